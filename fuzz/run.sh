#!/usr/bin/env bash
# Run the fuzz targets one after another (needs a nightly toolchain and cargo-fuzz):
#   cargo install cargo-fuzz
#   fuzz/run.sh [SECONDS_PER_TARGET]        (default 600)
# Corpora grow in fuzz/corpus/TARGET (seeded from fuzz/seeds/TARGET); crashes land in
# fuzz/artifacts/TARGET. Add each crash as a case in tests/bad_input.rs once fixed.
set -euo pipefail
cd "$(dirname "$0")"
SECS=${1:-600}
for t in cell_parser ingest_bytes station_cells describe_text list_sheet station_layout; do
    mkdir -p "corpus/$t"
    cargo +nightly fuzz run -s none "$t" "corpus/$t" "seeds/$t" -- -max_total_time="$SECS" -rss_limit_mb=4096 2>&1 | tail -n 20
done
