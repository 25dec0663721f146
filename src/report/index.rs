//! `OUT/index.md`: one page for a whole run, linking every script's report, with a table of
//! every metric and its spec status. Same run, same bytes: nothing in it depends on the clock.
use super::markdown::{escape, metric_cells};
use super::metric::Metric;

/// How one script of the run ended, as the index shows it.
#[derive(Clone, Debug, PartialEq)]
pub enum Outcome {
    /// Ran; its metrics in recording order.
    Ran(Vec<Metric>),
    /// Failed with a script error; the previous report, if any, was left in place.
    Failed,
}

/// One script of the run.
#[derive(Clone, Debug, PartialEq)]
pub struct Entry {
    /// Output sub-path below OUT (`sub/path/name`), the folder holding its report.
    pub sub: String,
    /// Script path as shown to the user.
    pub script: String,
    pub outcome: Outcome,
}

/// Counts for the summary line: scripts run, failed, with a broken spec.
pub fn counts(entries: &[Entry]) -> (usize, usize, usize) {
    let failed = entries.iter().filter(|e| e.outcome == Outcome::Failed).count();
    let broken = entries
        .iter()
        .filter(|e| matches!(&e.outcome, Outcome::Ran(m) if m.iter().any(|m| m.pass() == Some(false))))
        .count();
    (entries.len(), failed, broken)
}

/// The summary sentence: `3 scripts: 1 failed, 1 with a metric out of spec`.
pub fn summary(entries: &[Entry]) -> String {
    let (n, failed, broken) = counts(entries);
    let s = if n == 1 { "" } else { "s" };
    format!("{n} script{s} run: {failed} failed, {broken} with a metric out of spec")
}

/// The Markdown of `index.md`.
pub fn render(entries: &[Entry]) -> String {
    let mut s = String::from("# Index of reports\n\n");
    s.push_str(&summary(entries));
    s.push_str(".\n\n| report | script | result |\n| --- | --- | --- |\n");
    for e in entries {
        let result = match &e.outcome {
            Outcome::Failed => "**script error** (the report is the previous run's, if any)".to_string(),
            Outcome::Ran(m) => {
                let failed = m.iter().filter(|m| m.pass() == Some(false)).count();
                match (m.len(), failed) {
                    (0, _) => "ran, no metrics".to_string(),
                    (n, 0) => format!("{n} metric{}, none out of spec", if n == 1 { "" } else { "s" }),
                    (n, f) => format!("{n} metric{}, **{f} out of spec**", if n == 1 { "" } else { "s" }),
                }
            }
        };
        s.push_str(&format!("| [{}]({}/report.md) | `{}` | {result} |\n", escape(&e.sub), e.sub, e.script));
    }
    let rows: Vec<(&Entry, &Metric)> = entries
        .iter()
        .flat_map(|e| match &e.outcome {
            Outcome::Ran(m) => m.iter().map(|m| (e, m)).collect::<Vec<_>>(),
            Outcome::Failed => vec![],
        })
        .collect();
    if !rows.is_empty() {
        s.push_str("\n## Metrics\n\n| report | metric | value | spec | result |\n| --- | --- | ---: | --- | --- |\n");
        for (e, m) in rows {
            s.push_str(&format!(
                "| [{}]({}/report.md) | `{}` | {} |\n",
                escape(&e.sub),
                e.sub,
                m.name,
                metric_cells(m)
            ));
        }
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::Spec;
    #[test]
    fn links_counts_and_metric_rows() {
        let m = |v| Metric::new("osc.period", v, "s", Spec { min: None, max: Some(2e-6) }).unwrap();
        let e = vec![
            Entry { sub: "a/x".into(), script: "a/x.rhai".into(), outcome: Outcome::Ran(vec![m(1e-6)]) },
            Entry { sub: "b/x".into(), script: "b/x.rhai".into(), outcome: Outcome::Ran(vec![m(3e-6)]) },
            Entry { sub: "c".into(), script: "c.rhai".into(), outcome: Outcome::Failed },
        ];
        assert_eq!(counts(&e), (3, 1, 1));
        let md = render(&e);
        assert!(md.contains("3 scripts run: 1 failed, 1 with a metric out of spec."), "{md}");
        assert!(md.contains("| [a/x](a/x/report.md) | `osc.period` | 1.000 µs | ≤ 2.00 µs | pass |"), "{md}");
        assert!(md.contains("| [b/x](b/x/report.md) | `osc.period` | 3.000 µs | ≤ 2.00 µs | **FAIL** |"), "{md}");
        assert!(md.contains("| [c](c/report.md) | `c.rhai` | **script error**"), "{md}");
    }
}
