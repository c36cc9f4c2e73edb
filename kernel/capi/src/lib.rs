//! The C ABI of calor: `extern "C"` functions over plain `#[repr(C)]` structs.
//!
//! Every function returns an `int32_t` status: [`CALOR_OK`] (0) or one of the
//! `CALOR_ERR_*` codes, one per kind of [`calor::Error`] plus the ABI's own
//! (bad pointer, bad kind, bad length, incomplete batch) and a catch-all for
//! error kinds added to the kernel later. [`calor_status_message`] turns a
//! code into a static NUL-terminated message. Results go to caller-owned out
//! pointers; nothing is allocated and no function can panic: every pointer is
//! checked for null and alignment and every length for range before use.
//!
//! The header is `include/calor.h`, written by hand and checked against this
//! file by `tests/header_sync.rs`.
//!
//! # Pointer contract
//! A non-null, aligned pointer must point to as many valid, initialised
//! elements as the call says (one, or `len`), readable or writable as its
//! constness says. An output array may be the same array as an input array
//! (in place): elements are read and written one at a time through raw
//! pointers, never borrowed as Rust slices.

// The one crate of the project that may use `unsafe` (the workspace denies
// it): dereferencing the caller's pointers needs it, and so does
// `#[no_mangle]`, which rustc's `unsafe_code` lint counts because two
// libraries exporting one symbol is undefined at link time (every exported
// name here carries the `calor_` prefix). Each unsafe block states why it is
// sound; the blocks live only in the four pointer helpers at the end.
#![allow(unsafe_code)]
#![deny(clippy::undocumented_unsafe_blocks)]
#![deny(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::panic,
    clippy::indexing_slicing
)]

use core::ffi::c_char;

use calor::{Contract, ElementStatus, Error, Field, Kind, Market, OptionBatch};

/// Success.
pub const CALOR_OK: i32 = 0;
/// An input is NaN or infinite (`calor::Error::NotFinite`).
pub const CALOR_ERR_NOT_FINITE: i32 = 1;
/// Spot or strike is not greater than zero (`calor::Error::NotPositive`).
pub const CALOR_ERR_NOT_POSITIVE: i32 = 2;
/// Expiry, vol or premium is negative (`calor::Error::Negative`).
pub const CALOR_ERR_NEGATIVE: i32 = 3;
/// Greeks at zero vol or expiry with the forward at the strike (`calor::Error::SingularAtStrike`).
pub const CALOR_ERR_SINGULAR_AT_STRIKE: i32 = 4;
/// Premium at or below the no-arbitrage lower bound (`calor::Error::PremiumBelowIntrinsic`).
pub const CALOR_ERR_PREMIUM_BELOW_INTRINSIC: i32 = 5;
/// Premium at or above the no-arbitrage upper bound (`calor::Error::PremiumAboveMaximum`).
pub const CALOR_ERR_PREMIUM_ABOVE_MAXIMUM: i32 = 6;
/// The result exceeds the range of a double (`calor::Error::Overflow`).
pub const CALOR_ERR_OVERFLOW: i32 = 7;
/// A grid parameter is out of range (`calor::Error::InvalidGrid`).
pub const CALOR_ERR_INVALID_GRID: i32 = 8;
/// An explicit scheme step would be unstable (`calor::Error::UnstableStep`).
pub const CALOR_ERR_UNSTABLE_STEP: i32 = 9;
/// Batch slices of different lengths (`calor::Error::LengthMismatch`); the C
/// batch functions take one length, so they never return it.
pub const CALOR_ERR_LENGTH_MISMATCH: i32 = 10;
/// A pointer argument is null or not aligned for its type.
pub const CALOR_ERR_BAD_POINTER: i32 = 100;
/// `CalorInputs::kind` is neither `CALOR_CALL` nor `CALOR_PUT`.
pub const CALOR_ERR_BAD_KIND: i32 = 101;
/// A batch length too large to address.
pub const CALOR_ERR_BAD_LENGTH: i32 = 102;
/// A batch ran, and at least one element failed: see its status array.
pub const CALOR_ERR_BATCH_INCOMPLETE: i32 = 103;
/// A kernel error this version of the C ABI does not know.
pub const CALOR_ERR_UNKNOWN: i32 = 255;

