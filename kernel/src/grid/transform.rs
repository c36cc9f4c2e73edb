//! The change of variables that turns the Black–Scholes–Merton equation into u_τ = u_xx.
//!
//! # Formula
//! With x = ln(S/K), τ = σ²(T−t)/2, k = 2r/σ² and k_q = 2(r−q)/σ²,
//! V(S, t) = K·e^(αx + βτ)·u(x, τ) with α = −(k_q − 1)/2 and β = −α² − k.
//! The payoff becomes u(x, 0) = e^(−αx)·max(ω(eˣ − 1), 0) (ω = +1 call, −1 put)
//! and the early-exercise floor at τ is e^(−βτ) times the same shape.
//!
//! The grid coordinate is y = ω·x, mirrored for the put, so the exercise side
//! of every option lies at the high end of the grid and one sweep direction
//! (Brennan–Schwartz) serves calls and puts.
//!
//! # Source
//! P. Wilmott, S. Howison & J. Dewynne, *The Mathematics of Financial
//! Derivatives* (CUP, 1995), ch. 5 (the transformation to the heat equation,
//! written there without the dividend yield), from memory.

use crate::contract::{Contract, Kind, Market};

/// The transformed problem for one contract, market and volatility.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Transform {
    /// +1 for a call, −1 for a put: ω, also the mirror of the grid coordinate.
    pub omega: f64,
    pub strike: f64,
    pub rate: f64,
    pub dividend_yield: f64,
    /// σ²/2, the factor from calendar time to τ.
    pub half_variance: f64,
    pub alpha: f64,
    pub beta: f64,
    /// τ at the valuation date, σ²T/2.
    pub tau_max: f64,
    /// ln(S/K).
    pub x_spot: f64,
    /// σ√T.
    pub total_vol: f64,
}

impl Transform {
    /// The transform of already validated, strictly positive inputs.
    pub(crate) fn new(contract: &Contract, market: &Market, vol: f64) -> Self {
        let half_variance = 0.5 * vol * vol;
        let k = market.rate / half_variance;
        let kq = (market.rate - market.dividend_yield) / half_variance;
        let alpha = -0.5 * (kq - 1.0);
        Transform {
            omega: match contract.kind {
                Kind::Call => 1.0,
                Kind::Put => -1.0,
            },
            strike: contract.strike,
            rate: market.rate,
            dividend_yield: market.dividend_yield,
            half_variance,
            alpha,
            beta: -alpha * alpha - k,
            tau_max: half_variance * contract.expiry,
            x_spot: libm::log(market.spot / contract.strike),
            total_vol: vol * libm::sqrt(contract.expiry),
        }
    }

    /// x of grid coordinate y.
    pub(crate) fn x(&self, y: f64) -> f64 {
        self.omega * y
    }

    /// The payoff shape e^(−αx)·max(ω(eˣ − 1), 0) at grid coordinate y.
    pub(crate) fn floor_shape(&self, y: f64) -> f64 {
        let x = self.x(y);
        let intrinsic = self.omega * libm::expm1(x);
        if intrinsic > 0.0 {
            libm::exp(-self.alpha * x) * intrinsic
        } else {
            0.0
        }
    }

    /// The mean of [`Transform::floor_shape`] over the cell [y − h/2, y + h/2].
    ///
    /// Used for the node whose cell holds the strike: the grid then sees the
    /// payoff's kink through its integral, wherever the kink falls in the cell,
    /// and the error stays a smooth function of h (the basis of Richardson
    /// extrapolation).
    pub(crate) fn cell_mean(&self, y: f64, h: f64) -> f64 {
        // In y the exercise side is y > 0; integrate ω(eˣ − 1)·e^(−αx) over y ∈ [max(a, 0), b].
        let (a, b) = ((y - 0.5 * h).max(0.0), y + 0.5 * h);
        if b <= a {
            return 0.0;
        }
        let w = self.omega;
        // x = ω·y, so e^(cx) = e^(cω·y).
        let growth = integral_exp(w * (1.0 - self.alpha), a, b);
        let decay = integral_exp(-w * self.alpha, a, b);
        w * (growth - decay) / h
    }

    /// u at grid coordinate y and time τ for a value V.
    pub(crate) fn heat_value(&self, value: f64, y: f64, tau: f64) -> f64 {
        value / (self.strike * libm::exp(self.alpha * self.x(y) + self.beta * tau))
    }

    /// V at grid coordinate y at the valuation date for u.
    pub(crate) fn option_value(&self, u: f64, y: f64) -> f64 {
        u * self.strike * libm::exp(self.alpha * self.x(y) + self.beta * self.tau_max)
    }

    /// The Dirichlet value of u at the in-the-money end y at time τ.
    ///
    /// Far in the money the option is worth its discounted forward intrinsic
    /// value, or its intrinsic value when that is larger and exercise is allowed.
    pub(crate) fn deep_value(&self, y: f64, tau: f64, american: bool) -> f64 {
        let t = tau / self.half_variance;
        let s = self.strike * libm::exp(self.x(y));
        let forward = self.omega
            * (s * libm::exp(-self.dividend_yield * t) - self.strike * libm::exp(-self.rate * t));
        let intrinsic = if american {
            self.omega * (s - self.strike)
        } else {
            0.0
        };
        self.heat_value(forward.max(intrinsic).max(0.0), y, tau)
    }
}

/// ∫ₐᵇ e^(c·y) dy = e^(ca)·(b − a)·(e^(c(b−a)) − 1)/(c(b−a)), without cancellation.
fn integral_exp(c: f64, a: f64, b: f64) -> f64 {
    let z = c * (b - a);
    let ratio = if z == 0.0 { 1.0 } else { libm::expm1(z) / z };
    libm::exp(c * a) * (b - a) * ratio
}
