//! Command-line verbs.
pub mod digest;
pub mod discover;
pub mod docs_cmd;
pub mod repl;
pub mod run;

use std::path::PathBuf;

use clap::{Parser, Subcommand};

/// Exit code of a script error (syntax, runtime, bad input).
pub const EXIT_SCRIPT_ERROR: i32 = 1;
/// Exit code of a command-line usage error (clap's own code).
pub const EXIT_USAGE: i32 = 2;
/// Exit code when every script ran but a metric failed its spec.
pub const EXIT_SPEC_FAILED: i32 = 3;
/// Exit code of `digest` and `compare` when a metric regressed.
pub const EXIT_REGRESSION: i32 = 4;

#[derive(Parser, Debug)]
#[command(name = "tickwork", version, about = "Scripted timing-circuit calculations with Markdown reports")]
pub struct Cli {
    #[command(subcommand)]
    pub cmd: Cmd,
}

#[derive(Subcommand, Debug)]
pub enum Cmd {
    /// Run scripts and folders of scripts; each writes OUT/<sub/path>/<name>/report.md
    Run(run::RunArgs),
    /// The Markdown digest of a metrics history: trends, changes, regressions first
    Digest(digest::DigestArgs),
    /// Compare two runs' results (output folders or results.json files), metric by metric
    Compare(digest::CompareArgs),
    /// Interactive session (reads a pipe too)
    Repl(repl::ReplArgs),
    /// Show the documentation of one function, or list all
    Doc {
        name: Option<String>,
        /// Print the whole reference as Markdown (the text of docs/functions.md)
        #[arg(long, conflicts_with = "name")]
        markdown: bool,
    },
    /// Write the editor definition file of every script function (script-level types)
    Defs {
        /// Where to write it; a name ending in .json writes JSON instead of a definition file
        #[arg(long, default_value = "tickwork.d.rhai")]
        out: PathBuf,
    },
}

/// `--seed N`: a whole number in 0..=2^64-1; a negative one is named as out of range, not
/// taken for an option.
pub fn parse_seed(s: &str) -> Result<u64, String> {
    s.trim().parse::<u64>().map_err(|_| format!("the seed must be a whole number in 0..={}, got '{s}'", u64::MAX))
}

/// Dispatch a parsed command line; returns the process exit code.
pub fn main(cli: Cli) -> i32 {
    match cli.cmd {
        Cmd::Run(a) => run::run(&a),
        Cmd::Digest(a) => digest::digest(&a),
        Cmd::Compare(a) => digest::compare(&a),
        Cmd::Repl(a) => repl::repl(&a),
        Cmd::Doc { name, markdown } => docs_cmd::doc(name.as_deref(), markdown),
        Cmd::Defs { out } => docs_cmd::defs(&out),
    }
}
