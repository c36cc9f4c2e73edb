//! The batch entry points on slices against `libm::exp`, the textbook closed
//! form and the scalar kernel, on the same 4,096 options per group.
//!
//! Measure both builds and compare ratios within one run:
//! `cargo bench -p calor-benches --bench slices` (default target) and
//! `RUSTFLAGS="-C target-cpu=native" cargo bench -p calor-benches --bench slices`.

use std::hint::black_box;

use calor::{price_delta_batch, OptionBatch};
use criterion::{criterion_group, criterion_main, Criterion};

mod common;
use common::{cases, closed_form_yardsticks, Case, Strikes, BATCH};

/// Structure-of-arrays copy of the cases.
struct Columns {
    kinds: Vec<calor::Kind>,
    spots: Vec<f64>,
    strikes: Vec<f64>,
    expiries: Vec<f64>,
    rates: Vec<f64>,
    dividend_yields: Vec<f64>,
    vols: Vec<f64>,
}

fn columns(batch: &[Case]) -> Columns {
    Columns {
        kinds: batch.iter().map(|c| c.contract.kind).collect(),
        spots: batch.iter().map(|c| c.market.spot).collect(),
        strikes: batch.iter().map(|c| c.contract.strike).collect(),
        expiries: batch.iter().map(|c| c.contract.expiry).collect(),
        rates: batch.iter().map(|c| c.market.rate).collect(),
        dividend_yields: batch.iter().map(|c| c.market.dividend_yield).collect(),
        vols: batch.iter().map(|c| c.vol).collect(),
    }
}

fn group(c: &mut Criterion, name: &str, batch: &[Case]) {
    let cols = columns(batch);
    let options = OptionBatch {
        kinds: &cols.kinds,
        spots: &cols.spots,
        strikes: &cols.strikes,
        expiries: &cols.expiries,
        rates: &cols.rates,
        dividend_yields: &cols.dividend_yields,
    };
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
