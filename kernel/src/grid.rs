//! Vanilla options, European or American, on a Crank–Nicolson heat-equation grid.
//!
//! # Formula
//! The Black–Scholes–Merton equation becomes u_τ = u_xx under
//! x = ln(S/K), τ = σ²(T−t)/2, V = K·e^(αx+βτ)·u (see the `transform` module).
//! The domain is x ∈ [min(x_S, 0) − w·σ√T, max(x_S, 0) + w·σ√T], shifted by
//! less than a cell so the spot is a node; the node whose cell holds the
//! strike starts from the cell mean of the payoff. The first time steps are
//! replaced by fully implicit half steps (Rannacher start-up), which damp the
//! high-frequency error of the payoff's kink that Crank–Nicolson alone keeps;
//! the rest use the spec's θ. The time levels are graded, τ_k = τ_max·(k/N)^p. American exercise projects onto the payoff in
//! every solve (Brennan–Schwartz sweep). With Richardson extrapolation the
//! grid is solved twice, the second time with half the node spacing and half
//! the time step, and each output is (4·fine − coarse)/3.
//!
//! # Source
//! R. Rannacher, "Finite element solution of diffusion problems with irregular
//! data", Numer. Math. 43 (1984) 309–327; M. J. Brennan & E. S. Schwartz,
//! "The valuation of American put options", J. Finance 32 (1977) 449–462;
//! J. Crank & P. Nicolson (1947); L. F. Richardson, "The deferred approach to
//! the limit", Phil. Trans. R. Soc. A 226 (1927) 299–361; the cell mean of the
//! payoff as in D. M. Pooley, K. R. Vetzal & P. A. Forsyth, "Convergence
//! remedies for non-smooth payoffs in option pricing", J. Comput. Finance 6
//! (2003) 25–40 (all from memory).

mod march;
mod readoff;
mod transform;

use crate::contract::{validate, Contract, Kind, Market};
use crate::error::{Error, Field, GridParameter};

use march::{march, Layout, Schedule};
use transform::Transform;

/// When the holder may exercise.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "lowercase"))]
pub enum Exercise {
    /// At expiry only.
    European,
    /// At any time up to expiry.
    American,
}

/// The grid a valuation runs on.
///
/// # Examples
/// ```
/// use calor::{Exercise, GridSpec};
/// let spec = GridSpec { exercise: Exercise::European, ..GridSpec::AMERICAN };
/// assert!(spec.workspace_len().is_some());
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct GridSpec {
    /// Nodes in x, end nodes included (at least 5).
    pub nodes: usize,
    /// Time steps from expiry to the valuation date (at least 1).
    pub steps: usize,
    /// Weight of the implicit side: ½ is Crank–Nicolson.
    pub theta: f64,
    /// Leading time steps each replaced by two fully implicit half steps
    /// (Rannacher start-up; at most `steps`).
    pub rannacher_steps: usize,
    /// Exponent p of the time levels τ_k = τ_max·(k/N)^p, from 1 (uniform) to 4;
    /// 2 resolves the early-exercise boundary near expiry.
    pub grading: f64,
    /// Half-width of the domain beyond spot and strike, in units of σ√T (at least 1).
    pub width: f64,
    /// European or American exercise.
    pub exercise: Exercise,
    /// Solve a second grid with half the spacing and step and extrapolate.
    pub richardson: bool,
}

impl GridSpec {
    /// The grid of [`american_price`]: see its accuracy and cost there.
    pub const AMERICAN: GridSpec = GridSpec {
        nodes: 241,
        steps: 60,
        theta: 0.5,
        rannacher_steps: 2,
        grading: 2.0,
        width: 5.0,
        exercise: Exercise::American,
        richardson: true,
    };

    /// The number of `f64` the workspace of [`grid_value`] needs for this spec,
    /// or `None` if it overflows `usize`.
    pub const fn workspace_len(&self) -> Option<usize> {
        let nodes = if self.richardson {
            match self.nodes.checked_mul(2) {
                Some(n) => n,
                None => return None,
            }
        } else {
            self.nodes
        };
        nodes.checked_mul(3)
    }
}

/// What [`grid_value`] reads off the grid at the spot.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct GridValue {
    /// V.
    pub price: f64,
    /// ∂V/∂S.
    pub delta: f64,
    /// ∂²V/∂S².
    pub gamma: f64,
    /// The spot level at which immediate exercise starts at the valuation date
    /// (below it for a put, above it for a call); `None` for European
    /// exercise, or when no grid node is exercised.
    pub boundary: Option<f64>,
}

