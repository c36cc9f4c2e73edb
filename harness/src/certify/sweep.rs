//! The sampled property sweep: relations every price must satisfy, checked on
//! seeded random cases over the whole domain of the contract.
//!
//! Parity, the no-arbitrage bounds, monotonicity and convexity in strike,
//! homogeneity of degree one in (spot, strike), and six Greeks against central
//! differences of the price. Every limit is in `tolerance.rs` with its reason.

use crate::cases::black::{Inputs, KindCell};
use crate::certify::region::regions_of;
use crate::certify::tally::Tally;
use crate::tolerance::{self, Tolerance};

/// The suite's name in reports.
pub const SUITE: &str = "sweep";

/// Cases of a default run; `--extended` takes 100 times as many.
pub const DEFAULT_CASES: usize = 10_000;

/// The seed of the sweep (written to the certificate).
pub const SEED: u64 = 0x00ca_104f_2024_0001;

/// SplitMix64 (G. Steele, D. Lea & C. Flood, "Fast splittable pseudorandom
/// number generators", OOPSLA 2014): small, seedable, good enough for sampling.
#[derive(Debug, Clone)]
pub struct SampleStream(u64);

impl SampleStream {
    /// A stream from `seed`.
    pub const fn new(seed: u64) -> Self {
        SampleStream(seed)
    }

    /// The next 64 random bits.
    pub fn next_bits(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    pub fn unit(&mut self) -> f64 {
        (self.next_bits() >> 11) as f64 * (1.0 / (1u64 << 53) as f64)
    }

    /// Uniform in [lo, hi).
    pub fn uniform(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.unit()
    }

    /// Log-uniform in [lo, hi).
    pub fn log_uniform(&mut self, lo: f64, hi: f64) -> f64 {
        (lo.ln() + (hi.ln() - lo.ln()) * self.unit()).exp()
    }
}

/// One sampled case on the domain of the contract: expiry 1 hour to 50 years,
/// vol 0.1 % to 500 % (both log-uniform), rate −5 % to 30 %, dividend yield
/// 0 to 20 %, spot 1e-3 to 1e6 (log-uniform) and a strike at a standardised
/// moneyness |z| uniform in [0, 10] with a random sign.
pub fn sample(stream: &mut SampleStream) -> Inputs {
    let kind = if stream.next_bits() & 1 == 0 {
        KindCell::Call
    } else {
        KindCell::Put
    };
    let expiry = stream.log_uniform(1.0 / 8760.0, 50.0);
    let vol = stream.log_uniform(0.001, 5.0);
    let rate = stream.uniform(-0.05, 0.30);
    let dividend_yield = stream.uniform(0.0, 0.20);
    let spot = stream.log_uniform(1e-3, 1e6);
    let z = stream.uniform(-10.0, 10.0);
    let forward = spot * ((rate - dividend_yield) * expiry).exp();
    let strike = forward * (-z * vol * expiry.sqrt()).exp();
    Inputs {
        kind,
        spot,
        strike,
        expiry,
        rate,
        dividend_yield,
        vol,
    }
}

/// Price and Greeks of `inputs`, with κ computed from the kernel's own Greeks.
fn valued(inputs: &Inputs) -> Result<(calor::Greeks, f64), calor::Error> {
    let g = calor::greeks(&inputs.contract(), &inputs.market(), inputs.vol)?;
    Ok((g, condition(inputs, &g)))
}

/// κ = Σ|xᵢ·∂V/∂xᵢ|/|V| over (S, K, T, r, q, σ), with ∂V/∂K = (V − S·Δ)/K by homogeneity.
fn condition(inputs: &Inputs, g: &calor::Greeks) -> f64 {
    let dv_dk = (g.price - inputs.spot * g.delta) / inputs.strike;
    let sum = (inputs.spot * g.delta).abs()
        + (inputs.strike * dv_dk).abs()
        + (inputs.expiry * g.theta).abs()
        + (inputs.rate * g.rho).abs()
        + (inputs.dividend_yield * g.dividend_rho).abs()
        + (inputs.vol * g.vega).abs();
    if g.price == 0.0 {
        0.0
    } else {
        sum / g.price.abs()
    }
}

fn price(inputs: &Inputs) -> f64 {
    calor::price(&inputs.contract(), &inputs.market(), inputs.vol).unwrap_or(f64::NAN)
}

/// Runs `cases` sampled cases from [`SEED`] and records every property.
pub fn check_sweep(cases: usize, tally: &mut Tally) {
    let mut stream = SampleStream::new(SEED);
    for n in 0..cases {
        let inputs = sample(&mut stream);
        let id = format!("s{n:07}");
        let regions = regions_of(&inputs);
        let mut record = |function: &'static str, tol: &Tolerance, units: f64, what: String| {
            tally.record(SUITE, function, &id, &regions, units, tol.limit, || {
                format!("{inputs:?} {what}")
            });
        };
        let Ok((g, kappa)) = valued(&inputs) else {
            record(
                "parity",
                &tolerance::PARITY,
                f64::INFINITY,
                "refused by calor::greeks".to_owned(),
            );
            continue;
        };
        for (function, tol, units, what) in properties(&inputs, &g, kappa) {
            record(function, tol, units, what);
        }
    }
}

