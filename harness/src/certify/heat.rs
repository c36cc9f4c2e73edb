//! The heat-equation step against its exact discrete solution.
//!
//! On u(x, 0) = sin(πx) over [0, 1] with zero ends, n steps of the θ-scheme
//! give exactly λⁿ·sin(πx_j), λ the amplification factor of the mode
//! (K. W. Morton & D. F. Mayers, *Numerical Solution of Partial Differential
//! Equations*, 2nd ed., CUP 2005, ch. 2, from memory). What is left is rounding,
//! which this suite measures for the kernel's `ThetaScheme::step`.

use std::f64::consts::PI;

use crate::certify::tally::Tally;
use crate::tolerance;

/// The suite's name in reports.
pub const SUITE: &str = "heat";

/// One run of the scheme on the sine.
#[derive(Debug, Clone, Copy)]
pub struct HeatCase {
    /// Case id.
    pub id: &'static str,
    /// Implicit weight θ.
    pub theta: f64,
    /// Cells on [0, 1].
    pub cells: usize,
    /// Time step.
    pub dt: f64,
    /// Steps taken.
    pub steps: usize,
    /// Why the case is here.
    pub reason: &'static str,
}

/// The cases, each with its reason.
pub const CASES: [HeatCase; 5] = [
    HeatCase {
        id: "heat_implicit_table",
        theta: 1.0,
        cells: 10,
        dt: 0.01,
        steps: 50,
        reason: "the backward-difference table of the numerical-analysis texts (h 0.1, k 0.01)",
    },
    HeatCase {
        id: "heat_crank_nicolson_table",
        theta: 0.5,
        cells: 10,
        dt: 0.01,
        steps: 50,
        reason: "the Crank–Nicolson table of the same problem",
    },
    HeatCase {
        id: "heat_explicit_edge",
        theta: 0.0,
        cells: 10,
        dt: 0.005,
        steps: 100,
        reason: "the explicit scheme at the edge of stability, μ = ½",
    },
    HeatCase {
        id: "heat_quarter_theta",
        theta: 0.25,
        cells: 40,
        dt: 0.000_6,
        steps: 200,
        reason: "θ = ¼ just inside its stability limit μ·(1 − 2θ) ≤ ½ (μ = 0.96)",
    },
    HeatCase {
        id: "heat_crank_nicolson_long_steps",
        theta: 0.5,
        cells: 200,
        dt: 0.000_5,
        steps: 400,
        reason: "Crank–Nicolson with μ = 20, where the high modes alternate sign",
    },
];

/// Runs every case and records max_j |u_j − λⁿ·sin(πx_j)| in units of
/// ε·n·(1 + 2μ)·max_j |λⁿ·sin(πx_j)| against [`tolerance::HEAT_DISCRETE`].
pub fn check_heat(tally: &mut Tally) {
    for case in &CASES {
        let h = 1.0 / case.cells as f64;
        let nodes = || (0..=case.cells).map(|j| (PI * j as f64 * h).sin());
        let mut u: Vec<f64> = nodes().collect();
        let mut scratch = vec![0.0; case.cells];
        let outcome = calor::ThetaScheme::new(case.theta, 1.0, case.dt, h).and_then(|scheme| {
            for _ in 0..case.steps {
                scheme.step(&mut u, &mut scratch, 0.0, 0.0)?;
            }
            Ok((scheme.amplification(PI * h), scheme.mesh_ratio()))
        });
        let (error, detail) = match outcome {
            Ok((lambda, mu)) => {
                let decay = lambda.powf(case.steps as f64);
                let (mut worst, mut size, mut at) = (0.0f64, 0.0f64, 0);
                for (j, (got, sine)) in u.iter().zip(nodes()).enumerate() {
                    let exact = decay * sine;
                    size = size.max(exact.abs());
                    if (got - exact).abs() > worst {
                        (worst, at) = ((got - exact).abs(), j);
                    }
                }
                let units = worst / (f64::EPSILON * case.steps as f64 * (1.0 + 2.0 * mu) * size);
                let got = u.get(at).copied().unwrap_or(f64::NAN);
                let exact = decay * (PI * at as f64 * h).sin();
                (
                    units,
                    format!(
                        "θ {} cells {} dt {} steps {}: node {at} expected {exact:e} got {got:e}",
                        case.theta, case.cells, case.dt, case.steps
                    ),
                )
            }
            Err(e) => (f64::INFINITY, format!("refused: {e}")),
        };
        tally.record(
            SUITE,
            "discrete_solution",
            case.id,
            &[],
            error,
            tolerance::HEAT_DISCRETE.limit,
            || detail,
        );
    }
}
