//! Script errors as `file:line:col: message`, with the offending source line and a caret.
use std::collections::HashMap;

use rhai::{EvalAltResult, ParseError, ParseErrorType, Position};

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
            let pad: String =
                src.chars().take(col.saturating_sub(1)).map(|c| if c == '\t' { '\t' } else { ' ' }).collect();
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
    let message = match e.err_type() {
        // Not a syntax error: the name is not defined (variables are checked at compile time).
        ParseErrorType::VariableUndefined(name) => {
            format!("undefined name '{name}': no variable or constant of that name is defined before this line")
        }
        other => format!("syntax error: {other}"),
    };
    located(sources, file, e.position(), message)
}

/// The innermost located error of an evaluation failure, with the call chain as context.
pub fn from_eval(sources: &Sources, file: &str, e: &EvalAltResult, max_ops: u64) -> ScriptError {
    from_eval_in(sources, file, e, max_ops, &HashMap::new())
}

/// As [`from_eval`]; `fn_files` names the source of script functions whose errors Rhai reports
/// against the calling entry (the REPL merges functions of earlier entries into each new one).
pub fn from_eval_in(
    sources: &Sources,
    file: &str,
    e: &EvalAltResult,
    max_ops: u64,
    fn_files: &HashMap<String, String>,
) -> ScriptError {
    let mut context: Vec<String> = Vec::new();
    let mut cur = e;
    let mut source = file.to_string();
    loop {
        match cur {
            EvalAltResult::ErrorInFunctionCall(name, src, inner, pos) => {
                let who = if name.starts_with("anon$") { "a closure".to_string() } else { format!("'{name}'") };
                context.push(format!("in {who} called at {}", at(&source, *pos)));
                let defined = fn_files.get(name.as_str()).filter(|_| src.is_empty() || *src == source);
                if let Some(f) = defined {
                    source = f.clone();
                } else if !src.is_empty() {
                    source = src.clone();
                }
                cur = inner;
            }
            EvalAltResult::ErrorInModule(name, inner, pos) => {
                context.push(format!("in module '{name}' imported at {}", at(&source, *pos)));
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
        EvalAltResult::ErrorRuntime(v, _) => plain_types(&v.to_string()),
        EvalAltResult::ErrorFunctionNotFound(sig, _) => not_found(sig),
        EvalAltResult::ErrorStackOverflow(_) => {
            "too many nested function calls (the limit is 64): a function that calls itself without end?".to_string()
        }
        EvalAltResult::ErrorParsing(t, _) => format!("syntax error: {t}"),
        EvalAltResult::ErrorPropertyNotFound(k, _) => format!("the map has no key '{k}'"),
        EvalAltResult::ErrorIndexingType(t, _) => {
            let t = plain_types(t);
            match t.split_once(" [") {
                Some((what, idx)) => format!("a {what} cannot be indexed by a {}", idx.trim_end_matches(']')),
                None => format!("cannot index {t}"),
            }
        }
        other => {
            let mut s = other.to_string();
            // Rhai appends " (line L, position C)" to some messages; positions are given separately.
            if let Some(k) = s.rfind(" (line ") {
                s.truncate(k);
            }
            property_words(&plain_types(&s))
        }
    };
    // The innermost call first: "in 'g' called at f.rhai:3, in 'f' called at f.rhai:5".
    context.reverse();
    let message = if context.is_empty() { message } else { format!("{message} ({})", context.join(", ")) };
    located(sources, &source, cur.position(), message)
}

/// `file:line` of a position, or just the file.
fn at(file: &str, pos: Position) -> String {
    match pos.line() {
        Some(l) => format!("{file}:{l}"),
        None => file.to_string(),
    }
}

/// Rhai's Rust spellings of script types in the words scripts use.
pub fn plain_types(s: &str) -> String {
    let s = s.replace("&str | ImmutableString | String", "string").replace("ImmutableString", "string");
    let mut out = String::with_capacity(s.len());
    let chars: Vec<char> = s.chars().collect();
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        if c.is_alphanumeric() || c == '_' || c == ':' {
            let st = i;
            while i < chars.len() && (chars[i].is_alphanumeric() || chars[i] == '_' || chars[i] == ':') {
                i += 1;
            }
            let w: String = chars[st..i].iter().collect();
            out.push_str(match w.as_str() {
                "i64" => "int",
                "f64" => "float",
                "bool" => "bool",
                // A Rust path of a registered type (`tickwork::timing::osc::Osc`): its last part.
                _ if w.starts_with("tickwork::") => match w.rsplit("::").next().unwrap_or(&w) {
                    "Osc" => "Oscillator",
                    last => last,
                },
                _ => &w,
            });
            continue;
        }
        out.push(c);
        i += 1;
    }
    for (a, b) in [
        (" a int", " an int"),
        (" a array", " an array"),
        (" a Oscillator", " an Oscillator"),
        (" a integer", " an integer"),
    ] {
        out = out.replace(a, b);
    }
    out
}

/// Rhai's getter and setter wording as what the script did: `a int has no property 'p'`.
fn property_words(s: &str) -> String {
    let quoted = |t: &str, k: usize| t.split('\'').nth(k).map(str::to_string);
    if s.starts_with("Unknown property '")
        && s.contains("a getter is not registered for type '")
        && let (Some(p), Some(t)) = (quoted(s, 1), quoted(s, 3))
    {
        return format!("{} has no property '{p}'", plain_types(&format!(" a {t}")).trim_start());
    }
    if s.starts_with("No writable property '")
        && s.contains("a setter is not registered for type '")
        && let (Some(p), Some(t)) = (quoted(s, 1), quoted(s, 3))
    {
        return format!("{} has no property '{p}' that can be set", plain_types(&format!(" a {t}")).trim_start());
    }
    s.to_string()
}

/// A call that matches no function: say which forms exist.
fn not_found(sig: &str) -> String {
    let sig = plain_types(sig);
    let (name, args) = match sig.split_once(" (") {
        Some((n, a)) => (n.trim(), a.trim_end_matches(')')),
        None => (sig.as_str(), ""),
    };
    let short = name.rsplit("::").next().unwrap_or(name);
    if short.starts_with("anon$") {
        return format!(
            "the closure cannot be called with ({args}): it takes another number of parameters (s.map calls it with one: |x| ...)"
        );
    }
    if !short.starts_with(|c: char| c.is_alphabetic() || c == '_') {
        return format!("operator '{short}' does not apply to ({args})");
    }
    let forms = super::docs::lookup(short);
    if !forms.is_empty() {
        let sigs: Vec<&str> = forms.iter().map(|d| d.sig.as_str()).collect();
        return format!("{short}({args}) matches none of its forms: {}", sigs.join("; "));
    }
    let near = super::docs::similar(short);
    let hint = if near.is_empty() { String::new() } else { format!("; similar names: {}", near.join(", ")) };
    format!("no function '{short}' takes ({args}){hint}")
}
