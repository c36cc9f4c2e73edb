//! Implied volatility in a fixed number of steps: an asymptotic or tangent
//! initial guess in normalised coordinates, then at most three Householder-type
//! iterations on the normalised Black function or a transform of it.
//!
//! # Formula
//! In normalised form (see [`crate::price`]) the out-of-the-money premium is
//! β = b(x, s)·√(S·e^(−qT)·K·e^(−rT)) with x = −|ln(F/K)| ≤ 0 and s = σ√T, and
//! 0 < β < b_max = e^(x/2). With h = x/s, t = s/2 the derivatives are
//! b′ = exp(−(h² + t²)/2)/√(2π), b″/b′ = x²/s³ − s/4 and
//! b‴/b′ = (b″/b′)² − 3x²/s⁴ − 1/4. b has its inflection point at
//! s_c = √(2|x|), where b′ = b_max/√(2π).
//!
//! The initial guess depends on where β lies relative to b_c = b(x, s_c):
//! - far below (β < b_c/20): the lower asymptote b ≈ s·exp(−(h² + t²)/2)/((h² − t²)√(2π)),
//!   inverted in closed form for s² with two corrections of its prefactor;
//!   the iteration then works on ln b, which is close to linear there;
//! - far above (b_max − β < (b_max − b_c)/4): the upper asymptote
//!   b_max − b ≈ 2Φ(−s/2), inverted with the rational approximation of
//!   Abramowitz & Stegun 26.2.23; the iteration works on ln(b_max − b);
//! - otherwise the iteration works on b itself, from a guess taken at the
//!   inflection point, where b_c and b′(s_c) are known without a further
//!   evaluation of b. Below s_c it is the iteration's own step (see below)
//!   taken from s_c: the Taylor series of b about s_c reverted to degree
//!   seven, whose coefficients there reduce to polynomials in u = |x|/4
//!   (R₂ = 0, R₃ = 4u/3, R₄ = −u, R₅ = u + 56u²/15, R₆ = −u − 20u²/3,
//!   R₇ = u + 32u²/3 + 4064u³/315); to third order it is the tangent's offset
//!   y = (β − b_c)/b′(s_c) with its cubic correction y·(1 + y²/6). Above s_c,
//!   where b‴/b′ climbs from −1 towards −1/4 within a short distance, the
//!   series overshoots and the plain tangent s_c + y is the guess.
//!
//! On the logarithmic objectives each step is Householder's of order four,
//! s ← s + ν·(1 + h₂ν/2)/(1 + ν·(h₂ + h₃ν/6)) with ν = −f/f′, h₂ = f″/f′,
//! h₃ = f‴/f′. On b itself, where every derivative is b′ times a polynomial in
//! x²/s² and s², the step is of order eight: the Taylor series of b in the
//! relative correction δ (s ← s·(1 + δ)) is reverted to degree seven,
//! δ = ν + R₂ν² + … + R₇ν⁷ with ν = (β − b)/(s·b′), and the last term says
//! when the step is final. Near the money most quotes then take one step.
//! Where t < 0.05, or t < 0.1 and h + t < −1 (and h + t ≥ −2, or |x| < 0.2),
//! b comes from its Taylor series in t (`black::small_t`), and so does
//! ν = (β − b)/(s·b′): the two Φ
//! terms, which cancel to about 1/t there, are never formed.
//!
//! # Source
//! P. Jäckel, "Let's be rational", *Wilmott* 2015(75), 40–53 (normalised
//! coordinates, the inflection point, the branch-wise transformed objectives and
//! Householder iterations); M. Abramowitz and I. A. Stegun, *Handbook of
//! Mathematical Functions* (NBS, 1964), eq. 26.2.23 (after C. Hastings, 1955)
//! and eq. 3.6.25 (reversion of series).
//! The guesses here are simpler than the rational cubic interpolation of the
//! paper; the iteration count they need is checked on the reference tables.
//!
//! # Accuracy
//! |σ̂ − σ| ≤ 16·(1+κ)·ε·V/vega + 4·ε·σ for a premium rounded from the exact price
//! at σ (tolerance entry `implied_vol`). Near the money and near expiry also
//! |σ̂ − σ| ≤ 64·ε·(σ + V/vega), and the
//! repricing error within 64 ulps of the premium (tolerance entry
//! `near_expiry`).

use core::f64::consts::{FRAC_1_SQRT_2, SQRT_2};

mod blocks;

pub(crate) use blocks::solve_in_blocks;

use crate::black::{erfcx_wing, small_t, Setup};
use crate::contract::{finite, Contract, Market};
use crate::elementary::exp;
use crate::error::{Error, Field};
use crate::normal::{erfc_with_square, norm_cdf, scaled_erfc, INV_SQRT_2PI};

