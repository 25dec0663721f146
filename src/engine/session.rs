//! The state one run (or one REPL session) builds up while its script executes.
use std::collections::{BTreeMap, BTreeSet, HashMap};
use std::sync::{Arc, Mutex, MutexGuard};

use super::prepass::ColumnMap;
use super::sandbox::Sandbox;
use crate::report::{Item, Report};

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
        }
    }

    /// Read a data file the script names (relative to the script's folder, inside the project
    /// root) and record it with its hash for the report's provenance.
    pub fn read_input(&mut self, rel: &str) -> Result<String, String> {
        use sha2::{Digest, Sha256};
        let path = self.sandbox.readable(rel)?;
        // A FIFO or a device would block or never end; only plain files are data.
        if !std::fs::metadata(&path).map(|m| m.is_file()).unwrap_or(false) {
            return Err(format!("'{rel}' is not a regular file"));
        }
        let bytes = std::fs::read(&path).map_err(|e| format!("cannot read '{rel}': {e}"))?;
        let hash: String = Sha256::digest(&bytes).iter().map(|b| format!("{b:02x}")).collect();
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
