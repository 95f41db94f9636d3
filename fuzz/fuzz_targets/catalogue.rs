//! Fuzz target: arbitrary bytes read as a stock catalogue, then merged into a pool. The checks
//! live in `gearsieve_fuzz::check_catalogue`.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    gearsieve_fuzz::check_catalogue(data);
});
