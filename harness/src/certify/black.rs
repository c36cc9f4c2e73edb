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

/// Measures every quantity of every case; one [`Worst`] per quantity, in table order.
///
/// A case the kernel refuses counts as an infinite error on every quantity.
pub fn measure_greeks(cases: &[GreeksCase]) -> Vec<Worst> {
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
    worst
}
