//! `calor bench`: options per second per core for the kernel's main entry
//! points, at 1, 2, … N threads, with the scaling efficiency of each.
//!
//! Each worker thread owns a copy of a deterministic batch of 4,096 options
//! near the money on the invented NGX barley index and revalues it in a loop
//! for the measuring time; the figure is options valued per second of wall
//! time, divided by the thread count. Scaling efficiency at k threads is the
//! k-thread throughput over k times the one-thread throughput. The machine's
//! other load shows up in these figures: the criterion benches, which compare
//! against yardsticks in the same run, are the reference for ratios.

use std::fmt::Write as _;
use std::hint::black_box;
use std::time::{Duration, Instant};

use calor::{Kind, OptionBatch};
use clap::Args;
use serde::Serialize;

/// Inputs of `calor bench`.
#[derive(Debug, Clone, Copy, Args)]
pub struct BenchArgs {
    /// Largest number of threads; every count from 1 up to it is measured.
    #[arg(long, default_value_t = default_threads())]
    pub threads: usize,
    /// Seconds of measurement per entry point and thread count.
    #[arg(long, default_value_t = 1.0)]
    pub seconds: f64,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

fn default_threads() -> usize {
    std::thread::available_parallelism().map_or(1, std::num::NonZeroUsize::get)
}

/// Options in the batch each thread revalues.
const OPTIONS: usize = 4096;

/// The measured entry points.
const WORKLOADS: [&str; 4] = [
    "price_batch",
    "greeks_batch",
    "implied_vol_batch",
    "american_price",
];

/// One measurement.
#[derive(Debug, Serialize)]
struct Measurement {
    workload: &'static str,
    threads: usize,
    options_per_second: f64,
    options_per_second_per_core: f64,
    scaling_efficiency: f64,
}

/// The batch: columns of 4,096 options on an index at 100.
struct Book {
    kinds: Vec<Kind>,
    spots: Vec<f64>,
    strikes: Vec<f64>,
    expiries: Vec<f64>,
    rates: Vec<f64>,
    dividend_yields: Vec<f64>,
    vols: Vec<f64>,
    premiums: Vec<f64>,
}

impl Book {
    fn new() -> Self {
        let n = OPTIONS;
        // A fixed low-discrepancy spread over the usual ranges.
        let frac = |i: usize, a: f64| (i as f64 * a).fract();
        let mut book = Book {
            kinds: (0..n)
                .map(|i| if i % 2 == 0 { Kind::Call } else { Kind::Put })
                .collect(),
            spots: vec![100.0; n],
            strikes: (0..n)
                .map(|i| 80.0 + 45.0 * frac(i, 0.618_033_988_7))
                .collect(),
            expiries: (0..n)
                .map(|i| 0.05 + 1.95 * frac(i, 0.414_213_562_4))
                .collect(),
            rates: (0..n).map(|i| 0.08 * frac(i, 0.732_050_807_6)).collect(),
            dividend_yields: (0..n).map(|i| 0.03 * frac(i, 0.236_067_977_5)).collect(),
            vols: (0..n)
                .map(|i| 0.1 + 0.5 * frac(i, 0.645_751_311_1))
                .collect(),
            premiums: Vec::new(),
        };
        let mut status = vec![Ok(()); n];
        let mut premiums = vec![0.0; n];
        let _ = calor::price_batch(&book.batch(), &book.vols, &mut premiums, &mut status);
        book.premiums = premiums;
        book
    }

    fn batch(&self) -> OptionBatch<'_> {
        OptionBatch {
            kinds: &self.kinds,
            spots: &self.spots,
            strikes: &self.strikes,
            expiries: &self.expiries,
            rates: &self.rates,
            dividend_yields: &self.dividend_yields,
        }
    }

    /// Values `workload` once over the book (American: a 64-option slice, the
    /// grid being a thousand times slower); returns the options valued.
    fn run(
        &self,
        workload: &str,
        out: &mut [f64],
        greeks: &mut [calor::Greeks],
        status: &mut [calor::ElementStatus],
    ) -> usize {
        let batch = self.batch();
        match workload {
            "price_batch" => {
                let _ = calor::price_batch(&batch, &self.vols, out, status);
                OPTIONS
            }
            "greeks_batch" => {
                let _ = calor::greeks_batch(&batch, &self.vols, greeks, status);
                OPTIONS
            }
            "implied_vol_batch" => {
                let _ = calor::implied_vol_batch(&batch, &self.premiums, out, status);
                OPTIONS
            }
            _ => {
                for i in 0..64 {
                    let c = calor::Contract {
                        kind: Kind::Put,
                        strike: self.strikes[i],
                        expiry: self.expiries[i],
                    };
                    let m = calor::Market {
                        spot: self.spots[i],
                        rate: self.rates[i],
                        dividend_yield: self.dividend_yields[i],
                    };
                    black_box(calor::american_price(&c, &m, self.vols[i]).ok());
                }
                64
            }
        }
    }
}

/// Options per second over `threads` threads each valuing its own book for `seconds`.
fn measure(workload: &'static str, threads: usize, seconds: f64) -> f64 {
    let limit = Duration::from_secs_f64(seconds.max(0.01));
    let start = Instant::now();
    let total: usize = std::thread::scope(|scope| {
        let workers: Vec<_> = (0..threads)
            .map(|_| {
                scope.spawn(move || {
                    let book = Book::new();
                    let (mut out, mut greeks, mut status) = (
                        vec![0.0; OPTIONS],
                        vec![calor::Greeks::default(); OPTIONS],
                        vec![Ok(()); OPTIONS],
                    );
                    let began = Instant::now();
                    let mut done = 0;
                    while began.elapsed() < limit {
                        done += book.run(workload, &mut out, &mut greeks, &mut status);
                        black_box(&out);
                    }
                    done
                })
            })
            .collect();
        workers.into_iter().map(|w| w.join().unwrap_or(0)).sum()
    });
    total as f64 / start.elapsed().as_secs_f64()
}

/// Runs every workload at every thread count and renders the result.
///
/// # Errors
/// A usage error (no threads, no time) or a JSON encoding failure.
pub fn run(args: &BenchArgs) -> Result<String, String> {
    if args.threads == 0 || args.seconds.is_nan() || args.seconds <= 0.0 {
        return Err("threads and seconds must be positive".to_owned());
    }
    let mut rows = Vec::new();
    for workload in WORKLOADS {
        let mut single = 0.0;
        for threads in 1..=args.threads {
            let rate = measure(workload, threads, args.seconds);
            if threads == 1 {
                single = rate;
            }
            rows.push(Measurement {
                workload,
                threads,
                options_per_second: rate,
                options_per_second_per_core: rate / threads as f64,
                scaling_efficiency: rate / (threads as f64 * single),
            });
        }
    }
    if args.json {
        return serde_json::to_string(&rows).map_err(|e| format!("json: {e}"));
    }
    let mut out = format!(
        "{:<18} {:>7} {:>16} {:>16} {:>10}",
        "entry point", "threads", "options/s", "per core", "scaling"
    );
    for r in &rows {
        let _ = write!(
            out,
            "\n{:<18} {:>7} {:>16.0} {:>16.0} {:>9.1}%",
            r.workload,
            r.threads,
            r.options_per_second,
            r.options_per_second_per_core,
            100.0 * r.scaling_efficiency
        );
    }
    Ok(out)
}
