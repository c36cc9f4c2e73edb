//! Reading the reference tables of `reference-cases/`.
//!
//! Every table is CSV with a header row. A file that cannot be read or a cell
//! that does not parse is a [`CaseError`] naming the file, the line and the
//! column, so that `calor certify` can say exactly what is broken.

pub mod american;
pub mod black;
pub mod textbook;

use std::fmt;
use std::path::{Path, PathBuf};

use serde::de::DeserializeOwned;

/// A reference file that could not be read.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct CaseError {
    /// The file.
    pub file: PathBuf,
    /// 1-based line number, when the problem is in a line.
    pub line: Option<u64>,
    /// The column, when the problem is in a cell.
    pub field: Option<String>,
    /// What is wrong.
    pub reason: String,
}

impl fmt::Display for CaseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}", self.file.display())?;
        if let Some(line) = self.line {
            write!(f, ", line {line}")?;
        }
        if let Some(field) = &self.field {
            write!(f, ", field {field}")?;
        }
        write!(f, ": {}", self.reason)
    }
}

impl std::error::Error for CaseError {}

/// Reads every row of a CSV table into `T`, naming file, line and column on failure.
///
/// # Errors
/// [`CaseError`] when the file is missing, the header is unreadable, a row has
/// the wrong number of cells or a cell does not parse.
pub fn read_table<T: DeserializeOwned>(path: &Path) -> Result<Vec<T>, CaseError> {
    let fail = |line: Option<u64>, field: Option<String>, reason: String| CaseError {
        file: path.to_path_buf(),
        line,
        field,
        reason,
    };
    let mut reader = csv::Reader::from_path(path).map_err(|e| fail(None, None, e.to_string()))?;
    let headers = reader
        .headers()
        .map_err(|e| fail(Some(1), None, e.to_string()))?
        .clone();
    let mut rows = Vec::new();
    for record in reader.records() {
        let record = record.map_err(|e| {
            let line = e.position().map(csv::Position::line);
            fail(line, None, e.to_string())
        })?;
        let line = record.position().map(csv::Position::line);
        let row = record
            .deserialize(Some(&headers))
            .map_err(|e| match e.kind() {
                csv::ErrorKind::Deserialize { err, .. } => {
                    let field = err
                        .field()
                        .and_then(|i| headers.get(usize::try_from(i).ok()?))
                        .map(str::to_owned);
                    let reason = match err.kind() {
                        csv::DeserializeErrorKind::ParseFloat(p) => format!("not a number ({p})"),
                        other => other.to_string(),
                    };
                    fail(line, field, reason)
                }
                _ => fail(line, None, e.to_string()),
            })?;
        rows.push(row);
    }
    if rows.is_empty() {
        return Err(fail(None, None, "the table has no rows".to_owned()));
    }
    Ok(rows)
}

/// The `reference-cases/` folder of this checkout.
pub fn default_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../reference-cases")
}
