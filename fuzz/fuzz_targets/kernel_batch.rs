//! Fuzz target `kernel_batch`: any bytes become a batch of up to 40 options
//! through the kernel's batch entry points; see
//! `calor_harness::fuzz_checks::check_kernel_batch` (statuses and counts as
//! the scalar calls, finite values, prices at the scalar price, refused
//! lengths).
#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| calor_harness::fuzz_checks::check_kernel_batch(data));
