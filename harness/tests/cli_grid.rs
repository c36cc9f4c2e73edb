//! End-to-end tests of `calor grid`, run on the built binary.

use std::process::{Command, Output};

use serde_json::Value;

/// Hull's American put (S = K = 50, r = 10 %, σ = 40 %, T = 5/12), whose tree
/// ladder converges to about 4.2842 (J. C. Hull, *Options, Futures, and Other
/// Derivatives*, 9th ed., ch. 21, from memory).
const HULL_PUT: [&str; 12] = [
    "--kind",
    "put",
    "--spot",
    "50",
    "--strike",
    "50",
    "--expiry",
    "0.4166666666666667",
    "--rate",
    "0.1",
    "--vol",
    "0.4",
];

fn calor(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_calor"))
        .args(args)
        .output()
        .expect("the calor binary runs")
}

fn grid(extra: &[&str]) -> Output {
    let mut args = vec!["grid"];
    args.extend_from_slice(&HULL_PUT);
    args.extend_from_slice(extra);
    calor(&args)
}

#[test]
fn cli_grid_table_converges() {
    let out = grid(&["--levels", "4"]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).expect("utf-8");
    assert!(
        text.starts_with("American put on the grid: spot 50 strike 50"),
        "{text}"
    );
    for column in [
        "nodes", "price", "delta", "gamma", "change", "order", "us/solve", "boundary",
    ] {
        assert!(text.contains(column), "no column {column}: {text}");
    }
    assert_eq!(text.lines().count(), 2 + 4, "{text}");
}

#[test]
fn cli_grid_json_ladder() {
    let out = grid(&["--levels", "4", "--json"]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: Value = serde_json::from_slice(&out.stdout).expect("one JSON object");
    assert_eq!(v["kind"], "put");
    assert_eq!(v["exercise"], "american");
    let rungs = v["rungs"].as_array().expect("rungs");
    assert_eq!(rungs.len(), 4);
    let last = rungs[3]["price"].as_f64().expect("a price");
    assert!((last - 4.2842).abs() < 1e-3, "{last}");
    let order = rungs[3]["observed_order"].as_f64().expect("an order");
    assert!(order > 1.5, "observed order {order}");
    assert!(rungs[3]["boundary"].as_f64().is_some_and(|b| b < 50.0));
    assert!(rungs[0]["change"].is_null());
}

#[test]
fn cli_grid_european_matches_closed_form() {
    let out = grid(&[
        "--style",
        "european",
        "--levels",
        "3",
        "--richardson",
        "--json",
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: Value = serde_json::from_slice(&out.stdout).expect("one JSON object");
    let exact = v["closed_form"].as_f64().expect("the closed form");
    let last = v["rungs"][2]["price"].as_f64().expect("a price");
    assert!((last - exact).abs() < 1e-5, "{last} against {exact}");
    assert!(v["rungs"][2]["boundary"].is_null());
}

#[test]
fn cli_grid_refuses_bad_input() {
    let out = grid(&["--nodes", "3"]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).starts_with("error: nodes: "));
    let out = calor(&[
        "grid", "--kind", "call", "--spot", "100", "--strike", "100", "--expiry", "0", "--rate",
        "0.05", "--vol", "0.2",
    ]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).starts_with("error: expiry: "));
    let out = grid(&["--levels", "0"]);
    assert_eq!(out.status.code(), Some(2));
}
