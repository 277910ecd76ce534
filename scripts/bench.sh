#!/usr/bin/env bash
# Benchmark `lossledger audit` against its I/O floors on synthetic stations
# (examples/synth_station.rs). The floor program (examples/io_floor.rs) reads every cell with
# calamine and writes it back with rust_xlsxwriter in constant-memory sheets, timing its read and
# write phases apart:
#   input floor  = io_floor on the input workbook (the least any reader of the input costs);
#   output floor = io_floor on the audit's own output workbook (the least writing that many cells
#                  costs);
#   floor time   = input floor's read + output floor's write: what the audit cannot avoid.
#
# Usage: scripts/bench.sh [SIZES...]      (default: 2000 20000 60000 lines)
#        scripts/bench.sh review [STATIONS MIN_LINES MAX_LINES]   (default: 200 20 200)
#        scripts/bench.sh corpus      (peak memory of every bad-input case, bound 2 GB)
# Env:   RUNS=3 (alternating runs per size; the median is reported), BENCH_DIR=/tmp/lossledger-bench,
#        JOBS (review: stations at once, default every core)
#
# Prints wall time (median of RUNS), peak resident memory (largest of RUNS) for each program, the
# ratios audit/floor (time against the floor time, memory against the output floor's), and the
# growth of each cost between consecutive sizes relative to the growth in size (1.00 = linear).
# Needs GNU time at /usr/bin/time for peak memory.
set -euo pipefail

cd "$(dirname "$0")/.."
if [ "${1:-}" = review ]; then
    shift
    exec "$(dirname "$0")/bench_review.sh" "$@"
fi
if [ "${1:-}" = corpus ]; then
    exec "$(dirname "$0")/bench_corpus.sh"
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

# measure OUTFILE CMD... : runs CMD under GNU time, appends "seconds kilobytes" to OUTFILE; the
# command's stdout and stderr are left in $DIR/stdout.txt and $DIR/stderr.txt.
measure() {
    local out=$1
    shift
    /usr/bin/time -f "%e %M" -o "$DIR/time.txt" "$@" >"$DIR/stdout.txt" 2>"$DIR/stderr.txt" || {
        local rc=$?
        # audit exits 1 only with --fail-on; anything else is a failure
        echo "command failed ($rc): $*" >&2
        cat "$DIR/stderr.txt" >&2
        exit 1
    }
    tail -n 1 "$DIR/time.txt" >>"$out"
}

# phases OUTFILE: appends the floor's "read write" seconds (its stderr line) to OUTFILE.
phases() { sed -n 's/^read: \([0-9.]*\) s, write: \([0-9.]*\) s$/\1 \2/p' "$DIR/stderr.txt" >>"$1"; }

median() { sort -n | awk '{a[NR]=$1} END {print (NR%2 ? a[(NR+1)/2] : (a[NR/2]+a[NR/2+1])/2)}'; }
maxof() { sort -n | tail -n 1; }
col() { cut -d' ' -f"$1" "$2"; }

echo "machine: $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | xargs), $(nproc) cores, $(free -g | awk '/Mem:/ {print $2}') GB RAM; $(uname -sr)"
echo "runs per size: $RUNS (alternating input floor, audit, output floor); times are medians, memory the largest"
echo "columns: in read = input floor's read phase; out write = output floor's write phase;"
echo "         floor s = in read + out write; in/out MB = peak memory of the input/output floor runs"
echo
printf "%7s %7s %8s %9s | %7s %9s %7s %7s | %6s %6s %8s | %7s %7s\n" lines runs fittings "out cells" \
    "in read" "out write" "floor s" "audit s" "in MB" "out MB" "audit MB" "t ratio" "m ratio"

prev_lines="" prev_floor="" prev_audit=""
growth=()
for n in "${SIZES[@]}"; do
    in="$DIR/station-$n.xlsx"
    [ -f "$in" ] || "$SYNTH" "$n" "$in" >"$DIR/synth-$n.txt"
    read -r _ _ _ _ runs _ fittings _ < <(sed 's/,//g' "$DIR/synth-$n.txt")
    for f in in out audit in-phases out-phases; do : >"$DIR/$f-$n.txt"; done
    for _ in $(seq "$RUNS"); do
        rm -f "$DIR/floor-out.xlsx" "$DIR/audit-out.xlsx"
        measure "$DIR/in-$n.txt" "$FLOOR" "$in" "$DIR/floor-out.xlsx"
        phases "$DIR/in-phases-$n.txt"
        measure "$DIR/audit-$n.txt" "$BIN" audit "$in" -o "$DIR/audit-out.xlsx"
        rm -f "$DIR/floor-out.xlsx"
        measure "$DIR/out-$n.txt" "$FLOOR" "$DIR/audit-out.xlsx" "$DIR/floor-out.xlsx"
        phases "$DIR/out-phases-$n.txt"
        cells=$(awk '{print $2}' "$DIR/stdout.txt")
    done
    ir=$(col 1 "$DIR/in-phases-$n.txt" | median)
    ow=$(col 2 "$DIR/out-phases-$n.txt" | median)
    ft=$(echo "$ir + $ow" | bc -l)
    at=$(col 1 "$DIR/audit-$n.txt" | median)
    im=$(col 2 "$DIR/in-$n.txt" | maxof)
    om=$(col 2 "$DIR/out-$n.txt" | maxof)
    am=$(col 2 "$DIR/audit-$n.txt" | maxof)
    printf "%7s %7s %8s %9s | %7.2f %9.2f %7.2f %7.2f | %6.0f %6.0f %8.0f | %7.2f %7.2f\n" \
        "$n" "$runs" "$fittings" "$cells" "$ir" "$ow" "$ft" "$at" \
        "$(echo "$im/1024" | bc -l)" "$(echo "$om/1024" | bc -l)" "$(echo "$am/1024" | bc -l)" \
        "$(echo "$at/$ft" | bc -l)" "$(echo "$am/$om" | bc -l)"
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
echo "targets: t ratio (audit/floor) <= 1.5 at 20000 lines; m ratio (audit/output floor) <= 1.5; growth close to linear (1.00)"
