//! The Black–Scholes–Merton closed form, evaluated without cancellation in the tails.
//!
//! # Formula
//! With forward F = S·e^((r−q)T), log-moneyness x = ln(F/K), total volatility
//! s = σ√T, h = x/s and t = s/2, the call price is
//! V = e^(−rT)·√(FK)·b(x, s) with the normalised Black function
//! b(x, s) = e^(x/2)·Φ(h + t) − e^(−x/2)·Φ(h − t), and b_put(x, s) = b(−x, s).
//!
//! Only the out-of-the-money side (x ≤ 0 in normalised form) is ever
//! evaluated; an in-the-money price is that value plus the forward intrinsic
//! value (put–call parity), a sum of two positive numbers. Far out of the money
//! (h + t < −2) the two Φ terms would cancel, so they are rewritten with the
//! scaled complementary error function erfcx:
//! b = ½·exp(−(h² + t²)/2)·[erfcx(−(h + t)/√2) − erfcx((t − h)/√2)],
//! where the exponential factor is common to both terms and is applied last,
//! in two halves when it would underflow on its own; from t = 0.1 on it
//! already starts below h + t = −1. Near expiry (t < 0.05, or t < 0.1 and
//! h + t < −1; h + t ≥ −2, or within |x| < 0.2 below that) the two terms
//! cancel too, to about 1/t, so b is summed from its Taylor series in t
//! instead ([`small_t`]).
//!
//! # Source
//! P. Jäckel, "Let's be rational", *Wilmott* 2015(75), 40–53 (the normalised
//! Black function and its evaluation through erfcx in the lower wing);
//! F. Black and M. Scholes, "The pricing of options and corporate liabilities",
//! *J. Political Economy* 81 (1973) 637–654; R. C. Merton, "Theory of rational
//! option pricing", *Bell J. Econ.* 4 (1973) 141–183 (the dividend yield).
//!
//! # Accuracy
//! The erfcx difference loses at most a factor |h|/s ≤ κ to cancellation and
//! the Φ terms in the central region lose at most the same, so the price error
//! stays within the contract 8·ε·(1+κ)·|V| (tolerance entry `price`). Near the
//! money and near expiry it is also within 64 ulps of V itself, not scaled
//! by κ (tolerance entry `near_expiry`), the intrinsic value in the money
//! coming from the inputs ([`Setup::intrinsic`]): the
//! series a few ulps times its own condition number (below 16 for
//! h ≥ −2.25), the Φ or erfcx terms elsewhere up to about 50 ulps.
//! Deeper in the wing near expiry the erfcx difference cancels to about
//! |h|/(2t): within the contract above, not within 64 ulps of V.

use core::f64::consts::FRAC_1_SQRT_2;

pub(crate) mod small_t;

use crate::contract::{validate, Contract, Kind, Market};
use crate::elementary::{exp, exp_with_minus_one, ln_ratio_near_one};
use crate::error::Error;
use crate::normal::{norm_cdf, scaled_erfc_parts, two_product, two_sum};

/// Below this h + t the Φ terms of the central formula would lose too much:
/// each carries the rounding of its argument amplified by (h ± t)², and their
/// difference amplifies that again by |h|/s. The erfcx form applies the common
/// factor exp(−(h² + t²)/2) after the difference instead, where erfcx itself is
/// insensitive to its argument.
const ERFCX_BELOW: f64 = -2.0;

/// From t = 0.1 on, where the series in t stops ([`small_t`]), the erfcx form
/// starts higher, below this h + t. Between −2 and −1 the two terms cancel to
/// about 17 at t = 0.08 and h = −1.9 (and less as t grows) in either form, but
/// each Φ term also carries its argument's rounding amplified by (h ± t)²,
/// which erfcx does not: on 12,000 random options near the money (mpmath,
/// t from 0.02 to 0.3) the worst price there fell from 75 ulps to 28.
pub(super) const ERFCX_BELOW_PAST_SERIES: f64 = -1.0;

/// True where the normalised price is evaluated through erfcx.
pub(crate) fn erfcx_wing(h: f64, t: f64) -> bool {
    h + t < ERFCX_BELOW || (h + t < ERFCX_BELOW_PAST_SERIES && t >= small_t::SMALL_T_BELOW)
}

/// exp(−e) underflows past e ≈ 745; beyond this the factor is applied in halves.
const SPLIT_DECAY_ABOVE: f64 = 700.0;

