//! The standard normal distribution: Φ, φ and the complementary error function.
//!
//! erfc and its scaled form erfcx use the rational approximations of the
//! FreeBSD/Sun fdlibm `erfc` (themselves after W. J. Cody's rational Chebyshev
//! approximations), evaluated here for latency: Estrin's scheme instead of
//! Horner's rule and, in the tail, one exponential of an exactly formed
//! argument instead of fdlibm's two. Exponentials come from `elementary::exp`.

use core::f64::consts::FRAC_1_SQRT_2;

use crate::elementary::exp;

/// 1/√(2π).
pub(crate) const INV_SQRT_2PI: f64 = 0.398_942_280_401_432_7;
/// 1/√π.
const INV_SQRT_PI: f64 = 0.564_189_583_547_756_3;
/// Above this argument `erfc` is close to underflow and the asymptotic series
/// of `erfcx` converges to full precision in eight terms.
const ASYMPTOTIC_FROM: f64 = 26.0;

/// Φ(z), the standard normal cumulative distribution function.
///
/// # Formula
/// Φ(z) = erfc(−z/√2)/2, which keeps full relative accuracy in the lower tail
/// (no 1 − x cancellation) down to the underflow of `erfc` near z = −38.4.
///
/// # Accuracy
/// A few ulps, plus the conditioning of the argument: a relative error δ in z
/// becomes a relative error of about z²·δ in Φ(z) in the lower tail.
#[inline]
pub(crate) fn norm_cdf(z: f64) -> f64 {
    0.5 * erfc(-z * FRAC_1_SQRT_2)
}

/// erfc(x) for x ≥ 0 given x² as well (`square`, formed beside x), so that
/// where the first rational applies it need not wait for x.
///
/// # Formula
/// Below x = 0.84375 fdlibm's first rational is a function of x², so it is
/// evaluated from `square` and only the final erfc(x) = 1 − (x + x·P/Q) waits
/// for x. Elsewhere it is [`erfc`] of x. A caller with u and x = √u passes u.
///
/// # Accuracy
/// As [`erfc`] of x. Against erfc(√u) for x = √u rounded: d ln erfc/dx is
/// about −2x in the tail, so the root's relative rounding of at most ε/2 is a
/// relative error of up to u·ε in erfc. Within 3 + u ulps of erfc(√u) in the
/// test `edge_erfc_with_square_against_reference`.
#[inline]
pub(crate) fn erfc_with_square(x: f64, square: f64) -> f64 {
    if x < FIRST_RATIONAL_BELOW {
        first_range(x, square)
    } else {
        erfc(x)
    }
}

/// erfc(x) for |x| < 0.84375 from x and its square.
#[inline]
fn first_range(x: f64, square: f64) -> f64 {
    let y = fdlibm::first(square);
    // fdlibm's two forms, 1 − (x + x·y) below ¼ and ½ − (x − ½ + x·y)
    // above, differ by a constant: selected as a mask, not a branch (in a
    // book of mixed strikes the side of ¼ is a coin toss; the mispredicted
    // branch cost `calor::price` 5–10 % near the money). Bit for bit the same.
    let shift = if x < 0.25 { 0.0 } else { 0.5 };
    (1.0 - shift) - (x - shift + x * y)
}

/// Below this |x|, fdlibm's first rational (in x²) approximates erfc.
const FIRST_RATIONAL_BELOW: f64 = 0.84375;
/// From here on erfc(x) underflows (erfc(28) ≈ 6·10⁻³⁴³).
const UNDERFLOW_FROM: f64 = 28.0;

