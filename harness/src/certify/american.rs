//! The American suites: `calor::american_price` against the binomial
//! references of `american/references.csv` and the published values of
//! `american/published.csv`.

use crate::cases::american::AmericanCase;
use crate::certify::region::regions_of;
use crate::certify::show;
use crate::certify::tally::Tally;
use crate::tolerance;

/// Checks every case of one American table under `suite`.
///
/// `price` is |american_price − reference| / K against [`tolerance::AMERICAN`];
/// a row with a `printed` value is also checked to its printed digits
/// (`printed`, [`tolerance::PRINTED`]). A refusal is an infinite error.
pub fn check_american(suite: &'static str, cases: &[AmericanCase], tally: &mut Tally) {
    for case in cases {
        let inputs = case.inputs();
        let regions = regions_of(&inputs);
        let got = calor::american_price(&inputs.contract(), &inputs.market(), inputs.vol);
        let (actual, refused) = match got {
            Ok(v) => (v, String::new()),
            Err(e) => (f64::NAN, format!(" error {e}")),
        };
        let error = (actual - case.reference).abs() / case.strike;
        tally.record(
            suite,
            "price",
            &case.id,
            &regions,
            error,
            tolerance::AMERICAN.limit,
            || {
                format!(
                    "{inputs:?} expected {} (±{:e}) got {}{refused}",
                    show(case.reference),
                    case.reference_error,
                    show(actual)
                )
            },
        );
        if let (Some(printed), Some(decimals)) = (case.printed, case.printed_decimals) {
            let half = 0.5 * 10f64.powi(-decimals);
            tally.record(
                suite,
                "printed",
                &case.id,
                &regions,
                (actual - printed).abs() / half,
                tolerance::PRINTED.limit,
                || {
                    format!(
                        "{inputs:?} printed {printed} ({decimals} decimals) got {}{refused}",
                        show(actual)
                    )
                },
            );
        }
    }
}
