//! Cost of the heat-equation grid.
//!
//! - `american_price`: the default grid (241 × 60 nodes × steps, extrapolated
//!   from 481 × 120) on 16 American options of the accuracy box, beside the
//!   closed form `calor::price` on the same options.
//! - `heat_step`: one Crank–Nicolson step of 481 nodes (factoring included, and
//!   with pivots reused) beside a bare Thomas solve of the same tridiagonal
//!   system written below.
//!
//! Run with `cargo bench -p calor-benches --bench grid`.

use std::hint::black_box;

use calor::{Contract, Kind, Market, ThetaScheme};
use criterion::{criterion_group, criterion_main, Criterion, Throughput};

/// 16 options over spot/strike 0.8–1.25, expiry 0.1–2, vol 10–60 %, rate 2–8 %, yield 0–3 %.
fn options() -> Vec<(Contract, Market, f64)> {
    (0..16)
        .map(|i| {
            let f = f64::from(i) / 15.0;
            let kind = if i % 2 == 0 { Kind::Put } else { Kind::Call };
            let contract = Contract {
                kind,
                strike: 100.0,
                expiry: 0.1 + 1.9 * f,
            };
            let market = Market {
                spot: 80.0 + 45.0 * ((f * 7.0) % 1.0),
                rate: 0.02 + 0.06 * ((f * 3.0) % 1.0),
                dividend_yield: 0.03 * ((f * 5.0) % 1.0),
            };
            (contract, market, 0.1 + 0.5 * ((f * 11.0) % 1.0))
        })
        .collect()
}

fn american(c: &mut Criterion) {
    let options = options();
    let mut group = c.benchmark_group("american_price");
    group.throughput(Throughput::Elements(options.len() as u64));
    group.bench_function("calor::american_price", |b| {
        b.iter(|| {
            for (contract, market, vol) in &options {
                black_box(calor::american_price(black_box(contract), market, *vol).ok());
            }
        });
    });
    group.bench_function("calor::price (closed form, European)", |b| {
        b.iter(|| {
            for (contract, market, vol) in &options {
                black_box(calor::price(black_box(contract), market, *vol).ok());
            }
        });
    });
    group.finish();
}

/// The textbook Thomas algorithm for a tridiagonal system with constant
/// diagonals: `diag` on the diagonal, `off` on both neighbours.
fn bare_thomas(off: f64, diag: f64, rhs: &mut [f64], scratch: &mut [f64]) {
    let n = rhs.len();
    scratch[0] = off / diag;
    rhs[0] /= diag;
    for i in 1..n {
        let m = 1.0 / (diag - off * scratch[i - 1]);
        scratch[i] = off * m;
        rhs[i] = (rhs[i] - off * rhs[i - 1]) * m;
    }
    for i in (0..n - 1).rev() {
        rhs[i] -= scratch[i] * rhs[i + 1];
    }
}

fn heat(c: &mut Criterion) {
    const NODES: usize = 481;
    let h = 1.0 / (NODES - 1) as f64;
    let scheme = ThetaScheme::new(0.5, 1.0, 10.0 * h * h, h).expect("a scheme");
    let start: Vec<f64> = (0..NODES)
        .map(|j| (std::f64::consts::PI * j as f64 * h).sin())
        .collect();
    let mut group = c.benchmark_group("heat_step");
    group.throughput(Throughput::Elements(NODES as u64));
    let mut u = start.clone();
    let mut scratch = vec![0.0; NODES];
    group.bench_function("ThetaScheme::step (factoring included)", |b| {
        b.iter(|| scheme.step(black_box(&mut u), &mut scratch, 0.0, 0.0));
    });
    let mut pivots = vec![0.0; NODES - 2];
    let factored = scheme.factor(&mut pivots).expect("pivots");
    let mut u = start.clone();
    group.bench_function("Factored::step (pivots reused)", |b| {
        b.iter(|| factored.step(black_box(&mut u), 0.0, 0.0));
    });
    let mut rhs = start[1..NODES - 1].to_vec();
    let mut scratch = vec![0.0; NODES - 2];
    let (off, diag) = (-0.5 * scheme.mesh_ratio(), 1.0 + scheme.mesh_ratio());
    group.bench_function("bare Thomas solve", |b| {
        b.iter(|| bare_thomas(off, diag, black_box(&mut rhs), &mut scratch));
    });
    group.finish();
}

criterion_group!(benches, american, heat);
criterion_main!(benches);
