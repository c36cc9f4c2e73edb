//! The batch entry points on slices against `libm::exp`, the textbook closed
//! form and the scalar kernel, on the same 4,096 options per group.
//!
//! Measure both builds and compare ratios within one run:
//! `cargo bench -p calor-benches --bench slices` (default target) and
//! `RUSTFLAGS="-C target-cpu=native" cargo bench -p calor-benches --bench slices`.

use std::hint::black_box;

use calor::price_delta_batch;
use criterion::{criterion_group, criterion_main, Criterion};

mod common;
use common::{cases, closed_form_yardsticks, columns, Case, Strikes, BATCH};

fn group(c: &mut Criterion, name: &str, batch: &[Case]) {
    let cols = columns(batch);
    let options = cols.options();
    let mut group = c.benchmark_group(name);
    closed_form_yardsticks(&mut group, batch);
    let (mut prices, mut deltas, mut status) =
        (vec![0.0; BATCH], vec![0.0; BATCH], vec![Ok(()); BATCH]);
    group.bench_function("batch_price_delta", |b| {
        b.iter(|| {
            price_delta_batch(
                black_box(&options),
                &cols.vols,
                &mut prices,
                &mut deltas,
                &mut status,
            )
            .unwrap_or(0)
        });
    });
    group.finish();
}

fn near_the_money(c: &mut Criterion) {
    group(
        c,
        "slices_near_the_money",
        &cases(Strikes::NearTheMoney, 0x4E47_5805),
    );
}

fn wings(c: &mut Criterion) {
    group(c, "slices_wings", &cases(Strikes::Wings, 0x4E47_5806));
}

criterion_group!(benches, near_the_money, wings);
criterion_main!(benches);
