//! Grid convergence ladders: European options on four grids, each with half
//! the node spacing and time step of the one before, against the closed form.
//!
//! The observed order is the smallest log2 ratio of successive errors; the
//! suite records the deficit 2 − order against [`tolerance::GRID_ORDER`].

use crate::cases::black::{Inputs, KindCell};
use crate::certify::region::regions_of;
use crate::certify::tally::Tally;
use crate::tolerance;

/// The suite's name in reports.
pub const SUITE: &str = "ladder";

/// The rungs (nodes, steps), from coarse to fine.
pub const RUNGS: [(usize, usize); 4] = [(81, 20), (161, 40), (321, 80), (641, 160)];

/// One ladder: an option and why it is here.
#[derive(Debug, Clone, Copy)]
pub struct Ladder {
    /// Case id.
    pub id: &'static str,
    /// The option.
    pub inputs: Inputs,
    /// Why the case is here.
    pub reason: &'static str,
}

/// The ladders, on the invented NGX barley index.
pub const LADDERS: [Ladder; 3] = [
    Ladder {
        id: "ladder_put_otm",
        inputs: Inputs {
            kind: KindCell::Put,
            spot: 93.0,
            strike: 100.0,
            expiry: 0.75,
            rate: 0.05,
            dividend_yield: 0.02,
            vol: 0.3,
        },
        reason: "a put in the money, spot off the strike, with a dividend yield",
    },
    Ladder {
        id: "ladder_call_otm",
        inputs: Inputs {
            kind: KindCell::Call,
            spot: 93.0,
            strike: 100.0,
            expiry: 0.75,
            rate: 0.05,
            dividend_yield: 0.02,
            vol: 0.3,
        },
        reason: "the call on the same market, out of the money",
    },
    Ladder {
        id: "ladder_put_long",
        inputs: Inputs {
            kind: KindCell::Put,
            spot: 110.0,
            strike: 100.0,
            expiry: 2.0,
            rate: 0.03,
            dividend_yield: 0.0,
            vol: 0.25,
        },
        reason: "a two-year put out of the money",
    },
];

/// Observed orders of price, delta and gamma on one ladder, with the errors.
fn orders(inputs: &Inputs) -> Result<([f64; 3], Vec<[f64; 3]>), calor::Error> {
    let (contract, market) = (inputs.contract(), inputs.market());
    let exact = calor::greeks(&contract, &market, inputs.vol)?;
    let mut errors = Vec::new();
    for (nodes, steps) in RUNGS {
        let spec = calor::GridSpec {
            nodes,
            steps,
            exercise: calor::Exercise::European,
            richardson: false,
            ..calor::GridSpec::AMERICAN
        };
        let mut workspace = vec![0.0; spec.workspace_len().unwrap_or(0)];
        let v = calor::grid_value(&contract, &market, inputs.vol, &spec, &mut workspace)?;
        errors.push([
            (v.price - exact.price).abs(),
            (v.delta - exact.delta).abs(),
            (v.gamma - exact.gamma).abs(),
        ]);
    }
    let mut orders = [f64::INFINITY; 3];
    for pair in errors.windows(2) {
        if let [coarse, fine] = pair {
            for ((order, c), f) in orders.iter_mut().zip(coarse).zip(fine) {
                *order = order.min((c / f).log2());
            }
        }
    }
    Ok((orders, errors))
}

/// Runs every ladder and records the order deficits.
pub fn check_ladders(tally: &mut Tally) {
    for ladder in &LADDERS {
        let regions = regions_of(&ladder.inputs);
        let outcome = orders(&ladder.inputs);
        for (q, function) in ["price_order", "delta_order", "gamma_order"]
            .into_iter()
            .enumerate()
        {
            let (deficit, detail) = match &outcome {
                Ok((orders, errors)) => {
                    let order = orders.get(q).copied().unwrap_or(f64::NAN);
                    let errs: Vec<String> = errors
                        .iter()
                        .filter_map(|e| e.get(q))
                        .map(|e| format!("{e:.3e}"))
                        .collect();
                    (
                        2.0 - order,
                        format!(
                            "{:?} rungs {RUNGS:?}: expected order 2, got {order:.3} (errors {})",
                            ladder.inputs,
                            errs.join(", ")
                        ),
                    )
                }
                Err(e) => (f64::INFINITY, format!("{:?} refused: {e}", ladder.inputs)),
            };
            tally.record(
                SUITE,
                function,
                ladder.id,
                &regions,
                deficit,
                tolerance::GRID_ORDER.limit,
                || detail,
            );
        }
    }
}
