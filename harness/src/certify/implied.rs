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

/// One round trip, as measured by [`visit_implied`].
#[derive(Debug, Clone, Copy)]
pub struct RoundTrip {
    /// |σ̂ − σ| in units of ε·((1+κ)·V/vega + σ/4); infinite when refused.
    pub forward: f64,
    /// |price(σ̂) − premium| in units of ε·(1+κ)·V; infinite when refused.
    pub backward: f64,
    /// The recovered vol σ̂ (NaN when refused).
    pub vol: f64,
    /// Iterations used, when solved.
    pub iterations: Option<u32>,
    /// False when one more Newton correction would still move σ̂ by more
    /// than the forward tolerance, or the iteration bound was exceeded.
    pub converged: bool,
    /// The kernel's refusal, if it refused.
    pub refused: Option<calor::Error>,
}

/// Solves every case and hands each round trip to `visit`.
pub fn visit_implied(cases: &[ImpliedCase], mut visit: impl FnMut(&ImpliedCase, RoundTrip)) {
    let eps = f64::EPSILON;
    for case in cases {
        let inputs = case.inputs();
        let (contract, market) = (inputs.contract(), inputs.market());
        let trip = match calor::solve_implied_vol(&contract, &market, case.premium) {
            Ok(r) => {
                let scale = (1.0 + case.kappa) * case.price / case.vega + case.vol / 4.0;
                let correction = calor::greeks(&contract, &market, r.vol)
                    .map_or(f64::INFINITY, |g| (g.price - case.premium) / g.vega);
                let converged = r.iterations <= calor::MAX_ITERATIONS
                    && correction.abs() <= tolerance::IMPLIED_VOL.limit * eps * scale;
                let repriced = calor::price(&contract, &market, r.vol).unwrap_or(f64::NAN);
                RoundTrip {
                    forward: (r.vol - case.vol).abs() / (eps * scale),
                    backward: tolerance::units(repriced, case.premium, case.kappa, 0.0),
                    vol: r.vol,
                    iterations: Some(r.iterations),
                    converged,
                    refused: None,
                }
            }
            Err(e) => RoundTrip {
                forward: f64::INFINITY,
                backward: f64::INFINITY,
                vol: f64::NAN,
                iterations: None,
                converged: false,
                refused: Some(e),
            },
        };
        visit(case, trip);
    }
}

/// The failure detail of a round trip: inputs, premium, expected and recovered vol.
pub fn round_trip_detail(case: &ImpliedCase, trip: &RoundTrip) -> String {
    format!(
        "{:?} premium {} expected vol {} got {}{}",
        case.inputs(),
        show(case.premium),
        show(case.vol),
        show(trip.vol),
        trip.refused
            .map(|e| format!(" error {e}"))
            .unwrap_or_default()
    )
}

/// Solves every case and measures it.
pub fn measure_implied(cases: &[ImpliedCase]) -> ImpliedOutcome {
    let mut forward = Worst::new("implied_vol", tolerance::IMPLIED_VOL.limit);
    let mut backward = Worst::new("repricing", tolerance::REPRICING.limit);
    let mut unconverged = Vec::new();
    let mut iteration_counts = vec![0; calor::MAX_ITERATIONS as usize + 1];
    visit_implied(cases, |case, trip| {
        if let Some(n) = trip
            .iterations
            .and_then(|i| iteration_counts.get_mut(i as usize))
        {
            *n += 1;
        }
        if trip.iterations.is_some() && !trip.converged {
            unconverged.push(case.id.clone());
        }
        forward.record(trip.forward, &case.id, || round_trip_detail(case, &trip));
        backward.record(trip.backward, &case.id, || round_trip_detail(case, &trip));
    });
    ImpliedOutcome {
        forward,
        backward,
        unconverged,
        iteration_counts,
    }
}
