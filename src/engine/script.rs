//! Running one script file: pre-pass, `--set` checks, compile, evaluate, with every error
//! located in the original source.
use rhai::{Dynamic, Engine, Scope};

use super::errors::{ScriptError, from_eval, from_parse, from_prepass};
use super::prepass::{Prepared, prepare};
use super::session::Shared;
use crate::report::Section;

/// Pre-pass `text` (named `file` in messages), register its source for error messages and
/// open its prose sections in the session's report.
pub fn prepare_into_session(session: &Shared, file: &str, text: &str) -> Result<Prepared, ScriptError> {
    let mut g = session.lock();
    let base = g.report.sections.len();
    g.sources.files.insert(file.to_string(), (text.to_string(), Default::default()));
    let prepared = prepare(text, Some(base)).map_err(|e| from_prepass(&g.sources, file, &e))?;
    g.sources.files.insert(file.to_string(), (text.to_string(), prepared.columns.clone()));
    for p in &prepared.prose {
        g.report.sections.push(Section { prose: p.markdown.clone(), line: p.line, items: vec![] });
    }
    Ok(prepared)
}

/// Compile and run `text` (named `file` in messages) in a fresh scope of `engine`.
pub fn run_source(engine: &Engine, session: &Shared, file: &str, text: &str, max_ops: u64) -> Result<(), ScriptError> {
    let prepared = prepare_into_session(session, file, text)?;
    {
        let g = session.lock();
        let declared: Vec<&str> = prepared.consts.iter().map(|c| c.name.as_str()).collect();
        if let Some(unknown) = g.overrides.keys().find(|k| !declared.contains(&k.as_str())) {
            let list = if declared.is_empty() { "none".to_string() } else { declared.join(", ") };
            return Err(ScriptError {
                file: file.to_string(),
                line: 0,
                col: 0,
                message: format!(
                    "--set {unknown}: the script declares no top-level constant '{unknown}'; it declares: {list}"
                ),
                excerpt: String::new(),
            });
        }
    }
    evaluate(engine, session, file, &prepared, max_ops).map(|_| ())
}

/// Compile and evaluate prepared code in a fresh scope; the value of the last statement.
fn evaluate(
    engine: &Engine,
    session: &Shared,
    file: &str,
    prepared: &Prepared,
    max_ops: u64,
) -> Result<Dynamic, ScriptError> {
    let mut ast = engine.compile(&prepared.code).map_err(|e| from_parse(&session.lock().sources, file, &e))?;
    ast.set_source(file);
    let mut scope = Scope::new();
    engine.eval_ast_with_scope(&mut scope, &ast).map_err(|e| from_eval(&session.lock().sources, file, &e, max_ops))
}

/// Evaluate `text` as a script and return the value of its last statement (for tests and
/// one-off evaluations); SI literals and modules work as in a script file.
pub fn eval_source(
    engine: &Engine,
    session: &Shared,
    file: &str,
    text: &str,
    max_ops: u64,
) -> Result<Dynamic, ScriptError> {
    let prepared = prepare_into_session(session, file, text)?;
    evaluate(engine, session, file, &prepared, max_ops)
}
