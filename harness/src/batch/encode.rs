//! Writing result rows: CSV or JSON lines, numbers in shortest round-trip form.
//!
//! Rows are appended to a caller's `Vec<u8>`, so that each worker encodes its
//! share of a chunk without locks and the chunk is written in input order.

use std::borrow::Cow;
use std::fmt::Write as _;

use csv::ByteRecord;

use super::decode::{Header, Quote, GREEK_COLUMNS};
use super::value::{Failure, Outcome};

/// The output format of `calor batch`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum Format {
    /// CSV with a header row, empty cells for missing numbers.
    Csv,
    /// One JSON object per row: numbers as numbers, missing ones as null,
    /// input cells as strings.
    Jsonl,
}

/// The output's header line (CSV), or nothing (JSON lines).
pub fn header_line(header: &Header, format: Format, out: &mut Vec<u8>) {
    if format == Format::Jsonl {
        return;
    }
    let mut first = true;
    let mut name = |out: &mut Vec<u8>, text: &[u8]| {
        if !first {
            out.push(b',');
        }
        first = false;
        csv_cell(out, text);
    };
    for n in &header.names {
        name(out, n.as_bytes());
    }
    for n in output_columns(header.quote) {
        name(out, n.as_bytes());
    }
    out.push(b'\n');
}

/// The names of the computed columns, after the input's own.
fn output_columns(quote: Quote) -> impl Iterator<Item = &'static str> {
    let implied: &[&str] = match quote {
        Quote::Vol => &[],
        Quote::Premium => &["implied_vol"],
    };
    GREEK_COLUMNS
        .into_iter()
        .chain(implied.iter().copied())
        .chain(["status"])
}

/// Appends one result row: the input cells (padded or cut to the header's
/// width), the fifteen values, `implied_vol` for premium books, the status.
///
/// `scratch` is reused for the status text.
pub fn row(
    header: &Header,
    record: &ByteRecord,
    outcome: &Outcome,
    format: Format,
    scratch: &mut String,
    out: &mut Vec<u8>,
) {
    scratch.clear();
    match &outcome.failure {
        None => scratch.push_str("ok"),
        Some(failure) => {
            let _ = write!(scratch, "error: {failure}");
        }
    }
    let implied = match header.quote {
        Quote::Vol => None,
        Quote::Premium => Some(outcome.implied_vol),
    };
    let numbers = outcome.values.iter().copied().chain(implied);
    let mut numbers_buf = zmij::Buffer::new();
    // A decoded row's cells were checked for UTF-8; a row refused by the
    // decoder may not have been (a wrong cell count is found first), so its
    // cells that are not valid UTF-8 are written with U+FFFD.
    let checked = !matches!(outcome.failure, Some(Failure::Decode(_)));
    let cells = (0..header.len()).map(|i| {
        let cell = record.get(i).unwrap_or_default();
        if checked || std::str::from_utf8(cell).is_ok() {
            Cow::Borrowed(cell)
        } else {
            Cow::Owned(String::from_utf8_lossy(cell).into_owned().into_bytes())
        }
    });
    match format {
        Format::Csv => {
            if checked && !needs_quotes(record.as_slice()) {
                // The common row: no cell to quote, so no cell to scan.
                for i in 0..header.len() {
                    if i > 0 {
                        out.push(b',');
                    }
                    out.extend_from_slice(record.get(i).unwrap_or_default());
                }
            } else {
                for (i, cell) in cells.enumerate() {
                    if i > 0 {
                        out.push(b',');
                    }
                    csv_cell(out, &cell);
                }
            }
            for value in numbers {
                out.push(b',');
                if let Some(v) = value.filter(|v| v.is_finite()) {
                    number(out, &mut numbers_buf, v);
                }
            }
            out.push(b',');
            if outcome.failure.is_none() {
                // `ok` needs no quotes.
                out.extend_from_slice(scratch.as_bytes());
            } else {
                csv_cell(out, scratch.as_bytes());
            }
            out.push(b'\n');
        }
        Format::Jsonl => {
            out.push(b'{');
            for (name, cell) in header.names.iter().zip(cells) {
                json_string(out, name.as_bytes());
                out.push(b':');
                json_string(out, &cell);
                out.push(b',');
            }
            for (name, value) in output_columns(header.quote).zip(numbers) {
                json_string(out, name.as_bytes());
                out.push(b':');
                match value.filter(|v| v.is_finite()) {
                    Some(v) => number(out, &mut numbers_buf, v),
                    None => out.extend_from_slice(b"null"),
                }
                out.push(b',');
            }
            out.extend_from_slice(b"\"status\":");
            json_string(out, scratch.as_bytes());
            out.extend_from_slice(b"}\n");
        }
    }
}

