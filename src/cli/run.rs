//! `tickwork run DIR|FILE...`: evaluate scripts (a folder's recursively, in parallel) and write
//! their reports, `OUT/index.md`, and optionally one history record per script.
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use clap::Args;
use rayon::prelude::*;

use super::discover::{self, Job};
use crate::engine::term::err;
use crate::engine::{
    self,
    sandbox::Sandbox,
    script::run_source,
    session::{Session, Shared},
};
use crate::report::{
    self, Provenance,
    history::{self, History, Record, Status},
    index::{self, Entry, Outcome},
};

#[derive(Args, Debug, Clone)]
#[command(
    after_help = "Each script writes OUT/<sub/path>/<name>/report.md, results.json and its figures (fig-NN-<title>.svg); \
a folder is searched recursively (names starting with '.' or '_' are skipped) and <sub/path> is the script's folder below it. \
OUT/index.md links every report of the run with a table of its metrics.\n\
Exit codes: 0 all scripts ran and every metric met its spec; 1 a script failed (its previous report is left as it was);\n\
2 bad command line; 3 every script ran but a metric failed its spec."
)]
pub struct RunArgs {
    /// Script files (.rhai) and folders of scripts
    #[arg(required = true, value_name = "DIR|FILE")]
    pub files: Vec<PathBuf>,
    /// Output folder; each script writes into OUT/<sub/path>/<name>/
    #[arg(long, default_value = "out")]
    pub out: PathBuf,
    /// Override a top-level constant: NAME=VALUE (SI suffixes allowed); in a batch, the
    /// scripts that declare NAME take it and the others run unchanged
    #[arg(long = "set", value_name = "NAME=VALUE")]
    pub set: Vec<String>,
    /// Seed of every random stream (Monte Carlo)
    #[arg(long, default_value_t = 1, allow_negative_numbers = true, value_parser = super::parse_seed)]
    pub seed: u64,
    /// Stop a script after this many operations (at least 1)
    #[arg(long, default_value_t = engine::DEFAULT_MAX_OPS, value_parser = clap::value_parser!(u64).range(1..))]
    pub max_ops: u64,
    /// Project root: scripts read files only below it (default: the current folder)
    #[arg(long, default_value = ".")]
    pub root: PathBuf,
    /// Write the UTC time of the run into the report's provenance (off by default, so that
    /// re-running an unchanged script gives byte-identical files)
    #[arg(long)]
    pub stamp: bool,
    /// Append one JSON Lines record per script (metrics, specs, hashes, seed, git commit) to FILE
    #[arg(long, value_name = "FILE")]
    pub history: Option<PathBuf>,
    /// Worker threads: scripts of a batch run at the same time, and Monte Carlo runs and sweeps
    /// share them (default: one per core); results are the same for any count
    #[arg(long, value_parser = clap::value_parser!(u64).range(1..=crate::analysis::parallel::MAX_THREADS as u64))]
    pub threads: Option<u64>,
}

/// Parse the `--set` list into a map; an entry without `=` is a usage error.
pub fn parse_sets(sets: &[String]) -> Result<BTreeMap<String, String>, String> {
    let mut m = BTreeMap::new();
    for s in sets {
        let Some((k, v)) = s.split_once('=') else {
            return Err(format!("--set {s}: expected NAME=VALUE"));
        };
        let k = k.trim();
        if k.is_empty() || !k.chars().all(|c| c.is_alphanumeric() || c == '_') {
            return Err(format!("--set {s}: '{k}' is not a constant name"));
        }
        if m.insert(k.to_string(), v.trim().to_string()).is_some() {
            return Err(format!("--set {k} is given twice; give each constant once"));
        }
    }
    Ok(m)
}

/// What one script's run left behind.
struct Done {
    entry: Entry,
    /// Error and spec messages, printed in script order once every script has finished.
    messages: Vec<String>,
    code: i32,
    prov: Provenance,
}

