//! Where results go: stdout, or `--output FILE` written to a temporary file in the same folder
//! and renamed into place only when complete, so a failed or interrupted run never leaves half
//! a file. A closed pipe (`gearsieve … | head`) ends the program quietly.

use std::io::{self, Write};
use std::path::Path;

use anyhow::Context;

/// Write `bytes` to `path` atomically, or to stdout when `path` is `None`. Returns false when
/// stdout was a closed pipe (not an error).
pub fn emit(path: Option<&Path>, bytes: &[u8]) -> anyhow::Result<bool> {
    match path {
        None => {
            let mut out = io::stdout().lock();
            match out.write_all(bytes).and_then(|_| out.flush()) {
                Ok(()) => Ok(true),
                Err(e) if e.kind() == io::ErrorKind::BrokenPipe => Ok(false),
                Err(e) => Err(e).context("cannot write to standard output"),
            }
        }
        Some(path) => {
            let dir = match path.parent() {
                Some(d) if !d.as_os_str().is_empty() => d,
                _ => Path::new("."),
            };
            let ctx = || format!("--output {}: cannot write the file", path.display());
            let mut tmp = tempfile::NamedTempFile::new_in(dir).with_context(ctx)?;
            tmp.write_all(bytes).with_context(ctx)?;
            tmp.as_file().sync_all().with_context(ctx)?;
            tmp.persist(path).map_err(|e| e.error).with_context(ctx)?;
            Ok(true)
        }
    }
}
