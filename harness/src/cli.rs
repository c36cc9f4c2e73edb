//! The command-line definition of `calor` and its dispatch.

use std::io::Write;
use std::process::ExitCode;

use clap::{Args, Parser, Subcommand, ValueEnum};

/// Option valuation from the command line, on the calor kernel.
#[derive(Debug, Parser)]
#[command(name = "calor", version, about)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands of `calor`.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Value one European option: its price and all fifteen Greeks.
    Price(PriceArgs),
    /// The volatility that reproduces a premium, with the iterations it took.
    Implied(ImpliedArgs),
    /// One option on a ladder of finer and finer grids: a convergence table.
    Grid(crate::grid::GridArgs),
    /// Value a CSV book of options: one result row per input row, CSV or JSON lines.
    Batch(crate::batch::BatchArgs),
    /// Check the kernel as built against every reference suite and write a certificate.
    ///
    /// Exit status 0 when every check passes, 1 when one fails, 2 when the
    /// reference cases cannot be read or the certificate cannot be written.
    Certify(crate::certify::command::CertifyArgs),
    /// Options per second per core for the main entry points, at 1..N threads.
    Bench(crate::throughput::BenchArgs),
}

/// The option and its market, shared by the subcommands. Rates and yields are
/// continuously compounded, per year.
#[derive(Debug, Clone, Copy, Args)]
pub struct OptionArgs {
    /// Call or put.
    #[arg(long, value_enum)]
    pub kind: KindArg,
    /// Price of the underlying today (for a futures option: the futures price).
    #[arg(long, allow_negative_numbers = true)]
    pub spot: f64,
    /// Strike price, in the currency of the spot.
    #[arg(long, allow_negative_numbers = true)]
    pub strike: f64,
    /// Time to expiry in years.
    #[arg(long, allow_negative_numbers = true)]
    pub expiry: f64,
    /// Risk-free rate r, e.g. 0.05 for 5 %.
    #[arg(long, allow_negative_numbers = true)]
    pub rate: f64,
    /// Continuous dividend yield q (foreign rate for currencies, r for futures).
    #[arg(long, default_value_t = 0.0, allow_negative_numbers = true)]
    pub dividend_yield: f64,
}

impl OptionArgs {
    /// The kernel's contract.
    pub fn contract(&self) -> calor::Contract {
        calor::Contract {
            kind: self.kind.into(),
            strike: self.strike,
            expiry: self.expiry,
        }
    }

    /// The kernel's market.
    pub fn market(&self) -> calor::Market {
        calor::Market {
            spot: self.spot,
            rate: self.rate,
            dividend_yield: self.dividend_yield,
        }
    }
}

/// Inputs of `calor price`.
#[derive(Debug, Clone, Copy, Args)]
pub struct PriceArgs {
    /// The option and its market.
    #[command(flatten)]
    pub option: OptionArgs,
    /// Volatility σ per year, e.g. 0.2 for 20 %.
    #[arg(long, allow_negative_numbers = true)]
    pub vol: f64,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// Inputs of `calor implied`.
#[derive(Debug, Clone, Copy, Args)]
pub struct ImpliedArgs {
    /// The option and its market.
    #[command(flatten)]
    pub option: OptionArgs,
    /// The option's premium, in the currency of the spot.
    #[arg(long, allow_negative_numbers = true)]
    pub premium: f64,
    /// Print one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// `--kind` on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum KindArg {
    /// The right to buy at the strike.
    Call,
    /// The right to sell at the strike.
    Put,
}

impl From<KindArg> for calor::Kind {
    fn from(kind: KindArg) -> Self {
        match kind {
            KindArg::Call => calor::Kind::Call,
            KindArg::Put => calor::Kind::Put,
        }
    }
}

/// Parses the process arguments and runs the subcommand.
///
/// Usage errors exit through clap (code 2); a refused input prints
/// `error: <field>: <reason>` on stderr and gives code 1.
pub fn main() -> ExitCode {
    run(&Cli::parse())
}

/// Runs an already parsed command line.
pub fn run(cli: &Cli) -> ExitCode {
    let outcome = match &cli.command {
        Command::Price(args) => crate::price::run(args),
        Command::Implied(args) => crate::implied::run(args),
        Command::Grid(args) => crate::grid::run(args),
        // Writes its own output and summary, and has its own exit codes.
        Command::Batch(args) => return crate::batch::main(args),
        Command::Certify(args) => return crate::certify::command::run(args),
        Command::Bench(args) => crate::throughput::run(args),
    };
    // Written without `println!`, which panics when stdout is a closed pipe.
    match outcome {
        Ok(text) => match writeln!(std::io::stdout().lock(), "{text}") {
            Ok(()) => ExitCode::SUCCESS,
            Err(_) => ExitCode::FAILURE,
        },
        Err(message) => {
            let _ = writeln!(std::io::stderr().lock(), "error: {message}");
            ExitCode::FAILURE
        }
    }
}
