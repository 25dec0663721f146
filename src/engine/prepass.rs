//! Source pre-pass, run before Rhai parses a script:
//! - SI-prefixed literals (`2p`, `1.5uA`, `3.3kOhm`) become plain float literals;
//! - runs of `///` prose lines become report sections (a `__section(N);` marker replaces the
//!   first line, the rest are blanked) unless they document the `fn` that follows;
//! - top-level `const NAME = expr;` declarations are wrapped so `--set NAME=VALUE` can
//!   override them.
//!
//! Strings, character literals, comments and identifiers are never touched. Line breaks are
//! kept, so line numbers stay exact; every edit is recorded so that a column in the rewritten
//! source maps back to the column in the original (see [`ColumnMap`]).
use crate::num::si::suffix_exponent;

/// One prose block: its Markdown text and the 1-based line of its first `///`.
#[derive(Clone, Debug, PartialEq)]
pub struct Prose {
    pub line: usize,
    pub markdown: String,
}

/// A top-level constant the script declares (a `--set` target).
#[derive(Clone, Debug, PartialEq)]
pub struct ConstDecl {
    pub name: String,
    pub line: usize,
}

/// An edit on one line: at original column `col` (1-based, in chars), `old_len` chars
/// were replaced by `new_len` chars.
#[derive(Clone, Copy, Debug)]
struct Edit {
    col: usize,
    old_len: usize,
    new_len: usize,
}

/// Maps (line, column) in the rewritten source back to the original.
#[derive(Clone, Debug, Default)]
pub struct ColumnMap {
    edits: Vec<Vec<Edit>>, // index: line - 1
}

impl ColumnMap {
    fn push(&mut self, line: usize, e: Edit) {
        if self.edits.len() < line {
            self.edits.resize(line, Vec::new());
        }
        self.edits[line - 1].push(e);
    }
    /// Original column of a rewritten column on `line` (both 1-based).
    pub fn original_col(&self, line: usize, col: usize) -> usize {
        let Some(edits) = self.edits.get(line.wrapping_sub(1)) else { return col };
        let mut shift: isize = 0; // new - old, accumulated over edits left of `col`
        for e in edits {
            let new_start = (e.col as isize + shift) as usize;
            if col < new_start {
                break;
            }
            if col < new_start + e.new_len {
                return e.col; // inside a rewritten token: point at its start
            }
            shift += e.new_len as isize - e.old_len as isize;
        }
        (col as isize - shift).max(1) as usize
    }
}

/// The result of the pre-pass.
#[derive(Clone, Debug, Default)]
pub struct Prepared {
    pub code: String,
    pub prose: Vec<Prose>,
    pub consts: Vec<ConstDecl>,
    pub columns: ColumnMap,
}

/// A pre-pass error at an exact original position.
#[derive(Clone, Debug, PartialEq)]
pub struct PrepassError {
    pub line: usize,
    pub col: usize,
    pub message: String,
}

/// Name of the native function the section markers call.
pub const SECTION_FN: &str = "__section";
/// Name of the native function that applies `--set` overrides.
pub const OVERRIDE_FN: &str = "__override";

