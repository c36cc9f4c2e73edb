//! Fuzz target `batch_decode`: any bytes as a CSV book, through the row
//! decoder and the whole in-memory batch; see
//! `calor_harness::fuzz_checks::check_batch_decode` (one output row per input
//! row, well-formed statuses, finite values, CSV and JSON lines agreeing).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| calor_harness::fuzz_checks::check_batch_decode(data));
