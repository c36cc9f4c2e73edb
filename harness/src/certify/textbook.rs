//! The worked-example suite: each published value against the kernel.

use crate::cases::textbook::TextbookCase;
use crate::tolerance;

/// One worked example as the kernel reproduces it.
#[derive(Debug, Clone, PartialEq)]
pub struct TextbookResult {
    /// Case id.
    pub id: String,
    /// The quantity.
    pub quantity: String,
    /// The kernel's value, scaled as the book prints it (NaN when refused).
    pub ours: f64,
    /// |ours − printed| in units of half the last printed decimal.
    pub printed_units: f64,
    /// |ours − recomputed| relative to max(1, |recomputed|), in units of the
    /// [`tolerance::TEXTBOOK`] limit's base ε.
    pub recomputed_units: f64,
    /// Both checks pass.
    pub passes: bool,
    /// The source, with its memory flag.
    pub source: String,
}

/// The kernel's value for a case's quantity, unscaled.
fn kernel_value(case: &TextbookCase) -> Result<f64, String> {
    let contract = calor::Contract {
        kind: case.kind.into(),
        strike: case.strike,
        expiry: case.expiry,
    };
    let market = calor::Market {
        spot: case.spot,
        rate: case.rate,
        dividend_yield: case.dividend_yield,
    };
    if case.quantity == "implied_vol" {
        let premium = case.premium.ok_or("implied_vol row without a premium")?;
        return calor::implied_vol(&contract, &market, premium).map_err(|e| e.to_string());
    }
    let vol = case.vol.ok_or("row without a vol")?;
    let g = calor::greeks(&contract, &market, vol).map_err(|e| e.to_string())?;
    if case.quantity == "carry_rho" {
        // ∂V/∂b at fixed r, with q = r − b.
        return Ok(-g.dividend_rho);
    }
    g.named()
        .iter()
        .find(|(name, _)| *name == case.quantity)
        .map(|(_, v)| *v)
        .ok_or_else(|| format!("unknown quantity {}", case.quantity))
}

/// Checks every worked example.
pub fn measure_textbook(cases: &[TextbookCase]) -> Vec<TextbookResult> {
    cases
        .iter()
        .map(|case| {
            let ours = kernel_value(case).map_or(f64::NAN, |v| v * case.scale);
            let half_decimal = 0.5 * 10f64.powi(-case.printed_decimals);
            let printed_units = (ours - case.printed).abs() / half_decimal;
            let recomputed_units =
                (ours - case.recomputed).abs() / (f64::EPSILON * case.recomputed.abs().max(1.0));
            TextbookResult {
                id: case.id.clone(),
                quantity: case.quantity.clone(),
                ours,
                printed_units,
                recomputed_units,
                passes: printed_units <= tolerance::PRINTED.limit
                    && recomputed_units <= tolerance::TEXTBOOK.limit,
                source: format!("{} ({})", case.source, case.citation),
            }
        })
        .collect()
}
