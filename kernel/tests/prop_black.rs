//! Properties of the closed form that hold for every admissible input.

use calor::{greeks, price, Contract, Kind, Market};
use proptest::prelude::*;

const EPS: f64 = f64::EPSILON;

fn contract(kind: Kind, strike: f64, expiry: f64) -> Contract {
    Contract {
        kind,
        strike,
        expiry,
    }
}

fn market(spot: f64, rate: f64, dividend_yield: f64) -> Market {
    Market {
        spot,
        rate,
        dividend_yield,
    }
}

/// (spot, strike, expiry, rate, dividend yield, vol) over the contract's domain.
fn inputs() -> impl Strategy<Value = (f64, f64, f64, f64, f64, f64)> {
    (
        -3.0f64..6.0,   // log10 spot
        -1.5f64..1.5,   // ln(K/S)
        -3.94f64..1.7,  // log10 expiry: 1 hour .. 50 years
        -0.05f64..0.30, // rate
        0.0f64..0.20,   // dividend yield
        -3.0f64..0.699, // log10 vol: 0.1 % .. 500 %
    )
        .prop_map(|(ls, lk, lt, r, q, lv)| {
            let s = 10f64.powf(ls);
            (s, s * lk.exp(), 10f64.powf(lt), r, q, 10f64.powf(lv))
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(4096))]

    #[test]
    fn prop_put_call_parity((s, k, t, r, q, v) in inputs()) {
        let m = market(s, r, q);
        let c = price(&contract(Kind::Call, k, t), &m, v).unwrap();
        let p = price(&contract(Kind::Put, k, t), &m, v).unwrap();
        let forward_gap = s * (-q * t).exp() - k * (-r * t).exp();
        let scale = c + p + s * (-q * t).exp() + k * (-r * t).exp();
        prop_assert!((c - p - forward_gap).abs() <= 64.0 * EPS * scale,
            "C={c:e} P={p:e} gap={forward_gap:e}");
    }

    #[test]
    fn prop_bounds((s, k, t, r, q, v) in inputs()) {
        let m = market(s, r, q);
        let (sq, kr) = (s * (-q * t).exp(), k * (-r * t).exp());
        let c = price(&contract(Kind::Call, k, t), &m, v).unwrap();
        let p = price(&contract(Kind::Put, k, t), &m, v).unwrap();
        let slack = 16.0 * EPS * (sq + kr);
        prop_assert!(c >= 0.0 && p >= 0.0);
        prop_assert!(c >= (sq - kr).max(0.0) - slack && c <= sq + slack, "call {c:e}");
        prop_assert!(p >= (kr - sq).max(0.0) - slack && p <= kr + slack, "put {p:e}");
    }

    #[test]
    fn prop_homogeneity((s, k, t, r, q, v) in inputs(), k4 in -8i32..8) {
        // Scaling by a power of four is exact in every step of the evaluation.
        let lambda = 4f64.powi(k4);
        for kind in [Kind::Call, Kind::Put] {
            let a = price(&contract(kind, k, t), &market(s, r, q), v).unwrap();
            let b = price(&contract(kind, lambda * k, t), &market(lambda * s, r, q), v).unwrap();
            // Subnormal results have lost their low bits; exactness holds above.
            if a > 1e-290 {
                prop_assert_eq!(b, lambda * a);
            }
        }
    }

    #[test]
    fn prop_homogeneity_any_factor((s, k, t, r, q, v) in inputs(), lambda in 0.01f64..100.0) {
        let g = greeks(&contract(Kind::Call, k, t), &market(s, r, q), v).unwrap();
        // Only where the price is well away from underflow and its conditioning is mild.
        if g.price < 1e-8 * s {
            return Ok(());
        }
        let kappa = (s * g.delta).abs() + (g.price - s * g.delta).abs()
            + (t * g.theta).abs() + (r * g.rho).abs() + (q * g.dividend_rho).abs()
            + (v * g.vega).abs();
        let b = price(&contract(Kind::Call, lambda * k, t), &market(lambda * s, r, q), v).unwrap();
        let tol = 16.0 * EPS * (1.0 + kappa / g.price) * lambda * g.price;
        prop_assert!((b - lambda * g.price).abs() <= tol, "{b:e} vs {:e}", lambda * g.price);
    }

    #[test]
    fn prop_strike_monotone_convex((s, k, t, r, q, v) in inputs(), step in 0.001f64..0.2) {
        let m = market(s, r, q);
        let dk = step * k;
        for kind in [Kind::Call, Kind::Put] {
            let lo = price(&contract(kind, k - dk, t), &m, v).unwrap();
            let mid = price(&contract(kind, k, t), &m, v).unwrap();
            let hi = price(&contract(kind, k + dk, t), &m, v).unwrap();
            let slack = 64.0 * EPS * (lo + mid + hi + k * (-r * t).exp());
            match kind {
                Kind::Call => prop_assert!(lo + slack >= mid && mid + slack >= hi),
                Kind::Put => prop_assert!(lo <= mid + slack && mid <= hi + slack),
            }
            prop_assert!(lo + hi - 2.0 * mid >= -slack, "convexity {kind:?}: {lo:e} {mid:e} {hi:e}");
        }
    }

    #[test]
    fn prop_greeks_finite_and_consistent((s, k, t, r, q, v) in inputs()) {
        for kind in [Kind::Call, Kind::Put] {
            let c = contract(kind, k, t);
            let m = market(s, r, q);
            let g = greeks(&c, &m, v).unwrap();
            prop_assert!(g.named().iter().all(|(_, x)| x.is_finite()));
            prop_assert_eq!(g.price, price(&c, &m, v).unwrap());
            prop_assert!(g.gamma >= 0.0 && g.vega >= 0.0);
        }
    }

    #[test]
    fn prop_extreme_inputs_never_nan(
        ls in -300.0f64..300.0, lk in -300.0f64..300.0, lt in -300.0f64..3.0,
        r in -1.0f64..1.0, q in -1.0f64..1.0, lv in -300.0f64..3.0,
    ) {
        let (s, k, t, v) = (10f64.powf(ls), 10f64.powf(lk), 10f64.powf(lt), 10f64.powf(lv));
        for kind in [Kind::Call, Kind::Put] {
            if let Ok(x) = price(&contract(kind, k, t), &market(s, r, q), v) {
                prop_assert!(x.is_finite() && x >= 0.0, "{x}");
            }
            if let Ok(g) = greeks(&contract(kind, k, t), &market(s, r, q), v) {
                prop_assert!(g.named().iter().all(|(_, x)| x.is_finite()));
            }
        }
    }
}
