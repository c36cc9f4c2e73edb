//! Many options at once: structure-of-arrays inputs, caller-provided outputs
//! and a status per element, so that one bad element never stops the batch.
//!
//! Prices and deltas take a vectorisable fast path ([`crate::vector`]) for
//! options in the central region of the normalised price: validated inputs of
//! moderate size with h + t ≥ −2, h − t ≥ −12 and t ≥ 0.05, and t ≥ 0.1
//! where h + t < −1 (h = −|ln(F/K)|/(σ√T), t = σ√T/2; there the scalar
//! path's series in t avoids the two Φ terms' cancellation). Every other
//! element (the wings,
//! near expiry, the limits, bad input) takes the scalar [`crate::price`] /
//! [`crate::greeks`] path. Which path an element takes
//! depends on its own inputs only, and the fast path is exact IEEE arithmetic
//! without data-dependent branches, so results are bit-for-bit the same
//! whatever the batch size, the element's position or the slices' alignment.
//!
//! Implied vols are solved in blocks of 16, stage by stage, each element's
//! result the scalar [`crate::implied_vol`]'s bit for bit.
//!
//! # Accuracy
//! The same contract as the scalar functions (tolerance entries `price` and
//! `greek`); the tests run the batch over the full reference tables.

use crate::contract::{Contract, Greeks, Kind, Market};
use crate::error::{Error, Field};
use crate::{black, implied, normal, vector};

/// The outcome of one element: `Ok(())` or the error that element got.
pub type ElementStatus = Result<(), Error>;

/// N options as parallel slices, one entry per option.
///
/// # Examples
/// ```
/// use calor::{price_batch, Kind, OptionBatch};
/// let batch = OptionBatch {
///     kinds: &[Kind::Call, Kind::Put],
///     spots: &[100.0, 100.0],
///     strikes: &[95.0, 105.0],
///     expiries: &[0.5, 0.5],
///     rates: &[0.03, 0.03],
///     dividend_yields: &[0.0, 0.0],
/// };
/// let (mut prices, mut status) = ([0.0; 2], [Ok(()); 2]);
/// let ok = price_batch(&batch, &[0.2, 0.2], &mut prices, &mut status)?;
/// assert_eq!(ok, 2);
/// # Ok::<(), calor::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct OptionBatch<'a> {
    /// Call or put.
    pub kinds: &'a [Kind],
    /// Spots.
    pub spots: &'a [f64],
    /// Strikes.
    pub strikes: &'a [f64],
    /// Expiries in years.
    pub expiries: &'a [f64],
    /// Rates.
    pub rates: &'a [f64],
    /// Dividend yields.
    pub dividend_yields: &'a [f64],
}

impl OptionBatch<'_> {
    /// The number of options (the length of `kinds`).
    pub fn len(&self) -> usize {
        self.kinds.len()
    }

    /// True for an empty batch.
    pub fn is_empty(&self) -> bool {
        self.kinds.is_empty()
    }

    /// Checks that every input slice has `len()` entries.
    fn check(&self) -> Result<usize, Error> {
        let n = self.len();
        same_len(self.spots.len(), n, Field::Spot)?;
        same_len(self.strikes.len(), n, Field::Strike)?;
        same_len(self.expiries.len(), n, Field::Expiry)?;
        same_len(self.rates.len(), n, Field::Rate)?;
        same_len(self.dividend_yields.len(), n, Field::DividendYield)?;
        Ok(n)
    }

    /// The i-th option, or `None` past the end.
    fn get(&self, i: usize) -> Option<(Contract, Market)> {
        Some((
            Contract {
                kind: *self.kinds.get(i)?,
                strike: *self.strikes.get(i)?,
                expiry: *self.expiries.get(i)?,
            },
            Market {
                spot: *self.spots.get(i)?,
                rate: *self.rates.get(i)?,
                dividend_yield: *self.dividend_yields.get(i)?,
            },
        ))
    }
}

fn same_len(len: usize, n: usize, field: Field) -> Result<(), Error> {
    if len == n {
        Ok(())
    } else {
        Err(Error::LengthMismatch { field })
    }
}

/// Prices of every option of the batch at the vols given.
///
/// Returns the number of elements valued; every other element has its error
/// in `status` and NaN in `prices`.
///
/// # Errors
/// [`Error::LengthMismatch`] naming the first slice whose length differs from
/// `options.kinds` (`Field::Output` and `Field::Status` for the outputs);
/// nothing is written then.
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn price_batch(
    options: &OptionBatch<'_>,
    vols: &[f64],
    prices: &mut [f64],
    status: &mut [ElementStatus],
) -> Result<usize, Error> {
    let n = options.check()?;
    same_len(vols.len(), n, Field::Vol)?;
    same_len(prices.len(), n, Field::Output)?;
    same_len(status.len(), n, Field::Status)?;
    fast_pass(options, vols, prices, None);
    Ok(finish(options, vols, prices, None, status))
}

