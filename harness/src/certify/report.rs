//! The certificate of a `calor certify` run and its three renderings: the
//! terminal table, report.md and report.json (fields documented in
//! DEVELOPERS.md, "The certificate").

use std::fmt::Write as _;

use serde::Serialize;

use crate::cases::textbook::TextbookCase;
use crate::certify::command::CertifyArgs;
use crate::certify::identity::Identity;
use crate::certify::region::Region;
use crate::certify::tally::{Failure, Group, Tally};
use crate::tolerance::{self, Tolerance};

/// Version of the report.json layout; bumped when a field changes meaning or goes.
pub const FORMAT: &str = "calor-certificate/1";

/// A generator script and the tools it names.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Generator {
    /// Path relative to the cases folder.
    pub path: String,
    /// Its `# requires:` line (tool and library versions).
    pub requires: String,
}

/// One suite: where its cases come from and whether it ran.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct SuiteInfo {
    /// The suite's name.
    pub suite: &'static str,
    /// The table it reads, or a description of a built-in suite.
    pub source: String,
    /// Cases in the suite (0 when skipped).
    pub cases: usize,
    /// Why it did not run, when it did not.
    pub skipped: Option<String>,
    /// A remark for the report.
    pub note: Option<String>,
    /// Built-in cases with their reasons.
    pub cases_listed: Vec<(String, String)>,
}

impl SuiteInfo {
    /// A suite read from a table.
    pub fn read(suite: &'static str, file: &str, cases: usize) -> Self {
        SuiteInfo {
            suite,
            source: file.to_owned(),
            cases,
            skipped: None,
            note: None,
            cases_listed: Vec::new(),
        }
    }

    /// A suite whose optional table is absent.
    pub fn skipped(suite: &'static str, file: &str) -> Self {
        SuiteInfo {
            skipped: Some(format!("{file} is not present in the cases folder")),
            ..SuiteInfo::read(suite, file, 0)
        }
    }

    /// A suite whose cases are built into the harness.
    pub fn built_in(suite: &'static str, description: &str, cases: usize) -> Self {
        SuiteInfo::read(suite, description, cases)
    }
}

/// An expected failure as measured in this run.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ExpectedOutcome {
    /// The suite.
    pub suite: &'static str,
    /// Case id.
    pub case_id: &'static str,
    /// The quantity.
    pub quantity: &'static str,
    /// Error in tolerance units.
    pub units: f64,
    /// The limit (after `--tighten`).
    pub limit: f64,
    /// True while it still misses; false fails the certificate (take it off the list).
    pub still_fails: bool,
    /// Why it misses.
    pub reason: &'static str,
}

/// A tolerance entry as the certificate lists it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ToleranceEntry {
    /// The name of the entry.
    pub quantity: &'static str,
    /// Its limit, before `--tighten`.
    pub limit: f64,
    /// Why.
    pub reason: &'static str,
}

impl From<&Tolerance> for ToleranceEntry {
    fn from(t: &Tolerance) -> Self {
        ToleranceEntry {
            quantity: t.quantity,
            limit: t.limit,
            reason: t.reason,
        }
    }
}

/// A worked example's source.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct TextbookSource {
    /// Row id.
    pub id: String,
    /// The quantity.
    pub quantity: String,
    /// Book, edition and example.
    pub source: String,
    /// `verified` or `memory`.
    pub citation: String,
}

/// How the run was set up.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RunInfo {
    /// `--extended` given.
    pub extended: bool,
    /// `--tighten` factor (1 = the shipped limits).
    pub tighten: f64,
    /// Cases of the property sweep.
    pub sweep_cases: usize,
    /// Its seed.
    pub sweep_seed: u64,
    /// Wall time of the run in seconds.
    pub seconds: f64,
}

/// Everything a run found.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Certificate {
    /// [`FORMAT`].
    pub format: &'static str,
    /// True when every check passes and every expected failure still fails.
    pub passes: bool,
    /// What is certified.
    pub identity: Identity,
    /// How the run was set up.
    pub run: RunInfo,
    /// The generators of the tables.
    pub generators: Vec<Generator>,
    /// The suites.
    pub suites: Vec<SuiteInfo>,
    /// Every function of every suite in every region it has cases in.
    pub results: Vec<Group>,
    /// The expected failures.
    pub expected_failures: Vec<ExpectedOutcome>,
    /// The failing check with the largest error relative to its limit.
    pub worst_failure: Option<Failure>,
    /// The tolerance table.
    pub tolerances: Vec<ToleranceEntry>,
    /// Sources of the worked examples.
    pub textbook_sources: Vec<TextbookSource>,
    /// Definitions of the regions.
    pub regions: Vec<(&'static str, &'static str)>,
    #[serde(skip)]
    suite_rows: Vec<crate::certify::tally::SuiteRow>,
}

