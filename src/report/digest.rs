//! The metrics digest: from the history, every metric's trend over the last runs (an SVG with
//! its spec limits), its change since the previous run and since a baseline, and the
//! regressions listed first. Same history and options, same bytes.
use std::collections::BTreeMap;

use super::change::{self, Change};
use super::history::{BadLine, History, Record, Status};
use super::markdown::{ESTIMATES_NOTE, escape, verdict};
use super::metric::Spec;
use super::plot::{self, Kind, Plot};

/// What the digest compares and how much of the trend it draws.
#[derive(Clone, Debug)]
pub struct Options {
    /// The history file as the user named it (shown in the digest).
    pub source: String,
    /// A run number, or the first (at least 4) hex digits of a commit; None: the first run.
    pub baseline: Option<String>,
    /// Percent a metric must move toward a spec limit to count as a regression.
    pub threshold_pct: f64,
    /// Runs shown in each trend.
    pub last: usize,
}

/// A written digest: `digest.md` and its trend figures (file name, SVG).
#[derive(Clone, Debug)]
pub struct Digest {
    pub markdown: String,
    pub figures: Vec<(String, String)>,
    pub regressions: usize,
}

/// One row of the digest: a metric of a report, its values by run.
struct Row<'a> {
    report: &'a str,
    name: &'a str,
    unit: &'a str,
    spec: Spec,
    /// (run, value), in run order.
    points: Vec<(u64, f64)>,
}

/// The run the baseline names.
fn baseline_run(h: &History, runs: &[u64], b: Option<&str>) -> Result<u64, String> {
    let Some(b) = b else { return Ok(runs[0]) };
    if let Ok(n) = b.parse::<u64>() {
        return if runs.contains(&n) {
            Ok(n)
        } else {
            Err(format!("--baseline {b}: no run {b} in the history; its runs are {}…{}", runs[0], runs[runs.len() - 1]))
        };
    }
    if b.len() >= 4 && b.bytes().all(|c| c.is_ascii_hexdigit()) {
        let b = b.to_ascii_lowercase();
        if let Some(r) = h.records.iter().find(|r| r.commit.as_deref().is_some_and(|c| c.starts_with(&b))) {
            return Ok(r.run);
        }
        return Err(format!("--baseline {b}: no run of the history was made at a commit starting with {b}"));
    }
    Err(format!("--baseline {b}: expected a run number or the first 4 or more hex digits of a commit"))
}

/// The records of one run, by report.
fn of_run(h: &History, run: u64) -> BTreeMap<&str, &Record> {
    h.records.iter().filter(|r| r.run == run).map(|r| (r.report.as_str(), r)).collect()
}

fn value_in(recs: &BTreeMap<&str, &Record>, report: &str, name: &str) -> Option<f64> {
    recs.get(report).and_then(|r| r.metrics.iter().find(|m| m.name == name)).map(|m| m.value)
}

/// A regression row: report, metric, the values and why.
struct Regression {
    report: String,
    name: String,
    text: String,
}

