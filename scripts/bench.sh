#!/usr/bin/env bash
# Benchmark `lossledger audit` against the I/O floor (read every cell with calamine, write it back
# with rust_xlsxwriter: examples/io_floor.rs) on synthetic stations (examples/synth_station.rs).
#
# Usage: scripts/bench.sh [SIZES...]      (default: 2000 20000 60000 lines)
#        scripts/bench.sh review [STATIONS MIN_LINES MAX_LINES]   (default: 200 20 200)
# Env:   RUNS=3 (alternating runs per size; the median is reported), BENCH_DIR=/tmp/lossledger-bench,
#        JOBS (review: stations at once, default every core)
#
# Prints wall time (median of RUNS), peak resident memory (largest of RUNS) for each program, the
# ratios audit/floor, and the growth of each cost between consecutive sizes relative to the growth
# in size (1.00 = linear). Needs GNU time at /usr/bin/time for peak memory.
set -euo pipefail

cd "$(dirname "$0")/.."
if [ "${1:-}" = review ]; then
    shift
    exec "$(dirname "$0")/bench_review.sh" "$@"
fi
SIZES=("${@:-2000 20000 60000}")
# shellcheck disable=SC2206
SIZES=(${SIZES[*]})
RUNS=${RUNS:-3}
DIR=${BENCH_DIR:-/tmp/lossledger-bench}
mkdir -p "$DIR"

if [ ! -x /usr/bin/time ]; then
    echo "bench.sh needs GNU time at /usr/bin/time (apt-get install time)" >&2
    exit 2
fi

cargo build --release --quiet --bin lossledger --example synth_station --example io_floor
BIN=target/release/lossledger
SYNTH=target/release/examples/synth_station
FLOOR=target/release/examples/io_floor

# measure OUTFILE CMD... : runs CMD under GNU time, appends "seconds kilobytes" to OUTFILE.
measure() {
    local out=$1
    shift
    /usr/bin/time -f "%e %M" -o "$DIR/time.txt" "$@" >/dev/null 2>"$DIR/stderr.txt" || {
        local rc=$?
        # audit exits 1 only with --fail-on; anything else is a failure
        echo "command failed ($rc): $*" >&2
        cat "$DIR/stderr.txt" >&2
        exit 1
    }
    tail -n 1 "$DIR/time.txt" >>"$out"
}

median() { sort -n | awk '{a[NR]=$1} END {print (NR%2 ? a[(NR+1)/2] : (a[NR/2]+a[NR/2+1])/2)}'; }
maxof() { sort -n | tail -n 1; }

echo "machine: $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | xargs), $(nproc) cores, $(free -g | awk '/Mem:/ {print $2}') GB RAM; $(uname -sr)"
echo "runs per size: $RUNS (alternating floor, audit); times are medians, memory the largest"
echo
printf "%8s %9s %10s | %9s %9s | %9s %9s | %7s %7s\n" lines runs fittings "floor s" "audit s" "floor MB" "audit MB" "t ratio" "m ratio"

prev_lines="" prev_floor="" prev_audit=""
growth=()
for n in "${SIZES[@]}"; do
    in="$DIR/station-$n.xlsx"
    [ -f "$in" ] || "$SYNTH" "$n" "$in" >"$DIR/synth-$n.txt"
    read -r _ _ _ _ runs _ fittings _ < <(sed 's/,//g' "$DIR/synth-$n.txt")
    : >"$DIR/floor-$n.txt"
    : >"$DIR/audit-$n.txt"
    for _ in $(seq "$RUNS"); do
        rm -f "$DIR/floor-out.xlsx" "$DIR/audit-out.xlsx"
        measure "$DIR/floor-$n.txt" "$FLOOR" "$in" "$DIR/floor-out.xlsx"
        measure "$DIR/audit-$n.txt" "$BIN" audit "$in" -o "$DIR/audit-out.xlsx"
    done
    ft=$(cut -d' ' -f1 "$DIR/floor-$n.txt" | median)
    at=$(cut -d' ' -f1 "$DIR/audit-$n.txt" | median)
    fm=$(cut -d' ' -f2 "$DIR/floor-$n.txt" | maxof)
    am=$(cut -d' ' -f2 "$DIR/audit-$n.txt" | maxof)
    printf "%8s %9s %10s | %9.2f %9.2f | %9.0f %9.0f | %7.2f %7.2f\n" "$n" "$runs" "$fittings" "$ft" "$at" \
        "$(echo "$fm/1024" | bc -l)" "$(echo "$am/1024" | bc -l)" "$(echo "$at/$ft" | bc -l)" "$(echo "$am/$fm" | bc -l)"
    if [ -n "$prev_lines" ]; then
        size=$(echo "$n/$prev_lines" | bc -l)
        growth+=("$(printf "%s→%s lines (×%.1f): floor time ×%.2f (%.2f of linear), audit time ×%.2f (%.2f of linear)" \
            "$prev_lines" "$n" "$size" "$(echo "$ft/$prev_floor" | bc -l)" "$(echo "$ft/$prev_floor/$size" | bc -l)" \
            "$(echo "$at/$prev_audit" | bc -l)" "$(echo "$at/$prev_audit/$size" | bc -l)")")
    fi
    prev_lines=$n prev_floor=$ft prev_audit=$at
done
echo
for g in "${growth[@]}"; do echo "$g"; done
echo
echo "targets: t ratio (audit/floor) <= 1.5 at 20000 lines; m ratio <= 2; growth close to linear (1.00)"