/// A finite number in shortest round-trip form, positive exponents without a
/// sign (`1e21`, as Rust's and Python's parsers and printers write them).
/// Out of line: inlined into [`row`], the formatter's tables and branches
/// made the whole batch slower, not faster.
#[inline(never)]
fn number(out: &mut Vec<u8>, buf: &mut zmij::Buffer, v: f64) {
    let text = buf.format_finite(v).as_bytes();
    // The formatter switches to an exponent from 1e16 up, written `1e+16`.
    if v.abs() < 1e16 {
        out.extend_from_slice(text);
        return;
    }
    match text.iter().position(|&b| b == b'+') {
        Some(plus) => {
            out.extend_from_slice(text.get(..plus).unwrap_or_default());
            out.extend_from_slice(text.get(plus + 1..).unwrap_or_default());
        }
        None => out.extend_from_slice(text),
    }
}

/// Whether a CSV cell (or all the cells of a row, back to back) holds a byte
/// that must be quoted.
fn needs_quotes(bytes: &[u8]) -> bool {
    memchr::memchr3(b',', b'"', b'\n', bytes).is_some() || memchr::memchr(b'\r', bytes).is_some()
}

/// A CSV cell, quoted (with doubled quotes) only when it must be.
fn csv_cell(out: &mut Vec<u8>, cell: &[u8]) {
    if needs_quotes(cell) {
        out.push(b'"');
        for &b in cell {
            if b == b'"' {
                out.push(b'"');
            }
            out.push(b);
        }
        out.push(b'"');
    } else {
        out.extend_from_slice(cell);
    }
}

/// A JSON string; `text` is UTF-8, so only quotes, backslashes and control
/// characters need escapes.
fn json_string(out: &mut Vec<u8>, text: &[u8]) {
    const HEX: &[u8; 16] = b"0123456789abcdef";
    out.push(b'"');
    for &b in text {
        match b {
            b'"' => out.extend_from_slice(b"\\\""),
            b'\\' => out.extend_from_slice(b"\\\\"),
            b'\n' => out.extend_from_slice(b"\\n"),
            b'\r' => out.extend_from_slice(b"\\r"),
            b'\t' => out.extend_from_slice(b"\\t"),
            0..=0x1f => {
                out.extend_from_slice(b"\\u00");
                out.push(HEX[usize::from(b >> 4)]);
                out.push(HEX[usize::from(b & 0xf)]);
            }
            _ => out.push(b),
        }
    }
    out.push(b'"');
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn encode_csv_cell_quotes_when_needed() {
        let mut out = Vec::new();
        csv_cell(&mut out, b"plain");
        csv_cell(&mut out, b"a,\"b\"");
        assert_eq!(out, b"plain\"a,\"\"b\"\"\"");
    }

    #[test]
    fn encode_number_shortest_without_plus() {
        let mut out = Vec::new();
        let mut buf = zmij::Buffer::new();
        let values = [
            0.1,
            9.9e15,
            1e16,
            1e21,
            -2.5e300,
            f64::MAX,
            5e-324,
            -2.5,
            1e-7,
        ];
        for v in values {
            number(&mut out, &mut buf, v);
            out.push(b' ');
        }
        let want =
            "0.1 9900000000000000.0 1e16 1e21 -2.5e300 1.7976931348623157e308 5e-324 -2.5 1e-7 ";
        assert_eq!(String::from_utf8_lossy(&out), want);
        for v in values {
            let mut one = Vec::new();
            number(&mut one, &mut buf, v);
            let back: f64 = String::from_utf8_lossy(&one).parse().unwrap_or(f64::NAN);
            assert_eq!(back.to_bits(), v.to_bits(), "{v} does not round-trip");
        }
    }

    #[test]
    fn encode_json_string_escapes() {
        let mut out = Vec::new();
        json_string(&mut out, b"a\"\\\n\x01");
        assert_eq!(out, b"\"a\\\"\\\\\\n\\u0001\"");
    }
}
