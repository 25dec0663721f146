//! Terminal output that survives a closed pipe (`tickwork run x | head`) and a full or closed
//! standard error (`2>/dev/full`): a failed write is dropped, never a crash.
use std::io::Write;

/// Print one line to standard output; a closed pipe is not an error worth a crash.
pub fn out(line: &str) {
    let mut o = std::io::stdout().lock();
    let _ = writeln!(o, "{line}");
}

/// Print one line to standard error; when it cannot be written there is nowhere left to say
/// so, and the exit code still tells the outcome.
pub fn err(line: &str) {
    let mut e = std::io::stderr().lock();
    let _ = writeln!(e, "{line}");
}
