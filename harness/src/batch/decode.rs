//! The CSV side of `calor batch`: the header's column map and the decoder of
//! one row into the kernel's inputs.
//!
//! Both are plain functions of bytes so that the fuzz target `batch_decode`
//! and the replay test call exactly what the command runs.

use std::fmt;

use calor::{Contract, Kind, Market};
use csv::ByteRecord;

/// The UTF-8 byte-order mark, stripped from the first header cell.
const BOM: &[u8] = b"\xEF\xBB\xBF";

/// The columns the batch writes after the input's own, in this order, before
/// `implied_vol` (premium books only) and `status`.
pub const GREEK_COLUMNS: [&str; 15] = calor::Greeks::NAMES;

/// Whether a book gives volatilities to value at or premiums to imply from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Quote {
    /// A `vol` column: value each option at its volatility.
    Vol,
    /// A `premium` column: imply the volatility, then value at it.
    Premium,
}

/// European or American exercise, from the optional `style` column.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Style {
    /// Exercise at expiry only (the default).
    European,
    /// Exercise at any time up to expiry.
    American,
}

/// Where each known column sits in a row; found once, from the header.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Header {
    /// The header cells as given (the first one without a byte-order mark).
    pub names: Vec<String>,
    /// Volatilities or premiums.
    pub quote: Quote,
    kind: usize,
    spot: usize,
    strike: usize,
    expiry: usize,
    rate: usize,
    quote_column: usize,
    style: Option<usize>,
    dividend_yield: Option<usize>,
}

/// Why a header cannot start a batch: the run stops before any row (exit code 2).
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum HeaderError {
    /// The input has no header row at all.
    Empty,
    /// A header cell is not UTF-8.
    NotUtf8 {
        /// The 1-based position of the cell.
        column: usize,
    },
    /// A required column is absent.
    Missing {
        /// Its name.
        column: &'static str,
    },
    /// Both `vol` and `premium` are present.
    BothQuotes,
    /// Neither `vol` nor `premium` is present.
    NoQuote,
    /// A column name appears twice.
    Duplicate {
        /// Its name.
        column: String,
    },
    /// An input column has the name of an output column.
    Reserved {
        /// Its name.
        column: String,
    },
}

impl fmt::Display for HeaderError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            HeaderError::Empty => f.write_str("header: the input is empty, expected a header row"),
            HeaderError::NotUtf8 { column } => {
                write!(f, "header: column {column} is not valid UTF-8")
            }
            HeaderError::Missing { column } => {
                write!(f, "{column}: required column missing from the header")
            }
            HeaderError::BothQuotes => f.write_str(
                "vol, premium: both columns present; give exactly one (vol to value, premium to imply)",
            ),
            HeaderError::NoQuote => f.write_str(
                "vol, premium: neither column present; give exactly one (vol to value, premium to imply)",
            ),
            HeaderError::Duplicate { column } => write!(f, "{column}: duplicate column"),
            HeaderError::Reserved { column } => {
                write!(f, "{column}: input column has the name of an output column")
            }
        }
    }
}

impl std::error::Error for HeaderError {}

impl Header {
    /// Maps the header row; column names are matched exactly, after trimming
    /// spaces and tabs, in any order; unknown columns are passed through.
    ///
    /// # Errors
    /// [`HeaderError`] for a header the batch cannot run on.
    ///
    /// # Examples
    /// ```
    /// use calor_harness::batch::decode::{Header, Quote};
    /// let h = Header::new(&csv::ByteRecord::from(vec!["id", "kind", "spot", "strike", "expiry", "rate", "vol"]))?;
    /// assert_eq!(h.quote, Quote::Vol);
    /// # Ok::<(), calor_harness::batch::decode::HeaderError>(())
    /// ```
    pub fn new(record: &ByteRecord) -> Result<Header, HeaderError> {
        if record.is_empty() {
            return Err(HeaderError::Empty);
        }
        let mut names = Vec::with_capacity(record.len());
        for (i, cell) in record.iter().enumerate() {
            let cell = if i == 0 {
                cell.strip_prefix(BOM).unwrap_or(cell)
            } else {
                cell
            };
            let name = std::str::from_utf8(cell)
                .map_err(|_| HeaderError::NotUtf8 { column: i + 1 })?
                .trim_matches([' ', '\t']);
            if names.iter().any(|n: &String| n == name) {
                return Err(HeaderError::Duplicate {
                    column: name.to_owned(),
                });
            }
            if GREEK_COLUMNS.contains(&name) || name == "implied_vol" || name == "status" {
                return Err(HeaderError::Reserved {
                    column: name.to_owned(),
                });
            }
            names.push(name.to_owned());
        }
        let find = |column: &str| names.iter().position(|n| n == column);
        let required = |column: &'static str| find(column).ok_or(HeaderError::Missing { column });
        let (quote, quote_column) = match (find("vol"), find("premium")) {
            (Some(_), Some(_)) => return Err(HeaderError::BothQuotes),
            (None, None) => return Err(HeaderError::NoQuote),
            (Some(i), None) => (Quote::Vol, i),
            (None, Some(i)) => (Quote::Premium, i),
        };
        Ok(Header {
            kind: required("kind")?,
            spot: required("spot")?,
            strike: required("strike")?,
            expiry: required("expiry")?,
            rate: required("rate")?,
            style: find("style"),
            dividend_yield: find("dividend_yield"),
            quote,
            quote_column,
            names,
        })
    }

