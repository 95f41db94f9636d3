//! The one run-and-print path every command takes: forecast, progress bar, worker threads,
//! Ctrl-C, render in the chosen format, write stdout or `--output` atomically, and the exit
//! status with its last word on stderr.

use std::path::PathBuf;

use gearsieve::engine::{RunOptions, Shard};
use gearsieve::report::{render, Format, RenderError, Report};

use super::args::PrintArgs;
use super::progress::Bar;
use super::{output, CANCEL, EXIT_INTERRUPTED, EXIT_NOTHING_FOUND, EXIT_OK};

/// How and where results are printed.
#[derive(Debug, Clone)]
pub struct Print {
    /// The format.
    pub format: Format,
    /// `--output FILE`, or standard output.
    pub output: Option<PathBuf>,
    /// Worker threads (all cores when `None`).
    pub threads: Option<usize>,
    /// No progress bar.
    pub quiet: bool,
}

impl From<&PrintArgs> for Print {
    fn from(a: &PrintArgs) -> Print {
        Print {
            format: a.format.into(),
            output: a.output.clone(),
            threads: a.threads.map(usize::from),
            quiet: a.quiet,
        }
    }
}

/// What a command says on stderr when its run ends without a full answer.
pub struct Words {
    /// After "gearsieve: interrupted; "; `None` to say nothing.
    pub interrupted: Option<String>,
    /// After "gearsieve: " when nothing was found; `None` to say nothing (the result itself
    /// says it, as a mesh check's verdict does).
    pub nothing: Option<String>,
}

/// One command's work: search (or compute) with the library, then present what was found.
pub trait Job: Sync {
    /// What the search finds.
    type Found: Send;

    /// Run the search. Called inside the worker pool.
    fn search(&self, options: &RunOptions) -> anyhow::Result<Self::Found>;

    /// Present what was found.
    fn report<'a>(&'a self, found: &'a Self::Found) -> Box<dyn Report + 'a>;

    /// The words for an interrupted run and for one that found nothing.
    fn words(&self) -> Words;

    /// What to say when nothing was found, worked out from what the search found (which
    /// changes would help); `None` keeps the words of [`Job::words`].
    fn nothing_found(&self, _found: &Self::Found) -> Option<String> {
        None
    }

    /// Before a big search: say how long it will take, or refuse one of hours.
    fn forecast(&self, _print: &Print) -> anyhow::Result<()> {
        Ok(())
    }

    /// The part of a split search to run.
    fn shard(&self) -> Option<Shard> {
        None
    }

    /// Whether the search reports progress worth a bar.
    fn shows_progress(&self) -> bool {
        true
    }
}

/// Build a rayon pool of `threads` threads (all cores when `None`) and run `f` in it.
pub fn with_threads<T: Send>(threads: Option<usize>, f: impl FnOnce() -> T + Send) -> anyhow::Result<T> {
    let mut b = rayon::ThreadPoolBuilder::new();
    if let Some(n) = threads {
        b = b.num_threads(n);
    }
    let pool = b.build().map_err(|e| anyhow::anyhow!("--threads: cannot start worker threads: {e}"))?;
    Ok(pool.install(f))
}

/// Run `job` and print what it found: the path every command takes.
pub fn run<J: Job>(job: &J, print: &Print) -> anyhow::Result<i32> {
    job.forecast(print)?;
    let bar = Bar::new(print.quiet || !job.shows_progress());
    let progress = |p| bar.update(p);
    let options = RunOptions { progress: Some(&progress), cancel: Some(&CANCEL), shard: job.shard() };
    let found = with_threads(print.threads, || job.search(&options))??;
    bar.finish();
    let report = job.report(&found);
    let mut words = job.words();
    if !report.completion().found {
        if let Some(hint) = job.nothing_found(&found) {
            words.nothing = Some(hint);
        }
    }
    present(report.as_ref(), print, &words)
}

/// Render `report`, write it, and choose the exit status.
pub fn present(report: &dyn Report, print: &Print, words: &Words) -> anyhow::Result<i32> {
    let mut buf = Vec::new();
    match render(report, print.format, &mut buf) {
        Ok(()) => {}
        Err(e @ RenderError::NotOffered { .. }) => return Err(anyhow::anyhow!("--format: {e}")),
        Err(RenderError::Io(e)) => return Err(e.into()),
    }
    let c = report.completion();
    if !output::emit(print.output.as_deref(), &buf, c.complete)? {
        return Ok(EXIT_OK);
    }
    Ok(status(c.complete, c.found, words))
}

/// The exit status of a run that ended so, with its message on stderr.
pub fn status(complete: bool, found: bool, words: &Words) -> i32 {
    if !complete {
        if let Some(interrupted) = &words.interrupted {
            eprintln!("gearsieve: interrupted; {interrupted}");
        }
        EXIT_INTERRUPTED
    } else if !found {
        if let Some(nothing) = &words.nothing {
            eprintln!("gearsieve: {nothing}");
        }
        EXIT_NOTHING_FOUND
    } else {
        EXIT_OK
    }
}
