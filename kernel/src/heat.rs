//! One time step of the 1-D heat equation u_τ = κ·u_xx on a uniform grid.
//!
//! # Formula
//! With mesh ratio μ = κ·Δτ/Δx² and weight θ ∈ [0, 1], the θ-scheme
//! (1 + 2θμ)·uⁿ⁺¹_j − θμ·(uⁿ⁺¹_{j−1} + uⁿ⁺¹_{j+1})
//!   = (1 − 2(1−θ)μ)·uⁿ_j + (1−θ)μ·(uⁿ_{j−1} + uⁿ_{j+1})
//! holds at every interior node; the two end nodes carry Dirichlet values.
//! θ = 0 is the explicit scheme, θ = ½ Crank–Nicolson, θ = 1 fully implicit.
//! The implicit side is a constant tridiagonal matrix, solved by the Thomas
//! algorithm (LU elimination without pivoting, stable because the matrix is
//! diagonally dominant). Its pivots depend on μ and θ only, so repeated steps
//! factor once ([`ThetaScheme::factor`]) and then cost two passes over the grid.
//!
//! A Fourier mode sin(kx) is multiplied per step by
//! λ = (1 − 4(1−θ)μ·sin²(kΔx/2)) / (1 + 4θμ·sin²(kΔx/2)), so the scheme is
//! stable for every μ when θ ≥ ½ and for μ ≤ 1/(2(1 − 2θ)) when θ < ½.
//!
//! # Source
//! J. Crank & P. Nicolson, "A practical method for numerical evaluation of
//! solutions of partial differential equations of the heat-conduction type",
//! Proc. Cambridge Philos. Soc. 43 (1947) 50–67; K. W. Morton & D. F. Mayers,
//! *Numerical Solution of Partial Differential Equations*, 2nd ed. (CUP, 2005),
//! ch. 2 (the θ-method and its Fourier analysis), from memory; L. H. Thomas,
//! "Elliptic problems in linear difference equations over a network", Watson
//! Sci. Comput. Lab. report (Columbia University, 1949), from memory.
//!
//! # Accuracy
//! Truncation error O(Δτ + Δx²), and O(Δτ² + Δx²) for θ = ½; on a sine the
//! step reproduces λⁿ·sin(πx_j) to rounding (tests `ref_heat_*`, `conv_heat_*`).

use crate::error::{Error, GridParameter};

/// The θ-scheme for u_τ = κ·u_xx with a given step, validated once.
///
/// # Examples
/// ```
/// use calor::ThetaScheme;
/// // Crank–Nicolson, h = 0.1, k = 0.01 on [0, 1]: one step of sin(πx).
/// let scheme = ThetaScheme::new(0.5, 1.0, 0.01, 0.1)?;
/// let mut u: [f64; 11] = core::array::from_fn(|j| (core::f64::consts::PI * j as f64 / 10.0).sin());
/// let mut scratch = [0.0; 11];
/// scheme.step(&mut u, &mut scratch, 0.0, 0.0)?;
/// let lambda = scheme.amplification(core::f64::consts::PI * 0.1);
/// assert!((u[5] - lambda).abs() < 1e-15);
/// # Ok::<(), calor::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ThetaScheme {
    theta: f64,
    mu: f64,
}

impl ThetaScheme {
    /// The scheme with weight `theta` for diffusivity `kappa`, time step `dt` and node spacing `dx`.
    ///
    /// # Errors
    /// [`Error::InvalidGrid`] naming `theta` (NaN or outside [0, 1]), `kappa`,
    /// `time_step` or `space_step` (NaN, infinite or ≤ 0), or `mesh_ratio`
    /// (μ overflows); [`Error::UnstableStep`] if θ < ½ and μ·(1 − 2θ) > ½.
    pub fn new(theta: f64, kappa: f64, dt: f64, dx: f64) -> Result<Self, Error> {
        if !(0.0..=1.0).contains(&theta) {
            return Err(invalid(GridParameter::Theta));
        }
        positive(kappa, GridParameter::Kappa)?;
        positive(dt, GridParameter::TimeStep)?;
        positive(dx, GridParameter::SpaceStep)?;
        let mu = kappa * dt / (dx * dx);
        positive(mu, GridParameter::MeshRatio)?;
        if theta < 0.5 && mu * (1.0 - 2.0 * theta) > 0.5 {
            return Err(Error::UnstableStep);
        }
        Ok(ThetaScheme { theta, mu })
    }

    /// The weight θ of the implicit side.
    pub const fn theta(&self) -> f64 {
        self.theta
    }

