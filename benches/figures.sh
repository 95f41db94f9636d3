#!/usr/bin/env bash
# Reproducible timing of the release binary: each case runs REPEAT times (default 3) one after
# the other in this one run; the table gives the median wall time, the peak resident memory
# (GNU time's maximum RSS) and the count of trains found, as Markdown rows for the README.
# Usage: benches/figures.sh [REPEAT]   (needs /usr/bin/time)
set -euo pipefail
cd "$(dirname "$0")/.."
REPEAT=${1:-3}
cargo build --release --quiet
BIN=${CARGO_TARGET_DIR:-target}/release/gearsieve

# One command timed REPEAT times: its label, the subcommand (words, unquoted), the JSON key that holds its count,
# then its arguments.
run_command() {
    local label=$1 command=$2 key=$3; shift 3
    local times=() rss=0 count=""
    for _ in $(seq "$REPEAT"); do
        local out
        out=$( { /usr/bin/time -f "TIME %e %M" "$BIN" $command --quiet --format json "$@" > /tmp/gearsieve-figures.json; } 2>&1 | grep '^TIME' || true)
        times+=("$(echo "$out" | awk '{print $2}')")
        local m; m=$(echo "$out" | awk '{print $3}')
        (( m > rss )) && rss=$m
        count=$(python3 -c "import json;print(json.load(open('/tmp/gearsieve-figures.json'))['$key'])")
    done
    local median; median=$(printf '%s\n' "${times[@]}" | sort -g | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}')
    printf '| %s | `%s` | %s s | %d MiB | %s |\n' "$label" "$*" "$median" $(( rss / 1024 )) "$count"
}
run_case() { local label=$1; shift; run_command "$label" search count "$@"; }

echo "| case | arguments | median wall | peak RSS | count |"
echo "|---|---|---|---|---|"
run_case "2 stages, 12..150, 0.1%" --ratio 37.5 --tol 0.1% --teeth 12..150 --stages 2
run_case "3 stages, 12..150, 10 ppm" --ratio 37.5 --tol 10ppm --teeth 12..150 --stages 3
run_case "3 stages, 12..150, 10 ppm, sieve engine" --ratio 37.5 --tol 10ppm --teeth 12..150 --stages 3 --engine sieve
run_case "4 stages, 12..150, 1 ppm" --ratio 29.530588 --tol 1ppm --teeth 12..150 --stages 4
run_case "4 stages, 12..200, 0.1 ppm" --ratio 29.530588 --tol 0.1ppm --teeth 12..200 --stages 4
run_case "5 stages, 12..60, 1 ppm" --ratio 29.530588 --tol 1ppm --teeth 12..60 --stages 5
# Five stages of 10..120 near 365.2422 at 1 ppm and six stages of 12..80 at 0.1 ppm, which the
# meet engine forecasts at about half an hour and about a day on two threads when every train is
# counted: the proven best 20 with a lower-bound count (the window engine).
run_case "5 stages, 10..120, 1 ppm, best 20, lower-bound count" --ratio 365.2422 --tol 1ppm --teeth 10..120 --stages 5 --count lower-bound
run_case "6 stages, 12..80, 0.1 ppm, best 20, lower-bound count" --ratio 29.530588 --tol 0.1ppm --teeth 12..80 --stages 6 --count lower-bound
run_case "exact 127/120, 1..4 stages, 12..200" --ratio 127/120 --teeth 12..200 --stages 1..4
run_case "exact 366/365, 1..4 stages, 12..200" --ratio 366/365 --teeth 12..200 --stages 1..4
run_case "exact 7/5, 4 stages, 12..48, sieve engine" --ratio 7/5 --teeth 12..48 --stages 4 --engine sieve
run_case "fast (factor) engine, same space" --ratio 7/5 --teeth 12..48 --stages 4
run_case "exhaustive engine, 2 stages, 12..240, 10 ppm" --ratio 7.3 --tol 10ppm --teeth 12..240 --stages 2 --engine exhaustive
run_case "fast engine, same space" --ratio 7.3 --tol 10ppm --teeth 12..240 --stages 2
for w in 40 80 140; do
    for n in 1 2 3 4; do
        run_case "scaling: $w tooth counts, $n stages, 1 ppm" --ratio 29.530588 --tol 1ppm --teeth 12..$((11 + w)) --stages $n
    done
done
for hi in 150 200 300 400; do
    run_case "scaling, exact 127/120: teeth 12..$hi, 4 stages" --ratio 127/120 --teeth 12..$hi --stages 4 --long
done
run_case "scaling, exact 127/120: teeth 12..160, 5 stages" --ratio 127/120 --teeth 12..160 --stages 5 --long

# `chart --buy`: the time of the whole command; the count is the choices that gain a thread.
run_chart_case() { local label=$1; shift; run_command "$label" chart choice_count "$@"; }
run_chart_case "chart --buy 2, metric coarse, demo lathe" --lathe catalogs/lathe/brackenfold.lathe --series iso-coarse --buy 2
run_chart_case "chart --buy 2, metric coarse, demo lathe without its 127, exact" --lathe catalogs/lathe/brackenfold.lathe --stock catalogs/lathe-change-gears-no127.csv --series iso-coarse --tol 0 --buy 2
# A trade's search on the bulk engines: the astronomical clock's moon-phase train.
run_command "clock astro, synodic month, 4 stages, 1 ppm (default teeth 8..150)" "clock astro" count --period synodic-month --tol 1ppm --stages 4
# A reducer in a fixed housing: stages that mesh in no place are left out before the search.
run_command "reducer, 3 stages, modules 1/1.5/2, housing 50/70/100 mm, 0.5%" reducer count --ratio 37.5 --modules 1,1.5,2 --stages 3 --centre-distances 50,70,100 --tol 0.5%
