//! European price and delta in fixed-point arithmetic, for hosts without an FPU.
//!
//! Feature `fixed`. Every value is an [`Fix`] (`fixed::types::I64F64`): a
//! signed 128-bit word with 64 integer and 64 fraction bits, so a resolution
//! of 2⁻⁶⁴ ≈ 5.4e-20 and a range of ±9.2e18. No floating-point arithmetic is
//! done anywhere in this module (`clippy::float_arithmetic` is denied here);
//! all of it is integer arithmetic on 128-bit words (products and quotients
//! through the `fixed` crate's exact 256-bit intermediates, truncated).
//! Converting to and from `f64` is the caller's business.
//!
//! # Formula
//! V = ω·(S·e^(−qT)·Φ(ω·d1) − K·e^(−rT)·Φ(ω·d2)), ω = +1 for a call and −1
//! for a put, d1,2 = (ln(S/K) + (r − q)T)/(σ√T) ± σ√T/2; delta = ω·e^(−qT)·Φ(ω·d1).
//! At zero expiry or vol the price is the (discounted) intrinsic value, as in
//! [`crate::price`].
//!
//! # Accuracy
//! Each operation's bound is in its rustdoc, in units of the resolution
//! u = 2⁻⁶⁴; they add up to an absolute error below 1e-15·max(S, K) on the
//! price over spot/strike 0.5–2, expiry 1 day–5 years and vol 5–100 %, so a
//! price of at least 1e-4 of the strike is within a relative 1e-8 of the `f64`
//! kernel (test `ref_fixed_sweep`, measured worst case in the README).
#![deny(clippy::float_arithmetic)]

use ::fixed::types::I64F64;

use crate::contract::Kind;
use crate::error::{Error, Field};

/// The fixed-point number of this module: 64 integer and 64 fraction bits.
pub type Fix = I64F64;

/// A European option and its market in fixed point.
///
/// # Examples
/// ```
/// use calor::fixed::{price, Fix, FixedInputs};
/// use calor::Kind;
/// let inputs = FixedInputs {
///     kind: Kind::Call,
///     spot: Fix::from_num(42),
///     strike: Fix::from_num(40),
///     expiry: Fix::from_num(1) / 2,
///     rate: Fix::from_num(1) / 10,
///     dividend_yield: Fix::ZERO,
///     vol: Fix::from_num(1) / 5,
/// };
/// let v = price(&inputs)?;
/// assert!((v - Fix::lit("4.759422392871")).abs() < Fix::lit("1e-10"));
/// # Ok::<(), calor::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FixedInputs {
    /// Call or put.
    pub kind: Kind,
    /// Spot, > 0.
    pub spot: Fix,
    /// Strike, > 0.
    pub strike: Fix,
    /// Time to expiry in years, ≥ 0.
    pub expiry: Fix,
    /// Rate, continuously compounded.
    pub rate: Fix,
    /// Dividend yield, continuously compounded.
    pub dividend_yield: Fix,
    /// Volatility per 1.00, ≥ 0.
    pub vol: Fix,
}

/// ln 2, rounded to the nearest multiple of u.
const LN_2: Fix = Fix::from_bits(0xB172_17F7_D1CF_79AC);
/// 1/√(2π), rounded to the nearest multiple of u.
const FRAC_1_SQRT_2PI: Fix = Fix::from_bits(0x6621_14CF_50D9_4234);
/// √2, rounded to the nearest multiple of u.
const SQRT_2: Fix = Fix::from_bits(0x1_6A09_E667_F3BC_C909);
const ONE: Fix = Fix::ONE;
const HALF: Fix = Fix::from_bits(1 << 63);
/// Below this |x| Φ uses its Taylor series, above it the continued fraction.
const SERIES_BELOW: Fix = Fix::from_bits(4 << 64);
/// Beyond this |x| Φ(−|x|) < 1e-300: it reads as 0 (and 1 on the other side).
const TAIL_ZERO: Fix = Fix::from_bits(40 << 64);

fn mul(a: Fix, b: Fix) -> Fix {
    a.saturating_mul(b)
}

/// a/b, saturating; b = 0 gives the saturated value of a's sign.
fn div(a: Fix, b: Fix) -> Fix {
    a.checked_div(b)
        .unwrap_or(if a < Fix::ZERO { Fix::MIN } else { Fix::MAX })
}

