//! The θ-scheme step against printed tables and exact solutions.
//!
//! Problem of the tables: u_t = u_xx on [0, 1], u(x, 0) = sin(πx), u = 0 at both
//! ends, h = 0.1, k = 0.01, t = 0.5 (50 steps). R. L. Burden & J. D. Faires,
//! *Numerical Analysis*, 9th ed. (Brooks/Cole, 2011), Sec. 12.2, from memory;
//! the ids are those of `/work/shared/reference-notes.md`. On a sine the
//! scheme's discrete solution is exactly λⁿ·sin(πx_j), λ its amplification
//! factor (K. W. Morton & D. F. Mayers, *Numerical Solution of PDEs*, 2nd ed.,
//! CUP 2005, ch. 2, from memory), which checks the step to rounding.

use std::f64::consts::PI;

use calor::{Error, HeatGrid, ThetaScheme};

/// The sine on 11 nodes of [0, 1].
fn sine() -> [f64; 11] {
    std::array::from_fn(|j| (PI * j as f64 / 10.0).sin())
}

/// 50 steps of the scheme with weight `theta`, h = 0.1, k = 0.01.
fn table_run(theta: f64) -> (ThetaScheme, [f64; 11]) {
    let scheme = ThetaScheme::new(theta, 1.0, 0.01, 0.1).expect("a valid scheme");
    let mut grid = HeatGrid::new(sine());
    for _ in 0..50 {
        grid.step(&scheme, 0.0, 0.0).expect("a step");
    }
    (scheme, *grid.values())
}

/// Checks nodes 1..=5 against the printed digits (8 decimals) and against λⁿ·sin(πx_j).
fn check_table(theta: f64, printed: [f64; 5]) {
    let (scheme, u) = table_run(theta);
    let lambda = scheme.amplification(PI * 0.1).powi(50);
    for (j, want) in (1..=5).zip(printed) {
        let got = u[j];
        assert!(
            ((got * 1e8).round() / 1e8 - want).abs() < 1e-12,
            "theta {theta}, x = {}: {got} does not print as {want}",
            j as f64 / 10.0
        );
        let exact = lambda * (PI * j as f64 / 10.0).sin();
        assert!(
            (got - exact).abs() <= 1e-13 * exact,
            "theta {theta}, x = {}: {got} against the discrete solution {exact}",
            j as f64 / 10.0
        );
    }
}

#[test]
fn ref_heat_h01_backward_difference() {
    check_table(
        1.0,
        [0.00289802, 0.00551236, 0.00758711, 0.00891918, 0.00937818],
    );
}

#[test]
fn ref_heat_h02_crank_nicolson() {
    check_table(
        0.5,
        [0.00230512, 0.00438461, 0.00603489, 0.00709444, 0.00745954],
    );
}

#[test]
fn ref_heat_h01_recomputed_digits() {
    // The notes' 50-digit recomputation of H01 at x = 0.5.
    let (_, u) = table_run(1.0);
    let want = 0.009378178863319269898975654871166921489120980735055;
    assert!(
        (u[5] - want).abs() <= 1e-13 * want,
        "{} against {want}",
        u[5]
    );
}

#[test]
fn ref_heat_h04_exercise() {
    // 0 < x < 2, u(x, 0) = sin(πx/2), h = 0.5, k = 0.05, two backward-difference steps.
    let r = 0.5f64.sqrt();
    let mut grid = HeatGrid::new([0.0, r, 1.0, r, 0.0]);
    let scheme = ThetaScheme::new(1.0, 1.0, 0.05, 0.5).expect("a valid scheme");
    grid.step(&scheme, 0.0, 0.0).expect("a step");
    grid.step(&scheme, 0.0, 0.0).expect("a step");
    let want = [
        0.56657362879712453309691107364584994345322128589987,
        0.80125610992783307699438255023693722385667050990581,
        0.56657362879712453309691107364584994345322128589986,
    ];
    for (got, want) in grid.values()[1..4].iter().zip(want) {
        assert!((got - want).abs() <= 1e-13 * want, "{got} against {want}");
    }
}

#[test]
fn ref_heat_h05_amplification() {
    let scheme = ThetaScheme::new(0.5, 1.0, 0.005, 0.1).expect("a valid scheme");
    let want = 0.95222563814561825692405215047471871539771394879338;
    let got = scheme.amplification(PI * 0.1);
    assert!((got - want).abs() < 1e-15, "{got} against {want}");
}

#[test]
fn ref_heat_dirichlet_ends_carried() {
    // A linear profile is steady for every θ once its end values are imposed.
    let scheme = ThetaScheme::new(0.5, 2.0, 0.3, 0.1).expect("a valid scheme");
    let mut u: Vec<f64> = (0..21).map(|j| 1.0 + 0.25 * f64::from(j)).collect();
    let want = u.clone();
    let mut scratch = vec![0.0; 19];
    for _ in 0..10 {
        scheme.step(&mut u, &mut scratch, 1.0, 6.0).expect("a step");
    }
    for (got, want) in u.iter().zip(&want) {
        assert!((got - want).abs() < 1e-13, "{got} against {want}");
    }
}

/// Max error of Crank–Nicolson against e^(−κπ²τ)·sin(πx) at τ = 0.1, with `m` cells and μ = 0.5·m/10.
fn crank_nicolson_error(m: usize) -> f64 {
    let kappa = 0.5;
    let (h, steps) = (1.0 / m as f64, m);
    let dt = 0.1 / steps as f64;
    let scheme = ThetaScheme::new(0.5, kappa, dt, h).expect("a valid scheme");
    let mut u: Vec<f64> = (0..=m).map(|j| (PI * j as f64 * h).sin()).collect();
    let mut scratch = vec![0.0; m];
    for _ in 0..steps {
        scheme.step(&mut u, &mut scratch, 0.0, 0.0).expect("a step");
    }
    let decay = (-kappa * PI * PI * 0.1).exp();
    u.iter()
        .enumerate()
        .map(|(j, v)| (v - decay * (PI * j as f64 * h).sin()).abs())
        .fold(0.0, f64::max)
}

#[test]
fn conv_heat_crank_nicolson_second_order() {
    // h and k halve together, so the error O(h² + k²) falls by 4 per level.
    let errors: Vec<f64> = [10, 20, 40, 80]
        .into_iter()
        .map(crank_nicolson_error)
        .collect();
    for pair in errors.windows(2) {
        let order = (pair[0] / pair[1]).log2();
        println!(
            "errors {:.3e} -> {:.3e}: observed order {order:.3}",
            pair[0], pair[1]
        );
        assert!(order >= 1.9, "observed order {order} below 1.9");
    }
}

#[test]
fn ref_heat_explicit_step_refused_when_unstable() {
    // μ = 0.5 is the edge of stability; just past it the scheme refuses.
    assert!(ThetaScheme::new(0.0, 1.0, 0.005, 0.1).is_ok());
    assert_eq!(
        ThetaScheme::new(0.0, 1.0, 0.0051, 0.1),
        Err(Error::UnstableStep)
    );
    // θ = 0.25 doubles the limit: μ·(1 − 2θ) ≤ ½.
    assert!(ThetaScheme::new(0.25, 1.0, 0.01, 0.1).is_ok());
    assert_eq!(
        ThetaScheme::new(0.25, 1.0, 0.0101, 0.1),
        Err(Error::UnstableStep)
    );
}