/// `CalorInputs::kind` of a call.
pub const CALOR_CALL: i32 = 0;
/// `CalorInputs::kind` of a put.
pub const CALOR_PUT: i32 = 1;

/// One European or American vanilla option and its market.
///
/// The fields of `calor::Contract` and `calor::Market`, with the kind as an
/// integer so that every bit pattern a C caller can write is a valid value.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CalorInputs {
    /// [`CALOR_CALL`] or [`CALOR_PUT`].
    pub kind: i32,
    /// Strike, in the currency of the spot.
    pub strike: f64,
    /// Time to expiry in years.
    pub expiry: f64,
    /// Price of the underlying today.
    pub spot: f64,
    /// Risk-free rate, continuously compounded, per year.
    pub rate: f64,
    /// Continuous dividend yield, per year.
    pub dividend_yield: f64,
}

/// The fifteen values of `calor::Greeks`, same names, same order, same conventions.
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct CalorGreeks {
    /// V.
    pub price: f64,
    /// ∂V/∂S.
    pub delta: f64,
    /// ∂²V/∂S².
    pub gamma: f64,
    /// ∂V/∂σ.
    pub vega: f64,
    /// ∂V/∂t, per year.
    pub theta: f64,
    /// ∂V/∂r.
    pub rho: f64,
    /// ∂V/∂q.
    pub dividend_rho: f64,
    /// ∂²V/∂S∂σ.
    pub vanna: f64,
    /// ∂²V/∂σ².
    pub volga: f64,
    /// ∂Δ/∂t.
    pub charm: f64,
    /// ∂vega/∂t.
    pub veta: f64,
    /// ∂Γ/∂S.
    pub speed: f64,
    /// ∂Γ/∂σ.
    pub zomma: f64,
    /// ∂Γ/∂t.
    pub color: f64,
    /// ∂³V/∂σ³.
    pub ultima: f64,
}

impl CalorGreeks {
    /// Every field NaN: what a failed element's Greeks read as.
    const FAILED: CalorGreeks = CalorGreeks {
        price: f64::NAN,
        delta: f64::NAN,
        gamma: f64::NAN,
        vega: f64::NAN,
        theta: f64::NAN,
        rho: f64::NAN,
        dividend_rho: f64::NAN,
        vanna: f64::NAN,
        volga: f64::NAN,
        charm: f64::NAN,
        veta: f64::NAN,
        speed: f64::NAN,
        zomma: f64::NAN,
        color: f64::NAN,
        ultima: f64::NAN,
    };
}

/// Price and delta of one option, the output of [`calor_price_delta_batch`].
#[repr(C)]
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct CalorPriceDelta {
    /// V.
    pub price: f64,
    /// ∂V/∂S.
    pub delta: f64,
}

impl CalorPriceDelta {
    /// Both NaN: a failed element.
    const FAILED: CalorPriceDelta = CalorPriceDelta {
        price: f64::NAN,
        delta: f64::NAN,
    };
}

impl From<calor::Greeks> for CalorGreeks {
    fn from(g: calor::Greeks) -> Self {
        CalorGreeks {
            price: g.price,
            delta: g.delta,
            gamma: g.gamma,
            vega: g.vega,
            theta: g.theta,
            rho: g.rho,
            dividend_rho: g.dividend_rho,
            vanna: g.vanna,
            volga: g.volga,
            charm: g.charm,
            veta: g.veta,
            speed: g.speed,
            zomma: g.zomma,
            color: g.color,
            ultima: g.ultima,
        }
    }
}

/// The status code of a kernel error; kinds added to the kernel later map to
/// [`CALOR_ERR_UNKNOWN`] until this table learns them.
pub fn error_code(error: Error) -> i32 {
    match error {
        Error::NotFinite { .. } => CALOR_ERR_NOT_FINITE,
        Error::NotPositive { .. } => CALOR_ERR_NOT_POSITIVE,
        Error::Negative { .. } => CALOR_ERR_NEGATIVE,
        Error::SingularAtStrike => CALOR_ERR_SINGULAR_AT_STRIKE,
        Error::PremiumBelowIntrinsic => CALOR_ERR_PREMIUM_BELOW_INTRINSIC,
        Error::PremiumAboveMaximum => CALOR_ERR_PREMIUM_ABOVE_MAXIMUM,
        Error::Overflow => CALOR_ERR_OVERFLOW,
        Error::InvalidGrid { .. } => CALOR_ERR_INVALID_GRID,
        Error::UnstableStep => CALOR_ERR_UNSTABLE_STEP,
        Error::LengthMismatch { .. } => CALOR_ERR_LENGTH_MISMATCH,
        _ => CALOR_ERR_UNKNOWN,
    }
}

