//! `calor price`: one European option, its price and all fifteen Greeks, as an
//! aligned table or as one JSON object.

use std::fmt::Write as _;

use calor::{Contract, Greeks, Market};
use serde::Serialize;

use crate::cli::PriceArgs;

/// Significant digits shown in the table (the JSON output keeps every digit).
pub const TABLE_DIGITS: usize = 12;

/// What each quantity of [`Greeks`] is, with its unit, in the order of [`Greeks::named`].
pub const CONVENTIONS: [(&str, &str); 15] = [
    ("price", "V, in the currency of spot and strike"),
    ("delta", "∂V/∂S, per 1.00 of spot"),
    ("gamma", "∂²V/∂S², per 1.00 of spot, squared"),
    ("vega", "∂V/∂σ, per 1.00 of vol (÷100 for one vol point)"),
    ("theta", "∂V/∂t = −∂V/∂T, per year (÷365 for one day)"),
    ("rho", "∂V/∂r, per 1.00 of rate"),
    ("dividend_rho", "∂V/∂q, per 1.00 of dividend yield"),
    ("vanna", "∂²V/∂S∂σ, per 1.00 of spot and per 1.00 of vol"),
    ("volga", "∂²V/∂σ², per 1.00 of vol, squared"),
    ("charm", "∂Δ/∂t, delta change per year"),
    ("veta", "∂vega/∂t, per 1.00 of vol, per year"),
    ("speed", "∂Γ/∂S = ∂³V/∂S³, per 1.00 of spot, cubed"),
    (
        "zomma",
        "∂Γ/∂σ, per 1.00 of spot squared and per 1.00 of vol",
    ),
    ("color", "∂Γ/∂t, per 1.00 of spot squared, per year"),
    ("ultima", "∂³V/∂σ³, per 1.00 of vol, cubed"),
];

/// The JSON form of one valuation: the inputs, then the fifteen quantities,
/// all in one flat object with the field names of the kernel's types.
#[derive(Debug, Serialize)]
struct Report<'a> {
    #[serde(flatten)]
    contract: &'a Contract,
    #[serde(flatten)]
    market: &'a Market,
    vol: f64,
    #[serde(flatten)]
    greeks: &'a Greeks,
}

/// Values the option described by `args` and renders the result.
///
/// # Errors
/// The kernel's refusal, displayed as `<field>: <reason>`, or a JSON encoding failure.
pub fn run(args: &PriceArgs) -> Result<String, String> {
    let (contract, market) = (args.option.contract(), args.option.market());
    let greeks = calor::greeks(&contract, &market, args.vol).map_err(|e| e.to_string())?;
    if args.json {
        let report = Report {
            contract: &contract,
            market: &market,
            vol: args.vol,
            greeks: &greeks,
        };
        serde_json::to_string(&report).map_err(|e| format!("json: {e}"))
    } else {
        Ok(table(&contract, &market, args.vol, &greeks))
    }
}

/// The human-readable table: a header line with the inputs, then one line per
/// quantity with its value to [`TABLE_DIGITS`] significant digits and its unit.
pub fn table(contract: &Contract, market: &Market, vol: f64, greeks: &Greeks) -> String {
    let kind = match contract.kind {
        calor::Kind::Call => "call",
        calor::Kind::Put => "put",
    };
    let mut out = format!(
        "European {kind}: spot {} strike {} expiry {} y rate {} dividend_yield {} vol {}\n",
        exact(market.spot),
        exact(contract.strike),
        exact(contract.expiry),
        exact(market.rate),
        exact(market.dividend_yield),
        exact(vol),
    );
    let values = greeks.named();
    let width = values
        .iter()
        .map(|(_, v)| significant(*v, TABLE_DIGITS).len())
        .fold("value".len(), usize::max);
    let _ = write!(out, "{:<12}  {:>width$}  convention", "quantity", "value");
    for ((name, value), (_, note)) in values.iter().zip(CONVENTIONS.iter()) {
        let shown = significant(*value, TABLE_DIGITS);
        let _ = write!(out, "\n{name:<12}  {shown:>width$}  {note}");
    }
    out
}

/// `x` rounded to `digits` significant digits: positional for magnitudes in
/// [1e-5, 10^digits), scientific (`1.23450000000e-7`) outside, `0` for zero.
pub fn significant(x: f64, digits: usize) -> String {
    if !x.is_finite() {
        return format!("{x}");
    }
    if x == 0.0 {
        return "0".to_owned();
    }
    let digits = digits.max(1);
    let scientific = format!("{:.*e}", digits - 1, x);
    // The exponent after rounding, so 9.9999999999996 counts as 1e1.
    let exponent = scientific
        .rsplit_once('e')
        .and_then(|(_, e)| e.parse::<i64>().ok())
        .unwrap_or(0);
    let max_exponent = i64::try_from(digits).unwrap_or(i64::MAX);
    if (-5..max_exponent).contains(&exponent) {
        let decimals = usize::try_from(max_exponent - 1 - exponent).unwrap_or(0);
        format!("{x:.decimals$}")
    } else {
        scientific
    }
}

/// An input as the user gave it: the shortest decimal that reads back as the
/// same `f64`, positional for magnitudes in [1e-5, 1e16) and scientific
/// outside (`1e300`, not three hundred digits).
pub fn exact(x: f64) -> String {
    let magnitude = x.abs();
    if x.is_finite() && x != 0.0 && !(1e-5..1e16).contains(&magnitude) {
        format!("{x:e}")
    } else {
        format!("{x}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn format_exact_reads_back() {
        assert_eq!(exact(42.0), "42");
        assert_eq!(
            exact(0.000_114_155_251_141_552_51),
            "0.00011415525114155251"
        );
        assert_eq!(exact(1e300), "1e300");
        assert_eq!(exact(-2.5e-300), "-2.5e-300");
        assert_eq!(exact(0.0), "0");
        for x in [
            1e300,
            2.5e-300,
            0.1,
            1e16,
            9.999_999_999_999_998e15,
            1e-5,
            9.9e-6,
        ] {
            assert_eq!(exact(x).parse::<f64>().ok(), Some(x), "{x:e}");
        }
    }

    #[test]
    fn format_significant_positional() {
        assert_eq!(significant(4.759_422_392_871_018, 12), "4.75942239287");
        assert_eq!(significant(-0.043_5, 3), "-0.0435");
        assert_eq!(significant(123.456, 3), "123");
        assert_eq!(significant(123_456.0, 3), "1.23e5");
    }

    #[test]
    fn format_significant_rounding_carries() {
        assert_eq!(significant(9.999_999_999_999_6, 12), "10.0000000000");
    }

    #[test]
    fn format_significant_scientific() {
        assert_eq!(significant(1.234_5e-7, 5), "1.2345e-7");
        assert_eq!(significant(-2.5e300, 2), "-2.5e300");
        assert_eq!(significant(0.0, 12), "0");
    }

    #[test]
    fn conventions_follow_kernel_order() {
        let named = Greeks::default().named();
        for ((name, _), (label, _)) in named.iter().zip(CONVENTIONS.iter()) {
            assert_eq!(name, label);
        }
    }
}
