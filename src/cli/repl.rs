//! `tickwork repl`: the line editor around the engine's REPL session
//! (`engine::repl_session`): prompts, history saved after every entry, completion of names,
//! methods and map keys, and Ctrl-C cancelling the running entry. Reads a pipe too, so
//! sessions can be scripted and tested.
use std::io::{BufRead, IsTerminal};
use std::path::PathBuf;
use std::sync::atomic::Ordering;
use std::sync::{Arc, Mutex};

use clap::Args;
use rustyline::completion::{Completer, Pair};
use rustyline::highlight::Highlighter;
use rustyline::hint::Hinter;
use rustyline::validate::{ValidationContext, ValidationResult, Validator};
use rustyline::{Context, Helper};

use crate::engine::prepass::is_incomplete;
use crate::engine::repl_session::{CANCEL, Completions, Entry, Options, ReplSession};
use crate::engine::term::{err, out};

/// The prompt, and the one for an entry that needs more lines.
const PROMPT: &str = "tw▸ ";
const CONTINUE: &str = "  ▹ ";

#[derive(Args, Debug, Clone)]
pub struct ReplArgs {
    /// Stop an entry after this many operations (at least 1)
    #[arg(long, default_value_t = crate::engine::DEFAULT_MAX_OPS, value_parser = clap::value_parser!(u64).range(1..))]
    pub max_ops: u64,
    /// Project root: files are read only below it (default: the current folder)
    #[arg(long, default_value = ".")]
    pub root: PathBuf,
    /// Output folder; save_report("x") writes OUT/repl/x/
    #[arg(long, default_value = "out")]
    pub out: PathBuf,
    /// Seed of every random stream
    #[arg(long, default_value_t = 1, allow_negative_numbers = true, value_parser = super::parse_seed)]
    pub seed: u64,
    /// Worker threads of Monte Carlo runs and sweeps (default: all cores); results are the
    /// same for any count
    #[arg(long, value_parser = clap::value_parser!(u64).range(1..=crate::analysis::parallel::MAX_THREADS as u64))]
    pub threads: Option<u64>,
}

/// SIGINT while an entry runs: ask the engine to stop it (async-signal-safe: one atomic store).
extern "C" fn on_interrupt(_: libc::c_int) {
    CANCEL.store(true, Ordering::Relaxed);
}

/// From now on Ctrl-C cancels the running entry instead of ending the process. While the line
/// editor reads a line the terminal is in raw mode and Ctrl-C reaches it as a key instead.
fn cancel_on_interrupt() {
    let handler = on_interrupt as extern "C" fn(libc::c_int);
    // SAFETY: installs a handler that only stores to an atomic.
    unsafe {
        libc::signal(libc::SIGINT, handler as libc::sighandler_t);
    }
}

