//! The kernel's one error type.

use core::fmt;

/// The input or output quantity an [`Error`] is about.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum Field {
    /// `Market::spot`.
    Spot,
    /// `Contract::strike`.
    Strike,
    /// `Contract::expiry`.
    Expiry,
    /// `Market::rate`.
    Rate,
    /// `Market::dividend_yield`.
    DividendYield,
    /// The volatility argument.
    Vol,
    /// The premium argument of the implied-volatility solver.
    Premium,
    /// The kind of a batch element.
    Kind,
    /// An output slice of a batch function.
    Output,
    /// The status slice of a batch function.
    Status,
}

impl Field {
    /// The field's name as it appears in the public API (`spot`, `strike`, ...).
    ///
    /// # Examples
    /// ```
    /// assert_eq!(calor::Field::DividendYield.name(), "dividend_yield");
    /// ```
    pub const fn name(self) -> &'static str {
        match self {
            Field::Spot => "spot",
            Field::Strike => "strike",
            Field::Expiry => "expiry",
            Field::Rate => "rate",
            Field::DividendYield => "dividend_yield",
            Field::Vol => "vol",
            Field::Premium => "premium",
            Field::Kind => "kind",
            Field::Output => "output",
            Field::Status => "status",
        }
    }
}

impl fmt::Display for Field {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// The grid or scheme parameter an [`Error::InvalidGrid`] is about.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum GridParameter {
    /// The node count: at least 3 for a heat step, 5 for a valuation grid.
    Nodes,
    /// The time-step count: at least 1.
    Steps,
    /// The scheme weight θ: in [0, 1].
    Theta,
    /// The Rannacher start-up: at most one per time step.
    RannacherSteps,
    /// The exponent of the time grading: in [1, 4].
    Grading,
    /// The domain half-width in units of σ√T: finite and at least 1.
    Width,
    /// The diffusivity κ: finite and > 0.
    Kappa,
    /// The time step Δτ: finite and > 0.
    TimeStep,
    /// The node spacing Δx: finite and > 0.
    SpaceStep,
    /// The mesh ratio κ·Δτ/Δx²: finite.
    MeshRatio,
    /// A Dirichlet end value: finite.
    Boundary,
    /// The caller's workspace slice: too short for the grid.
    Workspace,
}

impl GridParameter {
    /// The parameter's name (`nodes`, `steps`, `theta`, ...).
    ///
    /// # Examples
    /// ```
    /// assert_eq!(calor::GridParameter::RannacherSteps.name(), "rannacher_steps");
    /// ```
    pub const fn name(self) -> &'static str {
        match self {
            GridParameter::Nodes => "nodes",
            GridParameter::Steps => "steps",
            GridParameter::Theta => "theta",
            GridParameter::RannacherSteps => "rannacher_steps",
            GridParameter::Grading => "grading",
            GridParameter::Width => "width",
            GridParameter::Kappa => "kappa",
            GridParameter::TimeStep => "time_step",
            GridParameter::SpaceStep => "space_step",
            GridParameter::MeshRatio => "mesh_ratio",
            GridParameter::Boundary => "boundary",
            GridParameter::Workspace => "workspace",
        }
    }

    const fn requirement(self) -> &'static str {
        match self {
            GridParameter::Nodes => "too few nodes, or not the size the scheme was factored for",
            GridParameter::Steps => "must be at least 1",
            GridParameter::Theta => "must lie in [0, 1]",
            GridParameter::RannacherSteps => "must not exceed the time steps",
            GridParameter::Grading => "must lie in [1, 4]",
            GridParameter::Width => "must be finite and at least 1",
            GridParameter::Kappa | GridParameter::TimeStep | GridParameter::SpaceStep => {
                "must be finite and greater than zero"
            }
            GridParameter::MeshRatio | GridParameter::Boundary => "not a finite number",
            GridParameter::Workspace => "slice too short for the grid",
        }
    }
}

impl fmt::Display for GridParameter {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Why a kernel function refused its input or could not represent its result.
///
/// Every variant that is about one input names it, so a caller can report the
/// offending field of a row without guessing.
///
/// # Examples
/// ```
/// use calor::{price, Contract, Error, Field, Kind, Market};
/// let c = Contract { kind: Kind::Call, strike: 100.0, expiry: 1.0 };
/// let m = Market { spot: f64::NAN, rate: 0.01, dividend_yield: 0.0 };
/// assert_eq!(price(&c, &m, 0.2), Err(Error::NotFinite { field: Field::Spot }));
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum Error {
    /// The field is NaN or infinite.
    NotFinite {
        /// The offending field.
        field: Field,
    },
    /// The field must be strictly positive (spot, strike) and is not.
    NotPositive {
        /// The offending field.
        field: Field,
    },
    /// The field must not be negative (expiry, volatility) and is.
    Negative {
        /// The offending field.
        field: Field,
    },
    /// Greeks at zero volatility or zero expiry with the forward exactly at
    /// the strike: gamma and its relatives diverge there.
    SingularAtStrike,
    /// The premium is at or below the no-arbitrage lower bound
    /// max(0, ±(S·e^(−qT) − K·e^(−rT))): no volatility reproduces it.
    PremiumBelowIntrinsic,
    /// The premium is at or above the no-arbitrage upper bound (S·e^(−qT) for a
    /// call, K·e^(−rT) for a put): no volatility reproduces it.
    PremiumAboveMaximum,
    /// A slice of a batch call has a different length from the batch's
    /// `kinds`; nothing was computed.
    LengthMismatch {
        /// The slice whose length differs.
        field: Field,
    },
    /// The result exceeds the range of `f64` (for example a put struck near
    /// `f64::MAX` under a negative rate).
    Overflow,
    /// A grid or scheme parameter is out of its range.
    InvalidGrid {
        /// The offending parameter.
        parameter: GridParameter,
    },
    /// The explicit part of a θ-scheme with θ < ½ would amplify errors:
    /// κ·Δτ/Δx²·(1 − 2θ) > ½ (for the explicit scheme, κ·Δτ/Δx² > ½).
    UnstableStep,
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Error::NotFinite { field } => write!(f, "{field}: not a finite number"),
            Error::NotPositive { field } => write!(f, "{field}: must be greater than zero"),
            Error::Negative { field } => write!(f, "{field}: must not be negative"),
            Error::SingularAtStrike => f.write_str(
                "vol: Greeks diverge at zero volatility or expiry with the forward at the strike",
            ),
            Error::PremiumBelowIntrinsic => {
                f.write_str("premium: at or below the discounted intrinsic value of the forward")
            }
            Error::PremiumAboveMaximum => {
                f.write_str("premium: at or above the no-arbitrage maximum of the option")
            }
            Error::LengthMismatch { field } => {
                write!(f, "{field}: slice length differs from the batch's")
            }
            Error::Overflow => f.write_str("result: exceeds the range of f64"),
            Error::InvalidGrid { parameter } => {
                write!(f, "{parameter}: {}", parameter.requirement())
            }
            Error::UnstableStep => f.write_str(
                "mesh_ratio: the explicit scheme is unstable for kappa*dt/dx^2 above 1/2",
            ),
        }
    }
}

impl core::error::Error for Error {}
