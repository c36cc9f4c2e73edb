//! Replays the committed fuzz corpus and crash reproducers under the stable
//! toolchain, through the same checks the fuzz targets run
//! (`calor_harness::fuzz_checks`), so that a fixed finding stays fixed.
//!
//! Inputs live in `fuzz/corpus/<target>/` (seeds and what the fuzzer kept)
//! and `fuzz/regressions/<target>/` (one file per finding).

use std::path::Path;

use calor_harness::fuzz_checks::TARGETS;

/// Findings not fixed yet: (target, file under `fuzz/`, reason). Each must
/// still fail its check; once it passes, the test says so and the entry goes.
const EXPECTED_FAILURES: &[(&str, &str, &str)] = &[];

/// Runs `target`'s check on every file of its corpus and regressions; returns how many.
fn replay(target: &str) -> usize {
    let check = TARGETS
        .iter()
        .find(|(name, _)| *name == target)
        .map(|(_, check)| *check)
        .expect("a known target");
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("../fuzz");
    let mut count = 0;
    for folder in ["corpus", "regressions"] {
        let Ok(entries) = std::fs::read_dir(root.join(folder).join(target)) else {
            continue;
        };
        let mut paths: Vec<_> = entries.filter_map(Result::ok).map(|e| e.path()).collect();
        paths.sort();
        for path in paths.into_iter().filter(|p| p.is_file()) {
            let data = std::fs::read(&path).expect("a readable corpus file");
            let name = path
                .file_name()
                .and_then(|n| n.to_str())
                .unwrap_or_default();
            let relative = format!("{folder}/{target}/{name}");
            let expected = EXPECTED_FAILURES
                .iter()
                .find(|(_, file, _)| *file == relative);
            let passed = std::panic::catch_unwind(|| check(&data)).is_ok();
            match expected {
                None => assert!(passed, "{target}: {relative} fails its check"),
                Some((_, _, reason)) => assert!(
                    !passed,
                    "{relative} now passes; remove it from EXPECTED_FAILURES ({reason})"
                ),
            }
            count += 1;
        }
    }
    count
}

#[test]
fn fuzz_replay_price() {
    assert!(replay("price") > 0, "seed corpus present");
}

#[test]
fn fuzz_replay_greeks() {
    assert!(replay("greeks") > 0);
}

#[test]
fn fuzz_replay_implied_vol() {
    assert!(replay("implied_vol") > 0);
}

#[test]
fn fuzz_replay_american_price() {
    assert!(replay("american_price") > 0);
}

#[test]
fn fuzz_replay_heat_step() {
    assert!(replay("heat_step") > 0);
}

#[test]
fn fuzz_replay_batch_decode() {
    assert!(replay("batch_decode") > 0);
}

#[test]
fn fuzz_replay_kernel_batch() {
    assert!(replay("kernel_batch") > 0);
}

#[test]
fn fuzz_replay_every_target_has_a_test() {
    let source = include_str!("fuzz_replay.rs");
    for (name, _) in TARGETS {
        assert!(
            source.contains(&format!("fn fuzz_replay_{name}()")),
            "{name}"
        );
    }
}