/// erfc(x), the complementary error function.
///
/// # Formula
/// fdlibm's ranges and approximations, with c = 0.84506291151 (`ERX`):
/// - |x| < 0.84375: erfc(x) = 1 − x·(1 + P(x²)/Q(x²)), rearranged as fdlibm
///   does for x ≥ 1/4 so that nothing cancels.
/// - 0.84375 ≤ |x| < 1.25: erfc(|x|) = 1 − c − P(|x| − 1)/Q(|x| − 1).
/// - 1.25 ≤ |x| < 28: erfc(|x|) = exp(e − x²)/|x| with e = R/S − 0.5625, the
///   rational of [`scaled_erfc`]'s middle range; x² is split exactly ([`two_product`]) and e − x²
///   summed exactly ([`two_sum`]), so one exponential of the rounded sum times
///   (1 + its tails) does what fdlibm's two exponentials do.
/// - Negative x: erfc(x) = 2 − erfc(|x|) from 0.84375 on.
///
/// # Source
/// Sun Microsystems' fdlibm `s_erf.c` (1993), as carried by the `libm` crate
/// (coefficients in `fdlibm` below, under their notice).
///
/// # Accuracy
/// Within 2 ulps of mpmath at 40 digits (1.995 worst, fdlibm's own 1.61) over
/// 20,000 evenly spaced points of [−6, 27.5] and 10,000 random ones of
/// [−1.3, 1.3] (`edge_erfc_against_reference` holds points on both sides of
/// every switch to 3 ulps).
#[inline]
pub(crate) fn erfc(x: f64) -> f64 {
    let a = libm::fabs(x);
    if a < FIRST_RATIONAL_BELOW {
        first_range(x, x * x)
    } else if a < RATIONAL_FROM {
        let p = fdlibm::second(a - 1.0);
        if x > 0.0 {
            1.0 - fdlibm::ERX - p
        } else {
            1.0 + fdlibm::ERX + p
        }
    } else if a < UNDERFLOW_FROM {
        let (e, inv) = rational_parts(a);
        let (square, square_tail) = two_product(a, a);
        // a < 28, so the sum is finite (unlike the decay of the wing terms).
        let (sum, tail) = two_sum(e, -square);
        // The factor is formed while the exponential runs.
        let v = exp(sum) * ((1.0 + (tail - square_tail)) * inv);
        if x > 0.0 {
            v
        } else {
            2.0 - v
        }
    } else if x > 0.0 {
        0.0
    } else if x < 0.0 {
        2.0
    } else {
        x // NaN
    }
}

/// a·b = p + e exactly, with p the rounded product.
///
/// # Source
/// T. J. Dekker, "A floating-point technique for extending the available
/// precision", *Numer. Math.* 18 (1971) 224–242 (Veltkamp's splitting). Used
/// instead of a fused multiply-add, which `libm` emulates in software on the
/// default x86-64 target. Products beyond 1e290 (where the splitting would
/// overflow) come back with e = 0.
#[inline]
pub(crate) fn two_product(a: f64, b: f64) -> (f64, f64) {
    const SPLITTER: f64 = 134_217_729.0; // 2^27 + 1
    let p = a * b;
    if !(libm::fabs(p) < 1e290 && libm::fabs(a) < 1e290 && libm::fabs(b) < 1e290) {
        return (p, 0.0);
    }
    let split = |v: f64| {
        let c = SPLITTER * v;
        let hi = c - (c - v);
        (hi, v - hi)
    };
    let (ah, al) = split(a);
    let (bh, bl) = split(b);
    let e = ((ah * bh - p) + ah * bl + al * bh) + al * bl;
    (p, e)
}

/// a + b = s + e exactly, with s the rounded sum.
///
/// # Source
/// D. E. Knuth, *The Art of Computer Programming*, vol. 2, 3rd ed.
/// (Addison-Wesley, 1997), §4.2.2, Theorem B.
#[inline]
pub(crate) fn two_sum(a: f64, b: f64) -> (f64, f64) {
    let s = a + b;
    let b_part = s - a;
    (s, (a - (s - b_part)) + (b - b_part))
}

/// Below this argument erfcx is formed from `erfc` (cheap there); from it on,
/// directly from the rational approximation that `erfc` itself uses.
const RATIONAL_FROM: f64 = 1.25;
/// Where the two rational approximations of erfcx meet (1/0.35).
const SECOND_RATIONAL_FROM: f64 = 2.857_142_857_142_857;

