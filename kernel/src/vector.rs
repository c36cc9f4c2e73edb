//! Branch-free lane math for the batch path: exp, ln(a/b) and Φ written as
//! straight-line code so that a loop over many options vectorises.
//!
//! Every function here is exact IEEE arithmetic with no data-dependent branch
//! (comparisons become selects), so the compiler may process 2, 4 or 8 lanes at
//! once and the result of a lane is the same whatever its neighbours or its
//! position in the batch. Callers keep the arguments inside the stated ranges
//! and send everything else to the scalar path.

// The loop vectoriser only widens a loop whose whole body is inlined; these
// functions are larger than LLVM's default inlining threshold.
#![allow(clippy::inline_always)]

use core::f64::consts::{FRAC_1_SQRT_2, LOG2_E, SQRT_2};

use crate::elementary::{pow2, ATANH_SERIES, EXP_TAYLOR, LN2_HI, LN2_LO, ROUNDER};

/// Mantissa and exponent masks of an f64.
const MANTISSA: u64 = (1 << 52) - 1;
const EXPONENT_ONE: u64 = 1023 << 52;

/// exp(x) for x in [−708, 709].
///
/// # Formula
/// x = k·ln 2 + r with |r| ≤ ln 2/2 (Cody–Waite reduction with a two-part
/// ln 2), exp(r) by its Taylor polynomial of degree 13 (truncation below
/// 4·10⁻¹⁸), then the exponent added from the bits of k.
///
/// # Source
/// W. J. Cody and W. Waite, *Software Manual for the Elementary Functions*
/// (Prentice-Hall, 1980), ch. 6 (the reduction).
///
/// # Accuracy
/// About one ulp (the Horner evaluation and the reduction each contribute
/// half an ulp); checked against `libm::exp` in the tests.
#[inline(always)]
pub(crate) fn exp(x: f64) -> f64 {
    // max/min, not clamp: clamp carries a panic branch that blocks vectorisation.
    #[allow(clippy::manual_clamp)]
    let x = x.max(-708.0).min(709.0);
    let k = (x * LOG2_E + ROUNDER) - ROUNDER;
    let r = (x - k * LN2_HI) - k * LN2_LO;
    // Horner over 1/n! from n = 13 down to 0.
    // Horner over 1/n! from n = 13 down to 0, written out so that no inner
    // loop stands between the caller's loop and the vectoriser.
    let mut p = EXP_TAYLOR[13];
    p = p * r + EXP_TAYLOR[12];
    p = p * r + EXP_TAYLOR[11];
    p = p * r + EXP_TAYLOR[10];
    p = p * r + EXP_TAYLOR[9];
    p = p * r + EXP_TAYLOR[8];
    p = p * r + EXP_TAYLOR[7];
    p = p * r + EXP_TAYLOR[6];
    p = p * r + EXP_TAYLOR[5];
    p = p * r + EXP_TAYLOR[4];
    p = p * r + EXP_TAYLOR[3];
    p = p * r + EXP_TAYLOR[2];
    p = p * r + EXP_TAYLOR[1];
    p = p * r + EXP_TAYLOR[0];
    p * pow2(k)
}

/// ln(a/b) for positive normal a, b whose ratio lies in [1e-300, 1e300].
///
/// # Formula
/// a/b = 2^e·m with m in [1/√2, √2); with b′ = b·2^e (exact),
/// ln(a/b) = e·ln 2 + 2·atanh((a − b′)/(a + b′)), where a − b′ is exact
/// (Sterbenz) and atanh(u) = u·Σ u²ⁿ/(2n + 1) to n = 10 (|u| ≤ 0.172, the
/// first omitted term below 10⁻¹⁷ of the sum).
///
/// # Accuracy
/// About one ulp of the result, and exact to rounding near a = b: the same
/// property as the scalar path's (`black::ln_ratio_near_one`).
#[inline(always)]
pub(crate) fn ln_ratio(a: f64, b: f64) -> f64 {
    let bits = (a / b).to_bits();
    let m = f64::from_bits((bits & MANTISSA) | EXPONENT_ONE);
    // The biased exponent as a double, from its bits.
    let biased =
        f64::from_bits(0x4330_0000_0000_0000 | ((bits >> 52) & 0x7ff)) - 4_503_599_627_370_496.0;
    let e = biased - 1023.0 + if m > SQRT_2 { 1.0 } else { 0.0 };
    let b_scaled = b * pow2(e);
    let u = (a - b_scaled) / (a + b_scaled);
    let u2 = u * u;
    let mut series = ATANH_SERIES[10];
    series = series * u2 + ATANH_SERIES[9];
    series = series * u2 + ATANH_SERIES[8];
    series = series * u2 + ATANH_SERIES[7];
    series = series * u2 + ATANH_SERIES[6];
    series = series * u2 + ATANH_SERIES[5];
    series = series * u2 + ATANH_SERIES[4];
    series = series * u2 + ATANH_SERIES[3];
    series = series * u2 + ATANH_SERIES[2];
    series = series * u2 + ATANH_SERIES[1];
    series = series * u2 + ATANH_SERIES[0];
    e * LN2_HI + (2.0 * u * series + e * LN2_LO)
}

