//! Throughput of the kernel against two yardsticks, on the same 4,096 options.
//!
//! Each group measures, in one run: `libm::exp` on 4,096 arguments (the cost
//! of one transcendental call per option), the textbook closed form written
//! below, `calor::price` and `calor::greeks`. Inputs are generated
//! deterministically, so runs on one machine compare.
//!
//! - `near_the_money`: spot 100, strikes 80–125, expiries 0.05–2 years, vols
//!   10 %–60 %, rates 0–8 %, dividend yields 0–3 %.
//! - `wings`: the same ranges, with strikes placed so that ln(F/K) spans
//!   ±8·σ√T, where the tail-accurate paths of the kernel take over.
//!
//! Run with `cargo bench -p calor-benches`.

use std::hint::black_box;

use criterion::{criterion_group, criterion_main, BenchmarkGroup, Criterion, Throughput};

mod common;
use common::{cases, textbook, Case, Strikes, BATCH};

/// The four measurements of one group, over the same batch.
fn measure(group: &mut BenchmarkGroup<'_, criterion::measurement::WallTime>, batch: &[Case]) {
    group.throughput(Throughput::Elements(BATCH as u64));
    let exp_args: Vec<f64> = batch
        .iter()
        .map(|c| -c.market.rate * c.contract.expiry)
        .collect();
    group.bench_function("libm_exp", |b| {
        b.iter(|| {
            black_box(&exp_args)
                .iter()
                .fold(0.0, |sum, &x| sum + libm::exp(x))
        });
    });
    group.bench_function("textbook_price", |b| {
        b.iter(|| {
            black_box(batch)
                .iter()
                .fold(0.0, |sum, case| sum + textbook(case))
        });
    });
    group.bench_function("calor_price", |b| {
        b.iter(|| {
            black_box(batch).iter().fold(0.0, |sum, c| {
                sum + calor::price(&c.contract, &c.market, c.vol).unwrap_or(f64::NAN)
            })
        });
    });
    group.bench_function("calor_greeks", |b| {
        b.iter(|| {
            black_box(batch).iter().fold(0.0, |sum, c| {
                sum + calor::greeks(&c.contract, &c.market, c.vol)
                    .map_or(f64::NAN, |g| black_box(g).price)
            })
        });
    });
}

fn near_the_money(c: &mut Criterion) {
    let batch = cases(Strikes::NearTheMoney, 0x4E47_5801);
    let mut group = c.benchmark_group("near_the_money");
    measure(&mut group, &batch);
    group.finish();
}

fn wings(c: &mut Criterion) {
    let batch = cases(Strikes::Wings, 0x4E47_5802);
    let mut group = c.benchmark_group("wings");
    measure(&mut group, &batch);
    group.finish();
}

criterion_group!(benches, near_the_money, wings);
criterion_main!(benches);
