#!/usr/bin/env bash
# Check that a real spreadsheet application opens the annotated workbook.
#
# Installs LibreOffice Calc (headless) and poppler-utils from the distribution's packages when they
# are missing, writes the demo, converts its annotated workbook headless to PDF and to one CSV per
# sheet, checks that the conversion succeeded with the expected sheets and a known value, and
# renders the first PDF page to PNG for a person to look at.
#
# Usage: scripts/libreoffice_check.sh [OUT_DIR]     (default /tmp/lossledger-libreoffice)
# Exit:  0 all checks passed; 1 a check failed; 2 LibreOffice could not be installed or run.
set -euo pipefail

cd "$(dirname "$0")/.."
OUT=${1:-/tmp/lossledger-libreoffice}
rm -rf "$OUT"
mkdir -p "$OUT"

if ! command -v soffice >/dev/null || ! command -v pdftoppm >/dev/null; then
    if [ "$(id -u)" -ne 0 ]; then SUDO=sudo; else SUDO=; fi
    $SUDO apt-get update -qq
    DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends \
        libreoffice-calc-nogui poppler-utils >/dev/null ||
        DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq libreoffice-calc poppler-utils >/dev/null ||
        { echo "could not install LibreOffice" >&2; exit 2; }
fi
soffice --version

cargo run --quiet --release -- demo --dir "$OUT/demo" >/dev/null
BOOK="$OUT/demo/kestrel-ridge.audit.xlsx"
test -s "$BOOK"

# A private profile so a user's LibreOffice settings (or a running instance) do not interfere.
PROFILE="file://$OUT/profile"
lo() { timeout 300 soffice -env:UserInstallation="$PROFILE" --headless --norestore "$@"; }

fail=0
check() { if eval "$2"; then echo "ok: $1"; else echo "FAILED: $1"; fail=1; fi; }

lo --convert-to pdf --outdir "$OUT" "$BOOK" >"$OUT/pdf.log" 2>&1 || true
PDF="$OUT/kestrel-ridge.audit.pdf"
check "PDF written" '[ -s "$PDF" ]'

# One CSV per sheet: filter options 44 (comma), 34 (quote), 76 (UTF-8), 1 (first line), , , , , ,
# , , -1 (all sheets, LibreOffice 7.2 and later; files are named NAME-SHEET.csv).
lo --convert-to 'csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1' \
    --outdir "$OUT" "$BOOK" >"$OUT/csv.log" 2>&1 || true
ls "$OUT"/*.csv >"$OUT/csv-files.txt" 2>/dev/null || true
for sheet in Summary Findings Lines Pipes Fittings Basis; do
    check "sheet $sheet converted" '[ -s "$OUT/kestrel-ridge.audit-$sheet.csv" ]'
done
# Known values: the demo's first pipe run is line KR-S1, 8.5 m of DN200; the fitting schedule
# carries the datasheet K of 22 on KR-D1-CV; the summary names the line and the input file.
check "Pipes keeps KR-S1, 8.5 m" 'grep -q "^\"\?KR-S1\"\?,1,\"\?DN200\"\?,\"\?40\"\?,\"\?carbon steel\"\?,8.5" "$OUT/kestrel-ridge.audit-Pipes.csv"'
check "Fittings keeps KR-D1-CV with K 22" 'grep -q "KR-D1-CV.*,22," "$OUT/kestrel-ridge.audit-Fittings.csv"'
check "Summary lists KR-M1" 'grep -q "KR-M1" "$OUT/kestrel-ridge.audit-Summary.csv"'
check "formula result kept (=2*18.5 shows 37)" 'grep -q "^\"\?KR-D1\"\?,2,.*,37," "$OUT/kestrel-ridge.audit-Pipes.csv"'

if [ -s "$PDF" ]; then
    pdftoppm -png -r 80 -f 1 -l 1 "$PDF" "$OUT/first-page"
    PNG=$(ls "$OUT"/first-page*.png | head -n 1)
    check "first page rendered to PNG" '[ -s "$PNG" ]'
    echo "PDF pages: $(pdfinfo "$PDF" | awk '/^Pages:/ {print $2}')"
    echo "look at: $PNG"
fi
exit $fail