/// erfcx(x) = exp(x²)·erfc(x) for x ≥ 0, the scaled complementary error function.
///
/// # Formula
/// - x < 1.25: erfc(x)·exp(x²), where x² is split exactly into hi + lo
///   ([`two_product`]) so that exp(x²) = exp(hi)·(1 + lo) loses nothing to the
///   rounding of x².
/// - 1.25 ≤ x < 26: erfcx(x) = exp(R(s)/S(s) − 0.5625)/x with s = 1/x², the
///   rational approximations of fdlibm's `erfc` on [1.25, 1/0.35) and
///   [1/0.35, 28), where `erfc` computes exp(−x² − 0.5625 + R/S)/x. Leaving out
///   the factor exp(−x²) saves the two exponentials `erfc` spends on it. R/S
///   is evaluated in x² (numerator and denominator multiplied through by
///   x¹⁶), so that 1/x is needed only for the final factor.
/// - x ≥ 26: the asymptotic series
///   erfcx(x) = 1/(x√π)·Σₙ (−1)ⁿ (2n−1)!!/(2x²)ⁿ, truncated after n = 7, whose
///   first omitted term is below 2·10⁻¹⁹.
///
/// # Source
/// Sun Microsystems' fdlibm `s_erf.c` (1993), as carried by the `libm` crate,
/// for R and S (coefficients below, under their notice); M. Abramowitz and
/// I. A. Stegun, *Handbook of Mathematical Functions* (NBS, 1964), eq. 7.1.23
/// (the asymptotic series).
///
/// # Accuracy
/// Against mpmath at 40 digits: 1.6 ulps worst over 10,000 evenly spaced
/// points of [0, 30], and 2.03 over 5,000 random points of [1.2, 3], around
/// the switches; the test `edge_scaled_erfc_against_reference` holds 12
/// points, on both sides of every switch, to 3 ulps.
#[inline]
pub(crate) fn scaled_erfc(x: f64) -> f64 {
    let (e, m) = scaled_erfc_parts(x);
    m * exp(e)
}

/// erfcx(x) as a pair (e, m) with erfcx(x) = m·exp(e), for the formulas of
/// [`scaled_erfc`]; a caller with a further exponential factor folds it into
/// e and spends one exponential on both.
#[inline]
pub(crate) fn scaled_erfc_parts(x: f64) -> (f64, f64) {
    if x < RATIONAL_FROM {
        let (hi, lo) = two_product(x, x);
        (hi, erfc(x) * (1.0 + lo))
    } else if x < ASYMPTOTIC_FROM {
        rational_parts(x)
    } else {
        let u = 1.0 / (2.0 * x * x);
        // Horner form of Σ (−1)ⁿ (2n−1)!! uⁿ for n = 0..=7.
        let series = 1.0
            - u * (1.0
                - u * (3.0
                    - u * (5.0 * 3.0
                        - u * (7.0 * 15.0
                            - u * (9.0 * 105.0 - u * (11.0 * 945.0 - u * (13.0 * 10395.0)))))));
        (0.0, INV_SQRT_PI / x * series)
    }
}

/// (R/S − 0.5625, 1/x) for 1.25 ≤ x < 28: erfc(x) = exp(R/S − 0.5625 − x²)/x.
#[inline]
fn rational_parts(x: f64) -> (f64, f64) {
    // The rational in s = 1/x², evaluated in x² itself: 1/x is then off the
    // critical path (only the final factor needs it).
    let square = x * x;
    let ratio = if x < SECOND_RATIONAL_FROM {
        fdlibm::ratio_a(square)
    } else {
        fdlibm::ratio_b(square)
    };
    (ratio - 0.5625, 1.0 / x)
}

