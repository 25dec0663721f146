//! The pre-pass on arbitrary text: it never panics, and it keeps every line break, so line
//! numbers in error messages stay those of the file.
use rand::{RngExt, SeedableRng};
use rand_chacha::ChaCha8Rng;
use tickwork::engine::prepass::{is_incomplete, prepare};

const PIECES: &[&str] = &[
    "2p",
    "1.5u",
    "µ",
    "3.3kOhm",
    "1e-3",
    "0x1F",
    "..",
    ".",
    "\"",
    "'",
    "`",
    "${",
    "}",
    "{",
    "#{",
    "(",
    ")",
    "[",
    "]",
    "//",
    "///",
    "/*",
    "*/",
    "\n",
    "\n/// prose\n",
    "const X = ",
    ";",
    "=",
    "==",
    "fn f() ",
    "let a = ",
    " ",
    "\t",
    "x2p",
    "_",
    "Ω",
    "\\",
    "é",
    "2",
    "e",
    "E",
    "+",
    "-",
    "\r\n",
    "5Kg",
    "7_000M",
];

#[test]
fn random_text_never_panics_and_keeps_lines() {
    let mut rng = ChaCha8Rng::seed_from_u64(20261201);
    for _ in 0..20_000 {
        let n = rng.random_range(0..40);
        let src: String = (0..n).map(|_| PIECES[rng.random_range(0..PIECES.len())]).collect();
        let _ = is_incomplete(&src);
        match prepare(&src, Some(1)) {
            Ok(p) => assert_eq!(p.code.split('\n').count(), src.split('\n').count(), "line count changed for {src:?}"),
            Err(e) => {
                assert!(
                    e.line >= 1 && e.line <= src.split('\n').count(),
                    "error line {} out of range for {src:?}",
                    e.line
                );
                assert!(e.col >= 1, "error column 0 for {src:?}");
            }
        }
    }
}

use crate::cli_util;

#[test]
fn random_text_through_the_engine_gives_errors_not_panics() {
    let mut rng = ChaCha8Rng::seed_from_u64(7);
    for _ in 0..2_000 {
        let n = rng.random_range(0..25);
        let src: String = (0..n).map(|_| PIECES[rng.random_range(0..PIECES.len())]).collect();
        if let Err(e) = cli_util::eval(&src) {
            // Every located error names the file and a line inside it.
            assert!(e.starts_with("test.rhai"), "{e}");
        }
    }
}
