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
        }
    }
}

impl fmt::Display for Field {
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
    /// The result exceeds the range of `f64` (for example a put struck near
    /// `f64::MAX` under a negative rate).
    Overflow,
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
            Error::Overflow => f.write_str("result: exceeds the range of f64"),
        }
    }
}

impl core::error::Error for Error {}
