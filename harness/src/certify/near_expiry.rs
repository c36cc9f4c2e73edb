//! The near-expiry suite: prices and implied vols near the money and near
//! expiry (`black/near_expiry.csv`), in ulps of the value itself, not scaled
//! by the condition number.
//!
//! There the two Φ terms of the textbook formula cancel to about 1/t
//! (t = σ√T/2): an hour before expiry at 20 % vol that is some 500 ulps. The
//! condition number κ grows as fast (through the spot sensitivity), so the
//! κ-scaled contracts of the other suites allow it; this suite does not.
//!
//! Every row is checked, in the money with carry too: there the kernel takes
//! the intrinsic value from the inputs where the difference of the two
//! rounded discounted legs would carry many ulps of the price
//! (`Setup::intrinsic_near` in the kernel).

use crate::cases::black::ImpliedCase;

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