/// Every tolerance entry, in the order of `tolerance.rs`.
pub const TOLERANCES: [&Tolerance; 17] = [
    &tolerance::PRICE,
    &tolerance::GREEK,
    &tolerance::THIRD_ORDER,
    &tolerance::IMPLIED_VOL,
    &tolerance::REPRICING,
    &tolerance::NEAR_EXPIRY,
    &tolerance::TEXTBOOK,
    &tolerance::PRINTED,
    &tolerance::AMERICAN,
    &tolerance::HEAT_DISCRETE,
    &tolerance::GRID_ORDER,
    &tolerance::PARITY,
    &tolerance::BOUNDS,
    &tolerance::STRIKE_MONOTONE,
    &tolerance::STRIKE_CONVEX,
    &tolerance::HOMOGENEITY,
    &tolerance::FINITE_DIFFERENCE,
];

impl Certificate {
    /// Puts a run together.
    #[allow(clippy::too_many_arguments)]
    pub fn assemble(
        identity: Identity,
        args: &CertifyArgs,
        sweep_cases: usize,
        generators: Vec<Generator>,
        suites: Vec<SuiteInfo>,
        tally: &Tally,
        expected_failures: Vec<ExpectedOutcome>,
        textbook: &[TextbookCase],
        seconds: f64,
    ) -> Self {
        let passes = tally.passes() && expected_failures.iter().all(|x| x.still_fails);
        Certificate {
            format: FORMAT,
            passes,
            identity,
            run: RunInfo {
                extended: args.extended,
                tighten: args.tighten,
                sweep_cases,
                sweep_seed: crate::certify::sweep::SEED,
                seconds,
            },
            generators,
            suites,
            results: tally.groups().to_vec(),
            expected_failures,
            worst_failure: tally.worst_failure().cloned(),
            tolerances: TOLERANCES
                .iter()
                .map(|t| ToleranceEntry::from(*t))
                .collect(),
            textbook_sources: textbook
                .iter()
                .map(|c| TextbookSource {
                    id: c.id.clone(),
                    quantity: c.quantity.clone(),
                    source: c.source.clone(),
                    citation: c.citation.clone(),
                })
                .collect(),
            regions: Region::EVERY
                .iter()
                .map(|r| (r.name(), r.definition()))
                .collect(),
            suite_rows: tally.by_suite(),
        }
    }

    fn checks(&self) -> usize {
        self.results
            .iter()
            .filter(|g| g.region == Region::All)
            .map(|g| g.cases)
            .sum()
    }
}

/// A number in at most four significant digits, in plain or scientific form.
pub fn short(x: f64) -> String {
    if x.is_nan() || x.is_infinite() {
        return if x > 0.0 {
            "inf".into()
        } else {
            format!("{x}")
        };
    }
    if x == 0.0 {
        return "0".into();
    }
    let a = x.abs();
    if (1e-3..1e5).contains(&a) {
        let digits = (3 - a.log10().floor() as i32).clamp(0, 6) as usize;
        let s = format!("{x:.digits$}");
        if s.contains('.') {
            s.trim_end_matches('0').trim_end_matches('.').to_owned()
        } else {
            s
        }
    } else {
        let s = format!("{x:.2e}");
        let (mantissa, exponent) = s.split_once('e').unwrap_or((&s, "0"));
        let mantissa = if mantissa.contains('.') {
            mantissa.trim_end_matches('0').trim_end_matches('.')
        } else {
            mantissa
        };
        format!("{mantissa}e{exponent}")
    }
}

fn verdict(cert: &Certificate) -> String {
    let ran = cert.suites.iter().filter(|s| s.skipped.is_none()).count();
    let still = cert
        .expected_failures
        .iter()
        .filter(|x| x.still_fails)
        .count();
    let fails: usize = cert
        .results
        .iter()
        .filter(|g| g.region == Region::All)
        .map(|g| g.failures)
        .sum();
    let passing_expected = cert.expected_failures.len() - still;
    if cert.passes {
        format!(
            "verdict: PASS: {} checks in {ran} suites within tolerance; {still} expected \
             failures still fail; {:.1} s",
            cert.checks(),
            cert.run.seconds
        )
    } else {
        format!(
            "verdict: FAIL: {fails} of {} checks over tolerance; {passing_expected} expected \
             failures now pass; {:.1} s",
            cert.checks(),
            cert.run.seconds
        )
    }
}