    /// The number of cells every row must have.
    pub fn len(&self) -> usize {
        self.names.len()
    }

    /// Whether the header has no columns (never true for a [`Header::new`] result).
    pub fn is_empty(&self) -> bool {
        self.names.is_empty()
    }
}

/// One decoded row: the kernel's inputs, the exercise style and the quote.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Row {
    /// Kind, strike, expiry.
    pub contract: Contract,
    /// Spot, rate, dividend yield.
    pub market: Market,
    /// European or American.
    pub style: Style,
    /// The `vol` or `premium` cell, as [`Header::quote`] says.
    pub quote: f64,
}

/// What is wrong with a cell.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CellProblem {
    /// Empty (or only spaces) in a required column.
    Empty,
    /// Not a decimal number (`nan` and `inf` are numbers: the kernel refuses them).
    NotANumber,
    /// `kind` other than call or put.
    UnknownKind,
    /// `style` other than european or american.
    UnknownStyle,
}

/// Why a row cannot be decoded; the batch reports it in the row's status and goes on.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RowError {
    /// The row does not have as many cells as the header.
    CellCount {
        /// The 1-based line the row starts on.
        line: u64,
        /// Cells in the header.
        expected: usize,
        /// Cells in the row.
        found: usize,
    },
    /// Some cell of the row is not valid UTF-8.
    NotUtf8 {
        /// The 1-based line the row starts on.
        line: u64,
    },
    /// A cell of a known column is unusable.
    Cell {
        /// The column.
        field: &'static str,
        /// What is wrong with it.
        problem: CellProblem,
    },
}

impl fmt::Display for RowError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            RowError::CellCount {
                line,
                expected,
                found,
            } => write!(f, "line {line}: expected {expected} cells, found {found}"),
            RowError::NotUtf8 { line } => write!(f, "line {line}: not valid UTF-8"),
            RowError::Cell { field, problem } => {
                let reason = match problem {
                    CellProblem::Empty => "empty",
                    CellProblem::NotANumber => "not a number",
                    CellProblem::UnknownKind => "expected call or put",
                    CellProblem::UnknownStyle => "expected european or american",
                };
                write!(f, "{field}: {reason}")
            }
        }
    }
}

impl std::error::Error for RowError {}

