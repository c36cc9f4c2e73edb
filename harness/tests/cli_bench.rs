//! `calor bench` runs every entry point at every thread count and reports finite figures.

use std::process::Command;

#[test]
fn cli_bench_json() {
    let out = Command::new(env!("CARGO_BIN_EXE_calor"))
        .args(["bench", "--threads", "2", "--seconds", "0.05", "--json"])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let rows: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let rows = rows.as_array().unwrap();
    assert_eq!(rows.len(), 8, "four entry points at one and two threads");
    for r in rows {
        let rate = r["options_per_second_per_core"].as_f64().unwrap();
        let scaling = r["scaling_efficiency"].as_f64().unwrap();
        assert!(rate > 0.0 && scaling.is_finite(), "{r}");
    }
}

#[test]
fn cli_bench_refuses_zero_threads() {
    let out = Command::new(env!("CARGO_BIN_EXE_calor"))
        .args(["bench", "--threads", "0"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("threads"));
}
