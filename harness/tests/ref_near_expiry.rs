//! Prices and implied vols near the money and near expiry, in ulps of the
//! value itself, against the 50-digit grid of
//! `reference-cases/black/near_expiry.csv`, every row checked.

use calor_harness::cases::black::ImpliedCase;
use calor_harness::cases::{default_dir, read_table};
use calor_harness::certify::near_expiry::measure;
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

/// In the money with carry: the rows whose intrinsic value the kernel takes
/// from the inputs, where the two rounded discounted legs would lose up to
/// 13,779 ulps of V (the code before).
fn in_the_money_with_carry(case: &ImpliedCase) -> bool {
    let forward = case.spot * ((case.rate - case.dividend_yield) * case.expiry).exp();
    let call = matches!(case.inputs().contract().kind, calor::Kind::Call);
    (case.rate != 0.0 || case.dividend_yield != 0.0) && (call == (case.strike < forward))
}

#[test]
fn ref_near_expiry_price_in_ulps() {
    let limit = NEAR_EXPIRY.limit;
    let mut series = Worst::new("price, t < 0.1", limit);
    let mut central = Worst::new("price, t ≥ 0.1", limit);
    let mut carry = Worst::new("price, in the money with carry", limit);
    for case in cases() {
        let t = 0.5 * case.vol * case.expiry.sqrt();
        let error = measure(&case).price;
        let detail = || format!("{:?}", case.inputs());
        if in_the_money_with_carry(&case) {
            carry.record(error, &case.id, detail);
        }
        let worst = if t < SERIES_BELOW {
            &mut series
        } else {
            &mut central
        };
        worst.record(error, &case.id, detail);
    }
    println!("{series}\n{central}\n{carry}");
    assert!(
        series.cases > 0 && central.cases > 0 && carry.cases > 0,
        "every group sampled"
    );
    assert!(series.passes(), "{series:#?}");
    assert!(central.passes(), "{central:#?}");
    assert!(carry.passes(), "{carry:#?}");
}

#[test]
fn ref_near_expiry_implied_round_trip_in_ulps() {
    let mut forward = Worst::new("implied vol", NEAR_EXPIRY.limit);
    let mut backward = Worst::new("repricing", NEAR_EXPIRY.limit);
    for case in cases() {
        let trip = measure(&case);
        let detail = || format!("{:?} premium {:e}", case.inputs(), case.premium);
        forward.record(trip.forward, &case.id, detail);
        backward.record(trip.backward, &case.id, detail);
    }
    println!("{forward}\n{backward}");
    assert!(forward.passes(), "{forward:#?}");
    assert!(backward.passes(), "{backward:#?}");
}