/// Decodes one data row against `header`; `line` is where the row starts, for messages.
///
/// Cells are trimmed of spaces and tabs. An empty `style` or `dividend_yield`
/// takes its default (european, 0). Numbers are anything `f64::from_str`
/// reads, so `nan`, `inf` and `1e999` (infinite) reach the kernel, which
/// refuses them naming the field. Fields are checked in the order kind,
/// style, spot, strike, expiry, rate, dividend_yield, then vol or premium.
///
/// # Errors
/// [`RowError`]: the wrong number of cells, invalid UTF-8 anywhere in the
/// row, or an empty, non-numeric or unknown value in a known column.
///
/// # Examples
/// ```
/// use calor_harness::batch::decode::{decode_row, Header};
/// use csv::ByteRecord;
/// let header = Header::new(&ByteRecord::from(vec!["kind", "spot", "strike", "expiry", "rate", "vol"]))?;
/// let row = decode_row(&header, &ByteRecord::from(vec!["put", "42", "40", "0.5", "0.1", "0.2"]), 2)?;
/// assert_eq!(row.market.spot, 42.0);
/// let bad = decode_row(&header, &ByteRecord::from(vec!["put", "42", "", "0.5", "0.1", "0.2"]), 3);
/// assert_eq!(bad.unwrap_err().to_string(), "strike: empty");
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn decode_row(header: &Header, record: &ByteRecord, line: u64) -> Result<Row, RowError> {
    if record.len() != header.len() {
        return Err(RowError::CellCount {
            line,
            expected: header.len(),
            found: record.len(),
        });
    }
    let Ok(text) = std::str::from_utf8(record.as_slice()) else {
        return Err(RowError::NotUtf8 { line });
    };
    let cell = |i: usize| trim(record.get(i).unwrap_or_default());
    // A number cell as text, sliced from the row checked above; `None` where
    // the cell's bounds split a character (then it cannot be a number).
    let number_cell = |i: usize| {
        record.range(i).and_then(|r| text.get(r)).map(|c| {
            let (start, end) = blank_trimmed(c.as_bytes());
            c.get(start..end).unwrap_or_default()
        })
    };
    let kind = match cell(header.kind) {
        b"" => return Err(problem("kind", CellProblem::Empty)),
        k if k.eq_ignore_ascii_case(b"call") => Kind::Call,
        k if k.eq_ignore_ascii_case(b"put") => Kind::Put,
        _ => return Err(problem("kind", CellProblem::UnknownKind)),
    };
    let style = match header.style.map(cell) {
        None | Some(b"") => Style::European,
        Some(s) if s.eq_ignore_ascii_case(b"european") => Style::European,
        Some(s) if s.eq_ignore_ascii_case(b"american") => Style::American,
        Some(_) => return Err(problem("style", CellProblem::UnknownStyle)),
    };
    let spot = number(number_cell(header.spot), "spot")?;
    let strike = number(number_cell(header.strike), "strike")?;
    let expiry = number(number_cell(header.expiry), "expiry")?;
    let rate = number(number_cell(header.rate), "rate")?;
    let dividend_yield = match header.dividend_yield.map(number_cell) {
        None | Some(Some("")) => 0.0,
        Some(text) => number(text, "dividend_yield")?,
    };
    let quote_name = match header.quote {
        Quote::Vol => "vol",
        Quote::Premium => "premium",
    };
    let quote = number(number_cell(header.quote_column), quote_name)?;
    Ok(Row {
        contract: Contract {
            kind,
            strike,
            expiry,
        },
        market: Market {
            spot,
            rate,
            dividend_yield,
        },
        style,
        quote,
    })
}

const fn problem(field: &'static str, problem: CellProblem) -> RowError {
    RowError::Cell { field, problem }
}

/// A number cell (trimmed, `None` if not text by itself); empty and
/// non-numeric cells are errors naming `field`.
fn number(text: Option<&str>, field: &'static str) -> Result<f64, RowError> {
    match text {
        Some("") => Err(problem(field, CellProblem::Empty)),
        Some(text) => text
            .parse::<f64>()
            .map_err(|_| problem(field, CellProblem::NotANumber)),
        None => Err(problem(field, CellProblem::NotANumber)),
    }
}

/// `cell` without leading and trailing spaces and tabs.
fn trim(cell: &[u8]) -> &[u8] {
    let (start, end) = blank_trimmed(cell);
    cell.get(start..end).unwrap_or_default()
}

/// The bounds of `cell` without its leading and trailing spaces and tabs
/// (ASCII bytes, so the bounds of a text cell stay on character boundaries).
fn blank_trimmed(cell: &[u8]) -> (usize, usize) {
    let blank = |b: &u8| *b == b' ' || *b == b'\t';
    let start = cell.iter().position(|b| !blank(b)).unwrap_or(cell.len());
    let end = cell
        .iter()
        .rposition(|b| !blank(b))
        .map_or(start, |i| i + 1);
    (start, end)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn header(names: &[&str]) -> Result<Header, HeaderError> {
        Header::new(&ByteRecord::from(names.to_vec()))
    }

    #[test]
    fn decode_trim_blanks() {
        assert_eq!(trim(b"  1.5\t"), b"1.5");
        assert_eq!(trim(b"   "), b"");
        assert_eq!(trim(b""), b"");
    }

    #[test]
    fn decode_header_strips_bom() {
        let h = header(&["\u{feff}kind", "spot", "strike", "expiry", "rate", "vol"]);
        assert_eq!(h.map(|h| h.names[0].clone()), Ok("kind".to_owned()));
    }

    #[test]
    fn decode_header_names_missing_column() {
        let h = header(&["kind", "spot", "expiry", "rate", "vol"]);
        assert_eq!(h, Err(HeaderError::Missing { column: "strike" }));
    }
}