/// Build the digest of `h`.
pub fn build(h: &History, o: &Options) -> Result<Digest, String> {
    let runs = h.runs();
    if runs.is_empty() {
        return Err(format!("{}: the history holds no readable record", o.source));
    }
    let latest = runs[runs.len() - 1];
    let previous = (runs.len() > 1).then(|| runs[runs.len() - 2]);
    let base = baseline_run(h, &runs, o.baseline.as_deref())?;
    let shown: Vec<u64> = runs[runs.len().saturating_sub(o.last.max(1))..].to_vec();
    let (l, p, b) = (of_run(h, latest), previous.map(|r| of_run(h, r)).unwrap_or_default(), of_run(h, base));

    // Rows: every metric of the latest run, in script order then recording order.
    let mut rows: Vec<Row> = Vec::new();
    for rec in l.values() {
        for m in &rec.metrics {
            let points = h
                .records
                .iter()
                .filter(|r| r.report == rec.report && shown.contains(&r.run))
                .filter_map(|r| r.metrics.iter().find(|x| x.name == m.name).map(|x| (r.run, x.value)))
                .collect();
            rows.push(Row { report: &rec.report, name: &m.name, unit: &m.unit, spec: m.spec(), points });
        }
    }
    let mut regressions: Vec<Regression> = Vec::new();
    let fmt = |v: f64, u: &str| super::format::value(v, u, 4);
    for row in &rows {
        let new = row.points.last().map(|p| p.1).unwrap_or(f64::NAN);
        for (label, recs) in [("previous", &p), ("baseline", &b)] {
            if label == "baseline" && (Some(base) == previous || base == latest) {
                continue;
            }
            let Some(old) = value_in(recs, row.report, row.name) else { continue };
            let c: Change = change::judge(old, new, &row.spec, o.threshold_pct);
            if let Some(why) = c.regression {
                regressions.push(Regression {
                    report: row.report.to_string(),
                    name: row.name.to_string(),
                    text: format!(
                        "{} → {} ({} since the {label} run), spec {}: {why}",
                        fmt(old, row.unit),
                        fmt(new, row.unit),
                        change::pct_text(c.pct),
                        row.spec.text(row.unit)
                    ),
                });
            }
        }
    }
    // A script that failed, or a metric that is gone, is a regression too: nothing to gate on.
    if previous.is_some() {
        for (report, prev) in &p {
            let now = l.get(report);
            if now.is_some_and(|r| r.status == Status::Error) || now.is_none() {
                let what = if now.is_none() { "not run in the latest run" } else { "script error in the latest run" };
                regressions.push(Regression { report: report.to_string(), name: String::new(), text: what.into() });
                continue;
            }
            for m in &prev.metrics {
                if value_in(&l, report, &m.name).is_none() {
                    regressions.push(Regression {
                        report: report.to_string(),
                        name: m.name.clone(),
                        text: "recorded in the previous run, missing in the latest".into(),
                    });
                }
            }
        }
    }

    let time = l.values().next().map(|r| r.time.as_str()).unwrap_or("");
    let commit = l.values().find_map(|r| r.commit.as_deref()).map(|c| format!(", commit `{}`", &c[..c.len().min(12)]));
    let mut s = String::from("# Metrics digest\n\n");
    s.push_str(&format!(
        "- history: `{}`, {} run{} ({}…{})\n",
        o.source,
        runs.len(),
        if runs.len() == 1 { "" } else { "s" },
        runs[0],
        latest
    ));
    s.push_str(&format!("- latest: run {latest} at {time}{}\n", commit.unwrap_or_default()));
    match previous {
        Some(r) => s.push_str(&format!("- compared with: the previous run {r} and the baseline run {base}\n")),
        None => s.push_str("- compared with: nothing yet (one run)\n"),
    }
    s.push_str(&format!(
        "- threshold: a move of more than {} % toward a spec limit, or out of the spec, is a regression\n",
        o.threshold_pct
    ));
    if !h.bad.is_empty() {
        s.push_str("- skipped lines of the history:\n");
        for BadLine { line, why } in &h.bad {
            s.push_str(&format!("  - line {line}: {}\n", escape(why)));
        }
    }
    s.push('\n');
    s.push_str(ESTIMATES_NOTE);
    s.push_str("\n\n");
    s.push_str(&format!("## Regressions ({})\n\n", regressions.len()));
    if regressions.is_empty() {
        s.push_str("None.\n");
    }
    for r in &regressions {
        let name = if r.name.is_empty() { String::new() } else { format!(" `{}`", r.name) };
        s.push_str(&format!("- **{}**{name}: {}\n", escape(&r.report), r.text));
    }
    s.push_str("\n## Every metric of the latest run\n\n");
    s.push_str("| report | metric | latest | since previous | since baseline | spec | result |\n");
    s.push_str("| --- | --- | ---: | ---: | ---: | --- | --- |\n");
    let mut figures = Vec::new();
    let mut trends = String::new();
    for (k, row) in rows.iter().enumerate() {
        let new = row.points.last().map(|p| p.1).unwrap_or(f64::NAN);
        let since = |recs: &BTreeMap<&str, &Record>| {
            value_in(recs, row.report, row.name)
                .map(|old| change::pct_text(change::pct(old, new)))
                .unwrap_or("—".into())
        };
        let spec = if row.spec.is_open() { "—".to_string() } else { row.spec.text(row.unit) };
        let pass = change::margin(new, &row.spec).map(|m| verdict(m >= 0.0)).unwrap_or("—");
        s.push_str(&format!(
            "| {} | `{}` | {} | {} | {} | {spec} | {pass} |\n",
            escape(row.report),
            row.name,
            fmt(new, row.unit),
            if previous.is_some() { since(&p) } else { "—".into() },
            since(&b)
        ));
        let title = format!("{} {}", row.report, row.name);
        let file = format!("trend-{:02}-{}.svg", k + 1, plot::slug(&title));
        figures.push((file.clone(), trend_svg(row, &title)?));
        trends.push_str(&format!("\n![Trend of {}]({file})\n", escape(&title)));
    }
    s.push_str("\n## Trends\n");
    s.push_str(&trends);
    Ok(Digest { markdown: s, figures, regressions: regressions.len() })
}

/// The trend of one metric: its value by run, with the spec limits as flat lines.
fn trend_svg(row: &Row, title: &str) -> Result<String, String> {
    let mut p = Plot::new(Kind::Line);
    p.title = title.to_string();
    p.x = row.points.iter().map(|(r, _)| *r as f64).collect();
    p.ys = vec![row.points.iter().map(|(_, v)| *v).collect()];
    p.names = vec![row.name.to_string()];
    for (label, lim) in [("spec min", row.spec.min), ("spec max", row.spec.max)] {
        if let Some(v) = lim {
            p.ys.push(vec![v; p.x.len()]);
            p.names.push(label.to_string());
        }
    }
    p.x_label = "run".into();
    p.y_label = row.name.to_string();
    p.y_unit = row.unit.to_string();
    if p.x.len() == 1 {
        // One run: a trend of one point, drawn as a point.
        p.kind = Kind::Scatter;
    }
    plot::svg::render(&p)
}