/// The most Householder iterations [`implied_vol`] ever takes.
pub const MAX_ITERATIONS: u32 = 3;

/// Fraction of b_c below which the lower asymptotic guess applies. Above it
/// the guess reverted from the inflection point is within about a quarter of
/// the root (an mpmath scan over |x| from 10⁻¹⁰ to 10³) and the iteration on b
/// converges within the bound. The lower-wing guess and iteration cost more
/// than the iteration on b: at 0.05, 8 % of the benchmark's near-the-money
/// quotes took them, 4 % at 0.02; at 0.01 the reference round trips needing
/// three iterations grow from 551 to 578.
const LOWER_FRACTION: f64 = 0.02;
/// Fraction of b_max − b_c below which the upper asymptotic guess applies.
const UPPER_FRACTION: f64 = 0.25;
/// Newton steps on the cheap model of b that refine the lower-wing guess.
const MODEL_STEPS: usize = 1;
/// On the logarithmic objectives: a correction this small (relative) leaves an
/// error of order its fourth power, below 10⁻¹⁷. On the reference round trips,
/// 2·10⁻⁴ is where that error first shows (forward worst 2.07 → 8.1 tolerance
/// units) and 4·10⁻⁴ fails; this threshold keeps a factor 4 from the first (a
/// factor 256 in the error).
const CONVERGED_STEP: f64 = 5e-5;
/// On b itself: the reverted series' last term, relative to s, below which
/// the step is final (its error is of the order of the next term). On the
/// reference round trips the error first shows between 10⁻¹³ (forward worst
/// still 2.07 tolerance units) and 3·10⁻¹³ (6.3), and 10⁻¹² fails; this keeps
/// a factor 250 below the first.
const CONVERGED_TAIL: f64 = 4e-16;
/// ... and the step must lie well inside the series' radius of convergence
/// (|δ| < 1, from the pole of x²/s² at s = 0) for that term to tell.
const CONVERGED_RADIUS: f64 = 0.1;
/// √(2π).
const SQRT_2PI: f64 = 2.506_628_274_631_000_5;
/// e^decay is finite below this.
const MAX_EXP_ARGUMENT: f64 = 700.0;
/// √π.
const SQRT_PI: f64 = 1.772_453_850_905_516;

/// An implied volatility and the iterations it took.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct ImpliedVol {
    /// The volatility σ that reproduces the premium.
    pub vol: f64,
    /// Householder iterations used, at most [`MAX_ITERATIONS`].
    pub iterations: u32,
    /// Size of the last correction relative to σ. On the logarithmic
    /// objectives (order four) the iteration stops once it is below 5·10⁻⁵,
    /// which leaves an error of order its fourth power; on b itself (order
    /// eight) once the reverted series' last term is below 4·10⁻¹⁶.
    pub last_step: f64,
}

/// The volatility at which the Black–Scholes–Merton price equals `premium`.
///
/// See the module documentation of the method. The cost is bounded: one
/// initial guess (at most one normal-distribution evaluation) and at most
/// [`MAX_ITERATIONS`] iterations, each one evaluation of the normalised price.
///
/// # Accuracy
/// |σ̂ − σ| ≤ 16·(1+κ)·ε·V/vega + 4·ε·σ (tolerance entry `implied_vol`); near
/// the money and near expiry see the module documentation.
///
/// # Errors
/// As [`crate::price`] for the contract and market, plus
/// [`Error::NotPositive`] for expiry = 0, [`Error::NotFinite`] or
/// [`Error::Negative`] for the premium, [`Error::PremiumBelowIntrinsic`] and
/// [`Error::PremiumAboveMaximum`] outside the no-arbitrage bounds, and
/// [`Error::Overflow`] when the inputs' discount factors or moneyness leave the
/// range of `f64`.
///
/// # Examples
/// ```
/// use calor::{implied_vol, price, Contract, Kind, Market};
/// let c = Contract { kind: Kind::Call, strike: 20.0, expiry: 0.25 };
/// let m = Market { spot: 21.0, rate: 0.1, dividend_yield: 0.0 };
/// let vol = implied_vol(&c, &m, 1.875)?;
/// assert!((vol - 0.2345129139976438).abs() < 1e-15);
/// assert!((price(&c, &m, vol)? - 1.875).abs() < 1e-14);
/// # Ok::<(), calor::Error>(())
/// ```
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn implied_vol(contract: &Contract, market: &Market, premium: f64) -> Result<f64, Error> {
    solve_implied_vol(contract, market, premium).map(|r| r.vol)
}

