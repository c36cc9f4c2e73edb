//! The near-expiry suite: prices and implied vols near the money and near
//! expiry (`black/near_expiry.csv`), in ulps of the value itself, not scaled
//! by the condition number.
//!
//! There the two Φ terms of the textbook formula cancel to about 1/t
//! (t = σ√T/2): an hour before expiry at 20 % vol that is some 500 ulps. The
//! condition number κ grows as fast (through the spot sensitivity), so the
//! κ-scaled contracts of the other suites allow it; this suite does not.
//!
//! Checked ("claimed"): every option without carry (r = q = 0, where the
//! discounted legs and the intrinsic value are exact), and the
//! out-of-the-money options with carry. In the money with carry, the
//! intrinsic value is the difference of the two rounded discounted legs,
//! which carries half an ulp of the strike: those rows are measured but not
//! checked.

use crate::cases::black::{ImpliedCase, KindCell};

/// The measured errors of one row; infinite where the kernel refused.
#[derive(Debug, Clone, Copy)]
pub struct NearExpiryTrip {
    /// |price − reference| in ulps of the reference price.
    pub price: f64,
    /// |σ̂ − σ| in units of ε·(σ + V/vega), σ̂ from the f64 premium.
    pub forward: f64,
    /// |price(σ̂) − premium| in ulps of the premium.
    pub backward: f64,
}

/// True for the rows the suite checks (module documentation).
pub fn claimed(case: &ImpliedCase) -> bool {
    if case.rate == 0.0 && case.dividend_yield == 0.0 {
        return true;
    }
    let forward = case.spot * ((case.rate - case.dividend_yield) * case.expiry).exp();
    match case.kind {
        KindCell::Call => case.strike > forward * (1.0 + 1e-12),
        KindCell::Put => case.strike < forward * (1.0 - 1e-12),
    }
}

/// The errors of one row.
pub fn measure(case: &ImpliedCase) -> NearExpiryTrip {
    let eps = f64::EPSILON;
    let ulps = |got: f64, want: f64| (got - want).abs() / (eps * want.abs());
    let inputs = case.inputs();
    let (contract, market) = (inputs.contract(), inputs.market());
    let price =
        calor::price(&contract, &market, case.vol).map_or(f64::INFINITY, |p| ulps(p, case.price));
    let Ok(vol) = calor::implied_vol(&contract, &market, case.premium) else {
        return NearExpiryTrip {
            price,
            forward: f64::INFINITY,
            backward: f64::INFINITY,
        };
    };
    // The premium is known to half an ulp, which moves σ by that over vega.
    let scale = case.vol + case.price / case.vega;
    let backward =
        calor::price(&contract, &market, vol).map_or(f64::INFINITY, |p| ulps(p, case.premium));
    NearExpiryTrip {
        price,
        forward: (vol - case.vol).abs() / (eps * scale),
        backward,
    }
}