fn failure_text(f: &Failure) -> String {
    format!(
        "worst failing case: {}/{} {}: error {} > limit {}\n  {}",
        f.suite,
        f.function,
        f.case_id,
        short(f.error),
        short(f.limit),
        f.detail
    )
}

/// The table, the verdict and, on failure, the worst failing case.
pub fn terminal(cert: &Certificate) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "{:<19} {:<13} {:>7}  {:>9}  {:>7}  {:<17} result",
        "suite", "region", "cases", "worst", "limit", "worst function"
    );
    for row in &cert.suite_rows {
        let _ = writeln!(
            s,
            "{:<19} {:<13} {:>7}  {:>9}  {:>7}  {:<17} {}",
            row.suite,
            row.region.name(),
            row.cases,
            short(row.worst.worst),
            short(row.worst.limit),
            row.worst.function,
            if row.passes() { "pass" } else { "FAIL" }
        );
    }
    for suite in &cert.suites {
        if let Some(why) = &suite.skipped {
            let _ = writeln!(s, "{:<19} skipped: {why}", suite.suite);
        }
    }
    for x in &cert.expected_failures {
        let _ = writeln!(
            s,
            "expected failure {}/{} {}: {} > {}: {}",
            x.suite,
            x.quantity,
            x.case_id,
            short(x.units),
            short(x.limit),
            if x.still_fails {
                "still fails"
            } else {
                "NOW PASSES: take it off tolerance::EXPECTED_FAILURES"
            }
        );
    }
    let _ = write!(s, "{}", verdict(cert));
    if let Some(f) = &cert.worst_failure {
        let _ = write!(s, "\n{}", failure_text(f));
    }
    s
}

/// report.json.
///
/// # Errors
/// A serialisation failure, as text.
pub fn json(cert: &Certificate) -> Result<String, String> {
    serde_json::to_string_pretty(cert).map_err(|e| e.to_string())
}

fn md_cell(text: &str) -> String {
    text.replace('|', "\\|").replace('\n', " ")
}

