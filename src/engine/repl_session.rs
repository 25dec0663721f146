//! The evaluating half of the REPL, independent of where lines come from (a terminal, a pipe,
//! a test): variables and functions persist between entries, `import` outlives its entry,
//! `help NAME` shows a function's documentation, and an entry can be cancelled (Ctrl-C)
//! without losing the session. The line editor lives in the command line (`cli::repl`).
use std::collections::HashMap;
use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, Ordering};

use rhai::{AST, ASTNode, Dynamic, Engine, Expr, Scope, Stmt};

use super::display;
use super::docs;
use super::errors::{from_eval, from_eval_in, from_parse};
use super::prepass::prepare;
use super::sandbox::Sandbox;
use super::script::prepare_into_session;
use super::session::{Session, Shared};

/// Set (by the command line's SIGINT handler, or anyone) to stop the running entry; the
/// engine checks it between operations and clears it when the entry stops.
pub static CANCEL: AtomicBool = AtomicBool::new(false);

/// What a REPL session starts from.
#[derive(Clone, Debug)]
pub struct Options {
    /// Project root: files are read only below it.
    pub root: PathBuf,
    /// Output folder: `save_report("x")` writes OUT/repl/x/.
    pub out: PathBuf,
    pub seed: u64,
    pub max_ops: u64,
    /// Worker threads of Monte Carlo runs and sweeps (0: all cores).
    pub threads: usize,
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

pub struct ReplSession {
    engine: Engine,
    scope: Scope<'static>,
    functions: AST,
    pub session: Shared,
    entries: usize,
    max_ops: u64,
    /// The entry each script function was defined in, for error positions.
    fn_files: HashMap<String, String>,
    /// The last result at full precision, for `full`.
    last_full: Option<String>,
}

impl ReplSession {
    pub fn new(o: &Options) -> Result<Self, String> {
        let out = o.out.join("repl");
        let sandbox = Sandbox::new(&o.root, &out, &o.root)?;
        let mut session = Session::new("repl", sandbox);
        session.seed = o.seed;
        session.threads = o.threads;
        let session = Shared::new(session);
        let mut engine = super::build(&session, o.max_ops);
        engine.on_progress(|_| CANCEL.swap(false, Ordering::Relaxed).then(|| Dynamic::from("cancelled")));
        Ok(ReplSession {
            engine,
            scope: Scope::new(),
            functions: AST::empty(),
            session,
            entries: 0,
            max_ops: o.max_ops,
            fn_files: HashMap::new(),
            last_full: None,
        })
    }

    /// Names for completion: every registered function and every variable in scope.
    pub fn names(&self) -> Vec<String> {
        let mut v: Vec<String> = docs::all().iter().map(|d| d.name.to_string()).collect();
        v.extend(self.scope.iter().map(|(n, _, _)| n.to_string()));
        v.extend(self.functions.iter_functions().map(|f| f.name.to_string()));
        for kw in [
            "let", "const", "fn", "if", "else", "for", "in", "while", "loop", "return", "import", "true", "false",
            "help", "doc", "full",
        ] {
            v.push(kw.to_string());
        }
        v.sort();
        v.dedup();
        v
    }

    /// True when the entry parses only as the start of something (`let x = 1 +`).
    fn ends_early(&self, text: &str) -> bool {
        let Ok(p) = prepare(text, Some(0)) else { return false };
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
        if t == "full" {
            return Ok(Some(self.last_full.clone().unwrap_or_else(|| "no result yet".into())));
        }
        for cmd in ["help ", "doc "] {
            if let Some(name) = t.strip_prefix(cmd) {
                return docs::describe_or_hint(name.trim()).map(Some).map_err(Entry::Failed);
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
        // An interrupt that came after the entry's last check must not cancel the next one.
        let result = self.engine.eval_ast_with_scope::<Dynamic>(&mut self.scope, &ast);
        CANCEL.store(false, Ordering::Relaxed);
        let result = result.map_err(|e| match *e {
            rhai::EvalAltResult::ErrorTerminated(..) => {
                format!("{file}: entry cancelled; variables and functions of earlier entries are kept")
            }
            _ => from_eval_in(&self.session.lock().sources, &file, &e, self.max_ops, &fn_files).to_string(),
        })?;
        self.fn_files = fn_files;
        self.functions = self.functions.merge(&ast.clone_functions_only());
        // A trailing `;` asks for the statement's effect only, not its value.
        if result.is_unit() || t.ends_with(';') {
            return Ok(None);
        }
        let (short, full) = match result.as_float() {
            // Engineering notation to read; `full` gives the exact value.
            Ok(x) => (crate::num::si::eng(x, "", 4), format!("{x:?}")),
            Err(_) => {
                let t = display::text_of(&self.engine, &result);
                (t.clone(), t)
            }
        };
        self.last_full = Some(full);
        Ok(Some(short))
    }

    /// Modules imported at the top level of the entry (read from its syntax tree), resolved
    /// now so later entries can use them.
    fn imports(&self, ast: &AST, file: &str) -> Result<Vec<(String, rhai::Shared<rhai::Module>)>, String> {
        let mut found: Vec<(String, String)> = Vec::new();
        ast.walk(&mut |path: &[ASTNode]| {
            if let [ASTNode::Stmt(Stmt::Import(x, _))] = path
                && let (Expr::StringConstant(p, _), alias) = (&x.0, &x.1)
                && !alias.name.is_empty()
            {
                found.push((p.to_string(), alias.name.to_string()));
            }
            true
        });
        let src = ast.source().unwrap_or(file).to_string();
        let mut v = Vec::new();
        for (path, alias) in found {
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

pub const HELP: &str = "\
Type statements as in a script; variables and functions stay defined. The value of an
entry is printed (numbers in engineering notation) unless the entry ends with `;`.
  help NAME | doc NAME   signature, units and description of a function (o.period works)
  help                   this text
  full                   the last result at full precision
  Tab                    complete a function, variable, method or map key
  Ctrl-C                 cancel the running entry (the session and its variables stay)
  Ctrl-D                 leave
An unclosed bracket, string or comment, or a line ending in an operator, continues on the
next line.";

/// What Tab can offer: every name, and after `x.` the methods of x's type or the keys of the
/// map x, for each variable in scope.
#[derive(Clone, Debug, Default)]
pub struct Completions {
    pub names: Vec<String>,
    pub members: HashMap<String, Vec<String>>,
}

impl ReplSession {
    /// Completion candidates for the session as it stands.
    pub fn completions(&self) -> Completions {
        let mut members = HashMap::new();
        for (name, _, v) in self.scope.iter() {
            let mut list: Vec<String> = match v.clone().try_cast::<rhai::Map>() {
                Some(m) => m.keys().map(|k| k.to_string()).collect(),
                None => docs::methods_of(self.engine.map_type_name(v.type_name())),
            };
            list.sort();
            list.dedup();
            members.insert(name.to_string(), list);
        }
        Completions { names: self.names(), members }
    }
}
