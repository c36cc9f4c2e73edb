//! All fifteen sensitivities of the closed form in one pass.
//!
//! # Formula
//! With ω = +1 for a call and −1 for a put, d1,2 = x/s ± s/2 and
//! A = S·e^(−qT)·φ(d1) = K·e^(−rT)·φ(d2) = √(S·e^(−qT)·K·e^(−rT))·φ-factor,
//! computed as √(legs)·exp(−(h² + t²)/2)/√(2π) so it neither underflows early
//! nor depends on which of d1, d2 is used:
//!
//! | Greek | formula |
//! |---|---|
//! | delta | ω·e^(−qT)·Φ(ωd1) |
//! | gamma | A/(S²·s) |
//! | vega | A·√T |
//! | theta | −A·σ/(2√T) + ω·(q·S·e^(−qT)·Φ(ωd1) − r·K·e^(−rT)·Φ(ωd2)) |
//! | rho | ω·T·K·e^(−rT)·Φ(ωd2) |
//! | dividend_rho | −ω·T·S·e^(−qT)·Φ(ωd1) |
//! | vanna | −(A/S)·d2/σ |
//! | volga | vega·d1·d2/σ |
//! | charm | ω·q·e^(−qT)·Φ(ωd1) − (A/S)·∂d1/∂T |
//! | veta | vega·(q + d1·∂d1/∂T − 1/(2T)) |
//! | speed | −(gamma/S)·(1 + d1/s) |
//! | zomma | gamma·(d1·d2 − 1)/σ |
//! | color | gamma·(q + d1·∂d1/∂T + 1/(2T)) |
//! | ultima | −(vega/σ²)·(d1·d2·(1 − d1·d2) + d1² + d2²) |
//!
//! with ∂d1/∂T = (2(r − q)T − s·d2)/(2T·s).
//!
//! # Source
//! E. G. Haug, *The Complete Guide to Option Pricing Formulas*, 2nd ed.
//! (McGraw-Hill, 2007), ch. 2 (the generalised Greeks). The project's tests do
//! not trust this table: the references are numerical derivatives of the price
//! at 50 digits.

use crate::black::{otm_parts, scaled, Setup};
use crate::contract::{Contract, Greeks, Market};
use crate::error::Error;
use crate::normal::INV_SQRT_2PI;

/// Price and all Greeks of a European option, sharing the common terms.
///
/// Greeks are raw partial derivatives (see [`Greeks`]).
///
/// At vol = 0 or expiry = 0 the option is worth its discounted forward
/// intrinsic value and the Greeks are those of that value: in the money,
/// delta = ±e^(−qT), theta = ±(q·S·e^(−qT) − r·K·e^(−rT)), rho = ±T·K·e^(−rT),
/// dividend_rho = ∓T·S·e^(−qT), charm = ±q·e^(−qT) and every other Greek is 0;
/// out of the money every Greek is 0.
///
/// # Accuracy
/// Each Greek g within 16·ε·(1+κ)·(|g| + s_g), s_g its natural scale (V/S for
/// delta, V/S² for gamma, ...; tolerance entries `greek_*`).
///
/// # Errors
/// As [`crate::price`], plus [`Error::SingularAtStrike`] at vol = 0 or expiry = 0
/// with the forward exactly at the strike, where gamma diverges, and
/// [`Error::Overflow`] if a Greek exceeds the range of `f64` (only for expiries
/// far below an hour).
///
/// # Examples
/// ```
/// use calor::{greeks, Contract, Kind, Market};
/// let g = greeks(
///     &Contract { kind: Kind::Call, strike: 50.0, expiry: 20.0 / 52.0 },
///     &Market { spot: 49.0, rate: 0.05, dividend_yield: 0.0 },
///     0.2,
/// )?;
/// assert!((g.delta - 0.521604661066).abs() < 1e-11);
/// assert!((g.gamma - 0.065544039347).abs() < 1e-11);
/// # Ok::<(), calor::Error>(())
/// ```
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn greeks(contract: &Contract, market: &Market, vol: f64) -> Result<Greeks, Error> {
    let g = unchecked(&Setup::new(contract, market, vol)?)?;
    if g.named().iter().all(|(_, v)| v.is_finite()) {
        Ok(g)
    } else {
        Err(Error::Overflow)
    }
}

/// Price and delta, range-checked on their own: the option is refused when
/// [`crate::price`] refuses it or its delta leaves the range of `f64`, not
/// when a higher Greek does (gamma and those after it, which grow without
/// bound as spot, vol and expiry shrink together). The price is
/// [`crate::price`]'s, bit for bit. For the scalar path of
/// [`crate::price_delta_batch`], which must value what its lane path values.
///
/// # Errors
/// As [`greeks`], with [`Error::Overflow`] for the price and the delta only.
pub(crate) fn price_and_delta(
    contract: &Contract,
    market: &Market,
    vol: f64,
) -> Result<(f64, f64), Error> {
    let p = Setup::new(contract, market, vol)?;
    // greeks' own refusals (at the strike with no diffusion) come first. With
    // diffusion, price and delta are greeks' (the price is `price`'s, bit for
    // bit), without the other thirteen Greeks.
    let (price, delta) = if p.s > 0.0 {
        let terms = Terms::new(&p);
        (terms.price, p.omega * terms.spot_term / p.spot)
    } else {
        let g = deterministic(&p)?;
        (g.price, g.delta)
    };
    if price.is_finite() && delta.is_finite() {
        Ok((price, delta))
    } else {
        Err(Error::Overflow)
    }
}

