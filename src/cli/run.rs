//! `tickwork run FILE...`: evaluate scripts and write their reports.
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use clap::Args;

use crate::engine::{self, sandbox::Sandbox, script::run_source, session::{Session, Shared}};
use crate::report;

#[derive(Args, Debug, Clone)]
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
    /// Stop a script after this many operations
    #[arg(long, default_value_t = engine::DEFAULT_MAX_OPS)]
    pub max_ops: u64,
    /// Project root: scripts read files only below it (default: the current folder)
    #[arg(long, default_value = ".")]
    pub root: PathBuf,
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
        m.insert(k.to_string(), v.trim().to_string());
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
    let mut worst = 0;
    for file in &a.files {
        let code = run_one(a, file, &sets);
        worst = worst.max(code);
    }
    worst
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
    let script_dir = file.parent().map(|p| if p.as_os_str().is_empty() { Path::new(".") } else { p }).unwrap_or(Path::new("."));
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
    let shared = Shared::new(session);
    let engine = engine::build(&shared, a.max_ops);
    if let Err(e) = run_source(&engine, &shared, &shown, &text, a.max_ops) {
        eprintln!("{e}");
        eprintln!("{shown}: no report written; the previous one in {} is left as it was", out_dir.display());
        return super::EXIT_SCRIPT_ERROR;
    }
    let g = shared.lock();
    if let Err(e) = report::output::write(&g.report, &out_dir) {
        eprintln!("{shown}: cannot write the report into {}: {e}", out_dir.display());
        return super::EXIT_SCRIPT_ERROR;
    }
    0
}
