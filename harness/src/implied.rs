//! `calor implied`: the volatility that reproduces a premium, the iterations
//! the solver took, and how closely the volatility reprices the premium.

use serde::Serialize;

use crate::cli::ImpliedArgs;
use crate::price::{exact, significant, TABLE_DIGITS};

/// The JSON form of one implied-volatility solve.
#[derive(Debug, Serialize)]
struct Report {
    #[serde(flatten)]
    contract: calor::Contract,
    #[serde(flatten)]
    market: calor::Market,
    premium: f64,
    implied_vol: f64,
    iterations: u32,
    max_iterations: u32,
    /// price(implied_vol) − premium.
    repricing_error: f64,
    /// The same in units in the last place of the premium.
    repricing_error_ulps: f64,
}

/// Solves for the volatility of the option described by `args` and renders it.
///
/// # Errors
/// The kernel's refusal, displayed as `<field>: <reason>`, or a JSON encoding failure.
pub fn run(args: &ImpliedArgs) -> Result<String, String> {
    let (contract, market) = (args.option.contract(), args.option.market());
    let solved =
        calor::solve_implied_vol(&contract, &market, args.premium).map_err(|e| e.to_string())?;
    let repriced = calor::price(&contract, &market, solved.vol).map_err(|e| e.to_string())?;
    let repricing_error = repriced - args.premium;
    let ulp = ulp(args.premium);
    let report = Report {
        contract,
        market,
        premium: args.premium,
        implied_vol: solved.vol,
        iterations: solved.iterations,
        max_iterations: calor::MAX_ITERATIONS,
        repricing_error,
        repricing_error_ulps: repricing_error / ulp,
    };
    if args.json {
        return serde_json::to_string(&report).map_err(|e| format!("json: {e}"));
    }
    let kind = match contract.kind {
        calor::Kind::Call => "call",
        calor::Kind::Put => "put",
    };
    Ok(format!(
        "European {kind}: spot {} strike {} expiry {} y rate {} dividend_yield {} premium {}\n\
         implied vol       {}\n\
         iterations        {} of at most {}\n\
         repricing error   {} ({} ulp of the premium)",
        exact(market.spot),
        exact(contract.strike),
        exact(contract.expiry),
        exact(market.rate),
        exact(market.dividend_yield),
        exact(args.premium),
        significant(solved.vol, TABLE_DIGITS),
        solved.iterations,
        calor::MAX_ITERATIONS,
        significant(repricing_error, 3),
        significant(report.repricing_error_ulps, 3),
    ))
}

/// The spacing of f64 values at `x`.
fn ulp(x: f64) -> f64 {
    let x = x.abs();
    f64::from_bits(x.to_bits() + 1) - x
}