/// e^x.
///
/// # Formula
/// x = k·ln 2 + r with |r| ≤ ln 2/2, e^r by its Taylor series to the first
/// term below u, then a shift by k bits.
///
/// # Accuracy
/// Relative error ≤ 32·u·(1 + |x|) for e^x ≥ 2⁻³²: the reduction rounds k·ln 2
/// by |k|/2 u, each of the ≤ 20 series terms by one u. Saturates above
/// x ≈ 43.6 and returns 0 below x ≈ −44.4.
pub fn exp(x: Fix) -> Fix {
    let k = div(x, LN_2).round().to_num::<i64>();
    if k > 62 {
        return Fix::MAX;
    }
    if k < -64 {
        return Fix::ZERO;
    }
    let r = x.saturating_sub(mul(Fix::from_num(k), LN_2));
    let mut term = ONE;
    let mut sum = ONE;
    for n in 1..=24_i32 {
        term = div(mul(term, r), Fix::from_num(n));
        if term == Fix::ZERO {
            break;
        }
        sum = sum.saturating_add(term);
    }
    if k >= 0 {
        sum.checked_shl(k as u32).unwrap_or(Fix::MAX)
    } else {
        sum >> k.unsigned_abs() as u32
    }
}

/// ln x for x > 0 (`None` for x ≤ 0).
///
/// # Formula
/// x = m·2^k with m ∈ [1/√2, √2), ln m = 2·atanh z, z = (m − 1)/(m + 1),
/// |z| ≤ 0.172, by its series to the first term below u.
///
/// # Accuracy
/// Absolute error ≤ 16·u + |k|/2·u (k ≤ 64): the series takes ≤ 14 terms.
pub fn ln(x: Fix) -> Option<Fix> {
    if x <= Fix::ZERO {
        return None;
    }
    let mut k = x.int_log2();
    let mut m = if k >= 0 {
        x >> k as u32
    } else {
        x << k.unsigned_abs()
    };
    if m > SQRT_2 {
        m >>= 1_u32;
        k += 1;
    }
    let z = div(m - ONE, m + ONE);
    let z2 = mul(z, z);
    let mut power = z;
    let mut sum = z;
    for n in (3..=41_i32).step_by(2) {
        power = mul(power, z2);
        let term = div(power, Fix::from_num(n));
        if term == Fix::ZERO {
            break;
        }
        sum += term;
    }
    Some(mul(Fix::from_num(k), LN_2).saturating_add(sum << 1_u32))
}

/// √x for x ≥ 0 (`None` for x < 0): the `fixed` crate's, truncated.
///
/// # Accuracy
/// Absolute error < u.
pub fn sqrt(x: Fix) -> Option<Fix> {
    x.checked_sqrt()
}

/// Φ(x), the standard normal distribution function.
///
/// # Formula
/// For |x| < 4, Φ(x) = ½ + φ-weighted Taylor series
/// (1/√(2π))·Σ (−1)ⁿ x^(2n+1)/(2ⁿ n! (2n+1)), summed until a term is below u.
/// For |x| ≥ 4, Φ(−|x|) = φ(x)·R(|x|) with the Mills ratio R by its continued
/// fraction R(x) = 1/(x + 1/(x + 2/(x + 3/(x + …)))), 120 levels evaluated
/// from the bottom; Φ(|x|) = 1 − Φ(−|x|).
///
/// # Accuracy
/// Absolute error ≤ 2e-17 for |x| < 4 (the largest series term is below 120,
/// so cancellation costs at most 7 bits of the 64, over ≤ 60 terms);
/// ≤ 1e-18 for |x| ≥ 4 (the truncated fraction's relative error is below
/// 1e-12 at x = 4 and Φ(−4) ≈ 3.2e-5).
pub fn norm_cdf(x: Fix) -> Fix {
    let a = x.abs();
    if a >= TAIL_ZERO {
        return if x < Fix::ZERO { Fix::ZERO } else { ONE };
    }
    if a < SERIES_BELOW {
        let x2_half = mul(x, x) >> 1_u32;
        let mut power = x;
        let mut sum = x;
        for n in 1..=80_i32 {
            power = div(mul(power, x2_half), Fix::from_num(n)).saturating_neg();
            let term = div(power, Fix::from_num(2 * n + 1));
            if term == Fix::ZERO {
                break;
            }
            sum += term;
        }
        return HALF.saturating_add(mul(FRAC_1_SQRT_2PI, sum));
    }
    let mut tail = a;
    for n in (1..=120_i32).rev() {
        tail = a.saturating_add(div(Fix::from_num(n), tail));
    }
    let density = mul(FRAC_1_SQRT_2PI, exp((mul(a, a) >> 1_u32).saturating_neg()));
    let lower = div(density, tail);
    if x < Fix::ZERO {
        lower
    } else {
        ONE - lower
    }
}