/// [`implied_vol`] with the number of iterations it took.
///
/// # Errors
/// As [`implied_vol`].
///
/// # Examples
/// ```
/// use calor::{solve_implied_vol, Contract, Kind, Market, MAX_ITERATIONS};
/// let c = Contract { kind: Kind::Put, strike: 100.0, expiry: 1.0 };
/// let m = Market { spot: 100.0, rate: 0.02, dividend_yield: 0.0 };
/// let r = solve_implied_vol(&c, &m, 7.0)?;
/// assert!(r.iterations <= MAX_ITERATIONS);
/// # Ok::<(), calor::Error>(())
/// ```
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn solve_implied_vol(
    contract: &Contract,
    market: &Market,
    premium: f64,
) -> Result<ImpliedVol, Error> {
    let problem = prepare(contract, market, premium)?;
    let (s, iterations, last_step) = problem.target.solve();
    Ok(ImpliedVol {
        vol: problem.vol(s)?,
        iterations,
        last_step,
    })
}

/// A validated premium: its normalised problem, and √T to turn s = σ√T back
/// into σ.
#[derive(Clone, Copy)]
struct Prepared {
    target: Target,
    sqrt_t: f64,
}

/// Validates the inputs and the premium against the no-arbitrage bounds and
/// sets up the normalised problem ([`solve_implied_vol`]'s errors).
// Inlined so that the block path writes the result straight into its slot:
// through a temporary, its set-up and guess stages measured 6 % slower.
#[inline]
fn prepare(contract: &Contract, market: &Market, premium: f64) -> Result<Prepared, Error> {
    let p = Setup::new(contract, market, 0.0)?;
    if p.expiry <= 0.0 {
        return Err(Error::NotPositive {
            field: Field::Expiry,
        });
    }
    finite(premium, Field::Premium)?;
    if premium < 0.0 {
        return Err(Error::Negative {
            field: Field::Premium,
        });
    }
    let (small, large) = p.otm_legs();
    // The maximum is the option's own leg, the larger one in the money, and
    // the forward intrinsic value is max(0, ω·(S·e^(−qT) − K·e^(−rT))), which
    // is large − small there, exactly. Neither takes a branch: in a book of
    // mixed strikes and kinds the side is a coin toss.
    let maximum = if p.in_the_money() { large } else { small };
    if premium >= maximum {
        return Err(Error::PremiumAboveMaximum);
    }
    let otm = premium - p.intrinsic();
    if otm <= 0.0 {
        return Err(Error::PremiumBelowIntrinsic);
    }
    Ok(Prepared {
        target: Target::new(-libm::fabs(p.x), otm, small, large),
        sqrt_t: p.sqrt_t,
    })
}

impl Prepared {
    /// σ = s/√T for the solved s.
    fn vol(&self, s: f64) -> Result<f64, Error> {
        // Inputs whose discount factors or moneyness leave the range of f64
        // (say q·T beyond 700) have no meaningful normalised problem: refuse,
        // never NaN.
        let vol = s / self.sqrt_t;
        if vol.is_finite() {
            Ok(vol)
        } else {
            Err(Error::Overflow)
        }
    }
}

/// Which function of b the iteration drives to zero.
#[derive(Clone, Copy, Debug, PartialEq)]
enum Objective {
    /// ln b − ln β, for β far below b_c; carries ln β.
    LogPrice(f64),
    /// b − β, around the inflection point.
    Price,
    /// ln(b_max − b) − ln(b_max − β), for β close to b_max.
    LogComplement,
}

/// The normalised problem b(x, s) = β.
#[derive(Clone, Copy)]
struct Target {
    x: f64,
    b_max: f64,
    /// 1/b_max, so that each evaluation of b multiplies instead of dividing.
    inv_b_max: f64,
    beta: f64,
    /// b_max − β, from the unnormalised premium without cancellation.
    gap: f64,
    /// The out-of-the-money premium and its legs, for [`Target::ln_beta`].
    otm: f64,
    small: f64,
    large: f64,
}

/// What one Householder step needs: ν = −f/f′, h₂ = f″/f′, h₃ = f‴/f′.
type Terms = (f64, f64, f64);

impl Target {
    fn new(x: f64, otm: f64, small: f64, large: f64) -> Self {
        let (root_small, root_large) = (libm::sqrt(small), libm::sqrt(large));
        let root = root_small * root_large;
        // e^(x/2) = √(small/large), from the legs: ready before x is.
        let b_max = root_small / root_large;
        Target {
            x,
            b_max,
            inv_b_max: root_large / root_small,
            beta: otm / root,
            gap: (small - otm) / root,
            otm,
            small,
            large,
        }
    }

