//! Link check of the no-panic promise (feature `no-panic`, release + LTO only).
//!
//! Each public entry point carries `#[no_panic]` under the feature: its body is
//! wrapped in a guard whose unwinding path calls an undefined symbol. If the
//! optimiser cannot remove every panic path from a function, the reference to
//! that symbol survives and linking this test binary fails, naming the
//! function. The calls below make the linker see every entry point, with
//! inputs hidden behind `black_box` so that nothing is folded at compile time.
//!
//! `cargo test -p calor --profile release-lto --features no-panic,fixed --test no_panic_link`
//!
#![cfg(feature = "no-panic")]

use core::hint::black_box;

use calor::{Contract, GridSpec, Kind, Market};

#[test]
fn link_entry_points_cannot_panic() {
    let c = black_box(Contract {
        kind: Kind::Put,
        strike: 40.0,
        expiry: 0.5,
    });
    let m = black_box(Market {
        spot: 42.0,
        rate: 0.1,
        dividend_yield: 0.0,
    });
    let vol = black_box(0.2);
    let p = calor::price(&c, &m, vol);
    assert!(p.is_ok());
    assert!(calor::greeks(&c, &m, vol).is_ok());
    assert!(calor::implied_vol(&c, &m, black_box(1.0)).is_ok());
    assert!(calor::solve_implied_vol(&c, &m, black_box(1.0)).is_ok());
    assert!(calor::american_price(&c, &m, vol).is_ok());
    let mut workspace = [0.0; 1446];
    let spec = black_box(GridSpec::AMERICAN);
    assert!(calor::grid_value(&c, &m, vol, &spec, black_box(&mut workspace[..])).is_ok());
}

#[cfg(feature = "fixed")]
#[test]
fn link_fixed_point_cannot_panic() {
    use calor::fixed::{price_delta, Fix, FixedInputs};
    let inputs = black_box(FixedInputs {
        kind: Kind::Call,
        spot: Fix::from_num(42),
        strike: Fix::from_num(40),
        expiry: Fix::ONE >> 1_u32,
        rate: Fix::ONE / 10,
        dividend_yield: Fix::ZERO,
        vol: Fix::ONE / 5,
    });
    assert!(price_delta(&inputs).is_ok());
    let batch = calor::OptionBatch {
        kinds: black_box(&[Kind::Call, Kind::Put][..]),
        spots: black_box(&[42.0, 42.0][..]),
        strikes: black_box(&[40.0, 44.0][..]),
        expiries: black_box(&[0.5, 0.5][..]),
        rates: black_box(&[0.1, 0.1][..]),
        dividend_yields: black_box(&[0.0, 0.0][..]),
    };
    let vols = black_box([0.2, 0.2]);
    let (mut prices, mut deltas, mut status) = ([0.0; 2], [0.0; 2], [Ok(()); 2]);
    assert_eq!(
        calor::price_batch(&batch, &vols, &mut prices, &mut status),
        Ok(2)
    );
    assert_eq!(
        calor::price_delta_batch(&batch, &vols, &mut prices, &mut deltas, &mut status),
        Ok(2)
    );
    let mut out = [calor::Greeks::default(); 2];
    assert_eq!(
        calor::greeks_batch(&batch, &vols, &mut out, &mut status),
        Ok(2)
    );
    let mut implied = [0.0; 2];
    assert_eq!(
        calor::implied_vol_batch(&batch, &prices, &mut implied, &mut status),
        Ok(2)
    );
}
