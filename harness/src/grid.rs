//! `calor grid`: one option on a ladder of ever finer heat-equation grids, with
//! the convergence table that shows how far each rung can be trusted.

use std::fmt::Write as _;
use std::time::{Duration, Instant};

use clap::{Args, ValueEnum};
use serde::Serialize;

use crate::cli::OptionArgs;
use crate::price::{exact, significant, TABLE_DIGITS};

/// Inputs of `calor grid`.
#[derive(Debug, Clone, Copy, Args)]
pub struct GridArgs {
    /// The option and its market.
    #[command(flatten)]
    pub option: OptionArgs,
    /// Volatility σ per year, e.g. 0.2 for 20 %.
    #[arg(long, allow_negative_numbers = true)]
    pub vol: f64,
    /// Exercise at expiry only, or at any time.
    #[arg(long, value_enum, default_value_t = StyleArg::American)]
    pub style: StyleArg,
    /// Rungs of the ladder; each halves the node spacing and the time step.
    #[arg(long, default_value_t = 5, value_parser = clap::value_parser!(u32).range(1..=10))]
    pub levels: u32,
    /// Nodes of the first rung.
    #[arg(long, default_value_t = 61)]
    pub nodes: usize,
    /// Time steps of the first rung.
    #[arg(long, default_value_t = 15)]
    pub steps: usize,
    /// Extrapolate every rung from a second grid of half the spacing (Richardson).
    #[arg(long)]
    pub richardson: bool,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// `--style` on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum StyleArg {
    /// Exercise at expiry only.
    European,
    /// Exercise at any time up to expiry.
    American,
}

/// One rung of the ladder.
#[derive(Debug, Serialize)]
struct Rung {
    nodes: usize,
    steps: usize,
    price: f64,
    delta: f64,
    gamma: f64,
    boundary: Option<f64>,
    /// price − the previous rung's price.
    change: Option<f64>,
    /// log2 of the ratio of the last two changes.
    observed_order: Option<f64>,
    /// Wall time of one solve, in microseconds.
    micros_per_solve: f64,
}

/// The JSON form of a ladder.
#[derive(Debug, Serialize)]
struct Report {
    #[serde(flatten)]
    contract: calor::Contract,
    #[serde(flatten)]
    market: calor::Market,
    vol: f64,
    exercise: calor::Exercise,
    richardson: bool,
    /// The closed form, for European exercise.
    closed_form: Option<f64>,
    rungs: Vec<Rung>,
}

/// Runs the ladder described by `args` and renders it.
///
/// # Errors
/// The kernel's refusal, displayed as `<field>: <reason>`, or a JSON encoding failure.
pub fn run(args: &GridArgs) -> Result<String, String> {
    let (contract, market) = (args.option.contract(), args.option.market());
    let exercise = match args.style {
        StyleArg::European => calor::Exercise::European,
        StyleArg::American => calor::Exercise::American,
    };
    let mut rungs: Vec<Rung> = Vec::new();
    for level in 0..args.levels {
        let scale = 1usize << level;
        let spec = calor::GridSpec {
            nodes: args
                .nodes
                .saturating_sub(1)
                .saturating_mul(scale)
                .saturating_add(1),
            steps: args.steps.saturating_mul(scale),
            exercise,
            richardson: args.richardson,
            ..calor::GridSpec::AMERICAN
        };
        let (value, micros) = timed_solve(&contract, &market, args.vol, &spec)?;
        let change = rungs.last().map(|r| value.price - r.price);
        let observed_order = match (rungs.last().and_then(|r| r.change), change) {
            (Some(before), Some(now)) if now != 0.0 => Some((before / now).abs().log2()),
            _ => None,
        };
        rungs.push(Rung {
            nodes: spec.nodes,
            steps: spec.steps,
            price: value.price,
            delta: value.delta,
            gamma: value.gamma,
            boundary: value.boundary,
            change,
            observed_order,
            micros_per_solve: micros,
        });
    }
    let closed_form = match exercise {
        calor::Exercise::European => calor::price(&contract, &market, args.vol).ok(),
        calor::Exercise::American => None,
    };
    let report = Report {
        contract,
        market,
        vol: args.vol,
        exercise,
        richardson: args.richardson,
        closed_form,
        rungs,
    };
    if args.json {
        serde_json::to_string(&report).map_err(|e| format!("json: {e}"))
    } else {
        Ok(table(&report))
    }
}

/// Solves once, then repeats for about 20 ms to time one solve.
fn timed_solve(
    contract: &calor::Contract,
    market: &calor::Market,
    vol: f64,
    spec: &calor::GridSpec,
) -> Result<(calor::GridValue, f64), String> {
    let len = spec
        .workspace_len()
        .ok_or_else(|| "nodes: grid too large".to_owned())?;
    let mut workspace = vec![0.0; len];
    let started = Instant::now();
    let value = calor::grid_value(contract, market, vol, spec, &mut workspace)
        .map_err(|e| e.to_string())?;
    let mut solves = 1u32;
    while started.elapsed() < Duration::from_millis(20) && solves < 10_000 {
        let _ = calor::grid_value(contract, market, vol, spec, &mut workspace);
        solves += 1;
    }
    Ok((
        value,
        started.elapsed().as_secs_f64() * 1e6 / f64::from(solves),
    ))
}

fn table(report: &Report) -> String {
    let kind = match report.contract.kind {
        calor::Kind::Call => "call",
        calor::Kind::Put => "put",
    };
    let style = match report.exercise {
        calor::Exercise::European => "European",
        calor::Exercise::American => "American",
    };
    let (c, m) = (&report.contract, &report.market);
    let mut out = format!(
        "{style} {kind} on the grid: spot {} strike {} expiry {} y rate {} dividend_yield {} vol {}{}\n",
        exact(m.spot),
        exact(c.strike),
        exact(c.expiry),
        exact(m.rate),
        exact(m.dividend_yield),
        exact(report.vol),
        if report.richardson { ", Richardson" } else { "" },
    );
    if let Some(exact) = report.closed_form {
        let _ = writeln!(out, "closed form {}", significant(exact, TABLE_DIGITS));
    }
    let _ = write!(
        out,
        "{:>6} {:>6} {:>15} {:>15} {:>15} {:>11} {:>6} {:>10} {:>13}",
        "nodes", "steps", "price", "delta", "gamma", "change", "order", "us/solve", "boundary"
    );
    let short = |x: Option<f64>, digits: usize| {
        x.map_or_else(|| "-".to_owned(), |v| significant(v, digits))
    };
    for r in &report.rungs {
        let _ = write!(
            out,
            "\n{:>6} {:>6} {:>15} {:>15} {:>15} {:>11} {:>6} {:>10.1} {:>13}",
            r.nodes,
            r.steps,
            significant(r.price, TABLE_DIGITS),
            significant(r.delta, TABLE_DIGITS),
            significant(r.gamma, TABLE_DIGITS),
            short(r.change, 3),
            r.observed_order
                .map_or_else(|| "-".to_owned(), |o| format!("{o:.2}")),
            r.micros_per_solve,
            short(r.boundary, 8),
        );
    }
    out
}
