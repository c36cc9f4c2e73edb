//! Fuzz target `greeks`: all fifteen Greeks; see
//! `calor_harness::fuzz_checks::check_greeks` for the invariants (finite,
//! signs, agreement with `price`, delta/gamma/vega parity near the money).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| calor_harness::fuzz_checks::check_greeks(data));