/// All the Greeks, some possibly infinite or NaN past the range of `f64`.
fn unchecked(p: &Setup) -> Result<Greeks, Error> {
    if p.s > 0.0 {
        Ok(diffusive(p))
    } else {
        deterministic(p)
    }
}

/// What the price and every Greek with diffusion start from.
struct Terms {
    /// h = x/s and t = s/2.
    h: f64,
    half: f64,
    /// The out-of-the-money legs, smaller first.
    small: f64,
    large: f64,
    price: f64,
    /// S·e^(−qT)·Φ(ωd1) and K·e^(−rT)·Φ(ωd2).
    spot_term: f64,
    strike_term: f64,
}

impl Terms {
    /// For s > 0.
    fn new(p: &Setup) -> Self {
        // As the value's terms form it (black::otm_value), so that the density
        // of the Greeks and those terms share the rounding of h.
        let h = p.x * (1.0 / p.s);
        let half = 0.5 * p.s;
        // S·e^(−qT)·Φ(ωd1) and K·e^(−rT)·Φ(ωd2) from the two terms of the
        // out-of-the-money value (one pair of erfc evaluations serves the price
        // and all Greeks): for the out-of-the-money option they are those
        // terms, in scaled form deep in the wing; in the money they are the
        // legs less the other option's terms (parity), with no cancellation of
        // consequence.
        let (small, large) = p.otm_legs();
        let (otm, near, far) = otm_parts(libm::fabs(p.x), p.s, small, large);
        let price = otm + p.intrinsic();
        let (spot_term, strike_term) = match (p.in_the_money(), p.omega > 0.0) {
            (false, true) => (near, far),
            (false, false) => (far, near),
            (true, true) => (p.spot_leg - far, p.strike_leg - near),
            (true, false) => (p.spot_leg - near, p.strike_leg - far),
        };
        Terms {
            h,
            half,
            small,
            large,
            price,
            spot_term,
            strike_term,
        }
    }
}

fn diffusive(p: &Setup) -> Greeks {
    let (w, vol, t, sqrt_t, s) = (p.omega, p.vol, p.expiry, p.sqrt_t, p.s);
    let (spot, q, r) = (p.spot, p.dividend_yield, p.rate);
    let Terms {
        h,
        half,
        small,
        large,
        price,
        spot_term,
        strike_term,
    } = Terms::new(p);
    let (d1, d2) = (h + half, h - half);
    let a = scaled(
        INV_SQRT_2PI * libm::sqrt(small) * libm::sqrt(large),
        0.5 * (h * h + half * half),
    );
    let mut g = Greeks {
        price,
        delta: w * spot_term / spot,
        theta: w * (q * spot_term - r * strike_term),
        rho: w * t * strike_term,
        dividend_rho: -w * t * spot_term,
        charm: w * q * spot_term / spot,
        ..Greeks::default()
    };
    // Past the density's underflow every φ term is exactly 0; skipping them
    // avoids 0·∞ where d1·d2 or ∂d1/∂T overflow for vanishing s.
    if a > 0.0 {
        let dd1 = (2.0 * (r - q) * t - s * d2) / (2.0 * t * s);
        let density = a / spot;
        let gamma = density / (spot * s);
        let vega = a * sqrt_t;
        let d12 = d1 * d2;
        g.gamma = gamma;
        g.vega = vega;
        g.theta -= a * vol / (2.0 * sqrt_t);
        g.vanna = -density * d2 / vol;
        g.volga = vega * d12 / vol;
        g.charm -= density * dd1;
        g.veta = vega * (q + d1 * dd1 - 0.5 / t);
        g.speed = -gamma / spot * (1.0 + d1 / s);
        g.zomma = gamma * (d12 - 1.0) / vol;
        g.color = gamma * (q + d1 * dd1 + 0.5 / t);
        g.ultima = -vega / (vol * vol) * (d12 * (1.0 - d12) + d1 * d1 + d2 * d2);
    }
    g
}

fn deterministic(p: &Setup) -> Result<Greeks, Error> {
    if p.x == 0.0 {
        return Err(Error::SingularAtStrike);
    }
    let price = p.value();
    if !p.in_the_money() {
        return Ok(Greeks {
            price,
            ..Greeks::default()
        });
    }
    let (w, t) = (p.omega, p.expiry);
    Ok(Greeks {
        price,
        delta: w * p.dq,
        theta: w * (p.dividend_yield * p.spot_leg - p.rate * p.strike_leg),
        rho: w * t * p.strike_leg,
        dividend_rho: -w * t * p.spot_leg,
        charm: w * p.dividend_yield * p.dq,
        ..Greeks::default()
    })
}
