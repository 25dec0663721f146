//! `tickwork run FILE...`: evaluate scripts and write their reports.
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use clap::Args;

use crate::engine::{
    self,
    sandbox::Sandbox,
    script::run_source,
    session::{Session, Shared},
};
use crate::report;

#[derive(Args, Debug, Clone)]
#[command(
    after_help = "Each script writes OUT/<script-name>/report.md, results.json and its figures (fig-NN-<title>.svg).\n\
Exit codes: 0 all scripts ran and every metric met its spec; 1 a script failed (its previous report is left as it was);\n\
2 bad command line; 3 every script ran but a metric failed its spec."
)]
pub struct RunArgs {
    /// Script files (.rhai)
    #[arg(required = true)]
    pub files: Vec<PathBuf>,
    /// Output folder; each script writes into OUT/<script-name>/
    #[arg(long, default_value = "out")]
    pub out: PathBuf,
    /// Override a top-level constant of the script: NAME=VALUE (SI suffixes allowed)
    #[arg(long = "set", value_name = "NAME=VALUE")]
    pub set: Vec<String>,
    /// Seed of every random stream (Monte Carlo)
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Worker threads of Monte Carlo runs and sweeps (default: all cores); results are the
    /// same for any count
    #[arg(long, value_parser = clap::value_parser!(u64).range(1..=crate::analysis::parallel::MAX_THREADS as u64))]
    pub threads: Option<u64>,
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

/// The name of a script's output folder: its file name without `.rhai`.
pub fn script_name(file: &Path) -> String {
    file.file_stem().map(|s| s.to_string_lossy().to_string()).unwrap_or_else(|| "script".into())
}

pub fn run(a: &RunArgs) -> i32 {
    let sets = match parse_sets(&a.set) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("error: {e}");
            return super::EXIT_USAGE;
        }
    };
    // A script error (1) outranks a failed spec (3): CI must see that a script did not run.
    let codes: Vec<i32> = a.files.iter().map(|file| run_one(a, file, &sets)).collect();
    if codes.contains(&super::EXIT_SCRIPT_ERROR) {
        super::EXIT_SCRIPT_ERROR
    } else {
        codes.into_iter().max().unwrap_or(0)
    }
}

fn run_one(a: &RunArgs, file: &Path, sets: &BTreeMap<String, String>) -> i32 {
    let shown = file.display().to_string();
    let text = match std::fs::read_to_string(file) {
        Ok(t) => t,
        Err(e) => {
            eprintln!("{shown}: cannot read the script: {e}");
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    let name = script_name(file);
    let out_dir = a.out.join(&name);
    let script_dir =
        file.parent().map(|p| if p.as_os_str().is_empty() { Path::new(".") } else { p }).unwrap_or(Path::new("."));
    let sandbox = match Sandbox::new(&a.root, &out_dir, script_dir) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("{shown}: {e}");
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    let mut session = Session::new(&name, sandbox);
    session.overrides = sets.clone();
    session.seed = a.seed;
    session.threads = a.threads.unwrap_or(0) as usize;
    let shared = Shared::new(session);
    let engine = engine::build(&shared, a.max_ops);
    if let Err(e) = run_source(&engine, &shared, &shown, &text, a.max_ops) {
        eprintln!("{e}");
        eprintln!("{shown}: no report written; the previous one in {} is left as it was", out_dir.display());
        return super::EXIT_SCRIPT_ERROR;
    }
    let g = shared.lock();
    let script_path = file
        .canonicalize()
        .ok()
        .and_then(|c| c.strip_prefix(&g.sandbox.root).ok().map(|r| r.display().to_string()))
        .unwrap_or_else(|| shown.clone());
    let prov = report::Provenance {
        tool: report::Provenance::tool(),
        script: Some(script_path),
        script_sha256: Some(report::provenance::sha256_hex(text.as_bytes())),
        inputs: engine::report_api::included_files(&g, Some(&shown)),
        overrides: g.overrides.clone(),
        seed: g.seed,
        stamp: a.stamp.then(report::provenance::utc_now),
    };
    if let Err(e) = report::output::write(&g.report, &prov, &out_dir) {
        eprintln!(
            "{shown}: cannot write the report into {}: {e}; report.md there, if any, is the previous run's",
            out_dir.display()
        );
        return super::EXIT_SCRIPT_ERROR;
    }
    let failed = g.report.failed();
    if !failed.is_empty() {
        for m in &failed {
            eprintln!(
                "{shown}: metric '{}' = {} fails its spec {}",
                m.name,
                report::format::value(m.value, &m.unit, 4),
                m.spec.text(&m.unit)
            );
        }
        return super::EXIT_SPEC_FAILED;
    }
    0
}