    /// ln β, exact even where β itself would underflow: from β while β is a
    /// normal number (its rounding is that of the premium the Price objective
    /// sees), from the logarithms of the parts once β would have lost digits.
    /// Only the lower wing needs it, so it is not formed up front.
    fn ln_beta(&self) -> f64 {
        if self.beta.is_normal() {
            libm::log(self.beta)
        } else {
            libm::log(self.otm) - 0.5 * (libm::log(self.small) + libm::log(self.large))
        }
    }

    /// The initial guess and the objective that goes with it.
    #[inline]
    fn guess(&self) -> (f64, Objective) {
        let x = self.x;
        // At s_c: h + t = 0 and h − t = −s_c, and Φ(−s_c) = erfc(√|x|)/2, whose
        // rational starts from |x| beside the root.
        let root = libm::sqrt(-x);
        let s_c = SQRT_2 * root;
        let b_c = 0.5 * (self.b_max - erfc_with_square(root, -x) * self.inv_b_max);
        let slope_c = self.b_max * INV_SQRT_2PI;
        if self.beta <= b_c {
            if self.beta < LOWER_FRACTION * b_c {
                // The leading asymptote under-estimates s, the tangent of the convex
                // lower branch over-estimates it; keep the one a cheap model of b
                // (erfcx replaced by its rational bound, A&S 7.1.13) puts closer.
                let ln_beta = self.ln_beta();
                let tangent = s_c - (b_c - self.beta) / slope_c;
                let asymptote = self.lower_asymptote(s_c, ln_beta);
                let miss = |s: f64| libm::fabs(self.model_ln_b(s) - ln_beta);
                let mut s = if tangent > 0.0 && miss(tangent) < miss(asymptote) {
                    tangent
                } else {
                    asymptote
                };
                // A Newton step on the model in u = 1/s², in which ln b is
                // nearly linear (−x²·u/2 plus slowly varying terms).
                for _ in 0..MODEL_STEPS {
                    let (ln_m, ratio) = self.model_ln_b_and_slope(s);
                    let u = 1.0 / (s * s);
                    // d ln b/du = (d ln b/ds)·(ds/du) = ratio·(−s³/2).
                    let next = u + (ln_m - ln_beta) / (0.5 * ratio * s * s * s);
                    if next.is_finite() && next > 0.0 {
                        s = (1.0 / libm::sqrt(next)).min(s_c);
                    }
                }
                (s, Objective::LogPrice(ln_beta))
            } else {
                (self.reverted_from_inflection(s_c, b_c), Objective::Price)
            }
        } else {
            let gap_c = self.b_max - b_c;
            if self.gap < UPPER_FRACTION * gap_c {
                (self.upper_asymptote(), Objective::LogComplement)
            } else {
                (s_c + self.tangent_offset(b_c), Objective::Price)
            }
        }
    }

    /// The tangent's offset from s_c, y = (β − b_c)/b′(s_c) with
    /// b′(s_c) = b_max/√(2π), for the guesses of the iteration on b.
    fn tangent_offset(&self, b_c: f64) -> f64 {
        (self.beta - b_c) * (SQRT_2PI * self.inv_b_max)
    }

    /// The guess for b_c/50 ≤ β ≤ b_c: the reverted step from s_c (module
    /// documentation). Against the tangent with its cubic correction it takes
    /// 10 % of the benchmark's near-the-money quotes from two iterations to one.
    fn reverted_from_inflection(&self, s_c: f64, b_c: f64) -> f64 {
        // ν = (β − b_c)/(s_c·b′(s_c)) lies in (−1, 0) in exact arithmetic: b
        // is convex below s_c and b(0) = 0, so b_c < s_c·b′(s_c), by a margin
        // of order |x|·b_c. b_c is the difference of two terms near ½, so it
        // carries an absolute error of order ε, and for |x| below about
        // 4·10⁻¹¹ that error can exceed the margin: ν then falls below −1 and
        // so would the tangent s_c·(1 + ν) below zero.
        //
        // 1/s_c is formed while b_c is, so that a product, not a division,
        // follows b_c on the guess's critical path.
        let inv_s_c = 1.0 / s_c;
        let y = self.tangent_offset(b_c);
        let (delta, _) = reverted_step(y * inv_s_c, &inflection_coefficients(-0.25 * self.x));
        if delta > -1.0 {
            s_c * (1.0 + delta)
        } else {
            // The chord from the origin, positive as 0 < β ≤ b_c, and a lower
            // bound of the root by the same convexity.
            s_c * (self.beta / b_c)
        }
    }

    /// Inverts the leading order ln β ≈ −x²/(2s²) − s²/8 for s < s_c.
    fn lower_asymptote(&self, s_c: f64, ln_beta: f64) -> f64 {
        let x2 = self.x * self.x;
        let r = -ln_beta;
        let disc = (r * r - 0.25 * x2).max(0.0);
        // Smaller root of w²/8 − r·w + x²/2 = 0 in w = s², without cancellation.
        let w = x2 / (r + libm::sqrt(disc));
        libm::sqrt(w).min(s_c)
    }

