#!/usr/bin/env bash
# Record what gearsieve prints for every command shown in README.md and docs/, and for each
# command in each output format on a fixed case, so that a change of structure can be checked
# to print the same bytes:
#
#   scripts/record-outputs.sh before/      # on the old code
#   scripts/record-outputs.sh after/       # on the new code
#   diff -r before/ after/
#
# Each case becomes one file holding the command, its standard output, its standard error and
# its exit status. Uses the release binary (built first).
set -euo pipefail
cd "$(dirname "$0")/.."

out=${1:?usage: scripts/record-outputs.sh DIR}
mkdir -p "$out"
cargo build --release --locked --quiet
bin=$PWD/target/release/gearsieve

n=0
record() {
    # $1: a name; the rest: a shell command line that starts with `gearsieve`
    local name=$1
    shift
    local line="$*"
    n=$((n + 1))
    local file
    file=$(printf '%s/%03d-%s.txt' "$out" "$n" "$name")
    {
        echo "\$ $line"
        set +e
        # The shown commands use the word gearsieve; run the binary just built.
        (eval "gearsieve() { \"$bin\" \"\$@\"; }; $line") >"$file.out" 2>"$file.err"
        local status=$?
        set -e
        echo "--- stdout"
        cat "$file.out"
        echo "--- stderr"
        cat "$file.err"
        echo "--- exit $status"
    } >"$file"
    rm -f "$file.out" "$file.err"
}

# Every command shown in the README and in docs/.
while IFS= read -r line; do
    record shown "${line#\$ }"
done < <(grep -h '^\$ gearsieve' README.md docs/*.md)

# Each command in each format on a fixed case.
formats=(table csv json markdown)
cases=(
    "search --ratio 127/60 --stock catalogs/lathe-change-gears.csv --stages 1..2 --limit 5"
    "search --ratio 12 --tol 1% --teeth 14..90 --module 1.5 --stages 2 --centre-distance 75 --limit 3 --explain"
    "search --ratio pi --tol 1e-3 --teeth 12..100 --stages 1..3 --pareto --limit 4"
    "mesh --teeth 17,53 --module 2 --centre-distance 71"
    "mesh --teeth 19,47 --module 2 --shift 0.2,-0.1 --backlash 0.08..0.2 --housing-tol 0.02"
    "thread --leadscrew 8tpi --pitch 1.25mm --stock catalogs/lathe-change-gears.csv --banjo catalogs/lathe/brackenfold.banjo --limit 3 --explain"
    "chart --series iso-coarse --leadscrew 8tpi --stock catalogs/lathe-change-gears.csv"
    "clock going --period 2 --escape-teeth 30 --pinions 8 --stages 2 --limit 3"
    "clock motion --limit 3"
    "clock astro --period synodic-month --tol 10ppm --limit 3"
    "reducer --ratio 20 --modules 1,1.5 --centre-distances 60,80 --input-rpm 1450 --limit 2"
    "reducer --ratio 20 --modules 1.5,2 --prefer split --shaft-diameter 20 --fold 60 --housing-tol 0.025 --limit 2"
)
for c in "${cases[@]}"; do
    for f in "${formats[@]}"; do
        record "format-$f" "gearsieve $c --format $f"
    done
done

echo "recorded $n cases in $out"