/// A static, NUL-terminated English message for a status code; unknown codes
/// get a message saying so. Never null; the caller must not free it.
#[no_mangle]
pub extern "C" fn calor_status_message(code: i32) -> *const c_char {
    let message = match code {
        CALOR_OK => c"ok",
        CALOR_ERR_NOT_FINITE => c"an input is NaN or infinite",
        CALOR_ERR_NOT_POSITIVE => c"spot and strike must be greater than zero",
        CALOR_ERR_NEGATIVE => c"expiry, vol and premium must not be negative",
        CALOR_ERR_SINGULAR_AT_STRIKE => {
            c"Greeks diverge at zero volatility or expiry with the forward at the strike"
        }
        CALOR_ERR_PREMIUM_BELOW_INTRINSIC => {
            c"premium at or below the discounted intrinsic value of the forward"
        }
        CALOR_ERR_PREMIUM_ABOVE_MAXIMUM => {
            c"premium at or above the no-arbitrage maximum of the option"
        }
        CALOR_ERR_OVERFLOW => c"result exceeds the range of double",
        CALOR_ERR_INVALID_GRID => c"a grid parameter is out of range",
        CALOR_ERR_UNSTABLE_STEP => c"the explicit scheme is unstable for this mesh ratio",
        CALOR_ERR_LENGTH_MISMATCH => c"batch slices of different lengths",
        CALOR_ERR_BAD_POINTER => c"a pointer argument is null or misaligned",
        CALOR_ERR_BAD_KIND => c"kind must be CALOR_CALL (0) or CALOR_PUT (1)",
        CALOR_ERR_BAD_LENGTH => c"batch length too large to address",
        CALOR_ERR_BATCH_INCOMPLETE => c"at least one batch element failed; see its status",
        CALOR_ERR_UNKNOWN => c"a kernel error this version of the C ABI does not know",
        _ => c"not a calor status code",
    };
    message.as_ptr()
}

/// Prices a European option: writes `*price`.
///
/// On a kernel error `*price` is NaN; on a bad pointer nothing is written.
#[no_mangle]
pub extern "C" fn calor_price(inputs: *const CalorInputs, vol: f64, price: *mut f64) -> i32 {
    scalar(inputs, vol, price, f64::NAN, calor::price)
}

/// All fifteen Greeks of a European option: writes `*greeks`.
///
/// On a kernel error every field is NaN; on a bad pointer nothing is written.
#[no_mangle]
pub extern "C" fn calor_greeks(
    inputs: *const CalorInputs,
    vol: f64,
    greeks: *mut CalorGreeks,
) -> i32 {
    scalar(inputs, vol, greeks, CalorGreeks::FAILED, |c, m, v| {
        calor::greeks(c, m, v).map(CalorGreeks::from)
    })
}

/// The implied volatility of a European option's premium: writes `*vol`.
///
/// On a kernel error `*vol` is NaN; on a bad pointer nothing is written.
#[no_mangle]
pub extern "C" fn calor_implied_vol(
    inputs: *const CalorInputs,
    premium: f64,
    vol: *mut f64,
) -> i32 {
    scalar(inputs, premium, vol, f64::NAN, calor::implied_vol)
}

/// The American price on the kernel's default grid: writes `*price`.
///
/// Uses about 12 KB of stack (the grid's workspace). On a kernel error
/// `*price` is NaN; on a bad pointer nothing is written.
#[no_mangle]
pub extern "C" fn calor_american_price(
    inputs: *const CalorInputs,
    vol: f64,
    price: *mut f64,
) -> i32 {
    scalar(inputs, vol, price, f64::NAN, calor::american_price)
}

