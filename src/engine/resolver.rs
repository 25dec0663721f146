//! `import "name" as x;`: modules from the embedded `stdlib/`, then `name.rhai` beside the
//! script (inside the project root). Modules go through the same pre-pass as scripts. A module
//! that imports itself, directly or through others, is refused with the cycle named.
use std::collections::HashMap;
use std::sync::{Arc, Mutex};

use rhai::module_resolvers::ModuleResolver;
use rhai::{Engine, EvalAltResult, Module, Position, Scope, Shared as RhaiShared};

use super::prepass::prepare;
use super::session::Shared;
use super::stdlib;

pub struct Resolver {
    session: Shared,
    cache: Mutex<HashMap<String, RhaiShared<Module>>>,
    /// Source names of the modules being loaded now, outermost first (the running script
    /// first when known): an import of one of them is a cycle.
    loading: Mutex<Vec<String>>,
}

impl Resolver {
    pub fn new(session: Shared) -> Self {
        Resolver { session, cache: Mutex::new(HashMap::new()), loading: Mutex::new(Vec::new()) }
    }

    /// The chain `a.rhai → b.rhai → a.rhai` if loading `name` now would close a cycle.
    fn cycle(&self, name: &str) -> Option<String> {
        let loading = self.loading.lock().unwrap_or_else(|p| p.into_inner());
        let script = self.session.lock().script.as_ref().map(|s| s.path.clone());
        let chain: Vec<String> = script.into_iter().chain(loading.iter().cloned()).collect();
        let k = chain.iter().position(|n| n == name)?;
        let mut names: Vec<&str> = chain[k..].iter().map(String::as_str).collect();
        names.push(name);
        Some(format!("import cycle: {}; a module cannot import itself, directly or through others", names.join(" → ")))
    }

    /// Source name and text of module `path`.
    fn load(&self, path: &str) -> Result<(String, String), String> {
        if let Some(src) = stdlib::get(path) {
            return Ok((format!("stdlib/{path}.rhai"), src.to_string()));
        }
        let file = if path.ends_with(".rhai") { path.to_string() } else { format!("{path}.rhai") };
        let sandbox = self.session.lock().sandbox.clone();
        let p = sandbox.readable(&file).map_err(|e| {
            let names: Vec<&str> = stdlib::MODULES.iter().map(|(n, _)| *n).collect();
            format!("module '{path}' is not in the standard library ({}) and {e}", names.join(", "))
        })?;
        let text = std::fs::read_to_string(&p).map_err(|e| format!("cannot read module {}: {e}", p.display()))?;
        let name = p.strip_prefix(&sandbox.root).unwrap_or(&p).display().to_string();
        Ok((name, text))
    }
}

impl ModuleResolver for Resolver {
    fn resolve(
        &self,
        engine: &Engine,
        _source: Option<&str>,
        path: &str,
        pos: Position,
    ) -> Result<RhaiShared<Module>, Box<EvalAltResult>> {
        if let Some(m) = self.cache.lock().unwrap_or_else(|p| p.into_inner()).get(path) {
            return Ok(m.clone());
        }
        let fail = |msg: String| Box::new(EvalAltResult::ErrorRuntime(msg.into(), pos));
        let (name, text) = self.load(path).map_err(fail)?;
        if let Some(msg) = self.cycle(&name) {
            return Err(fail(msg));
        }
        self.loading.lock().unwrap_or_else(|p| p.into_inner()).push(name.clone());
        let r = self.compile(engine, name, text, pos);
        self.loading.lock().unwrap_or_else(|p| p.into_inner()).pop();
        let module = r?;
        self.cache.lock().unwrap_or_else(|p| p.into_inner()).insert(path.to_string(), module.clone());
        Ok(module)
    }
}

impl Resolver {
    /// Pre-pass, compile and evaluate module `name` (its imports resolve recursively).
    fn compile(
        &self,
        engine: &Engine,
        name: String,
        text: String,
        pos: Position,
    ) -> Result<RhaiShared<Module>, Box<EvalAltResult>> {
        let prepared = match prepare(&text, None) {
            Ok(p) => p,
            Err(e) => {
                // Located in the module file: its text with no rewrites, so columns are as written.
                self.session.lock().sources.files.insert(name.clone(), (text, Default::default()));
                let at = Position::new(e.line.min(u16::MAX as usize) as u16, e.col.min(u16::MAX as usize) as u16);
                let inner = Box::new(EvalAltResult::ErrorRuntime(e.message.into(), at));
                return Err(Box::new(EvalAltResult::ErrorInModule(name, inner, pos)));
            }
        };
        self.session.lock().sources.files.insert(name.clone(), (text, prepared.columns.clone()));
        let mut ast = engine
            .compile(&prepared.code)
            .map_err(|e| Box::new(EvalAltResult::ErrorInModule(name.clone(), Box::new(e.into()), pos)))?;
        ast.set_source(name.as_str());
        let module = Module::eval_ast_as_new(Scope::new(), &ast, engine)
            .map_err(|e| Box::new(EvalAltResult::ErrorInModule(name.clone(), e, pos)))?;
        Ok(Arc::new(module))
    }
}