/// Price and delta, computed together.
///
/// # Errors
/// [`Error::NotPositive`] for spot or strike ≤ 0, [`Error::Negative`] for a
/// negative expiry or vol, [`Error::Overflow`] if a discount factor or the
/// result saturates the format.
///
/// # Examples
/// ```
/// use calor::fixed::{price_delta, Fix, FixedInputs};
/// use calor::Kind;
/// let inputs = FixedInputs {
///     kind: Kind::Put,
///     spot: Fix::from_num(100),
///     strike: Fix::from_num(95),
///     expiry: Fix::from_num(1) / 2,
///     rate: Fix::from_num(1) / 10,
///     dividend_yield: Fix::from_num(1) / 20,
///     vol: Fix::from_num(1) / 5,
/// };
/// let (v, delta) = price_delta(&inputs)?;
/// assert!((v - Fix::lit("2.464787646755")).abs() < Fix::lit("1e-10"));
/// assert!(delta < Fix::ZERO);
/// # Ok::<(), calor::Error>(())
/// ```
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn price_delta(inputs: &FixedInputs) -> Result<(Fix, Fix), Error> {
    let FixedInputs {
        kind,
        spot,
        strike,
        expiry,
        rate,
        dividend_yield,
        vol,
    } = *inputs;
    if spot <= Fix::ZERO {
        return Err(Error::NotPositive { field: Field::Spot });
    }
    if strike <= Fix::ZERO {
        return Err(Error::NotPositive {
            field: Field::Strike,
        });
    }
    if expiry < Fix::ZERO {
        return Err(Error::Negative {
            field: Field::Expiry,
        });
    }
    if vol < Fix::ZERO {
        return Err(Error::Negative { field: Field::Vol });
    }
    let omega = match kind {
        Kind::Call => ONE,
        Kind::Put => -ONE,
    };
    let dq = exp(mul(dividend_yield, expiry).saturating_neg());
    let dr = exp(mul(rate, expiry).saturating_neg());
    let spot_leg = mul(spot, dq);
    let strike_leg = mul(strike, dr);
    if [dq, dr, spot_leg, strike_leg].contains(&Fix::MAX) {
        return Err(Error::Overflow);
    }
    let s = mul(vol, sqrt(expiry).unwrap_or(Fix::ZERO));
    if s == Fix::ZERO {
        if expiry == Fix::ZERO {
            let intrinsic = mul(omega, spot - strike).max(Fix::ZERO);
            let delta = if intrinsic > Fix::ZERO {
                omega
            } else {
                Fix::ZERO
            };
            return Ok((intrinsic, delta));
        }
        let intrinsic = mul(omega, spot_leg - strike_leg).max(Fix::ZERO);
        let delta = if intrinsic > Fix::ZERO {
            mul(omega, dq)
        } else {
            Fix::ZERO
        };
        return Ok((intrinsic, delta));
    }
    let log_moneyness =
        ln(div(spot, strike)).ok_or(Error::Overflow)? + mul(rate - dividend_yield, expiry);
    let d1 = div(log_moneyness, s) + (s >> 1_u32);
    let d2 = d1 - s;
    let n1 = norm_cdf(mul(omega, d1));
    let n2 = norm_cdf(mul(omega, d2));
    let value = mul(omega, mul(spot_leg, n1) - mul(strike_leg, n2)).max(Fix::ZERO);
    let delta = mul(omega, mul(dq, n1));
    if value == Fix::MAX {
        return Err(Error::Overflow);
    }
    Ok((value, delta))
}

/// Price of a European option in fixed point.
///
/// # Errors
/// As [`price_delta`].
///
/// # Examples
/// See [`FixedInputs`].
pub fn price(inputs: &FixedInputs) -> Result<Fix, Error> {
    price_delta(inputs).map(|(v, _)| v)
}

/// Delta ∂V/∂S of a European option in fixed point.
///
/// # Errors
/// As [`price_delta`].
///
/// # Examples
/// See [`price_delta`].
pub fn delta(inputs: &FixedInputs) -> Result<Fix, Error> {
    price_delta(inputs).map(|(_, d)| d)
}
