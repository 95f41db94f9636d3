//! Where results go: stdout, or `--output FILE` written to a temporary file in the same folder
//! and renamed into place only when complete, so a failed or interrupted run never leaves half
//! a file. A closed pipe (`gearsieve … | head`) ends the program quietly.

use std::io::{self, BufWriter, Write};
use std::path::{Path, PathBuf};

use anyhow::Context;

/// An open destination for results.
pub enum Sink {
    /// Standard output.
    Stdout(BufWriter<io::Stdout>),
    /// A temporary file beside `path`, renamed to it by [`Sink::commit`].
    File {
        /// The temporary file.
        tmp: BufWriter<tempfile::NamedTempFile>,
        /// Where it goes.
        path: PathBuf,
    },
}

fn file_context(path: &Path) -> String {
    format!("--output {}: cannot write the file", path.display())
}

impl Sink {
    /// Open stdout, or a temporary file beside `path`.
    pub fn open(path: Option<&Path>) -> anyhow::Result<Sink> {
        Ok(match path {
            None => Sink::Stdout(BufWriter::new(io::stdout())),
            Some(path) => {
                let dir = match path.parent() {
                    Some(d) if !d.as_os_str().is_empty() => d,
                    _ => Path::new("."),
                };
                if !dir.is_dir() {
                    anyhow::bail!(
                        "--output {}: there is no folder {}; create it first or give another path",
                        path.display(),
                        dir.display()
                    );
                }
                let tmp = tempfile::NamedTempFile::new_in(dir).with_context(|| file_context(path))?;
                Sink::File { tmp: BufWriter::new(tmp), path: path.to_path_buf() }
            }
        })
    }

    /// The writer to print into.
    pub fn writer(&mut self) -> &mut dyn Write {
        match self {
            Sink::Stdout(w) => w,
            Sink::File { tmp, .. } => tmp,
        }
    }

    /// Finish: flush stdout, or flush, sync and rename the file into place — under the name
    /// asked for when the run was `complete`, else under [`incomplete_name`] so that a file cut
    /// short by Ctrl-C can never pass for a whole result. Returns where the file went. Dropping
    /// a sink without committing deletes its temporary file.
    pub fn commit(self, complete: bool) -> io::Result<Option<PathBuf>> {
        match self {
            Sink::Stdout(mut w) => w.flush().map(|_| None),
            Sink::File { tmp, path } => {
                let path = if complete { path } else { incomplete_name(&path) };
                let tmp = tmp.into_inner().map_err(|e| e.into_error())?;
                // A temporary file is private to its owner; the result is an ordinary file.
                #[cfg(unix)]
                {
                    use std::os::unix::fs::PermissionsExt;
                    tmp.as_file().set_permissions(std::fs::Permissions::from_mode(0o644))?;
                }
                tmp.as_file().sync_all()?;
                tmp.persist(&path).map_err(|e| e.error)?;
                Ok(Some(path))
            }
        }
    }
}

/// Map a write failure: a closed stdout pipe is `Ok(false)` (stop quietly); anything else is an
/// error naming where the output was going.
pub fn quiet_broken_pipe(result: io::Result<()>, path: Option<&Path>) -> anyhow::Result<bool> {
    match result {
        Ok(()) => Ok(true),
        Err(e) if path.is_none() && e.kind() == io::ErrorKind::BrokenPipe => Ok(false),
        Err(e) => Err(e).with_context(|| match path {
            Some(p) => file_context(p),
            None => "cannot write to standard output".to_string(),
        }),
    }
}

/// Where the output of an interrupted run goes instead of `path`: `x.csv` → `x.incomplete.csv`
/// (`x` → `x.incomplete`).
pub fn incomplete_name(path: &Path) -> PathBuf {
    let stem = path.file_stem().map_or_else(|| "output".into(), |s| s.to_string_lossy().into_owned());
    let name = match path.extension() {
        Some(ext) => format!("{stem}.incomplete.{}", ext.to_string_lossy()),
        None => format!("{stem}.incomplete"),
    };
    path.with_file_name(name)
}

/// Write `bytes` to `path` atomically (under [`incomplete_name`] when the run was not
/// `complete`), or to stdout when `path` is `None`. Returns false when stdout was a closed pipe
/// (not an error).
pub fn emit(path: Option<&Path>, bytes: &[u8], complete: bool) -> anyhow::Result<bool> {
    let mut sink = Sink::open(path)?;
    let written = sink.writer().write_all(bytes).and_then(|_| sink.commit(complete));
    let kept = match written {
        Ok(kept) => kept,
        Err(e) => return quiet_broken_pipe(Err(e), path),
    };
    if let Some(kept) = kept.filter(|_| !complete) {
        say_kept(&kept);
    }
    Ok(true)
}

/// Tell where the output of a run cut short went.
pub fn say_kept(kept: &Path) {
    eprintln!("gearsieve: the run was cut short; what it found is in {}", kept.display());
}
