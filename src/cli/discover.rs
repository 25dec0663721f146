//! Which scripts a `run` covers and where each one's report goes: folders are searched
//! recursively in a stable order, and a script's output folder keeps its sub-path, so two
//! scripts of the same name in different folders never share a report.
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

/// One script of a run.
#[derive(Clone, Debug, PartialEq)]
pub struct Job {
    /// The script file, as found (relative to the current folder when given so).
    pub file: PathBuf,
    /// Output sub-path below OUT, with `/` separators: `sub/path/name`.
    pub sub: String,
}

/// True for a file or folder name a folder search skips: hidden (`.git`, `.cache`) or marked
/// as not a script of its own (`_helper.rhai`, a module other scripts import).
fn skipped(name: &str) -> bool {
    name.starts_with('.') || name.starts_with('_')
}

/// The name of a script's output folder: its file name without `.rhai`.
pub fn script_name(file: &Path) -> String {
    file.file_stem().map(|s| s.to_string_lossy().to_string()).unwrap_or_else(|| "script".into())
}

/// Every `.rhai` file below `dir`, sorted by path (byte order of the `/`-joined components).
fn walk(dir: &Path, rel: &mut Vec<String>, found: &mut Vec<(Vec<String>, PathBuf)>) -> Result<(), String> {
    let entries = std::fs::read_dir(dir).map_err(|e| format!("{}: cannot read the folder: {e}", dir.display()))?;
    let mut names: Vec<(String, PathBuf)> = Vec::new();
    for e in entries {
        let e = e.map_err(|e| format!("{}: cannot read the folder: {e}", dir.display()))?;
        let name = e.file_name().to_string_lossy().to_string();
        if !skipped(&name) {
            names.push((name, e.path()));
        }
    }
    names.sort();
    for (name, path) in names {
        // Follows symbolic links to files, not to folders (a link loop would never end).
        let is_dir = std::fs::symlink_metadata(&path).map(|m| m.is_dir()).unwrap_or(false);
        if is_dir {
            rel.push(name);
            walk(&path, rel, found)?;
            rel.pop();
        } else if name.ends_with(".rhai") && path.is_file() {
            let mut r = rel.clone();
            r.push(name);
            found.push((r, path));
        }
    }
    Ok(())
}

/// The jobs of `run ARGS...`: a file is one job with output `OUT/<name>/`; a folder is every
/// `.rhai` below it with output `OUT/<path below the folder>/<name>/`. Files named twice run
/// once; two scripts that would write the same output folder are an error naming both.
pub fn jobs(args: &[PathBuf]) -> Result<Vec<Job>, String> {
    let mut jobs: Vec<Job> = Vec::new();
    let mut seen: Vec<PathBuf> = Vec::new();
    for a in args {
        let mut add = |file: PathBuf, sub: String| {
            let canon = file.canonicalize().unwrap_or_else(|_| file.clone());
            if !seen.contains(&canon) {
                seen.push(canon);
                jobs.push(Job { file, sub });
            }
        };
        if a.is_dir() {
            let mut found = Vec::new();
            walk(a, &mut Vec::new(), &mut found)?;
            if found.is_empty() {
                return Err(format!("{}: no .rhai scripts in this folder or below it", a.display()));
            }
            for (rel, path) in found {
                let mut parts = rel;
                let stem = script_name(Path::new(&parts.pop().unwrap_or_default()));
                parts.push(stem);
                add(path, parts.join("/"));
            }
        } else {
            add(a.clone(), script_name(a));
        }
    }
    let mut by_out: BTreeMap<&str, &Path> = BTreeMap::new();
    for j in &jobs {
        if let Some(other) = by_out.insert(&j.sub, &j.file) {
            return Err(format!(
                "{} and {} would both write OUT/{}/; run their folder instead (each keeps its sub-path) or rename one",
                other.display(),
                j.file.display(),
                j.sub
            ));
        }
    }
    Ok(jobs)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn folders_keep_sub_paths_in_stable_order() {
        let d = tempfile::tempdir().unwrap();
        for f in ["b/x.rhai", "a/x.rhai", "a/c/y.rhai", "top.rhai", "_mod.rhai", ".hid/z.rhai", "notes.md"] {
            let p = d.path().join(f);
            std::fs::create_dir_all(p.parent().unwrap()).unwrap();
            std::fs::write(p, "").unwrap();
        }
        let j = jobs(&[d.path().to_path_buf()]).unwrap();
        let subs: Vec<&str> = j.iter().map(|j| j.sub.as_str()).collect();
        assert_eq!(subs, ["a/c/y", "a/x", "b/x", "top"]);
        // The same file again (as a file) runs once; a second x.rhai as a file collides.
        let j = jobs(&[d.path().to_path_buf(), d.path().join("top.rhai")]).unwrap();
        assert_eq!(j.len(), 4);
        let e = jobs(&[d.path().join("a/x.rhai"), d.path().join("b/x.rhai")]).unwrap_err();
        assert!(e.contains("would both write OUT/x/"), "{e}");
        assert!(jobs(&[d.path().join(".hid/none")]).unwrap()[0].sub == "none");
        std::fs::create_dir(d.path().join("empty")).unwrap();
        assert!(jobs(&[d.path().join("empty")]).unwrap_err().contains("no .rhai scripts"));
    }
}
