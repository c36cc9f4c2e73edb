//! End-to-end tests of `calor batch`, run on the built binary. The books are
//! invented: options on the NGX barley index of the fictional Nordwind Grain
//! Exchange.

use std::fmt::Write as _;
use std::process::{Command, Output};

use calor::{Contract, Kind, Market};
use serde_json::Value;

mod common;
use common::batch_stdin;

fn rows(out: &Output) -> Vec<Vec<String>> {
    csv::ReaderBuilder::new()
        .has_headers(false)
        .from_reader(out.stdout.as_slice())
        .records()
        .map(|r| r.expect("CSV output").iter().map(str::to_owned).collect())
        .collect()
}

const BOOK: &str = "\
desk,id,vol,rate,expiry,strike,spot,kind,dividend_yield
barley-a,ngx-1,0.2,0.1,0.5,40,42,call,0
barley-a,ngx-2,0.25,0.05,1,45,42,put,0.02
barley-b,ngx-3,0.3,0.03,0.25,42,42,call,0.01
";

#[test]
fn cli_batch_values_match_kernel() {
    let out = batch_stdin(BOOK.as_bytes(), &[]);
    assert_eq!(out.status.code(), Some(0));
    let rows = rows(&out);
    let names: Vec<&str> = calor::Greeks::default().named().map(|(n, _)| n).to_vec();
    let mut expected_header: Vec<String> = BOOK
        .lines()
        .next()
        .unwrap()
        .split(',')
        .map(str::to_owned)
        .collect();
    expected_header.extend(names.iter().map(|n| (*n).to_owned()));
    expected_header.push("status".to_owned());
    assert_eq!(
        rows[0], expected_header,
        "input columns in their order, then the results"
    );
    for (row, line) in rows.iter().skip(1).zip(BOOK.lines().skip(1)) {
        let cells: Vec<&str> = line.split(',').collect();
        assert_eq!(row[..9], cells[..], "input cells passed through untouched");
        let num = |i: usize| cells[i].parse::<f64>().unwrap();
        let kind = if cells[7] == "call" {
            Kind::Call
        } else {
            Kind::Put
        };
        let g = calor::greeks(
            &Contract {
                kind,
                strike: num(5),
                expiry: num(4),
            },
            &Market {
                spot: num(6),
                rate: num(3),
                dividend_yield: num(8),
            },
            num(2),
        )
        .unwrap();
        for (j, (name, value)) in g.named().iter().enumerate() {
            let shown: f64 = row[9 + j].parse().unwrap();
            assert_eq!(
                shown.to_bits(),
                value.to_bits(),
                "{name} round-trips exactly"
            );
        }
        assert_eq!(row[24], "ok");
    }
}

#[test]
fn cli_batch_premium_books_imply_then_value() {
    let book = "id,kind,spot,strike,expiry,rate,premium\nngx-iv,call,21,20,0.25,0.1,1.875\n";
    let out = batch_stdin(book.as_bytes(), &[]);
    let rows = rows(&out);
    assert_eq!(rows[0][22], "implied_vol");
    assert_eq!(rows[0][23], "status");
    let vol: f64 = rows[1][22].parse().unwrap();
    assert!((vol - 0.2345129139976438).abs() < 1e-15);
    let price: f64 = rows[1][7].parse().unwrap();
    assert!(
        (price - 1.875).abs() < 1e-13,
        "valued at the implied vol: {price}"
    );
    assert_eq!(rows[1][23], "ok");
}

#[test]
fn cli_batch_american_rows_get_price_delta_gamma() {
    let book =
        "kind,style,spot,strike,expiry,rate,vol\nput,american,50,50,0.4166666666666667,0.1,0.4\n";
    let out = batch_stdin(book.as_bytes(), &[]);
    let rows = rows(&out);
    let c = Contract {
        kind: Kind::Put,
        strike: 50.0,
        expiry: 0.4166666666666667,
    };
    let m = Market {
        spot: 50.0,
        rate: 0.1,
        dividend_yield: 0.0,
    };
    let expected = calor::american_price(&c, &m, 0.4).unwrap();
    assert_eq!(rows[1][7].parse::<f64>().unwrap(), expected);
    assert!(rows[1][8].parse::<f64>().unwrap() < 0.0, "put delta");
    assert!(rows[1][9].parse::<f64>().unwrap() > 0.0, "gamma");
    assert!(
        rows[1][10..22].iter().all(String::is_empty),
        "no other Greeks on the grid"
    );
    assert_eq!(rows[1][22], "ok");
}

