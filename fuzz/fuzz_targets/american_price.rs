//! Fuzz target `american_price`: the finite-difference American pricer; see
//! `calor_harness::fuzz_checks::check_american_price` (finite, between the
//! intrinsic value and its cap, at least the European price on the grid's
//! reference domain).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| calor_harness::fuzz_checks::check_american_price(data));
