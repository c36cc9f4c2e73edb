//! Inputs and textbook yardsticks shared by the benches.
//!
//! Inputs are generated deterministically, so runs on one machine compare.
//! Every bench target compiles this module and uses only part of it.
#![allow(dead_code)]

use std::f64::consts::FRAC_1_SQRT_2;

use calor::{Contract, Kind, Market};

/// Options per measured batch.
pub const BATCH: usize = 4096;

/// One benchmark input: the contract, its market and its volatility.
#[derive(Clone, Copy)]
pub struct Case {
    pub contract: Contract,
    pub market: Market,
    pub vol: f64,
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
pub enum Strikes {
    /// Uniform in 80–125 around a spot of 100.
    NearTheMoney,
    /// ln(F/K) uniform in ±8·σ√T.
    Wings,
}

pub fn cases(strikes: Strikes, seed: u64) -> Vec<Case> {
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

/// Structure-of-arrays copy of the cases, for the batch entry points.
pub struct Columns {
    pub kinds: Vec<Kind>,
    pub spots: Vec<f64>,
    pub strikes: Vec<f64>,
    pub expiries: Vec<f64>,
    pub rates: Vec<f64>,
    pub dividend_yields: Vec<f64>,
    pub vols: Vec<f64>,
}

pub fn columns(batch: &[Case]) -> Columns {
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

impl Columns {
    /// The options, without their vols.
    pub fn options(&self) -> calor::OptionBatch<'_> {
        calor::OptionBatch {
            kinds: &self.kinds,
            spots: &self.spots,
            strikes: &self.strikes,
            expiries: &self.expiries,
            rates: &self.rates,
            dividend_yields: &self.dividend_yields,
        }
    }
}

/// Standard normal distribution function, the textbook way.
pub fn norm_cdf(z: f64) -> f64 {
    0.5 * libm::erfc(-z * FRAC_1_SQRT_2)
}

/// The textbook closed form, on the same math library as the kernel (`libm`),
/// S·e^(−qT)·N(d1) − K·e^(−rT)·N(d2) for a call and
/// K·e^(−rT)·N(−d2) − S·e^(−qT)·N(−d1) for a put, with no care for the tails.
pub fn textbook(case: &Case) -> f64 {
    let Case {
        contract,
        market,
        vol,
    } = *case;
    let t = contract.expiry;
    let s = vol * libm::sqrt(t);
    let d1 = (libm::log(market.spot / contract.strike)
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

/// Vega of the textbook closed form, S·e^(−qT)·φ(d1)·√T.
pub fn textbook_vega(case: &Case) -> f64 {
    let Case {
        contract,
        market,
        vol,
    } = *case;
    let t = contract.expiry;
    let s = vol * libm::sqrt(t);
    let d1 = (libm::log(market.spot / contract.strike)
        + (market.rate - market.dividend_yield + 0.5 * vol * vol) * t)
        / s;
    market.spot * libm::exp(-market.dividend_yield * t) * libm::exp(-0.5 * d1 * d1) * libm::sqrt(t)
        / (2.0 * std::f64::consts::PI).sqrt()
}

/// The textbook implied-volatility solver: Newton's method on the textbook
/// price, falling back to bisection whenever a step leaves the bracket
/// [10⁻⁴, 10], until the bracket or the step is below 10⁻¹².
pub fn textbook_implied(case: &Case, premium: f64) -> f64 {
    let (mut lo, mut hi) = (1e-4, 10.0);
    let mut vol = 0.3;
    for _ in 0..200 {
        let trial = Case { vol, ..*case };
        let diff = textbook(&trial) - premium;
        if diff > 0.0 {
            hi = vol;
        } else {
            lo = vol;
        }
        let newton = vol - diff / textbook_vega(&trial);
        let next = if newton > lo && newton < hi {
            newton
        } else {
            0.5 * (lo + hi)
        };
        if (next - vol).abs() < 1e-12 || hi - lo < 1e-12 {
            return next;
        }
        vol = next;
    }
    vol
}

/// A criterion group measured in wall time.
pub type Group<'a> = criterion::BenchmarkGroup<'a, criterion::measurement::WallTime>;

/// `libm::exp` once per case: the yardstick every ratio is taken against.
pub fn exp_yardstick<'c>(group: &mut Group<'_>, cases: impl Iterator<Item = &'c Case>) {
    let exp_args: Vec<f64> = cases.map(|c| -c.market.rate * c.contract.expiry).collect();
    group.bench_function("libm_exp", |b| {
        b.iter(|| {
            std::hint::black_box(&exp_args)
                .iter()
                .fold(0.0, |sum, &x| sum + libm::exp(x))
        });
    });
}

/// The yardstick, the textbook closed form and the scalar kernel price on the
/// same batch, with the group's throughput set to the batch size.
pub fn closed_form_yardsticks(group: &mut Group<'_>, batch: &[Case]) {
    group.throughput(criterion::Throughput::Elements(batch.len() as u64));
    exp_yardstick(group, batch.iter());
    group.bench_function("textbook_price", |b| {
        b.iter(|| {
            std::hint::black_box(batch)
                .iter()
                .fold(0.0, |sum, case| sum + textbook(case))
        });
    });
    kernel_price(group, batch);
}

/// The scalar kernel price of each case at its vol (`calor_price`).
pub fn kernel_price(group: &mut Group<'_>, cases: &[Case]) {
    group.bench_function("calor_price", |b| {
        b.iter(|| {
            std::hint::black_box(cases).iter().fold(0.0, |sum, c| {
                sum + calor::price(&c.contract, &c.market, c.vol).unwrap_or(f64::NAN)
            })
        });
    });
}