    /// ln b with erfcx(z) replaced by 2/(√π·(z + √(z² + 4/π))), valid for s ≤ s_c.
    fn model_ln_b(&self, s: f64) -> f64 {
        self.model_ln_b_and_slope(s).0
    }

    /// The model's ln b and b′/b (b′ exact, b from the model).
    fn model_ln_b_and_slope(&self, s: f64) -> (f64, f64) {
        let h = self.x / s;
        let t = 0.5 * s;
        let bound =
            |z: f64| 2.0 / (SQRT_PI * (z + libm::sqrt(z * z + 4.0 / core::f64::consts::PI)));
        let m = 0.5 * (bound(-(h + t) * FRAC_1_SQRT_2) - bound((t - h) * FRAC_1_SQRT_2));
        (libm::log(m) - 0.5 * (h * h + t * t), INV_SQRT_2PI / m)
    }

    /// Inverts b_max − β ≈ 2Φ(−s/2).
    fn upper_asymptote(&self) -> f64 {
        let p = (0.5 * self.gap).min(0.5);
        2.0 * upper_quantile(p)
    }

    /// ν, h₂, h₃ at s of a logarithmic objective: ln b for [`Objective::LogPrice`],
    /// ln(b_max − b) otherwise (the iteration on b itself is [`Target::price_step`]).
    fn householder_terms(&self, s: f64, objective: Objective) -> Terms {
        let x = self.x;
        let h = x / s;
        let t = 0.5 * s;
        let decay = 0.5 * (h * h + t * t);
        let q2 = x * x / (s * s * s) - 0.25 * s;
        let q3 = q2 * q2 - 3.0 * x * x / (s * s * s * s) - 0.25;
        if let Objective::LogPrice(ln_beta) = objective {
            // b = m·exp(−e): in the wing the common factor stays apart (e = decay),
            // and b′/b = r cancels it.
            let (m, e, r) = if erfcx_wing(h, t) && !small_t::applies(h, t) {
                let m = 0.5
                    * (scaled_erfc(-(h + t) * FRAC_1_SQRT_2)
                        - scaled_erfc((t - h) * FRAC_1_SQRT_2));
                (m, decay, INV_SQRT_2PI / m)
            } else {
                // Near expiry b comes from its series in t (black::small_t),
                // without the two Φ terms' cancellation, and its vega with it.
                let (m, density) = if small_t::applies(h, t) {
                    small_t::normalised(h, t)
                } else {
                    let m = self.b_max * norm_cdf(h + t) - norm_cdf(h - t) * self.inv_b_max;
                    (m, INV_SQRT_2PI * exp(-decay))
                };
                (m, 0.0, density / m)
            };
            (
                -(libm::log(m) - e - ln_beta) / r,
                q2 - r,
                q3 - 3.0 * r * q2 + 2.0 * r * r,
            )
        } else {
            let gap = self.b_max * norm_cdf(-(h + t)) + norm_cdf(h - t) * self.inv_b_max;
            let u = INV_SQRT_2PI * exp(-decay) / gap;
            (
                libm::log(gap / self.gap) / u,
                q2 + u,
                q3 + 3.0 * u * q2 + 2.0 * u * u,
            )
        }
    }

    /// One step on b itself: the relative correction δ (s ← s·(1 + δ)) from
    /// the series reversion of b(s·(1 + δ)) to degree 7, and its last term.
    fn price_step(&self, s: f64) -> (f64, f64) {
        let inv_s = 1.0 / s;
        let h = self.x * inv_s;
        let t = 0.5 * s;
        let decay = 0.5 * (h * h + t * t);
        if small_t::applies(h, t) {
            let nu = self.small_t_residual(h, t, inv_s);
            return reverted_step(nu, &reversion_coefficients(0.5 * h * h, t * t));
        }
        let b = if erfcx_wing(h, t) {
            0.5 * (scaled_erfc(-(h + t) * FRAC_1_SQRT_2) - scaled_erfc((t - h) * FRAC_1_SQRT_2))
                * exp(-decay)
        } else {
            self.b_max * norm_cdf(h + t) - norm_cdf(h - t) * self.inv_b_max
        };
        // ν = (β − b)/(s·b′) with 1/b′ = √(2π)·e^decay formed beside b, so that
        // no division follows b on the iteration's critical path.
        let nu = if decay < MAX_EXP_ARGUMENT {
            (self.beta - b) * (SQRT_2PI * exp(decay) * inv_s)
        } else {
            (self.beta - b) / (s * INV_SQRT_2PI * exp(-decay))
        };
        reverted_step(nu, &reversion_coefficients(0.5 * h * h, t * t))
    }

