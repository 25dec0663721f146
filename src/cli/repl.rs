//! `tickwork repl`: an interactive session. Variables and functions persist between entries;
//! an unclosed bracket, string or comment continues on the next line; `help NAME` shows a
//! function's signature and units. Reads a pipe too, so sessions can be scripted and tested.
use std::collections::HashMap;
use std::io::{BufRead, IsTerminal};
use std::path::PathBuf;
use std::sync::{Arc, Mutex};

use clap::Args;
use rhai::{AST, Dynamic, Engine, Scope};
use rustyline::completion::{Completer, Pair};
use rustyline::highlight::Highlighter;
use rustyline::hint::Hinter;
use rustyline::validate::{ValidationContext, ValidationResult, Validator};
use rustyline::{Context, Helper};

use super::docs_cmd::{describe, similar};
use crate::engine::errors::{from_eval, from_eval_in, from_parse};
use crate::engine::prepass::is_incomplete;
use crate::engine::script::prepare_into_session;
use crate::engine::session::{Session, Shared};
use crate::engine::term::err;
use crate::engine::{self, docs, sandbox::Sandbox};

/// The prompt, and the one for an entry that needs more lines.
const PROMPT: &str = "tw▸ ";
const CONTINUE: &str = "  ▹ ";

#[derive(Args, Debug, Clone)]
pub struct ReplArgs {
    /// Stop an entry after this many operations (at least 1)
    #[arg(long, default_value_t = engine::DEFAULT_MAX_OPS, value_parser = clap::value_parser!(u64).range(1..))]
    pub max_ops: u64,
    /// Project root: files are read only below it (default: the current folder)
    #[arg(long, default_value = ".")]
    pub root: PathBuf,
    /// Seed of every random stream
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Worker threads of Monte Carlo runs and sweeps (default: all cores); results are the
    /// same for any count
    #[arg(long, value_parser = clap::value_parser!(u64).range(1..=crate::analysis::parallel::MAX_THREADS as u64))]
    pub threads: Option<u64>,
}

/// The evaluating half of the REPL, independent of where lines come from.
pub struct Evaluator {
    engine: Engine,
    scope: Scope<'static>,
    functions: AST,
    pub session: Shared,
    entries: usize,
    max_ops: u64,
    /// The entry each script function was defined in, for error positions.
    fn_files: HashMap<String, String>,
}

impl Evaluator {
    pub fn new(a: &ReplArgs) -> Result<Self, String> {
        let out = a.root.join("out").join("repl");
        let sandbox = Sandbox::new(&a.root, &out, &a.root)?;
        let mut session = Session::new("repl", sandbox);
        session.seed = a.seed;
        session.threads = a.threads.unwrap_or(0) as usize;
        let session = Shared::new(session);
        let engine = engine::build(&session, a.max_ops);
        Ok(Evaluator {
            engine,
            scope: Scope::new(),
            functions: AST::empty(),
            session,
            entries: 0,
            max_ops: a.max_ops,
            fn_files: HashMap::new(),
        })
    }

    /// Names for completion: every registered function and every variable in scope.
    pub fn names(&self) -> Vec<String> {
        let mut v: Vec<String> = docs::all().iter().map(|d| d.name.to_string()).collect();
        v.extend(self.scope.iter().map(|(n, _, _)| n.to_string()));
        v.extend(self.functions.iter_functions().map(|f| f.name.to_string()));
        for kw in [
            "let", "const", "fn", "if", "else", "for", "in", "while", "loop", "return", "import", "true", "false",
            "help", "doc",
        ] {
            v.push(kw.to_string());
        }
        v.sort();
        v.dedup();
        v
    }

    /// True when the entry parses only as the start of something (`let x = 1 +`).
    fn ends_early(&self, text: &str) -> bool {
        let Ok(p) = crate::engine::prepass::prepare(text, Some(0)) else { return false };
        matches!(
            self.engine.compile_with_scope(&self.scope, &p.code),
            Err(e) if matches!(e.err_type(), rhai::ParseErrorType::UnexpectedEOF)
        )
    }

    /// Evaluate one complete entry; returns what to print (result value, help text).
    pub fn eval(&mut self, text: &str) -> Result<Option<String>, Entry> {
        let t = text.trim();
        if t.is_empty() {
            return Ok(None);
        }
        if t == "help" {
            return Ok(Some(HELP.to_string()));
        }
        for cmd in ["help ", "doc "] {
            if let Some(name) = t.strip_prefix(cmd) {
                let name = name.trim();
                return match describe(name) {
                    Some(d) => Ok(Some(d)),
                    None => {
                        let sim = similar(name);
                        Err(Entry::Failed(format!(
                            "no function named '{name}'{}",
                            if sim.is_empty() { String::new() } else { format!("; similar: {}", sim.join(", ")) }
                        )))
                    }
                };
            }
        }
        if self.ends_early(text) {
            return Err(Entry::Incomplete);
        }
        self.entries += 1;
        let file = format!("repl[{}]", self.entries);
        let prepared = prepare_into_session(&self.session, &file, text).map_err(|e| Entry::Failed(e.to_string()))?;
        let ast = self
            .engine
            .compile_with_scope(&self.scope, &prepared.code)
            .map_err(|e| from_parse(&self.session.lock().sources, &file, &e).to_string())?;
        // `import "m" as x;` must outlive this entry: register the module under its alias.
        for (alias, module) in self.imports(&ast, &file).map_err(Entry::Failed)? {
            self.engine.register_static_module(alias, module);
        }
        let defined: Vec<String> = ast.iter_functions().map(|f| f.name.to_string()).collect();
        let mut ast = self.functions.merge(&ast);
        ast.set_source(file.as_str());
        let mut fn_files = self.fn_files.clone();
        for n in &defined {
            fn_files.insert(n.clone(), file.clone());
        }
        let result: Dynamic = self
            .engine
            .eval_ast_with_scope(&mut self.scope, &ast)
            .map_err(|e| from_eval_in(&self.session.lock().sources, &file, &e, self.max_ops, &fn_files).to_string())?;
        self.fn_files = fn_files;
        self.functions = self.functions.merge(&ast.clone_functions_only());
        // A trailing `;` asks for the statement's effect only, not its value.
        if result.is_unit() || t.ends_with(';') {
            return Ok(None);
        }
        Ok(Some(match result.as_float() {
            Ok(x) => format!("{x:?}"), // exact and short: 3.32e-6, not 0.00000332
            Err(_) => crate::engine::display::text_of(&self.engine, &result),
        }))
    }