/// The rational approximations of fdlibm's `erfc`.
///
/// ```text
/// Copyright (C) 1993 by Sun Microsystems, Inc. All rights reserved.
///
/// Developed at SunPro, a Sun Microsystems, Inc. business.
/// Permission to use, copy, modify, and distribute this
/// software is freely granted, provided that this notice
/// is preserved.
/// ```
mod fdlibm {
    /// erfc(x) = 1 − c − P/Q on [0.84375, 1.25), in s = |x| − 1.
    pub(super) const ERX: f64 = 8.450_629_115_104_675_292_97e-01;
    /// P(z)/Q(z) on [0, 0.84375), in z = x² (P padded with zeros).
    const PP: [f64; 8] = [
        1.283_791_670_955_125_585_61e-01,
        -3.250_421_072_470_014_993_70e-01,
        -2.848_174_957_559_851_047_66e-02,
        -5.770_270_296_489_441_591_57e-03,
        -2.376_301_665_665_016_260_84e-05,
        0.0,
        0.0,
        0.0,
    ];
    const QQ: [f64; 8] = [
        1.0,
        3.979_172_239_591_553_528_19e-01,
        6.502_224_998_876_729_444_85e-02,
        5.081_306_281_875_765_627_76e-03,
        1.324_947_380_043_216_445_26e-04,
        -3.960_228_278_775_368_123_20e-06,
        0.0,
        0.0,
    ];
    /// P(s)/Q(s) on [0.84375, 1.25), in s = |x| − 1.
    const PA: [f64; 8] = [
        -2.362_118_560_752_659_440_77e-03,
        4.148_561_186_837_483_316_66e-01,
        -3.722_078_760_357_013_238_47e-01,
        3.183_466_199_011_617_536_74e-01,
        -1.108_946_942_823_966_774_76e-01,
        3.547_830_432_561_823_593_71e-02,
        -2.166_375_594_868_790_843_00e-03,
        0.0,
    ];
    const QA: [f64; 8] = [
        1.0,
        1.064_208_804_008_442_282_86e-01,
        5.403_979_177_021_710_489_37e-01,
        7.182_865_441_419_626_628_68e-02,
        1.261_712_198_087_616_421_12e-01,
        1.363_708_391_202_905_073_62e-02,
        1.198_449_984_679_910_741_70e-02,
        0.0,
    ];
    const RA: [f64; 8] = [
        -9.864_944_034_847_148_227_05e-03,
        -6.938_585_727_071_817_643_72e-01,
        -1.055_862_622_532_329_098_14e+01,
        -6.237_533_245_032_600_603_96e+01,
        -1.623_966_694_625_734_703_55e+02,
        -1.846_050_929_067_110_359_94e+02,
        -8.128_743_550_630_659_342_46e+01,
        -9.814_329_344_169_145_485_92e+00,
    ];
    const SA: [f64; 8] = [
        1.965_127_166_743_925_712_92e+01,
        1.376_577_541_435_190_426_00e+02,
        4.345_658_774_752_292_288_21e+02,
        6.453_872_717_332_678_803_36e+02,
        4.290_081_400_275_678_333_86e+02,
        1.086_350_055_417_794_351_34e+02,
        6.570_249_770_319_281_701_35e+00,
        -6.042_441_521_485_809_874_38e-02,
    ];
    /// fdlibm's 7 coefficients, padded with a zero to the length of [`RA`].
    const RB: [f64; 8] = [
        -9.864_942_924_700_099_285_97e-03,
        -7.992_832_376_805_230_065_74e-01,
        -1.775_795_491_775_475_198_89e+01,
        -1.606_363_848_558_219_160_62e+02,
        -6.375_664_433_683_896_277_22e+02,
        -1.025_095_131_611_077_249_54e+03,
        -4.835_191_916_086_513_970_19e+02,
        0.0,
    ];
    /// As [`RB`].
    const SB: [f64; 8] = [
        3.033_806_074_348_245_829_24e+01,
        3.257_925_129_965_739_188_26e+02,
        1.536_729_586_084_436_959_94e+03,
        3.199_858_219_508_595_539_08e+03,
        2.553_050_406_433_164_425_83e+03,
        4.745_285_412_069_553_672_15e+02,
        -2.244_095_244_658_581_833_62e+01,
        0.0,
    ];

    /// Σ cᵢ·sⁱ by Estrin's scheme: the same work as Horner's rule in three
    /// dependent steps instead of seven (the rational sits on the critical
    /// path of every wing price). The coefficients of each polynomial share
    /// one sign but the last, or shrink fast with s, so no grouping cancels.
    ///
    /// # Source
    /// G. Estrin, "Organization of computer systems: the fixed plus variable
    /// structure computer", *Proc. Western Joint Computer Conf.* (1960) 33–40.
    fn estrin(c: &[f64; 8], s: f64) -> f64 {
        let [c0, c1, c2, c3, c4, c5, c6, c7] = *c;
        let s2 = s * s;
        let s4 = s2 * s2;
        ((c0 + c1 * s) + s2 * (c2 + c3 * s)) + s4 * ((c4 + c5 * s) + s2 * (c6 + c7 * s))
    }

    /// P/Q on [0, 0.84375), z = x².
    pub(super) fn first(z: f64) -> f64 {
        estrin(&PP, z) / estrin(&QQ, z)
    }

