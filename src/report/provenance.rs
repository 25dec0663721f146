//! Provenance of a report: what produced it, so that anyone can re-run it and get the same
//! bytes. No wall-clock time unless asked for (`--stamp`), since a timestamp would make every
//! re-run differ.
use std::collections::BTreeMap;

#[derive(Clone, Debug, PartialEq, Default)]
pub struct Provenance {
    /// `tickwork <version>`.
    pub tool: String,
    /// Script path relative to the project root (None for a REPL session).
    pub script: Option<String>,
    /// SHA-256 of the script's bytes, hex.
    pub script_sha256: Option<String>,
    /// Files the script read: (path relative to the project root, SHA-256 hex).
    pub inputs: Vec<(String, String)>,
    pub overrides: BTreeMap<String, String>,
    pub seed: u64,
    /// UTC time of the run, only with `--stamp`.
    pub stamp: Option<String>,
}

impl Provenance {
    pub fn tool() -> String {
        format!("tickwork {}", env!("CARGO_PKG_VERSION"))
    }

    /// The Markdown block at the top of the report.
    pub fn markdown(&self) -> String {
        let mut s = String::from("**Provenance**\n\n");
        s.push_str(&format!("- tool: {}\n", self.tool));
        match (&self.script, &self.script_sha256) {
            (Some(p), Some(h)) => s.push_str(&format!("- script: `{p}` (SHA-256 `{h}`)\n")),
            (Some(p), None) => s.push_str(&format!("- script: `{p}`\n")),
            _ => s.push_str("- script: interactive session\n"),
        }
        if self.inputs.is_empty() {
            s.push_str("- files read: none\n");
        } else {
            s.push_str("- files read:\n");
            for (p, h) in &self.inputs {
                s.push_str(&format!("  - `{p}` (SHA-256 `{h}`)\n"));
            }
        }
        if self.overrides.is_empty() {
            s.push_str("- overrides: none\n");
        } else {
            let o: Vec<String> = self.overrides.iter().map(|(k, v)| format!("`--set {k}={v}`")).collect();
            s.push_str(&format!("- overrides: {}\n", o.join(", ")));
        }
        s.push_str(&format!("- seed: {}\n", self.seed));
        if let Some(t) = &self.stamp {
            s.push_str(&format!("- run at: {t}\n"));
        }
        s
    }
}

/// SHA-256 of `bytes` as lower-case hex.
pub fn sha256_hex(bytes: &[u8]) -> String {
    use sha2::{Digest, Sha256};
    Sha256::digest(bytes).iter().map(|b| format!("{b:02x}")).collect()
}

/// The current UTC time as `YYYY-MM-DDTHH:MM:SSZ` (ISO 8601).
pub fn utc_now() -> String {
    let secs =
        std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map(|d| d.as_secs() as i64).unwrap_or(0);
    utc_text(secs)
}

/// Seconds since 1970-01-01T00:00:00Z as ISO 8601 text.
pub fn utc_text(secs: i64) -> String {
    let days = secs.div_euclid(86_400);
    let rem = secs.rem_euclid(86_400);
    let (y, m, d) = civil_from_days(days);
    format!("{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}Z", rem / 3600, rem % 3600 / 60, rem % 60)
}

/// Proleptic Gregorian date of a day count from 1970-01-01 (H. Hinnant, "chrono-Compatible
/// Low-Level Date Algorithms", `civil_from_days`).
fn civil_from_days(z: i64) -> (i64, u32, u32) {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    let y = yoe + era * 400 + if m <= 2 { 1 } else { 0 };
    (y, m, d)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn utc_dates() {
        // Reference: `date -u -d @SECS +%FT%TZ` (GNU coreutils).
        assert_eq!(utc_text(0), "1970-01-01T00:00:00Z");
        assert_eq!(utc_text(951_782_400), "2000-02-29T00:00:00Z");
        assert_eq!(utc_text(1_798_761_599), "2026-12-31T23:59:59Z");
    }
    #[test]
    fn sha256_of_abc() {
        // FIPS 180-2, appendix B.1: SHA-256("abc").
        assert_eq!(sha256_hex(b"abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    }
}