    /// The mesh ratio μ = κ·Δτ/Δx².
    pub const fn mesh_ratio(&self) -> f64 {
        self.mu
    }

    /// The factor λ by which one step multiplies the mode sin(kx), given `k_dx` = k·Δx.
    pub fn amplification(&self, k_dx: f64) -> f64 {
        let s = libm::sin(0.5 * k_dx);
        let m = 4.0 * self.mu * s * s;
        (1.0 - (1.0 - self.theta) * m) / (1.0 + self.theta * m)
    }

    /// Advances `u` (end nodes included) by one step; the new end values are `left` and `right`.
    ///
    /// `scratch` holds the pivots and needs at least `u.len() − 2` entries.
    ///
    /// # Errors
    /// [`Error::InvalidGrid`] naming `nodes` (fewer than 3), `workspace`
    /// (`scratch` too short) or `boundary` (a non-finite end value).
    pub fn step(
        &self,
        u: &mut [f64],
        scratch: &mut [f64],
        left: f64,
        right: f64,
    ) -> Result<(), Error> {
        let interior = interior_len(u.len())?;
        let pivots = scratch
            .get_mut(..interior)
            .ok_or(invalid(GridParameter::Workspace))?;
        self.factor(pivots)?.step(u, left, right)
    }

    /// Computes the pivots for grids of `pivots.len() + 2` nodes, for repeated steps.
    ///
    /// # Errors
    /// [`Error::InvalidGrid`] naming `nodes` if `pivots` is empty.
    pub fn factor<'a>(&self, pivots: &'a mut [f64]) -> Result<Factored<'a>, Error> {
        if pivots.is_empty() {
            return Err(invalid(GridParameter::Nodes));
        }
        let (diag, off) = (1.0 + 2.0 * self.theta * self.mu, -self.theta * self.mu);
        let mut previous = 0.0;
        let mut rows = pivots.iter_mut();
        // The pivots converge monotonically to the fixed point of
        // m = 1/(diag − off²·m); once two agree to rounding the rest are filled,
        // which keeps refactoring cheap for schemes whose step changes.
        for m in rows.by_ref() {
            *m = 1.0 / (diag - off * off * previous);
            let settled = (*m - previous).abs() <= f64::EPSILON * *m;
            previous = *m;
            if settled {
                break;
            }
        }
        rows.for_each(|m| *m = previous);
        Ok(Factored {
            scheme: *self,
            pivots,
        })
    }
}

/// A [`ThetaScheme`] with its pivots: each step is one forward and one backward pass.
///
/// # Examples
/// ```
/// use calor::ThetaScheme;
/// let scheme = ThetaScheme::new(1.0, 1.0, 0.05, 0.5)?;
/// let mut pivots = [0.0; 3];
/// let factored = scheme.factor(&mut pivots)?;
/// let mut u = [0.0, 0.5f64.sqrt(), 1.0, 0.5f64.sqrt(), 0.0];
/// factored.step(&mut u, 0.0, 0.0)?;
/// factored.step(&mut u, 0.0, 0.0)?;
/// assert!((u[2] - 0.80125610992783307699).abs() < 1e-15);
/// # Ok::<(), calor::Error>(())
/// ```
#[derive(Debug)]
pub struct Factored<'a> {
    scheme: ThetaScheme,
    pivots: &'a [f64],
}

