//! The closed-form suite: every quantity of `black/greeks.csv` against the kernel.

use crate::cases::black::GreeksCase;
use crate::certify::{show, Worst};
use crate::tolerance;

/// The fifteen quantities in table order.
pub const QUANTITIES: [&str; 15] = [
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

/// Measures every quantity of every case.
///
/// A case the kernel refuses counts as an infinite error on every quantity.
pub fn measure_greeks(cases: &[GreeksCase]) -> GreeksOutcome {
    let mut expected = Vec::new();
    let mut worst: Vec<Worst> = QUANTITIES
        .iter()
        .map(|q| Worst::new(q, tolerance::for_quantity(q).limit))
        .collect();
    for case in cases {
        let inputs = case.inputs();
        let got = calor::greeks(&inputs.contract(), &inputs.market(), inputs.vol);
        let reference = case.reference().named();
        for (w, (name, want)) in worst.iter_mut().zip(reference) {
            let (units, actual) = match &got {
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
                    (tolerance::units(actual, want, case.kappa, scale), actual)
                }
                Err(_) => (f64::INFINITY, f64::NAN),
            };
            if let Some(x) = tolerance::expected_failure(&case.id, name) {
                expected.push((x, units));
                continue;
            }
            w.record(units, &case.id, || {
                format!(
                    "{:?} expected {} got {}{}",
                    inputs,
                    show(want),
                    show(actual),
                    got.err().map(|e| format!(" error {e}")).unwrap_or_default()
                )
            });
        }
    }
    GreeksOutcome { worst, expected }
}
