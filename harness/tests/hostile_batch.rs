//! Hostile inputs to `calor batch`, one test per row of the README table
//! "Batch valuation of CSV books: hostile inputs", run through the built binary.
//!
//! Books are invented: options on the NGX barley index of the fictional
//! Nordwind Grain Exchange.

use std::fmt::Write as _;

mod common;

/// What one run of `calor batch` gave.
struct Run {
    code: i32,
    stdout: Vec<u8>,
    stderr: String,
}

impl Run {
    /// The output rows (header first) as text cells.
    fn rows(&self) -> Vec<Vec<String>> {
        let mut reader = csv::ReaderBuilder::new()
            .has_headers(false)
            .from_reader(self.stdout.as_slice());
        reader
            .records()
            .map(|r| {
                r.expect("output is UTF-8 CSV")
                    .iter()
                    .map(str::to_owned)
                    .collect()
            })
            .collect()
    }

    /// The status cell of each data row.
    fn statuses(&self) -> Vec<String> {
        self.rows()
            .iter()
            .skip(1)
            .map(|r| r.last().cloned().unwrap_or_default())
            .collect()
    }

    /// The cell of `column` in each data row.
    fn column(&self, column: &str) -> Vec<String> {
        let rows = self.rows();
        let i = rows[0]
            .iter()
            .position(|c| c == column)
            .expect("column present");
        rows.iter().skip(1).map(|r| r[i].clone()).collect()
    }
}

fn batch(input: &[u8], extra: &[&str]) -> Run {
    let out = common::batch_stdin(input, extra);
    Run {
        code: out.status.code().unwrap_or(-1),
        stdout: out.stdout,
        stderr: String::from_utf8_lossy(&out.stderr).into_owned(),
    }
}

const HEADER: &str = "id,kind,spot,strike,expiry,rate,dividend_yield,vol";
const FIELDS: [&str; 6] = ["spot", "strike", "expiry", "rate", "dividend_yield", "vol"];
const GOOD: [&str; 6] = ["42", "40", "0.5", "0.1", "0.02", "0.2"];

/// A book with one row per field, that field set to `value`, the rest good.
fn each_field(value: &str) -> String {
    let mut book = format!("{HEADER}\n");
    for (i, field) in FIELDS.iter().enumerate() {
        let mut cells = GOOD;
        cells[i] = value;
        let _ = writeln!(book, "ngx-{field},call,{}", cells.join(","));
    }
    book
}

