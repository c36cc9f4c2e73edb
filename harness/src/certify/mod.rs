//! Measuring the kernel against the reference tables, in units of tolerance.

pub mod american;
pub mod black;
pub mod command;
pub mod error_map;
pub mod heat;
pub mod identity;
pub mod implied;
pub mod ladder;
pub mod near_expiry;
pub mod region;
pub mod report;
pub mod sweep;
pub mod tally;
pub mod textbook;

use std::fmt;

/// The largest error seen for one quantity, with the case that produced it.
#[derive(Debug, Clone, PartialEq)]
pub struct Worst {
    /// The quantity (price, delta, ...).
    pub quantity: &'static str,
    /// Cases measured.
    pub cases: usize,
    /// Largest error in units of ε·(1+κ)·scale.
    pub units: f64,
    /// The tolerance limit in the same units.
    pub limit: f64,
    /// Id of the worst case.
    pub case_id: String,
    /// Inputs, expected and actual of the worst case, for the report.
    pub detail: String,
}

impl Worst {
    /// An empty tracker.
    pub fn new(quantity: &'static str, limit: f64) -> Self {
        Worst {
            quantity,
            cases: 0,
            units: 0.0,
            limit,
            case_id: String::new(),
            detail: String::new(),
        }
    }

    /// Records one measurement; `detail` is only built when it is the new worst.
    pub fn record(&mut self, units: f64, case_id: &str, detail: impl FnOnce() -> String) {
        self.cases += 1;
        // NaN counts as the worst possible error.
        if units.is_nan() || units > self.units || self.case_id.is_empty() {
            self.units = if units.is_nan() { f64::INFINITY } else { units };
            case_id.clone_into(&mut self.case_id);
            self.detail = detail();
        }
    }

    /// True when the worst error is within the limit.
    pub fn passes(&self) -> bool {
        self.units <= self.limit
    }
}

impl fmt::Display for Worst {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "{:<13} {:>6} cases  worst {:>9.3} / {:<5} {}  ({}: {})",
            self.quantity,
            self.cases,
            self.units,
            self.limit,
            if self.passes() { "pass" } else { "FAIL" },
            self.case_id,
            self.detail
        )
    }
}

/// A value in decimal and in hex bits, as failure reports show it.
pub fn show(x: f64) -> String {
    format!("{x:e} ({:#018x})", x.to_bits())
}
