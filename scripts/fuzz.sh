#!/usr/bin/env bash
# Run each fuzz target for N seconds (default 60), one after the other, on one core.
#
#   scripts/fuzz.sh [SECONDS] [TARGET...]      targets: parsers catalogue (default: both)
#
# cargo-fuzz is installed from crates.io if missing. It passes nightly-only flags to rustc;
# RUSTC_BOOTSTRAP=1 lets the stable toolchain accept them. Inputs the fuzzer finds interesting
# grow fuzz/corpus/<target>/ (ignored by git except the seed-* files); a failing input is saved in
# fuzz/artifacts/<target>/ and should be copied to fuzz/regressions/<target>/ (see
# docs/fuzzing.md). Exits non-zero if any target failed.
set -uo pipefail
cd "$(dirname "$0")/.."

seconds="${1:-60}"
shift || true
targets=("$@")
if [ "${#targets[@]}" -eq 0 ]; then
    targets=(parsers catalogue)
fi
case "$seconds" in
    '' | *[!0-9]*)
        echo "fuzz.sh: SECONDS must be a whole number, found \"$seconds\"" >&2
        exit 2
        ;;
esac

if ! cargo fuzz --version >/dev/null 2>&1; then
    echo "== installing cargo-fuzz"
    cargo install cargo-fuzz --locked || exit 1
fi

export RUSTC_BOOTSTRAP=1
export CARGO_BUILD_JOBS="${CARGO_BUILD_JOBS:-1}"

failed=()
for target in "${targets[@]}"; do
    echo "== fuzzing $target for ${seconds}s"
    # No -jobs/-workers: libFuzzer then runs one process in the foreground (-jobs=1 would do the
    # same work but send its output to ./fuzz-0.log).
    if ! cargo fuzz run "$target" -- -max_total_time="$seconds" -print_final_stats=1; then
        failed+=("$target")
    fi
done

if [ "${#failed[@]}" -gt 0 ]; then
    echo "== failed: ${failed[*]} (inputs in fuzz/artifacts/)" >&2
    exit 1
fi
echo "== no failures"
