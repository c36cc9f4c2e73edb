//! Implied volatility: the kernel's bounded solver against a textbook
//! Newton–bisection solver and the `libm::exp` yardstick, on the same premiums,
//! with the kernel's price of the same options as the unit of "prices per solve",
//! and the same premiums through `calor::implied_vol_batch`.
//!
//! Premiums are the kernel's prices of the benchmark options at their vols, so
//! both solvers answer the same questions. Run with
//! `cargo bench -p calor-benches --bench implied`.

use std::hint::black_box;

use criterion::{criterion_group, criterion_main, Criterion, Throughput};

mod common;
use common::{cases, columns, exp_yardstick, kernel_price, textbook_implied, Case, Strikes, BATCH};

fn with_premiums(strikes: Strikes, seed: u64) -> Vec<(Case, f64)> {
    cases(strikes, seed)
        .into_iter()
        .filter_map(|c| {
            let p = calor::price(&c.contract, &c.market, c.vol).ok()?;
            calor::implied_vol(&c.contract, &c.market, p)
                .ok()
                .map(|_| (c, p))
        })
        .collect()
}

fn group(c: &mut Criterion, name: &str, batch: &[(Case, f64)]) {
    let mut group = c.benchmark_group(name);
    group.throughput(Throughput::Elements(batch.len() as u64));
    exp_yardstick(&mut group, batch.iter().map(|(c, _)| c));
    group.bench_function("textbook_newton_bisection", |b| {
        b.iter(|| {
            black_box(batch)
                .iter()
                .fold(0.0, |sum, (c, p)| sum + textbook_implied(c, *p))
        });
    });
    // A solver that polishes a guess prices the option at least once to full
    // precision: the kernel's price of the same options, at the vols the
    // premiums came from, says how many prices a solve costs in this run.
    let options: Vec<Case> = batch.iter().map(|(c, _)| *c).collect();
    kernel_price(&mut group, &options);
    group.bench_function("calor_implied_vol", |b| {
        b.iter(|| {
            black_box(batch).iter().fold(0.0, |sum, (c, p)| {
                sum + calor::implied_vol(&c.contract, &c.market, *p).unwrap_or(f64::NAN)
            })
        });
    });
    // The same premiums through the batch entry point, which solves blocks of
    // them stage by stage; columns and outputs are set up outside the loop.
    let cols = columns(&options);
    let inputs = cols.options();
    let premiums: Vec<f64> = batch.iter().map(|(_, p)| *p).collect();
    let (mut vols, mut status) = (vec![0.0; batch.len()], vec![Ok(()); batch.len()]);
    group.bench_function("calor_implied_vol_batch", |b| {
        b.iter(|| {
            let solved = calor::implied_vol_batch(
                black_box(&inputs),
                black_box(&premiums),
                &mut vols,
                &mut status,
            );
            black_box((solved.ok(), &vols));
        });
    });
    group.finish();
}

fn near_the_money(c: &mut Criterion) {
    let batch = with_premiums(Strikes::NearTheMoney, 0x4E47_5803);
    assert!(batch.len() > BATCH / 2);
    group(c, "implied_near_the_money", &batch);
}

fn wings(c: &mut Criterion) {
    let batch = with_premiums(Strikes::Wings, 0x4E47_5804);
    group(c, "implied_wings", &batch);
}

criterion_group!(benches, near_the_money, wings);
criterion_main!(benches);