/// Run the pre-pass. `section_base` numbers the first prose block (the REPL keeps counting
/// across entries); `None` (modules) blanks prose without section markers.
pub fn prepare(src: &str, section_base: Option<usize>) -> Result<Prepared, PrepassError> {
    // A UTF-8 byte-order mark, as some editors write one, is not part of the script.
    let src = src.strip_prefix('\u{feff}').unwrap_or(src);
    let lines: Vec<&str> = src.split('\n').collect();
    let prose_kind = classify_prose_lines(&lines);
    let mut out = Prepared::default();
    let mut code = String::with_capacity(src.len() + 64);
    let mut lx = Lexer::default();
    let mut pending_const: Option<(usize, usize)> = None; // (depth, line) of a `const X =` awaiting `;`
    let mut prose_open = false;
    for (k, line) in lines.iter().enumerate() {
        let ln = k + 1;
        if k > 0 {
            code.push('\n');
        }
        match prose_kind[k] {
            ProseLine::First | ProseLine::Rest if !lx.in_block_comment() && !lx.in_string() => {
                let text = line.trim_start().strip_prefix("///").unwrap_or("");
                let text = text.strip_prefix(' ').unwrap_or(text);
                // A block whose first line sat inside a string or comment starts here.
                let starts = prose_kind[k] == ProseLine::First || !prose_open;
                prose_open = true;
                if starts {
                    out.prose.push(Prose { line: ln, markdown: String::new() });
                    if let Some(base) = section_base
                        && lx.at_statement_level()
                    {
                        let n = base + out.prose.len() - 1;
                        code.push_str(&format!("{SECTION_FN}({n});"));
                    }
                }
                let Some(last) = out.prose.last_mut() else { continue };
                let md = &mut last.markdown;
                if !starts {
                    md.push('\n');
                }
                md.push_str(text.trim_end_matches('\r'));
                continue;
            }
            _ => {}
        }
        prose_open = false;
        lx.line(line, ln, &mut code, &mut out, &mut pending_const)?;
    }
    if lx.in_block_comment() {
        let (line, col) = lx.comment_start;
        return Err(PrepassError {
            line,
            col,
            message: "this /* comment is never closed (no */ before the end of the file)".into(),
        });
    }
    if pending_const.is_some() {
        code.push(')'); // a last `const` statement without its `;`
    }
    // Drop the leading newline artefacts of the first prose line of each block.
    for p in &mut out.prose {
        p.markdown = p.markdown.trim_matches('\n').to_string();
    }
    out.code = code;
    Ok(out)
}

/// True when `src` ends inside an open bracket, string or block comment: the REPL then reads
/// another line before evaluating.
pub fn is_incomplete(src: &str) -> bool {
    let mut lx = Lexer::default();
    let mut scratch = Prepared::default();
    let mut code = String::new();
    let mut pending = None;
    for (k, line) in src.split('\n').enumerate() {
        if lx.line(line, k + 1, &mut code, &mut scratch, &mut pending).is_err() {
            return false; // let evaluation report the error
        }
    }
    lx.in_block_comment() || !lx.strings.is_empty() || !lx.brackets.is_empty()
}

#[derive(Clone, Copy, Debug, PartialEq)]
enum ProseLine {
    Code,
    First,
    Rest,
}

/// Which lines are prose: runs of lines starting (after indentation) with exactly `///`
/// that are not directly followed by a `fn` definition (those are its doc comment).
fn classify_prose_lines(lines: &[&str]) -> Vec<ProseLine> {
    let is_doc = |l: &str| {
        let t = l.trim_start();
        t.starts_with("///") && !t.starts_with("////")
    };
    let mut kinds = vec![ProseLine::Code; lines.len()];
    let mut k = 0;
    while k < lines.len() {
        if !is_doc(lines[k]) {
            k += 1;
            continue;
        }
        let start = k;
        while k < lines.len() && is_doc(lines[k]) {
            k += 1;
        }
        let next = lines.get(k).map(|l| l.trim_start()).unwrap_or("");
        let documents_fn = next.starts_with("fn ") || next.starts_with("private fn ");
        if !documents_fn {
            kinds[start] = ProseLine::First;
            for kind in &mut kinds[start + 1..k] {
                *kind = ProseLine::Rest;
            }
        }
    }
    kinds
}

#[derive(Clone, Copy, Debug, PartialEq)]
enum Bracket {
    Paren,
    Square,
    Block,
    Map,
    Interp, // `${` inside a back-tick string
}

#[derive(Clone, Copy, Debug, PartialEq)]
enum StrKind {
    Normal,
    BackTick,
}

/// Tokeniser state that survives line ends (block comments, multi-line strings, brackets).
#[derive(Default)]
struct Lexer {
    block_comment: usize,          // nesting depth of /* */
    comment_start: (usize, usize), // (line, col) of the outermost open /*
    strings: Vec<StrKind>,         // open strings (back-tick strings can hold `${ code }`)
    brackets: Vec<Bracket>,
    last_token_was_const: bool,
}

