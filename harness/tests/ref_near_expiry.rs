//! Prices and implied vols near the money and near expiry, in ulps of the
//! value itself, against the 50-digit grid of
//! `reference-cases/black/near_expiry.csv`; which rows are checked, and why,
//! is in `calor_harness::certify::near_expiry`.

use calor_harness::cases::black::ImpliedCase;
use calor_harness::cases::{default_dir, read_table};
use calor_harness::certify::near_expiry::{claimed, measure};
use calor_harness::certify::Worst;
use calor_harness::tolerance::NEAR_EXPIRY;

/// The price is reported in two groups split at this t = σ√T/2: below it the
/// kernel sums the normalised price from its series in t (`black::small_t`)
/// where t < 0.05 or h + t < −1, and from the two Φ terms elsewhere; at and
/// above it, from the two Φ terms (through erfcx below h + t = −1).
const SERIES_BELOW: f64 = 0.1;

fn cases() -> Vec<ImpliedCase> {
    let cases: Vec<ImpliedCase> = read_table(&default_dir().join("black/near_expiry.csv")).unwrap();
    assert_eq!(cases.len(), 3000, "the grid's 560 rows and 2,440 sampled");
    cases
}

#[test]
fn ref_near_expiry_price_in_ulps() {
    let mut series = Worst::new("price, checked, t < 0.1", NEAR_EXPIRY.limit);
    let mut central = Worst::new("price, checked, t ≥ 0.1", NEAR_EXPIRY.limit);
    let mut shown = Worst::new("price, in the money with carry", f64::INFINITY);
    for case in cases() {
        let t = 0.5 * case.vol * case.expiry.sqrt();
        let worst = match (claimed(&case), t < SERIES_BELOW) {
            (false, _) => &mut shown,
            (true, true) => &mut series,
            (true, false) => &mut central,
        };
        worst.record(measure(&case).price, &case.id, || {
            format!("{:?}", case.inputs())
        });
    }
    println!("{series}\n{central}\n{shown}");
    assert!(series.cases > 0 && central.cases > 0, "both paths sampled");
    assert!(series.passes(), "{series:#?}");
    assert!(central.passes(), "{central:#?}");
}

#[test]
fn ref_near_expiry_implied_round_trip_in_ulps() {
    let mut forward = Worst::new("implied vol, checked", NEAR_EXPIRY.limit);
    let mut backward = Worst::new("repricing, checked", NEAR_EXPIRY.limit);
    for case in cases().into_iter().filter(claimed) {
        let trip = measure(&case);
        let detail = || format!("{:?} premium {:e}", case.inputs(), case.premium);
        forward.record(trip.forward, &case.id, detail);
        backward.record(trip.backward, &case.id, detail);
    }
    println!("{forward}\n{backward}");
    assert!(
        forward.cases == 2227,
        "2,227 checked rows, {}",
        forward.cases
    );
    assert!(forward.passes(), "{forward:#?}");
    assert!(backward.passes(), "{backward:#?}");
}
