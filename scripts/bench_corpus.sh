#!/usr/bin/env bash
# Peak memory of the audit of every workbook in the bad-input corpus (tests/bad_input.rs), with the
# release binary: the corpus is written by the test run (LOSSLEDGER_CORPUS_DIR), then each case is
# audited under GNU time with its own arguments. Run as `scripts/bench.sh corpus`.
#
# Prints the ten largest peaks, the largest, and whether every case stays under the 2 GB bound
# of docs/reliability.md.
# Env: BENCH_DIR=/tmp/lossledger-bench. Needs GNU time at /usr/bin/time.
set -euo pipefail

cd "$(dirname "$0")/.."
DIR=${BENCH_DIR:-/tmp/lossledger-bench}/corpus
BOUND_KB=$((2 * 1024 * 1024))
rm -rf "$DIR"
mkdir -p "$DIR/cases"

if [ ! -x /usr/bin/time ]; then
    echo "bench needs GNU time at /usr/bin/time (apt-get install time)" >&2
    exit 2
fi

cargo build --release --quiet --bin lossledger
BIN=$PWD/target/release/lossledger
LOSSLEDGER_CORPUS_DIR="$DIR/cases" cargo test --quiet --test bad_input >/dev/null

: >"$DIR/peaks.txt"
for case in "$DIR"/cases/*/; do
    name=$(basename "$case")
    input=$(find "$case" -maxdepth 1 -type f ! -name args | head -n 1)
    mapfile -t args <"$case/args"
    rm -rf "$DIR/out" && mkdir -p "$DIR/out"
    # Refused cases exit 2 by design; only the peak matters here.
    /usr/bin/time -f "%M %e" -o "$DIR/time.txt" "$BIN" audit "$input" -o "$DIR/out/out.xlsx" \
        --json "$DIR/out/out.json" "${args[@]}" >/dev/null 2>&1 || true
    read -r kb secs <"$DIR/time.txt"
    echo "$kb $secs $name" >>"$DIR/peaks.txt"
done

cases=$(wc -l <"$DIR/peaks.txt")
echo "machine: $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | xargs), $(nproc) cores; $(uname -sr)"
echo "bad-input corpus: $cases cases audited with the release binary; the ten largest peaks:"
printf "%10s %8s  %s\n" "peak MB" "wall s" case
sort -n -r "$DIR/peaks.txt" | head -n 10 | awk '{printf "%10.1f %8.2f  %s\n", $1 / 1024, $2, $3}'
read -r max _ name < <(sort -n -r "$DIR/peaks.txt" | head -n 1)
if [ "$max" -lt "$BOUND_KB" ]; then
    echo "largest: $((max / 1024)) MB ($name): every case under 2 GB"
else
    echo "largest: $((max / 1024)) MB ($name): OVER the 2 GB bound" >&2
    exit 1
fi