impl Factored<'_> {
    /// The scheme these pivots belong to.
    pub const fn scheme(&self) -> &ThetaScheme {
        &self.scheme
    }

    /// Advances `u` by one step, as [`ThetaScheme::step`].
    ///
    /// # Errors
    /// [`Error::InvalidGrid`] naming `nodes` if `u.len()` is not the factored
    /// size, or `boundary` for a non-finite end value.
    pub fn step(&self, u: &mut [f64], left: f64, right: f64) -> Result<(), Error> {
        self.eliminate(u, left, right)?;
        let off = self.off_diagonal();
        let mut next = right;
        for (x, m) in interior_mut(u)?
            .iter_mut()
            .rev()
            .zip(self.pivots.iter().rev())
        {
            *x -= off * m * next;
            next = *x;
        }
        Ok(())
    }

    /// The off-diagonal entry −θμ of the implicit matrix.
    pub(crate) fn off_diagonal(&self) -> f64 {
        -self.scheme.theta * self.scheme.mu
    }

    /// The pivots 1/dᵢ of the elimination, one per interior node.
    pub(crate) fn pivots(&self) -> &[f64] {
        self.pivots
    }

    /// Forms the explicit side and eliminates the lower diagonal, in place.
    ///
    /// Afterwards the interior of `u` holds the eliminated right-hand side and
    /// its end nodes hold `left` and `right`; the back substitution is the caller's.
    pub(crate) fn eliminate(&self, u: &mut [f64], left: f64, right: f64) -> Result<(), Error> {
        if u.len() != self.pivots.len() + 2 {
            return Err(invalid(GridParameter::Nodes));
        }
        if !(left.is_finite() && right.is_finite()) {
            return Err(invalid(GridParameter::Boundary));
        }
        let ThetaScheme { theta, mu } = self.scheme;
        let (centre, side, off) = (
            1.0 - 2.0 * (1.0 - theta) * mu,
            (1.0 - theta) * mu,
            -theta * mu,
        );
        let cells = core::cell::Cell::from_mut(u).as_slice_of_cells();
        let (mut old_left, mut eliminated) = (0.0, left);
        if let Some(first) = cells.first() {
            old_left = first.replace(left);
        }
        for (window, m) in cells.windows(3).zip(self.pivots) {
            if let [_, here, next] = window {
                let old = here.get();
                let rhs = centre * old + side * (old_left + next.get());
                // Grouped so that only one product and one difference wait on the last row.
                eliminated = rhs * m - off * m * eliminated;
                here.set(eliminated);
                old_left = old;
            }
        }
        // The old right end was read above; the back substitution starts from the new one.
        if let Some(last) = cells.last() {
            last.set(right);
        }
        Ok(())
    }
}

/// The interior nodes of `u` (all but the two ends).
pub(crate) fn interior_mut(u: &mut [f64]) -> Result<&mut [f64], Error> {
    let end = u.len().saturating_sub(1);
    u.get_mut(1..end).ok_or(invalid(GridParameter::Nodes))
}

fn interior_len(nodes: usize) -> Result<usize, Error> {
    match nodes.checked_sub(2) {
        Some(n) if n > 0 => Ok(n),
        _ => Err(invalid(GridParameter::Nodes)),
    }
}

fn positive(value: f64, parameter: GridParameter) -> Result<(), Error> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(invalid(parameter))
    }
}

const fn invalid(parameter: GridParameter) -> Error {
    Error::InvalidGrid { parameter }
}

/// A heat-equation grid of `N` nodes that owns its storage: no allocator needed.
///
/// The pivots of the last scheme used are kept, so a run of equal steps
/// factors once. `N < 3` is rejected when the program is compiled.
///
/// # Examples
/// ```
/// use calor::{HeatGrid, ThetaScheme};
/// // Burden & Faires' backward-difference exercise: 0 < x < 2, sin(πx/2), h = 0.5, k = 0.05.
/// let r = 0.5f64.sqrt();
/// let mut grid = HeatGrid::new([0.0, r, 1.0, r, 0.0]);
/// let scheme = ThetaScheme::new(1.0, 1.0, 0.05, 0.5)?;
/// grid.step(&scheme, 0.0, 0.0)?;
/// grid.step(&scheme, 0.0, 0.0)?;
/// assert!((grid.values()[1] - 0.56657362879712453309).abs() < 1e-15);
/// # Ok::<(), calor::Error>(())
/// ```
#[derive(Clone, Debug)]
pub struct HeatGrid<const N: usize> {
    values: [f64; N],
    pivots: [f64; N],
    factored: Option<ThetaScheme>,
}

impl<const N: usize> HeatGrid<N> {
    /// A grid holding `values`, end nodes included.
    pub const fn new(values: [f64; N]) -> Self {
        const {
            assert!(N >= 3, "a heat grid needs at least 3 nodes");
        }
        HeatGrid {
            values,
            pivots: [0.0; N],
            factored: None,
        }
    }

    /// The current values, end nodes included.
    pub const fn values(&self) -> &[f64; N] {
        &self.values
    }

    /// The current values, for setting them between steps.
    pub fn values_mut(&mut self) -> &mut [f64; N] {
        &mut self.values
    }

    /// Advances the grid by one step of `scheme`; the new end values are `left` and `right`.
    ///
    /// # Errors
    /// [`Error::InvalidGrid`] naming `boundary` for a non-finite end value.
    pub fn step(&mut self, scheme: &ThetaScheme, left: f64, right: f64) -> Result<(), Error> {
        let pivots = self
            .pivots
            .get_mut(..N - 2)
            .ok_or(invalid(GridParameter::Nodes))?;
        let factored = if self.factored == Some(*scheme) {
            Factored {
                scheme: *scheme,
                pivots,
            }
        } else {
            self.factored = Some(*scheme);
            scheme.factor(pivots)?
        };
        factored.step(&mut self.values, left, right)
    }
}