/// √x for x in [1e-300, 1e300], without the `sqrt` instruction's intrinsic
/// (which stops the loop vectoriser).
///
/// # Formula
/// 1/√x from the exponent-halving bit estimate (relative error below 3.5 %),
/// four Newton steps r ← r·(3/2 − x·r²/2) without division (the error squares
/// each step: below 10⁻²⁰), then √x = x·r corrected once with the exact
/// residual x − s² from [`two_product`].
///
/// # Accuracy
/// Within one ulp of the correctly rounded root (checked against `libm::sqrt`).
#[inline(always)]
pub(crate) fn sqrt(x: f64) -> f64 {
    // Wrapping: the batch's fast pass also runs over the lanes it refuses
    // (negative, NaN, infinite), whose bits are above the constant's double.
    let mut r = f64::from_bits(0x5FE6_EB50_C7B5_37A9_u64.wrapping_sub(x.to_bits() >> 1));
    let half = 0.5 * x;
    r *= 1.5 - half * r * r;
    r *= 1.5 - half * r * r;
    r *= 1.5 - half * r * r;
    r *= 1.5 - half * r * r;
    let s = x * r;
    let (p, e) = two_product(s, s);
    s + 0.5 * r * ((x - p) - e)
}

/// x·y = p + e exactly (Dekker's product with Veltkamp's splitting), for
/// |x|, |y|, |x·y| below 1e290.
#[inline(always)]
pub(crate) fn two_product(x: f64, y: f64) -> (f64, f64) {
    const SPLITTER: f64 = 134_217_729.0;
    let p = x * y;
    let cx = SPLITTER * x;
    let (xh, cy) = (cx - (cx - x), SPLITTER * y);
    let yh = cy - (cy - y);
    let (xl, yl) = (x - xh, y - yh);
    (p, ((xh * yh - p) + xh * yl + xl * yh) + xl * yl)
}

/// The upper end of erfcx's Chebyshev variable t = (x − 4)/(x + 4) at x = 8.5.
const ERFCX_T_HIGH: f64 = 0.36;
/// Chebyshev coefficients of erfcx over x in [0, 8.5] in the variable
/// u = (2t − (t_high − 1))/(t_high + 1); generated at 40 digits by
/// `kernel/tools/erfcx_chebyshev.py` (omitted terms below 2·10⁻¹⁸).
const ERFCX_CHEBYSHEV: [f64; 20] = [
    0.764_432_611_993_458_833_84,
    -0.426_563_278_803_637_645_79,
    0.141_701_207_189_062_909_97,
    -0.038_809_796_401_108_894_601,
    0.008_799_757_820_500_162_286_3,
    -0.001_637_200_000_302_545_295_2,
    0.000_243_419_750_374_552_102_49,
    -0.000_027_161_965_537_888_303_865,
    0.000_001_886_321_690_842_687_317_5,
    -0.000_000_002_919_485_454_233_395_558_6,
    -0.000_000_015_889_711_577_986_564_717,
    0.000_000_001_357_600_105_365_290_518_3,
    0.000_000_000_061_194_694_389_972_734_146,
    -0.000_000_000_017_733_729_408_668_704_026,
    0.000_000_000_000_156_198_239_023_889_905_15,
    0.000_000_000_000_198_551_433_081_871_331_69,
    -0.000_000_000_000_007_134_318_518_915_772_705_7,
    -0.000_000_000_000_002_354_208_975_395_298_288_7,
    0.000_000_000_000_000_112_912_497_828_399_584_73,
    0.000_000_000_000_000_031_369_009_319_218_896_344,
];

