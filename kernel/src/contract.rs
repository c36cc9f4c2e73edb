//! The data a valuation starts from: the option, the market, and the result of [`crate::greeks`].

use crate::error::{Error, Field};

/// Call or put.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "lowercase"))]
pub enum Kind {
    /// The right to buy at the strike.
    Call,
    /// The right to sell at the strike.
    Put,
}

/// A vanilla option: kind, strike and time to expiry in years.
///
/// # Examples
/// ```
/// let c = calor::Contract { kind: calor::Kind::Put, strike: 95.0, expiry: 0.5 };
/// assert_eq!(c.expiry, 0.5);
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Contract {
    /// Call or put.
    pub kind: Kind,
    /// Strike price, in the currency of the spot.
    pub strike: f64,
    /// Time to expiry in years (0 means at expiry).
    pub expiry: f64,
}

/// The market a contract is valued in; rates are continuously compounded, per year.
///
/// Mappings to the usual variants of the model:
/// - Black-76 on a futures price: `spot` = the futures price, `dividend_yield` = `rate`.
/// - Garman–Kohlhagen for a currency pair: `rate` = the domestic rate,
///   `dividend_yield` = the foreign rate.
/// - Cost of carry: b = `rate` − `dividend_yield`.
///
/// # Examples
/// ```
/// // A futures option: the futures price is the spot and it carries at zero cost.
/// let m = calor::Market { spot: 19.0, rate: 0.1, dividend_yield: 0.1 };
/// assert_eq!(m.rate - m.dividend_yield, 0.0);
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Market {
    /// Price of the underlying today.
    pub spot: f64,
    /// Risk-free rate r, continuously compounded.
    pub rate: f64,
    /// Continuous dividend yield q (or foreign rate, or r for futures).
    pub dividend_yield: f64,
}

/// Price and sensitivities of a European option, as raw partial derivatives.
///
/// Conventions: V is the price, S the spot, σ the volatility (per 1.00, not per
/// percentage point), T the time to expiry, t calendar time (so ∂/∂t = −∂/∂T,
/// per year), r the rate and q the dividend yield. Nothing is rescaled: divide
/// theta by 365 for a per-day figure, vega by 100 for a per-vol-point figure.
///
/// # Examples
/// ```
/// use calor::{greeks, Contract, Kind, Market};
/// let g = greeks(
///     &Contract { kind: Kind::Call, strike: 100.0, expiry: 1.0 },
///     &Market { spot: 100.0, rate: 0.0, dividend_yield: 0.0 },
///     0.2,
/// )?;
/// assert!((g.delta - 0.5398).abs() < 1e-4);
/// # Ok::<(), calor::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Greeks {
    /// V.
    pub price: f64,
    /// ∂V/∂S.
    pub delta: f64,
    /// ∂²V/∂S².
    pub gamma: f64,
    /// ∂V/∂σ.
    pub vega: f64,
    /// ∂V/∂t = −∂V/∂T, per year.
    pub theta: f64,
    /// ∂V/∂r.
    pub rho: f64,
    /// ∂V/∂q.
    pub dividend_rho: f64,
    /// ∂²V/∂S∂σ.
    pub vanna: f64,
    /// ∂²V/∂σ².
    pub volga: f64,
    /// ∂Δ/∂t = −∂²V/∂S∂T.
    pub charm: f64,
    /// ∂vega/∂t = −∂²V/∂σ∂T.
    pub veta: f64,
    /// ∂Γ/∂S = ∂³V/∂S³.
    pub speed: f64,
    /// ∂Γ/∂σ = ∂³V/∂S²∂σ.
    pub zomma: f64,
    /// ∂Γ/∂t = −∂³V/∂S²∂T.
    pub color: f64,
    /// ∂³V/∂σ³.
    pub ultima: f64,
}

impl Greeks {
    /// The fifteen field names, in declaration order.
    ///
    /// # Examples
    /// ```
    /// assert_eq!(calor::Greeks::NAMES[6], "dividend_rho");
    /// ```
    pub const NAMES: [&'static str; 15] = [
        "price",
        "delta",
        "gamma",
        "vega",
        "theta",
        "rho",
        "dividend_rho",
        "vanna",
        "volga",
        "charm",
        "veta",
        "speed",
        "zomma",
        "color",
        "ultima",
    ];

    /// All fifteen values with their names, in declaration order.
    ///
    /// # Examples
    /// ```
    /// let g = calor::Greeks::default();
    /// assert_eq!(g.named()[14].0, "ultima");
    /// ```
    pub const fn named(&self) -> [(&'static str, f64); 15] {
        let n = Self::NAMES;
        [
            (n[0], self.price),
            (n[1], self.delta),
            (n[2], self.gamma),
            (n[3], self.vega),
            (n[4], self.theta),
            (n[5], self.rho),
            (n[6], self.dividend_rho),
            (n[7], self.vanna),
            (n[8], self.volga),
            (n[9], self.charm),
            (n[10], self.veta),
            (n[11], self.speed),
            (n[12], self.zomma),
            (n[13], self.color),
            (n[14], self.ultima),
        ]
    }
}

/// Checks every input of a valuation and names the first bad field.
///
/// Order of checks: spot, strike, expiry, rate, dividend yield, vol.
///
/// # Errors
/// [`Error::NotFinite`] for NaN or ±∞, [`Error::NotPositive`] for spot or strike
/// ≤ 0, [`Error::Negative`] for expiry or vol < 0.
#[inline]
pub(crate) fn validate(contract: &Contract, market: &Market, vol: f64) -> Result<(), Error> {
    // One combined test on the hot path, on the bit patterns: a few integer
    // compares and one branch. (Written as float compares, the optimiser turns
    // each into a classification several times longer.) The test may be
    // stricter than the rules (it refuses −0 for expiry and vol); the cold path
    // applies the rules exactly and names the field.
    const INFINITY: u64 = 0x7FF0_0000_0000_0000;
    let positive_bits = |v: f64| v.to_bits().wrapping_sub(1) < INFINITY - 1;
    let non_negative_bits = |v: f64| v.to_bits() < INFINITY;
    let finite_bits = |v: f64| v.to_bits() & !(1 << 63) < INFINITY;
    let fine = positive_bits(market.spot)
        & positive_bits(contract.strike)
        & non_negative_bits(contract.expiry)
        & finite_bits(market.rate)
        & finite_bits(market.dividend_yield)
        & non_negative_bits(vol);
    if fine {
        Ok(())
    } else {
        diagnose(contract, market, vol)
    }
}

/// The first bad field, in the order of [`validate`].
#[cold]
#[inline(never)]
fn diagnose(contract: &Contract, market: &Market, vol: f64) -> Result<(), Error> {
    positive(market.spot, Field::Spot)?;
    positive(contract.strike, Field::Strike)?;
    non_negative(contract.expiry, Field::Expiry)?;
    finite(market.rate, Field::Rate)?;
    finite(market.dividend_yield, Field::DividendYield)?;
    non_negative(vol, Field::Vol)
}

pub(crate) fn finite(value: f64, field: Field) -> Result<(), Error> {
    if value.is_finite() {
        Ok(())
    } else {
        Err(Error::NotFinite { field })
    }
}

pub(crate) fn positive(value: f64, field: Field) -> Result<(), Error> {
    finite(value, field)?;
    if value > 0.0 {
        Ok(())
    } else {
        Err(Error::NotPositive { field })
    }
}

pub(crate) fn non_negative(value: f64, field: Field) -> Result<(), Error> {
    finite(value, field)?;
    if value >= 0.0 {
        Ok(())
    } else {
        Err(Error::Negative { field })
    }
}
