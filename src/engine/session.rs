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
    /// Print results to the terminal as they are shown.
    pub echo: bool,
    pub sandbox: Sandbox,
    pub sources: Sources,
}

impl Session {
    pub fn new(title: &str, sandbox: Sandbox) -> Self {
        Session {
            report: Report::new(title),
            current: 0,
            overrides: BTreeMap::new(),
            used: BTreeSet::new(),
            seed: 0,
            echo: true,
            sandbox,
            sources: Sources::default(),
        }
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
