//! The one run-and-print path every command takes: forecast, progress bar, worker threads,
//! Ctrl-C, render in the chosen format, write stdout or `--output` atomically, and the exit
//! status with its last word on stderr.

use std::borrow::Cow;
use std::path::PathBuf;
use std::time::Duration;

use gearsieve::engine::{estimate, EngineChoice, RunOptions, Shard};
use gearsieve::report::{render, Format, RenderError, Report};
use gearsieve::Problem;

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
            format: a.format().into(),
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

    /// The words for an interrupted run and for one that found nothing, built from what was
    /// asked and what was found.
    fn words(&self, found: &Self::Found) -> Words;

    /// What the forecast weighs before the run ([`forecast`]): the searches the job will make.
    /// `None` for work that is never long (a single mesh).
    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        Ok(None)
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

/// What a job will search, for the forecast: each problem with its engine, and how the user
/// could make the work smaller in this command's own flags.
pub struct Outlook<'a> {
    /// The searches, in the order they run.
    pub searches: Vec<(Cow<'a, Problem>, EngineChoice)>,
    /// `--long` was given: run whatever the forecast.
    pub long: bool,
    /// The part of a split search to run, which divides the work that can be split.
    pub shard: Option<Shard>,
    /// Changes that would shrink this search, each naming flags of this command ("fewer
    /// --stages"); only those that apply to what was asked.
    pub narrow: Vec<String>,
    /// Whether `--shard` can split this command's search.
    pub can_shard: bool,
    /// Whether `--count lower-bound` would spare this search counting every train.
    pub can_count_less: bool,
}

/// Forecast searches longer than this (wall seconds) are refused without `--long`.
const REFUSE_ABOVE_S: f64 = 3600.0;
/// Forecast searches longer than this get a note on stderr before they start.
const NOTE_ABOVE_S: f64 = 30.0;
/// Time spent forecasting, at most, shared between a job's searches.
const FORECAST_BUDGET: Duration = Duration::from_secs(1);

/// Before a big job: forecast its time from a short sample of each search, say so when it is
/// long, and refuse one that would plainly run for hours unless `--long` is given. The one
/// forecast every command that can run long goes through.
pub fn forecast(outlook: Option<Outlook<'_>>, print: &Print) -> anyhow::Result<()> {
    let Some(o) = outlook else { return Ok(()) };
    if o.searches.is_empty() {
        return Ok(());
    }
    let budget = FORECAST_BUDGET / o.searches.len() as u32;
    let (mut one_thread, mut split, mut combinations, mut at_least, mut shardable) =
        (0.0, 0.0, 0.0, false, true);
    let mut timed = false;
    for (problem, engine) in &o.searches {
        let e = estimate(problem, *engine, budget);
        combinations += e.combinations;
        let Some(seconds) = e.seconds_one_thread else { continue };
        timed = true;
        at_least |= e.at_least;
        shardable &= e.shardable;
        if e.shardable {
            split += seconds;
        } else {
            one_thread += seconds;
        }
    }
    if !timed {
        return Ok(());
    }
    let threads = print.threads.unwrap_or_else(rayon::current_num_threads).max(1);
    let parts = o.shard.map_or(1.0, |s| s.count as f64);
    let wall = (one_thread + split / parts) / threads as f64;
    let what = format!(
        "{} {} on {threads} thread{} ({combinations:.1e} stage combinations before pruning)",
        if at_least { "at least" } else { "about" },
        human_duration(wall),
        if threads == 1 { "" } else { "s" },
    );
    if wall > REFUSE_ABOVE_S && !o.long {
        let mut ways = Vec::new();
        if o.can_count_less {
            ways.push(
                "list the proven best without counting every train with --count lower-bound".to_string(),
            );
        }
        if !o.narrow.is_empty() {
            ways.push(format!("narrow it ({})", o.narrow.join(", ")));
        }
        if o.can_shard && shardable {
            ways.push("split it with --shard I/N".to_string());
        }
        ways.push("give --long to run it anyway".to_string());
        // The remedy names --long; the message is about the search, so it leads with that.
        return Err(anyhow::anyhow!("this search would take {what}; {}", either(&ways)));
    }
    if print.quiet {
        return Ok(());
    }
    let stop = "Ctrl-C stops it and prints the best so far";
    if let Some(s) = o.shard {
        // A scheduler's log shows what each part will take, so the parts can be sized.
        let whole = (one_thread + split) / threads as f64;
        eprintln!(
            "gearsieve: part {s}: {}{} on {threads} thread{}; the whole search {} on one machine{}{}",
            if wall < 1.0 {
                ""
            } else if at_least {
                "at least "
            } else {
                "about "
            },
            human_duration(wall),
            if threads == 1 { "" } else { "s" },
            human_duration(whole),
            if one_thread > 0.0 { " (some of the work cannot be split, and every part does it)" } else { "" },
            if wall > NOTE_ABOVE_S { format!("; {stop}") } else { String::new() },
        );
    } else if wall > NOTE_ABOVE_S {
        eprintln!("gearsieve: this search will take {what}; {stop}");
    }
    Ok(())
}

/// `a`, `a or b`, `a, b or c`: choices in words.
pub fn either(items: &[String]) -> String {
    match items {
        [] => String::new(),
        [one] => one.clone(),
        [rest @ .., last] => format!("{}, or {last}", rest.join(", ")),
    }
}

/// `under 1 s`, `45 s`, `12 min`, `3.2 hours`.
fn human_duration(s: f64) -> String {
    if s < 1.0 {
        "under 1 s".to_string()
    } else if s < 90.0 {
        format!("{s:.0} s")
    } else if s < 5400.0 {
        format!("{:.0} min", s / 60.0)
    } else {
        format!("{:.1} hours", s / 3600.0)
    }
}

/// Run `job` and print what it found: the path every command takes.
pub fn run<J: Job>(job: &J, print: &Print) -> anyhow::Result<i32> {
    forecast(job.forecast()?, print)?;
    let bar = Bar::new(print.quiet || !job.shows_progress());
    let progress = |p| bar.update(p);
    let options = RunOptions {
        progress: Some(&progress),
        cancel: Some(&CANCEL),
        shard: job.shard(),
        list_arrangements: false,
    };
    let found = with_threads(print.threads, || job.search(&options))??;
    bar.finish();
    let report = job.report(&found);
    match job.shard() {
        // A part that holds no train is a result like any other: a scheduler must not take it
        // for a failure, and the hint to relax the search would mislead.
        Some(s) => {
            let words = Words {
                nothing: Some(format!(
                    "part {s} holds no train; the other parts may (combine the parts' JSON with gearsieve merge)"
                )),
                ..job.words(&found)
            };
            let code = present(report.as_ref(), print, &words)?;
            Ok(if code == EXIT_NOTHING_FOUND { EXIT_OK } else { code })
        }
        None => present(report.as_ref(), print, &job.words(&found)),
    }
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
