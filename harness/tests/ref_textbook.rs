//! The published worked examples of `reference-cases/textbook/european.csv`.

use calor_harness::cases::{default_dir, read_table, textbook::TextbookCase};
use calor_harness::certify::textbook::measure_textbook;

#[test]
fn ref_textbook_examples() {
    let cases: Vec<TextbookCase> =
        read_table(&default_dir().join("textbook/european.csv")).unwrap();
    let results = measure_textbook(&cases);
    for r in &results {
        println!(
            "{:<4} {:<13} {:>18.12} printed {:6.3} recomputed {:8.1}  {}",
            r.id, r.quantity, r.ours, r.printed_units, r.recomputed_units, r.source
        );
    }
    let failed: Vec<_> = results.iter().filter(|r| !r.passes).collect();
    assert!(failed.is_empty(), "{failed:#?}");
}