/// Prices and deltas of every option of the batch, the pair a quoting loop
/// refreshes on every tick.
///
/// An element's status is that of [`crate::greeks`] on its inputs, except
/// that an option whose higher Greeks overflow (gamma and those after it,
/// at expiries far below an hour) still gets its price and delta: only
/// those two are range-checked. On the scalar path the price, and its
/// refusal, are those of [`crate::price`], bit for bit.
///
/// # Errors
/// As [`price_batch`], with `deltas` checked as `Field::Output` too.
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn price_delta_batch(
    options: &OptionBatch<'_>,
    vols: &[f64],
    prices: &mut [f64],
    deltas: &mut [f64],
    status: &mut [ElementStatus],
) -> Result<usize, Error> {
    let n = options.check()?;
    same_len(vols.len(), n, Field::Vol)?;
    same_len(prices.len(), n, Field::Output)?;
    same_len(deltas.len(), n, Field::Output)?;
    same_len(status.len(), n, Field::Status)?;
    fast_pass(options, vols, prices, Some(&mut *deltas));
    Ok(finish(options, vols, prices, Some(deltas), status))
}

/// All Greeks of every option of the batch (scalar path per element).
///
/// # Errors
/// As [`price_batch`].
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn greeks_batch(
    options: &OptionBatch<'_>,
    vols: &[f64],
    out: &mut [Greeks],
    status: &mut [ElementStatus],
) -> Result<usize, Error> {
    let n = options.check()?;
    same_len(vols.len(), n, Field::Vol)?;
    same_len(out.len(), n, Field::Output)?;
    same_len(status.len(), n, Field::Status)?;
    let mut ok = 0;
    for (i, ((slot, st), vol)) in out.iter_mut().zip(status.iter_mut()).zip(vols).enumerate() {
        let result = options.get(i).map_or(
            Err(Error::LengthMismatch { field: Field::Spot }),
            |(c, m)| crate::greeks(&c, &m, *vol),
        );
        match result {
            Ok(g) => {
                *slot = g;
                *st = Ok(());
                ok += 1;
            }
            Err(e) => {
                *slot = nan_greeks();
                *st = Err(e);
            }
        }
    }
    Ok(ok)
}

/// Implied volatilities of every option of the batch from its premium.
///
/// Each element's vol or error is [`crate::implied_vol`]'s, bit for bit. The
/// elements are solved in blocks of 16, stage by stage, so that the processor
/// overlaps their work (see the README for the measured gain).
///
/// # Errors
/// As [`price_batch`], with `premiums` checked as `Field::Premium`.
#[cfg_attr(feature = "no-panic", allow(unsafe_code), no_panic::no_panic)]
pub fn implied_vol_batch(
    options: &OptionBatch<'_>,
    premiums: &[f64],
    vols: &mut [f64],
    status: &mut [ElementStatus],
) -> Result<usize, Error> {
    let n = options.check()?;
    same_len(premiums.len(), n, Field::Premium)?;
    same_len(vols.len(), n, Field::Output)?;
    same_len(status.len(), n, Field::Status)?;
    let problems = premiums.iter().enumerate().map(|(i, premium)| {
        options
            .get(i)
            .map(|(c, m)| (c, m, *premium))
            .ok_or(Error::LengthMismatch { field: Field::Spot })
    });
    let mut slots = vols.iter_mut().zip(status.iter_mut());
    let mut ok = 0;
    implied::solve_in_blocks(problems, |result| {
        if let Some((slot, st)) = slots.next() {
            (*slot, *st) = match result {
                Ok(v) => {
                    ok += 1;
                    (v, Ok(()))
                }
                Err(e) => (f64::NAN, Err(e)),
            };
        }
    });
    Ok(ok)
}

fn nan_greeks() -> Greeks {
    let nan = f64::NAN;
    Greeks {
        price: nan,
        delta: nan,
        gamma: nan,
        vega: nan,
        theta: nan,
        rho: nan,
        dividend_rho: nan,
        vanna: nan,
        volga: nan,
        charm: nan,
        veta: nan,
        speed: nan,
        zomma: nan,
        color: nan,
        ultima: nan,
    }
}

/// The vectorisable pass: every element by the lane formula, NaN where the
/// element must take the scalar path.
fn fast_pass(
    options: &OptionBatch<'_>,
    vols: &[f64],
    prices: &mut [f64],
    deltas: Option<&mut [f64]>,
) {
    let inputs = options
        .kinds
        .iter()
        .zip(options.spots)
        .zip(options.strikes)
        .zip(options.expiries)
        .zip(options.rates)
        .zip(options.dividend_yields)
        .zip(vols);
    match deltas {
        Some(deltas) => {
            for ((((((((k, s), x), t), r), q), v), p), d) in
                inputs.zip(prices.iter_mut()).zip(deltas.iter_mut())
            {
                (*p, *d) = lane(*k, *s, *x, *t, *r, *q, *v);
            }
        }
        None => {
            for (((((((k, s), x), t), r), q), v), p) in inputs.zip(prices.iter_mut()) {
                *p = lane(*k, *s, *x, *t, *r, *q, *v).0;
            }
        }
    }
}

