//! Limits, special inputs and refusals of the closed form.

use calor::{greeks, price, Contract, Error, Field, Kind, Market};

fn call(strike: f64, expiry: f64) -> Contract {
    Contract {
        kind: Kind::Call,
        strike,
        expiry,
    }
}

fn put(strike: f64, expiry: f64) -> Contract {
    Contract {
        kind: Kind::Put,
        strike,
        expiry,
    }
}

fn market(spot: f64) -> Market {
    Market {
        spot,
        rate: 0.05,
        dividend_yield: 0.02,
    }
}

#[test]
fn edge_expiry_zero_is_intrinsic() {
    assert_eq!(price(&call(90.0, 0.0), &market(100.0), 0.3), Ok(10.0));
    assert_eq!(price(&put(90.0, 0.0), &market(100.0), 0.3), Ok(0.0));
    assert_eq!(price(&put(110.0, 0.0), &market(100.0), 0.3), Ok(10.0));
    let g = greeks(&call(90.0, 0.0), &market(100.0), 0.3).unwrap();
    assert_eq!((g.delta, g.gamma, g.vega), (1.0, 0.0, 0.0));
}

#[test]
fn edge_vol_zero_is_discounted_forward_intrinsic() {
    let (t, m) = (2.0, market(100.0));
    let expected = 100.0 * (-0.02f64 * t).exp() - 90.0 * (-0.05f64 * t).exp();
    let v = price(&call(90.0, t), &m, 0.0).unwrap();
    assert!((v - expected).abs() <= 4.0 * f64::EPSILON * 100.0);
    assert_eq!(price(&put(90.0, t), &m, 0.0), Ok(0.0));
    let g = greeks(&call(90.0, t), &m, 0.0).unwrap();
    assert_eq!(g.delta, (-0.02f64 * t).exp());
    assert_eq!(g.rho, t * 90.0 * (-0.05f64 * t).exp());
    assert_eq!((g.gamma, g.vega, g.ultima), (0.0, 0.0, 0.0));
    let otm = greeks(&put(90.0, t), &m, 0.0).unwrap();
    assert_eq!(otm, calor::Greeks::default());
}

#[test]
fn edge_limit_at_the_strike_refuses_greeks_only() {
    assert_eq!(price(&call(100.0, 0.0), &market(100.0), 0.2), Ok(0.0));
    assert_eq!(
        greeks(&call(100.0, 0.0), &market(100.0), 0.2),
        Err(Error::SingularAtStrike)
    );
}

#[test]
fn edge_negative_zero_is_zero() {
    // −0 passes the rules for expiry and vol (it is not below 0); the fast
    // check refuses it and the field-by-field check lets it through.
    let m = market(100.0);
    for c in [call(90.0, 1.0), put(110.0, 1.0)] {
        assert_eq!(price(&c, &m, -0.0), price(&c, &m, 0.0));
    }
    assert_eq!(
        price(&call(90.0, -0.0), &m, 0.2),
        price(&call(90.0, 0.0), &m, 0.2)
    );
}

#[test]
fn edge_vanishing_vol_tends_to_the_limit() {
    let m = market(100.0);
    let limit = price(&call(90.0, 1.0), &m, 0.0).unwrap();
    let near = price(&call(90.0, 1.0), &m, 1e-12).unwrap();
    assert_eq!(near, limit);
    let tiny = price(&call(90.0, 1.0), &m, 5e-324).unwrap();
    assert_eq!(tiny, limit);
}

#[test]
fn edge_deep_tail_is_tiny_and_positive() {
    // Strike 1000 standard deviations out: the true price underflows.
    let v = price(&call(1e6, 0.01), &market(100.0), 0.1).unwrap();
    assert!(v == 0.0 || (v > 0.0 && v < 1e-300));
    let p = price(&put(1e-6, 0.01), &market(100.0), 0.1).unwrap();
    assert!((0.0..1e-300).contains(&p));
}

#[test]
fn edge_bad_inputs_name_the_field() {
    let m = market(100.0);
    let nan = f64::NAN;
    let cases = [
        (
            price(&call(100.0, 1.0), &Market { spot: nan, ..m }, 0.2),
            Error::NotFinite { field: Field::Spot },
        ),
        (
            price(&call(100.0, 1.0), &Market { spot: 0.0, ..m }, 0.2),
            Error::NotPositive { field: Field::Spot },
        ),
        (
            price(&call(-1.0, 1.0), &m, 0.2),
            Error::NotPositive {
                field: Field::Strike,
            },
        ),
        (
            price(&call(f64::INFINITY, 1.0), &m, 0.2),
            Error::NotFinite {
                field: Field::Strike,
            },
        ),
        (
            price(&call(100.0, -1.0), &m, 0.2),
            Error::Negative {
                field: Field::Expiry,
            },
        ),
        (
            price(&call(100.0, nan), &m, 0.2),
            Error::NotFinite {
                field: Field::Expiry,
            },
        ),
        (
            price(&call(100.0, 1.0), &Market { rate: nan, ..m }, 0.2),
            Error::NotFinite { field: Field::Rate },
        ),
        (
            price(
                &call(100.0, 1.0),
                &Market {
                    dividend_yield: f64::NEG_INFINITY,
                    ..m
                },
                0.2,
            ),
            Error::NotFinite {
                field: Field::DividendYield,
            },
        ),
        (
            price(&call(100.0, 1.0), &m, -0.2),
            Error::Negative { field: Field::Vol },
        ),
        (
            price(&call(100.0, 1.0), &m, nan),
            Error::NotFinite { field: Field::Vol },
        ),
    ];
    for (got, want) in cases {
        assert_eq!(got, Err(want));
    }
    assert_eq!(
        greeks(&call(100.0, 1.0), &m, nan),
        Err(Error::NotFinite { field: Field::Vol })
    );
}

#[test]
fn edge_error_messages_name_the_field() {
    let msg = Error::NotPositive {
        field: Field::DividendYield,
    }
    .to_string();
    assert!(msg.starts_with("dividend_yield:"), "{msg}");
}

#[test]
fn edge_overflow_is_an_error() {
    // A put struck at f64::MAX under a negative rate is worth more than f64::MAX.
    let m = Market {
        spot: 1.0,
        rate: -0.05,
        dividend_yield: 0.0,
    };
    assert_eq!(price(&put(f64::MAX, 50.0), &m, 0.2), Err(Error::Overflow));
}

#[test]
fn edge_wing_near_expiry_with_huge_legs_stays_representable() {
    // h = −40, t = 1/800, |x| = 0.1: the normalised price (about 10⁻³⁵³)
    // underflows on its own; √(S·K)·b does not. The erfcx form applies its
    // Gaussian factor in halves; the series in t (which reaches into the
    // wing near the money) must not take this option. mpmath 1.3.0 at 50
    // digits from the f64 inputs below: 2.399089369278992252947693e-54. The
    // bound is loose (κ is about 1.6·10⁴ here); the failure it guards is 0.
    let m = Market {
        spot: 1e300,
        rate: 0.0,
        dividend_yield: 0.0,
    };
    let got = price(
        &call(1.1051709180756478e300, 0.01),
        &m,
        0.024999999999999998,
    )
    .unwrap();
    let want = 2.399089369278992252947693e-54;
    assert!((got - want).abs() <= 1e-10 * want, "{got:e}");
}
