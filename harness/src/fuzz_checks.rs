//! The checks behind the fuzz targets in `fuzz/`, shared with the stable
//! replay test `tests/fuzz_replay.rs`, so that an input the fuzzer once broke
//! stays fixed.
//!
//! Each `check_*` function turns arbitrary bytes into a call of the kernel (or
//! of the batch decoder) and panics if an invariant fails. The invariants:
//! no panic; whatever is accepted is finite; and on success the cheap
//! identities of the model hold within tolerances derived below from the
//! accuracy contract in README.md.
//!
//! # Input layout
//! Byte 0 holds flags: bit 0 = put, bit 1 = raw mode, bit 2 = a target's
//! variant. Then little-endian u64 words, missing bytes read as zero. In raw
//! mode each word is the bits of an `f64` (NaN, ±∞, subnormals, huge
//! values: the error paths); otherwise words are mapped into ranges a little
//! wider than the documented domain.
//!
//! # Tolerances
//! Let L = S·e^(−qT) + K·e^(−rT) (the two legs of the forward) and
//! a = |r|T + |q|T + σ√T. Every elasticity of a call or put is bounded by the
//! legs: S·|∂V/∂S| ≤ L, K·|∂V/∂K| ≤ L, T·|∂V/∂T| ≤ L·a, r·|∂V/∂r| + q·|∂V/∂q| ≤ L·a,
//! σ·∂V/∂σ ≤ L·σ√T, so κ·V ≤ L·(2 + 2a). The contract's price error
//! 8·ε·(1+κ)·V is then at most 8·ε·L·(3 + 2a), and evaluating e^(−rT) and
//! e^(−qT) here adds about ε·L·(1 + a). Hence:
//! - [`PARITY_ULPS`]: C − P against S·e^(−qT) − K·e^(−rT), two prices and
//!   the legs: 2·8·(3 + 2a) + 4·(1 + a) ≤ 64·(1 + a) ulps of L.
//! - [`BOUND_ULPS`]: one price against a bound: 8·(3 + 2a) + 2·(1 + a) ≤ 32·(1 + a) ulps of L.
//! - Repricing an implied vol: |σ̂ − σ| ≤ 16·(1+κ)·ε·V/vega + 4·ε·σ, so
//!   |V(σ̂) − premium| ≤ vega·|σ̂ − σ| + 8·ε·(1+κ)·V ≤ 24·ε·(V + κV) + 4·ε·σ·vega,
//!   within [`BOUND_ULPS`]·(1 + a) ulps of L with σ√T·φ ≤ a.
//!
//! These hold only inside the documented domain, so the identities are
//! checked there; outside it only finiteness and the sign are.

use calor::{Contract, GridSpec, Kind, Market, ThetaScheme};

use crate::batch::{self, Format};

/// Ulps of L allowed, per unit of (1 + a), for put–call parity (see the module docs).
pub const PARITY_ULPS: f64 = 64.0;

/// Ulps of L allowed, per unit of (1 + a), for a price against a bound or a repricing.
pub const BOUND_ULPS: f64 = 32.0;

/// American against European, and against the European call when early
/// exercise never pays: the grid's documented accuracy is 1e-6·K on its
/// reference domain, doubled for the reference's own error.
pub const AMERICAN_TOLERANCE_PER_STRIKE: f64 = 2e-6;

/// The fuzz input, read as a flag byte and little-endian words.
#[derive(Clone, Copy, Debug)]
pub struct Input<'a> {
    data: &'a [u8],
}

impl<'a> Input<'a> {
    /// Wraps the raw bytes.
    pub const fn new(data: &'a [u8]) -> Self {
        Input { data }
    }

    /// Byte 0.
    pub fn flags(&self) -> u8 {
        self.data.first().copied().unwrap_or(0)
    }

    /// Bit 0 of the flags: call or put.
    pub fn kind(&self) -> Kind {
        if self.flags() & 1 == 0 {
            Kind::Call
        } else {
            Kind::Put
        }
    }

    /// Bit 1 of the flags: raw `f64` bits instead of mapped ranges.
    pub fn raw(&self) -> bool {
        self.flags() & 2 != 0
    }

    /// Bit 2 of the flags: a target's variant.
    pub fn variant(&self) -> bool {
        self.flags() & 4 != 0
    }

