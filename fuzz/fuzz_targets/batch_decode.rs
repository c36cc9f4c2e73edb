//! Fuzz target `batch_decode`: any bytes as a CSV book, through the row
//! decoder and the whole in-memory batch; see
//! `calor_harness::fuzz_checks::check_batch_decode` (one output row per input
//! row, well-formed statuses, finite values, CSV and JSON lines agreeing).
#![no_main]

libfuzzer_sys::fuzz_target!(
    init: {
        // The fuzzing thread is the pool's only worker. Pool threads would
        // outlive every input, and LeakSanitizer counts the thread-local
        // destructor records they register as leaks of whichever input
        // first started them.
        let _ = rayon::ThreadPoolBuilder::new()
            .num_threads(1)
            .use_current_thread()
            .build_global();
    },
    |data: &[u8]| calor_harness::fuzz_checks::check_batch_decode(data)
);
