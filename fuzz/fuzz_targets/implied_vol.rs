//! Fuzz target `implied_vol`: premiums from prices, from anywhere between the
//! no-arbitrage bounds, or raw bits; see
//! `calor_harness::fuzz_checks::check_implied_vol` (finite vol that reprices
//! the premium within the tolerance derived there).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| calor_harness::fuzz_checks::check_implied_vol(data));
