//! Properties of the implied-volatility solver.

use calor::{greeks, implied_vol, price, solve_implied_vol, Contract, Error, Field, Kind, Market};
use proptest::prelude::*;

/// (spot, strike, expiry, rate, dividend yield, vol) over the contract's domain.
fn inputs() -> impl Strategy<Value = (f64, f64, f64, f64, f64, f64)> {
    (
        -3.0f64..6.0,
        -1.5f64..1.5,
        -3.94f64..1.7,
        -0.05f64..0.30,
        0.0f64..0.20,
        -3.0f64..0.699,
    )
        .prop_map(|(ls, lk, lt, r, q, lv)| {
            let s = 10f64.powf(ls);
            (s, s * lk.exp(), 10f64.powf(lt), r, q, 10f64.powf(lv))
        })
}

fn legs(s: f64, k: f64, t: f64, r: f64, q: f64) -> (f64, f64) {
    (s * (-q * t).exp(), k * (-r * t).exp())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(4096))]

    #[test]
    fn prop_implied_round_trip((s, k, t, r, q, v) in inputs(), call in any::<bool>()) {
        let kind = if call { Kind::Call } else { Kind::Put };
        let c = Contract { kind, strike: k, expiry: t };
        let m = Market { spot: s, rate: r, dividend_yield: q };
        let g = greeks(&c, &m, v).unwrap();
        // Only where the premium determines σ to better than a millionth.
        if g.vega * v < 1e-6 * g.price || g.price < 1e-250 {
            return Ok(());
        }
        let got = implied_vol(&c, &m, g.price).unwrap();
        prop_assert!((got - v).abs() <= 1e-6 * v, "σ {v} → {got}");
    }

    #[test]
    fn prop_implied_increasing_in_premium(
        (s, k, t, r, q, v) in inputs(), bump in 1.0001f64..1.5, call in any::<bool>(),
    ) {
        let kind = if call { Kind::Call } else { Kind::Put };
        let c = Contract { kind, strike: k, expiry: t };
        let m = Market { spot: s, rate: r, dividend_yield: q };
        let (p1, p2) = (price(&c, &m, v).unwrap(), price(&c, &m, v * bump).unwrap());
        if let (Ok(a), Ok(b)) = (implied_vol(&c, &m, p1), implied_vol(&c, &m, p2)) {
            prop_assert!(p1 > p2 || a <= b, "premiums {p1:e} < {p2:e} gave vols {a} > {b}");
        }
    }

    #[test]
    fn prop_implied_parity_same_vol((s, k, t, r, q, v) in inputs()) {
        let m = Market { spot: s, rate: r, dividend_yield: q };
        let call = Contract { kind: Kind::Call, strike: k, expiry: t };
        let put = Contract { kind: Kind::Put, ..call };
        let g = greeks(&call, &m, v).unwrap();
        if g.vega * v < 1e-4 * g.price || g.price < 1e-250 {
            return Ok(());
        }
        let (sq, kr) = legs(s, k, t, r, q);
        let put_premium = g.price - (sq - kr);
        if let (Ok(a), Ok(b)) = (implied_vol(&call, &m, g.price), implied_vol(&put, &m, put_premium)) {
            // The two premiums differ by roundings of the forward; both vols sit within
            // the conditioning of the call premium.
            let tol = 64.0 * f64::EPSILON * (sq + kr + g.price) / g.vega + 8.0 * f64::EPSILON * v;
            prop_assert!((a - b).abs() <= tol, "call {a} put {b}");
        }
    }

    #[test]
    fn prop_implied_out_of_bounds_refused((s, k, t, r, q, _v) in inputs(), f in 0.0f64..1.0) {
        let m = Market { spot: s, rate: r, dividend_yield: q };
        let (sq, kr) = legs(s, k, t, r, q);
        for (kind, low, high) in [(Kind::Call, (sq - kr).max(0.0), sq), (Kind::Put, (kr - sq).max(0.0), kr)] {
            let c = Contract { kind, strike: k, expiry: t };
            prop_assert_eq!(implied_vol(&c, &m, low * f), Err(Error::PremiumBelowIntrinsic));
            prop_assert_eq!(implied_vol(&c, &m, high * (1.0 + f)), Err(Error::PremiumAboveMaximum));
        }
    }
}

#[test]
fn edge_implied_bad_inputs() {
    let c = Contract {
        kind: Kind::Call,
        strike: 100.0,
        expiry: 1.0,
    };
    let m = Market {
        spot: 100.0,
        rate: 0.01,
        dividend_yield: 0.0,
    };
    assert_eq!(
        implied_vol(&c, &m, f64::NAN),
        Err(Error::NotFinite {
            field: Field::Premium
        })
    );
    assert_eq!(
        implied_vol(&c, &m, -1.0),
        Err(Error::Negative {
            field: Field::Premium
        })
    );
    let at_expiry = Contract { expiry: 0.0, ..c };
    assert_eq!(
        implied_vol(&at_expiry, &m, 5.0),
        Err(Error::NotPositive {
            field: Field::Expiry
        })
    );
    let bad_spot = Market {
        spot: f64::INFINITY,
        ..m
    };
    assert_eq!(
        implied_vol(&c, &bad_spot, 5.0),
        Err(Error::NotFinite { field: Field::Spot })
    );
    assert_eq!(implied_vol(&c, &m, 0.0), Err(Error::PremiumBelowIntrinsic));
}

#[test]
fn ref_implied_textbook_hull() {
    // J.C. Hull, Options, Futures, and Other Derivatives, 9th ed. (Pearson, 2015), ch. 15,
    // "Implied volatilities" text example (from memory): printed 0.235; solved with
    // mpmath at 40 digits: 0.2345129139976437865484318662724601053262.
    let c = Contract {
        kind: Kind::Call,
        strike: 20.0,
        expiry: 0.25,
    };
    let m = Market {
        spot: 21.0,
        rate: 0.1,
        dividend_yield: 0.0,
    };
    let r = solve_implied_vol(&c, &m, 1.875).unwrap();
    assert!((r.vol - 0.234_512_913_997_643_8).abs() < 1e-15, "{}", r.vol);
    assert!(r.iterations <= calor::MAX_ITERATIONS);
}

#[test]
fn edge_implied_inexact_inflection_value_keeps_the_guess_positive() {
    // Found by the implied_vol fuzz target: legs equal to rounding, |x| ≈ 6e-33
    // and a premium of 9e-18 of the legs. b_c then carries a rounding error
    // larger than its distance from the tangent's root at zero, and the
    // tangent guess was negative: the solver returned a vol of −9.3e137.
    let c = Contract {
        kind: Kind::Call,
        strike: 3.644_696_722_363_173_4e88,
        expiry: 1.280_977_553_43e-312,
    };
    let m = Market {
        spot: 3.644_696_722_363_173_4e88,
        rate: 4.538_291_337_560_359e279,
        dividend_yield: 7.142_483_541_982_407e-251,
    };
    let premium = 3.330_324_999_909_473e71;
    match implied_vol(&c, &m, premium) {
        Ok(vol) => assert!(vol.is_finite() && vol >= 0.0, "vol {vol}"),
        Err(e) => assert_eq!(e, Error::Overflow),
    }
}