/// Values a vanilla option on the grid `spec`, in the caller's `workspace`.
///
/// # Accuracy
/// European exercise with Richardson off: price, delta and gamma converge
/// at second order in the node spacing (tests `conv_grid_*`).
///
/// # Errors
/// As [`crate::price`]; [`Error::NotPositive`] for an expiry or vol of 0;
/// [`Error::InvalidGrid`] naming the spec field out of range or `workspace`
/// if it holds fewer than [`GridSpec::workspace_len`] entries;
/// [`Error::UnstableStep`] for an explicit θ too large for the grid;
/// [`Error::Overflow`] if the transform's scale factors leave the range of
/// `f64` (vol tiny against the rates and the expiry).
///
/// # Examples
/// ```
/// use calor::{grid_value, Contract, GridSpec, Kind, Market};
/// // An American put on the NGX barley index (Nordwind Grain Exchange).
/// let c = Contract { kind: Kind::Put, strike: 50.0, expiry: 5.0 / 12.0 };
/// let m = Market { spot: 50.0, rate: 0.1, dividend_yield: 0.0 };
/// let mut workspace = [0.0; 1446];
/// let v = grid_value(&c, &m, 0.4, &GridSpec::AMERICAN, &mut workspace)?;
/// assert!((v.price - 4.2842).abs() < 1e-4);
/// assert!(v.boundary.is_some_and(|b| b < 50.0));
/// # Ok::<(), calor::Error>(())
/// ```
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn grid_value(
    contract: &Contract,
    market: &Market,
    vol: f64,
    spec: &GridSpec,
    workspace: &mut [f64],
) -> Result<GridValue, Error> {
    validate(contract, market, vol)?;
    if contract.expiry == 0.0 {
        return Err(Error::NotPositive {
            field: Field::Expiry,
        });
    }
    if vol == 0.0 {
        return Err(Error::NotPositive { field: Field::Vol });
    }
    check_spec(spec)?;
    let needed = spec.workspace_len().ok_or(invalid(GridParameter::Nodes))?;
    if workspace.len() < needed {
        return Err(invalid(GridParameter::Workspace));
    }
    let t = Transform::new(contract, market, vol);
    let coarse = layout(&t, spec);
    let schedule = Schedule {
        steps: spec.steps,
        theta: spec.theta,
        rannacher_steps: spec.rannacher_steps,
        grading: spec.grading,
        american: spec.exercise == Exercise::American,
    };
    let first = solve(&t, &coarse, &schedule, workspace)?;
    let value = if spec.richardson {
        let fine = coarse.refined().ok_or(invalid(GridParameter::Nodes))?;
        let steps = spec
            .steps
            .checked_mul(2)
            .ok_or(invalid(GridParameter::Steps))?;
        let second = solve(&t, &fine, &Schedule { steps, ..schedule }, workspace)?;
        let extrapolate = |f: f64, c: f64| (4.0 * f - c) / 3.0;
        GridValue {
            price: extrapolate(second.price, first.price),
            delta: extrapolate(second.delta, first.delta),
            gamma: extrapolate(second.gamma, first.gamma),
            boundary: second.boundary,
        }
    } else {
        first
    };
    let mut value = value;
    // Extrapolation and rounding may undercut the payoff (or zero, far out of
    // the money) by a rounding-sized amount; an option value never does.
    let floor = if schedule.american {
        (t.omega * (market.spot - contract.strike)).max(0.0)
    } else {
        0.0
    };
    // And never above what the option can pay: the spot (call) or the strike
    // (put), discounted for European exercise; for American exercise the holder
    // may also wait, which is worth more than exercising now only when the rate
    // (put) or the yield (call) is negative.
    let t_exp = contract.expiry;
    let (cap_now, carry) = match contract.kind {
        Kind::Call => (market.spot, market.dividend_yield),
        Kind::Put => (contract.strike, market.rate),
    };
    let grown = cap_now * libm::exp(-carry * t_exp);
    let cap = if schedule.american {
        grown.max(cap_now)
    } else {
        grown
    };
    value.price = value.price.max(floor).min(cap);
    let finite = [value.price, value.delta, value.gamma]
        .iter()
        .all(|v| v.is_finite());
    if finite && value.boundary.is_none_or(f64::is_finite) {
        Ok(value)
    } else {
        Err(Error::Overflow)
    }
}

