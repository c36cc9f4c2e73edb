//! Proof that `calor` builds for a consumer without std.
//!
//! This crate is `no_std` and `no_main`, brings its own panic handler and is
//! built as a static library, the form a C host or a firmware image links.
//! If the kernel (or anything it depends on) ever pulled in `std`, the build
//! would fail: `std` would bring a second `panic_impl` lang item and clash
//! with the handler below.
//!
//! The check, built on its own so that no other package's features reach the
//! kernel (see DEVELOPERS.md):
//! `cargo rustc -p calor-nostd-check --release --features panic-handler -- -C panic=abort`
//!
//! In an ordinary workspace build the feature is off and the crate is a plain
//! `no_std` library: other members link `std`, whose handler then applies.
#![no_std]
#![no_main]

use calor::{Contract, Kind, Market};

/// Values one option and returns a checksum touching every output (the price
/// plus the sum of all fifteen Greeks), or NaN if the kernel refuses the
/// input; `put` ≠ 0 selects a put. Its only job is to make the whole kernel
/// part of the library.
///
/// The C signature is
/// `double calor_check(int put, double spot, double strike, double expiry,
/// double rate, double dividend_yield, double vol);`.
// `#[no_mangle]` exports the symbol for the host. rustc's `unsafe_code` lint
// counts it (two libraries exporting one name is undefined at link time);
// the name is prefixed and this crate is never linked with another that
// defines it, so it is allowed here and nowhere else. The function body
// itself contains no unsafe code.
#[allow(unsafe_code)]
#[no_mangle]
pub extern "C" fn calor_check(
    put: i32,
    spot: f64,
    strike: f64,
    expiry: f64,
    rate: f64,
    dividend_yield: f64,
    vol: f64,
) -> f64 {
    let kind = if put == 0 { Kind::Call } else { Kind::Put };
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
    match (
        calor::price(&contract, &market, vol),
        calor::greeks(&contract, &market, vol),
    ) {
        (Ok(value), Ok(greeks)) => {
            value
                + greeks
                    .named()
                    .iter()
                    .fold(0.0, |sum, (_, greek)| sum + greek)
        }
        _ => f64::NAN,
    }
}

/// The kernel never panics; if it ever did, a no_std host has nowhere to unwind to.
#[cfg(feature = "panic-handler")]
#[panic_handler]
fn panic(_info: &core::panic::PanicInfo) -> ! {
    loop {
        core::hint::spin_loop();
    }
}