/// Prices `len` European options: `prices[i]` from `inputs[i]` and `vols[i]`,
/// with `statuses[i]` its status (wraps `calor::price_batch`).
///
/// Returns [`CALOR_OK`] when every element succeeded,
/// [`CALOR_ERR_BATCH_INCOMPLETE`] when at least one failed (its price is
/// NaN), or a pointer or length error, in which case nothing is written.
/// With `len` = 0 the pointers may be null.
#[no_mangle]
pub extern "C" fn calor_price_batch(
    inputs: *const CalorInputs,
    vols: *const f64,
    len: usize,
    prices: *mut f64,
    statuses: *mut i32,
) -> i32 {
    batch(
        inputs,
        vols,
        len,
        prices,
        statuses,
        f64::NAN,
        calor::price_batch,
    )
}

/// Prices and deltas of `len` European options, the pair a quoting loop
/// refreshes on every tick (wraps `calor::price_delta_batch`).
///
/// Returns as [`calor_price_batch`]; a failed element's pair is NaN.
#[no_mangle]
pub extern "C" fn calor_price_delta_batch(
    inputs: *const CalorInputs,
    vols: *const f64,
    len: usize,
    out: *mut CalorPriceDelta,
    statuses: *mut i32,
) -> i32 {
    batch(
        inputs,
        vols,
        len,
        out,
        statuses,
        CalorPriceDelta::FAILED,
        |options, vols, out, status| {
            let (mut prices, mut deltas) = ([f64::NAN; CHUNK], [f64::NAN; CHUNK]);
            let n = out.len();
            let (Some(prices), Some(deltas)) = (prices.get_mut(..n), deltas.get_mut(..n)) else {
                return Err(Error::LengthMismatch {
                    field: Field::Output,
                });
            };
            let valued = calor::price_delta_batch(options, vols, prices, deltas, status)?;
            for ((slot, &price), &delta) in out.iter_mut().zip(&*prices).zip(&*deltas) {
                *slot = CalorPriceDelta { price, delta };
            }
            Ok(valued)
        },
    )
}

/// The Greeks of `len` European options: `greeks[i]` from `inputs[i]` and
/// `vols[i]`, with `statuses[i]` its status (wraps `calor::greeks_batch`).
///
/// Returns as [`calor_price_batch`]; a failed element's Greeks are all NaN.
#[no_mangle]
pub extern "C" fn calor_greeks_batch(
    inputs: *const CalorInputs,
    vols: *const f64,
    len: usize,
    greeks: *mut CalorGreeks,
    statuses: *mut i32,
) -> i32 {
    batch(
        inputs,
        vols,
        len,
        greeks,
        statuses,
        CalorGreeks::FAILED,
        |options, vols, out, status| {
            let mut kernel = [calor::Greeks::default(); CHUNK];
            let Some(kernel) = kernel.get_mut(..out.len()) else {
                return Err(Error::LengthMismatch {
                    field: Field::Output,
                });
            };
            let valued = calor::greeks_batch(options, vols, kernel, status)?;
            for (slot, g) in out.iter_mut().zip(&*kernel) {
                *slot = CalorGreeks::from(*g);
            }
            Ok(valued)
        },
    )
}

/// The implied volatilities of `len` premiums: `vols[i]` from `inputs[i]` and
/// `premiums[i]`, with `statuses[i]` its status (wraps `calor::implied_vol_batch`).
///
/// Returns as [`calor_price_batch`]; a failed element's vol is NaN.
#[no_mangle]
pub extern "C" fn calor_implied_vol_batch(
    inputs: *const CalorInputs,
    premiums: *const f64,
    len: usize,
    vols: *mut f64,
    statuses: *mut i32,
) -> i32 {
    batch(
        inputs,
        premiums,
        len,
        vols,
        statuses,
        f64::NAN,
        calor::implied_vol_batch,
    )
}

