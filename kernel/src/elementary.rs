//! Elementary functions for the scalar paths, written for a short chain of
//! dependent steps (the price is bound by that latency, not by throughput):
//! exp, and ln(a/b) near 1. Also the constants the lanes of `vector` share.

use core::f64::consts::LOG2_E;

/// 1.5·2⁵²: adding and subtracting it rounds a double below 2⁵¹ to an integer.
pub(crate) const ROUNDER: f64 = 6_755_399_441_055_744.0;
/// ln 2 split so that k·LN2_HI is exact for |k| < 2¹¹.
pub(crate) const LN2_HI: f64 = 6.931_471_803_691_238_2e-1;
pub(crate) const LN2_LO: f64 = 1.908_214_929_270_587_7e-10;
/// 1/n! for n = 0..=13, the Taylor coefficients of exp.
pub(crate) const EXP_TAYLOR: [f64; 14] = [
    1.0,
    1.0,
    1.0 / 2.0,
    1.0 / 6.0,
    1.0 / 24.0,
    1.0 / 120.0,
    1.0 / 720.0,
    1.0 / 5040.0,
    1.0 / 40320.0,
    1.0 / 362_880.0,
    1.0 / 3_628_800.0,
    1.0 / 39_916_800.0,
    1.0 / 479_001_600.0,
    1.0 / 6_227_020_800.0,
];
/// 1/(2n + 1) for n = 0..=16, the series of atanh(u)/u in u² (to n = 10 in
/// the lanes' `vector::ln_ratio`, to n = 16 in [`ln_ratio_near_one`]).
pub(crate) const ATANH_SERIES: [f64; 17] = [
    1.0,
    1.0 / 3.0,
    1.0 / 5.0,
    1.0 / 7.0,
    1.0 / 9.0,
    1.0 / 11.0,
    1.0 / 13.0,
    1.0 / 15.0,
    1.0 / 17.0,
    1.0 / 19.0,
    1.0 / 21.0,
    1.0 / 23.0,
    1.0 / 25.0,
    1.0 / 27.0,
    1.0 / 29.0,
    1.0 / 31.0,
    1.0 / 33.0,
];

/// 2^k for an integer-valued k in [−1022, 1023], from the exponent bits.
// Inlined everywhere: the lanes of `vector` vectorise only fully inlined bodies.
#[allow(clippy::inline_always)]
#[inline(always)]
pub(crate) fn pow2(k: f64) -> f64 {
    // The low bits of (k + 1023 + ROUNDER) hold k + 1023; shifting them into the
    // exponent field drops the rounder's own bit.
    f64::from_bits((k + 1023.0 + ROUNDER).to_bits() << 52)
}

/// exp(x), for the scalar paths' critical chains.
///
/// # Formula
/// x = k·ln 2 + r with |r| ≤ ln 2/2 (Cody–Waite reduction with a two-part
/// ln 2), exp(r) = 1 + r·q(r) with q the Taylor polynomial of degree 12 of
/// (eʳ − 1)/r (truncation below 4·10⁻¹⁸), summed by Estrin's scheme in four
/// dependent steps where Horner's rule takes thirteen; the exponent is added
/// from the bits of k. Outside [−708, 709], where the result leaves the
/// normal range, `libm::exp`.
///
/// # Source
/// W. J. Cody and W. Waite, *Software Manual for the Elementary Functions*
/// (Prentice-Hall, 1980), ch. 6 (the reduction); G. Estrin, "Organization of
/// computer systems: the fixed plus variable structure computer", *Proc.
/// Western Joint Computer Conf.* (1960) 33–40.
///
/// # Accuracy
/// 0.996 ulps worst over 100,000 random points of [−708, 709] and [−60, 2]
/// against mpmath at 40 digits (`libm::exp` 0.996 on the same points);
/// `edge_exp_against_reference` holds 10 of them to 1 ulp.
#[inline]
pub(crate) fn exp(x: f64) -> f64 {
    if !(-708.0..=709.0).contains(&x) {
        return libm::exp(x);
    }
    let k = (x * LOG2_E + ROUNDER) - ROUNDER;
    let r = (x - k * LN2_HI) - k * LN2_LO;
    // exp(r) = 1 + r·q(r), q of degree 12: the final sum rounds once.
    (1.0 + r * exp_quotient(r)) * pow2(k)
}