/// Inputs of one valuation after validation, with the terms every formula shares.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Setup {
    /// +1 for a call, −1 for a put.
    pub omega: f64,
    pub spot: f64,
    pub expiry: f64,
    pub rate: f64,
    pub dividend_yield: f64,
    pub vol: f64,
    /// √T.
    pub sqrt_t: f64,
    /// s = σ√T.
    pub s: f64,
    /// x = ln(F/K).
    pub x: f64,
    /// e^(−qT).
    pub dq: f64,
    /// S·e^(−qT).
    pub spot_leg: f64,
    /// K·e^(−rT).
    pub strike_leg: f64,
    /// S·e^(−qT) − K·e^(−rT), as (S − K) + (S·(e^(−qT) − 1) − K·(e^(−rT) − 1))
    /// while the carries are small ([`DECOMPOSED_GAP_BELOW`]).
    pub forward_gap: f64,
}

impl Setup {
    /// Validates the inputs and computes the shared terms.
    #[inline]
    pub(crate) fn new(contract: &Contract, market: &Market, vol: f64) -> Result<Self, Error> {
        validate(contract, market, vol)?;
        let (spot, strike, expiry) = (market.spot, contract.strike, contract.expiry);
        let (rate, dividend_yield) = (market.rate, market.dividend_yield);
        let sqrt_t = libm::sqrt(expiry);
        let (dq, carry_q) = exp_with_minus_one(-dividend_yield * expiry);
        let (dr, carry_r) = exp_with_minus_one(-rate * expiry);
        Ok(Setup {
            // ±1 by its sign bit, not by a match on the kind: from a match the
            // compiler knows ω's two values and turns ω·v into a branch on the
            // kind, which a book of mixed calls and puts mispredicts.
            omega: f64::from_bits(
                1.0f64.to_bits() | u64::from(matches!(contract.kind, Kind::Put)) << 63,
            ),
            spot,
            expiry,
            rate,
            dividend_yield,
            vol,
            sqrt_t,
            s: vol * sqrt_t,
            x: log_moneyness(spot, strike, rate, dividend_yield, expiry),
            dq,
            spot_leg: spot * dq,
            strike_leg: strike * dr,
            forward_gap: if libm::fabs(carry_q) + libm::fabs(carry_r) < DECOMPOSED_GAP_BELOW {
                (spot - strike) + (spot * carry_q - strike * carry_r)
            } else {
                spot * dq - strike * dr
            },
        })
    }

    /// (smaller, larger) of S·e^(−qT) and K·e^(−rT): the legs of the
    /// out-of-the-money option (the call when S·e^(−qT) is the smaller).
    /// Ordered by value rather than by the sign of x, so that no branch is
    /// taken: in a book of mixed strikes the side is a coin toss that a
    /// predicted branch gets wrong about half the time. The two orders differ
    /// only where |x| is within a few ulps of 0 and the legs are equal to
    /// rounding.
    pub(crate) fn otm_legs(&self) -> (f64, f64) {
        let (a, b) = (self.spot_leg, self.strike_leg);
        // Compare-and-select, which compiles to the min/max instructions (the
        // legs are never NaN, so `f64::min`'s NaN handling would be wasted).
        (if a < b { a } else { b }, if a < b { b } else { a })
    }

    /// True when the option is in the money with respect to the forward
    /// (its own leg is the larger one), consistently with [`Setup::otm_legs`].
    pub(crate) fn in_the_money(&self) -> bool {
        self.intrinsic() > 0.0
    }

    /// The forward intrinsic value max(0, ω·(S·e^(−qT) − K·e^(−rT))), from
    /// the inputs rather than from the two rounded legs: each leg carries up
    /// to about an ulp and a half of itself, which near the money and near
    /// expiry is many ulps of the price (up to 13,779 on the near-expiry
    /// table). S − K is exact where S and K are within a factor 2, and
    /// S·(e^(−qT) − 1) and K·(e^(−rT) − 1) round relative to themselves.
    pub(crate) fn intrinsic(&self) -> f64 {
        (self.omega * self.forward_gap).max(0.0)
    }

    /// The option value.
    #[inline]
    pub(crate) fn value(&self) -> f64 {
        let (small, large) = self.otm_legs();
        let abs_x = libm::fabs(self.x);
        let otm = otm_value(abs_x, self.s, small, large);
        otm + self.intrinsic()
    }
}

/// Below this |e^(−qT) − 1| + |e^(−rT) − 1| the forward gap is decomposed as
/// (S − K) + (S·(e^(−qT) − 1) − K·(e^(−rT) − 1)), whose terms round relative
/// to themselves, at most a quarter of the legs. Above it those terms
/// approach the legs and cancel among themselves (a discount factor near 0
/// puts S·(e^(−qT) − 1) near −S), so the gap is the legs' difference.
const DECOMPOSED_GAP_BELOW: f64 = 0.25;

/// Up to this |r·T| + |q·T| the carry is summed in plain arithmetic: each
/// product is then below 1/8 and rounds by at most ε/16, so x moves by at most
/// ε/8 (an eighth of the rounding of a logarithm near 1), which no quantity in
/// the reference tables notices. Above it the products are formed exactly.
const EXACT_CARRY_ABOVE: f64 = 0.125;

