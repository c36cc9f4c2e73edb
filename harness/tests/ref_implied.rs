//! Implied volatility against the 50-digit round trips of `reference-cases/black/implied.csv`.

use calor_harness::cases::{black::ImpliedCase, default_dir, read_table};
use calor_harness::certify::implied::measure_implied;

#[test]
fn ref_implied_round_trips() {
    let path = default_dir().join("black/implied.csv");
    let cases: Vec<ImpliedCase> = read_table(&path).unwrap();
    assert!(cases.len() >= 5000, "only {} cases", cases.len());
    let outcome = measure_implied(&cases);
    println!("{}\n{}", outcome.forward, outcome.backward);
    println!("cases by iterations used: {:?}", outcome.iteration_counts);
    assert!(
        outcome.forward.passes(),
        "forward error over tolerance: {:#?}",
        outcome.forward
    );
    assert!(
        outcome.backward.passes(),
        "repricing error over tolerance: {:#?}",
        outcome.backward
    );
}

#[test]
fn ref_implied_iteration_bound() {
    let path = default_dir().join("black/implied.csv");
    let cases: Vec<ImpliedCase> = read_table(&path).unwrap();
    let outcome = measure_implied(&cases);
    assert!(
        outcome.unconverged.is_empty(),
        "{} cases needed more than {} iterations, e.g. {:?}",
        outcome.unconverged.len(),
        calor::MAX_ITERATIONS,
        &outcome.unconverged[..outcome.unconverged.len().min(10)]
    );
}