/// q(r) = (eʳ − 1)/r by its Taylor polynomial of degree 12, for |r| ≤ ln 2/2.
#[inline]
fn exp_quotient(r: f64) -> f64 {
    let [_, c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13] = EXP_TAYLOR;
    let r2 = r * r;
    let r4 = r2 * r2;
    let r8 = r4 * r4;
    ((c1 + c2 * r) + r2 * (c3 + c4 * r))
        + r4 * ((c5 + c6 * r) + r2 * (c7 + c8 * r))
        + r8 * (((c9 + c10 * r) + r2 * (c11 + c12 * r)) + r4 * c13)
}

/// (eˣ, eˣ − 1), the second without the cancellation of subtracting 1, for
/// the discount factors and the intrinsic value.
///
/// # Formula
/// For |x| < ln 2/2, where [`exp`]'s reduction leaves r = x and k = 0,
/// eˣ − 1 = x·q(x) with [`exp`]'s polynomial q, and eˣ = 1 + x·q(x) as
/// [`exp`] forms it; elsewhere `libm::exp` and `libm::expm1`.
///
/// # Accuracy
/// eˣ as [`exp`]; eˣ − 1 within about an ulp and a half of itself (q's
/// truncation below 4·10⁻¹⁸, one rounding of the product); `libm::expm1`
/// outside (`edge_exp_with_minus_one_against_reference`).
#[inline]
pub(crate) fn exp_with_minus_one(x: f64) -> (f64, f64) {
    if libm::fabs(x) < HALF_LN2 {
        let minus_one = x * exp_quotient(x);
        (1.0 + minus_one, minus_one)
    } else {
        (libm::exp(x), libm::expm1(x))
    }
}

/// ln 2/2, below which [`exp`]'s reduction leaves its argument as it is.
const HALF_LN2: f64 = 0.346_573_590_279_972_65;

