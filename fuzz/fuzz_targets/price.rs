//! Fuzz target `price`: any bytes become a European valuation; see
//! `calor_harness::fuzz_checks::check_price` for the input layout and the
//! invariants (finite, non-negative, below its bound, put–call parity).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| calor_harness::fuzz_checks::check_price(data));
