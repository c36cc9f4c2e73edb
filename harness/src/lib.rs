//! The std side of calor: the `calor` command line and the harness that checks
//! the kernel against its 50-digit reference cases.
//!
//! The kernel itself (`calor`) stays `no_std`; everything that needs an
//! allocator, files or a terminal lives here.

pub mod batch;
pub mod cases;
pub mod certify;
pub mod cli;
pub mod fuzz_checks;
pub mod grid;
pub mod implied;
pub mod price;
pub mod throughput;
pub mod tolerance;
