//! `tickwork digest`: the Markdown digest of a metrics history, and `tickwork compare`: two
//! runs' results side by side. Both exit with [`super::EXIT_REGRESSION`] when a metric regressed.
use std::path::PathBuf;

use clap::Args;

use crate::report::{self, compare, digest, history::History};

/// A threshold in percent: a finite number ≥ 0.
fn threshold(s: &str) -> Result<f64, String> {
    match s.trim_end_matches('%').trim().parse::<f64>() {
        Ok(x) if x.is_finite() && x >= 0.0 => Ok(x),
        _ => Err(format!("'{s}' is not a percentage ≥ 0 (e.g. 2 or 0.5)")),
    }
}

#[derive(Args, Debug, Clone)]
#[command(
    after_help = "Exit codes: 0 no regression; 1 the history cannot be read or holds no record; 2 bad command line; \
4 a metric regressed (moved more than the threshold toward or past a spec limit, or left it; a script error or a \
missing metric counts too)."
)]
pub struct DigestArgs {
    /// The history file (JSON Lines) that `run --history` appends to
    #[arg(long, value_name = "FILE")]
    pub history: PathBuf,
    /// The run to compare with besides the previous one: a run number or the first hex digits of
    /// a commit (default: the first run of the history)
    #[arg(long, value_name = "RUN")]
    pub baseline: Option<String>,
    /// Percent a metric may move toward a spec limit before it counts as a regression
    #[arg(long, value_name = "PCT", default_value = "1", value_parser = threshold)]
    pub threshold: f64,
    /// Runs drawn in each trend
    #[arg(long, default_value_t = 20, value_parser = clap::value_parser!(u64).range(1..=10_000))]
    pub last: u64,
    /// Output folder for digest.md and its trend figures
    #[arg(long, default_value = "digest")]
    pub out: PathBuf,
}

pub fn digest(a: &DigestArgs) -> i32 {
    let shown = a.history.display().to_string();
    if !a.history.is_file() {
        eprintln!("error: --history {shown}: no such file");
        return super::EXIT_SCRIPT_ERROR;
    }
    let h = match History::read(&a.history) {
        Ok(h) => h,
        Err(e) => {
            eprintln!("error: --history {shown}: cannot read it: {e}");
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    for b in &h.bad {
        eprintln!("{shown}:{}: skipped: {}", b.line, b.why);
    }
    let o = digest::Options {
        source: shown.clone(),
        baseline: a.baseline.clone(),
        threshold_pct: a.threshold,
        last: a.last as usize,
    };
    let d = match digest::build(&h, &o) {
        Ok(d) => d,
        Err(e) if e.starts_with("--baseline") => {
            eprintln!("error: {e}");
            return super::EXIT_USAGE;
        }
        Err(e) => {
            eprintln!("error: {e}");
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    if let Err(e) = write(a, &d) {
        eprintln!("error: cannot write the digest into {}: {e}", a.out.display());
        return super::EXIT_SCRIPT_ERROR;
    }
    println!(
        "tickwork: digest in {}: {} regression{}",
        a.out.join("digest.md").display(),
        d.regressions,
        if d.regressions == 1 { "" } else { "s" }
    );
    if d.regressions > 0 { super::EXIT_REGRESSION } else { 0 }
}

/// The trend figures first, `digest.md` last, each atomically; stale trend figures removed.
fn write(a: &DigestArgs, d: &digest::Digest) -> std::io::Result<()> {
    std::fs::create_dir_all(&a.out)?;
    for (file, svg) in &d.figures {
        report::output::write_atomic(&a.out.join(file), svg.as_bytes())?;
    }
    report::output::write_atomic(&a.out.join("digest.md"), d.markdown.as_bytes())?;
    for e in std::fs::read_dir(&a.out)?.flatten() {
        let name = e.file_name().to_string_lossy().to_string();
        if name.starts_with("trend-") && name.ends_with(".svg") && !d.figures.iter().any(|(f, _)| *f == name) {
            let _ = std::fs::remove_file(e.path());
        }
    }
    Ok(())
}

#[derive(Args, Debug, Clone)]
#[command(after_help = "OLD and NEW are output folders of `run` (every results.json below each, matched by sub-path) \
or two results.json files. Exit codes: 0 no regression; 1 a side cannot be read; 2 bad command line; 4 a metric regressed.")]
pub struct CompareArgs {
    pub old: PathBuf,
    pub new: PathBuf,
    /// Percent a metric may move toward a spec limit before it counts as a regression
    #[arg(long, value_name = "PCT", default_value = "1", value_parser = threshold)]
    pub threshold: f64,
}

pub fn compare(a: &CompareArgs) -> i32 {
    let (old, new) = match (compare::read_side(&a.old), compare::read_side(&a.new)) {
        (Ok(o), Ok(n)) => (o, n),
        (Err(e), _) | (_, Err(e)) => {
            eprintln!("error: {e}");
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    let (md, n) = compare::compare(&a.old.display().to_string(), &old, &a.new.display().to_string(), &new, a.threshold);
    crate::engine::term::out(md.trim_end());
    if n > 0 { super::EXIT_REGRESSION } else { 0 }
}
