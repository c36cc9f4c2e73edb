//! calor: option valuation that can be embedded anywhere and proven right.
//!
//! Black–Scholes–Merton prices and all fifteen Greeks that keep their digits far
//! out of the money and near expiry. `#![no_std]`, no allocation, no panics, no
//! `unsafe`; the only dependency is `libm`.
//!
//! The model assumes a lognormal underlying with constant volatility, rate and
//! continuous dividend yield and European exercise. Its outputs are not advice;
//! see the README for the cautions that go with deploying it.
//!
//! # Examples
//! ```
//! use calor::{greeks, price, Contract, Kind, Market};
//! let c = Contract { kind: Kind::Put, strike: 95.0, expiry: 0.5 };
//! let m = Market { spot: 100.0, rate: 0.1, dividend_yield: 0.05 };
//! let v = price(&c, &m, 0.2)?;
//! assert!((v - 2.464787646755).abs() < 1e-11);
//! assert_eq!(greeks(&c, &m, 0.2)?.price, v);
//! # Ok::<(), calor::Error>(())
//! ```
#![no_std]
#![cfg_attr(not(feature = "no-panic"), forbid(unsafe_code))]
// Under the `no-panic` feature the one unsafe block is the link-time trigger
// that `no_panic` expands into each entry point, allowed on those alone.
#![cfg_attr(feature = "no-panic", deny(unsafe_code))]
#![deny(missing_docs)]
#![deny(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::panic,
    clippy::indexing_slicing
)]

mod batch;
mod black;
mod contract;
mod elementary;
mod error;
#[cfg(feature = "fixed")]
pub mod fixed;
mod greeks;
mod grid;
mod heat;
mod implied;
mod normal;
mod vector;

pub use batch::{
    greeks_batch, implied_vol_batch, price_batch, price_delta_batch, ElementStatus, OptionBatch,
};
pub use black::price;
pub use contract::{Contract, Greeks, Kind, Market};
pub use error::{Error, Field, GridParameter};
pub use greeks::greeks;
pub use grid::{american_price, grid_value, Exercise, GridSpec, GridValue};
pub use heat::{Factored, HeatGrid, ThetaScheme};
pub use implied::{implied_vol, solve_implied_vol, ImpliedVol, MAX_ITERATIONS};
