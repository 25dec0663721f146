//! Helpers for the engine's integration tests: run the built binary in a scratch folder, or
//! evaluate a script in-process.
#![allow(dead_code)]
use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};

use tickwork::engine::{
    self,
    sandbox::Sandbox,
    session::{Session, Shared},
};

/// A scratch project folder holding one script file.
pub struct Project {
    pub dir: tempfile::TempDir,
}

impl Project {
    pub fn new() -> Self {
        Project { dir: tempfile::tempdir().expect("temp dir") }
    }
    pub fn path(&self) -> &Path {
        self.dir.path()
    }
    pub fn write(&self, name: &str, text: &str) -> PathBuf {
        let p = self.path().join(name);
        if let Some(d) = p.parent() {
            std::fs::create_dir_all(d).unwrap();
        }
        std::fs::write(&p, text).unwrap();
        p
    }
    /// Run `tickwork ARGS` in the project folder.
    pub fn tickwork(&self, args: &[&str]) -> Output {
        Command::new(env!("CARGO_BIN_EXE_tickwork")).args(args).current_dir(self.path()).output().expect("run tickwork")
    }
    /// Run `tickwork repl` with `input` on a pipe.
    pub fn repl(&self, input: &str) -> Output {
        self.repl_with(input, &[])
    }
    /// Run `tickwork repl ARGS` with `input` on a pipe.
    pub fn repl_with(&self, input: &str, args: &[&str]) -> Output {
        let mut child = Command::new(env!("CARGO_BIN_EXE_tickwork"))
            .arg("repl")
            .args(args)
            .current_dir(self.path())
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()
            .expect("start repl");
        child.stdin.take().unwrap().write_all(input.as_bytes()).unwrap();
        child.wait_with_output().unwrap()
    }
}

pub fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).to_string()
}
pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).to_string()
}

/// Evaluate a script in-process and return the value of its last statement as f64.
pub fn eval_f64(text: &str) -> f64 {
    let v = eval(text).unwrap_or_else(|e| panic!("script failed: {e}"));
    v.as_float().unwrap_or_else(|_| v.as_int().map(|i| i as f64).expect("a number"))
}

/// Evaluate a script in-process; the error as the user would see it.
pub fn eval(text: &str) -> Result<rhai::Dynamic, String> {
    let out = std::env::temp_dir();
    let sandbox = Sandbox::new(Path::new("."), &out, Path::new(".")).unwrap();
    let mut s = Session::new("test", sandbox);
    s.echo = false;
    let shared = Shared::new(s);
    let e = engine::build(&shared, engine::DEFAULT_MAX_OPS);
    engine::script::eval_source(&e, &shared, "test.rhai", text, engine::DEFAULT_MAX_OPS).map_err(|e| e.to_string())
}
