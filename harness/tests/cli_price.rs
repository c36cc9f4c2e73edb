//! End-to-end tests of `calor price`, run on the built binary.

use std::process::{Command, Output};

use serde_json::Value;

/// Hull's worked example: S = 42, K = 40, T = 0.5, r = 0.1, σ = 0.2, no dividend.
const HULL: [&str; 10] = [
    "--spot", "42", "--strike", "40", "--expiry", "0.5", "--rate", "0.1", "--vol", "0.2",
];

/// Call value for [`HULL`]: 4.759422392871, per J. C. Hull, *Options, Futures,
/// and Other Derivatives*, 9th ed., Example 15.6 (from memory).
const HULL_CALL: f64 = 4.759_422_392_871;

const NAMES: [&str; 15] = [
    "price",
    "delta",
    "gamma",
    "vega",
    "theta",
    "rho",
    "dividend_rho",
    "vanna",
    "volga",
    "charm",
    "veta",
    "speed",
    "zomma",
    "color",
    "ultima",
];

fn calor(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_calor"))
        .args(args)
        .output()
        .expect("the calor binary runs")
}

/// `calor price --kind <kind>` on [`HULL`], with `extra` flags appended or,
/// for a flag already in [`HULL`], replacing its value.
fn price(kind: &str, extra: &[&str]) -> Output {
    let mut args: Vec<&str> = vec!["price", "--kind", kind];
    args.extend_from_slice(&HULL);
    let mut rest = extra.iter().copied().peekable();
    while let Some(flag) = rest.next() {
        let value = rest.next_if(|v| !v.starts_with("--"));
        match (args.iter().position(|a| *a == flag), value) {
            (Some(at), Some(value)) => args[at + 1] = value,
            (_, value) => args.extend([flag].into_iter().chain(value)),
        }
    }
    calor(&args)
}

fn json(kind: &str) -> Value {
    let out = price(kind, &["--json"]);
    assert!(
        out.status.success(),
        "stderr: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("stdout is one JSON object")
}

fn number(v: &Value, key: &str) -> f64 {
    v[key]
        .as_f64()
        .unwrap_or_else(|| panic!("{key} is a number in {v}"))
}

#[test]
fn cli_price_json() {
    let v = json("call");
    let value = number(&v, "price");
    assert!((value - HULL_CALL).abs() < 1e-9, "price {value}");
    for name in NAMES {
        assert!(number(&v, name).is_finite(), "{name}");
    }
    assert_eq!(v["kind"], "call");
    assert_eq!(number(&v, "spot"), 42.0);
    assert_eq!(number(&v, "strike"), 40.0);
    assert_eq!(number(&v, "expiry"), 0.5);
    assert_eq!(number(&v, "rate"), 0.1);
    assert_eq!(number(&v, "dividend_yield"), 0.0);
    assert_eq!(number(&v, "vol"), 0.2);
    assert_eq!(v.as_object().map(serde_json::Map::len), Some(7 + 15));
}

#[test]
fn cli_price_json_put_call_parity() {
    let call = number(&json("call"), "price");
    let put = number(&json("put"), "price");
    let forward_value = 42.0 - 40.0 * (-0.1_f64 * 0.5).exp();
    assert!((call - put - forward_value).abs() < 1e-12, "{call} {put}");
}

#[test]
fn cli_price_table_labels() {
    let out = price("call", &[]);
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).expect("UTF-8 table");
    let lines: Vec<&str> = text.lines().collect();
    assert!(
        lines[0].contains("spot 42") && lines[0].contains("vol 0.2"),
        "{}",
        lines[0]
    );
    for name in NAMES {
        let line = lines
            .iter()
            .find(|l| l.split_whitespace().next() == Some(name))
            .unwrap_or_else(|| panic!("no line for {name} in\n{text}"));
        assert!(line.contains("per") || name == "price", "{line}");
    }
    let price_line = lines
        .iter()
        .find(|l| l.starts_with("price "))
        .expect("price line");
    assert!(price_line.contains("4.75942239287"), "{price_line}");
}

#[test]
fn cli_price_header_extreme_inputs() {
    // The header echoes the inputs as they read back: 1e300, not 301 digits.
    let out = price(
        "call",
        &["--spot", "1e300", "--strike", "2.5e299", "--rate", "1e-7"],
    );
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).expect("UTF-8 table");
    let header = text.lines().next().unwrap_or_default();
    assert!(
        header.contains("spot 1e300 strike 2.5e299 ") && header.contains("rate 1e-7 "),
        "{header}"
    );
    assert!(header.len() < 120, "{header}");
}

/// Byte offset where the second column (the value) ends, for every line but the header.
fn value_column_ends(text: &str) -> Vec<usize> {
    text.lines()
        .skip(1)
        .map(|line| {
            let name_end = line.find(' ').unwrap_or(line.len());
            let rest = &line[name_end..];
            let value_start = name_end + (rest.len() - rest.trim_start().len());
            value_start + line[value_start..].find(' ').unwrap_or(0)
        })
        .collect()
}

#[test]
fn cli_price_table_values_aligned() {
    // A put with a dividend, and a far wing whose values are all zero.
    for extra in [
        &["--dividend-yield", "0.03"][..],
        &["--strike", "4000", "--expiry", "0.01"][..],
    ] {
        let out = price("put", extra);
        assert!(out.status.success());
        let text = String::from_utf8(out.stdout).expect("UTF-8 table");
        let ends = value_column_ends(&text);
        assert_eq!(ends.len(), 16, "{text}");
        assert!(ends.windows(2).all(|w| w[0] == w[1]), "{text}");
    }
}

#[test]
fn cli_price_bad_spot() {
    let out = price("call", &["--spot", "-1"]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.starts_with("error: spot: "), "{err}");
    assert!(out.stdout.is_empty());
}

#[test]
fn cli_price_bad_vol_not_finite() {
    let out = price("call", &["--vol", "NaN"]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).starts_with("error: vol: "));
}

#[test]
fn cli_price_unparseable_flag() {
    let out = price("call", &["--strike", "forty"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--strike"));
}

#[test]
fn cli_price_rate_required() {
    let out = calor(&[
        "price", "--kind", "call", "--spot", "42", "--strike", "40", "--expiry", "0.5", "--vol",
        "0.2",
    ]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--rate"));
}
