//! The one table of tolerances, each with the reason for its value.
//!
//! Errors are measured in units of ε·(1+κ)·scale, with ε = `f64::EPSILON`, κ the
//! price's relative condition number over (spot, strike, expiry, rate,
//! dividend yield, vol) from the reference table, and `scale` the quantity's
//! magnitude plus its natural scale. A check passes when its error in those
//! units is at most the entry's `limit`.

/// One entry of the tolerance table.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Tolerance {
    /// The quantity checked, as named in the reference tables.
    pub quantity: &'static str,
    /// The largest admissible error, in units of ε·(1+κ)·scale.
    pub limit: f64,
    /// Why the limit has this value.
    pub reason: &'static str,
}

/// Price of the closed form.
pub const PRICE: Tolerance = Tolerance {
    quantity: "price",
    limit: 8.0,
    reason: "the contract of the kernel foundation: no evaluation can beat about κ·ε \
             (inputs are only known to half an ulp) and the erfcx formulation adds a few \
             ulps of erfc, exp and the final products",
};

/// First- and second-order Greeks: delta, gamma, vega, theta, rho,
/// dividend_rho, vanna, volga, charm, veta.
pub const GREEK: Tolerance = Tolerance {
    quantity: "greek",
    limit: 16.0,
    reason: "the contract of the kernel foundation: each Greek is a short product of \
             terms that carry the price's conditioning, measured against |g| + s_g so that \
             Greeks that cross zero are judged on the scale of the price",
};

/// Third-order Greeks: speed, zomma, color, ultima.
pub const THIRD_ORDER: Tolerance = Tolerance {
    quantity: "third_order",
    limit: 16.0,
    reason: "third derivatives are polynomials of degree four in d1, d2 times the density; \
             measured against |g| + s_g they stay within the second-order limit",
};

/// The natural scale s_g of each Greek, built from the price V, spot S, vol σ
/// and expiry T, so that a Greek that passes through zero is judged on the
/// scale of the price rather than of itself.
///
/// Returns `None` for a name that is not a Greek of [`calor::Greeks`].
pub fn natural_scale(quantity: &str, v: f64, s: f64, sigma: f64, t: f64) -> Option<f64> {
    let v = v.abs();
    Some(match quantity {
        "price" => v,
        "delta" => v / s,
        "gamma" => v / (s * s),
        "vega" => v / sigma,
        "theta" => v / t,
        "rho" | "dividend_rho" => v * t,
        "vanna" => v / (s * sigma),
        "volga" => v / (sigma * sigma),
        "charm" => v / (s * t),
        "veta" => v / (sigma * t),
        "speed" => v / (s * s * s),
        "zomma" => v / (s * s * sigma),
        "color" => v / (s * s * t),
        "ultima" => v / (sigma * sigma * sigma),
        _ => return None,
    })
}

/// The tolerance entry for a quantity of the Greeks table.
pub fn for_quantity(quantity: &str) -> Tolerance {
    match quantity {
        "price" => PRICE,
        "speed" | "zomma" | "color" | "ultima" => THIRD_ORDER,
        _ => GREEK,
    }
}

/// Results far below the normal range of `f64` cannot be represented to any
/// relative accuracy; the contract lets a true price below 1e-300 come back as
/// 0 or subnormal. This absolute floor is added to every tolerance.
pub const UNDERFLOW_FLOOR: f64 = 1e-300;

/// Error of `got` against `reference` in units of ε·(1+κ)·(|reference| + scale).
pub fn units(got: f64, reference: f64, kappa: f64, scale: f64) -> f64 {
    let err = (got - reference).abs();
    if err <= UNDERFLOW_FLOOR {
        return 0.0;
    }
    err / (f64::EPSILON * (1.0 + kappa) * (reference.abs() + scale))
}