/// erfcx(x) for x in [0, 8.5] by Clenshaw's recurrence.
#[inline(always)]
fn scaled_erfc(x: f64) -> f64 {
    let t = (x - 4.0) / (x + 4.0);
    let u = (2.0 * t - (ERFCX_T_HIGH - 1.0)) / (ERFCX_T_HIGH + 1.0);
    let two_u = 2.0 * u;
    // Clenshaw's recurrence from the last coefficient down, written out (see exp).
    let (mut b1, mut b2) = (0.0, 0.0);
    (b1, b2) = (ERFCX_CHEBYSHEV[19] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[18] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[17] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[16] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[15] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[14] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[13] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[12] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[11] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[10] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[9] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[8] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[7] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[6] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[5] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[4] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[3] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[2] + two_u * b1 - b2, b1);
    (b1, b2) = (ERFCX_CHEBYSHEV[1] + two_u * b1 - b2, b1);
    0.5 * ERFCX_CHEBYSHEV[0] + u * b1 - b2
}

/// Φ(z) for z ≥ −12 (and any larger z).
///
/// # Formula
/// With y = |z|/√2, q = ½·exp(−y²)·erfcx(y) is Φ(−|z|); exp(−y²) takes y²
/// exactly split (so the rounding of the argument is not amplified), and
/// erfcx is clamped at 8.5 where q is already below 10⁻³¹.
///
/// # Accuracy
/// A few ulps relative for z < 0, a few ulps absolute for z ≥ 0.
#[inline(always)]
pub(crate) fn norm_cdf(z: f64) -> f64 {
    let y = if z < 0.0 { -z } else { z } * FRAC_1_SQRT_2;
    let (hi, lo) = two_product(y, y);
    let q = 0.5 * exp(-hi) * (1.0 - lo) * scaled_erfc(y.min(8.5));
    if z < 0.0 {
        q
    } else {
        1.0 - q
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ulps(a: f64, b: f64) -> f64 {
        (a - b).abs() / (f64::EPSILON * b.abs())
    }

    #[test]
    fn edge_exp_against_libm() {
        let mut worst = 0.0f64;
        for i in 0..20_000 {
            let x = -700.0 + 1400.0 * f64::from(i) / 20_000.0 + 1e-3;
            worst = worst.max(ulps(exp(x), libm::exp(x)));
        }
        assert!(worst <= 2.0, "exp worst {worst} ulps");
    }

    #[test]
    fn edge_ln_ratio_against_libm() {
        let mut worst = 0.0f64;
        for i in 1..20_000 {
            let a = 10f64.powf(-100.0 + 200.0 * f64::from(i) / 20_000.0);
            let b = 3.7;
            let want = libm::log(a) - libm::log(b);
            let err = (ln_ratio(a, b) - want).abs() / (f64::EPSILON * want.abs().max(1.0));
            worst = worst.max(err);
        }
        assert!(worst <= 4.0, "ln_ratio worst {worst}");
        // Exact to rounding next to 1, as log1p.
        let (a, b) = (1.000_000_001, 1.0);
        assert!(ulps(ln_ratio(a, b), libm::log1p(a - b)) <= 1.0);
    }

    #[test]
    fn edge_sqrt_against_libm() {
        let mut worst = 0.0f64;
        for i in 0..20_000 {
            let x = 10f64.powf(-300.0 + 600.0 * f64::from(i) / 20_000.0) * 1.000_1;
            worst = worst.max(ulps(sqrt(x), libm::sqrt(x)));
        }
        assert!(worst <= 1.0, "sqrt worst {worst} ulps");
    }

    #[test]
    fn edge_norm_cdf_against_scalar() {
        let mut worst = 0.0f64;
        for i in 0..24_000 {
            let z = -12.0 + 24.0 * f64::from(i) / 24_000.0;
            let want = crate::normal::norm_cdf(z);
            worst = worst.max(ulps(norm_cdf(z), want));
        }
        assert!(worst <= 8.0, "Φ worst {worst} ulps");
    }
}
