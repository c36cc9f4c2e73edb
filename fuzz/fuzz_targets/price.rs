//! Fuzz target: any bytes become a valuation; the kernel must never panic, and
//! whatever it accepts must come back finite with a non-negative price.
//!
//! Layout of the input (missing bytes read as zero):
//! - byte 0: bit 0 = put, bit 1 = raw mode;
//! - then six little-endian u64 words: spot, strike, expiry, vol, rate,
//!   dividend yield.
//!
//! In raw mode each word is taken as the bits of an f64 (NaN, ±∞, subnormals,
//! huge magnitudes: the error paths). Otherwise each word is mapped into a
//! range around the documented domain, wide enough to cross its edges.
#![no_main]

use calor::{Contract, Kind, Market};
use libfuzzer_sys::fuzz_target;

/// Word `i` of the input after the flag byte, zero-padded.
fn word(data: &[u8], i: usize) -> u64 {
    let mut bytes = [0u8; 8];
    let start = 1 + 8 * i;
    if let Some(chunk) = data.get(start..) {
        for (b, d) in bytes.iter_mut().zip(chunk) {
            *b = *d;
        }
    }
    u64::from_le_bytes(bytes)
}

/// A word as a number in [0, 1).
fn unit(w: u64) -> f64 {
    (w >> 11) as f64 / (1u64 << 53) as f64
}

/// A word as a number between `lo` and `hi`, uniform in its logarithm.
fn log_uniform(w: u64, lo: f64, hi: f64) -> f64 {
    (lo.ln() + unit(w) * (hi.ln() - lo.ln())).exp()
}

/// A word as a number between `lo` and `hi`, uniform.
fn uniform(w: u64, lo: f64, hi: f64) -> f64 {
    lo + unit(w) * (hi - lo)
}

fuzz_target!(|data: &[u8]| {
    let flags = data.first().copied().unwrap_or(0);
    let kind = if flags & 1 == 0 {
        Kind::Call
    } else {
        Kind::Put
    };
    let w: [u64; 6] = core::array::from_fn(|i| word(data, i));
    let [spot, strike, expiry, vol, rate, dividend_yield] = if flags & 2 != 0 {
        w.map(f64::from_bits)
    } else {
        [
            log_uniform(w[0], 1e-8, 1e8),
            log_uniform(w[1], 1e-8, 1e8),
            log_uniform(w[2], 1e-6, 100.0),
            log_uniform(w[3], 1e-4, 10.0),
            uniform(w[4], -0.1, 0.5),
            uniform(w[5], 0.0, 0.4),
        ]
    };
    let contract = Contract {
        kind,
        strike,
        expiry,
    };
    let market = Market {
        spot,
        rate,
        dividend_yield,
    };
    if let Ok(value) = calor::price(&contract, &market, vol) {
        assert!(
            value.is_finite(),
            "price {value} for {contract:?} {market:?} vol {vol}"
        );
        assert!(
            value >= 0.0,
            "price {value} for {contract:?} {market:?} vol {vol}"
        );
    }
    if let Ok(greeks) = calor::greeks(&contract, &market, vol) {
        for (name, g) in greeks.named() {
            assert!(
                g.is_finite(),
                "{name} {g} for {contract:?} {market:?} vol {vol}"
            );
        }
        assert!(
            greeks.price >= 0.0,
            "price {} for {contract:?} {market:?} vol {vol}",
            greeks.price
        );
    }
});
