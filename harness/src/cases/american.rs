//! `american/references.csv` and `american/published.csv`: American options
//! valued by an independent binomial method, and published converged values.

use serde::Deserialize;

use crate::cases::black::{Inputs, KindCell};

/// One American reference: inputs, the reference value and its uncertainty.
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct AmericanCase {
    /// Case id.
    pub id: String,
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
    /// The reference American value.
    pub reference: f64,
    /// Estimated uncertainty of `reference` (its change over one refinement).
    pub reference_error: f64,
    /// Steps of the tree behind `reference`.
    pub steps: u64,
    /// The value as printed by its source, when the table gives one.
    #[serde(default)]
    pub printed: Option<f64>,
    /// Decimals printed, with `printed`.
    #[serde(default)]
    pub printed_decimals: Option<i32>,
}

impl AmericanCase {
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
}