/// The kernel's contract and market for C inputs.
fn kernel_inputs(inputs: &CalorInputs) -> Result<(Contract, Market), i32> {
    let kind = match inputs.kind {
        CALOR_CALL => Kind::Call,
        CALOR_PUT => Kind::Put,
        _ => return Err(CALOR_ERR_BAD_KIND),
    };
    let contract = Contract {
        kind,
        strike: inputs.strike,
        expiry: inputs.expiry,
    };
    let market = Market {
        spot: inputs.spot,
        rate: inputs.rate,
        dividend_yield: inputs.dividend_yield,
    };
    Ok((contract, market))
}

/// One element: the kernel function `f` on `inputs` and the scalar argument.
fn evaluate<O>(
    inputs: &CalorInputs,
    argument: f64,
    f: &impl Fn(&Contract, &Market, f64) -> Result<O, Error>,
) -> Result<O, i32> {
    let (contract, market) = kernel_inputs(inputs)?;
    f(&contract, &market, argument).map_err(error_code)
}

/// A scalar entry point: checks both pointers, then evaluates and writes the
/// result, or `failed` on an error of the inputs.
fn scalar<O: Copy>(
    inputs: *const CalorInputs,
    argument: f64,
    out: *mut O,
    failed: O,
    f: impl Fn(&Contract, &Market, f64) -> Result<O, Error>,
) -> i32 {
    if !usable(inputs) || !usable(out) {
        return CALOR_ERR_BAD_POINTER;
    }
    let inputs = read_at(inputs, 0);
    let (value, status) = match evaluate(&inputs, argument, &f) {
        Ok(value) => (value, CALOR_OK),
        Err(code) => (failed, code),
    };
    write_at(out, 0, value);
    status
}

/// Elements per call of a kernel batch function: the C arrays are copied in
/// chunks of this size into the kernel's structure-of-arrays form on the
/// stack (about 6 KB for the Greeks), so nothing is allocated, the kernel's
/// vectorised path still runs, and an output array may alias an input.
const CHUNK: usize = 32;

/// One chunk of a batch in the kernel's form.
struct Chunk {
    kinds: [Kind; CHUNK],
    spots: [f64; CHUNK],
    strikes: [f64; CHUNK],
    expiries: [f64; CHUNK],
    rates: [f64; CHUNK],
    dividend_yields: [f64; CHUNK],
    arguments: [f64; CHUNK],
    /// `CALOR_ERR_BAD_KIND` for an element whose kind was neither call nor put
    /// (valued as a call, then overruled).
    bad_kind: [bool; CHUNK],
}