/// The scalar pass over the elements the fast pass left as NaN; fills `status`.
fn finish(
    options: &OptionBatch<'_>,
    vols: &[f64],
    prices: &mut [f64],
    mut deltas: Option<&mut [f64]>,
    status: &mut [ElementStatus],
) -> usize {
    let mut ok = 0;
    for (i, ((p, st), vol)) in prices
        .iter_mut()
        .zip(status.iter_mut())
        .zip(vols)
        .enumerate()
    {
        let delta = deltas.as_deref_mut().and_then(|d| d.get_mut(i));
        if !p.is_nan() {
            *st = Ok(());
            ok += 1;
            continue;
        }
        let Some((c, m)) = options.get(i) else {
            *st = Err(Error::LengthMismatch { field: Field::Spot });
            continue;
        };
        let result = match delta {
            Some(d) => crate::greeks::price_and_delta(&c, &m, *vol).map(|(price, delta)| {
                *d = delta;
                price
            }),
            None => crate::price(&c, &m, *vol),
        };
        match result {
            Ok(v) => {
                *p = v;
                *st = Ok(());
                ok += 1;
            }
            Err(e) => {
                *st = Err(e);
                if let Some(d) = deltas.as_deref_mut().and_then(|d| d.get_mut(i)) {
                    *d = f64::NAN;
                }
            }
        }
    }
    ok
}

/// Price and delta of one element by the lane formulas, or (NaN, NaN) when the
/// element lies outside the fast region. Straight-line code: every condition
/// is a select.
// Inlined so that the loops of `fast_pass` see the whole body and vectorise.
#[allow(clippy::too_many_arguments, clippy::inline_always)]
#[inline(always)]
fn lane(
    kind: Kind,
    spot: f64,
    strike: f64,
    expiry: f64,
    rate: f64,
    q: f64,
    vol: f64,
) -> (f64, f64) {
    let omega = if matches!(kind, Kind::Call) {
        1.0
    } else {
        -1.0
    };
    let moderate = |v: f64| v > 1e-150 && v < 1e150;
    let bounded = |v: f64| v > -10.0 && v < 10.0;
    let valid = moderate(spot)
        && moderate(strike)
        && expiry > 1e-12
        && expiry < 1e3
        && vol > 1e-12
        && vol < 1e3
        && bounded(rate)
        && bounded(q);
    let sqrt_t = vector::sqrt(expiry);
    let s = vol * sqrt_t;
    let (carry_q, err_q) = vector::two_product(-q, expiry);
    let (carry_r, err_r) = vector::two_product(rate, expiry);
    let (carry, err_sum) = normal::two_sum(carry_r, carry_q);
    let x = (vector::ln_ratio(spot, strike) + carry) + (err_sum + (err_r + err_q));
    // Where the scalar path takes x from the forward, so does this element.
    let forward_route = black::forward_route(x, carry);
    let dq = vector::exp(-q * expiry);
    let spot_leg = spot * dq;
    let strike_leg = strike * vector::exp(-rate * expiry);
    let call_otm = x <= 0.0;
    let (small, large) = if call_otm {
        (spot_leg, strike_leg)
    } else {
        (strike_leg, spot_leg)
    };
    let h = -(if x < 0.0 { -x } else { x }) / s;
    let t = 0.5 * s;
    // Near expiry the scalar path sums b from its series in t, where these two
    // Φ terms would cancel to about 1/t: those elements take it. (From t = 0.1
    // on, between h + t = −2 and −1, the scalar path takes erfcx for the
    // rounding of the Φ terms' arguments; the lanes keep the Φ terms there,
    // within the κ-scaled contract: sent to the scalar path, the benchmark's
    // wings took 11 % longer.)
    let central = h + t >= -2.0 && h - t >= -12.0 && !black::small_t::applies(h, t);
    let near = vector::norm_cdf(h + t);
    let far = vector::norm_cdf(h - t);
    let otm = (small * near - large * far).max(0.0);
    let itm = omega * x > 0.0;
    let price = otm + if itm { large - small } else { 0.0 };
    // Φ(ω·d1): the near or far term for the out-of-the-money option, the
    // complement of the other for the in-the-money one.
    let cdf = match (call_otm, itm) {
        (true, false) => near,
        (false, false) => far,
        (false, true) => 1.0 - far,
        (true, true) => 1.0 - near,
    };
    let delta = omega * dq * cdf;
    if valid && central && !forward_route {
        (price, delta)
    } else {
        (f64::NAN, f64::NAN)
    }
}
