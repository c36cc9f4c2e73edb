//! The implied-volatility suite: round trips of `black/implied.csv`.

use crate::cases::black::ImpliedCase;
use crate::certify::{show, Worst};
use crate::tolerance;

/// Forward error, backward error and convergence of the solver over the cases.
#[derive(Debug, Clone)]
pub struct ImpliedOutcome {
    /// |σ̂ − σ| in units of ε·((1+κ)·V/vega + σ/4).
    pub forward: Worst,
    /// |price(σ̂) − premium| in units of ε·(1+κ)·V.
    pub backward: Worst,
    /// Cases that needed more than [`calor::MAX_ITERATIONS`] iterations: one
    /// more Newton correction from σ̂ (with the kernel's own price and vega)
    /// would still move it by more than the forward tolerance.
    pub unconverged: Vec<String>,
    /// Cases per number of iterations used (index = iterations).
    pub iteration_counts: Vec<usize>,
}

/// Solves every case and measures it.
pub fn measure_implied(cases: &[ImpliedCase]) -> ImpliedOutcome {
    let mut forward = Worst::new("implied_vol", tolerance::IMPLIED_VOL.limit);
    let mut backward = Worst::new("repricing", tolerance::REPRICING.limit);
    let mut unconverged = Vec::new();
    let mut iteration_counts = vec![0; calor::MAX_ITERATIONS as usize + 1];
    for case in cases {
        let inputs = case.inputs();
        let (contract, market) = (inputs.contract(), inputs.market());
        let solved = calor::solve_implied_vol(&contract, &market, case.premium);
        let eps = f64::EPSILON;
        let (fwd, bwd, vol) = match solved {
            Ok(r) => {
                if let Some(n) = iteration_counts.get_mut(r.iterations as usize) {
                    *n += 1;
                }
                let scale = (1.0 + case.kappa) * case.price / case.vega + case.vol / 4.0;
                let correction = calor::greeks(&contract, &market, r.vol)
                    .map_or(f64::INFINITY, |g| (g.price - case.premium) / g.vega);
                if r.iterations > calor::MAX_ITERATIONS
                    || !(correction.abs() <= tolerance::IMPLIED_VOL.limit * eps * scale)
                {
                    unconverged.push(case.id.clone());
                }
                let fwd = (r.vol - case.vol).abs() / (eps * scale);
                let repriced = calor::price(&contract, &market, r.vol).unwrap_or(f64::NAN);
                let bwd = tolerance::units(repriced, case.premium, case.kappa, 0.0);
                (fwd, bwd, r.vol)
            }
            Err(_) => (f64::INFINITY, f64::INFINITY, f64::NAN),
        };
        let detail = || {
            format!(
                "{inputs:?} premium {} expected vol {} got {}{}",
                show(case.premium),
                show(case.vol),
                show(vol),
                solved
                    .err()
                    .map(|e| format!(" error {e}"))
                    .unwrap_or_default()
            )
        };
        forward.record(fwd, &case.id, detail);
        backward.record(bwd, &case.id, detail);
    }
    ImpliedOutcome {
        forward,
        backward,
        unconverged,
        iteration_counts,
    }
}