pub fn repl(a: &ReplArgs) -> i32 {
    let o = Options {
        root: a.root.clone(),
        out: a.out.clone(),
        seed: a.seed,
        max_ops: a.max_ops,
        threads: a.threads.unwrap_or(0) as usize,
    };
    let mut ev = match ReplSession::new(&o) {
        Ok(e) => e,
        Err(e) => {
            err(&format!("error: {e}"));
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    cancel_on_interrupt();
    if std::io::stdin().is_terminal() { interactive(&mut ev) } else { piped(&mut ev, std::io::stdin().lock()) }
}

/// Read entries from a non-terminal input: lines gather until the entry is complete.
pub fn piped(ev: &mut ReplSession, input: impl BufRead) -> i32 {
    let mut code = 0;
    let mut buf = String::new();
    for line in input.lines() {
        let Ok(line) = line else { break };
        if !buf.is_empty() {
            buf.push('\n');
        }
        buf.push_str(&line);
        if is_incomplete(&buf) {
            continue;
        }
        match ev.eval(&buf) {
            Err(Entry::Incomplete) => continue,
            r => code = code.max(report(r)),
        }
        buf.clear();
    }
    if !buf.trim().is_empty() {
        code = code.max(match ev.eval(&buf) {
            Err(Entry::Incomplete) => report(Err(Entry::Failed(format!("input ended inside an entry:\n{buf}")))),
            r => report(r),
        });
    }
    code
}

fn report(r: Result<Option<String>, Entry>) -> i32 {
    match r {
        Ok(Some(t)) => {
            out(&t);
            0
        }
        Ok(None) | Err(Entry::Incomplete) => 0,
        Err(Entry::Failed(e)) => {
            err(&e);
            super::EXIT_SCRIPT_ERROR
        }
    }
}

/// Rustyline helper: completion of names, methods and map keys; multi-line validation.
struct LineHelper {
    known: Arc<Mutex<Completions>>,
}

impl Completer for LineHelper {
    type Candidate = Pair;
    fn complete(&self, line: &str, pos: usize, _ctx: &Context<'_>) -> rustyline::Result<(usize, Vec<Pair>)> {
        let head = &line[..pos];
        let start = head
            .rfind(|c: char| !(c.is_alphanumeric() || c == '_'))
            .map(|k| k + head[k..].chars().next().map_or(1, |c| c.len_utf8()))
            .unwrap_or(0);
        let word = &head[start..];
        let known = self.known.lock().unwrap_or_else(|p| p.into_inner());
        // After `x.`: the methods of x's type, or the keys of the map x.
        let receiver = head[..start].strip_suffix('.').map(|h| {
            let k = h.rfind(|c: char| !(c.is_alphanumeric() || c == '_')).map_or(0, |k| k + 1);
            &h[k..]
        });
        let pool: &[String] = match receiver {
            Some(r) => known.members.get(r).map(Vec::as_slice).unwrap_or(&[]),
            None if word.is_empty() => &[],
            None => &known.names,
        };
        let c = pool
            .iter()
            .filter(|n| n.starts_with(word))
            .map(|n| Pair { display: n.clone(), replacement: n.clone() })
            .collect();
        Ok((start, c))
    }
}
impl Hinter for LineHelper {
    type Hint = String;
}
impl Highlighter for LineHelper {}
impl Validator for LineHelper {
    fn validate(&self, ctx: &mut ValidationContext) -> rustyline::Result<ValidationResult> {
        Ok(if is_incomplete(ctx.input()) { ValidationResult::Incomplete } else { ValidationResult::Valid(None) })
    }
}
impl Helper for LineHelper {}

fn history_path() -> Option<PathBuf> {
    dirs::data_dir().map(|d| d.join("tickwork").join("history.txt"))
}

fn interactive(ev: &mut ReplSession) -> i32 {
    let known = Arc::new(Mutex::new(ev.completions()));
    let config = rustyline::Config::builder().completion_type(rustyline::CompletionType::List).build();
    let mut rl = match rustyline::Editor::<LineHelper, rustyline::history::DefaultHistory>::with_config(config) {
        Ok(r) => r,
        Err(e) => {
            err(&format!("cannot start the line editor: {e}"));
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    rl.set_helper(Some(LineHelper { known: known.clone() }));
    let hist = history_path();
    if let Some(h) = &hist {
        let _ = rl.load_history(h);
        if let Some(dir) = h.parent() {
            let _ = std::fs::create_dir_all(dir);
        }
    }
    out(&format!("tickwork {} — type help for help, Ctrl-D to leave", env!("CARGO_PKG_VERSION")));
    let mut pending = String::new();
    loop {
        match rl.readline(if pending.is_empty() { PROMPT } else { CONTINUE }) {
            Ok(line) => {
                let _ = rl.add_history_entry(line.as_str());
                // Saved after every entry, so a crash or a closed terminal loses nothing.
                if let Some(h) = &hist {
                    let _ = rl.save_history(h);
                }
                if !pending.is_empty() {
                    pending.push('\n');
                }
                pending.push_str(&line);
                match ev.eval(&pending) {
                    Err(Entry::Incomplete) => continue,
                    r => report(r),
                };
                pending.clear();
                *known.lock().unwrap_or_else(|p| p.into_inner()) = ev.completions();
            }
            Err(rustyline::error::ReadlineError::Interrupted) => pending.clear(),
            Err(_) => break,
        }
    }
    0
}