    /// P/Q on [0.84375, 1.25), s = |x| − 1, by Horner's rule: its
    /// coefficients alternate in sign and s does too, and Estrin's grouping
    /// there costs 0.65 ulp of erfc (2.26 against fdlibm's 1.61) for no
    /// measurable speed.
    pub(super) fn second(s: f64) -> f64 {
        let horner = |c: &[f64; 8]| c.iter().rev().fold(0.0, |acc, &ci| acc * s + ci);
        horner(&PA) / horner(&QA)
    }

    /// Σ cᵢ·y⁷⁻ⁱ, the polynomial of [`estrin`] with its coefficients
    /// reversed: P(1/y)·y⁷.
    fn estrin_reversed(c: &[f64; 8], y: f64) -> f64 {
        let [c7, c6, c5, c4, c3, c2, c1, c0] = *c;
        estrin(&[c0, c1, c2, c3, c4, c5, c6, c7], y)
    }

    /// R(s)/(1 + s·S(s)) with s = 1/y, multiplied through by y⁸:
    /// y·R̃(y)/(y⁸ + S̃(y)) with R̃, S̃ the reversed polynomials. For y ≥ 1.5
    /// every term keeps the sign of its polynomial's leading one (the two
    /// constant terms of opposite sign are below 10⁻⁶ of the rest).
    fn ratio_in_square(r: &[f64; 8], q: &[f64; 8], y: f64) -> f64 {
        let y2 = y * y;
        let y8 = (y2 * y2) * (y2 * y2);
        y * estrin_reversed(r, y) / (y8 + estrin_reversed(q, y))
    }

    /// R/S on [1.25, 1/0.35), from y = x².
    pub(super) fn ratio_a(y: f64) -> f64 {
        ratio_in_square(&RA, &SA, y)
    }