impl Lexer {
    fn in_block_comment(&self) -> bool {
        self.block_comment > 0
    }
    fn in_string(&self) -> bool {
        !self.strings.is_empty() && self.strings.len() > self.interp_depth()
    }
    fn interp_depth(&self) -> usize {
        self.brackets.iter().filter(|b| **b == Bracket::Interp).count()
    }
    /// A statement may be inserted here: only inside blocks, never in an expression.
    fn at_statement_level(&self) -> bool {
        self.brackets.iter().all(|b| *b == Bracket::Block) && !self.in_string()
    }

    fn line(
        &mut self,
        line: &str,
        ln: usize,
        code: &mut String,
        out: &mut Prepared,
        pending_const: &mut Option<(usize, usize)>,
    ) -> Result<(), PrepassError> {
        let chars: Vec<char> = line.chars().collect();
        let mut i = 0;
        let n = chars.len();
        let at = |i: usize| chars.get(i).copied().unwrap_or('\0');
        while i < n {
            let c = chars[i];
            // Inside a block comment: look only for its end (or a nested start).
            if self.block_comment > 0 {
                if c == '*' && at(i + 1) == '/' {
                    self.block_comment -= 1;
                    code.push_str("*/");
                    i += 2;
                } else if c == '/' && at(i + 1) == '*' {
                    self.block_comment += 1;
                    code.push_str("/*");
                    i += 2;
                } else {
                    code.push(c);
                    i += 1;
                }
                continue;
            }
            // Inside a string literal (and not in a `${}` of it).
            if self.in_string() {
                let kind = *self.strings.last().unwrap();
                code.push(c);
                i += 1;
                match (kind, c) {
                    (_, '\\') if i < n => {
                        code.push(chars[i]);
                        i += 1;
                    }
                    (StrKind::Normal, '"') | (StrKind::BackTick, '`') => {
                        self.strings.pop();
                    }
                    (StrKind::BackTick, '$') if at(i) == '{' => {
                        code.push('{');
                        i += 1;
                        self.brackets.push(Bracket::Interp);
                    }
                    _ => {}
                }
                continue;
            }
            match c {
                '/' if at(i + 1) == '/' => {
                    // Line comment (including `///` after code): copy the rest untouched.
                    code.extend(&chars[i..]);
                    return Ok(());
                }
                '/' if at(i + 1) == '*' => {
                    self.block_comment = 1;
                    self.comment_start = (ln, i + 1);
                    code.push_str("/*");
                    i += 2;
                }
                '"' => {
                    self.strings.push(StrKind::Normal);
                    code.push(c);
                    i += 1;
                }
                '`' => {
                    self.strings.push(StrKind::BackTick);
                    code.push(c);
                    i += 1;
                }
                '\'' => {
                    // Character literal: copy through its closing quote.
                    code.push(c);
                    i += 1;
                    while i < n {
                        let d = chars[i];
                        code.push(d);
                        i += 1;
                        if d == '\\' && i < n {
                            code.push(chars[i]);
                            i += 1;
                        } else if d == '\'' {
                            break;
                        }
                    }
                }
                '#' if at(i + 1) == '{' => {
                    self.brackets.push(Bracket::Map);
                    code.push_str("#{");
                    i += 2;
                }
                '(' | '[' | '{' => {
                    self.brackets.push(match c {
                        '(' => Bracket::Paren,
                        '[' => Bracket::Square,
                        _ => Bracket::Block,
                    });
                    code.push(c);
                    i += 1;
                }
                ')' | ']' | '}' => {
                    if self.brackets.pop() == Some(Bracket::Interp) {
                        // Back inside the back-tick string that held the `${`.
                    }
                    code.push(c);
                    i += 1;
                }
                ';' => {
                    if let Some((depth, _)) = *pending_const
                        && depth == self.brackets.len()
                    {
                        code.push(')');
                        out.columns.push(ln, Edit { col: i + 1, old_len: 0, new_len: 1 });
                        *pending_const = None;
                    }
                    code.push(c);
                    i += 1;
                }
                '=' if self.last_token_was_const && at(i + 1) != '=' => {
                    // `const NAME =`: wrap the initialiser as `__override("NAME", expr)`.
                    let name = out.consts.last().map(|c| c.name.clone()).unwrap_or_default();
                    let ins = format!("= {OVERRIDE_FN}(\"{name}\",");
                    out.columns.push(ln, Edit { col: i + 1, old_len: 1, new_len: ins.chars().count() });
                    code.push_str(&ins);
                    *pending_const = Some((self.brackets.len(), ln));
                    self.last_token_was_const = false;
                    i += 1;
                    continue;
                }
                c if c.is_alphabetic() || c == '_' => {
                    let start = i;
                    while i < n && (chars[i].is_alphanumeric() || chars[i] == '_') {
                        i += 1;
                    }
                    let word: String = chars[start..i].iter().collect();
                    code.push_str(&word);
                    if word == "const" && self.brackets.is_empty() {
                        // Record the name that follows; the `=` after it starts the wrap.
                        let mut j = i;
                        while j < n && chars[j].is_whitespace() {
                            j += 1;
                        }
                        let ns = j;
                        while j < n && (chars[j].is_alphanumeric() || chars[j] == '_') {
                            j += 1;
                        }
                        if j > ns {
                            let name: String = chars[ns..j].iter().collect();
                            code.extend(&chars[i..j]);
                            i = j;
                            out.consts.push(ConstDecl { name, line: ln });
                            self.last_token_was_const = true;
                        }
                    }
                    continue;
                }
                c if c.is_ascii_digit() => {
                    i = self.number(&chars, i, ln, code, out)?;
                }
                _ => {
                    code.push(c);
                    i += 1;
                }
            }
            if !c.is_whitespace() && c != '=' {
                self.last_token_was_const = false;
            }
        }
        Ok(())
    }

