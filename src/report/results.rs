//! `results.json`: the run's metrics with units, specs and pass/fail, plus its provenance, for
//! CI gates, the metrics history and the digest. Field order is fixed, so the bytes are stable.
use serde::Serialize;

use super::model::Report;
use super::provenance::Provenance;

#[derive(Serialize)]
struct Results<'a> {
    /// Format version of this file.
    format: u32,
    report: &'a str,
    /// True when no metric failed its spec.
    pass: bool,
    metrics: Vec<MetricJson<'a>>,
    provenance: ProvJson<'a>,
}

#[derive(Serialize)]
struct MetricJson<'a> {
    name: &'a str,
    value: f64,
    unit: &'a str,
    spec: Option<SpecJson>,
    /// None (null) when the metric has no spec.
    pass: Option<bool>,
}

#[derive(Serialize)]
struct SpecJson {
    min: Option<f64>,
    max: Option<f64>,
}

#[derive(Serialize)]
struct ProvJson<'a> {
    tool: &'a str,
    script: Option<&'a str>,
    script_sha256: Option<&'a str>,
    inputs: Vec<InputJson<'a>>,
    overrides: &'a std::collections::BTreeMap<String, String>,
    seed: u64,
    #[serde(skip_serializing_if = "Option::is_none")]
    stamp: Option<&'a str>,
}

#[derive(Serialize)]
struct InputJson<'a> {
    path: &'a str,
    sha256: &'a str,
}

/// The text of `results.json` (pretty-printed, ending in a newline).
pub fn json(report: &Report, prov: &Provenance) -> String {
    let metrics: Vec<MetricJson> = report
        .metrics()
        .map(|m| MetricJson {
            name: &m.name,
            value: m.value,
            unit: &m.unit,
            spec: if m.spec.is_open() { None } else { Some(SpecJson { min: m.spec.min, max: m.spec.max }) },
            pass: m.pass(),
        })
        .collect();
    let r = Results {
        format: 1,
        report: &report.title,
        pass: report.failed().is_empty(),
        metrics,
        provenance: ProvJson {
            tool: &prov.tool,
            script: prov.script.as_deref(),
            script_sha256: prov.script_sha256.as_deref(),
            inputs: prov.inputs.iter().map(|(p, h)| InputJson { path: p, sha256: h }).collect(),
            overrides: &prov.overrides,
            seed: prov.seed,
            stamp: prov.stamp.as_deref(),
        },
    };
    // Serialising plain structs of strings and finite numbers cannot fail.
    let mut s = serde_json::to_string_pretty(&r).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"));
    s.push('\n');
    s
}
