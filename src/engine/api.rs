//! Registration of script functions together with their documentation.
//!
//! Every script function is registered with [`fun`], which takes its signature as a user reads
//! it (`"p.nmos(w: m, l: m) -> Mos"`: receiver, parameters with units or script types, result)
//! and a one-line description, and stores both in the scripting engine's own function metadata:
//! parameter names and script-level types, the result type, and doc comments whose first line is
//! the signature. `tickwork doc`, the REPL's `help`, the "did you mean" hints, `tickwork defs`
//! (editor definition files) and `docs/functions.md` are all generated from that metadata
//! ([`super::docs`]), so a function's documentation is written once, where it is registered.
//!
//! Signature grammar: `[recv.]name(param, ...) -> result`. `recv` is a receiver variable of
//! [`RECEIVERS`] (its script type is looked up there); a param is `name: type`, a bare `name`
//! (a number), a string literal such as `"tg"` (a string), or an option map `#{...}` (a map).
//! A type is a script type (`float`, `int`, `string`, `bool`, `map`, `array`, `Series`,
//! `Oscillator`, ...), a unit (`V`, `°C`, `A`, `m`, ... meaning a number in that unit), a string
//! literal, or alternatives joined by `|`.
use rhai::{Engine, FuncRegistration, RhaiNativeFunc};

/// Receiver variables used in signatures, and the script type each stands for.
pub const RECEIVERS: &[(&str, &str)] = &[
    ("o", "Oscillator"),
    ("p", "Process"),
    ("m", "Mos"),
    ("mi", "Mirror"),
    ("c", "Comparator"),
    ("cap", "Capacitor"),
    ("mcap", "MosCap"),
    ("res", "Resistor"),
    ("sw", "Switch"),
    ("s", "Series"),
    ("mask", "Series"),
    ("mc", "MonteCarlo"),
    ("t", "Trim"),
    ("r", "Reference"),
];

/// Script types a signature may name; anything else in a type position is a unit (a number).
pub const SCRIPT_TYPES: &[&str] = &[
    "float",
    "int",
    "number",
    "string",
    "bool",
    "map",
    "array",
    "fn",
    "()",
    "Series",
    "Oscillator",
    "Process",
    "Mos",
    "Mirror",
    "Comparator",
    "Capacitor",
    "MosCap",
    "Resistor",
    "Switch",
    "MonteCarlo",
    "Trim",
    "Distribution",
    "Reference",
];

/// A parsed signature: name, parameters as `name: type`, result type.
#[derive(Debug, Clone, PartialEq)]
pub struct Signature {
    pub name: String,
    pub params: Vec<(String, String)>,
    pub result: String,
}

/// Register `f` as the script function of signature `sig`, described by `summary`.
///
/// A signature that does not parse, or names an unknown receiver, is a programming error: every
/// engine build registers every function, so the test suite meets it at once.
pub fn fun<A: 'static, const N: usize, const X: bool, R, const F: bool, FUNC>(
    engine: &mut Engine,
    sig: &str,
    summary: &str,
    f: FUNC,
) where
    R: Clone + Send + Sync + 'static,
    FUNC: RhaiNativeFunc<A, N, X, R, F> + Send + Sync + 'static,
{
    let parsed = parse(sig).unwrap_or_else(|e| panic!("signature {sig:?}: {e}"));
    assert_eq!(
        parsed.params.len(),
        N,
        "signature {sig:?} names {} parameters; the function takes {N}",
        parsed.params.len()
    );
    let mut info: Vec<String> = parsed.params.iter().map(|(n, t)| format!("{n}: {t}")).collect();
    info.push(parsed.result.clone());
    let comments = [format!("/// `{sig}`\n/// {summary}")];
    FuncRegistration::new(parsed.name.as_str())
        .with_params_info(info)
        .with_comments(comments)
        .register_into_engine(engine, f);
}

/// Parse a signature (see the module documentation for the grammar).
pub fn parse(sig: &str) -> Result<Signature, String> {
    let (head, result) = match sig.rsplit_once(") -> ") {
        Some((h, r)) => (format!("{h})"), r.trim().to_string()),
        None => (sig.trim().to_string(), "()".to_string()),
    };
    let open = head.find('(').ok_or("no '('")?;
    if !head.ends_with(')') {
        return Err("no closing ')'".into());
    }
    let callee = &head[..open];
    let inner = &head[open + 1..head.len() - 1];
    let (receiver, name) = match callee.split_once('.') {
        Some((r, n)) => (Some(r), n),
        None => (None, callee),
    };
    if name.is_empty() || !name.chars().all(|c| c.is_alphanumeric() || c == '_') {
        return Err(format!("bad function name {name:?}"));
    }
    let mut params = Vec::new();
    if let Some(r) = receiver {
        let ty = RECEIVERS.iter().find(|(v, _)| *v == r).map(|(_, t)| *t).ok_or(format!("unknown receiver {r:?}"))?;
        params.push((r.to_string(), ty.to_string()));
    }
    for (i, p) in split_top(inner).into_iter().enumerate() {
        params.push(param(p, i)?);
    }
    Ok(Signature { name: name.to_string(), params, result: script_type(&result) })
}

