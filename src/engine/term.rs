//! Terminal output that survives a closed pipe (`tickwork run x | head`).
use std::io::Write;

/// Print one line to standard output; a closed pipe is not an error worth a crash.
pub fn out(line: &str) {
    let mut o = std::io::stdout().lock();
    let _ = writeln!(o, "{line}");
}
