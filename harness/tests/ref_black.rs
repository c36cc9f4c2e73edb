//! The closed form against the 50-digit tables of `reference-cases/black/`.

use calor_harness::cases::{black::GreeksCase, default_dir, read_table};
use calor_harness::certify::black::measure_greeks;

#[test]
fn ref_greeks_table() {
    let path = default_dir().join("black/greeks.csv");
    let cases: Vec<GreeksCase> = read_table(&path).unwrap();
    assert!(cases.len() >= 5000, "only {} cases", cases.len());
    let outcome = measure_greeks(&cases);
    for w in &outcome.worst {
        println!("{w}");
    }
    for (x, units) in &outcome.expected {
        println!(
            "expected failure {} {}: {units:.3} units ({})",
            x.case_id, x.quantity, x.reason
        );
    }
    let failed: Vec<_> = outcome.worst.iter().filter(|w| !w.passes()).collect();
    assert!(failed.is_empty(), "over tolerance:\n{failed:#?}");
    let passing = outcome.unexpected_passes();
    assert!(
        passing.is_empty(),
        "expected failures that now pass, take them off the list: {passing:#?}"
    );
}
