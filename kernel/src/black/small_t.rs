//! The normalised price for small t = s/2 by its Taylor series in t.
//!
//! # Formula
//! With Y = Φ/φ, e^(ht)·φ(h + t) = e^(−ht)·φ(h − t) = φ(h)·e^(−t²/2) gives
//! b = φ(h)·e^(−t²/2)·[Y(h + t) − Y(h − t)] = s·b′·G, where
//! b′ = exp(−(h² + t²)/2)/√(2π) is the vega of b and
//! G = [Y(h + t) − Y(h − t)]/(2t) = Σ_j t^(2j)·Y^(2j+1)(h)/(2j + 1)!.
//! From Y′ = 1 + h·Y every derivative is Y^(k) = p_k(h) + q_k(h)·Y(h) with
//! polynomials p_k, q_k (p_(k+1) = p_k′ + q_k, q_(k+1) = q_k′ + h·q_k), so
//! G = P + h·Q·Y with P = Σ_j t^(2j)·p_(2j+1)/(2j + 1)! and Q likewise. The
//! series Q is e^(t²/2)·sinh(ht)/(ht) (sympy, to the order kept), so that
//! b = s·[b′·P + h·Q̂·Φ(h)], Q̂ = sinh(ht)/(ht) = Σ_j (ht)^(2j)/(2j + 1)!,
//! and ht = x/2. Near the money the two Φ terms of the central formula lose a
//! factor of about e^(ht)·Φ(h + t)/b, some 1/t, to cancellation; the two
//! terms here cancel only as h falls towards −2 (condition number below 16 for
//! h ≥ −2.25, mpmath scan).
//!
//! # Source
//! P. Jäckel, "Let's be rational", *Wilmott* 2015(75), 40–53 (a small-t
//! expansion of the normalised Black function in terms of Y = Φ/φ). The
//! polynomials were derived with sympy from the recurrence above.
//!
//! # Accuracy
//! Truncated after t¹⁰: the first omitted term is below 2·10⁻²¹ of G for
//! t < 0.05 and h in [−2.25, 0] (mpmath scan). Evaluation: a few ulps, up to
//! the condition number above times the ulps of Φ(h) deep in.

use super::ERFCX_BELOW;
use crate::elementary::exp;
use crate::normal::{norm_cdf, two_product, INV_SQRT_2PI};

/// Below this t the series gives the value (outside the erfcx wing). Above
/// it the central formula's two Φ terms cancel to at most about 30 at
/// h = −2.15 (Y(h)/(2t·G) with G ≈ Y′), which on the near-expiry grid cost up
/// to 61 ulps at t = 0.05. The series costs more than the central formula
/// (the benchmark's near-the-money options all priced by it: 39.3 ns against
/// 32.3, scratch driver), so it is kept to where the loss would be larger.
const SMALL_T_BELOW: f64 = 0.05;

/// True where the series gives the out-of-the-money value: t below
/// [`SMALL_T_BELOW`], outside the erfcx wing.
#[inline]
pub(crate) fn applies(h: f64, t: f64) -> bool {
    t < SMALL_T_BELOW && h + t >= ERFCX_BELOW
}

/// (P, Q̂) with b = s·[b′·P + h·Q̂·Φ(h)] (module documentation).
#[inline]
pub(crate) fn polynomials(h: f64, t: f64) -> (f64, f64) {
    let (u, w) = (h * h, t * t);
    // p_(2j+1)(h)/(2j + 1)! as polynomials in u = h², each independent of
    // the others; then Horner's rule in w = t².
    let p3 = (2.0 + u) * (1.0 / 6.0);
    let p5 = (8.0 + u * (9.0 + u)) * (1.0 / 120.0);
    let p7 = (48.0 + u * (87.0 + u * (20.0 + u))) * (1.0 / 5040.0);
    let p9 = (384.0 + u * (975.0 + u * (345.0 + u * (35.0 + u)))) * (1.0 / 362_880.0);
    let p11 = (3840.0 + u * (12645.0 + u * (6090.0 + u * (938.0 + u * (54.0 + u)))))
        * (1.0 / 39_916_800.0);
    let p = 1.0 + w * (p3 + w * (p5 + w * (p7 + w * (p9 + w * p11))));
    // sinh(z)/z in z² = (ht)², to the same order.
    let z2 = u * w;
    let q = 1.0
        + z2 * ((1.0 / 6.0)
            + z2 * ((1.0 / 120.0)
                + z2 * ((1.0 / 5040.0) + z2 * ((1.0 / 362_880.0) + z2 * (1.0 / 39_916_800.0)))));
    (p, q)
}

/// e^(sign·(h² + t²)/2) for sign ±1, with h² split exactly: the series' two
/// terms cancel (up to 16 as h falls towards −2), which amplifies the
/// factor's rounding, and would amplify that of its argument (ε·h²/2) too.
#[inline]
pub(crate) fn gaussian(h: f64, t: f64, sign: f64) -> f64 {
    let (square, tail) = two_product(h, h);
    exp(sign * 0.5 * (square + t * t)) * (1.0 + sign * 0.5 * tail)
}

/// (b, b′): b(x, s) = s·[b′·P + h·Q̂·Φ(h)] for h = x/s, t = s/2 where
/// [`applies`], and its vega b′ = exp(−(h² + t²)/2)/√(2π).
#[inline]
pub(crate) fn normalised(h: f64, t: f64) -> (f64, f64) {
    let (p, q) = polynomials(h, t);
    let density = INV_SQRT_2PI * gaussian(h, t, -1.0);
    (
        ((2.0 * t) * (density * p + h * q * norm_cdf(h))).max(0.0),
        density,
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ref_series_against_mpmath() {
        // (h, t, G = [Y(h + t) − Y(h − t)]/(2t)) from mpmath 1.3.0 at 50
        // digits, Y = ncdf/npdf, the arguments being the f64 values written.
        let cases = [
            (0.0, 0.001, 1.000_000_333_333_4),
            (0.0, 0.049, 1.000_800_717_785_256_957_7),
            (-0.5, 0.03, 0.561_941_675_603_003_670_57),
            (-1.0, 0.045, 0.344_447_822_748_300_169_16),
            (-2.1, 0.04, 0.147_085_867_223_732_467_35),
            (-0.05, 1e-5, 0.939_757_996_428_386_424_08),
            (-1.85, 0.0499, 0.174_543_439_536_851_953_27),
        ];
        for (h, t, want) in cases {
            let (p, q) = polynomials(h, t);
            // G = P + h·Q·Y = P + h·Q̂·√(2π)·e^((h² + t²)/2)·Φ(h).
            let root_2pi = 2.506_628_274_631_000_5;
            let got = p + h * q * root_2pi * libm::exp(0.5 * (h * h + t * t)) * norm_cdf(h);
            let ulps = (got - want).abs() / (f64::EPSILON * want);
            // The terms' condition number (below 16 for h ≥ −2.25) times the
            // few ulps of Φ and exp: 32 deep in, a few near 0.
            let limit = if h < -1.5 { 32.0 } else { 4.0 };
            assert!(
                ulps <= limit,
                "G({h}, {t}) = {got}, want {want}: {ulps} ulps"
            );
        }
    }
}
