//! Fuzz target: one string fed to every command-line text parser (ratio, tolerance, and the
//! whole-number, ratio and length ranges). The checks live in `gearsieve_fuzz::check_text`.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    // Arguments reach the parsers as `&str`; lossy decoding keeps the non-UTF-8 inputs useful
    // instead of discarding them.
    gearsieve_fuzz::check_text(&String::from_utf8_lossy(data));
});
