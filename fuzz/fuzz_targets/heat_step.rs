//! Fuzz target `heat_step`: one θ-scheme step of the heat equation; see
//! `calor_harness::fuzz_checks::check_heat_step` (finite, maximum principle,
//! no l2 growth for θ ≥ ½).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| calor_harness::fuzz_checks::check_heat_step(data));