/// One property's measurement: function, tolerance, error in its units, detail.
type Measured = (&'static str, &'static Tolerance, f64, String);

fn properties(inputs: &Inputs, g: &calor::Greeks, kappa: f64) -> Vec<Measured> {
    let mut out = vec![parity(inputs, g, kappa), bounds(inputs, g, kappa)];
    out.push(strike_monotone(inputs, g, kappa));
    out.push(strike_convex(inputs, g, kappa));
    out.push(homogeneity(inputs, g, kappa));
    out.extend(finite_differences(inputs, g, kappa));
    out
}

fn eps_units(err: f64, bound: f64) -> f64 {
    if err <= tolerance::UNDERFLOW_FLOOR {
        0.0
    } else {
        err / (f64::EPSILON * bound)
    }
}

fn discounts(inputs: &Inputs) -> (f64, f64) {
    let s = inputs.spot * (-inputs.dividend_yield * inputs.expiry).exp();
    let k = inputs.strike * (-inputs.rate * inputs.expiry).exp();
    (s, k)
}

fn parity(inputs: &Inputs, g: &calor::Greeks, kappa: f64) -> Measured {
    let twin = Inputs {
        kind: match inputs.kind {
            KindCell::Call => KindCell::Put,
            KindCell::Put => KindCell::Call,
        },
        ..*inputs
    };
    let (s, k) = discounts(inputs);
    let (rt, qt) = (
        (inputs.rate * inputs.expiry).abs(),
        (inputs.dividend_yield * inputs.expiry).abs(),
    );
    let Ok((h, kappa_twin)) = valued(&twin) else {
        return (
            "parity",
            &tolerance::PARITY,
            f64::INFINITY,
            "twin refused".into(),
        );
    };
    let (call, put) = match inputs.kind {
        KindCell::Call => (g.price, h.price),
        KindCell::Put => (h.price, g.price),
    };
    let bound = (1.0 + kappa) * g.price.abs()
        + (1.0 + kappa_twin) * h.price.abs()
        + (2.0 + qt) * s
        + (2.0 + rt) * k;
    let err = ((call - put) - (s - k)).abs();
    (
        "parity",
        &tolerance::PARITY,
        eps_units(err, bound),
        format!(
            "call {call:e} put {put:e}: C − P = {:e}, S·e^(−qT) − K·e^(−rT) = {:e}",
            call - put,
            s - k
        ),
    )
}

fn bounds(inputs: &Inputs, g: &calor::Greeks, kappa: f64) -> Measured {
    let (s, k) = discounts(inputs);
    let (lower, upper) = match inputs.kind {
        KindCell::Call => ((s - k).max(0.0), s),
        KindCell::Put => ((k - s).max(0.0), k),
    };
    let v = g.price;
    let violation = (lower - v).max(v - upper).max(0.0);
    let carry =
        2.0 + (inputs.rate * inputs.expiry).abs() + (inputs.dividend_yield * inputs.expiry).abs();
    let bound = (1.0 + kappa) * v.abs() + carry * upper;
    (
        "bounds",
        &tolerance::BOUNDS,
        eps_units(violation, bound),
        format!("price {v:e} outside [{lower:e}, {upper:e}]"),
    )
}

