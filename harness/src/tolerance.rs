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
    limit: 128.0,
    reason: "third derivatives carry brackets such as d1·d2 − 1 or 1 + d1/s that pass \
             through zero where the price itself is well conditioned; there the rounding \
             of ln(F/K) (one ulp of the logarithm) is amplified by the bracket's own \
             condition, which κ of the price does not measure. Worst seen on the shipped \
             table: zomma at 81 units (g04589, forward 2 % from the strike, σ√T = 0.018, \
             d1·d2 − 1 ≈ 1e-3); limit set at 128 as the documented reach",
};

/// Implied volatility, forward error: |σ̂ − σ| in units of
/// ε·((1+κ)·V/vega + σ/4), so that the limit 16 is the contract
/// 16·(1+κ)·ε·V/vega + 4·ε·σ.
pub const IMPLIED_VOL: Tolerance = Tolerance {
    quantity: "implied_vol",
    limit: 16.0,
    reason: "the contract of the implied-volatility issue: the premium is known to half an \
             ulp and the price to 8·ε·(1+κ)·V, which moves σ by that over vega; 4·ε·σ \
             allows for the last rounding of σ itself",
};

/// Implied volatility, backward error: |price(σ̂) − premium| in units of ε·(1+κ)·V.
pub const REPRICING: Tolerance = Tolerance {
    quantity: "repricing",
    limit: 32.0,
    reason: "price(σ̂) − premium is the price's own error (8 units) plus vega times the \
             forward error of σ̂ (16 units plus 4·ε·σ·vega/V ≤ 4 units), plus the half ulp of \
             rounding in the premium",
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