    /// ν = (β − b)/(s·b′) for small t, from b = s·[b′·P + h·Q̂·Φ(h)]
    /// (black::small_t): with 1/b′ = √(2π)·e^((h² + t²)/2) it is
    /// √(2π)·e^((h² + t²)/2)·(β/s − h·Q̂·Φ(h)) − P, and the two Φ terms that
    /// would cancel to about 1/t are never formed. Out of line, so that the
    /// central formula's path stays as it was: inlined, the benchmark's
    /// near-the-money solves took 2 % longer (scratch driver).
    #[inline(never)]
    fn small_t_residual(&self, h: f64, t: f64, inv_s: f64) -> f64 {
        let (p, q) = small_t::polynomials(h, t);
        // Near the root the factor's rounding becomes ν's, up to 1/G ≈ 8 times
        // b's relative error: its argument is split exactly.
        let factor = SQRT_2PI * small_t::gaussian(h, t, 1.0);
        match small_t::wing_term(h, t, q) {
            Some(term) => factor * (self.beta * inv_s) - term - p,
            None => factor * (self.beta * inv_s - h * q * norm_cdf(h)) - p,
        }
    }

    /// One iteration from s: the next iterate, its change relative to itself,
    /// and whether it is final.
    #[inline]
    fn iterate(&self, s: f64, objective: Objective) -> (f64, f64, bool) {
        if objective == Objective::Price {
            let (delta, tail) = self.price_step(s);
            let next = if delta.is_finite() && delta > -1.0 {
                s * (1.0 + delta)
            } else {
                0.5 * s
            };
            let converged = libm::fabs(delta) < CONVERGED_RADIUS && tail < CONVERGED_TAIL;
            (next, libm::fabs(next - s) / next, converged)
        } else {
            let (nu, h2, h3) = self.householder_terms(s, objective);
            let step = nu * (1.0 + 0.5 * h2 * nu) / (1.0 + nu * (h2 + h3 * nu / 6.0));
            let next = if step.is_finite() && s + step > 0.0 {
                s + step
            } else {
                0.5 * s
            };
            let last_step = libm::fabs(next - s) / next;
            (next, last_step, last_step <= CONVERGED_STEP)
        }
    }

    /// The iterate, the iterations taken and the last relative correction.
    fn solve(&self) -> (f64, u32, f64) {
        let (mut s, objective) = self.guess();
        let mut iterations = 0;
        let mut last_step = f64::INFINITY;
        let mut converged = false;
        while iterations < MAX_ITERATIONS && !converged {
            iterations += 1;
            (s, last_step, converged) = self.iterate(s, objective);
        }
        (s, iterations, last_step)
    }
}