fn statuses_for(value: &str) -> Vec<String> {
    let run = batch(each_field(value).as_bytes(), &[]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    run.statuses()
}

/// The premium book's one row with `premium` as given.
fn premium_status(premium: &str) -> String {
    let book = format!("kind,spot,strike,expiry,rate,premium\ncall,42,40,0.5,0.1,{premium}\n");
    let run = batch(book.as_bytes(), &[]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    run.statuses()[0].clone()
}

fn assert_not_finite_each_field(value: &str) {
    let statuses = statuses_for(value);
    for (field, status) in FIELDS.iter().zip(&statuses) {
        assert_eq!(
            status,
            &format!("error: {field}: not a finite number"),
            "{value}"
        );
    }
    assert_eq!(premium_status(value), "error: premium: not a finite number");
}

#[test]
fn hostile_nan_each_field() {
    for value in ["nan", "NaN", "-nan"] {
        assert_not_finite_each_field(value);
    }
}

#[test]
fn hostile_infinity_each_field() {
    for value in ["inf", "-inf", "+infinity", "Infinity", "1e999", "-1e999"] {
        assert_not_finite_each_field(value);
    }
}

#[test]
fn hostile_negative_values() {
    let statuses = statuses_for("-1");
    assert_eq!(statuses[0], "error: spot: must be greater than zero");
    assert_eq!(statuses[1], "error: strike: must be greater than zero");
    assert_eq!(statuses[2], "error: expiry: must not be negative");
    assert_eq!(statuses[3], "ok", "a negative rate is a rate");
    assert_eq!(statuses[4], "ok", "a negative dividend yield is a yield");
    assert_eq!(statuses[5], "error: vol: must not be negative");
    assert_eq!(premium_status("-1"), "error: premium: must not be negative");
}

#[test]
fn hostile_zero_values() {
    let statuses = statuses_for("0");
    assert_eq!(statuses[0], "error: spot: must be greater than zero");
    assert_eq!(statuses[1], "error: strike: must be greater than zero");
    assert_eq!(statuses[2], "ok", "expiry 0: the intrinsic value");
    assert_eq!(statuses[3], "ok");
    assert_eq!(statuses[4], "ok");
    assert_eq!(
        statuses[5], "ok",
        "vol 0: the discounted intrinsic value of the forward"
    );
    let run = batch(each_field("0").as_bytes(), &[]);
    assert_eq!(run.column("price")[2], "2.0", "intrinsic 42 - 40");
    assert_eq!(
        premium_status("0"),
        "error: premium: at or below the discounted intrinsic value of the forward"
    );
    // At the strike, the Greeks diverge at expiry 0 or vol 0.
    let book = format!("{HEADER}\natm,call,40,40,0,0.1,0,0.2\natm,call,40,40,1,0,0,0\n");
    let statuses = batch(book.as_bytes(), &[]).statuses();
    for status in statuses {
        assert!(status.starts_with("error: vol: Greeks diverge"), "{status}");
    }
    // The grid needs time and volatility to diffuse.
    let book = "kind,style,spot,strike,expiry,rate,vol\nput,american,40,42,0,0.1,0.2\nput,american,40,42,1,0.1,0\n";
    let statuses = batch(book.as_bytes(), &[]).statuses();
    assert_eq!(statuses[0], "error: expiry: must be greater than zero");
    assert_eq!(statuses[1], "error: vol: must be greater than zero");
}

#[test]
fn hostile_huge_values() {
    // 1e308 in any one field: valued, every number finite (the kernel's
    // closed form keeps its scale), or refused naming the field.
    let run = batch(each_field("1e308").as_bytes(), &[]);
    assert_eq!(run.statuses(), vec!["ok"; 6]);
    for price in run.column("price") {
        assert!(price.parse::<f64>().is_ok_and(f64::is_finite), "{price}");
    }
    assert_eq!(
        run.column("price")[0],
        "9.900498337491681e307",
        "S·e^(−qT) − K·e^(−rT)"
    );
    assert_eq!(
        premium_status("1e308"),
        "error: premium: at or above the no-arbitrage maximum of the option"
    );
}

#[test]
fn hostile_tiny_values() {
    // 1e-308, a subnormal, is a usable number in every field.
    assert_eq!(statuses_for("1e-308"), vec!["ok"; 6]);
    // Near the money, an expiry that short sends the Greeks out of range.
    let book = format!("{HEADER}\natm,call,40,40,1e-308,0.1,0,0.2\n");
    assert_eq!(
        batch(book.as_bytes(), &[]).statuses(),
        vec!["error: result: exceeds the range of f64"]
    );
    assert_eq!(
        premium_status("1e-308"),
        "error: premium: at or below the discounted intrinsic value of the forward"
    );
}

#[test]
fn hostile_empty_required_cell() {
    let statuses = statuses_for("");
    for (field, status) in FIELDS.iter().zip(&statuses) {
        if *field == "dividend_yield" {
            assert_eq!(status, "ok", "optional: defaults to 0");
        } else {
            assert_eq!(status, &format!("error: {field}: empty"));
        }
    }
    let statuses = statuses_for("   ");
    assert_eq!(statuses[0], "error: spot: empty", "blanks are trimmed");
    let book = format!("{HEADER}\nngx,,42,40,0.5,0.1,0,0.2\n");
    assert_eq!(
        batch(book.as_bytes(), &[]).statuses(),
        vec!["error: kind: empty"]
    );
    assert_eq!(premium_status(""), "error: premium: empty");
}

#[test]
fn hostile_empty_optional_cell() {
    let book = "id,kind,style,spot,strike,expiry,rate,dividend_yield,vol\n\
                ,call,,42,40,0.5,0.1,,0.2\n\
                ngx,call,european,42,40,0.5,0.1,0,0.2\n";
    let run = batch(book.as_bytes(), &[]);
    assert_eq!(run.statuses(), vec!["ok", "ok"]);
    let rows = run.rows();
    assert_eq!(
        rows[1][9..],
        rows[2][9..],
        "empty style and dividend_yield take the defaults"
    );
}

#[test]
fn hostile_text_in_numeric_cell() {
    for value in ["abc", "\"1,5\"", "0x10", "1.2.3", "12%", "1e", "--1"] {
        let statuses = statuses_for(value);
        for (field, status) in FIELDS.iter().zip(&statuses) {
            assert_eq!(status, &format!("error: {field}: not a number"), "{value}");
        }
    }
    assert_eq!(premium_status("cheap"), "error: premium: not a number");
}

#[test]
fn hostile_unknown_kind() {
    let book = format!(
        "{HEADER}\na,straddle,42,40,0.5,0.1,0,0.2\nb,CALL,42,40,0.5,0.1,0,0.2\nc, Put ,42,40,0.5,0.1,0,0.2\n"
    );
    let run = batch(book.as_bytes(), &[]);
    assert_eq!(
        run.statuses(),
        vec!["error: kind: expected call or put", "ok", "ok"]
    );
}

#[test]
fn hostile_unknown_style() {
    let book = "kind,style,spot,strike,expiry,rate,vol\n\
                put,bermudan,40,42,0.5,0.1,0.2\n\
                put,American,40,42,0.5,0.1,0.2\n";
    let run = batch(book.as_bytes(), &[]);
    assert_eq!(
        run.statuses(),
        vec!["error: style: expected european or american", "ok"]
    );
}

#[test]
fn hostile_american_premium() {
    let book = "kind,style,spot,strike,expiry,rate,premium\nput,american,40,42,0.5,0.1,3\n";
    assert_eq!(
        batch(book.as_bytes(), &[]).statuses(),
        vec!["error: premium: implied volatility is offered for european rows only"]
    );
}

#[test]
fn hostile_duplicate_columns() {
    let run = batch(
        b"kind,spot,strike,expiry,rate,vol,spot\ncall,1,1,1,0,0.2,1\n",
        &[],
    );
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("error: spot: duplicate column"),
        "{}",
        run.stderr
    );
    assert!(run.stdout.is_empty());
    let run = batch(b"kind,spot,strike,expiry,rate,vol,desk,desk\n", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("desk: duplicate column"),
        "{}",
        run.stderr
    );
}

#[test]
fn hostile_missing_header() {
    // A book that starts with its data: the first row is read as the header.
    let run = batch(b"call,42,40,0.5,0.1,0.2\nput,42,40,0.5,0.1,0.2\n", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("vol, premium: neither"),
        "{}",
        run.stderr
    );
    let run = batch(b"call,42,40,0.5,0.1,vol\n", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr
            .contains("kind: required column missing from the header"),
        "{}",
        run.stderr
    );
    let run = batch(b"", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("header: the input is empty"),
        "{}",
        run.stderr
    );
}

#[test]
fn hostile_missing_required_column() {
    for missing in ["kind", "spot", "strike", "expiry", "rate"] {
        let header: Vec<&str> = ["kind", "spot", "strike", "expiry", "rate", "vol"]
            .into_iter()
            .filter(|c| *c != missing)
            .collect();
        let run = batch(format!("{}\n", header.join(",")).as_bytes(), &[]);
        assert_eq!(run.code, 2, "{missing}");
        assert!(
            run.stderr
                .contains(&format!("{missing}: required column missing")),
            "{}",
            run.stderr
        );
    }
}

#[test]
fn hostile_vol_and_premium() {
    let run = batch(b"kind,spot,strike,expiry,rate,vol,premium\n", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("vol, premium: both columns present"),
        "{}",
        run.stderr
    );
    let run = batch(b"kind,spot,strike,expiry,rate\n", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("vol, premium: neither column present"),
        "{}",
        run.stderr
    );
}

#[test]
fn hostile_output_column_in_input() {
    let run = batch(b"kind,spot,strike,expiry,rate,vol,status\n", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr
            .contains("status: input column has the name of an output column"),
        "{}",
        run.stderr
    );
}

#[test]
fn hostile_truncated_last_line() {
    let book = format!("{HEADER}\na,call,42,40,0.5,0.1,0,0.2\nb,put,42,4");
    let run = batch(book.as_bytes(), &[]);
    assert_eq!(run.code, 0);
    assert_eq!(
        run.statuses(),
        vec!["ok", "error: line 3: expected 8 cells, found 4"]
    );
    let rows = run.rows();
    assert_eq!(rows[2].len(), rows[0].len(), "the short row is padded");
    assert_eq!(rows[2][..4], ["b", "put", "42", "4"]);
}

#[test]
fn hostile_extra_cells() {
    let book = format!("{HEADER}\na,call,42,40,0.5,0.1,0,0.2,surplus\n");
    let run = batch(book.as_bytes(), &[]);
    assert_eq!(
        run.statuses(),
        vec!["error: line 2: expected 8 cells, found 9"]
    );
    assert_eq!(
        run.rows()[1].len(),
        run.rows()[0].len(),
        "the surplus is cut"
    );
}

#[test]
fn hostile_crlf_endings() {
    let lf = each_field("1");
    let crlf = lf.replace('\n', "\r\n");
    let (a, b) = (batch(lf.as_bytes(), &[]), batch(crlf.as_bytes(), &[]));
    assert_eq!(
        a.stdout, b.stdout,
        "CRLF reads as LF; output lines end in LF"
    );
    let short = format!("{HEADER}\r\na,call\r\n");
    assert_eq!(
        batch(short.as_bytes(), &[]).statuses(),
        vec!["error: line 2: expected 8 cells, found 2"]
    );
}

#[test]
fn hostile_byte_order_mark() {
    let book = each_field("1");
    let with_bom = [b"\xEF\xBB\xBF".as_slice(), book.as_bytes()].concat();
    let (a, b) = (batch(book.as_bytes(), &[]), batch(&with_bom, &[]));
    assert_eq!(
        a.stdout, b.stdout,
        "the mark is stripped from the first header cell"
    );
    assert!(b.stdout.starts_with(b"id,"));
    // A mark on a book whose first column is `kind`: still found.
    let run = batch(
        b"\xEF\xBB\xBFkind,spot,strike,expiry,rate,vol\ncall,42,40,0.5,0.1,0.2\n",
        &[],
    );
    assert_eq!(run.statuses(), vec!["ok"]);
}

#[test]
fn hostile_invalid_utf8() {
    let book = [
        HEADER.as_bytes(),
        b"\nngx-\xFF\xFE,call,42,40,0.5,0.1,0,0.2\nngx-2,call,42,40,0.5,0.1,0,0.2\n",
    ]
    .concat();
    let run = batch(&book, &[]);
    assert_eq!(run.code, 0);
    assert_eq!(run.statuses(), vec!["error: line 2: not valid UTF-8", "ok"]);
    assert!(
        String::from_utf8(run.stdout.clone()).is_ok(),
        "output stays UTF-8"
    );
    assert_eq!(run.rows()[1][0], "ngx-\u{FFFD}\u{FFFD}");
    let run = batch(b"kind,spot,strike,expiry,rate,vol,\xC0\n", &[]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("header: column 7 is not valid UTF-8"),
        "{}",
        run.stderr
    );
}

#[test]
fn hostile_blank_lines() {
    let book = format!("{HEADER}\n\na,call,42,40,0.5,0.1,0,0.2\n\n\nb,call\n\n");
    let run = batch(book.as_bytes(), &[]);
    assert_eq!(
        run.statuses(),
        vec!["ok", "error: line 6: expected 8 cells, found 2"],
        "blank lines are skipped but counted"
    );
}

#[test]
fn hostile_quoted_cells() {
    let book = format!(
        "{HEADER},note\n\"ngx, \"\"spring\"\"\",call,42,40,0.5,0.1,0,0.2,\"two\nlines\"\nx,put,1\n"
    );
    let run = batch(book.as_bytes(), &[]);
    let rows = run.rows();
    assert_eq!(rows[1][0], "ngx, \"spring\"");
    assert_eq!(rows[1][8], "two\nlines");
    assert_eq!(
        run.statuses(),
        vec!["ok", "error: line 4: expected 9 cells, found 3"],
        "a quoted line break does not end the row, but counts as a line"
    );
}
