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

use criterion::{criterion_group, criterion_main, Criterion};

mod common;
use common::{cases, closed_form_yardsticks, Case, Group, Strikes};

/// The four measurements of one group, over the same batch.
fn measure(group: &mut Group<'_>, batch: &[Case]) {
    closed_form_yardsticks(group, batch);
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
