//! The fixed-point path against the `f64` kernel, on a dense deterministic sweep.
//!
//! Spot/strike 0.5–2 (17 log-spaced ratios), expiry 1 day–5 years, vol 5–100 %,
//! three rates, two dividend yields, calls and puts. Prices of at least 1e-4
//! of the strike must agree to a relative 1e-8; deltas to an absolute 1e-9.
//! The worst cases are printed (`--nocapture`) for the README's table.
#![cfg(feature = "fixed")]

use calor::fixed::{exp, ln, norm_cdf, price_delta, sqrt, Fix, FixedInputs};
use calor::{greeks, Contract, Kind, Market};

const EXPIRIES: [f64; 9] = [
    1.0 / 365.0,
    1.0 / 52.0,
    1.0 / 12.0,
    0.25,
    0.5,
    1.0,
    2.0,
    3.5,
    5.0,
];
const VOLS: [f64; 7] = [0.05, 0.1, 0.2, 0.35, 0.5, 0.75, 1.0];
const RATES: [f64; 3] = [-0.01, 0.03, 0.1];
const YIELDS: [f64; 2] = [0.0, 0.02];

fn fix(x: f64) -> Fix {
    Fix::from_num(x)
}

#[test]
fn ref_fixed_sweep() {
    let strike = 100.0;
    let (mut worst_price, mut worst_delta, mut checked) = (0.0_f64, 0.0_f64, 0);
    let mut worst_case = String::new();
    for i in 0..=16 {
        let spot = strike * 2f64.powf(-1.0 + f64::from(i) / 8.0);
        for &expiry in &EXPIRIES {
            for &vol in &VOLS {
                for &rate in &RATES {
                    for &dividend_yield in &YIELDS {
                        for kind in [Kind::Call, Kind::Put] {
                            let c = Contract {
                                kind,
                                strike,
                                expiry,
                            };
                            let m = Market {
                                spot,
                                rate,
                                dividend_yield,
                            };
                            let g = greeks(&c, &m, vol).expect("f64 kernel");
                            let inputs = FixedInputs {
                                kind,
                                spot: fix(spot),
                                strike: fix(strike),
                                expiry: fix(expiry),
                                rate: fix(rate),
                                dividend_yield: fix(dividend_yield),
                                vol: fix(vol),
                            };
                            let (v, d) = price_delta(&inputs).expect("fixed path");
                            let (v, d) = (v.to_num::<f64>(), d.to_num::<f64>());
                            let delta_error = (d - g.delta).abs();
                            worst_delta = worst_delta.max(delta_error);
                            assert!(
                                delta_error <= 1e-9,
                                "{c:?} {m:?} {vol}: delta {d} vs {}",
                                g.delta
                            );
                            if g.price < 1e-4 * strike {
                                continue;
                            }
                            checked += 1;
                            let rel = (v - g.price).abs() / g.price;
                            if rel > worst_price {
                                worst_price = rel;
                                worst_case = format!("{c:?} {m:?} vol {vol}");
                            }
                            assert!(
                                rel <= 1e-8,
                                "{c:?} {m:?} {vol}: {v} vs {} ({rel:e})",
                                g.price
                            );
                        }
                    }
                }
            }
        }
    }
    println!("ref_fixed_sweep: {checked} prices, worst relative error {worst_price:.3e} ({worst_case}), worst delta error {worst_delta:.3e}");
    assert!(checked > 3000);
}

#[test]
fn ref_fixed_elementary_functions() {
    let mut worst = [0.0_f64; 4];
    for i in -400..=400 {
        let x = f64::from(i) / 40.0;
        let e = (exp(fix(x)).to_num::<f64>() - x.exp()).abs() / x.exp();
        worst[0] = worst[0].max(e);
        // Down to 2^-5: below that the input's own resolution, u/y, dominates.
        let y = 2f64.powf(f64::from(i.max(-100)) / 20.0);
        let l = (ln(fix(y)).expect("positive").to_num::<f64>() - y.ln()).abs();
        worst[1] = worst[1].max(l);
        let r = (sqrt(fix(y)).expect("positive").to_num::<f64>() - y.sqrt()).abs() / y.sqrt();
        worst[2] = worst[2].max(r);
        let z = f64::from(i) / 40.0;
        let reference = 0.5 * libm::erfc(-z / core::f64::consts::SQRT_2);
        let n = (norm_cdf(fix(z)).to_num::<f64>() - reference).abs();
        worst[3] = worst[3].max(n);
    }
    println!("ref_fixed_elementary_functions: exp rel {:.2e}, ln abs {:.2e}, sqrt rel {:.2e}, Φ abs {:.2e}", worst[0], worst[1], worst[2], worst[3]);
    // The f64 references are good to about 1e-16, and e^x near e^-10 ≈ 4.5e-5
    // is resolved to u/e^x ≈ 1.2e-15 by the format itself.
    assert!(
        worst[0] < 1e-14 && worst[1] < 1e-15 && worst[2] < 1e-15 && worst[3] < 5e-16,
        "{worst:?}"
    );
}
