//! Collecting measurements by suite, function and region, in units of tolerance.

use std::collections::HashMap;

use serde::Serialize;

use crate::certify::region::Region;

/// The worst error of one function in one region.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Group {
    /// The suite (`black`, `implied`, `american`, ...).
    pub suite: &'static str,
    /// The function checked within the suite (`price`, `delta`, `parity`, ...).
    pub function: &'static str,
    /// The region.
    pub region: Region,
    /// Checks measured.
    pub cases: usize,
    /// Checks over the limit.
    pub failures: usize,
    /// Largest error, in the function's tolerance units (infinite for a refusal or NaN).
    pub worst: f64,
    /// The limit in the same units, after `--tighten`.
    pub limit: f64,
    /// Id of the worst case.
    pub worst_case: String,
    /// Inputs, expected and actual of the worst case.
    pub detail: String,
}

impl Group {
    /// True when every check is within the limit.
    pub fn passes(&self) -> bool {
        self.failures == 0
    }

    /// The worst error as a fraction of the limit.
    pub fn ratio(&self) -> f64 {
        self.worst / self.limit
    }
}

/// The worst failing check of a run.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Failure {
    /// The suite.
    pub suite: &'static str,
    /// The function.
    pub function: &'static str,
    /// Case id.
    pub case_id: String,
    /// Error in tolerance units.
    pub error: f64,
    /// The limit.
    pub limit: f64,
    /// Inputs, expected and actual.
    pub detail: String,
}

/// Every group of a run, in the order first seen, and the worst failure.
#[derive(Debug, Clone)]
pub struct Tally {
    /// Every limit is divided by this (`--tighten`).
    pub tighten: f64,
    groups: Vec<Group>,
    index: HashMap<(&'static str, &'static str, Region), usize>,
    worst_failure: Option<Failure>,
}

impl Tally {
    /// An empty tally; limits are divided by `tighten`.
    pub fn new(tighten: f64) -> Self {
        Tally {
            tighten,
            groups: Vec::new(),
            index: HashMap::new(),
            worst_failure: None,
        }
    }

    /// Records one check of `function` in `suite` on a case in `regions` (besides
    /// [`Region::All`]); `detail` is only built when the check is a new worst
    /// of some group or the worst failure.
    #[allow(clippy::too_many_arguments)]
    pub fn record<F: FnOnce() -> String>(
        &mut self,
        suite: &'static str,
        function: &'static str,
        case_id: &str,
        regions: &[Region],
        error: f64,
        limit: f64,
        detail: F,
    ) {
        // NaN counts as the worst possible error.
        let error = if error.is_nan() { f64::INFINITY } else { error };
        let limit = limit / self.tighten;
        let fails = error > limit;
        let mut detail = Some(detail);
        let mut text = String::new();
        let mut text_of = |detail: &mut Option<F>| {
            if let Some(d) = detail.take() {
                text = d();
            }
            text.clone()
        };
        for &region in std::iter::once(&Region::All).chain(regions) {
            let at = *self
                .index
                .entry((suite, function, region))
                .or_insert_with(|| {
                    self.groups.push(Group {
                        suite,
                        function,
                        region,
                        cases: 0,
                        failures: 0,
                        worst: 0.0,
                        limit,
                        worst_case: String::new(),
                        detail: String::new(),
                    });
                    self.groups.len() - 1
                });
            let Some(group) = self.groups.get_mut(at) else {
                continue;
            };
            group.cases += 1;
            group.failures += usize::from(fails);
            if group.worst_case.is_empty() || error > group.worst {
                group.worst = error;
                case_id.clone_into(&mut group.worst_case);
                group.detail = text_of(&mut detail);
            }
        }
        let worse = self
            .worst_failure
            .as_ref()
            .is_none_or(|w| error / limit > w.error / w.limit);
        if fails && worse {
            self.worst_failure = Some(Failure {
                suite,
                function,
                case_id: case_id.to_owned(),
                error,
                limit,
                detail: text_of(&mut detail),
            });
        }
    }

    /// Every group, in the order first recorded.
    pub fn groups(&self) -> &[Group] {
        &self.groups
    }

    /// The failing check with the largest error relative to its limit.
    pub fn worst_failure(&self) -> Option<&Failure> {
        self.worst_failure.as_ref()
    }

    /// True when no check failed.
    pub fn passes(&self) -> bool {
        self.worst_failure.is_none()
    }

    /// One row per suite and region: the group with the largest error relative
    /// to its limit stands for the suite; `cases` is the largest count of its
    /// functions (every function of a suite sees the same cases).
    pub fn by_suite(&self) -> Vec<SuiteRow> {
        let mut rows: Vec<SuiteRow> = Vec::new();
        for g in &self.groups {
            match rows
                .iter_mut()
                .find(|r| r.suite == g.suite && r.region == g.region)
            {
                Some(row) => {
                    row.cases = row.cases.max(g.cases);
                    row.failures += g.failures;
                    if g.ratio() > row.worst.ratio() {
                        row.worst = g.clone();
                    }
                }
                None => rows.push(SuiteRow {
                    suite: g.suite,
                    region: g.region,
                    cases: g.cases,
                    failures: g.failures,
                    worst: g.clone(),
                }),
            }
        }
        // Regions in report order within each suite, suites in the order run.
        let suite_order: Vec<&str> = {
            let mut seen = Vec::new();
            for g in &self.groups {
                if !seen.contains(&g.suite) {
                    seen.push(g.suite);
                }
            }
            seen
        };
        rows.sort_by_key(|r| (suite_order.iter().position(|s| *s == r.suite), r.region));
        rows
    }
}

/// One suite in one region.
#[derive(Debug, Clone, PartialEq)]
pub struct SuiteRow {
    /// The suite.
    pub suite: &'static str,
    /// The region.
    pub region: Region,
    /// Cases measured.
    pub cases: usize,
    /// Failing checks over all functions.
    pub failures: usize,
    /// The function with the largest error relative to its limit.
    pub worst: Group,
}

impl SuiteRow {
    /// True when no check of the suite failed in the region.
    pub fn passes(&self) -> bool {
        self.failures == 0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unit_tally_groups_and_worst_failure() {
        let mut t = Tally::new(1.0);
        t.record("s", "f", "a", &[Region::Wings], 1.0, 2.0, || "a".into());
        t.record("s", "f", "b", &[Region::NearMoney], 3.0, 2.0, || "b".into());
        t.record("s", "g", "c", &[Region::NearMoney], 50.0, 100.0, || {
            "c".into()
        });
        assert_eq!(t.groups().len(), 5);
        let w = t.worst_failure().expect("a failure");
        assert_eq!((w.case_id.as_str(), w.detail.as_str()), ("b", "b"));
        let rows = t.by_suite();
        assert_eq!(rows.len(), 3);
        assert_eq!(rows[0].region, Region::All);
        assert_eq!(rows[0].worst.function, "f");
        assert_eq!(rows[0].failures, 1);
        let mut tight = Tally::new(4.0);
        tight.record("s", "f", "a", &[], 1.0, 2.0, String::new);
        assert!(!tight.passes());
    }
}