/// The American value of a vanilla option on the default grid [`GridSpec::AMERICAN`].
///
/// 241 nodes × 60 time steps, extrapolated from a second grid of 481 × 120;
/// the grid lives on the stack (1,446 `f64`), nothing is allocated.
///
/// # Accuracy
/// Within 1e-6·K of a converged binomial reference on spot/strike 0.8–1.25,
/// expiry 0.1–2 years, vol 10–60 %, rate 2–8 % and dividend yield 0–3 %
/// (test `ref_american_references`, tables in `reference-cases/american/`).
///
/// # Errors
/// As [`grid_value`].
///
/// # Examples
/// ```
/// use calor::{american_price, Contract, Kind, Market};
/// let c = Contract { kind: Kind::Put, strike: 50.0, expiry: 5.0 / 12.0 };
/// let m = Market { spot: 50.0, rate: 0.1, dividend_yield: 0.0 };
/// assert!((american_price(&c, &m, 0.4)? - 4.2842).abs() < 1e-4);
/// # Ok::<(), calor::Error>(())
/// ```
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn american_price(contract: &Contract, market: &Market, vol: f64) -> Result<f64, Error> {
    let mut workspace = [0.0; DEFAULT_WORKSPACE];
    grid_value(contract, market, vol, &GridSpec::AMERICAN, &mut workspace).map(|v| v.price)
}

/// The workspace of [`american_price`], checked against its spec when compiled.
const DEFAULT_WORKSPACE: usize = 6 * GridSpec::AMERICAN.nodes;
const _: () =
    assert!(matches!(GridSpec::AMERICAN.workspace_len(), Some(n) if n <= DEFAULT_WORKSPACE));

fn check_spec(spec: &GridSpec) -> Result<(), Error> {
    if spec.nodes < 5 {
        return Err(invalid(GridParameter::Nodes));
    }
    if spec.steps == 0 {
        return Err(invalid(GridParameter::Steps));
    }
    if !(0.0..=1.0).contains(&spec.theta) {
        return Err(invalid(GridParameter::Theta));
    }
    if spec.rannacher_steps > spec.steps {
        return Err(invalid(GridParameter::RannacherSteps));
    }
    if !(1.0..=4.0).contains(&spec.grading) {
        return Err(invalid(GridParameter::Grading));
    }
    if !(spec.width.is_finite() && spec.width >= 1.0) {
        return Err(invalid(GridParameter::Width));
    }
    Ok(())
}

/// The coarse layout: the domain of the spec, shifted so the spot is a node.
fn layout(t: &Transform, spec: &GridSpec) -> Layout {
    let reach = spec.width * t.total_vol;
    let y_spot = t.omega * t.x_spot;
    let (lo, hi) = (y_spot.min(0.0) - reach, y_spot.max(0.0) + reach);
    let last = spec.nodes - 1;
    let spacing = (hi - lo) / last as f64;
    // max/min rather than clamp: check_spec guarantees last ≥ 4, but clamp's own
    // min > max panic would otherwise stay reachable for the optimiser.
    let spot_node = (libm::round((y_spot - lo) / spacing) as usize)
        .max(1)
        .min(last.saturating_sub(1));
    Layout {
        nodes: spec.nodes,
        start: y_spot - spot_node as f64 * spacing,
        spacing,
        spot_node,
    }
}

fn solve(
    t: &Transform,
    layout: &Layout,
    schedule: &Schedule,
    workspace: &mut [f64],
) -> Result<GridValue, Error> {
    let n = layout.nodes;
    let short = invalid(GridParameter::Workspace);
    let (u, rest) = workspace.split_at_mut_checked(n).ok_or(short)?;
    let (floor, rest) = rest.split_at_mut_checked(n).ok_or(short)?;
    let pivots = rest.get_mut(..n - 2).ok_or(short)?;
    march(t, layout, schedule, u, floor, pivots)?;
    let [price, delta, gamma] = readoff::greeks_at_spot(t, layout, u).ok_or(short)?;
    let boundary = if schedule.american {
        readoff::exercise_boundary(t, layout, u, floor)
    } else {
        None
    };
    Ok(GridValue {
        price,
        delta,
        gamma,
        boundary,
    })
}

const fn invalid(parameter: GridParameter) -> Error {
    Error::InvalidGrid { parameter }
}
