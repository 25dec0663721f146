//! `compare OLD NEW`: two output folders (every `results.json` below each, matched by sub-path)
//! or two `results.json` files, metric by metric, with the digest's regression rule.
use std::collections::BTreeMap;
use std::path::Path;

use serde::Deserialize;

use super::change;
use super::markdown::{escape, verdict};
use super::metric::Spec;

#[derive(Deserialize)]
struct ResultsFile {
    metrics: Vec<MetricIn>,
}

#[derive(Deserialize)]
struct MetricIn {
    name: String,
    value: f64,
    unit: String,
    spec: Option<SpecIn>,
}

#[derive(Deserialize)]
struct SpecIn {
    min: Option<f64>,
    max: Option<f64>,
}

/// Metrics by report sub-path (`""` for a single file), each in recording order.
pub type Side = BTreeMap<String, Vec<(String, f64, String, Spec)>>;

fn read_results(path: &Path) -> Result<Vec<(String, f64, String, Spec)>, String> {
    let text = std::fs::read_to_string(path).map_err(|e| format!("{}: cannot read it: {e}", path.display()))?;
    let r: ResultsFile =
        serde_json::from_str(&text).map_err(|e| format!("{}: not a tickwork results.json: {e}", path.display()))?;
    Ok(r.metrics
        .into_iter()
        .map(|m| {
            let spec = m.spec.map(|s| Spec { min: s.min, max: s.max }).unwrap_or_default();
            (m.name, m.value, m.unit, spec)
        })
        .collect())
}

fn walk(dir: &Path, rel: &str, out: &mut Side) -> Result<(), String> {
    let mut names: Vec<_> = std::fs::read_dir(dir)
        .map_err(|e| format!("{}: cannot read the folder: {e}", dir.display()))?
        .flatten()
        .map(|e| (e.file_name().to_string_lossy().to_string(), e.path()))
        .collect();
    names.sort();
    for (name, path) in names {
        if std::fs::symlink_metadata(&path).map(|m| m.is_dir()).unwrap_or(false) {
            let sub = if rel.is_empty() { name.clone() } else { format!("{rel}/{name}") };
            walk(&path, &sub, out)?;
        } else if name == "results.json" {
            out.insert(rel.to_string(), read_results(&path)?);
        }
    }
    Ok(())
}

/// Read one side: a folder (every results.json below it) or one results.json.
pub fn read_side(path: &Path) -> Result<Side, String> {
    let mut side = Side::new();
    if path.is_dir() {
        walk(path, "", &mut side)?;
        if side.is_empty() {
            return Err(format!("{}: no results.json in this folder or below it", path.display()));
        }
    } else {
        side.insert(String::new(), read_results(path)?);
    }
    Ok(side)
}

/// The comparison as Markdown, and the number of regressions.
pub fn compare(old_name: &str, old: &Side, new_name: &str, new: &Side, threshold_pct: f64) -> (String, usize) {
    let mut rows = String::new();
    let mut regressions = Vec::new();
    let fmt = |v: f64, u: &str| super::format::value(v, u, 4);
    let mut reports: Vec<&String> = old.keys().chain(new.keys()).collect();
    reports.sort();
    reports.dedup();
    for rep in reports {
        let shown = if rep.is_empty() { "—".to_string() } else { escape(rep) };
        let (o, n) = (old.get(rep.as_str()), new.get(rep.as_str()));
        let mut names: Vec<&str> = n.into_iter().flatten().map(|m| m.0.as_str()).collect();
        for m in o.into_iter().flatten() {
            if !names.contains(&m.0.as_str()) {
                names.push(&m.0);
            }
        }
        for name in names {
            let om = o.and_then(|v| v.iter().find(|m| m.0 == name));
            let nm = n.and_then(|v| v.iter().find(|m| m.0 == name));
            let (cells, why) = match (om, nm) {
                (Some(a), Some(b)) => {
                    let c = change::judge(a.1, b.1, &b.3, threshold_pct);
                    let spec = if b.3.is_open() { "—".to_string() } else { b.3.text(&b.2) };
                    let res = change::margin(b.1, &b.3).map(|m| verdict(m >= 0.0)).unwrap_or("—");
                    (
                        format!(
                            "{} | {} | {} | {spec} | {res}",
                            fmt(a.1, &a.2),
                            fmt(b.1, &b.2),
                            change::pct_text(c.pct)
                        ),
                        c.regression,
                    )
                }
                (Some(a), None) => (format!("{} | — | — | — | —", fmt(a.1, &a.2)), Some("missing in NEW".to_string())),
                (None, Some(b)) => (format!("— | {} | new | — | —", fmt(b.1, &b.2)), None),
                (None, None) => continue,
            };
            let note = why.as_deref().map(|w| format!("**regression**: {w}")).unwrap_or_default();
            if why.is_some() {
                regressions.push(format!("{shown} `{name}`"));
            }
            rows.push_str(&format!("| {shown} | `{name}` | {cells} | {note} |\n"));
        }
    }
    let mut s = format!("# Comparison\n\n- old: `{old_name}`\n- new: `{new_name}`\n- threshold: {threshold_pct} %\n\n");
    s.push_str(&format!("**{} regression{}**", regressions.len(), if regressions.len() == 1 { "" } else { "s" }));
    if regressions.is_empty() {
        s.push_str(".\n\n");
    } else {
        s.push_str(&format!(": {}.\n\n", regressions.join(", ")));
    }
    s.push_str("| report | metric | old | new | change | spec | result | note |\n");
    s.push_str("| --- | --- | ---: | ---: | ---: | --- | --- | --- |\n");
    s.push_str(&rows);
    (s, regressions.len())
}
