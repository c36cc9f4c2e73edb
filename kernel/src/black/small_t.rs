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
//! terms here cancel only as h falls (condition number below 16 for
//! h ≥ −2.25, mpmath scan; about h² further down). In the erfcx wing
//! (h + t < −2), where the series still applies while |x| < 0.2, Φ(h)/b′ is
//! taken from erfcx, which does not amplify the rounding of its argument.
//!
//! # Source
//! P. Jäckel, "Let's be rational", *Wilmott* 2015(75), 40–53 (a small-t
//! expansion of the normalised Black function in terms of Y = Φ/φ). The
//! polynomials were derived with sympy from the recurrence above.
//!
//! # Accuracy
//! Truncated after t¹²: the first term omitted from P, t¹⁴·p₁₅(h)/15!, is
//! below 0.035 ulps of G for t < 0.1 and h in [−2.1, 0] (mpmath scan; the
//! t¹² term that this version adds was 30 ulps at t = 0.1). Evaluation: a few
//! ulps, up to the condition number above times the ulps of Φ(h) or erfcx.
//! On 12,000 random options near the money (h from −2.3 to 0, t from 0.02
//! to 0.3, mpmath) the price is within 49.7 ulps of V (the two Φ terms at
//! h = −1, t = 0.05; 32.1 where the series applies).

use super::{ERFCX_BELOW, ERFCX_BELOW_PAST_SERIES};
use crate::elementary::exp;
use core::f64::consts::FRAC_1_SQRT_2;

use crate::normal::{norm_cdf, scaled_erfc, two_product, INV_SQRT_2PI};

/// Below this t the series gives the value. Above it the central formula's
/// two Φ terms cancel to at most about 10 near the money (less as t grows),
/// and through erfcx from h + t = −1 down (`black::erfcx_wing`). At 0.1 the
/// first term the series omits (t¹⁴·p₁₅/15!) is below 0.035 ulps of G for h
/// in [−2.1, 0] (mpmath). The series costs more than the central formula
/// (the benchmark's near-the-money options all priced by it: 39.3 ns against
/// 32.3, scratch driver), so it is kept to where the Φ terms lose more.
pub(super) const SMALL_T_BELOW: f64 = 0.1;

/// Into the erfcx wing (h + t < −2) the series still applies while
/// |x| = 2|h|·t < 0.2: there its two terms cancel to about h², against
/// |h|/(2t) for the erfcx difference. On 8,000 random options with t from
/// 10⁻⁵ to 0.1 and h from −6 to −1.5 (mpmath) the worst price fell from
/// 414,078 ulps to 398 with it (at h = −5.3; 79 for h in [−2.5, −2]).
const WING_HT_ABOVE: f64 = -0.1;

/// ... and while h stays above this, so that e^(±(h² + t²)/2) stays well
/// inside the range of f64 (e^338): further down the erfcx form applies the
/// factor in halves, and a price whose normalised value would underflow
/// (legs near 10³⁰⁰) stays representable.
const WING_H_ABOVE: f64 = -26.0;

/// Below this t the series applies for any h. From it up to
/// [`SMALL_T_BELOW`] only below h + t = −1 (`black::ERFCX_BELOW_PAST_SERIES`):
/// above that the two Φ terms lose at most about 50 ulps (at h = −1,
/// t = 0.05; 16 for h above −0.5), and the batch's lane path keeps those
/// options (sent to the series, `price_delta_batch` took 33 % longer near the
/// money, criterion).
const ANY_H_BELOW: f64 = 0.05;

/// True where the series gives the out-of-the-money value: t below
/// [`ANY_H_BELOW`], or below [`SMALL_T_BELOW`] with h + t < −1; outside the
/// erfcx wing, or within |x| < 0.2 of the money in it (h > −26). Callers test it before
/// `black::erfcx_wing`.
#[inline]
pub(crate) fn applies(h: f64, t: f64) -> bool {
    t < SMALL_T_BELOW
        && (t < ANY_H_BELOW || h + t < ERFCX_BELOW_PAST_SERIES)
        && (h + t >= ERFCX_BELOW || (h * t > WING_HT_ABOVE && h > WING_H_ABOVE))
}

/// Y(h)·e^(t²/2) = Φ(h)/b′ in the wing (h + t < −2), from erfcx:
/// Y = Φ/φ = √(π/2)·erfcx(−h/√2). Through Φ(h) and the Gaussian factor, the
/// rounding of −h/√2 would come back amplified by h²; erfcx hardly notices it.
#[inline(never)]
fn wing_ratio(h: f64, t: f64) -> f64 {
    SQRT_HALF_PI * scaled_erfc(-h * FRAC_1_SQRT_2) * exp(0.5 * t * t)
}

/// √(π/2).
const SQRT_HALF_PI: f64 = 1.253_314_137_315_500_3;

/// True in the part of the series' region that lies in the erfcx wing.
#[inline]
fn in_wing(h: f64, t: f64) -> bool {
    h + t < ERFCX_BELOW
}

/// h·Q̂·Φ(h)/b′ for the solver's residual (`implied`), and None outside the
/// wing, where the caller keeps its own arrangement of the same terms.
#[inline]
pub(crate) fn wing_term(h: f64, t: f64, q: f64) -> Option<f64> {
    in_wing(h, t).then(|| h * q * wing_ratio(h, t))
}

/// (P, Q̂) with b = s·[b′·P + h·Q̂·Φ(h)] (module documentation).
#[inline]
pub(crate) fn polynomials(h: f64, t: f64) -> (f64, f64) {
    let (u, w) = (h * h, t * t);
    let (u2, w2) = (u * u, w * w);
    let u4 = u2 * u2;
    // p_(2j+1)(h)/(2j + 1)! as polynomials in u = h², each independent of
    // the others and by Estrin's scheme; then Estrin's scheme in w = t².
    let p3 = (2.0 + u) * (1.0 / 6.0);
    let p5 = ((8.0 + u * 9.0) + u2) * (1.0 / 120.0);
    let p7 = ((48.0 + u * 87.0) + u2 * (20.0 + u)) * (1.0 / 5040.0);
    let p9 = (((384.0 + u * 975.0) + u2 * (345.0 + u * 35.0)) + u4) * (1.0 / 362_880.0);
    let p11 = (((3840.0 + u * 12645.0) + u2 * (6090.0 + u * 938.0)) + u4 * (54.0 + u))
        * (1.0 / 39_916_800.0);
    let p13 = (((46080.0 + u * 187425.0) + u2 * (114765.0 + u * 23814.0))
        + u4 * ((2070.0 + u * 77.0) + u2))
        * (1.0 / 6_227_020_800.0);
    let w4 = w2 * w2;
    let p = ((1.0 + w * p3) + w2 * (p5 + w * p7)) + w4 * ((p9 + w * p11) + w2 * p13);
    // sinh(z)/z in z² = (ht)², to the same order.
    let z2 = u * w;
    let z4 = z2 * z2;
    let q = ((1.0 + z2 * (1.0 / 6.0)) + z4 * ((1.0 / 120.0) + z2 * (1.0 / 5040.0)))
        + z4 * z4 * ((1.0 / 362_880.0) + z2 * (1.0 / 39_916_800.0));
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
    let value = if in_wing(h, t) {
        (2.0 * t) * density * (p + h * q * wing_ratio(h, t))
    } else {
        (2.0 * t) * (density * p + h * q * norm_cdf(h))
    };
    (value.max(0.0), density)
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