    /// R/S on [1/0.35, 28), from y = x².
    pub(super) fn ratio_b(y: f64) -> f64 {
        ratio_in_square(&RB, &SB, y)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn edge_erfc_against_reference() {
        // erfc at exact f64 arguments on both sides of every switch (and of
        // the sign), from mpmath 1.3.0 at 40 digits, rounded to 21.
        let cases = [
            (-5.5, 1.999_999_999_999_992_642_15),
            (-1.25, 1.922_900_128_256_458_230_14),
            (-1.249_999_999_999_999_8, 1.922_900_128_256_458_177_62),
            (-0.843_75, 1.767_225_661_232_341_633_46),
            (-0.843_749_999_999_999_9, 1.767_225_661_232_341_571_99),
            (-0.1, 1.112_462_916_018_284_898_4),
            (1e-10, 0.999_999_999_887_162_083_29),
            (0.249_999_999_999_999_97, 0.723_673_609_831_763_096_436),
            (0.25, 0.723_673_609_831_763_067_015),
            (0.843_749_999_999_999_9, 0.232_774_338_767_658_428_014),
            (0.843_75, 0.232_774_338_767_658_366_541),
            (1.0, 0.157_299_207_050_285_130_659),
            (1.249_999_999_999_999_8, 0.077_099_871_743_541_822_381_7),
            (1.25, 0.077_099_871_743_541_769_863_5),
            (2.0, 0.004_677_734_981_047_265_837_93),
            (2.857_142_857_142_857, 5.331_231_138_832_279_427_07e-5),
            (2.857_142_857_142_857_7, 5.331_231_138_832_265_149_17e-5),
            (5.5, 7.357_847_917_974_398_063_07e-15),
            (12.0, 1.356_261_169_205_904_212_78e-64),
            (26.5, 2.210_907_664_263_734_275_93e-307),
        ];
        for (x, want) in cases {
            let ulps = (erfc(x) - want).abs() / (want * f64::EPSILON);
            assert!(ulps <= 3.0, "erfc({x}) off by {ulps} ulps");
        }
    }

    #[test]
    fn edge_erfc_with_square_against_reference() {
        // erfc(√u) at exact f64 u (of the exact root, not the rounded one) on
        // both sides of the switches at u = 1/16, 0.84375² and 1.25², from
        // mpmath 1.3.0 at 40 digits, rounded to 21.
        let cases = [
            (0.0, 1.0),
            (1e-20, 0.999_999_999_887_162_083_29),
            (1e-6, 0.998_871_621_209_030_763_646),
            (0.062_499_999_999_999_99, 0.723_673_609_831_763_081_726),
            (0.0625, 0.723_673_609_831_763_067_015),
            (0.3, 0.438_578_026_080_999_863_522),
            (0.711_914_062_499_999_9, 0.232_774_338_767_658_402_97),
            (0.711_914_062_5, 0.232_774_338_767_658_366_541),
            (1.0, 0.157_299_207_050_285_130_659),
            (1.562_499_999_999_999_8, 0.077_099_871_743_541_790_870_8),
            (1.5625, 0.077_099_871_743_541_769_863_5),
            (4.0, 0.004_677_734_981_047_265_837_93),
            (30.0, 9.485_737_571_073_848_388_48e-15),
            (700.0, 2.101_014_516_264_217_495_04e-306),
        ];
        for (u, want) in cases {
            let ulps = (erfc_with_square(libm::sqrt(u), u) - want).abs() / (want * f64::EPSILON);
            // The rounding of √u, a relative ε/2, moves erfc by about u·ε.
            assert!(ulps <= 3.0 + u, "erfc(√{u}) off by {ulps} ulps");
        }
    }

    #[test]
    fn edge_erfc_limits() {
        assert_eq!(erfc(f64::INFINITY), 0.0);
        assert_eq!(erfc(f64::NEG_INFINITY), 2.0);
        assert_eq!(erfc(28.0), 0.0);
        assert_eq!(erfc(-28.0), 2.0);
        assert_eq!(erfc(0.0), 1.0);
        assert!(erfc(f64::NAN).is_nan());
    }

    #[test]
    fn edge_scaled_erfc_branches_agree() {
        // Both formulas are valid on either side of the switch; they must agree there.
        let x = ASYMPTOTIC_FROM;
        let direct = libm::erfc(x) * libm::exp(x * x) * (1.0 + libm::fma(x, x, -x * x));
        assert_eq!(two_product(x, x).1, libm::fma(x, x, -x * x));
        let rel = (scaled_erfc(x) - direct).abs() / direct;
        assert!(rel < 1e-14, "relative gap {rel:e}");
    }

    #[test]
    fn edge_scaled_erfc_against_reference() {
        // erfcx at exact f64 arguments on both sides of every switch, from
        // mpmath 1.3.0 at 40 digits (erfc(x)·exp(x²)), rounded to 20.
        let cases = [
            (0.25, 0.770_346_547_730_996_743_92),
            (1.0, 0.427_583_576_155_807_004_41),
            (1.249_999_999_999_999_8, 0.367_822_916_452_361_139_29),
            (1.25, 0.367_822_916_452_361_092_93),
            (2.0, 0.255_395_676_310_505_743_87),
            (2.857_142_857_142_857, 0.187_106_376_711_470_691_25),
            (2.857_142_857_142_857_7, 0.187_106_376_711_470_664_96),
            (5.5, 0.100_962_218_399_499_088_23),
            (12.0, 0.046_854_221_014_893_762_62),
            (25.999_999_999_999_996, 0.021_683_584_850_562_909_575),
            (26.0, 0.021_683_584_850_562_906_616),
            (40.0, 0.014_100_335_983_377_813_625),
        ];
        for (x, want) in cases {
            let ulps = (scaled_erfc(x) - want).abs() / (want * f64::EPSILON);
            assert!(ulps <= 3.0, "erfcx({x}) off by {ulps} ulps");
        }
    }

    #[test]
    fn edge_two_product_is_exact() {
        for (a, b) in [
            (0.1, 0.3),
            (1.0 / 3.0, 3.0),
            (-7.77e-5, 123.456),
            (1e150, 1e-160),
        ] {
            assert_eq!(two_product(a, b), (a * b, libm::fma(a, b, -(a * b))));
        }
        assert_eq!(two_product(1e300, 10.0).1, 0.0);
    }

    #[test]
    fn edge_scaled_erfc_limits() {
        assert!((scaled_erfc(0.0) - 1.0).abs() < 1e-16);
        assert_eq!(scaled_erfc(f64::INFINITY), 0.0);
        // erfcx(x) ~ 1/(x√π) for large x.
        let x = 1e10;
        assert!((scaled_erfc(x) * x / INV_SQRT_PI - 1.0).abs() < 1e-15);
    }
}
