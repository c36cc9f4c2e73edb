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

use std::f64::consts::FRAC_1_SQRT_2;
use std::hint::black_box;

use calor::{Contract, Kind, Market};
use criterion::{criterion_group, criterion_main, BenchmarkGroup, Criterion, Throughput};

/// Options per measured batch.
const BATCH: usize = 4096;

/// One benchmark input: the contract, its market and its volatility.
#[derive(Clone, Copy)]
struct Case {
    contract: Contract,
    market: Market,
    vol: f64,
}

/// SplitMix64: a small, fixed generator, so every run sees the same inputs.
struct SplitMix(u64);

impl SplitMix {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [lo, hi).
    fn uniform(&mut self, lo: f64, hi: f64) -> f64 {
        let unit = (self.next_u64() >> 11) as f64 * (1.0 / (1u64 << 53) as f64);
        lo + (hi - lo) * unit
    }
}

/// How the strike of a generated case is chosen.
#[derive(Clone, Copy)]
enum Strikes {
    /// Uniform in 80–125 around a spot of 100.
    NearTheMoney,
    /// ln(F/K) uniform in ±8·σ√T.
    Wings,
}

fn cases(strikes: Strikes, seed: u64) -> Vec<Case> {
    let mut rng = SplitMix(seed);
    (0..BATCH)
        .map(|i| {
            let spot = 100.0;
            let expiry = rng.uniform(0.05, 2.0);
            let vol = rng.uniform(0.1, 0.6);
            let rate = rng.uniform(0.0, 0.08);
            let dividend_yield = rng.uniform(0.0, 0.03);
            let strike = match strikes {
                Strikes::NearTheMoney => rng.uniform(80.0, 125.0),
                Strikes::Wings => {
                    let forward = spot * ((rate - dividend_yield) * expiry).exp();
                    let z = rng.uniform(-8.0, 8.0);
                    forward * (-z * vol * expiry.sqrt()).exp()
                }
            };
            let kind = if i % 2 == 0 { Kind::Call } else { Kind::Put };
            Case {
                contract: Contract {
                    kind,
                    strike,
                    expiry,
                },
                market: Market {
                    spot,
                    rate,
                    dividend_yield,
                },
                vol,
            }
        })
        .collect()
}

/// Standard normal distribution function, the textbook way.
fn norm_cdf(z: f64) -> f64 {
    0.5 * libm::erfc(-z * FRAC_1_SQRT_2)
}

/// The textbook closed form, S·e^(−qT)·N(d1) − K·e^(−rT)·N(d2) for a call and
/// K·e^(−rT)·N(−d2) − S·e^(−qT)·N(−d1) for a put, with no care for the tails.
fn textbook(case: &Case) -> f64 {
    let Case {
        contract,
        market,
        vol,
    } = *case;
    let t = contract.expiry;
    let s = vol * t.sqrt();
    let d1 = ((market.spot / contract.strike).ln()
        + (market.rate - market.dividend_yield + 0.5 * vol * vol) * t)
        / s;
    let d2 = d1 - s;
    let spot_leg = market.spot * libm::exp(-market.dividend_yield * t);
    let strike_leg = contract.strike * libm::exp(-market.rate * t);
    match contract.kind {
        Kind::Call => spot_leg * norm_cdf(d1) - strike_leg * norm_cdf(d2),
        Kind::Put => strike_leg * norm_cdf(-d2) - spot_leg * norm_cdf(-d1),
    }
}

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