/// Below this |x| with a carry of at least [`FORWARD_ROUTE_CARRY`], x is
/// taken from the forward (F within a factor 2 of K).
const FORWARD_ROUTE_BELOW: f64 = 0.69;
/// From this |(r − q)·T| on, ln(S/K) rounds at 2ε or more (|ln(S/K)| ≥ 2
/// where x is small), against about ε for the forward.
const FORWARD_ROUTE_CARRY: f64 = 2.0;

/// True where [`log_moneyness`] takes x from the forward: |x| below
/// [`FORWARD_ROUTE_BELOW`] with a carry of at least [`FORWARD_ROUTE_CARRY`].
/// Branch-free, for the batch lanes too.
#[inline]
pub(crate) fn forward_route(x: f64, carry: f64) -> bool {
    let abs = |v: f64| if v < 0.0 { -v } else { v };
    abs(x) < FORWARD_ROUTE_BELOW && abs(carry) >= FORWARD_ROUTE_CARRY
}

/// x = ln(S/K) + (r − q)·T, with the carry formed first and added to the
/// logarithm in one sum: where the forward is near the strike that sum cancels
/// and is exact (Sterbenz), so only the logarithm rounds. When the carry is
/// large it is formed exactly, as a head and a tail (Dekker's products and
/// Knuth's two-sum); added to ln(S/K) term by term it would round at the
/// magnitude of the partial sum, several ulps of x.
#[inline]
fn log_moneyness(spot: f64, strike: f64, rate: f64, dividend_yield: f64, expiry: f64) -> f64 {
    let (carry_r, carry_q) = (rate * expiry, dividend_yield * expiry);
    if libm::fabs(carry_r) + libm::fabs(carry_q) <= EXACT_CARRY_ABOVE {
        return log_ratio(spot, strike) + (carry_r - carry_q);
    }
    let (carry_q, err_q) = two_product(-dividend_yield, expiry);
    let (carry_r, err_r) = two_product(rate, expiry);
    let (carry, err_sum) = two_sum(carry_r, carry_q);
    let tail = err_sum + (err_r + err_q);
    let x = (log_ratio(spot, strike) + carry) + tail;
    if forward_route(x, carry) {
        // ln(S/K) is large and rounds at its own magnitude, which the cancelling
        // carry leaves as an error of x. The forward F = S·e^((r−q)T) rounds
        // relative to itself instead, and F − K is exact within a factor 2.
        let forward = spot * (libm::exp(carry) * (1.0 + tail));
        let direct = libm::log1p((forward - strike) / strike);
        if direct.is_finite() {
            return direct;
        }
    }
    x
}

/// ln(a/b), exact to rounding near a = b and without overflow of the ratio.
#[inline]
fn log_ratio(a: f64, b: f64) -> f64 {
    // b/2 < a < 2b, written so that NaN takes the other branch.
    if a > 0.5 * b && a < 2.0 * b {
        return ln_ratio_near_one(a, b);
    }
    let ratio = a / b;
    if ratio.is_normal() {
        libm::log(ratio)
    } else {
        libm::log(a) - libm::log(b)
    }
}

/// m·exp(−decay), without the factor underflowing before the product would.
pub(crate) fn scaled(m: f64, decay: f64) -> f64 {
    if decay <= SPLIT_DECAY_ABOVE {
        m * exp(-decay)
    } else {
        let half = exp(-0.5 * decay);
        m * half * half
    }
}

/// The out-of-the-money value with its two terms small·Φ(h + t) and
/// large·Φ(h − t), for the Greeks: the value is computed exactly as
/// [`otm_value`] computes it (so `greeks(..).price == price(..)` bit for bit)
/// and the terms share its erfc evaluations. Requires s > 0.
pub(crate) fn otm_parts(abs_x: f64, s: f64, small: f64, large: f64) -> (f64, f64, f64) {
    let h = -abs_x * (1.0 / s); // as in otm_value
    let t = 0.5 * s;
    let (near, far) = if erfcx_wing(h, t) {
        wing_terms(h, t, small, large)
    } else {
        (small * norm_cdf(h + t), large * norm_cdf(h - t))
    };
    let value = if small_t::applies(h, t) {
        small_t_value(h, t, small, large)
    } else {
        (near - far).max(0.0)
    };
    (value, near, far)
}