    /// Modules imported by the entry, resolved now so later entries can use them.
    fn imports(&self, ast: &AST, file: &str) -> Result<Vec<(String, rhai::Shared<rhai::Module>)>, String> {
        let mut v = Vec::new();
        let src = ast.source().unwrap_or(file).to_string();
        let text = self.session.lock().sources.files.get(file).map(|(t, _)| t.clone()).unwrap_or_default();
        for (path, alias) in import_statements(&text) {
            let m = self
                .engine
                .module_resolver()
                .resolve(&self.engine, Some(&src), &path, rhai::Position::NONE)
                .map_err(|e| from_eval(&self.session.lock().sources, file, &e, self.max_ops).to_string())?;
            v.push((alias, m));
        }
        Ok(v)
    }
}

/// Why an entry gave no result.
#[derive(Debug)]
pub enum Entry {
    /// The entry needs more lines.
    Incomplete,
    /// The entry failed; the text is the located error message.
    Failed(String),
}

impl From<String> for Entry {
    fn from(s: String) -> Self {
        Entry::Failed(s)
    }
}

/// `(path, alias)` of each `import "path" as alias;` statement in an entry.
fn import_statements(text: &str) -> Vec<(String, String)> {
    let mut v = Vec::new();
    for stmt in text.split(';') {
        let s = stmt.trim();
        let Some(rest) = s.strip_prefix("import") else { continue };
        let rest = rest.trim_start();
        let Some(rest) = rest.strip_prefix('"') else { continue };
        let Some((path, rest)) = rest.split_once('"') else { continue };
        let Some(alias) = rest.trim().strip_prefix("as") else { continue };
        let alias = alias.trim();
        if !alias.is_empty() && alias.chars().all(|c| c.is_alphanumeric() || c == '_') {
            v.push((path.to_string(), alias.to_string()));
        }
    }
    v
}

const HELP: &str = "\
Type statements as in a script; variables and functions stay defined. The value of an
entry is printed unless the entry ends with `;`.
  help NAME | doc NAME   signature, units and description of a function
  help                   this text
  Tab                    complete a function or variable name
  Ctrl-D                 leave
An unclosed bracket, string or comment continues on the next line.";

/// Rustyline helper: completion of names, multi-line validation.
struct LineHelper {
    names: Arc<Mutex<Vec<String>>>,
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
        if word.is_empty() {
            return Ok((pos, vec![]));
        }
        let names = self.names.lock().unwrap_or_else(|p| p.into_inner());
        let c = names
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

pub fn repl(a: &ReplArgs) -> i32 {
    let mut ev = match Evaluator::new(a) {
        Ok(e) => e,
        Err(e) => {
            err(&format!("error: {e}"));
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    if std::io::stdin().is_terminal() { interactive(&mut ev) } else { piped(&mut ev, std::io::stdin().lock()) }
}

/// Read entries from a non-terminal input: lines gather until the entry is complete.
pub fn piped(ev: &mut Evaluator, input: impl BufRead) -> i32 {
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
            crate::engine::term::out(&t);
            0
        }
        Ok(None) | Err(Entry::Incomplete) => 0,
        Err(Entry::Failed(e)) => {
            err(&e.to_string());
            super::EXIT_SCRIPT_ERROR
        }
    }
}

fn interactive(ev: &mut Evaluator) -> i32 {
    let names = Arc::new(Mutex::new(ev.names()));
    let mut rl = match rustyline::Editor::<LineHelper, rustyline::history::DefaultHistory>::new() {
        Ok(r) => r,
        Err(e) => {
            err(&format!("cannot start the line editor: {e}"));
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    rl.set_helper(Some(LineHelper { names: names.clone() }));
    let hist = history_path();
    if let Some(h) = &hist {
        let _ = rl.load_history(h);
    }
    crate::engine::term::out(&format!("tickwork {} — type help for help, Ctrl-D to leave", env!("CARGO_PKG_VERSION")));
    let mut pending = String::new();
    loop {
        match rl.readline(if pending.is_empty() { PROMPT } else { CONTINUE }) {
            Ok(line) => {
                let _ = rl.add_history_entry(line.as_str());
                if !pending.is_empty() {
                    pending.push('\n');
                }
                pending.push_str(&line);
                match ev.eval(&pending) {
                    Err(Entry::Incomplete) => continue,
                    r => report(r),
                };
                pending.clear();
                *names.lock().unwrap_or_else(|p| p.into_inner()) = ev.names();
            }
            Err(rustyline::error::ReadlineError::Interrupted) => pending.clear(),
            Err(_) => break,
        }
    }
    if let Some(h) = &hist {
        if let Some(dir) = h.parent() {
            let _ = std::fs::create_dir_all(dir);
        }
        let _ = rl.save_history(h);
    }
    0
}
