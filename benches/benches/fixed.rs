//! Cost of the fixed-point price and delta (`calor::fixed`) against the `f64`
//! kernel, on the same 1,024 near-the-money options of `common::cases`.
//!
//! Run with `cargo bench -p calor-benches --features fixed --bench fixed`.

use std::hint::black_box;

use calor::fixed::{price_delta, Fix, FixedInputs};
use criterion::{criterion_group, criterion_main, Criterion, Throughput};

mod common;
use common::{cases, Strikes};

const OPTIONS: usize = 1024;

fn fixed_vs_f64(c: &mut Criterion) {
    let batch: Vec<_> = cases(Strikes::NearTheMoney, 7)
        .into_iter()
        .take(OPTIONS)
        .collect();
    let fixed: Vec<FixedInputs> = batch
        .iter()
        .map(|case| FixedInputs {
            kind: case.contract.kind,
            spot: Fix::from_num(case.market.spot),
            strike: Fix::from_num(case.contract.strike),
            expiry: Fix::from_num(case.contract.expiry),
            rate: Fix::from_num(case.market.rate),
            dividend_yield: Fix::from_num(case.market.dividend_yield),
            vol: Fix::from_num(case.vol),
        })
        .collect();
    let mut group = c.benchmark_group("fixed_vs_f64");
    group.throughput(Throughput::Elements(OPTIONS as u64));
    group.bench_function("f64_price_delta", |b| {
        b.iter(|| {
            black_box(&batch).iter().fold(0.0, |sum, case| {
                sum + calor::greeks(&case.contract, &case.market, case.vol)
                    .map_or(f64::NAN, |g| g.price + g.delta)
            })
        });
    });
    group.bench_function("f64_price", |b| {
        b.iter(|| {
            black_box(&batch).iter().fold(0.0, |sum, case| {
                sum + calor::price(&case.contract, &case.market, case.vol).unwrap_or(f64::NAN)
            })
        });
    });
    group.bench_function("fixed_price_delta", |b| {
        b.iter(|| {
            black_box(&fixed).iter().fold(Fix::ZERO, |sum, inputs| {
                sum + price_delta(inputs).map_or(Fix::ZERO, |(v, d)| v + d)
            })
        });
    });
    group.finish();
}

criterion_group!(benches, fixed_vs_f64);
criterion_main!(benches);