/// The coefficients R₂…R₇ of δ = ν + R₂ν² + … + R₇ν⁷, the reversion of
/// ν = δ + a₂δ² + … + a₇δ⁷ = (b(s·(1 + δ)) − b(s))/(s·b′(s)), as polynomials
/// in H = h²/2 and T = t².
///
/// # Formula
/// b′(s·(1 + δ))/b′(s) = exp(H·(1 − (1 + δ)⁻²) − T·(δ + δ²/2)) = Σ e_n δⁿ, so
/// a_k = e_(k−1)/k; R_k follow from the a_k by Abramowitz & Stegun 3.6.25.
/// The polynomials were expanded symbolically (sympy) and are evaluated by
/// Horner's rule in H inside Horner's rule in T: six independent short chains
/// instead of the serial recurrence for e_n, which sat on the critical path.
/// The unit test checks them against that recurrence.
#[allow(clippy::neg_multiply)]
fn reversion_coefficients(hh: f64, tt: f64) -> [f64; 6] {
    let r2 = (hh * (-1.0)) + tt * (1.0 / 2.0);
    let r3 = (hh * (1.0 + hh * (4.0 / 3.0)))
        + tt * (((1.0 / 6.0) + hh * (-4.0 / 3.0)) + tt * (1.0 / 3.0));
    let r4 = (hh * (-1.0 + hh * ((-7.0 / 2.0) + hh * (-2.0))))
        + tt * ((hh * ((7.0 / 6.0) + hh * (3.0)))
            + tt * (((7.0 / 24.0) + hh * (-3.0 / 2.0)) + tt * (1.0 / 4.0)));
    let r5 = (hh * (1.0 + hh * ((13.0 / 2.0) + hh * ((46.0 / 5.0) + hh * (16.0 / 5.0)))))
        + tt * ((hh * ((-3.0 / 2.0) + hh * ((-23.0 / 3.0) + hh * (-32.0 / 5.0))))
            + tt * (((7.0 / 120.0) + hh * ((23.0 / 30.0) + hh * (24.0 / 5.0)))
                + tt * (((23.0 / 60.0) + hh * (-8.0 / 5.0)) + tt * (1.0 / 5.0))));
    let r6 = (hh
        * (-1.0
            + hh * ((-31.0 / 3.0)
                + hh * ((-157.0 / 6.0) + hh * ((-326.0 / 15.0) + hh * (-16.0 / 3.0))))))
        + tt * ((hh
            * ((11.0 / 6.0) + hh * ((187.0 / 12.0) + hh * ((1304.0 / 45.0) + hh * (40.0 / 3.0)))))
            + tt * ((hh * ((-577.0 / 360.0) + hh * ((-163.0 / 15.0) + hh * (-40.0 / 3.0))))
                + tt * (((127.0 / 720.0) + hh * (hh * (20.0 / 3.0)))
                    + tt * (((163.0 / 360.0) + hh * (-5.0 / 3.0)) + tt * (1.0 / 6.0)))));
    let r7 = (hh
        * (1.0
            + hh * (15.0
                + hh * ((353.0 / 6.0)
                    + hh * ((8948.0 / 105.0) + hh * ((1704.0 / 35.0) + hh * (64.0 / 7.0)))))))
        + tt * ((hh
            * ((-13.0 / 6.0)
                + hh * ((-331.0 / 12.0)
                    + hh * ((-432.0 / 5.0) + hh * ((-3124.0 / 35.0) + hh * (-192.0 / 7.0))))))
            + tt * ((hh
                * ((271.0 / 120.0)
                    + hh * ((358.0 / 15.0) + hh * ((284.0 / 5.0) + hh * (240.0 / 7.0)))))
                + tt * (((127.0 / 5040.0)
                    + hh * ((-176.0 / 105.0) + hh * ((-426.0 / 35.0) + hh * (-160.0 / 7.0))))
                    + tt * (((29.0 / 84.0) + hh * ((-71.0 / 70.0) + hh * (60.0 / 7.0)))
                        + tt * (((71.0 / 140.0) + hh * (-12.0 / 7.0)) + tt * (1.0 / 7.0))))));
    [r2, r3, r4, r5, r6, r7]
}

/// [`reversion_coefficients`] at the inflection point, where H = u and T = 2u
/// with u = |x|/4: polynomials in u alone (expanded with sympy from the
/// general ones; the unit test compares the two).
fn inflection_coefficients(u: f64) -> [f64; 6] {
    let u2 = u * u;
    [
        0.0,
        u * (4.0 / 3.0),
        -u,
        u + u2 * (56.0 / 15.0),
        -u - u2 * (20.0 / 3.0),
        u + u2 * ((32.0 / 3.0) + u * (4064.0 / 315.0)),
    ]
}

/// δ from ν and the reversion coefficients, and the size of its last term.
fn reverted_step(nu: f64, r: &[f64; 6]) -> (f64, f64) {
    // The step is on the iteration's critical path. Grouped as
    // ν·(1 + R₂ν) + ν³·(R₃ + R₄ν) + ν⁵·(R₅ + R₆ν + R₇ν²), its longest chain is
    // five operations, against eight for ν + ν²·(polynomial in ν by Estrin).
    let nu2 = nu * nu;
    let nu3 = nu2 * nu;
    let nu5 = nu3 * nu2;
    let low = nu * (1.0 + r[0] * nu) + nu3 * (r[1] + r[2] * nu);
    let high = (r[3] + r[4] * nu) + nu2 * r[5];
    (low + nu5 * high, libm::fabs(r[5] * nu5 * nu2))
}

