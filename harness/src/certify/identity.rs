//! What a certificate certifies: the build, the machine, the date and the data.

use std::fmt::Write as _;
use std::path::Path;
use std::process::Command;
use std::time::{SystemTime, UNIX_EPOCH};

use serde::Serialize;
use sha2::{Digest, Sha256};

/// The kernel features the harness turns on (its `calor` dependency line in
/// `harness/Cargo.toml`; test `unit_identity_features_match_manifest`).
pub const KERNEL_FEATURES: &[&str] = &["serde"];

/// One reference file, as read.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct DataFile {
    /// Path relative to the cases folder, with `/` separators.
    pub path: String,
    /// Size in bytes.
    pub bytes: u64,
    /// SHA-256 of the contents, lowercase hex.
    pub sha256: String,
}

/// The identity block of a certificate.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Identity {
    /// Version of the `calor` kernel crate (the workspace version).
    pub crate_version: &'static str,
    /// `git rev-parse HEAD` of the checkout the harness was built from, or "unknown".
    pub git_commit: String,
    /// False when tracked files differ from that commit; `None` when unknown.
    pub git_tree_clean: Option<bool>,
    /// `rustc -V` of the compiler that built the harness.
    pub rustc: &'static str,
    /// Target triple.
    pub target: &'static str,
    /// Cargo profile (release or debug).
    pub profile: &'static str,
    /// Kernel features enabled.
    pub kernel_features: Vec<&'static str>,
    /// "model name" of /proc/cpuinfo, or "unknown".
    pub cpu_model: String,
    /// Date and time of the run, UTC, ISO 8601.
    pub date_utc: String,
    /// SHA-256 over every file read, in the order listed (see [`data_hash`]).
    pub reference_sha256: String,
    /// The files read, in order.
    pub reference_files: Vec<DataFile>,
}

impl Identity {
    /// Collects the identity of this build and machine for `files` (already read).
    pub fn collect(files: &[(String, Vec<u8>)]) -> Self {
        let checkout = Path::new(env!("CARGO_MANIFEST_DIR"));
        let git_commit = git(checkout, &["rev-parse", "HEAD"]).unwrap_or_else(|| "unknown".into());
        let git_tree_clean =
            git(checkout, &["status", "--porcelain", "--untracked-files=no"]).map(|s| s.is_empty());
        Identity {
            crate_version: env!("CARGO_PKG_VERSION"),
            git_commit,
            git_tree_clean,
            rustc: env!("CALOR_BUILD_RUSTC"),
            target: env!("CALOR_BUILD_TARGET"),
            profile: env!("CALOR_BUILD_PROFILE"),
            kernel_features: KERNEL_FEATURES.to_vec(),
            cpu_model: cpu_model().unwrap_or_else(|| "unknown".into()),
            date_utc: utc_timestamp(SystemTime::now()),
            reference_sha256: data_hash(files),
            reference_files: files
                .iter()
                .map(|(path, bytes)| DataFile {
                    path: path.clone(),
                    bytes: bytes.len() as u64,
                    sha256: hex(&Sha256::digest(bytes)),
                })
                .collect(),
        }
    }
}

fn git(dir: &Path, args: &[&str]) -> Option<String> {
    let out = Command::new("git")
        .arg("-C")
        .arg(dir)
        .args(args)
        .output()
        .ok()?;
    if !out.status.success() {
        return None;
    }
    Some(String::from_utf8(out.stdout).ok()?.trim().to_owned())
}

fn cpu_model() -> Option<String> {
    let info = std::fs::read_to_string("/proc/cpuinfo").ok()?;
    info.lines()
        .find(|l| l.starts_with("model name"))
        .and_then(|l| l.split_once(':'))
        .map(|(_, v)| v.trim().to_owned())
}

/// SHA-256 over the files in order: for each, its relative path, a NUL byte,
/// its length as 8 little-endian bytes, then its contents. Renaming, moving
/// or editing any file changes the hash.
pub fn data_hash(files: &[(String, Vec<u8>)]) -> String {
    let mut h = Sha256::new();
    for (path, bytes) in files {
        h.update(path.as_bytes());
        h.update([0]);
        h.update((bytes.len() as u64).to_le_bytes());
        h.update(bytes);
    }
    hex(&h.finalize())
}

fn hex(bytes: &[u8]) -> String {
    bytes.iter().fold(String::new(), |mut s, b| {
        let _ = write!(s, "{b:02x}");
        s
    })
}

/// `time` as `YYYY-MM-DDTHH:MM:SSZ` (UTC; the epoch itself for times before it).
pub fn utc_timestamp(time: SystemTime) -> String {
    let secs = time.duration_since(UNIX_EPOCH).map_or(0, |d| d.as_secs());
    let (days, rest) = (secs / 86_400, secs % 86_400);
    let (y, m, d) = civil_date(days);
    format!(
        "{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}Z",
        rest / 3600,
        rest % 3600 / 60,
        rest % 60
    )
}

/// Year, month and day of `days` since 1970-01-01 in the proleptic Gregorian
/// calendar. Counts in 400-year eras of 146,097 days from 0000-03-01, so that
/// the leap day falls at the end of each computed year.
fn civil_date(days: u64) -> (u64, u64, u64) {
    // Days from 0000-03-01 to 1970-01-01.
    let from_march_0 = days + 719_468;
    let era = from_march_0 / 146_097;
    let day_of_era = from_march_0 % 146_097;
    let year_of_era =
        (day_of_era - day_of_era / 1460 + day_of_era / 36_524 - day_of_era / 146_096) / 365;
    let day_of_year = day_of_era - (365 * year_of_era + year_of_era / 4 - year_of_era / 100);
    // Months from March: 153 days per five months.
    let month_from_march = (5 * day_of_year + 2) / 153;
    let day = day_of_year - (153 * month_from_march + 2) / 5 + 1;
    let month = if month_from_march < 10 {
        month_from_march + 3
    } else {
        month_from_march - 9
    };
    let year = era * 400 + year_of_era + u64::from(month <= 2);
    (year, month, day)
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::time::Duration;

    #[test]
    fn unit_identity_dates() {
        let at = |s| utc_timestamp(UNIX_EPOCH + Duration::from_secs(s));
        assert_eq!(at(0), "1970-01-01T00:00:00Z");
        assert_eq!(at(951_782_400), "2000-02-29T00:00:00Z");
        assert_eq!(at(1_709_251_199), "2024-02-29T23:59:59Z");
        assert_eq!(at(4_107_542_400), "2100-03-01T00:00:00Z");
    }

    #[test]
    fn unit_identity_features_match_manifest() {
        let manifest = include_str!("../../Cargo.toml");
        let line = manifest
            .lines()
            .find(|l| l.starts_with("calor ="))
            .expect("the calor dependency");
        let listed = KERNEL_FEATURES
            .iter()
            .map(|f| format!("\"{f}\""))
            .collect::<Vec<_>>()
            .join(", ");
        assert!(line.contains(&format!("features = [{listed}]")), "{line}");
    }

    #[test]
    fn unit_identity_hash_covers_names() {
        let a = data_hash(&[("a".into(), b"x".to_vec())]);
        let b = data_hash(&[("b".into(), b"x".to_vec())]);
        assert_ne!(a, b);
        assert_eq!(data_hash(&[]).len(), 64);
    }
}
