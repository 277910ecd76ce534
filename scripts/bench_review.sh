#!/usr/bin/env bash
# Benchmark `lossledger review` on an invented estate (examples/make_estate.rs): wall time against
# the sum of the stations' single audits divided by the cores used, and peak resident memory
# against the largest single audit's (target: within 1.5x of it). Run as `scripts/bench.sh review`.
#
# Usage: scripts/bench_review.sh [STATIONS MIN_LINES MAX_LINES]   (default: 200 20 200)
# Env:   BENCH_DIR=/tmp/lossledger-bench, JOBS (default: every core). Needs GNU time at /usr/bin/time.
set -euo pipefail

cd "$(dirname "$0")/.."
STATIONS=${1:-200}
MIN=${2:-20}
MAX=${3:-200}
JOBS=${JOBS:-$(nproc)}
DIR=${BENCH_DIR:-/tmp/lossledger-bench}/estate-$STATIONS-$MIN-$MAX
mkdir -p "$DIR"

if [ ! -x /usr/bin/time ]; then
    echo "bench needs GNU time at /usr/bin/time (apt-get install time)" >&2
    exit 2
fi

cargo build --release --quiet --bin lossledger --example make_estate
BIN=$PWD/target/release/lossledger
[ -f "$DIR/estate/station-001.xlsx" ] || target/release/examples/make_estate "$STATIONS" "$MIN" "$MAX" "$DIR/estate" >"$DIR/make.txt"
cat "$DIR/make.txt" 2>/dev/null || true

echo "machine: $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | xargs), $(nproc) cores; $(uname -sr)"

# Single audits, one after another: wall time and peak memory of each.
: >"$DIR/single.txt"
for f in "$DIR"/estate/station-*.xlsx; do
    /usr/bin/time -f "%e %M $(basename "$f")" -a -o "$DIR/single.txt" \
        "$BIN" audit "$f" -o "$DIR/single-out.xlsx" >/dev/null
done
sum=$(awk '{s += $1} END {printf "%.2f", s}' "$DIR/single.txt")
read -r largest_s largest_kb largest_name < <(sort -k2 -n "$DIR/single.txt" | tail -n 1)

# The review, at JOBS and at 1 job.
review() {
    rm -rf "$DIR/out"
    /usr/bin/time -v -o "$DIR/review-time.txt" "$BIN" review "$DIR/estate" -o "$DIR/out/review.xlsx" \
        --jobs "$1" >/dev/null 2>"$DIR/review-stderr.txt" || { cat "$DIR/review-stderr.txt" >&2; exit 1; }
    wall=$(awk -F': ' '/Elapsed \(wall clock\)/ {n = split($2, t, ":"); s = 0; for (i = 1; i <= n; i++) s = s * 60 + t[i]; print s}' "$DIR/review-time.txt")
    peak=$(awk -F': ' '/Maximum resident set size/ {print $2}' "$DIR/review-time.txt")
    echo "$wall $peak"
}
read -r wall_j peak_j < <(review "$JOBS")
read -r wall_1 peak_1 < <(review 1)

echo
echo "single audits: $STATIONS stations, sum of wall times ${sum} s; largest peak memory $((largest_kb / 1024)) MB ($largest_name, ${largest_s} s)"
printf "review --jobs %s: %.2f s wall (sum of single audits / %s cores = %.2f s: ratio %.2f); peak %d MB (%.2f x the largest single audit)\n" \
    "$JOBS" "$wall_j" "$JOBS" "$(echo "$sum/$JOBS" | bc -l)" "$(echo "$wall_j/($sum/$JOBS)" | bc -l)" \
    $((peak_j / 1024)) "$(echo "$peak_j/$largest_kb" | bc -l)"
printf "review --jobs 1: %.2f s wall (ratio to the sum %.2f); peak %d MB (%.2f x)\n" \
    "$wall_1" "$(echo "$wall_1/$sum" | bc -l)" $((peak_1 / 1024)) "$(echo "$peak_1/$largest_kb" | bc -l)"
echo "target: peak memory within 1.5 x the largest single audit's"