#[test]
fn cli_batch_jsonl() {
    let book = "id,kind,spot,strike,expiry,rate,vol,note\nngx-1,call,42,40,0.5,0.1,0.2,\"say \"\"hi\"\"\"\nngx-2,call,-42,40,0.5,0.1,0.2,\n";
    let out = batch_stdin(book.as_bytes(), &["--format", "jsonl"]);
    assert_eq!(out.status.code(), Some(0));
    let lines: Vec<Value> = out
        .stdout
        .split(|b| *b == b'\n')
        .filter(|l| !l.is_empty())
        .map(|l| serde_json::from_slice(l).expect("one JSON object per line"))
        .collect();
    assert_eq!(lines.len(), 2);
    assert_eq!(lines[0]["id"], "ngx-1");
    assert_eq!(lines[0]["spot"], "42", "input cells stay strings");
    assert_eq!(lines[0]["note"], "say \"hi\"");
    assert!((lines[0]["price"].as_f64().unwrap() - 4.759422392871).abs() < 1e-11);
    assert_eq!(lines[0]["status"], "ok");
    assert!(lines[1]["price"].is_null());
    assert_eq!(lines[1]["status"], "error: spot: must be greater than zero");
    assert_eq!(lines[0].as_object().unwrap().len(), 8 + 15 + 1);
}

#[test]
fn cli_batch_order_kept_across_chunks() {
    // Several chunks of the streaming loop, each valued in parallel.
    let n = 40_000;
    let mut book = String::from("id,kind,spot,strike,expiry,rate,vol\n");
    for i in 0..n {
        let kind = if i % 2 == 0 { "call" } else { "put" };
        let spot = if i % 997 == 0 {
            "x".to_owned()
        } else {
            format!("{}", 30 + i % 40)
        };
        let _ = writeln!(book, "ngx-{i},{kind},{spot},50,0.5,0.03,0.25");
    }
    let out = batch_stdin(book.as_bytes(), &[]);
    assert_eq!(out.status.code(), Some(0));
    let rows = rows(&out);
    assert_eq!(rows.len(), n + 1);
    for (i, row) in rows.iter().skip(1).enumerate() {
        assert_eq!(row[0], format!("ngx-{i}"));
        let expected = if i % 997 == 0 {
            "error: spot: not a number"
        } else {
            "ok"
        };
        assert_eq!(row[22], expected, "row {i}");
    }
    let stderr = String::from_utf8_lossy(&out.stderr);
    let bad = n.div_ceil(997);
    assert!(
        stderr.contains(&format!(
            "calor batch: {n} rows, {} ok, {bad} bad, ",
            n - bad
        )),
        "{stderr}"
    );
    assert!(stderr.trim_end().ends_with("rows/s"), "{stderr}");
}

#[test]
fn cli_batch_files() {
    let dir = tempfile::tempdir().unwrap();
    let (input, output) = (dir.path().join("book.csv"), dir.path().join("out.csv"));
    std::fs::write(&input, BOOK).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_calor"))
        .args(["batch", "--input"])
        .arg(&input)
        .arg("--output")
        .arg(&output)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0));
    assert!(out.stdout.is_empty());
    let written = std::fs::read(&output).unwrap();
    assert_eq!(written, batch_stdin(BOOK.as_bytes(), &[]).stdout);
}

#[test]
fn cli_batch_refused_header_leaves_output_alone() {
    let dir = tempfile::tempdir().unwrap();
    let (input, output) = (dir.path().join("book.csv"), dir.path().join("out.csv"));
    std::fs::write(&input, "kind,spot,strike,expiry,rate\n").unwrap();
    std::fs::write(&output, "yesterday's results\n").unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_calor"))
        .args(["batch", "--input"])
        .arg(&input)
        .arg("--output")
        .arg(&output)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert_eq!(
        std::fs::read_to_string(&output).unwrap(),
        "yesterday's results\n"
    );
}

#[test]
fn cli_batch_missing_input_file() {
    let out = Command::new(env!("CARGO_BIN_EXE_calor"))
        .args([
            "batch",
            "--input",
            "/nonexistent/ngx-book.csv",
            "--output",
            "-",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    assert!(
        String::from_utf8_lossy(&out.stderr).contains("error: input: /nonexistent/ngx-book.csv")
    );
}
