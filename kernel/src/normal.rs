//! The standard normal distribution: Φ, φ and the scaled complementary error function.
//!
//! Everything here is built on `libm::erfc` and `libm::exp` (the FreeBSD/Sun
//! fdlibm implementations, themselves after W. J. Cody's rational Chebyshev
//! approximations), which are accurate to about one ulp over their whole range.

use core::f64::consts::FRAC_1_SQRT_2;

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
pub(crate) fn norm_cdf(z: f64) -> f64 {
    0.5 * libm::erfc(-z * FRAC_1_SQRT_2)
}

/// a·b = p + e exactly, with p the rounded product.
///
/// # Source
/// T. J. Dekker, "A floating-point technique for extending the available
/// precision", *Numer. Math.* 18 (1971) 224–242 (Veltkamp's splitting). Used
/// instead of a fused multiply-add, which `libm` emulates in software on the
/// default x86-64 target. Products beyond 1e290 (where the splitting would
/// overflow) come back with e = 0.
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

/// erfcx(x) = exp(x²)·erfc(x) for x ≥ 0, the scaled complementary error function.
///
/// # Formula
/// For x < 26: erfc(x)·exp(x²), where x² is split exactly into hi + lo
/// ([`two_product`]) so that exp(x²) = exp(hi)·(1 + lo) loses nothing to the
/// rounding of x². For x ≥ 26: the asymptotic series
/// erfcx(x) = 1/(x√π)·Σₙ (−1)ⁿ (2n−1)!!/(2x²)ⁿ, truncated after n = 7, whose
/// first omitted term is below 2·10⁻¹⁹.
///
/// # Source
/// M. Abramowitz and I. A. Stegun, *Handbook of Mathematical Functions*
/// (NBS, 1964), eq. 7.1.23 (the asymptotic series).
///
/// # Accuracy
/// About three ulps: one each from `erfc`, `exp` and the product.
pub(crate) fn scaled_erfc(x: f64) -> f64 {
    if x < ASYMPTOTIC_FROM {
        let (hi, lo) = two_product(x, x);
        libm::erfc(x) * libm::exp(hi) * (1.0 + lo)
    } else {
        let u = 1.0 / (2.0 * x * x);
        // Horner form of Σ (−1)ⁿ (2n−1)!! uⁿ for n = 0..=7.
        let series = 1.0
            - u * (1.0
                - u * (3.0
                    - u * (5.0 * 3.0
                        - u * (7.0 * 15.0
                            - u * (9.0 * 105.0 - u * (11.0 * 945.0 - u * (13.0 * 10395.0)))))));
        INV_SQRT_PI / x * series
    }
}

#[cfg(test)]
mod tests {
    use super::*;

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
