//! The progress bar: drawn on stderr only when stderr is a terminal and `--quiet` is not given,
//! and only once a search has run for half a second, so quick searches print nothing extra.

use std::io::IsTerminal;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::{Duration, Instant};

use gearsieve::engine::Progress;
use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};

/// A bar that appears late and only on a terminal.
pub struct Bar {
    bar: Option<ProgressBar>,
    shown: AtomicBool,
    start: Instant,
}

impl Bar {
    /// A bar, or a silent stand-in when `quiet` or stderr is not a terminal.
    pub fn new(quiet: bool) -> Bar {
        let bar = (!quiet && std::io::stderr().is_terminal()).then(|| {
            let b = ProgressBar::with_draw_target(Some(1), ProgressDrawTarget::hidden());
            b.set_style(
                ProgressStyle::with_template(
                    "{spinner} searching [{bar:40}] {percent:>3}%  {elapsed} elapsed, ~{eta} left",
                )
                .unwrap_or_else(|_| ProgressStyle::default_bar())
                .progress_chars("=> "),
            );
            b
        });
        Bar { bar, shown: AtomicBool::new(false), start: Instant::now() }
    }

    /// Report progress (called from worker threads).
    pub fn update(&self, p: Progress) {
        let Some(bar) = &self.bar else { return };
        if !self.shown.load(Ordering::Relaxed)
            && self.start.elapsed() > Duration::from_millis(500)
            && !self.shown.swap(true, Ordering::SeqCst)
        {
            bar.set_draw_target(ProgressDrawTarget::stderr());
        }
        bar.set_length(p.total);
        bar.set_position(p.done);
    }

    /// Remove the bar before results are printed.
    pub fn finish(&self) {
        if let Some(bar) = &self.bar {
            bar.finish_and_clear();
        }
    }
}