fn strike_monotone(inputs: &Inputs, g: &calor::Greeks, kappa: f64) -> Measured {
    let higher = Inputs {
        strike: inputs.strike * (1.0 + inputs.total_vol() / 10.0),
        ..*inputs
    };
    let v2 = valued(&higher);
    let (p2, k2) = v2.map_or((f64::NAN, 0.0), |(h, k)| (h.price, k));
    // A call falls and a put rises with the strike.
    let rise = match inputs.kind {
        KindCell::Call => p2 - g.price,
        KindCell::Put => g.price - p2,
    };
    let bound = (1.0 + kappa) * g.price.abs() + (1.0 + k2) * p2.abs();
    let units = if rise.is_nan() {
        f64::INFINITY
    } else {
        eps_units(rise.max(0.0), bound)
    };
    (
        "strike_monotone",
        &tolerance::STRIKE_MONOTONE,
        units,
        format!("V(K) = {:e}, V({:e}) = {p2:e}", g.price, higher.strike),
    )
}

fn strike_convex(inputs: &Inputs, g: &calor::Greeks, kappa: f64) -> Measured {
    let h = inputs.strike * inputs.total_vol().min(1.0) / 10.0;
    let at = |strike: f64| valued(&Inputs { strike, ..*inputs });
    let (kl, kr) = (inputs.strike - h, inputs.strike + h);
    let (Ok((l, kappa_l)), Ok((r, kappa_r))) = (at(kl), at(kr)) else {
        return (
            "strike_convex",
            &tolerance::STRIKE_CONVEX,
            f64::INFINITY,
            "a neighbouring strike was refused".into(),
        );
    };
    let (hl, hr) = (inputs.strike - kl, kr - inputs.strike);
    let slope_left = (g.price - l.price) / hl;
    let slope_right = (r.price - g.price) / hr;
    let violation = (slope_left - slope_right).max(0.0);
    let bound = ((1.0 + kappa_l) * l.price.abs()
        + 2.0 * (1.0 + kappa) * g.price.abs()
        + (1.0 + kappa_r) * r.price.abs())
        * (1.0 / hl + 1.0 / hr);
    (
        "strike_convex",
        &tolerance::STRIKE_CONVEX,
        eps_units(violation, bound),
        format!(
            "V({kl:e}) = {:e}, V(K) = {:e}, V({kr:e}) = {:e}",
            l.price, g.price, r.price
        ),
    )
}

fn homogeneity(inputs: &Inputs, g: &calor::Greeks, kappa: f64) -> Measured {
    // λ from the case itself, so the sweep needs no second stream.
    let lambda = 0.25 * 16f64.powf((inputs.spot.ln().abs() * 7.0).fract());
    let scaled = Inputs {
        spot: lambda * inputs.spot,
        strike: lambda * inputs.strike,
        ..*inputs
    };
    let got = price(&scaled);
    let want = lambda * g.price;
    let err = (got - want).abs();
    let units = if err.is_nan() {
        f64::INFINITY
    } else {
        eps_units(err, (1.0 + kappa) * want.abs())
    };
    (
        "homogeneity",
        &tolerance::HOMOGENEITY,
        units,
        format!("λ {lambda}: V(λS, λK) = {got:e}, λ·V(S, K) = {want:e}"),
    )
}

/// The natural scales of spot, vol, expiry and rate: the change of each over
/// which the price's derivatives change by a factor of order one.
struct Scales {
    spot: f64,
    vol: f64,
    expiry: f64,
    rate: f64,
}

fn scales(inputs: &Inputs) -> Scales {
    let s = inputs.total_vol();
    let z = inputs.standardised_moneyness();
    let w = 1.0f64.max((z + s / 2.0).abs()).max((z - s / 2.0).abs());
    Scales {
        spot: inputs.spot * (s / w).min(1.0),
        vol: inputs.vol / (w * w).max(1.0),
        expiry: inputs.expiry / (w * w).max(1.0) / 4.0,
        rate: (s / w).min(1.0) / inputs.expiry,
    }
}

/// A central difference of `f` at `x` with step about `h`, over the actual
/// (representable) step.
fn central(f: &impl Fn(f64) -> f64, x: f64, h: f64) -> f64 {
    let (up, down) = (x + h, x - h);
    (f(up) - f(down)) / (up - down)
}

