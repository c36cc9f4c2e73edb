//! The closed form against the 50-digit tables of `reference-cases/black/`.

use calor_harness::cases::{black::GreeksCase, default_dir, read_table};
use calor_harness::certify::black::measure_greeks;

#[test]
fn ref_greeks_table() {
    let path = default_dir().join("black/greeks.csv");
    let cases: Vec<GreeksCase> = read_table(&path).unwrap();
    assert!(cases.len() >= 5000, "only {} cases", cases.len());
    let worst = measure_greeks(&cases);
    for w in &worst {
        println!("{w}");
    }
    let failed: Vec<_> = worst.iter().filter(|w| !w.passes()).collect();
    assert!(failed.is_empty(), "over tolerance:\n{failed:#?}");
}
