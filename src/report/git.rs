//! The git commit a design repository is checked out at, read from its `.git` folder directly
//! (HEAD, loose refs, packed-refs, linked work trees), for the metrics history. No git process
//! and no git library: these few plain-text files are all it takes.
use std::path::{Path, PathBuf};

/// The commit (40 or 64 hex digits) checked out in the repository holding `start`, or None when
/// `start` is not inside a git checkout or its branch has no commit yet.
pub fn head_commit(start: &Path) -> Option<String> {
    let (git_dir, common) = find(start)?;
    let head = std::fs::read_to_string(git_dir.join("HEAD")).ok()?;
    resolve(&git_dir, &common, head.trim(), 0)
}

/// The repository's own git folder and its common folder (they differ for a linked work tree).
fn find(start: &Path) -> Option<(PathBuf, PathBuf)> {
    let start = start.canonicalize().ok()?;
    for dir in start.ancestors() {
        let dot = dir.join(".git");
        let git_dir = if dot.is_dir() {
            dot
        } else if dot.is_file() {
            // A linked work tree or submodule: `.git` is a file "gitdir: PATH".
            let text = std::fs::read_to_string(&dot).ok()?;
            let p = Path::new(text.trim().strip_prefix("gitdir:")?.trim());
            dir.join(p)
        } else {
            continue;
        };
        let common = match std::fs::read_to_string(git_dir.join("commondir")) {
            Ok(c) => git_dir.join(c.trim()),
            Err(_) => git_dir.clone(),
        };
        return Some((git_dir, common));
    }
    None
}

fn is_hash(s: &str) -> bool {
    (s.len() == 40 || s.len() == 64) && s.bytes().all(|b| b.is_ascii_hexdigit())
}

/// Follow `value` (a hash, or `ref: NAME`) to a commit hash.
fn resolve(git_dir: &Path, common: &Path, value: &str, depth: usize) -> Option<String> {
    if is_hash(value) {
        return Some(value.to_ascii_lowercase());
    }
    let name = value.strip_prefix("ref:")?.trim();
    if depth > 8 || name.split('/').any(|c| c.is_empty() || c == "..") {
        return None;
    }
    for dir in [git_dir, common] {
        if let Ok(t) = std::fs::read_to_string(dir.join(name)) {
            return resolve(git_dir, common, t.trim(), depth + 1);
        }
    }
    // Packed refs: lines "HASH NAME"; '#' starts the header, '^' a peeled tag.
    let packed = std::fs::read_to_string(common.join("packed-refs")).ok()?;
    packed
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with('^'))
        .filter_map(|l| l.split_once(' '))
        .find(|(_, n)| n.trim() == name)
        .map(|(h, _)| h.to_ascii_lowercase())
        .filter(|h| is_hash(h))
}

#[cfg(test)]
mod tests {
    use super::*;
    const A: &str = "0123456789abcdef0123456789abcdef01234567";
    const B: &str = "89abcdef0123456789abcdef0123456789abcdef";
    #[test]
    fn loose_packed_detached_and_linked_work_tree() {
        // The layout of a .git folder as git-repository-layout(5) describes it.
        let d = tempfile::tempdir().unwrap();
        let git = d.path().join("repo/.git");
        std::fs::create_dir_all(git.join("refs/heads")).unwrap();
        std::fs::create_dir_all(d.path().join("repo/design/sub")).unwrap();
        std::fs::write(git.join("HEAD"), "ref: refs/heads/main\n").unwrap();
        assert_eq!(head_commit(&d.path().join("repo/design/sub")), None, "unborn branch");
        std::fs::write(git.join("packed-refs"), format!("# pack-refs with: peeled\n{B} refs/heads/main\n^{A}\n"))
            .unwrap();
        assert_eq!(head_commit(&d.path().join("repo/design/sub")).as_deref(), Some(B));
        std::fs::write(git.join("refs/heads/main"), format!("{A}\n")).unwrap();
        assert_eq!(head_commit(&d.path().join("repo")).as_deref(), Some(A), "a loose ref wins over a packed one");
        // A linked work tree: .git is a file naming its folder, which names the common folder.
        let wt = git.join("worktrees/w");
        std::fs::create_dir_all(&wt).unwrap();
        std::fs::write(wt.join("HEAD"), format!("{B}\n")).unwrap();
        std::fs::write(wt.join("commondir"), "../..\n").unwrap();
        std::fs::create_dir_all(d.path().join("w")).unwrap();
        std::fs::write(d.path().join("w/.git"), format!("gitdir: {}\n", wt.display())).unwrap();
        assert_eq!(head_commit(&d.path().join("w")).as_deref(), Some(B));
        std::fs::write(wt.join("HEAD"), "ref: refs/heads/main\n").unwrap();
        assert_eq!(head_commit(&d.path().join("w")).as_deref(), Some(A));
        assert_eq!(head_commit(Path::new("/")), None);
    }
}
