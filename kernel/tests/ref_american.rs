//! `american_price` on its default grid against the binomial references of
//! `reference-cases/american/` (CRR tree with a Black–Scholes last step and
//! Richardson extrapolation, 10,000 and 20,000 steps; see its README).

use std::path::Path;

use calor::{american_price, Contract, Kind, Market};

/// The promise of `american_price`: |error| ≤ 1e-6·K, i.e. 1e-4 per 100 of strike.
const PER_STRIKE: f64 = 1e-6;

/// One row of a reference table.
struct Case {
    id: String,
    contract: Contract,
    market: Market,
    vol: f64,
    reference: f64,
    reference_error: f64,
}

/// Reads a table by hand: the kernel has no CSV dependency and the format is plain.
fn read(name: &str) -> Vec<Case> {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../reference-cases/american")
        .join(name);
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let mut lines = text.lines();
    let header: Vec<&str> = lines.next().expect("a header").split(',').collect();
    let column = |name: &str| {
        header
            .iter()
            .position(|h| *h == name)
            .unwrap_or_else(|| panic!("column {name}"))
    };
    let (id, kind) = (column("id"), column("kind"));
    let numbers = [
        "spot",
        "strike",
        "expiry",
        "rate",
        "dividend_yield",
        "vol",
        "reference",
        "reference_error",
    ]
    .map(column);
    lines
        .map(|line| {
            let fields: Vec<&str> = line.split(',').collect();
            let [spot, strike, expiry, rate, dividend_yield, vol, reference, reference_error] =
                numbers.map(|i| {
                    fields[i]
                        .parse::<f64>()
                        .unwrap_or_else(|e| panic!("{line}: {e}"))
                });
            let kind = match fields[kind] {
                "put" => Kind::Put,
                "call" => Kind::Call,
                other => panic!("{line}: kind {other}"),
            };
            Case {
                id: fields[id].to_owned(),
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
                vol,
                reference,
                reference_error,
            }
        })
        .collect()
}

/// The worst |error|/K of `american_price` over `cases`, with the case; fails past the bound.
fn check(cases: &[Case]) -> f64 {
    let mut worst = (0.0, "");
    for case in cases {
        let got = american_price(&case.contract, &case.market, case.vol).expect("a value");
        let error = (got - case.reference).abs() / case.contract.strike;
        assert!(
            case.reference_error <= 0.25 * PER_STRIKE * case.contract.strike,
            "{}: the reference itself is uncertain by {:e}",
            case.id,
            case.reference_error
        );
        if error > worst.0 {
            worst = (error, &case.id);
        }
        assert!(
            error <= PER_STRIKE,
            "{}: {got} against {} is off by {error:e} per unit of strike",
            case.id,
            case.reference
        );
    }
    println!(
        "worst |error|/K = {:.3e} ({}) over {} cases",
        worst.0,
        worst.1,
        cases.len()
    );
    worst.0
}

#[test]
fn ref_american_references() {
    let cases = read("references.csv");
    assert!(cases.len() >= 60, "{} cases", cases.len());
    check(&cases);
}

#[test]
fn ref_american_hull_put_converged() {
    // J. C. Hull, Options, Futures, and Other Derivatives, 9th ed., ch. 21 (from
    // memory): S = K = 50, r = 10 %, σ = 40 %, T = 5/12. Its tree ladder
    // (A01–A05) converges to about 4.2842; the 500-step tree prints 4.283.
    let cases = read("published.csv");
    let hull = cases
        .iter()
        .find(|c| c.id == "hull_put_converged")
        .expect("the Hull row");
    let got = american_price(&hull.contract, &hull.market, hull.vol).expect("a value");
    assert!((got - 4.2842).abs() <= 1e-4, "{got}");
    check(&cases);
}
