//! Writing a report's files into its output folder.
use std::io;
use std::path::Path;

use super::markdown;
use super::model::Report;

/// Write `report.md` into `dir` (created if needed).
pub fn write(report: &Report, dir: &Path) -> io::Result<()> {
    std::fs::create_dir_all(dir)?;
    write_atomic(&dir.join("report.md"), markdown::render(report).as_bytes())
}

/// Write `bytes` to `path` through a temporary file in the same folder and a rename, so a
/// reader never sees a half-written file and a failure leaves the old file as it was.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> io::Result<()> {
    use std::io::Write;
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d,
        _ => Path::new("."),
    };
    let mut tmp = tempfile::NamedTempFile::new_in(dir)?;
    tmp.write_all(bytes)?;
    tmp.as_file().sync_all()?;
    tmp.persist(path).map_err(|e| e.error)?;
    Ok(())
}
