//! Script errors as `file:line:col: message`, with the offending source line and a caret.
use rhai::{EvalAltResult, ParseError, Position};

use super::prepass::PrepassError;
use super::session::Sources;

/// A located error ready to print.
#[derive(Clone, Debug, PartialEq)]
pub struct ScriptError {
    pub file: String,
    pub line: usize,
    pub col: usize,
    pub message: String,
    /// The source line and a caret under the column (empty when unknown).
    pub excerpt: String,
}

impl std::fmt::Display for ScriptError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        if self.line > 0 {
            write!(f, "{}:{}:{}: {}", self.file, self.line, self.col, self.message)?;
        } else {
            write!(f, "{}: {}", self.file, self.message)?;
        }
        if !self.excerpt.is_empty() {
            write!(f, "\n{}", self.excerpt)?;
        }
        Ok(())
    }
}

/// Build the error for a position in `file`'s rewritten source.
fn located(sources: &Sources, file: &str, pos: Position, message: String) -> ScriptError {
    let (line, col) = match (pos.line(), pos.position()) {
        (Some(l), c) => (l, c.unwrap_or(1)),
        _ => (0, 0),
    };
    let (col, excerpt) = match sources.files.get(file) {
        Some((text, map)) if line > 0 => {
            let col = map.original_col(line, col);
            let src = text.split('\n').nth(line - 1).unwrap_or("").trim_end_matches('\r');
            let pad: String = src.chars().take(col.saturating_sub(1)).map(|c| if c == '\t' { '\t' } else { ' ' }).collect();
            (col, format!("{:>5} | {src}\n      | {pad}^", line))
        }
        _ => (col, String::new()),
    };
    ScriptError { file: file.to_string(), line, col, message, excerpt }
}

pub fn from_prepass(sources: &Sources, file: &str, e: &PrepassError) -> ScriptError {
    let mut err = located(sources, file, Position::NONE, e.message.clone());
    // Pre-pass positions are already original ones: rebuild the excerpt without mapping.
    if let Some((text, _)) = sources.files.get(file) {
        let src = text.split('\n').nth(e.line - 1).unwrap_or("");
        let pad: String = src.chars().take(e.col - 1).map(|c| if c == '\t' { '\t' } else { ' ' }).collect();
        err.excerpt = format!("{:>5} | {src}\n      | {pad}^", e.line);
    }
    err.line = e.line;
    err.col = e.col;
    err
}

pub fn from_parse(sources: &Sources, file: &str, e: &ParseError) -> ScriptError {
    located(sources, file, e.position(), format!("syntax error: {}", e.err_type()))
}

/// The innermost located error of an evaluation failure, with the call chain as context.
pub fn from_eval(sources: &Sources, file: &str, e: &EvalAltResult, max_ops: u64) -> ScriptError {
    let mut context: Vec<String> = Vec::new();
    let mut cur = e;
    let mut source = file.to_string();
    loop {
        match cur {
            EvalAltResult::ErrorInFunctionCall(name, src, inner, pos) => {
                context.push(format!("in call to '{name}' at line {}", pos.line().unwrap_or(0)));
                if !src.is_empty() {
                    source = src.clone();
                }
                cur = inner;
            }
            EvalAltResult::ErrorInModule(name, inner, _) => {
                context.push(format!("in module '{name}'"));
                source = name.clone();
                cur = inner;
            }
            _ => break,
        }
    }
    let message = match cur {
        EvalAltResult::ErrorTooManyOperations(_) => format!(
            "script stopped after {max_ops} operations (a runaway loop?); raise the limit with --max-ops N if the work is real"
        ),
        EvalAltResult::ErrorRuntime(v, _) => v.to_string(),
        other => {
            let mut s = other.to_string();
            // Rhai appends " (line L, position C)" to some messages; positions are given separately.
            if let Some(k) = s.rfind(" (line ") {
                s.truncate(k);
            }
            s
        }
    };
    let message = if context.is_empty() { message } else { format!("{message} ({})", context.join(", ")) };
    located(sources, &source, cur.position(), message)
}
