//! `calor batch`: a CSV book of options in, one result row per input row out.
//!
//! - [`read`]: CSV records from any byte source, with their line numbers.
//! - [`decode`]: the header's column map and the row decoder (also fuzzed).
//! - [`value`]: one decoded row through the kernel.
//! - [`encode`]: CSV or JSON-lines output rows.
//! - [`run`]: the streaming loop over chunks, valued on all cores in order.
//!
//! Exit codes: 0 when every row was read and written (bad rows included),
//! 2 when the header cannot start a batch, 1 on an I/O failure.

pub mod decode;
pub mod encode;
pub mod read;
pub mod run;
pub mod value;

use std::fs::File;
use std::io::{self, BufWriter, IsTerminal, Read, Write};
use std::path::PathBuf;
use std::process::ExitCode;
use std::time::Instant;

use clap::Args;

pub use encode::Format;
pub use run::{run_bytes, BatchError, Started, Summary};

/// Inputs of `calor batch`.
#[derive(Debug, Clone, Args)]
pub struct BatchArgs {
    /// The CSV book to value, `-` for standard input.
    #[arg(long)]
    pub input: PathBuf,
    /// Where the results go, `-` for standard output.
    #[arg(long)]
    pub output: PathBuf,
    /// The output format.
    #[arg(long, value_enum, default_value_t = Format::Csv)]
    pub format: Format,
}

/// Runs `calor batch` and prints the summary line on stderr.
pub fn main(args: &BatchArgs) -> ExitCode {
    let started = Instant::now();
    let outcome = if args.input.as_os_str() == "-" {
        run_with(io::stdin(), args, None)
    } else {
        match File::open(&args.input) {
            Ok(file) => {
                let size = file.metadata().ok().map(|m| m.len());
                run_with(file, args, size)
            }
            Err(e) => Err(format!("input: {}: {e}", args.input.display()).into()),
        }
    };
    let mut stderr = io::stderr().lock();
    match outcome {
        Ok(summary) => {
            let seconds = started.elapsed().as_secs_f64();
            let rate = if seconds > 0.0 {
                summary.rows as f64 / seconds
            } else {
                0.0
            };
            let _ = writeln!(
                stderr,
                "calor batch: {} rows, {} ok, {} bad, {seconds:.3} s, {rate:.0} rows/s",
                summary.rows, summary.ok, summary.bad
            );
            ExitCode::SUCCESS
        }
        Err(Stop::Header(message)) => {
            let _ = writeln!(stderr, "error: {message}");
            ExitCode::from(2)
        }
        Err(Stop::Io(message)) => {
            let _ = writeln!(stderr, "error: {message}");
            ExitCode::FAILURE
        }
    }
}

/// How a run ended early, with its message.
enum Stop {
    Header(String),
    Io(String),
}

impl From<String> for Stop {
    fn from(message: String) -> Self {
        Stop::Io(message)
    }
}

impl From<BatchError> for Stop {
    fn from(e: BatchError) -> Self {
        match e {
            BatchError::Header(_) => Stop::Header(e.to_string()),
            _ => Stop::Io(e.to_string()),
        }
    }
}

/// Checks the header, then opens the output and streams; `size` is the input
/// file's length, for the progress bar.
fn run_with<R: Read + Send>(
    input: R,
    args: &BatchArgs,
    size: Option<u64>,
) -> Result<Summary, Stop> {
    let bar = size
        .filter(|_| io::stderr().is_terminal())
        .map(indicatif::ProgressBar::new);
    if let Some(bar) = &bar {
        bar.set_style(
            indicatif::ProgressStyle::with_template(
                "{bar:40} {binary_bytes}/{binary_total_bytes} {elapsed} eta {eta}",
            )
            .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
        );
    }
    let input: Box<dyn Read + Send> = match &bar {
        Some(bar) => Box::new(bar.wrap_read(input)),
        None => Box::new(input),
    };
    // The header is checked before the output is created, so a refused book
    // leaves an existing output file untouched.
    let started = Started::new(input)?;
    let summary = if args.output.as_os_str() == "-" {
        let mut out = BufWriter::with_capacity(1 << 18, io::stdout());
        started.finish(&mut out, args.format)?
    } else {
        let file = File::create(&args.output)
            .map_err(|e| format!("output: {}: {e}", args.output.display()))?;
        let mut out = BufWriter::with_capacity(1 << 18, file);
        started.finish(&mut out, args.format)?
    };
    if let Some(bar) = bar {
        bar.finish_and_clear();
    }
    Ok(summary)
}
