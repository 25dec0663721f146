//! File access for scripts: read only below the project root, write only into the output folder.
use std::path::{Component, Path, PathBuf};

#[derive(Clone, Debug)]
pub struct Sandbox {
    /// Canonical project root; every file a script reads must lie below it.
    pub root: PathBuf,
    /// Output folder of the current script; every file it writes lies below it.
    pub out: PathBuf,
    /// Folder of the running script: relative paths are taken from here.
    pub script_dir: PathBuf,
}

/// `p` with `.` and `..` resolved by the text alone (no file-system look-up).
fn lexical(p: &Path) -> PathBuf {
    let mut out = PathBuf::new();
    for c in p.components() {
        match c {
            Component::ParentDir => {
                out.pop();
            }
            Component::CurDir => {}
            other => out.push(other),
        }
    }
    out
}

impl Sandbox {
    pub fn new(root: &Path, out: &Path, script_dir: &Path) -> Result<Self, String> {
        let root =
            root.canonicalize().map_err(|e| format!("project root '{}' cannot be opened: {e}", root.display()))?;
        Ok(Sandbox { root, out: out.to_path_buf(), script_dir: script_dir.to_path_buf() })
    }

    /// The canonical path of a file a script may read, or why it may not.
    pub fn readable(&self, rel: &str) -> Result<PathBuf, String> {
        let outside =
            || format!("'{rel}' is outside the project root {}; scripts may read only below it", self.root.display());
        let p = self.script_dir.join(rel);
        // Judge the path as written first, so that a missing file outside the root is reported
        // as outside (not as missing, which would tell what exists there).
        if let Ok(dir) = self.script_dir.canonicalize()
            && !lexical(&dir.join(rel)).starts_with(&self.root)
        {
            return Err(outside());
        }
        let c = p.canonicalize().map_err(|e| format!("cannot open '{rel}': {e}"))?;
        if !c.starts_with(&self.root) {
            return Err(outside());
        }
        // A FIFO, socket or device would block or never end: only plain files are read.
        if !std::fs::metadata(&c).is_ok_and(|m| m.is_file()) {
            return Err(format!(
                "'{rel}' is not a regular file (a folder, pipe or device); scripts read only plain files"
            ));
        }
        Ok(c)
    }

    /// The path of a file a script may write (relative to the output folder), or why not.
    pub fn writable(&self, rel: &str) -> Result<PathBuf, String> {
        let p = Path::new(rel);
        let clean = p.components().all(|c| matches!(c, Component::Normal(_) | Component::CurDir));
        if !clean || rel.is_empty() {
            return Err(format!("'{rel}' must be a plain relative path inside the output folder"));
        }
        Ok(self.out.join(p))
    }
}