    /// Copy a numeric literal starting at `i`, rewriting an SI suffix; returns the index after it.
    fn number(
        &mut self,
        chars: &[char],
        start: usize,
        ln: usize,
        code: &mut String,
        out: &mut Prepared,
    ) -> Result<usize, PrepassError> {
        let n = chars.len();
        let at = |i: usize| chars.get(i).copied().unwrap_or('\0');
        let mut i = start;
        // Hex, octal and binary integers: no suffixes.
        if chars[i] == '0' && matches!(at(i + 1), 'x' | 'o' | 'b') {
            while i < n && (chars[i].is_alphanumeric() || chars[i] == '_') {
                i += 1;
            }
            code.extend(&chars[start..i]);
            return Ok(i);
        }
        let digits = |i: &mut usize| {
            while *i < n && (chars[*i].is_ascii_digit() || chars[*i] == '_') {
                *i += 1;
            }
        };
        digits(&mut i);
        if at(i) == '.' && at(i + 1).is_ascii_digit() {
            i += 1;
            digits(&mut i);
            if at(i) == '.' && at(i + 1).is_ascii_digit() {
                // `1.5.5`: a second decimal point.
                let word: String =
                    chars[start..].iter().take_while(|c| c.is_alphanumeric() || **c == '_' || **c == '.').collect();
                return Err(PrepassError {
                    line: ln,
                    col: start + 1,
                    message: format!("malformed number '{word}': more than one decimal point"),
                });
            }
        }
        // Exponent: `e` followed by digits (optionally signed). `e` alone would be a suffix.
        if at(i) == 'e'
            && (at(i + 1).is_ascii_digit() || (matches!(at(i + 1), '+' | '-') && at(i + 2).is_ascii_digit()))
        {
            i += if at(i + 1).is_ascii_digit() { 1 } else { 2 };
            digits(&mut i);
        }
        let num: String = chars[start..i].iter().collect();
        let s0 = i;
        while i < n && (chars[i].is_alphabetic() || chars[i] == 'µ' || chars[i] == 'Ω') {
            i += 1;
        }
        if i < n && (chars[i].is_ascii_digit() || chars[i] == '_') && i > s0 {
            // e.g. `2p5`: letters then digits is not a literal we understand.
            let word: String = chars[start..].iter().take_while(|c| c.is_alphanumeric() || **c == '_').collect();
            return Err(PrepassError {
                line: ln,
                col: start + 1,
                message: format!("malformed number '{word}': a prefix or unit ends a number (write 2.5p, not 2p5)"),
            });
        }
        if i == s0 {
            code.push_str(&num);
            return Ok(i);
        }
        let suffix: String = chars[s0..i].iter().collect();
        let exp = suffix_exponent(&suffix).map_err(|m| PrepassError { line: ln, col: s0 + 1, message: m })?;
        let lit = num.replace('_', "");
        let (mut mant, e0) = match lit.split_once('e') {
            Some((m, e)) => (m.to_string(), e.parse::<i32>().unwrap_or(0)),
            None => (lit.clone(), 0),
        };
        if !mant.contains('.') {
            mant.push_str(".0"); // a suffixed literal is always a float
        }
        let e = e0 + exp;
        let new = if e == 0 { mant } else { format!("{mant}e{e}") };
        out.columns.push(ln, Edit { col: start + 1, old_len: i - start, new_len: new.chars().count() });
        code.push_str(&new);
        Ok(i)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    fn code(s: &str) -> String {
        prepare(s, Some(0)).unwrap().code
    }
    #[test]
    fn rewrites_literals() {
        assert_eq!(code("let c = 2p;"), "let c = 2.0e-12;");
        assert_eq!(code("let i = 1.5uA + 3.3kOhm;"), "let i = 1.5e-6 + 3.3e3;");
        assert_eq!(code("x = 10M * 1e-3m"), "x = 10.0e6 * 1.0e-6");
        assert_eq!(code("v = 1.66V"), "v = 1.66");
    }
    #[test]
    fn leaves_strings_comments_identifiers() {
        let s = "let s = \"2p and 3k\"; // 4n\nlet x2p = 1; /* 5u */ let y = `a ${2p} 3k`;";
        assert_eq!(code(s), "let s = \"2p and 3k\"; // 4n\nlet x2p = 1; /* 5u */ let y = `a ${2.0e-12} 3k`;");
    }
    #[test]
    fn maps_columns_back() {
        let p = prepare("let a = 2p + 1x;", Some(0));
        let e = p.unwrap_err();
        assert_eq!((e.line, e.col), (1, 15));
        let p = prepare("let a = 2p + q;", Some(0)).unwrap();
        // `q` is at original col 14; in the rewritten line it is at col 19.
        assert_eq!(p.columns.original_col(1, 19), 14);
        // `+` at rewritten col 17 is original col 12; inside `2.0e-12` maps to the literal's start.
        assert_eq!(p.columns.original_col(1, 17), 12);
        assert_eq!(p.columns.original_col(1, 12), 9);
    }
    #[test]
    fn prose_sections() {
        let p = prepare("/// # Title\n/// text\nlet a = 1;\n/// doc\nfn f() { 1 }\n", Some(0)).unwrap();
        assert_eq!(p.prose, vec![Prose { line: 1, markdown: "# Title\ntext".into() }]);
        assert_eq!(p.code, "__section(0);\n\nlet a = 1;\n/// doc\nfn f() { 1 }\n");
    }
    #[test]
    fn const_wrapping() {
        let p = prepare("const VDD = 1.8V;\nfn f() { const X = 1; }", Some(0)).unwrap();
        assert_eq!(p.code, "const VDD = __override(\"VDD\", 1.8);\nfn f() { const X = 1; }");
        assert_eq!(p.consts, vec![ConstDecl { name: "VDD".into(), line: 1 }]);
    }
}