/// The body of every `*_batch` entry point: checks the pointers and the
/// length, then runs `kernel` (a `calor::*_batch` function, or an adapter to
/// one) chunk by chunk and writes outputs and statuses back. A new batch
/// entry point is one call of this.
fn batch<O: Copy>(
    inputs: *const CalorInputs,
    arguments: *const f64,
    len: usize,
    out: *mut O,
    statuses: *mut i32,
    failed: O,
    kernel: impl Fn(&OptionBatch<'_>, &[f64], &mut [O], &mut [ElementStatus]) -> Result<usize, Error>,
) -> i32 {
    if len == 0 {
        return CALOR_OK;
    }
    if !usable(inputs) || !usable(arguments) || !usable(out) || !usable(statuses) {
        return CALOR_ERR_BAD_POINTER;
    }
    if !addressable::<CalorInputs>(len) || !addressable::<O>(len) {
        return CALOR_ERR_BAD_LENGTH;
    }
    let mut all_ok = true;
    let mut start = 0;
    while start < len {
        let n = CHUNK.min(len - start);
        let mut chunk = Chunk {
            kinds: [Kind::Call; CHUNK],
            spots: [0.0; CHUNK],
            strikes: [0.0; CHUNK],
            expiries: [0.0; CHUNK],
            rates: [0.0; CHUNK],
            dividend_yields: [0.0; CHUNK],
            arguments: [0.0; CHUNK],
            bad_kind: [false; CHUNK],
        };
        for j in 0..n {
            let row = read_at(inputs, start + j);
            let kind = match row.kind {
                CALOR_CALL => Some(Kind::Call),
                CALOR_PUT => Some(Kind::Put),
                _ => None,
            };
            let fields = [
                (&mut chunk.spots, row.spot),
                (&mut chunk.strikes, row.strike),
                (&mut chunk.expiries, row.expiry),
                (&mut chunk.rates, row.rate),
                (&mut chunk.dividend_yields, row.dividend_yield),
                (&mut chunk.arguments, read_at(arguments, start + j)),
            ];
            for (array, value) in fields {
                if let Some(slot) = array.get_mut(j) {
                    *slot = value;
                }
            }
            if let (Some(k), Some(bad)) = (chunk.kinds.get_mut(j), chunk.bad_kind.get_mut(j)) {
                *k = kind.unwrap_or(Kind::Call);
                *bad = kind.is_none();
            }
        }
        let mut values = [failed; CHUNK];
        let mut status: [ElementStatus; CHUNK] = [Ok(()); CHUNK];
        let outcome = run_chunk(&chunk, n, &kernel, &mut values, &mut status);
        for j in 0..n {
            let code = match (outcome, chunk.bad_kind.get(j), status.get(j)) {
                (Err(code), _, _) => code,
                (Ok(()), Some(true), _) => CALOR_ERR_BAD_KIND,
                (Ok(()), _, Some(Ok(()))) => CALOR_OK,
                (Ok(()), _, Some(Err(e))) => error_code(*e),
                (Ok(()), _, None) => CALOR_ERR_UNKNOWN,
            };
            all_ok &= code == CALOR_OK;
            let value = match values.get(j) {
                Some(value) if code == CALOR_OK => *value,
                _ => failed,
            };
            write_at(out, start + j, value);
            write_at(statuses, start + j, code);
        }
        start += n;
    }
    if all_ok {
        CALOR_OK
    } else {
        CALOR_ERR_BATCH_INCOMPLETE
    }
}

/// Runs `kernel` on the first `n` elements of a chunk.
fn run_chunk<O>(
    chunk: &Chunk,
    n: usize,
    kernel: &impl Fn(&OptionBatch<'_>, &[f64], &mut [O], &mut [ElementStatus]) -> Result<usize, Error>,
    values: &mut [O; CHUNK],
    status: &mut [ElementStatus; CHUNK],
) -> Result<(), i32> {
    let (Some(kinds), Some(spots), Some(strikes), Some(expiries), Some(rates)) = (
        chunk.kinds.get(..n),
        head(n, &chunk.spots),
        head(n, &chunk.strikes),
        head(n, &chunk.expiries),
        head(n, &chunk.rates),
    ) else {
        return Err(CALOR_ERR_BAD_LENGTH);
    };
    let (Some(dividend_yields), Some(arguments), Some(values), Some(status)) = (
        head(n, &chunk.dividend_yields),
        head(n, &chunk.arguments),
        values.get_mut(..n),
        status.get_mut(..n),
    ) else {
        return Err(CALOR_ERR_BAD_LENGTH);
    };
    let options = OptionBatch {
        kinds,
        spots,
        strikes,
        expiries,
        rates,
        dividend_yields,
    };
    kernel(&options, arguments, values, status)
        .map(|_| ())
        .map_err(error_code)
}

/// The first `n` entries of a chunk's array.
fn head(n: usize, array: &[f64; CHUNK]) -> Option<&[f64]> {
    array.get(..n)
}

/// True for a non-null pointer aligned for `T`.
fn usable<T>(ptr: *const T) -> bool {
    !ptr.is_null() && ptr.is_aligned()
}

/// True when `len` elements of `T` span at most `isize::MAX` bytes, the limit
/// of pointer offsets. Checking the inputs and the output covers the `f64`
/// and `i32` arrays of a batch too: their elements are no larger.
fn addressable<T>(len: usize) -> bool {
    len.checked_mul(size_of::<T>())
        .is_some_and(|bytes| isize::try_from(bytes).is_ok())
}

/// Copies element `i` out of a C array.
fn read_at<T: Copy>(ptr: *const T, i: usize) -> T {
    // SAFETY: callers pass a pointer that `usable` accepted and an index below
    // a length `addressable` accepted (or 0), and the pointer contract in the
    // crate documentation says the array holds that many valid elements. Every
    // bit pattern is a valid `CalorInputs`, `f64` or `i32`; `read` copies
    // without creating a reference, so an output array may alias it.
    unsafe { ptr.add(i).read() }
}

/// Writes element `i` of a C array.
fn write_at<T>(ptr: *mut T, i: usize, value: T) {
    // SAFETY: as in `read_at`, for a writable array; the element types are
    // plain data without drop glue, so overwriting needs no read first.
    unsafe { ptr.add(i).write(value) }
}

#[cfg(test)]
// Tests pass Rust references where C would pass pointers, and build one
// misaligned pointer on purpose.
#[allow(
    clippy::unwrap_used,
    clippy::borrow_as_ptr,
    clippy::cast_ptr_alignment,
    clippy::indexing_slicing
)]
mod tests {
    use super::*;
    use calor::GridParameter;