/// Value of the out-of-the-money option: legs `small` ≤ `large` (S·e^(−qT) and
/// K·e^(−rT) in some order), |x| = ln(large/small), s = σ√T.
#[inline]
pub(crate) fn otm_value(abs_x: f64, s: f64, small: f64, large: f64) -> f64 {
    if s <= 0.0 {
        return 0.0;
    }
    // 1/s is ready long before x (it needs no logarithm), so h costs one
    // multiplication after x instead of a division on the critical path; the
    // Greeks form h the same way (greeks::diffusive).
    let h = -abs_x * (1.0 / s);
    let t = 0.5 * s;
    if small_t::applies(h, t) {
        small_t_value(h, t, small, large)
    } else if erfcx_wing(h, t) {
        wing_value(h, t, small, large)
    } else {
        (small * norm_cdf(h + t) - large * norm_cdf(h - t)).max(0.0)
    }
}

/// [`otm_value`] for small t: √(small·large)·b with b from the Taylor series
/// in t ([`small_t::normalised`]), where the two Φ terms of the central
/// formula would cancel to about 1/t.
fn small_t_value(h: f64, t: f64, small: f64, large: f64) -> f64 {
    small_t::normalised(h, t).0 * (libm::sqrt(small) * libm::sqrt(large))
}

/// [`otm_value`] in the lower wing. Kept out of line: the central formula's
/// hot path stays small.
#[inline(never)]
fn wing_value(h: f64, t: f64, small: f64, large: f64) -> f64 {
    let (near, far) = wing_terms(h, t, small, large);
    // erfcx is decreasing, so near ≥ far; rounding may still leave a hair below.
    (near - far).max(0.0)
}

/// small·Φ(h + t) and large·Φ(h − t) in the lower wing, through erfcx: both
/// are ½·√(small·large)·erfcx(z)·exp(−(h² + t²)/2), with z = −(h + t)/√2 and
/// (t − h)/√2. With erfcx(z) = m·exp(e), each term takes one exponential of
/// e − (h² + t²)/2, a sum formed exactly (two-sum, the tail applied as a
/// factor), so the decay's own rounding, common to both terms, is the only
/// one it adds; the factor is applied in halves where it would underflow
/// before the product does.
#[inline]
fn wing_terms(h: f64, t: f64, small: f64, large: f64) -> (f64, f64) {
    let decay = 0.5 * (h * h + t * t);
    let common = 0.5 * libm::sqrt(small) * libm::sqrt(large);
    let term = |z: f64| {
        let (e, m) = scaled_erfc_parts(z);
        let (sum, tail) = two_sum(e, -decay);
        // A decay that overflowed leaves the tail NaN; the factor is 0 then.
        let tail = if sum.is_finite() { tail } else { 0.0 };
        scaled(common * m * (1.0 + tail), -sum)
    };
    (
        term(-(h + t) * FRAC_1_SQRT_2),
        term((t - h) * FRAC_1_SQRT_2),
    )
}

/// Price of a European option under Black–Scholes–Merton with a continuous dividend yield.
///
/// # Formula
/// V = S·e^(−qT)·Φ(d1) − K·e^(−rT)·Φ(d2) for a call, with
/// d1,2 = (ln(S/K) + (r − q ± σ²/2)T)/(σ√T); the put by parity. Evaluated as
/// described in the module documentation, so that no digits are lost to
/// cancellation far out of the money.
///
/// Limits are not errors: at expiry = 0 the price is the intrinsic value
/// max(±(S − K), 0); at vol = 0 it is the discounted intrinsic value of the
/// forward, max(±(S·e^(−qT) − K·e^(−rT)), 0). A true price below about 1e-300
/// may come back as 0 or subnormal; it is never negative.
///
/// # Accuracy
/// |error| ≤ 8·ε·(1+κ)·|V|, κ the relative condition number of the price over
/// (spot, strike, expiry, rate, dividend yield, vol); checked against 50-digit
/// references (tolerance entry `price`). Near the money and near expiry also
/// within 64 ulps of V itself (tolerance entry `near_expiry`), where κ grows
/// like 1/(σ√T).
///
/// # Errors
/// [`Error::NotFinite`], [`Error::NotPositive`] or [`Error::Negative`] naming
/// the first bad field; [`Error::Overflow`] when the price exceeds `f64::MAX`.
///
/// # Examples
/// ```
/// use calor::{price, Contract, Kind, Market};
/// // A call on the invented Nordwind Grain Exchange's barley index.
/// let c = Contract { kind: Kind::Call, strike: 40.0, expiry: 0.5 };
/// let m = Market { spot: 42.0, rate: 0.1, dividend_yield: 0.0 };
/// let v = price(&c, &m, 0.2)?;
/// assert!((v - 4.759422392871).abs() < 1e-11);
/// # Ok::<(), calor::Error>(())
/// ```
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
#[inline]
pub fn price(contract: &Contract, market: &Market, vol: f64) -> Result<f64, Error> {
    let value = Setup::new(contract, market, vol)?.value();
    if value.is_finite() {
        Ok(value)
    } else {
        Err(Error::Overflow)
    }
}