    /// Word `i` after the flag byte, zero-padded.
    pub fn word(&self, i: usize) -> u64 {
        let mut bytes = [0u8; 8];
        if let Some(chunk) = self.data.get(1 + 8 * i..) {
            for (b, d) in bytes.iter_mut().zip(chunk) {
                *b = *d;
            }
        }
        u64::from_le_bytes(bytes)
    }

    /// Word `i` in [0, 1).
    pub fn unit(&self, i: usize) -> f64 {
        (self.word(i) >> 11) as f64 / (1u64 << 53) as f64
    }

    /// Word `i` between `lo` and `hi`, uniform in its logarithm.
    pub fn log_uniform(&self, i: usize, lo: f64, hi: f64) -> f64 {
        (lo.ln() + self.unit(i) * (hi.ln() - lo.ln())).exp()
    }

    /// Word `i` between `lo` and `hi`, uniform.
    pub fn uniform(&self, i: usize, lo: f64, hi: f64) -> f64 {
        lo + self.unit(i) * (hi - lo)
    }

    /// Word `i` as the bits of an `f64`.
    pub fn bits(&self, i: usize) -> f64 {
        f64::from_bits(self.word(i))
    }
}

/// One valuation's inputs.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Case {
    /// Kind, strike, expiry.
    pub contract: Contract,
    /// Spot, rate, dividend yield.
    pub market: Market,
    /// Volatility.
    pub vol: f64,
}

