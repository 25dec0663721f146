//! `import "name" as x;`: modules from the embedded `stdlib/`, then `name.rhai` beside the
//! script (inside the project root). Modules go through the same pre-pass as scripts.
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
}

impl Resolver {
    pub fn new(session: Shared) -> Self {
        Resolver { session, cache: Mutex::new(HashMap::new()) }
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
        let module: RhaiShared<Module> = Arc::new(module);
        self.cache.lock().unwrap_or_else(|p| p.into_inner()).insert(path.to_string(), module.clone());
        Ok(module)
    }
}
