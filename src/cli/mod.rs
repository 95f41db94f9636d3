//! The command line: clap-derive structs mirroring the arguments, each subcommand in its own
//! file turning its arguments into a library problem (`TryFrom`) and a [`run::Job`], and the
//! shared edge work in one run-and-print path ([`run`]) — exit codes, the progress bar, Ctrl-C,
//! worker threads, formats, writing output safely.

mod args;
mod buy;
mod clock;
mod draw;
mod flags;
mod hints;
mod merge;
mod mesh;
mod output;
mod planetary;
mod progress;
mod reducer;
mod run;
mod search;
mod thread;

use std::sync::atomic::AtomicBool;

use clap::{Parser, Subcommand};

/// Exit status: a train (or the asked-for result) was found.
pub const EXIT_OK: i32 = 0;
/// Exit status: the input was fine but nothing met every constraint.
pub const EXIT_NOTHING_FOUND: i32 = 1;
/// Exit status: bad input (flags, files); the message names the place.
pub const EXIT_BAD_INPUT: i32 = 2;
/// Exit status: interrupted with Ctrl-C; what was found so far was printed.
pub const EXIT_INTERRUPTED: i32 = 130;

/// Set by Ctrl-C; the search stops at the next unit of work.
pub static CANCEL: AtomicBool = AtomicBool::new(false);

#[derive(Parser)]
#[command(
    name = "gearsieve",
    version,
    about = "Find gear trains: compound spur trains that hit a speed ratio from gears to be cut or on hand",
    long_about = "Find gear trains: compound spur trains that hit a speed ratio from gears to be cut \
                  or on hand.\n\nRatio convention (ISO 1122-1): i = input turns per output turn = \
                  product of driven teeth / product of driver teeth; a reducer's ratio is above 1."
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Search every multi-stage train for a ratio within a tolerance.
    Search(Box<search::SearchArgs>),
    /// Combine the JSON of the parts of a search split with --shard into the unsplit result.
    Merge(merge::MergeArgs),
    /// The full geometry of one spur pair, and whether it runs: the check before cutting.
    Mesh(Box<mesh::MeshArgs>),
    /// Change gears for a thread on a lathe: setups, pitch cut, lead error, banjo fit.
    Thread(Box<thread::ThreadArgs>),
    /// The best change-gear setup for every thread of a series: a chart for the machine.
    Chart(Box<thread::ChartArgs>),
    /// Clock trains: the going train, the motion work, astronomical trains.
    Clock(clock::ClockArgs),
    /// A spur reducer: a module per stage, balanced stages, hunting-tooth pairs, housing fit.
    Reducer(Box<reducer::ReducerArgs>),
    /// Draw a train to scale with true teeth, or write one gear's outline to cut (SVG, DXF).
    Draw(Box<draw::DrawArgs>),
    /// Planetary trains: sun, planets on a carrier, ring; coaxial, assembled, planets clear.
    ///
    /// By default a simple train with the ring held, the sun driving and the carrier driven:
    /// i = 1 + Zr/Zs (Willis' equation). Every design listed is coaxial (both meshes at the
    /// carrier's centre distance), can be assembled with its planets where they are listed, and
    /// its neighbouring planets clear each other. Ratio convention (ISO 1122-1): i = input turns
    /// per output turn; the output's direction is given beside it.
    ///
    /// gearsieve sizes geometry only: a planetary train that carries power needs a load-capacity
    /// rating (e.g. ISO 6336 or AGMA 2001), a check of load sharing between the planets and of
    /// the bearings, by a qualified person.
    Planetary(Box<planetary::PlanetaryArgs>),
}

/// Parse the command line, run, and return the exit status.
pub fn run() -> i32 {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            if let Some(line) = flags::bad_value(&e) {
                eprintln!("gearsieve: {line}");
                return EXIT_BAD_INPUT;
            }
            let code = if e.use_stderr() { EXIT_BAD_INPUT } else { EXIT_OK };
            let _ = e.print();
            return code;
        }
    };
    // A second Ctrl-C (or a failure to install the handler) falls back to the default: abort.
    let _ = ctrlc::set_handler(|| {
        if CANCEL.swap(true, std::sync::atomic::Ordering::SeqCst) {
            std::process::exit(EXIT_INTERRUPTED);
        }
    });
    let result = match cli.command {
        Command::Search(args) => search::run(*args),
        Command::Merge(args) => merge::run(args),
        Command::Mesh(args) => mesh::run(*args),
        Command::Thread(args) => thread::run_thread(*args),
        Command::Chart(args) => thread::run_chart(*args),
        Command::Clock(args) => clock::run(args),
        Command::Reducer(args) => reducer::run(*args),
        Command::Draw(args) => draw::run(*args),
        Command::Planetary(args) => planetary::run(*args),
    };
    match result {
        Ok(code) => code,
        Err(e) => {
            eprintln!("gearsieve: {}", flags::message(&e));
            EXIT_BAD_INPUT
        }
    }
}