/// A central second difference on the actual nodes x − h, x, x + h.
fn second(f: &impl Fn(f64) -> f64, x: f64, h: f64) -> f64 {
    let (up, down) = (x + h, x - h);
    let (hu, hd) = (up - x, x - down);
    let fx = f(x);
    2.0 * ((f(up) - fx) / hu - (fx - f(down)) / hd) / (hu + hd)
}

/// One Greek against its difference: the kernel's value, fd(h), fd(2h), the
/// step h and the order of the derivative.
struct Difference {
    function: &'static str,
    name: &'static str,
    greek: f64,
    fd: f64,
    fd2: f64,
    h: f64,
    order: i32,
}

fn judge(inputs: &Inputs, d: &Difference, price: f64, kappa: f64) -> Measured {
    let eps = f64::EPSILON;
    let natural = tolerance::natural_scale(d.name, price, inputs.spot, inputs.vol, inputs.expiry)
        .unwrap_or(f64::NAN);
    let rounding = if d.order == 1 {
        tolerance::PRICE.limit * eps * (1.0 + kappa) * price / d.h
    } else {
        4.0 * tolerance::PRICE.limit * eps * (1.0 + kappa) * price / (d.h * d.h)
    };
    let own = tolerance::GREEK.limit * eps * (1.0 + kappa) * (d.greek.abs() + natural);
    let truncation = (d.fd2 - d.fd).abs() / 3.0;
    let err = (d.greek - d.fd).abs();
    let units = if err <= tolerance::UNDERFLOW_FLOOR {
        0.0
    } else {
        err / (truncation + rounding + own)
    };
    (
        d.function,
        &tolerance::FINITE_DIFFERENCE,
        if units.is_nan() { f64::INFINITY } else { units },
        format!(
            "{} expected {:e} (difference, step {:e}; {:e} at 2h) got {:e}",
            d.name, d.fd, d.h, d.fd2, d.greek
        ),
    )
}

fn finite_differences(inputs: &Inputs, g: &calor::Greeks, kappa: f64) -> Vec<Measured> {
    let c = scales(inputs);
    let cube = f64::EPSILON.cbrt();
    let fourth = f64::EPSILON.sqrt().sqrt();
    let at_spot = |x: f64| price(&Inputs { spot: x, ..*inputs });
    let at_vol = |x: f64| price(&Inputs { vol: x, ..*inputs });
    let at_expiry = |x: f64| {
        price(&Inputs {
            expiry: x,
            ..*inputs
        })
    };
    let at_rate = |x: f64| price(&Inputs { rate: x, ..*inputs });
    let at_yield = |x: f64| {
        price(&Inputs {
            dividend_yield: x,
            ..*inputs
        })
    };
    let first =
        |function, name, greek, f: &dyn Fn(f64) -> f64, x: f64, h: f64, sign: f64| Difference {
            function,
            name,
            greek,
            fd: sign * central(&f, x, h),
            fd2: sign * central(&f, x, 2.0 * h),
            h,
            order: 1,
        };
    let hg = fourth * c.spot;
    let rows = [
        first(
            "fd_delta",
            "delta",
            g.delta,
            &at_spot,
            inputs.spot,
            cube * c.spot,
            1.0,
        ),
        Difference {
            function: "fd_gamma",
            name: "gamma",
            greek: g.gamma,
            fd: second(&at_spot, inputs.spot, hg),
            fd2: second(&at_spot, inputs.spot, 2.0 * hg),
            h: hg,
            order: 2,
        },
        first(
            "fd_vega",
            "vega",
            g.vega,
            &at_vol,
            inputs.vol,
            cube * c.vol,
            1.0,
        ),
        first(
            "fd_theta",
            "theta",
            g.theta,
            &at_expiry,
            inputs.expiry,
            cube * c.expiry,
            -1.0,
        ),
        first(
            "fd_rho",
            "rho",
            g.rho,
            &at_rate,
            inputs.rate,
            cube * c.rate,
            1.0,
        ),
        first(
            "fd_dividend_rho",
            "dividend_rho",
            g.dividend_rho,
            &at_yield,
            inputs.dividend_yield,
            cube * c.rate,
            1.0,
        ),
    ];
    rows.iter()
        .map(|d| judge(inputs, d, g.price.abs(), kappa))
        .collect()
}
