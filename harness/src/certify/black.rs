//! The closed-form suite: every quantity of `black/greeks.csv` against the kernel.

use crate::cases::black::GreeksCase;
use crate::certify::{show, Worst};
use crate::tolerance;

/// The fifteen quantities in table order.
pub const QUANTITIES: [&str; 15] = calor::Greeks::NAMES;

/// The outcome of the closed-form suite.
#[derive(Debug, Clone)]
pub struct GreeksOutcome {
    /// One [`Worst`] per quantity, in table order, over the cases that are not
    /// expected failures.
    pub worst: Vec<Worst>,
    /// Expected failures with their measured error in tolerance units.
    pub expected: Vec<(&'static tolerance::ExpectedFailure, f64)>,
}

impl GreeksOutcome {
    /// Expected failures that now pass: each must be taken off the list.
    pub fn unexpected_passes(&self) -> Vec<&'static tolerance::ExpectedFailure> {
        self.expected
            .iter()
            .filter(|(x, units)| *units <= tolerance::for_quantity(x.quantity).limit)
            .map(|(x, _)| *x)
            .collect()
    }

    /// True when every quantity is within tolerance and every expected failure still fails.
    pub fn passes(&self) -> bool {
        self.worst.iter().all(Worst::passes) && self.unexpected_passes().is_empty()
    }
}

/// One quantity of one case, as measured by [`visit_greeks`].
#[derive(Debug, Clone, Copy)]
pub struct GreekError {
    /// The quantity, as named in the table.
    pub quantity: &'static str,
    /// Error in units of ε·(1+κ)·(|reference| + natural scale); infinite when refused.
    pub units: f64,
    /// The reference value.
    pub expected: f64,
    /// The kernel's value (NaN when refused).
    pub actual: f64,
    /// The kernel's refusal, if it refused.
    pub refused: Option<calor::Error>,
}

/// Measures every quantity of every case and hands each measurement to `visit`.
///
/// A case the kernel refuses counts as an infinite error on every quantity.
pub fn visit_greeks(cases: &[GreeksCase], mut visit: impl FnMut(&GreeksCase, GreekError)) {
    for case in cases {
        let inputs = case.inputs();
        let got = calor::greeks(&inputs.contract(), &inputs.market(), inputs.vol);
        let reference = case.reference().named();
        for (name, want) in reference {
            let measured = match &got {
                Ok(g) => {
                    let actual = g
                        .named()
                        .iter()
                        .find(|(n, _)| *n == name)
                        .map_or(f64::NAN, |p| p.1);
                    let scale = tolerance::natural_scale(
                        name,
                        case.price,
                        inputs.spot,
                        inputs.vol,
                        inputs.expiry,
                    )
                    .unwrap_or(f64::NAN);
                    GreekError {
                        quantity: name,
                        units: tolerance::units(actual, want, case.kappa, scale),
                        expected: want,
                        actual,
                        refused: None,
                    }
                }
                Err(e) => GreekError {
                    quantity: name,
                    units: f64::INFINITY,
                    expected: want,
                    actual: f64::NAN,
                    refused: Some(*e),
                },
            };
            visit(case, measured);
        }
    }
}

/// Measures every quantity of every case.
///
/// A case the kernel refuses counts as an infinite error on every quantity.
pub fn measure_greeks(cases: &[GreeksCase]) -> GreeksOutcome {
    let mut expected = Vec::new();
    let mut worst: Vec<Worst> = QUANTITIES
        .iter()
        .map(|q| Worst::new(q, tolerance::for_quantity(q).limit))
        .collect();
    visit_greeks(cases, |case, m| {
        if let Some(x) = tolerance::expected_failure(&case.id, m.quantity) {
            expected.push((x, m.units));
            return;
        }
        let Some(w) = worst.iter_mut().find(|w| w.quantity == m.quantity) else {
            return;
        };
        w.record(m.units, &case.id, || {
            format!(
                "{:?} expected {} got {}{}",
                case.inputs(),
                show(m.expected),
                show(m.actual),
                m.refused.map(|e| format!(" error {e}")).unwrap_or_default()
            )
        });
    });
    GreeksOutcome { worst, expected }
}