    #[test]
    fn status_every_kernel_error_has_its_own_code() {
        let errors = [
            Error::NotFinite { field: Field::Spot },
            Error::NotPositive {
                field: Field::Strike,
            },
            Error::Negative { field: Field::Vol },
            Error::SingularAtStrike,
            Error::PremiumBelowIntrinsic,
            Error::PremiumAboveMaximum,
            Error::Overflow,
            Error::InvalidGrid {
                parameter: GridParameter::Nodes,
            },
            Error::UnstableStep,
            Error::LengthMismatch { field: Field::Vol },
        ];
        let codes = errors.map(error_code);
        for (i, a) in codes.iter().enumerate() {
            assert_ne!(*a, CALOR_ERR_UNKNOWN, "{:?}", errors.get(i));
            assert_eq!(codes.iter().filter(|b| *b == a).count(), 1);
        }
    }

    #[test]
    fn status_messages_are_distinct_and_static() {
        let codes = [
            CALOR_OK,
            CALOR_ERR_NOT_FINITE,
            CALOR_ERR_NOT_POSITIVE,
            CALOR_ERR_NEGATIVE,
            CALOR_ERR_SINGULAR_AT_STRIKE,
            CALOR_ERR_PREMIUM_BELOW_INTRINSIC,
            CALOR_ERR_PREMIUM_ABOVE_MAXIMUM,
            CALOR_ERR_OVERFLOW,
            CALOR_ERR_INVALID_GRID,
            CALOR_ERR_UNSTABLE_STEP,
            CALOR_ERR_LENGTH_MISMATCH,
            CALOR_ERR_BAD_POINTER,
            CALOR_ERR_BAD_KIND,
            CALOR_ERR_BAD_LENGTH,
            CALOR_ERR_BATCH_INCOMPLETE,
            CALOR_ERR_UNKNOWN,
            -1,
        ];
        let messages = codes.map(|c| {
            let ptr = calor_status_message(c);
            assert!(!ptr.is_null());
            // SAFETY: the function returns a pointer to a static C string literal.
            unsafe { core::ffi::CStr::from_ptr(ptr) }
        });
        for (i, a) in messages.iter().enumerate() {
            assert!(!a.is_empty());
            assert_eq!(messages.iter().filter(|b| *b == a).count(), 1, "{i}");
        }
    }

    fn ngx_put() -> CalorInputs {
        CalorInputs {
            kind: CALOR_PUT,
            strike: 40.0,
            expiry: 0.5,
            spot: 42.0,
            rate: 0.1,
            dividend_yield: 0.0,
        }
    }

    #[test]
    fn abi_scalar_matches_kernel_and_checks_pointers() {
        let inputs = ngx_put();
        let (c, m) = kernel_inputs(&inputs).unwrap();
        let mut v = 0.0;
        assert_eq!(calor_price(&inputs, 0.2, &mut v), CALOR_OK);
        assert_eq!(Ok(v), calor::price(&c, &m, 0.2));
        let mut g = CalorGreeks::default();
        assert_eq!(calor_greeks(&inputs, 0.2, &mut g), CALOR_OK);
        assert_eq!(g.price, v);
        let mut iv = 0.0;
        assert_eq!(calor_implied_vol(&inputs, v, &mut iv), CALOR_OK);
        assert!((iv - 0.2).abs() < 1e-12);
        assert_eq!(
            calor_price(core::ptr::null(), 0.2, &mut v),
            CALOR_ERR_BAD_POINTER
        );
        assert_eq!(
            calor_price(&inputs, 0.2, core::ptr::null_mut()),
            CALOR_ERR_BAD_POINTER
        );
        let misaligned = (&raw mut v).cast::<u8>().wrapping_add(1).cast::<f64>();
        assert_eq!(calor_price(&inputs, 0.2, misaligned), CALOR_ERR_BAD_POINTER);
        let bad = CalorInputs { kind: 7, ..inputs };
        assert_eq!(calor_price(&bad, 0.2, &mut v), CALOR_ERR_BAD_KIND);
        assert!(v.is_nan());
        assert_eq!(calor_price(&inputs, -0.2, &mut v), CALOR_ERR_NEGATIVE);
    }