/// ln(a/b) for b/2 < a < 2b, as 2·atanh(d) with d = (a − b)/(a + b).
///
/// # Formula
/// ln(a/b) = 2·d·(1 + Σₖ d^(2k)/(2k + 1)), k = 1..=16, with |d| < 1/3; the
/// first omitted term is below 2·10⁻¹⁸ relative. a − b is exact (Sterbenz), so
/// d carries two roundings and the result about three: ε·|ln(a/b)| or so,
/// against the ε of a logarithm evaluated next to 1. The series is summed by
/// Estrin's scheme, in five dependent steps where a logarithm takes a division
/// and a dozen: this sits at the head of the price's critical path.
///
/// # Source
/// M. Abramowitz and I. A. Stegun, *Handbook of Mathematical Functions* (NBS,
/// 1964), eq. 4.1.28 (ln((1 + d)/(1 − d)) = 2·(d + d³/3 + d⁵/5 + …)).
#[inline]
pub(crate) fn ln_ratio_near_one(a: f64, b: f64) -> f64 {
    let sum = a + b;
    // Halving is exact where the sum overflows (both legs beyond 4e307).
    let d = if sum.is_finite() {
        (a - b) / sum
    } else {
        (0.5 * a - 0.5 * b) / (0.5 * a + 0.5 * b)
    };
    let u = d * d;
    let [_, c0, c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13, c14, c15] = ATANH_SERIES;
    let u2 = u * u;
    let u4 = u2 * u2;
    let u8 = u4 * u4;
    let low = ((c0 + c1 * u) + u2 * (c2 + c3 * u)) + u4 * ((c4 + c5 * u) + u2 * (c6 + c7 * u));
    let high =
        ((c8 + c9 * u) + u2 * (c10 + c11 * u)) + u4 * ((c12 + c13 * u) + u2 * (c14 + c15 * u));
    let tail = u * (low + u8 * high);
    2.0 * (d + d * tail)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn edge_exp_against_reference() {
        // exp at exact f64 arguments, from mpmath 1.3.0 at 40 digits, rounded
        // to 21: both ends of the range, near both ends of the reduced interval,
        // and the worst point of a 100,000-point scan (160.12…).
        let cases = [
            (-708.0, 3.307_553_003_638_407_996_2e-308),
            (-707.5, 5.453_232_991_066_741_607_32e-308),
            (-50.5, 1.169_845_917_706_196_468_59e-22),
            (-1.0, 0.367_879_441_171_442_321_596),
            (-0.34, 0.711_770_322_762_609_697_695),
            (1e-10, 1.000_000_000_100_000_000_01),
            (0.346_573_590_279_972_5, 1.414_213_562_373_094_796_89),
            (2.5, 12.182_493_960_703_473_438_1),
            (160.121_301_653_199_23, 3.465_754_079_792_237_540_61e69),
            (709.0, 8.218_407_461_554_972_189_24e307),
        ];
        for (x, want) in cases {
            let ulps = (exp(x) - want).abs() / (want * f64::EPSILON);
            assert!(ulps <= 1.0, "exp({x}) off by {ulps} ulps");
        }
        // Outside the range, libm's own limits.
        assert_eq!(exp(-1000.0), 0.0);
        assert_eq!(exp(f64::NEG_INFINITY), 0.0);
        assert_eq!(exp(1000.0), f64::INFINITY);
        assert!(exp(f64::NAN).is_nan());
    }

    #[test]
    fn edge_exp_with_minus_one_against_reference() {
        // eˣ − 1 at exact f64 arguments, from mpmath 1.3.0 at 40 digits,
        // rounded to 21: tiny, discount-like, both ends of the polynomial's
        // interval and beyond it (libm).
        let cases = [
            (-1e-10, -9.999_999_999_500_000_364_34e-11),
            (-2.5e-6, -2.499_996_875_002_604_369_55e-6),
            (-0.0125, -0.012_422_199_506_118_572_618),
            (-0.1, -0.095_162_581_964_040_431_858_6),
            (-0.3465, -0.292_841_180_712_728_660_709),
            (0.3465, 0.414_109_493_830_362_415_098),
            (-0.5, -0.393_469_340_287_366_576_396),
            (-15.0, -0.999_999_694_097_679_498_174),
        ];
        for (x, want) in cases {
            let (e, minus_one) = exp_with_minus_one(x);
            let ulps = (minus_one - want).abs() / (want.abs() * f64::EPSILON);
            assert!(ulps <= 1.5, "exp({x}) − 1 off by {ulps} ulps");
            let e_ulps = (e - exp(x)).abs() / (exp(x) * f64::EPSILON);
            assert!(e_ulps <= 1.0, "exp({x}) off by {e_ulps} ulps");
        }
    }

    #[test]
    fn edge_ln_ratio_near_one_against_reference() {
        // ln(a/b) at exact f64 arguments, from mpmath 1.3.0 at 50 digits,
        // rounded to 21: both ends of the range, the ulp next to 1, legs past
        // 4e307 (whose sum overflows) and subnormal legs. Over 200,000 random
        // pairs the worst error is 1.8 ulps of ln(a/b).
        let cases = [
            (
                1.000_000_000_000_000_2,
                1.0,
                2.220_446_049_250_312_834_33e-16,
            ),
            (
                1.0,
                1.000_000_000_000_000_2,
                -2.220_446_049_250_312_834_33e-16,
            ),
            (0.500_000_000_000_000_1, 1.0, -0.693_147_180_559_945_087_373),
            (1.999_999_999_999_999_8, 1.0, 0.693_147_180_559_945_198_395),
            (42.0, 40.0, 0.048_790_164_169_432_003_065_4),
            (40.0, 42.0, -0.048_790_164_169_432_003_065_4),
            (1.5e308, 1e308, 0.405_465_108_108_164_381_978),
            (1.7e308, 1.6e308, 0.060_624_621_816_434_820_567_7),
            (3e-310, 2e-310, 0.405_465_108_108_164_381_978),
            (100.0, 100.000_000_01, -9.999_993_721_476_353_017_74e-11),
            (0.7, 1.3, -0.619_039_208_406_223_528_55),
            (1.3, 0.7, 0.619_039_208_406_223_528_55),
        ];
        for (a, b, want) in cases {
            let ulps = (ln_ratio_near_one(a, b) - want).abs() / (libm::fabs(want) * f64::EPSILON);
            assert!(ulps <= 3.0, "ln({a}/{b}) off by {ulps} ulps");
        }
    }
}
