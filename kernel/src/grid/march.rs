//! Marching one grid from the payoff to the valuation date.
//!
//! Time levels τ_k = τ_max·(k/N)^p: with p = 2 the steps grow linearly from
//! expiry, which resolves the √τ-like start of the early-exercise boundary and
//! of the payoff's smoothing (in the variable √τ both are smooth, and a
//! uniform step there is second-order accurate). The first time steps are each
//! replaced by two fully implicit half steps (Rannacher start-up), the rest use
//! the spec's θ; for American exercise each step projects onto the payoff
//! inside the tridiagonal solve (Brennan–Schwartz).

use crate::error::{Error, GridParameter};
use crate::heat::{interior_mut, Factored, ThetaScheme};

use super::transform::Transform;

/// Where the nodes of one grid sit: y_j = start + j·spacing, the spot at node `spot_node`.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Layout {
    pub nodes: usize,
    pub start: f64,
    pub spacing: f64,
    pub spot_node: usize,
}

impl Layout {
    /// Grid coordinate of node j.
    pub(crate) fn y(&self, j: usize) -> f64 {
        self.start + j as f64 * self.spacing
    }

    /// The same domain with every cell halved.
    pub(crate) fn refined(&self) -> Option<Layout> {
        Some(Layout {
            nodes: self.nodes.checked_sub(1)?.checked_mul(2)?.checked_add(1)?,
            start: self.start,
            spacing: 0.5 * self.spacing,
            spot_node: self.spot_node.checked_mul(2)?,
        })
    }
}

/// The time stepping of one grid.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Schedule {
    pub steps: usize,
    pub theta: f64,
    pub rannacher_steps: usize,
    pub grading: f64,
    pub american: bool,
}

/// Fills `u` with the payoff and `floor` with its shape, then steps to τ_max.
///
/// Each slice holds `layout.nodes` entries, `pivots` two fewer.
pub(crate) fn march(
    t: &Transform,
    layout: &Layout,
    schedule: &Schedule,
    u: &mut [f64],
    floor: &mut [f64],
    pivots: &mut [f64],
) -> Result<(), Error> {
    let h = layout.spacing;
    for (j, (uj, gj)) in u.iter_mut().zip(floor.iter_mut()).enumerate() {
        let y = layout.y(j);
        *gj = t.floor_shape(y);
        // The node whose cell holds the kink takes the cell mean of the payoff.
        *uj = if y.abs() < 0.5 * h {
            t.cell_mean(y, h)
        } else {
            *gj
        };
    }
    let steps = schedule.steps as f64;
    let mut tau = 0.0;
    for k in 1..=schedule.steps {
        let next = if k == schedule.steps {
            t.tau_max
        } else {
            t.tau_max * libm::pow(k as f64 / steps, schedule.grading)
        };
        let dt = next - tau;
        if k <= schedule.rannacher_steps {
            let factored = ThetaScheme::new(1.0, 1.0, 0.5 * dt, h)?.factor(pivots)?;
            advance(
                t,
                layout,
                schedule.american,
                &factored,
                u,
                floor,
                tau + 0.5 * dt,
            )?;
            advance(t, layout, schedule.american, &factored, u, floor, next)?;
        } else {
            let factored = ThetaScheme::new(schedule.theta, 1.0, dt, h)?.factor(pivots)?;
            advance(t, layout, schedule.american, &factored, u, floor, next)?;
        }
        tau = next;
    }
    Ok(())
}

/// One step to time `tau`: the out-of-the-money end is 0, the other end its deep value.
fn advance(
    t: &Transform,
    layout: &Layout,
    american: bool,
    factored: &Factored,
    u: &mut [f64],
    floor: &[f64],
    tau: f64,
) -> Result<(), Error> {
    let last = layout.nodes.saturating_sub(1);
    let right = t.deep_value(layout.y(last), tau, american);
    if american {
        brennan_schwartz_sweep(factored, u, floor, libm::exp(-t.beta * tau), 0.0, right)
    } else {
        factored.step(u, 0.0, right)
    }
}

/// One θ-step with u ≥ scale·floor enforced during the back substitution.
///
/// The elimination runs towards the exercise side (the high end of the grid)
/// and the substitution back from it, so each node is projected after its
/// neighbour on the exercise side has its final value. For a put in the
/// original coordinate this is the upward-eliminating sweep of the source.
///
/// # Source
/// M. J. Brennan & E. S. Schwartz, "The valuation of American put options",
/// J. Finance 32 (1977) 449–462; its convergence for the put: P. Jaillet,
/// D. Lamberton & B. Lapeyre, "Variational inequalities and the pricing of
/// American options", Acta Appl. Math. 21 (1990) 263–289 (from memory).
pub(crate) fn brennan_schwartz_sweep(
    factored: &Factored,
    u: &mut [f64],
    floor: &[f64],
    scale: f64,
    left: f64,
    right: f64,
) -> Result<(), Error> {
    factored.eliminate(u, left, right)?;
    if floor.len() != u.len() {
        return Err(Error::InvalidGrid {
            parameter: GridParameter::Workspace,
        });
    }
    let floor = floor
        .get(1..floor.len().saturating_sub(1))
        .unwrap_or_default();
    let off = factored.off_diagonal();
    let mut next = right;
    let rows = interior_mut(u)?
        .iter_mut()
        .zip(factored.pivots())
        .zip(floor);
    for ((x, m), g) in rows.rev() {
        let (continuation, exercise) = (*x - off * m * next, scale * g);
        // A plain comparison: `f64::max` adds NaN handling to the critical path.
        *x = if continuation > exercise {
            continuation
        } else {
            exercise
        };
        next = *x;
    }
    Ok(())
}
