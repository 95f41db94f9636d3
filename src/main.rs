//! The `gearsieve` command: parse the command line, run the chosen job, print, exit.
//! All domain work is in the library; this edge only translates.

mod cli;

fn main() {
    std::process::exit(cli::run());
}
