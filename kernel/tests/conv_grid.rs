//! Convergence of the grid pricer: observed orders against the closed form,
//! and what the Rannacher start-up buys.

use calor::{greeks, grid_value, Contract, Exercise, GridSpec, GridValue, Kind, Market};

/// A European spec without extrapolation, so the raw order of the scheme shows.
fn european(nodes: usize, steps: usize) -> GridSpec {
    GridSpec {
        nodes,
        steps,
        exercise: Exercise::European,
        richardson: false,
        ..GridSpec::AMERICAN
    }
}

fn value(contract: &Contract, market: &Market, vol: f64, spec: &GridSpec) -> GridValue {
    let mut workspace = vec![0.0; spec.workspace_len().expect("a size")];
    grid_value(contract, market, vol, spec, &mut workspace).expect("a grid value")
}

/// |error| of price, delta and gamma against `calor::greeks` on each spec.
fn errors(contract: &Contract, market: &Market, vol: f64, specs: &[GridSpec]) -> Vec<[f64; 3]> {
    let exact = greeks(contract, market, vol).expect("a closed form");
    specs
        .iter()
        .map(|spec| {
            let v = value(contract, market, vol, spec);
            [
                (v.price - exact.price).abs(),
                (v.delta - exact.delta).abs(),
                (v.gamma - exact.gamma).abs(),
            ]
        })
        .collect()
}

/// Short scientific forms for the log.
fn sci(values: &[f64]) -> Vec<String> {
    values.iter().map(|v| format!("{v:.3e}")).collect()
}

/// The smallest log2 ratio of successive errors, per quantity.
fn observed_orders(errors: &[[f64; 3]]) -> [f64; 3] {
    let mut orders = [f64::INFINITY; 3];
    for pair in errors.windows(2) {
        for (q, order) in orders.iter_mut().enumerate() {
            *order = order.min((pair[0][q] / pair[1][q]).log2());
        }
    }
    orders
}

#[test]
fn conv_grid_european_second_order() {
    // An NGX barley index put and call, spot off the strike, with a dividend yield.
    let market = Market {
        spot: 93.0,
        rate: 0.05,
        dividend_yield: 0.02,
    };
    let specs: Vec<GridSpec> = [(81, 20), (161, 40), (321, 80), (641, 160)]
        .into_iter()
        .map(|(n, s)| european(n, s))
        .collect();
    for kind in [Kind::Put, Kind::Call] {
        let contract = Contract {
            kind,
            strike: 100.0,
            expiry: 0.75,
        };
        let errors = errors(&contract, &market, 0.3, &specs);
        let orders = observed_orders(&errors);
        println!(
            "{kind:?}: errors {:?}, orders price/delta/gamma {orders:.3?}",
            sci(&errors.concat())
        );
        for (name, order) in ["price", "delta", "gamma"].iter().zip(orders) {
            assert!(
                order >= 1.8,
                "{kind:?} {name}: observed order {order} below 1.8"
            );
        }
    }
}

#[test]
fn conv_grid_richardson_gains_digits() {
    let contract = Contract {
        kind: Kind::Put,
        strike: 100.0,
        expiry: 0.75,
    };
    let market = Market {
        spot: 93.0,
        rate: 0.05,
        dividend_yield: 0.02,
    };
    let plain = european(241, 60);
    let extrapolated = GridSpec {
        richardson: true,
        ..plain
    };
    let e = errors(&contract, &market, 0.3, &[plain, extrapolated]);
    println!("plain {:?}, extrapolated {:?}", sci(&e[0]), sci(&e[1]));
    for ((name, fine), plain) in ["price", "delta", "gamma"].iter().zip(e[1]).zip(e[0]) {
        assert!(fine < 0.05 * plain, "{name}: {fine:e} against {plain:e}");
    }
}

#[test]
fn conv_grid_crank_nicolson_needs_rannacher_for_gamma() {
    // Spot at the strike, a week to expiry and long uniform steps (μ ≈ 40):
    // plain Crank–Nicolson keeps the payoff kink's high frequencies, which
    // alternate sign every step and land on gamma at the strike.
    let contract = Contract {
        kind: Kind::Call,
        strike: 100.0,
        expiry: 7.0 / 365.0,
    };
    let market = Market {
        spot: 100.0,
        rate: 0.03,
        dividend_yield: 0.0,
    };
    let uniform = GridSpec {
        grading: 1.0,
        ..european(401, 10)
    };
    let plain = GridSpec {
        rannacher_steps: 0,
        ..uniform
    };
    let e = errors(&contract, &market, 0.25, &[uniform, plain]);
    let exact = greeks(&contract, &market, 0.25)
        .expect("a closed form")
        .gamma;
    println!(
        "gamma {exact}: error with start-up {:.3e}, without {:.3e}",
        e[0][2], e[1][2]
    );
    assert!(e[0][2] < 1e-2 * exact, "with start-up: {:e}", e[0][2]);
    assert!(e[1][2] > 100.0 * e[0][2], "without start-up: {:e}", e[1][2]);
}

#[test]
fn conv_grid_american_put_converges() {
    // The American put of the notes' tree ladder: the grid error falls with
    // the grid, at better than first order.
    let contract = Contract {
        kind: Kind::Put,
        strike: 50.0,
        expiry: 5.0 / 12.0,
    };
    let market = Market {
        spot: 50.0,
        rate: 0.1,
        dividend_yield: 0.0,
    };
    let reference = 4.28421664531919;
    let errors: Vec<f64> = [(121, 30), (241, 60), (481, 120)]
        .into_iter()
        .map(|(nodes, steps)| {
            let spec = GridSpec {
                nodes,
                steps,
                richardson: false,
                ..GridSpec::AMERICAN
            };
            (value(&contract, &market, 0.4, &spec).price - reference).abs()
        })
        .collect();
    println!("American put errors {:?}", sci(&errors));
    for pair in errors.windows(2) {
        assert!(
            (pair[0] / pair[1]).log2() > 1.5,
            "errors {:?}",
            sci(&errors)
        );
    }
}
