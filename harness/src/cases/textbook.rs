//! `textbook/european.csv`: worked examples from published books, each with its source.

use serde::Deserialize;

use crate::cases::black::KindCell;

/// One worked example: inputs, the value as printed, and a 30-digit recomputation.
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct TextbookCase {
    /// Case id (E01, G07, ...).
    pub id: String,
    /// What the book computes: price, a Greek, carry_rho or implied_vol.
    pub quantity: String,
    /// Call or put.
    pub kind: KindCell,
    /// Spot (escrowed for discrete dividends, see the tables' README).
    pub spot: f64,
    /// Strike.
    pub strike: f64,
    /// Expiry in years.
    pub expiry: f64,
    /// Rate.
    pub rate: f64,
    /// Dividend yield (or foreign rate, or the rate for futures).
    pub dividend_yield: f64,
    /// Volatility; empty for implied-volatility rows.
    pub vol: Option<f64>,
    /// Premium; only for implied-volatility rows.
    pub premium: Option<f64>,
    /// Factor applied to the raw quantity (1/365 for theta per day).
    pub scale: f64,
    /// The value as the book prints it.
    pub printed: f64,
    /// Decimals printed.
    pub printed_decimals: i32,
    /// The value recomputed at 30 digits from the same inputs.
    pub recomputed: f64,
    /// Book, edition and example.
    pub source: String,
    /// `verified` or `memory`.
    pub citation: String,
}
