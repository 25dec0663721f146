//! Writing a report's files into its output folder: every figure, `results.json`, then
//! `report.md`, each through a temporary file and a rename.
use std::io;
use std::path::Path;

use super::markdown;
use super::model::Report;
use super::provenance::Provenance;
use super::results;

/// Write the report's figures, `results.json` and `report.md` into `dir` (created if needed),
/// and remove figure files of an earlier run that this report no longer has.
pub fn write(report: &Report, prov: &Provenance, dir: &Path) -> io::Result<()> {
    std::fs::create_dir_all(dir)?;
    for f in report.figures() {
        write_atomic(&dir.join(&f.file), f.svg.as_bytes())?;
    }
    write_atomic(&dir.join("results.json"), results::json(report, prov).as_bytes())?;
    write_atomic(&dir.join("report.md"), markdown::render(report, prov).as_bytes())?;
    let keep: Vec<&str> = report.figures().map(|f| f.file.as_str()).collect();
    for e in std::fs::read_dir(dir)?.flatten() {
        let name = e.file_name().to_string_lossy().to_string();
        if is_figure_name(&name) && !keep.contains(&name.as_str()) {
            let _ = std::fs::remove_file(e.path());
        }
    }
    Ok(())
}

/// True for names tickwork gives figures: `fig-NN-<slug>.svg`.
fn is_figure_name(name: &str) -> bool {
    let Some(rest) = name.strip_prefix("fig-").and_then(|r| r.strip_suffix(".svg")) else { return false };
    let digits = rest.chars().take_while(|c| c.is_ascii_digit()).count();
    digits >= 2 && rest[digits..].starts_with('-')
}

/// Write `bytes` to `path` through a temporary file in the same folder and a rename, so a
/// reader never sees a half-written file and a failure leaves the old file as it was.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> io::Result<()> {
    use std::io::Write;
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d,
        _ => Path::new("."),
    };
    let mut tmp = tempfile::Builder::new().prefix(".tickwork-").suffix(".tmp").tempfile_in(dir)?;
    tmp.write_all(bytes)?;
    // A temporary file is private (0600); a report is an ordinary file: keep the mode of the
    // file it replaces, or rw-r--r--.
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        let mode = std::fs::metadata(path).map(|m| m.permissions().mode()).unwrap_or(0o644);
        tmp.as_file().set_permissions(std::fs::Permissions::from_mode(mode))?;
    }
    tmp.as_file().sync_all()?;
    tmp.persist(path).map_err(|e| e.error)?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn figure_names() {
        assert!(is_figure_name("fig-01-period.svg"));
        assert!(is_figure_name("fig-120-a.svg"));
        assert!(!is_figure_name("fig-1-period.svg"));
        assert!(!is_figure_name("figure.svg"));
        assert!(!is_figure_name("fig-01-period.png"));
    }
}
