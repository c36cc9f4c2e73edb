//! End-to-end tests of `calor certify`, run on the built binary.

use std::path::Path;
use std::process::{Command, Output};

use serde_json::Value;

fn reference_cases() -> &'static Path {
    Path::new(concat!(env!("CARGO_MANIFEST_DIR"), "/../reference-cases"))
}

fn certify(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_calor"))
        .arg("certify")
        .args(args)
        .output()
        .expect("the calor binary runs")
}

fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

/// Copies a folder tree.
fn copy_tree(from: &Path, to: &Path) {
    std::fs::create_dir_all(to).expect("a folder");
    for entry in std::fs::read_dir(from).expect("a readable folder") {
        let entry = entry.expect("an entry");
        let target = to.join(entry.file_name());
        if entry.file_type().expect("a type").is_dir() {
            copy_tree(&entry.path(), &target);
        } else {
            std::fs::copy(entry.path(), &target).expect("a copy");
        }
    }
}

#[test]
fn cli_certify_passes_on_shipped_cases() {
    let out = tempfile::tempdir().expect("a temp dir");
    let run = certify(&["--out", out.path().to_str().expect("utf-8")]);
    let stdout = text(&run.stdout);
    assert_eq!(
        run.status.code(),
        Some(0),
        "{stdout}\n{}",
        text(&run.stderr)
    );
    assert!(stdout.contains("verdict: PASS"), "{stdout}");
    for region in [
        "near_money",
        "wings",
        "deep_tails",
        "short_expiry",
        "high_vol",
    ] {
        assert!(stdout.contains(region), "no {region} row:\n{stdout}");
    }
    for name in ["report.md", "report.json", "error-map.svg"] {
        let path = out.path().join(name);
        let size = std::fs::metadata(&path).map_or(0, |m| m.len());
        assert!(size > 0, "{} missing or empty", path.display());
    }
    let json: Value = serde_json::from_str(
        &std::fs::read_to_string(out.path().join("report.json")).expect("report.json"),
    )
    .expect("valid JSON");
    assert_eq!(json["format"], "calor-certificate/1");
    assert_eq!(json["passes"], true);
    assert_eq!(
        json["identity"]["reference_sha256"].as_str().map(str::len),
        Some(64)
    );
    assert!(json["identity"]["rustc"]
        .as_str()
        .is_some_and(|r| r.starts_with("rustc ")));
    let suites: Vec<&str> = json["suites"]
        .as_array()
        .expect("suites")
        .iter()
        .filter_map(|s| s["suite"].as_str())
        .collect();
    for suite in [
        "black",
        "implied",
        "near_expiry",
        "textbook",
        "heat",
        "ladder",
        "sweep",
    ] {
        assert!(suites.contains(&suite), "{suites:?}");
    }
    let expected = json["expected_failures"].as_array().expect("a list");
    assert!(expected.iter().all(|x| x["still_fails"] == true));
    let md = std::fs::read_to_string(out.path().join("report.md")).expect("report.md");
    for needle in ["mpmath==1.3.0", "Hull", "g03981", "## Tolerances"] {
        assert!(md.contains(needle), "report.md lacks {needle}");
    }
    let svg = std::fs::read_to_string(out.path().join("error-map.svg")).expect("svg");
    assert!(svg.starts_with("<svg"));
}

#[test]
fn cli_certify_fails_loudly_when_tightened() {
    let out = tempfile::tempdir().expect("a temp dir");
    let run = certify(&[
        "--out",
        out.path().to_str().expect("utf-8"),
        "--tighten",
        "1000",
    ]);
    let stdout = text(&run.stdout);
    assert_eq!(run.status.code(), Some(1), "{stdout}");
    assert!(stdout.contains("verdict: FAIL"), "{stdout}");
    let worst = stdout
        .lines()
        .skip_while(|l| !l.starts_with("worst failing case:"))
        .collect::<Vec<_>>()
        .join("\n");
    assert!(
        worst.contains("expected") && worst.contains("got"),
        "{stdout}"
    );
    // The certificate is still written, and says why it failed.
    let json: Value = serde_json::from_str(
        &std::fs::read_to_string(out.path().join("report.json")).expect("report.json"),
    )
    .expect("valid JSON");
    assert_eq!(json["passes"], false);
    assert!(json["worst_failure"]["case_id"].is_string());
}

#[test]
fn cli_certify_names_file_line_and_field_of_a_bad_cell() {
    let scratch = tempfile::tempdir().expect("a temp dir");
    let cases = scratch.path().join("cases");
    copy_tree(reference_cases(), &cases);
    let table = cases.join("black/greeks.csv");
    let original = std::fs::read_to_string(&table).expect("the table");
    let mut lines: Vec<String> = original.lines().map(str::to_owned).collect();
    // Line 3 of the file (the second case): its spot becomes garbage.
    let mut cells: Vec<&str> = lines[2].split(',').collect();
    assert_eq!(
        original.lines().next().map(|h| h.split(',').nth(3)),
        Some(Some("spot"))
    );
    cells[3] = "12.5x";
    lines[2] = cells.join(",");
    std::fs::write(&table, lines.join("\n") + "\n").expect("a write");
    let run = certify(&[
        "--cases",
        cases.to_str().expect("utf-8"),
        "--out",
        scratch.path().join("out").to_str().expect("utf-8"),
    ]);
    let stderr = text(&run.stderr);
    assert_eq!(run.status.code(), Some(2), "{stderr}");
    assert!(stderr.contains("greeks.csv"), "{stderr}");
    assert!(stderr.contains("line 3"), "{stderr}");
    assert!(stderr.contains("field spot"), "{stderr}");
}

#[test]
fn cli_certify_refuses_a_bad_tighten_factor() {
    let run = certify(&["--tighten", "0"]);
    assert_eq!(run.status.code(), Some(2));
}