/// One parameter as (name, script type).
fn param(p: &str, index: usize) -> Result<(String, String), String> {
    let p = p.trim();
    if p.starts_with("#{") {
        return Ok(("options".into(), "map".into()));
    }
    if p.starts_with('"') {
        return Ok((format!("arg{index}"), "string".into()));
    }
    if p == "…" || p == "..." {
        return Err("a parameter list may not end in '...'; register each form".into());
    }
    match p.split_once(':') {
        Some((n, t)) => Ok((n.trim().to_string(), script_type(t.trim()))),
        None => Ok((p.to_string(), "float".into())),
    }
}

/// The script type a type position stands for: script types as written, units as `float`,
/// string literals as `string`, alternatives joined by `|`.
pub fn script_type(t: &str) -> String {
    let t = t.trim();
    if t.starts_with("#{") {
        return "map".into();
    }
    if t.starts_with("fn(") {
        return "fn".into();
    }
    let mut out: Vec<String> = Vec::new();
    for alt in split_alternatives(t) {
        let alt = alt.trim();
        let ty = if SCRIPT_TYPES.contains(&alt) {
            alt.to_string()
        } else if alt.starts_with('"') {
            "string".to_string()
        } else if alt.starts_with("#{") {
            "map".to_string()
        } else {
            "float".to_string()
        };
        if !out.contains(&ty) {
            out.push(ty);
        }
    }
    out.join("|")
}

/// Split on commas that are not inside brackets, braces or quotes.
fn split_top(s: &str) -> Vec<&str> {
    let mut parts = Vec::new();
    let (mut depth, mut quoted, mut start) = (0i32, false, 0usize);
    for (i, c) in s.char_indices() {
        match c {
            '"' => quoted = !quoted,
            '(' | '[' | '{' if !quoted => depth += 1,
            ')' | ']' | '}' if !quoted => depth -= 1,
            ',' if depth == 0 && !quoted => {
                parts.push(&s[start..i]);
                start = i + 1;
            }
            _ => {}
        }
    }
    if !s[start..].trim().is_empty() {
        parts.push(&s[start..]);
    }
    parts
}

/// Split on `|` outside brackets and quotes.
fn split_alternatives(s: &str) -> Vec<&str> {
    let mut parts = Vec::new();
    let (mut depth, mut quoted, mut start) = (0i32, false, 0usize);
    for (i, c) in s.char_indices() {
        match c {
            '"' => quoted = !quoted,
            '(' | '[' | '{' if !quoted => depth += 1,
            ')' | ']' | '}' if !quoted => depth -= 1,
            '|' if depth == 0 && !quoted => {
                parts.push(&s[start..i]);
                start = i + 1;
            }
            _ => {}
        }
    }
    parts.push(&s[start..]);
    parts
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn method_with_units() {
        let s = parse("p.nmos(w: m, l: m) -> Mos").unwrap();
        assert_eq!(s.name, "nmos");
        assert_eq!(
            s.params,
            vec![("p".into(), "Process".into()), ("w".into(), "float".into()), ("l".into(), "float".into())]
        );
        assert_eq!(s.result, "Mos");
    }

    #[test]
    fn maps_literals_and_alternatives() {
        let s = parse("p.mos_switch(\"tg\", w_n: m, w_p: m, l: m) -> Switch").unwrap();
        assert_eq!(s.params[1], ("arg0".into(), "string".into()));
        let s = parse("p.mirror(#{kind, type, i_ref: A, ratio}) -> Mirror").unwrap();
        assert_eq!(s.params[1], ("options".into(), "map".into()));
        let s = parse("pow(s: Series|float, p: float|Series) -> Series|float").unwrap();
        assert_eq!(s.params[0].1, "Series|float");
        let s = parse("m.id(vgs: V|Series, vds: V, temp: °C) -> A|Series").unwrap();
        assert_eq!(s.params[1].1, "float|Series");
        assert_eq!(s.result, "float|Series");
        assert_eq!(parse("seed() -> int").unwrap().params, vec![]);
    }

    #[test]
    fn bad_signatures_are_refused() {
        assert!(parse("q.nothing() -> int").is_err());
        assert!(parse("bad name() -> int").is_err());
        assert!(parse("noparen -> int").is_err());
    }
}