    #[test]
    fn abi_batch_statuses_in_place_and_lengths() {
        let rows = [
            ngx_put(),
            CalorInputs {
                spot: -1.0,
                ..ngx_put()
            },
        ];
        let mut values = [0.2, 0.3];
        let mut statuses = [-1; 2];
        // In place: the vols array receives the prices.
        let status = calor_price_batch(
            rows.as_ptr(),
            values.as_ptr(),
            2,
            values.as_mut_ptr(),
            statuses.as_mut_ptr(),
        );
        assert_eq!(status, CALOR_ERR_BATCH_INCOMPLETE, "{statuses:?}");
        assert_eq!(statuses, [CALOR_OK, CALOR_ERR_NOT_POSITIVE]);
        let mut one = 0.0;
        assert_eq!(calor_price(&ngx_put(), 0.2, &mut one), CALOR_OK);
        // The kernel's vectorised batch path agrees with the scalar one to rounding.
        assert!((values[0] - one).abs() <= 1e-14 * one);
        assert!(values.get(1).is_some_and(|v| v.is_nan()));
        // Several chunks, one bad kind: every element agrees with the scalar path.
        let mut rows = [ngx_put(); 3 * CHUNK + 5];
        for (i, row) in rows.iter_mut().enumerate() {
            row.strike = 20.0 + i as f64;
            row.kind = if i % 2 == 0 { CALOR_CALL } else { CALOR_PUT };
        }
        rows[40].kind = 9;
        let vols = [0.25; 3 * CHUNK + 5];
        let mut greeks = [CalorGreeks::default(); 3 * CHUNK + 5];
        let mut statuses = [-1; 3 * CHUNK + 5];
        let status = calor_greeks_batch(
            rows.as_ptr(),
            vols.as_ptr(),
            rows.len(),
            greeks.as_mut_ptr(),
            statuses.as_mut_ptr(),
        );
        assert_eq!(status, CALOR_ERR_BATCH_INCOMPLETE);
        for ((row, g), st) in rows.iter().zip(&greeks).zip(&statuses) {
            let mut one = CalorGreeks::default();
            assert_eq!(*st, calor_greeks(row, 0.25, &mut one));
            assert_eq!(g.delta.to_bits(), one.delta.to_bits());
        }
        assert_eq!(statuses[40], CALOR_ERR_BAD_KIND);
        let mut pairs = [CalorPriceDelta::default(); 3 * CHUNK + 5];
        calor_price_delta_batch(
            rows.as_ptr(),
            vols.as_ptr(),
            rows.len(),
            pairs.as_mut_ptr(),
            statuses.as_mut_ptr(),
        );
        for (pair, g) in pairs
            .iter()
            .zip(&greeks)
            .filter(|(_, g)| g.price.is_finite())
        {
            assert!((pair.price - g.price).abs() <= 1e-13 * g.price.max(1.0));
            assert!((pair.delta - g.delta).abs() <= 1e-13);
        }
        let null = core::ptr::null_mut::<f64>();
        assert_eq!(
            calor_price_batch(core::ptr::null(), null, 0, null, core::ptr::null_mut()),
            CALOR_OK
        );
        assert_eq!(
            calor_price_batch(rows.as_ptr(), null, 2, null, statuses.as_mut_ptr()),
            CALOR_ERR_BAD_POINTER
        );
        assert_eq!(
            calor_price_batch(
                rows.as_ptr(),
                values.as_ptr(),
                usize::MAX,
                values.as_mut_ptr(),
                statuses.as_mut_ptr()
            ),
            CALOR_ERR_BAD_LENGTH
        );
    }
}
