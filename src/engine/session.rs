//! The state one run (or one REPL session) builds up while its script executes.
use std::collections::{BTreeMap, BTreeSet, HashMap};
use std::sync::{Arc, Mutex, MutexGuard};

use super::prepass::ColumnMap;
use super::sandbox::Sandbox;
use crate::report::provenance::{Provenance, sha256_hex, utc_now};
use crate::report::{Item, Report};

/// The script a run executes, as its provenance names it.
#[derive(Clone, Debug)]
pub struct ScriptFile {
    /// Path relative to the project root, so the report reads the same from any folder.
    pub path: String,
    /// The name its source is registered under for error messages (as given on the command line).
    pub source: String,
    pub sha256: String,
}

/// Text and column map of each compiled source, by source name, for error messages.
#[derive(Default, Debug)]
pub struct Sources {
    pub files: HashMap<String, (String, ColumnMap)>,
}

#[derive(Debug)]
pub struct Session {
    pub report: Report,
    /// Index into `report.sections` that outputs go to.
    pub current: usize,
    /// `--set NAME=VALUE` overrides, raw text.
    pub overrides: BTreeMap<String, String>,
    /// Which overrides the script has consumed.
    pub used: BTreeSet<String>,
    pub seed: u64,
    /// Worker threads of the parallel analyses (Monte Carlo, sweeps); 0 means all cores.
    pub threads: usize,
    /// Print results to the terminal as they are shown.
    pub echo: bool,
    pub sandbox: Sandbox,
    pub sources: Sources,
    /// Files the script read (process files, CSV data), in order: (path relative to the
    /// project root, SHA-256 in hex). The report's provenance lists them.
    pub inputs: Vec<(String, String)>,
    /// The script file of a run (None in the REPL).
    pub script: Option<ScriptFile>,
    /// Write the UTC time into the provenance (`--stamp`).
    pub stamp: bool,
}

impl Session {
    pub fn new(title: &str, sandbox: Sandbox) -> Self {
        Session {
            report: Report::new(title),
            current: 0,
            overrides: BTreeMap::new(),
            used: BTreeSet::new(),
            seed: 0,
            threads: 0,
            echo: true,
            sandbox,
            sources: Sources::default(),
            inputs: Vec::new(),
            script: None,
            stamp: false,
        }
    }

    /// Record the script file of a run: its path relative to the project root (as given when
    /// it lies outside) and the hash of its text.
    pub fn set_script(&mut self, file: &std::path::Path, shown: &str, text: &str) {
        let path = file
            .canonicalize()
            .ok()
            .and_then(|c| c.strip_prefix(&self.sandbox.root).ok().map(|r| r.display().to_string()))
            .unwrap_or_else(|| shown.to_string());
        self.script = Some(ScriptFile { path, source: shown.to_string(), sha256: sha256_hex(text.as_bytes()) });
    }

    /// The provenance of the report built so far: the one place it is assembled, for `run`
    /// and for `save_report`.
    pub fn provenance(&self) -> Provenance {
        Provenance {
            tool: Provenance::tool(),
            script: self.script.as_ref().map(|s| s.path.clone()),
            script_sha256: self.script.as_ref().map(|s| s.sha256.clone()),
            inputs: self.included_files(),
            overrides: self.overrides.clone(),
            seed: self.seed,
            stamp: self.stamp.then(utc_now),
        }
    }

    /// Every file the run read: data files in the order they were read, then the script
    /// modules it imported from the project (by path). Built-in `stdlib/` modules are part of
    /// the tool version and the REPL's own entries are not files, so neither is listed.
    fn included_files(&self) -> Vec<(String, String)> {
        let script = self.script.as_ref().map(|s| s.source.as_str());
        let mut v = self.inputs.clone();
        let mut modules: Vec<(String, String)> = self
            .sources
            .files
            .iter()
            .filter(|(name, _)| Some(name.as_str()) != script && !name.starts_with("repl["))
            .filter(|(name, (text, _))| {
                let builtin = name
                    .strip_prefix("stdlib/")
                    .and_then(|n| n.strip_suffix(".rhai"))
                    .and_then(super::stdlib::get)
                    .is_some_and(|src| src == text);
                !builtin
            })
            .map(|(name, (text, _))| (name.clone(), sha256_hex(text.as_bytes())))
            .collect();
        modules.sort();
        for m in modules {
            if !v.iter().any(|(p, _)| *p == m.0) {
                v.push(m);
            }
        }
        v
    }

    /// Read a data file the script names (relative to the script's folder, inside the project
    /// root) and record it with its hash for the report's provenance.
    pub fn read_input(&mut self, rel: &str) -> Result<String, String> {
        let path = self.sandbox.readable(rel)?;
        let bytes = std::fs::read(&path).map_err(|e| format!("cannot read '{rel}': {e}"))?;
        let hash = sha256_hex(&bytes);
        let shown = path.strip_prefix(&self.sandbox.root).unwrap_or(&path).display().to_string();
        if !self.inputs.iter().any(|(p, _)| *p == shown) {
            self.inputs.push((shown, hash));
        }
        String::from_utf8(bytes).map_err(|_| format!("'{rel}' is not UTF-8 text"))
    }

    /// Place an output under the current section.
    pub fn push(&mut self, item: Item) {
        let k = self.current.min(self.report.sections.len() - 1);
        self.report.sections[k].items.push(item);
    }
}

/// The session as shared with native functions registered in the engine.
#[derive(Clone, Debug)]
pub struct Shared(pub Arc<Mutex<Session>>);

impl Shared {
    pub fn new(s: Session) -> Self {
        Shared(Arc::new(Mutex::new(s)))
    }
    /// Lock the session; a poisoned lock (a panic elsewhere) still yields the data.
    pub fn lock(&self) -> MutexGuard<'_, Session> {
        self.0.lock().unwrap_or_else(|p| p.into_inner())
    }
}
