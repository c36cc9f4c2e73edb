//! Properties of `american_price` over the box its accuracy is promised on.

use calor::{american_price, price, Contract, Kind, Market};
use proptest::prelude::*;

/// The default grid's accuracy, per unit of strike (see `ref_american`).
const GRID: f64 = 1e-6;

/// (spot, strike, expiry, rate, dividend yield, vol) in the box of the default grid.
fn inputs() -> impl Strategy<Value = (f64, f64, f64, f64, f64, f64)> {
    (
        20.0f64..500.0, // strike
        0.8f64..1.25,   // spot / strike
        0.1f64..2.0,    // expiry
        0.02f64..0.08,  // rate
        0.0f64..0.03,   // dividend yield
        0.1f64..0.6,    // vol
    )
        .prop_map(|(k, m, t, r, q, v)| (k * m, k, t, r, q, v))
}

fn american(kind: Kind, s: f64, k: f64, t: f64, r: f64, q: f64, v: f64) -> f64 {
    let c = Contract {
        kind,
        strike: k,
        expiry: t,
    };
    let m = Market {
        spot: s,
        rate: r,
        dividend_yield: q,
    };
    american_price(&c, &m, v).expect("an American value")
}

fn european(kind: Kind, s: f64, k: f64, t: f64, r: f64, q: f64, v: f64) -> f64 {
    let c = Contract {
        kind,
        strike: k,
        expiry: t,
    };
    let m = Market {
        spot: s,
        rate: r,
        dividend_yield: q,
    };
    price(&c, &m, v).expect("a European value")
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    #[test]
    fn prop_american_put_above_european_and_intrinsic((s, k, t, r, q, v) in inputs()) {
        let a = american(Kind::Put, s, k, t, r, q, v);
        let e = european(Kind::Put, s, k, t, r, q, v);
        prop_assert!(a >= e - GRID * k, "American {a} below European {e}");
        prop_assert!(a >= k - s, "American {a} below intrinsic {}", k - s);
    }

    #[test]
    fn prop_american_call_without_dividend_is_european((s, k, t, r, _q, v) in inputs()) {
        let a = american(Kind::Call, s, k, t, r, 0.0, v);
        let e = european(Kind::Call, s, k, t, r, 0.0, v);
        prop_assert!((a - e).abs() <= GRID * k, "American {a} against European {e}");
    }

    #[test]
    fn prop_american_increasing_in_vol(
        (s, k, t, r, q, v) in inputs(),
        put in any::<bool>(),
    ) {
        let kind = if put { Kind::Put } else { Kind::Call };
        let low = american(kind, s, k, t, r, q, v * 0.95);
        let high = american(kind, s, k, t, r, q, v);
        // Where both are exercised at once they are the payoff up to rounding.
        prop_assert!(high >= low - 1e-12 * k, "{kind:?}: {high} at vol {v} below {low}");
        // Strictly so unless the option is exercised at once at both vols.
        let intrinsic = match kind {
            Kind::Put => k - s,
            Kind::Call => s - k,
        };
        prop_assert!(high > low || low <= intrinsic + 1e-12 * k, "{kind:?}: {high} at vol {v} not above {low}");
    }

    #[test]
    fn prop_american_monotone_convex_in_spot(
        (s, k, t, r, q, v) in inputs(),
        put in any::<bool>(),
    ) {
        let kind = if put { Kind::Put } else { Kind::Call };
        let d = 0.02 * k;
        let [a, b, c] = [s - d, s, s + d].map(|x| american(kind, x, k, t, r, q, v));
        let (up, down) = if put { (a, c) } else { (c, a) };
        // Rising towards the money, by more than the grid's noise.
        prop_assert!(up >= b - GRID * k && b >= down - GRID * k, "{kind:?}: {a} {b} {c}");
        prop_assert!(a + c - 2.0 * b >= -2.0 * GRID * k, "{kind:?} not convex: {a} {b} {c}");
    }
}
