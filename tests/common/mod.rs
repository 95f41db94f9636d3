//! Helpers shared by the integration tests: run the real binary and capture what it prints.
#![allow(dead_code)]

use std::path::PathBuf;
use std::process::Command;

/// What one run of the binary printed and returned.
pub struct Run {
    pub code: i32,
    pub stdout: String,
    pub stderr: String,
}

/// Run `gearsieve` with `args` from the repository root.
pub fn gearsieve(args: &[&str]) -> Run {
    let out = Command::new(env!("CARGO_BIN_EXE_gearsieve"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("the binary runs");
    Run {
        code: out.status.code().unwrap_or(-1),
        stdout: String::from_utf8_lossy(&out.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&out.stderr).into_owned(),
    }
}

/// Run and parse standard output as JSON.
pub fn json(args: &[&str]) -> (i32, serde_json::Value) {
    let mut a = args.to_vec();
    a.extend(["--format", "json"]);
    let r = gearsieve(&a);
    let v = serde_json::from_str(&r.stdout)
        .unwrap_or_else(|e| panic!("not JSON ({e}): {}\n{}", r.stdout, r.stderr));
    (r.code, v)
}

/// Path of a fixture file.
pub fn fixture(name: &str) -> String {
    let p: PathBuf = [env!("CARGO_MANIFEST_DIR"), "tests", "fixtures", name].iter().collect();
    p.to_string_lossy().into_owned()
}

/// Write a temporary catalogue with `text` and return its directory guard and path.
pub fn temp_catalogue(name: &str, bytes: &[u8]) -> (tempfile::TempDir, String) {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join(name);
    std::fs::write(&path, bytes).expect("write");
    let s = path.to_string_lossy().into_owned();
    (dir, s)
}