/// report.md.
#[allow(clippy::too_many_lines)]
pub fn markdown(cert: &Certificate) -> String {
    let id = &cert.identity;
    let mut s = String::new();
    let _ = writeln!(s, "# Certificate of the calor kernel\n");
    let _ = writeln!(s, "**{}**\n", verdict(cert));
    if let Some(f) = &cert.worst_failure {
        let _ = writeln!(s, "```text\n{}\n```\n", failure_text(f));
    }
    let _ = writeln!(s, "## What is certified\n");
    let _ = writeln!(s, "| item | value |\n|---|---|");
    let clean = match id.git_tree_clean {
        Some(true) => "clean",
        Some(false) => "tracked files modified since the commit",
        None => "unknown",
    };
    let rows = [
        ("crate version (calor)", id.crate_version.to_owned()),
        ("git commit", format!("{} ({clean})", id.git_commit)),
        ("rustc", id.rustc.to_owned()),
        ("target", id.target.to_owned()),
        ("profile", id.profile.to_owned()),
        ("kernel features", id.kernel_features.join(", ")),
        ("CPU", id.cpu_model.clone()),
        ("date (UTC)", id.date_utc.clone()),
        (
            "reference data SHA-256",
            format!("`{}`", id.reference_sha256),
        ),
        (
            "run",
            format!(
                "extended {}, tighten {}, sweep {} cases (seed {:#018x}), {:.1} s",
                cert.run.extended,
                short(cert.run.tighten),
                cert.run.sweep_cases,
                cert.run.sweep_seed,
                cert.run.seconds
            ),
        ),
    ];
    for (k, v) in rows {
        let _ = writeln!(s, "| {k} | {} |", md_cell(&v));
    }
    let _ = writeln!(
        s,
        "\nThe data hash is SHA-256 over the files below in this order, each as its \
         relative path, a NUL byte, its length (8 bytes, little-endian) and its contents.\n"
    );
    let _ = writeln!(s, "| file | bytes | SHA-256 |\n|---|---:|---|");
    for f in &id.reference_files {
        let _ = writeln!(s, "| `{}` | {} | `{}` |", f.path, f.bytes, f.sha256);
    }

    let _ = writeln!(s, "\n## Results by suite and region\n");
    let _ = writeln!(
        s,
        "Errors are in each function's tolerance units (see Tolerances); a suite's row \
         shows its function with the largest error relative to its limit.\n"
    );
    let _ = writeln!(
        s,
        "| suite | region | cases | worst | limit | worst function | result |\n|---|---|---:|---:|---:|---|---|"
    );
    for row in &cert.suite_rows {
        let _ = writeln!(
            s,
            "| {} | {} | {} | {} | {} | {} | {} |",
            row.suite,
            row.region.name(),
            row.cases,
            short(row.worst.worst),
            short(row.worst.limit),
            row.worst.function,
            if row.passes() { "pass" } else { "**FAIL**" }
        );
    }

    let _ = writeln!(s, "\n## Results by function and region\n");
    let _ = writeln!(
        s,
        "| suite | function | region | cases | failures | worst | limit | worst case |\n|---|---|---|---:|---:|---:|---:|---|"
    );
    for g in &cert.results {
        let _ = writeln!(
            s,
            "| {} | {} | {} | {} | {} | {} | {} | {} |",
            g.suite,
            g.function,
            g.region.name(),
            g.cases,
            g.failures,
            short(g.worst),
            short(g.limit),
            g.worst_case
        );
    }

    let _ = writeln!(s, "\n## Expected failures\n");
    let _ = writeln!(
        s,
        "Known misses, measured like every other case. Each must still fail: one that \
         passes fails the certificate until it is taken off `tolerance::EXPECTED_FAILURES`.\n"
    );
    let _ = writeln!(s, "| suite | case | quantity | error | limit | status | reason |\n|---|---|---|---:|---:|---|---|");
    for x in &cert.expected_failures {
        let _ = writeln!(
            s,
            "| {} | {} | {} | {} | {} | {} | {} |",
            x.suite,
            x.case_id,
            x.quantity,
            short(x.units),
            short(x.limit),
            if x.still_fails {
                "still fails"
            } else {
                "**now passes**"
            },
            md_cell(x.reason)
        );
    }

    let _ = writeln!(s, "\n## Suites and their sources\n");
    for suite in &cert.suites {
        let _ = write!(s, "- **{}**: {}", suite.suite, md_cell(&suite.source));
        if let Some(why) = &suite.skipped {
            let _ = write!(s, ". Skipped: {why}");
        } else {
            let _ = write!(s, "; {} cases", suite.cases);
        }
        if let Some(note) = &suite.note {
            let _ = write!(s, ". {note}");
        }
        let _ = writeln!(s);
        for (case, reason) in &suite.cases_listed {
            let _ = writeln!(s, "  - `{case}`: {}", md_cell(reason));
        }
    }
    let _ = writeln!(
        s,
        "\nGenerators of the tables (see reference-cases/README.md):\n"
    );
    for g in &cert.generators {
        let _ = writeln!(s, "- `{}`: requires {}", g.path, md_cell(&g.requires));
    }
    let _ = writeln!(s, "\nWorked examples (textbook suite):\n");
    let _ = writeln!(
        s,
        "| id | quantity | source | citation |\n|---|---|---|---|"
    );
    for t in &cert.textbook_sources {
        let _ = writeln!(
            s,
            "| {} | {} | {} | {} |",
            t.id,
            t.quantity,
            md_cell(&t.source),
            t.citation
        );
    }

    let _ = writeln!(s, "\n## Regions\n");
    for (name, definition) in &cert.regions {
        let _ = writeln!(s, "- `{name}`: {definition}");
    }
    let _ = writeln!(
        s,
        "\nA case counts in `all`, in exactly one of `near_money`, `wings` and \
         `deep_tails`, and in any of the expiry and vol regions it meets. Checks that \
         are not on an option (the heat step) count in `all` only."
    );

    let _ = writeln!(s, "\n## Tolerances\n");
    let _ = writeln!(s, "From `harness/src/tolerance.rs`, before `--tighten`.\n");
    let _ = writeln!(s, "| entry | limit | reason |\n|---|---:|---|");
    for t in &cert.tolerances {
        let _ = writeln!(
            s,
            "| {} | {} | {} |",
            t.quantity,
            short(t.limit),
            md_cell(t.reason)
        );
    }

    let _ = writeln!(s, "\n## Error map\n");
    let _ = writeln!(
        s,
        "![price error in tolerance units over standardised moneyness and σ√T](error-map.svg)\n\n\
         Each cell shows the worst price error of `black/greeks.csv` in units of \
         ε·(1+κ)·|V| for the cases in it; the limit is {}.",
        short(tolerance::PRICE.limit / cert.run.tighten)
    );
    s
}
