//! The metrics history: a JSON Lines file, one record per script per run, appended by
//! `run --history FILE` and read by `digest`. Each record is appended with one write and an
//! fsync, so a killed run leaves at most one broken last line; a line that does not parse is
//! reported with its number and skipped, never merged into the records around it.
use std::collections::BTreeMap;
use std::io::{self, Read, Seek, SeekFrom, Write};
use std::path::Path;

use serde::{Deserialize, Serialize};

use super::metric::{Metric, Spec};
use super::provenance::Provenance;

/// Format version written into every record.
pub const FORMAT: u32 = 1;

/// How a script's run ended.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Status {
    /// Ran, and every metric with a spec met it.
    Pass,
    /// Ran, and a metric failed its spec.
    SpecFailed,
    /// Did not run to the end (script error); no metrics.
    Error,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct MetricRecord {
    pub name: String,
    pub value: f64,
    pub unit: String,
    pub min: Option<f64>,
    pub max: Option<f64>,
}

impl MetricRecord {
    pub fn of(m: &Metric) -> Self {
        MetricRecord { name: m.name.clone(), value: m.value, unit: m.unit.clone(), min: m.spec.min, max: m.spec.max }
    }
    pub fn spec(&self) -> Spec {
        Spec { min: self.min, max: self.max }
    }
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct InputRecord {
    pub path: String,
    pub sha256: String,
}

/// One script's result in one run.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Record {
    pub format: u32,
    /// Run number: one more than the largest in the file when the run started.
    pub run: u64,
    /// UTC time the run started, ISO 8601.
    pub time: String,
    /// Git commit of the design repository, when it is a git checkout.
    pub commit: Option<String>,
    /// The report's sub-path below the output folder (`sub/path/name`): the script's key.
    pub report: String,
    /// Script path relative to the project root.
    pub script: Option<String>,
    pub status: Status,
    pub metrics: Vec<MetricRecord>,
    pub script_sha256: Option<String>,
    pub inputs: Vec<InputRecord>,
    pub tool: String,
    pub seed: u64,
    pub overrides: BTreeMap<String, String>,
}

impl Record {
    /// The record of one script's run from its provenance and metrics.
    pub fn new(
        run: u64,
        time: &str,
        commit: Option<&str>,
        report: &str,
        status: Status,
        metrics: &[Metric],
        prov: &Provenance,
    ) -> Self {
        Record {
            format: FORMAT,
            run,
            time: time.to_string(),
            commit: commit.map(str::to_string),
            report: report.to_string(),
            script: prov.script.clone(),
            status,
            metrics: metrics.iter().map(MetricRecord::of).collect(),
            script_sha256: prov.script_sha256.clone(),
            inputs: prov.inputs.iter().map(|(p, h)| InputRecord { path: p.clone(), sha256: h.clone() }).collect(),
            tool: prov.tool.clone(),
            seed: prov.seed,
            overrides: prov.overrides.clone(),
        }
    }
}

/// A line of the history that is not a record.
#[derive(Clone, Debug, PartialEq)]
pub struct BadLine {
    /// 1-based line number.
    pub line: usize,
    pub why: String,
}

/// The records of a history file, in file order, and the lines that were skipped.
#[derive(Clone, Debug, Default)]
pub struct History {
    pub records: Vec<Record>,
    pub bad: Vec<BadLine>,
}

impl History {
    /// Parse the text of a history file. An empty line is skipped silently; a last line without
    /// its newline is a write cut short and is reported even when its text happens to parse.
    pub fn parse(text: &str) -> History {
        let mut h = History::default();
        let n = text.split_inclusive('\n').count();
        for (i, line) in text.split_inclusive('\n').enumerate() {
            let cut = i + 1 == n && !line.ends_with('\n');
            let body = line.trim_end_matches(['\n', '\r']);
            if body.trim().is_empty() {
                continue;
            }
            if cut {
                h.bad.push(BadLine { line: i + 1, why: "the line ends without a newline (a write cut short)".into() });
                continue;
            }
            match serde_json::from_str::<Record>(body) {
                Ok(r) if r.format == FORMAT => h.records.push(r),
                Ok(r) => {
                    h.bad.push(BadLine { line: i + 1, why: format!("record format {} is not {FORMAT}", r.format) })
                }
                Err(e) => h.bad.push(BadLine { line: i + 1, why: format!("not a history record: {e}") }),
            }
        }
        h
    }

    /// Read a history file; a missing file is an empty history.
    pub fn read(path: &Path) -> io::Result<History> {
        match std::fs::read(path) {
            Ok(b) => Ok(History::parse(&String::from_utf8_lossy(&b))),
            Err(e) if e.kind() == io::ErrorKind::NotFound => Ok(History::default()),
            Err(e) => Err(e),
        }
    }

    /// The number the next run takes.
    pub fn next_run(&self) -> u64 {
        self.records.iter().map(|r| r.run).max().unwrap_or(0) + 1
    }

    /// Run numbers in increasing order, each once.
    pub fn runs(&self) -> Vec<u64> {
        let mut v: Vec<u64> = self.records.iter().map(|r| r.run).collect();
        v.sort_unstable();
        v.dedup();
        v
    }
}

/// Append one record as one line: a single `write` on a file opened for appending, then fsync.
/// When the file's last line was cut short, the write starts with a newline so the new record
/// stands on a line of its own and the broken line stays visible to the reader.
pub fn append(path: &Path, record: &Record) -> io::Result<()> {
    let mut line = serde_json::to_string(record).map_err(io::Error::other)?;
    line.push('\n');
    let mut f = std::fs::OpenOptions::new().create(true).append(true).read(true).open(path)?;
    let len = f.seek(SeekFrom::End(0))?;
    if len > 0 {
        let mut last = [0u8; 1];
        f.seek(SeekFrom::Start(len - 1))?;
        f.read_exact(&mut last)?;
        if last[0] != b'\n' {
            line.insert(0, '\n');
        }
    }
    f.write_all(line.as_bytes())?;
    f.sync_all()
}

#[cfg(test)]
mod tests {
    use super::*;
    fn rec(run: u64, v: f64) -> Record {
        let m = Metric::new("osc.period", v, "s", Spec { min: None, max: Some(2.0) }).unwrap();
        Record::new(run, "2026-01-01T00:00:00Z", Some("abc"), "a/x", Status::Pass, &[m], &Provenance::default())
    }
    #[test]
    fn appended_records_read_back_and_a_cut_line_is_reported() {
        let d = tempfile::tempdir().unwrap();
        let p = d.path().join("h.jsonl");
        append(&p, &rec(1, 1.5)).unwrap();
        append(&p, &rec(2, 1.25)).unwrap();
        let h = History::read(&p).unwrap();
        assert_eq!(h.records, [rec(1, 1.5), rec(2, 1.25)]);
        assert!(h.bad.is_empty());
        assert_eq!(h.next_run(), 3);
        // Cut the last record short, as a kill mid-write would, then append again.
        let text = std::fs::read_to_string(&p).unwrap();
        std::fs::write(&p, &text[..text.len() - 10]).unwrap();
        append(&p, &rec(3, 1.0)).unwrap();
        let h = History::read(&p).unwrap();
        assert_eq!(h.records, [rec(1, 1.5), rec(3, 1.0)]);
        assert_eq!(h.bad.len(), 1);
        assert_eq!(h.bad[0].line, 2);
        assert_eq!(h.runs(), [1, 3]);
    }
}