pub fn run(a: &RunArgs) -> i32 {
    let sets = match parse_sets(&a.set) {
        Ok(s) => s,
        Err(e) => {
            err(&format!("error: {e}"));
            return super::EXIT_USAGE;
        }
    };
    let jobs = match discover::jobs(&a.files) {
        Ok(j) => j,
        Err(e) => {
            err(&format!("error: {e}"));
            return super::EXIT_USAGE;
        }
    };
    let batch = jobs.len() > 1 || a.files.iter().any(|f| f.is_dir());
    // A lone script keeps the strict rule (an unknown --set name is its error); in a batch each
    // script takes the names it declares, and a name nobody declares is a usage error.
    let job_sets: Vec<BTreeMap<String, String>> = if batch && !sets.is_empty() {
        let declared: Vec<Vec<String>> = jobs.iter().map(|j| declared_consts(&j.file)).collect();
        if let Some(nobody) = sets.keys().find(|k| !declared.iter().any(|d| d.contains(k))) {
            err(&format!("error: --set {nobody}: no script of this run declares a top-level constant '{nobody}'"));
            return super::EXIT_USAGE;
        }
        declared
            .iter()
            .map(|d| sets.iter().filter(|(k, _)| d.contains(k)).map(|(k, v)| (k.clone(), v.clone())).collect())
            .collect()
    } else {
        vec![sets.clone(); jobs.len()]
    };
    let prior = match a.history.as_deref().map(History::read).transpose() {
        Ok(h) => h,
        Err(e) => {
            err(&format!(
                "error: --history {}: cannot read it: {e}",
                a.history.as_ref().map(|p| p.display().to_string()).unwrap_or_default()
            ));
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    let one = |(j, s): (&Job, &BTreeMap<String, String>)| run_one(a, j, s, !batch);
    let done: Vec<Done> = if jobs.len() == 1 {
        jobs.iter().zip(&job_sets).map(one).collect()
    } else {
        let threads = a.threads.map(|t| t as usize).unwrap_or(0);
        // Scripts recurse in Rhai: give workers the stack of a main thread.
        match rayon::ThreadPoolBuilder::new().num_threads(threads).stack_size(8 << 20).build() {
            Ok(pool) => pool.install(|| jobs.par_iter().zip(job_sets.par_iter()).map(one).collect()),
            Err(_) => jobs.iter().zip(&job_sets).map(one).collect(),
        }
    };
    for d in &done {
        for m in &d.messages {
            err(m);
        }
    }
    // A script error (1) outranks a failed spec (3): CI must see that a script did not run.
    let mut code = if done.iter().any(|d| d.code == super::EXIT_SCRIPT_ERROR) {
        super::EXIT_SCRIPT_ERROR
    } else {
        done.iter().map(|d| d.code).max().unwrap_or(0)
    };
    let entries: Vec<Entry> = done.iter().map(|d| d.entry.clone()).collect();
    if let Err(e) = std::fs::create_dir_all(&a.out)
        .and_then(|_| report::output::write_atomic(&a.out.join("index.md"), index::render(&entries).as_bytes()))
    {
        err(&format!("error: cannot write {}: {e}", a.out.join("index.md").display()));
        code = super::EXIT_SCRIPT_ERROR;
    }
    if let (Some(path), Some(prior)) = (&a.history, &prior) {
        for b in &prior.bad {
            err(&format!("{}:{}: skipped: {}", path.display(), b.line, b.why));
        }
        if let Err(e) = append_history(a, path, prior.next_run(), &done) {
            err(&format!("error: cannot append to the history {}: {e}", path.display()));
            code = super::EXIT_SCRIPT_ERROR;
        }
    }
    if batch {
        println!("tickwork: {}", index::summary(&entries));
        for k in sets.keys() {
            let took: Vec<&str> =
                jobs.iter().zip(&job_sets).filter(|(_, s)| s.contains_key(k)).map(|(j, _)| j.sub.as_str()).collect();
            println!("tickwork: --set {k} taken by {}", took.join(", "));
        }
    }
    code
}

/// Top-level constants a script declares (none when it cannot be read or pre-passed: then its
/// own run reports why).
fn declared_consts(file: &Path) -> Vec<String> {
    let Ok(text) = std::fs::read_to_string(file) else { return vec![] };
    engine::prepass::prepare(&text, None).map(|p| p.consts.into_iter().map(|c| c.name).collect()).unwrap_or_default()
}

fn append_history(a: &RunArgs, path: &Path, run: u64, done: &[Done]) -> std::io::Result<()> {
    let time = report::provenance::utc_now();
    let commit = report::git::head_commit(&a.root);
    for d in done {
        let (status, metrics) = match &d.entry.outcome {
            Outcome::Failed => (Status::Error, vec![]),
            Outcome::Ran(m) if m.iter().any(|m| m.pass() == Some(false)) => (Status::SpecFailed, m.clone()),
            Outcome::Ran(m) => (Status::Pass, m.clone()),
        };
        history::append(path, &Record::new(run, &time, commit.as_deref(), &d.entry.sub, status, &metrics, &d.prov))?;
    }
    Ok(())
}

fn run_one(a: &RunArgs, job: &Job, sets: &BTreeMap<String, String>, echo: bool) -> Done {
    let file = job.file.as_path();
    let shown = file.display().to_string();
    let out_dir = a.out.join(&job.sub);
    let mut done = Done {
        entry: Entry { sub: job.sub.clone(), script: shown.clone(), outcome: Outcome::Failed },
        messages: vec![],
        code: super::EXIT_SCRIPT_ERROR,
        prov: Provenance {
            tool: Provenance::tool(),
            script: Some(shown.clone()),
            overrides: sets.clone(),
            seed: a.seed,
            ..Default::default()
        },
    };
    // A FIFO or a device as the script would block or never end: only plain files are scripts.
    if std::fs::metadata(file).is_ok_and(|m| !m.is_file()) {
        done.messages.push(format!("{shown}: cannot read the script: not a regular file (a folder, pipe or device)"));
        return done;
    }
    let text = match std::fs::read_to_string(file) {
        Ok(t) => t,
        Err(e) => {
            done.messages.push(format!("{shown}: cannot read the script: {e}"));
            return done;
        }
    };
    done.prov.script_sha256 = Some(report::provenance::sha256_hex(text.as_bytes()));
    let name = discover::script_name(file);
    let script_dir =
        file.parent().map(|p| if p.as_os_str().is_empty() { Path::new(".") } else { p }).unwrap_or(Path::new("."));
    let sandbox = match Sandbox::new(&a.root, &out_dir, script_dir) {
        Ok(s) => s,
        Err(e) => {
            done.messages.push(format!("{shown}: {e}"));
            return done;
        }
    };
    let mut session = Session::new(&name, sandbox);
    session.overrides = sets.clone();
    session.seed = a.seed;
    session.threads = a.threads.unwrap_or(0) as usize;
    session.stamp = a.stamp;
    session.set_script(file, &shown, &text);
    done.prov.script = session.script.as_ref().map(|s| s.path.clone());
    session.echo = echo;
    let shared = Shared::new(session);
    let engine = engine::build(&shared, a.max_ops);
    if let Err(e) = run_source(&engine, &shared, &shown, &text, a.max_ops) {
        done.messages.push(e.to_string());
        done.messages
            .push(format!("{shown}: no report written; the previous one in {} is left as it was", out_dir.display()));
        return done;
    }
    let g = shared.lock();
    done.prov = g.provenance();
    if let Err(e) = report::output::write(&g.report, &done.prov, &out_dir) {
        done.messages.push(format!(
            "{shown}: cannot write the report into {}: {e}; report.md there, if any, is the previous run's",
            out_dir.display()
        ));
        return done;
    }
    let metrics: Vec<report::Metric> = g.report.metrics().cloned().collect();
    let failed = g.report.failed();
    for m in &failed {
        done.messages.push(format!(
            "{shown}: metric '{}' = {} fails its spec {}",
            m.name,
            m.value_text(),
            m.spec.text(&m.unit)
        ));
    }
    done.code = if failed.is_empty() { 0 } else { super::EXIT_SPEC_FAILED };
    done.entry.outcome = Outcome::Ran(metrics);
    done
}
