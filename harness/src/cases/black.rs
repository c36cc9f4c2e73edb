//! The closed-form tables: `black/greeks.csv` (price and all Greeks) and
//! `black/implied.csv` (implied-volatility round trips).

use serde::Deserialize;

/// Call or put as written in the tables.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum KindCell {
    /// `call`.
    Call,
    /// `put`.
    Put,
}

impl From<KindCell> for calor::Kind {
    fn from(k: KindCell) -> Self {
        match k {
            KindCell::Call => calor::Kind::Call,
            KindCell::Put => calor::Kind::Put,
        }
    }
}

/// The inputs of one closed-form case.
#[derive(Debug, Clone, Copy, PartialEq, Deserialize)]
pub struct Inputs {
    /// Call or put.
    pub kind: KindCell,
    /// Spot.
    pub spot: f64,
    /// Strike.
    pub strike: f64,
    /// Expiry in years.
    pub expiry: f64,
    /// Rate.
    pub rate: f64,
    /// Dividend yield.
    pub dividend_yield: f64,
    /// Volatility.
    pub vol: f64,
}

impl Inputs {
    /// The kernel's contract.
    pub fn contract(&self) -> calor::Contract {
        calor::Contract {
            kind: self.kind.into(),
            strike: self.strike,
            expiry: self.expiry,
        }
    }

    /// The kernel's market.
    pub fn market(&self) -> calor::Market {
        calor::Market {
            spot: self.spot,
            rate: self.rate,
            dividend_yield: self.dividend_yield,
        }
    }

    /// Standardised moneyness ln(F/K)/(σ√T).
    pub fn standardised_moneyness(&self) -> f64 {
        let x = (self.spot / self.strike).ln() + (self.rate - self.dividend_yield) * self.expiry;
        x / self.total_vol()
    }

    /// σ√T.
    pub fn total_vol(&self) -> f64 {
        self.vol * self.expiry.sqrt()
    }
}

/// One row of `black/greeks.csv`: inputs, references at 30 digits, and κ.
///
/// Flat (no nested structs) because the CSV reader cannot flatten numbers.
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct GreeksCase {
    /// Case id.
    pub id: String,
    /// The sampling stratum.
    pub stratum: String,
    /// Call or put.
    pub kind: KindCell,
    /// Spot.
    pub spot: f64,
    /// Strike.
    pub strike: f64,
    /// Expiry in years.
    pub expiry: f64,
    /// Rate.
    pub rate: f64,
    /// Dividend yield.
    pub dividend_yield: f64,
    /// Volatility.
    pub vol: f64,
    /// Reference price.
    pub price: f64,
    /// Reference delta.
    pub delta: f64,
    /// Reference gamma.
    pub gamma: f64,
    /// Reference vega.
    pub vega: f64,
    /// Reference theta.
    pub theta: f64,
    /// Reference rho.
    pub rho: f64,
    /// Reference dividend_rho.
    pub dividend_rho: f64,
    /// Reference vanna.
    pub vanna: f64,
    /// Reference volga.
    pub volga: f64,
    /// Reference charm.
    pub charm: f64,
    /// Reference veta.
    pub veta: f64,
    /// Reference speed.
    pub speed: f64,
    /// Reference zomma.
    pub zomma: f64,
    /// Reference color.
    pub color: f64,
    /// Reference ultima.
    pub ultima: f64,
    /// Relative condition number of the price.
    pub kappa: f64,
}

impl GreeksCase {
    /// The inputs of the case.
    pub fn inputs(&self) -> Inputs {
        Inputs {
            kind: self.kind,
            spot: self.spot,
            strike: self.strike,
            expiry: self.expiry,
            rate: self.rate,
            dividend_yield: self.dividend_yield,
            vol: self.vol,
        }
    }

    /// The reference values.
    pub fn reference(&self) -> calor::Greeks {
        calor::Greeks {
            price: self.price,
            delta: self.delta,
            gamma: self.gamma,
            vega: self.vega,
            theta: self.theta,
            rho: self.rho,
            dividend_rho: self.dividend_rho,
            vanna: self.vanna,
            volga: self.volga,
            charm: self.charm,
            veta: self.veta,
            speed: self.speed,
            zomma: self.zomma,
            color: self.color,
            ultima: self.ultima,
        }
    }
}

/// One row of `black/implied.csv`: a premium rounded from a 30-digit price at a known vol.
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct ImpliedCase {
    /// Case id.
    pub id: String,
    /// The sampling stratum.
    pub stratum: String,
    /// Call or put.
    pub kind: KindCell,
    /// Spot.
    pub spot: f64,
    /// Strike.
    pub strike: f64,
    /// Expiry in years.
    pub expiry: f64,
    /// Rate.
    pub rate: f64,
    /// Dividend yield.
    pub dividend_yield: f64,
    /// The true volatility.
    pub vol: f64,
    /// The price at `vol`, rounded to the nearest f64.
    pub premium: f64,
    /// The price at `vol` (30 digits, read to the nearest f64).
    pub price: f64,
    /// Vega at `vol`.
    pub vega: f64,
    /// Relative condition number of the price.
    pub kappa: f64,
}

impl ImpliedCase {
    /// The inputs of the case (at the true vol).
    pub fn inputs(&self) -> Inputs {
        Inputs {
            kind: self.kind,
            spot: self.spot,
            strike: self.strike,
            expiry: self.expiry,
            rate: self.rate,
            dividend_yield: self.dividend_yield,
            vol: self.vol,
        }
    }
}
