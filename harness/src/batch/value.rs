//! Valuing one decoded row: the closed form for European rows, the kernel's
//! grid for American ones.

use std::fmt;

use calor::GridSpec;

use super::decode::{decode_row, Header, Quote, Row, RowError, Style};

/// The `f64` workspace of one American valuation on [`GridSpec::AMERICAN`]
/// (the grid of `calor::american_price`), kept on the stack.
const AMERICAN_WORKSPACE: usize = match GridSpec::AMERICAN.workspace_len() {
    Some(n) => n,
    None => 0,
};

/// Why a row has no values.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Failure {
    /// The row could not be decoded.
    Decode(RowError),
    /// The kernel refused the row's inputs.
    Kernel(calor::Error),
    /// A premium on an American row: implying an American volatility is not offered.
    AmericanImplied,
}

impl fmt::Display for Failure {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Failure::Decode(e) => e.fmt(f),
            Failure::Kernel(e) => e.fmt(f),
            Failure::AmericanImplied => {
                f.write_str("premium: implied volatility is offered for european rows only")
            }
        }
    }
}

/// The computed part of one output row.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct Outcome {
    /// Price and the fourteen Greeks in the order of [`calor::Greeks::named`];
    /// `None` where the row has no such value.
    pub values: [Option<f64>; 15],
    /// The implied volatility (premium books only).
    pub implied_vol: Option<f64>,
    /// `None` for status `ok`.
    pub failure: Option<Failure>,
}

/// Decodes and values one record; never fails, a bad row carries its failure.
pub fn value_record(header: &Header, record: &csv::ByteRecord) -> Outcome {
    let line = record.position().map_or(0, csv::Position::line);
    match decode_row(header, record, line) {
        Ok(row) => value_row(&row, header.quote),
        Err(e) => failed(Failure::Decode(e)),
    }
}

/// Values a decoded row: `quote` says whether its number is a vol or a premium.
///
/// European rows get the price and all fifteen Greeks from `calor::greeks`
/// (at the implied volatility for a premium). American rows get price, delta
/// and gamma from `calor::grid_value` on `GridSpec::AMERICAN`, the grid and
/// price of `calor::american_price`; their other Greeks stay empty.
pub fn value_row(row: &Row, quote: Quote) -> Outcome {
    let (contract, market) = (&row.contract, &row.market);
    match (row.style, quote) {
        (Style::European, _) => {
            let vol = match quote {
                Quote::Vol => row.quote,
                Quote::Premium => match calor::implied_vol(contract, market, row.quote) {
                    Ok(vol) => vol,
                    Err(e) => return failed(Failure::Kernel(e)),
                },
            };
            match calor::greeks(contract, market, vol) {
                Ok(g) => Outcome {
                    values: g.named().map(|(_, v)| Some(v)),
                    implied_vol: (quote == Quote::Premium).then_some(vol),
                    failure: None,
                },
                Err(e) => failed(Failure::Kernel(e)),
            }
        }
        (Style::American, Quote::Vol) => {
            let mut workspace = [0.0; AMERICAN_WORKSPACE];
            match calor::grid_value(
                contract,
                market,
                row.quote,
                &GridSpec::AMERICAN,
                &mut workspace,
            ) {
                Ok(v) => {
                    let mut values = [None; 15];
                    values[0] = Some(v.price);
                    values[1] = Some(v.delta);
                    values[2] = Some(v.gamma);
                    Outcome {
                        values,
                        implied_vol: None,
                        failure: None,
                    }
                }
                Err(e) => failed(Failure::Kernel(e)),
            }
        }
        (Style::American, Quote::Premium) => failed(Failure::AmericanImplied),
    }
}

fn failed(failure: Failure) -> Outcome {
    Outcome {
        failure: Some(failure),
        ..Outcome::default()
    }
}