impl Case {
    /// The case of words 0–5 (spot, strike, expiry, vol, rate, dividend yield).
    pub fn from_input(input: &Input<'_>) -> Case {
        let [spot, strike, expiry, vol, rate, dividend_yield] = if input.raw() {
            core::array::from_fn(|i| input.bits(i))
        } else {
            [
                input.log_uniform(0, 1e-8, 1e8),
                input.log_uniform(1, 1e-8, 1e8),
                input.log_uniform(2, 1e-6, 100.0),
                input.log_uniform(3, 1e-4, 10.0),
                input.uniform(4, -0.1, 0.5),
                input.uniform(5, 0.0, 0.4),
            ]
        };
        Case {
            contract: Contract {
                kind: input.kind(),
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
    }

    /// The same case with the other kind.
    #[must_use]
    pub fn with_kind(&self, kind: Kind) -> Case {
        let mut c = *self;
        c.contract.kind = kind;
        c
    }

    /// Inside the domain of the accuracy contract (README, "Accuracy contract").
    pub fn in_domain(&self) -> bool {
        let (m, c) = (&self.market, &self.contract);
        let positive = |x: f64| x.is_finite() && x > 0.0;
        positive(m.spot)
            && positive(c.strike)
            && (1.0 / 8766.0..=50.0).contains(&c.expiry)
            && (0.001..=5.0).contains(&self.vol)
            && (-0.05..=0.3).contains(&m.rate)
            && (0.0..=0.2).contains(&m.dividend_yield)
    }

    /// S·e^(−qT) and K·e^(−rT).
    pub fn legs(&self) -> (f64, f64) {
        let (m, c) = (&self.market, &self.contract);
        (
            m.spot * (-m.dividend_yield * c.expiry).exp(),
            c.strike * (-m.rate * c.expiry).exp(),
        )
    }

    /// The tolerance unit ε·L·(1 + a) of the module docs, at volatility `vol`.
    pub fn ulp_scale(&self, vol: f64) -> f64 {
        let (m, c) = (&self.market, &self.contract);
        let (s, k) = self.legs();
        let a = (m.rate.abs() + m.dividend_yield.abs()) * c.expiry + vol * c.expiry.sqrt();
        f64::EPSILON * (s + k) * (1.0 + a)
    }

    /// The upper bound of a European price: S·e^(−qT) for a call, K·e^(−rT) for a put.
    pub fn upper_bound(&self) -> f64 {
        let (s, k) = self.legs();
        match self.contract.kind {
            Kind::Call => s,
            Kind::Put => k,
        }
    }
}

/// `price`: finite and non-negative everywhere; in the domain, below its
/// upper bound and at parity with the other kind.
///
/// # Panics
/// When an invariant fails: that is the finding.
pub fn check_price(data: &[u8]) {
    let case = Case::from_input(&Input::new(data));
    let Ok(value) = calor::price(&case.contract, &case.market, case.vol) else {
        return;
    };
    assert!(
        value.is_finite() && value >= 0.0,
        "price {value} for {case:?}"
    );
    if !case.in_domain() {
        return;
    }
    let unit = case.ulp_scale(case.vol);
    let bound = case.upper_bound();
    assert!(
        value <= bound + BOUND_ULPS * unit,
        "price {value} above its bound {bound} for {case:?}"
    );
    let other = case.with_kind(match case.contract.kind {
        Kind::Call => Kind::Put,
        Kind::Put => Kind::Call,
    });
    let Ok(other_value) = calor::price(&other.contract, &other.market, other.vol) else {
        panic!("{case:?} priced but not its other kind");
    };
    let (call, put) = match case.contract.kind {
        Kind::Call => (value, other_value),
        Kind::Put => (other_value, value),
    };
    let (s, k) = case.legs();
    let residual = call - put - (s - k);
    assert!(
        residual.abs() <= PARITY_ULPS * unit,
        "parity off by {residual:e} (allowed {:e}) for {case:?}: call {call} put {put}",
        PARITY_ULPS * unit
    );
}

/// `greeks`: all fifteen finite, price non-negative, gamma and vega
/// non-negative, delta of the right sign; in the domain, the price agrees
/// with `price` and delta, gamma, vega with parity.
///
/// # Panics
/// When an invariant fails.
pub fn check_greeks(data: &[u8]) {
    let case = Case::from_input(&Input::new(data));
    let Ok(g) = calor::greeks(&case.contract, &case.market, case.vol) else {
        return;
    };
    for (name, value) in g.named() {
        assert!(value.is_finite(), "{name} {value} for {case:?}");
    }
    assert!(g.price >= 0.0, "price {} for {case:?}", g.price);
    assert!(g.gamma >= 0.0, "gamma {} for {case:?}", g.gamma);
    assert!(g.vega >= 0.0, "vega {} for {case:?}", g.vega);
    match case.contract.kind {
        Kind::Call => assert!(g.delta >= 0.0, "call delta {} for {case:?}", g.delta),
        Kind::Put => assert!(g.delta <= 0.0, "put delta {} for {case:?}", g.delta),
    }
    if !case.in_domain() {
        return;
    }
    let unit = case.ulp_scale(case.vol);
    let price = calor::price(&case.contract, &case.market, case.vol);
    assert!(
        price.is_ok_and(|p| (p - g.price).abs() <= 2.0 * BOUND_ULPS * unit),
        "greeks price {} against price {price:?} for {case:?}",
        g.price
    );
    // Delta parity Δc − Δp = e^(−qT), checked near the money only, where the
    // Greeks' condition numbers stay modest: |ln(F/K)| ≤ 5·σ√T.
    let (s, k) = case.legs();
    let sd = case.vol * case.contract.expiry.sqrt();
    if (s / k).ln().abs() > 5.0 * sd {
        return;
    }
    let other = case.with_kind(match case.contract.kind {
        Kind::Call => Kind::Put,
        Kind::Put => Kind::Call,
    });
    // The other kind may need a Greek beyond f64::MAX where this one does not
    // (a put's rho −T·K·e^(−rT)·Φ(−d2) with K near 1e307): that is the only
    // refusal allowed.
    let h = match calor::greeks(&other.contract, &other.market, other.vol) {
        Ok(h) => h,
        Err(calor::Error::Overflow) => return,
        Err(e) => panic!("{case:?} has Greeks but its other kind gets {e}"),
    };
    let (call, put) = match case.contract.kind {
        Kind::Call => (g, h),
        Kind::Put => (h, g),
    };
    let carry = s / case.market.spot;
    // 16·ε·(1+κ)·(|Δ| + V/S) with κ ≤ 1e3 near the money: 1e-10 per unit of (1 + L/S).
    let tol = 1e-10 * (1.0 + (s + k) / case.market.spot);
    let residual = call.delta - put.delta - carry;
    assert!(
        residual.abs() <= tol,
        "delta parity off by {residual:e} for {case:?}"
    );
    for (name, c, p) in [
        ("gamma", call.gamma, put.gamma),
        ("vega", call.vega, put.vega),
    ] {
        assert!(
            (c - p).abs() <= 1e-9 * c.abs().max(p.abs()) + f64::MIN_POSITIVE,
            "{name} differs between call {c} and put {p} for {case:?}"
        );
    }
}

/// `implied_vol`: an accepted premium gives a finite, non-negative vol; in
/// the domain, that vol reprices the premium within the tolerance of the
/// module docs. Variant bit: the premium is a fraction of the way between
/// the no-arbitrage bounds (word 6) instead of the price at word 3's vol.
///
/// # Panics
/// When an invariant fails.
pub fn check_implied_vol(data: &[u8]) {
    let input = Input::new(data);
    let case = Case::from_input(&input);
    let premium = if input.raw() {
        input.bits(6)
    } else if input.variant() {
        let (s, k) = case.legs();
        let (lower, upper) = match case.contract.kind {
            Kind::Call => ((s - k).max(0.0), s),
            Kind::Put => ((k - s).max(0.0), k),
        };
        lower + input.unit(6) * (upper - lower)
    } else {
        match calor::price(&case.contract, &case.market, case.vol) {
            Ok(p) => p,
            Err(_) => return,
        }
    };
    let Ok(vol) = calor::implied_vol(&case.contract, &case.market, premium) else {
        return;
    };
    assert!(
        vol.is_finite() && vol >= 0.0,
        "implied vol {vol} for premium {premium} and {case:?}"
    );
    let solved = Case { vol, ..case };
    if input.raw() || !case.in_domain() || !solved.in_domain() {
        return;
    }
    let Ok(repriced) = calor::price(&solved.contract, &solved.market, vol) else {
        panic!("implied vol {vol} does not price for {case:?}");
    };
    let tol = BOUND_ULPS * case.ulp_scale(vol.max(case.vol)) + 32.0 * f64::EPSILON * premium;
    assert!(
        (repriced - premium).abs() <= tol,
        "implied vol {vol} reprices {premium} as {repriced} (allowed {tol:e}) for {case:?}"
    );
}

/// The reference domain of the American grid's accuracy claim.
fn american_reference_domain(case: &Case) -> bool {
    let (m, c) = (&case.market, &case.contract);
    (0.8..=1.25).contains(&(m.spot / c.strike))
        && (0.1..=2.0).contains(&c.expiry)
        && (0.1..=0.6).contains(&case.vol)
        && (0.02..=0.08).contains(&m.rate)
        && (0.0..=0.03).contains(&m.dividend_yield)
}

/// `american_price` (and `grid_value` on the same grid): finite, at least
/// the intrinsic value, at most S (call) or K (put); on the grid's reference
/// domain, at least the European price, and equal to it for a call without
/// dividend yield. Mapped inputs centre on the reference domain.
///
/// # Panics
/// When an invariant fails.
pub fn check_american_price(data: &[u8]) {
    let input = Input::new(data);
    let case = if input.raw() {
        Case::from_input(&input)
    } else {
        let strike = input.log_uniform(1, 1e-3, 1e4);
        Case {
            contract: Contract {
                kind: input.kind(),
                strike,
                expiry: input.log_uniform(2, 0.01, 5.0),
            },
            market: Market {
                spot: strike * input.log_uniform(0, 0.2, 5.0),
                rate: input.uniform(4, -0.05, 0.3),
                dividend_yield: if input.variant() {
                    0.0
                } else {
                    input.uniform(5, 0.0, 0.2)
                },
            },
            vol: input.log_uniform(3, 0.02, 2.0),
        }
    };
    let (c, m) = (&case.contract, &case.market);
    let Ok(value) = calor::american_price(c, m, case.vol) else {
        return;
    };
    assert!(value.is_finite(), "american price {value} for {case:?}");
    let intrinsic = match c.kind {
        Kind::Call => (m.spot - c.strike).max(0.0),
        Kind::Put => (c.strike - m.spot).max(0.0),
    };
    assert!(
        value >= intrinsic,
        "american price {value} below intrinsic {intrinsic} for {case:?}"
    );
    // The most an American option can pay is the spot (call) or the strike
    // (put); with a negative rate (or yield) waiting to expiry can be worth that
    // amount grown at −r (or −q), which the holder may also choose.
    let t = c.expiry;
    let cap = match c.kind {
        Kind::Call => m.spot * (-m.dividend_yield * t).exp().max(1.0),
        Kind::Put => c.strike * (-m.rate * t).exp().max(1.0),
    };
    // The grid's accuracy on the strike's scale, or the rounding of the cap.
    let slack = (AMERICAN_TOLERANCE_PER_STRIKE * c.strike).max(16.0 * f64::EPSILON * cap);
    assert!(
        value <= cap + slack,
        "american price {value} above {cap} for {case:?}"
    );
    let mut workspace = vec![0.0; GridSpec::AMERICAN.workspace_len().unwrap_or(0)];
    let grid = calor::grid_value(c, m, case.vol, &GridSpec::AMERICAN, &mut workspace);
    assert!(
        grid.is_ok_and(|g| g.price == value && g.delta.is_finite() && g.gamma.is_finite()),
        "grid_value {grid:?} against american_price {value} for {case:?}"
    );
    if input.raw() || !american_reference_domain(&case) {
        return;
    }
    let Ok(european) = calor::price(c, m, case.vol) else {
        panic!("american price {value} but no european price for {case:?}");
    };
    assert!(
        value >= european - slack,
        "american {value} below european {european} for {case:?}"
    );
    if c.kind == Kind::Call && m.dividend_yield == 0.0 && m.rate >= 0.0 {
        assert!(
            (value - european).abs() <= slack,
            "american call {value} differs from european {european} without dividends for {case:?}"
        );
    }
}

/// One θ-scheme heat step: accepted schemes step without error on a grid of
/// 3 to 34 bounded values and stay finite; with a non-negative explicit
/// weight the step obeys the maximum principle, and for θ ≥ ½ with zero ends
/// it does not grow the l2 norm. Raw mode: any bits, no panic.
///
/// # Panics
/// When an invariant fails.
pub fn check_heat_step(data: &[u8]) {
    let input = Input::new(data);
    let nodes = 3 + usize::from(input.data.get(1).copied().unwrap_or(0) % 32);
    let (theta, kappa, dt, dx, left, right) = if input.raw() {
        (
            input.bits(1),
            input.bits(2),
            input.bits(3),
            input.bits(4),
            input.bits(5),
            input.bits(6),
        )
    } else {
        (
            input.unit(1),
            input.log_uniform(2, 1e-3, 1e3),
            input.log_uniform(3, 1e-6, 1.0),
            input.log_uniform(4, 1e-3, 1.0),
            input.uniform(5, -1.0, 1.0),
            input.uniform(6, -1.0, 1.0),
        )
    };
    let zero_ends = input.variant();
    let mut u: Vec<f64> = (0..nodes)
        .map(|j| {
            if input.raw() {
                input.bits(7 + j)
            } else {
                input.uniform(7 + j, -1.0, 1.0)
            }
        })
        .collect();
    let (left, right) = if zero_ends {
        if let Some(first) = u.first_mut() {
            *first = 0.0;
        }
        if let Some(last) = u.last_mut() {
            *last = 0.0;
        }
        (0.0, 0.0)
    } else {
        (left, right)
    };
    let Ok(scheme) = ThetaScheme::new(theta, kappa, dt, dx) else {
        return;
    };
    let old = u.clone();
    let mut scratch = vec![0.0; nodes];
    let stepped = scheme.step(&mut u, &mut scratch, left, right);
    if input.raw() {
        return;
    }
    assert_eq!(
        stepped,
        Ok(()),
        "step refused for {scheme:?}, {nodes} nodes"
    );
    assert!(
        u.iter().all(|x| x.is_finite()),
        "non-finite step {u:?} for {scheme:?}"
    );
    let mu = scheme.mesh_ratio();
    // Thomas elimination on this diagonally dominant matrix: forward error of
    // a few hundred ulps for up to 34 nodes (condition number ≤ 4·N²/π²).
    let tol = 1e-11;
    if 2.0 * (1.0 - scheme.theta()) * mu <= 1.0 {
        let before = old
            .iter()
            .fold(left.abs().max(right.abs()), |m, x| m.max(x.abs()));
        let after = u.iter().fold(0.0f64, |m, x| m.max(x.abs()));
        assert!(
            after <= before * (1.0 + tol),
            "maximum principle: {after} after {before} for {scheme:?}"
        );
    }
    if zero_ends && scheme.theta() >= 0.5 {
        let norm = |v: &[f64]| v.iter().map(|x| x * x).sum::<f64>().sqrt();
        let (before, after) = (norm(&old), norm(&u));
        assert!(
            after <= before * (1.0 + tol) + f64::MIN_POSITIVE,
            "l2 growth: {after} after {before} for {scheme:?}"
        );
    }
}

/// Bytes per option of [`check_kernel_batch`]: a flag byte and six words.
const BATCH_CASE_BYTES: usize = 1 + 8 * 6;
/// Options per [`check_kernel_batch`] input at most: two whole blocks of the
/// implied-vol batch's staged solver (16 premiums each) and part of a third,
/// so that its block edges are fuzzed too.
const BATCH_MAX_OPTIONS: usize = 40;

/// `kernel_batch`: the kernel's batch entry points (`price_batch`,
/// `price_delta_batch`, `greeks_batch`, `implied_vol_batch`) on up to
/// [`BATCH_MAX_OPTIONS`] options, each laid out as one [`check_price`] input of 49 bytes. Nothing is
/// lost: every element's status agrees with the scalar call on the same
/// inputs, the count returned is that of the `Ok` statuses, an `Ok` element is
/// finite, and its price is the scalar price within [`BOUND_ULPS`]. The
/// implied vols come from the batch's own prices (in raw mode, from the vol
/// words themselves) and equal the scalar solver's bit for bit. In the
/// variant, a vol slice one short is refused first. A slice of the wrong
/// length is refused, naming it, with nothing written.
///
/// # Panics
/// When an invariant fails: that is the finding.
pub fn check_kernel_batch(data: &[u8]) {
    let input = Input::new(data);
    let cases: Vec<Case> = data
        .chunks(BATCH_CASE_BYTES)
        .take(BATCH_MAX_OPTIONS)
        .map(|chunk| Case::from_input(&Input::new(chunk)))
        .collect();
    let n = cases.len();
    let kinds: Vec<Kind> = cases.iter().map(|c| c.contract.kind).collect();
    let column = |f: fn(&Case) -> f64| cases.iter().map(f).collect::<Vec<f64>>();
    let (spots, strikes, expiries) = (
        column(|c| c.market.spot),
        column(|c| c.contract.strike),
        column(|c| c.contract.expiry),
    );
    let (rates, dividend_yields, vols) = (
        column(|c| c.market.rate),
        column(|c| c.market.dividend_yield),
        column(|c| c.vol),
    );
    let options = calor::OptionBatch {
        kinds: &kinds,
        spots: &spots,
        strikes: &strikes,
        expiries: &expiries,
        rates: &rates,
        dividend_yields: &dividend_yields,
    };
    let mut prices = vec![f64::NAN; n];
    let mut deltas = vec![f64::NAN; n];
    let mut status = vec![Ok(()); n];
    if input.variant() && n > 0 {
        let short = vols.get(1..).unwrap_or_default();
        let refused = calor::price_batch(&options, short, &mut prices, &mut status);
        assert_eq!(
            refused,
            Err(calor::Error::LengthMismatch {
                field: calor::Field::Vol
            })
        );
        assert!(
            prices.iter().all(|p| p.is_nan()),
            "a refused batch wrote prices"
        );
    }
    let Ok(count) = calor::price_batch(&options, &vols, &mut prices, &mut status) else {
        panic!("price_batch refused slices of one length");
    };
    agree_with_scalar("price_batch", &cases, &prices, &status, count);
    let mut pair_prices = vec![f64::NAN; n];
    let mut pair_status = vec![Ok(()); n];
    let Ok(pair_count) = calor::price_delta_batch(
        &options,
        &vols,
        &mut pair_prices,
        &mut deltas,
        &mut pair_status,
    ) else {
        panic!("price_delta_batch refused slices of one length");
    };
    agree_with_scalar(
        "price_delta_batch",
        &cases,
        &pair_prices,
        &pair_status,
        pair_count,
    );
    for (i, (delta, st)) in deltas.iter().zip(&pair_status).enumerate() {
        assert!(
            st.is_err() || delta.is_finite(),
            "element {i}: delta {delta}"
        );
    }
    let mut greeks = vec![calor::Greeks::default(); n];
    let mut greek_status = vec![Ok(()); n];
    let Ok(greek_count) = calor::greeks_batch(&options, &vols, &mut greeks, &mut greek_status)
    else {
        panic!("greeks_batch refused slices of one length");
    };
    let greek_prices: Vec<f64> = greeks.iter().map(|g| g.price).collect();
    agree_with_scalar(
        "greeks_batch",
        &cases,
        &greek_prices,
        &greek_status,
        greek_count,
    );
    let premiums: Vec<f64> = if input.raw() {
        vols.clone()
    } else {
        prices.clone()
    };
    implied_agree_with_scalar(&options, &cases, &premiums);
}

/// `implied_vol_batch` on `premiums`: each element as the scalar solver,
/// status and value bit for bit, and the count that of the `Ok`s.
fn implied_agree_with_scalar(options: &calor::OptionBatch<'_>, cases: &[Case], premiums: &[f64]) {
    let n = cases.len();
    let mut implied = vec![f64::NAN; n];
    let mut implied_status = vec![Ok(()); n];
    let Ok(implied_count) =
        calor::implied_vol_batch(options, premiums, &mut implied, &mut implied_status)
    else {
        panic!("implied_vol_batch refused slices of one length");
    };
    let mut ok = 0;
    for (i, case) in cases.iter().enumerate() {
        let premium = premiums.get(i).copied().unwrap_or(f64::NAN);
        let scalar = calor::implied_vol(&case.contract, &case.market, premium);
        let (got, st) = (implied.get(i).copied(), implied_status.get(i).copied());
        match scalar {
            Ok(v) => {
                ok += 1;
                assert_eq!(
                    st,
                    Some(Ok(())),
                    "element {i}: batch refused, scalar gave {v}"
                );
                assert_eq!(got.map(f64::to_bits), Some(v.to_bits()), "element {i}");
            }
            Err(e) => assert_eq!(st, Some(Err(e)), "element {i}: statuses differ"),
        }
    }
    assert_eq!(implied_count, ok, "implied_vol_batch count");
}

/// Each element's status is the scalar call's on the same inputs (`price`
/// for `price_batch`; `greeks` for the batches that also give Greeks), `count`
/// the number of `Ok`s, an `Ok` price finite and (in the domain) within
/// [`BOUND_ULPS`] of the scalar one, a refused element NaN.
///
/// Where `greeks` overflows, `price_delta_batch` values the pair if price and
/// delta are in range and refuses it with the same overflow if not; the
/// public functions cannot tell the two apart, so either is accepted, and an
/// `Ok` is held to `price`.
fn agree_with_scalar(
    name: &str,
    cases: &[Case],
    prices: &[f64],
    status: &[calor::ElementStatus],
    count: usize,
) {
    let scalar = |c: &Case, st: Option<calor::ElementStatus>| {
        let price = || calor::price(&c.contract, &c.market, c.vol);
        match (name, calor::greeks(&c.contract, &c.market, c.vol), st) {
            ("price_batch", _, _)
            | ("price_delta_batch", Err(calor::Error::Overflow), Some(Ok(()))) => price(),
            (_, greeks, _) => greeks.map(|g| g.price),
        }
    };
    let mut ok = 0;
    for (i, case) in cases.iter().enumerate() {
        let got = prices.get(i).copied().unwrap_or(f64::NAN);
        let st = status.get(i).copied();
        match scalar(case, st) {
            Ok(want) => {
                ok += 1;
                assert_eq!(
                    st,
                    Some(Ok(())),
                    "{name} element {i}: refused, scalar {want} for {case:?}"
                );
                assert!(got.is_finite(), "{name} element {i}: {got} for {case:?}");
                let tol = BOUND_ULPS * case.ulp_scale(case.vol) + 4.0 * f64::EPSILON * want;
                assert!(
                    !case.in_domain() || (got - want).abs() <= tol,
                    "{name} element {i}: {got} against scalar {want} for {case:?}"
                );
            }
            Err(e) => {
                assert_eq!(
                    st,
                    Some(Err(e)),
                    "{name} element {i}: statuses differ for {case:?}"
                );
                assert!(got.is_nan(), "{name} element {i}: refused but wrote {got}");
            }
        }
    }
    assert_eq!(count, ok, "{name} count");
}

/// The batch's own record reader splits `data` into the same records as the
/// `csv` crate did (`first`, then `rows`).
fn check_reader_agrees(data: &[u8], first: &csv::ByteRecord, rows: &[csv::ByteRecord]) {
    let mut own = batch::read::RecordReader::new(data);
    let mut record = csv::ByteRecord::new();
    assert!(own.read_record(&mut record).unwrap_or(false));
    assert_eq!(
        record.iter().collect::<Vec<_>>(),
        first.iter().collect::<Vec<_>>()
    );
    for (i, row) in rows.iter().enumerate() {
        assert!(
            own.read_record(&mut record).unwrap_or(false),
            "row {i} missing"
        );
        assert_eq!(
            record.iter().collect::<Vec<_>>(),
            row.iter().collect::<Vec<_>>(),
            "row {i}"
        );
    }
    assert!(
        !own.read_record(&mut record).unwrap_or(true),
        "an extra row"
    );
}

/// The batch decoder and the whole in-memory batch on any bytes taken as a
/// CSV book: no panic; a refused header is the only early stop; otherwise
/// exactly one output row per input row, each as wide as the output header,
/// with status `ok` or `error: …`, and finite prices on `ok` rows; the JSON-lines
/// output agrees line by line.
///
/// # Panics
/// When an invariant fails.
pub fn check_batch_decode(data: &[u8]) {
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .from_reader(data);
    let mut records = reader.byte_records();
    let Some(Ok(first)) = records.next() else {
        return;
    };
    let Ok(header) = batch::decode::Header::new(&first) else {
        assert!(batch::run_bytes(data, Format::Csv).is_err());
        return;
    };
    let rows: Vec<csv::ByteRecord> = records.map_while(Result::ok).collect();
    check_reader_agrees(data, &first, &rows);
    for (i, row) in rows.iter().enumerate() {
        let line = row.position().map_or(0, csv::Position::line);
        if let Ok(decoded) = batch::decode::decode_row(&header, row, line) {
            let outcome = batch::value::value_row(&decoded, header.quote);
            for v in outcome.values.iter().flatten() {
                assert!(v.is_finite(), "row {i}: value {v} for {decoded:?}");
            }
        }
    }
    let (csv_out, summary) = match batch::run_bytes(data, Format::Csv) {
        Ok(done) => done,
        Err(e) => panic!("batch stopped on an accepted header: {e}"),
    };
    assert_eq!(summary.rows, rows.len() as u64);
    assert_eq!(summary.ok + summary.bad, summary.rows);
    let width = header.len() + 16 + usize::from(header.quote == batch::decode::Quote::Premium);
    let mut out = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .from_reader(csv_out.as_slice());
    let mut count = 0u64;
    let mut ok = 0u64;
    for (i, record) in out.byte_records().enumerate() {
        let record = match record {
            Ok(r) => r,
            Err(e) => panic!("output record {i} unreadable: {e}"),
        };
        assert_eq!(record.len(), width, "output record {i}: {record:?}");
        if i == 0 {
            continue;
        }
        count += 1;
        let status = record.get(width - 1).unwrap_or_default();
        assert!(
            status == b"ok" || status.starts_with(b"error: "),
            "row {i}: status {:?}",
            String::from_utf8_lossy(status)
        );
        if status == b"ok" {
            ok += 1;
            let price = record.get(header.len()).unwrap_or_default();
            let parsed = std::str::from_utf8(price)
                .ok()
                .and_then(|p| p.parse::<f64>().ok());
            assert!(
                parsed.is_some_and(f64::is_finite),
                "row {i}: ok with price {price:?}"
            );
        }
    }
    assert_eq!(count, summary.rows, "output rows against input rows");
    assert_eq!(ok, summary.ok);
    let (json_out, json_summary) = match batch::run_bytes(data, Format::Jsonl) {
        Ok(done) => done,
        Err(e) => panic!("jsonl batch stopped on an accepted header: {e}"),
    };
    assert_eq!(json_summary, summary);
    let mut lines = 0u64;
    for line in json_out.split(|b| *b == b'\n').filter(|l| !l.is_empty()) {
        lines += 1;
        let value: serde_json::Value = match serde_json::from_slice(line) {
            Ok(v) => v,
            Err(e) => panic!("jsonl line {lines} is not JSON ({e}): {line:?}"),
        };
        assert!(
            value.as_object().is_some_and(|o| o.len() == width),
            "jsonl line {lines}: {value}"
        );
    }
    assert_eq!(lines, summary.rows);
}

/// A fuzz check: panics on a finding.
pub type Check = fn(&[u8]);

/// Every check by target name, for the replay test and the fuzz crate.
pub const TARGETS: [(&str, Check); 7] = [
    ("price", check_price),
    ("greeks", check_greeks),
    ("implied_vol", check_implied_vol),
    ("american_price", check_american_price),
    ("heat_step", check_heat_step),
    ("batch_decode", check_batch_decode),
    ("kernel_batch", check_kernel_batch),
];