/// z with Φ(−z) = p for 0 < p ≤ ½, to about 4.5·10⁻⁴ absolute.
///
/// # Source
/// Abramowitz & Stegun (1964), eq. 26.2.23.
fn upper_quantile(p: f64) -> f64 {
    let t = libm::sqrt(-2.0 * libm::log(p));
    t - (2.515517 + t * (0.802853 + t * 0.010328))
        / (1.0 + t * (1.432788 + t * (0.189269 + t * 0.001308)))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// R₂…R₇ the long way: e_n by the recurrence for the exponential of a
    /// series, a_k = e_(k−1)/k, then Abramowitz & Stegun 3.6.25.
    fn reversion_by_recurrence(hh: f64, tt: f64) -> [f64; 6] {
        // c_j, j = 1…7: ln(b′(s(1+δ))/b′(s)) = Σ c_j δ^j.
        let mut c = [
            2.0 * hh - tt,
            -(3.0 * hh + 0.5 * tt),
            0.0,
            0.0,
            0.0,
            0.0,
            0.0,
        ];
        for (i, cj) in c.iter_mut().enumerate().skip(2) {
            let j = i + 1;
            let sign = if j % 2 == 1 { 1.0 } else { -1.0 };
            *cj = sign * (j as f64 + 1.0) * hh;
        }
        // e_n = (1/n)·Σ_(k=1..n) k·c_k·e_(n−k).
        let mut e = [1.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0];
        for n in 1..7 {
            let sum: f64 = c
                .iter()
                .take(n)
                .zip(e.iter().take(n).rev())
                .enumerate()
                .map(|(i, (ck, el))| (i + 1) as f64 * ck * el)
                .sum();
            if let Some(slot) = e.get_mut(n) {
                *slot = sum / n as f64;
            }
        }
        let a = |k: usize| e.get(k - 1).map_or(f64::NAN, |v| v / k as f64);
        let (a2, a3, a4, a5, a6, a7) = (a(2), a(3), a(4), a(5), a(6), a(7));
        [
            -a2,
            2.0 * a2.powi(2) - a3,
            -5.0 * a2.powi(3) + 5.0 * a2 * a3 - a4,
            14.0 * a2.powi(4) - 21.0 * a2.powi(2) * a3 + 6.0 * a2 * a4 + 3.0 * a3.powi(2) - a5,
            -42.0 * a2.powi(5) + 84.0 * a2.powi(3) * a3
                - 28.0 * a2.powi(2) * a4
                - 28.0 * a2 * a3.powi(2)
                + 7.0 * a2 * a5
                + 7.0 * a3 * a4
                - a6,
            132.0 * a2.powi(6) - 330.0 * a2.powi(4) * a3
                + 120.0 * a2.powi(3) * a4
                + 180.0 * a2.powi(2) * a3.powi(2)
                - 36.0 * a2.powi(2) * a5
                - 72.0 * a2 * a3 * a4
                + 8.0 * a2 * a6
                - 12.0 * a3.powi(3)
                + 8.0 * a3 * a5
                + 4.0 * a4.powi(2)
                - a7,
        ]
    }

    #[test]
    fn unit_reversion_coefficients_match_the_recurrence() {
        for (hh, tt) in [
            (0.0, 0.01),
            (0.02, 0.0625),
            (0.5, 0.36),
            (3.0, 0.25),
            (12.5, 12.5),
        ] {
            let direct = reversion_coefficients(hh, tt);
            let slow = reversion_by_recurrence(hh, tt);
            for (k, (d, w)) in direct.iter().zip(slow).enumerate() {
                let scale = w.abs().max(1.0);
                assert!(
                    (d - w).abs() <= 1e-12 * scale,
                    "R{} at H = {hh}, T = {tt}: {d} against {w}",
                    k + 2
                );
            }
        }
    }

    #[test]
    fn unit_inflection_coefficients_match_the_general_ones() {
        // Up to |x| = 10: beyond, the general polynomials' terms of opposite
        // sign (H and T both large) cancel and they lose more digits than this
        // comparison allows.
        for u in [0.0, 1e-6, 0.01, 0.25, 1.0, 2.5] {
            let at_inflection = inflection_coefficients(u);
            let general = reversion_coefficients(u, 2.0 * u);
            for (k, (a, g)) in at_inflection.iter().zip(general).enumerate() {
                assert!(
                    (a - g).abs() <= 1e-13 * g.abs().max(1.0),
                    "R{} at u = {u}: {a} against {g}",
                    k + 2
                );
            }
        }
    }

    #[test]
    fn ref_reverted_step_recovers_the_correction() {
        // (x, s, δ, ν) with ν = (b(s·(1 + δ)) − b(s))/(s·b′(s)), from mpmath
        // 1.3.0 at 50 digits. The degree-7 reversion leaves O(δ⁸): its error,
        // relative to s, stays within the last term (the solver's convergence
        // test) plus rounding.
        let cases = [
            (-0.3, 0.5, 0.01, 0.010_014_700_709_606_416_691),
            (-0.3, 0.5, -0.01, -0.009_984_947_937_238_991_136_1),
            (-2.0, 1.2, 0.004, 0.004_019_311_681_596_866_276_8),
            (-0.05, 0.8, -0.02, -0.020_031_021_449_991_623_344),
            (-8.0, 4.0, 0.01, 0.009_997_353_764_685_943_830_2),
        ];
        for (x, s, delta, nu) in cases {
            let h: f64 = x / s;
            let t = 0.5 * s;
            let (got, tail) = reverted_step(nu, &reversion_coefficients(0.5 * h * h, t * t));
            assert!(
                (got - delta).abs() <= tail + 2.0 * f64::EPSILON,
                "x = {x}, s = {s}: δ = {got}, want {delta}: {} ε, tail {tail:e}",
                (got - delta).abs() / f64::EPSILON
            );
        }
    }
}
