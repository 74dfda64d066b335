#!/usr/bin/env bash
# Runs two seistriage binaries on the same inputs and compares their outputs: the JSON, the
# Priority CSV, the GeoJSON and `explain` of every demo building byte for byte, the workbooks cell by cell (their packages
# differ by the timestamp, and the Summary's "Screened on" cell is left out). Inputs: the committed demo, and a generated stock of N rows
# (seed 7; the generated rows carry no hazard, so the demo settings give agr_g).
#
#     scripts/byte-identity.sh OLD_BINARY NEW_BINARY WORK_DIR [N=10000]
#
# Needs the `dump_workbook` example built (cargo build --release --example dump_workbook).
set -euo pipefail
old=$1 new=$2 work=$3 n=${4:-10000}
root=$(cd "$(dirname "$0")/.." && pwd)
dump=$root/target/release/examples/dump_workbook
inv=$root/inventories
mkdir -p "$work"
[ -f "$work/stock.xlsx" ] || "$old" generate --buildings "$n" --out "$work/stock.xlsx" --seed 7
[ -f "$work/stock.csv" ] || "$old" generate --buildings "$n" --out "$work/stock.csv" --seed 7
status=0
for side in old new; do
  bin=${!side}
  for case in demo stock; do
    out=$work/$side/$case; mkdir -p "$out"
    src=$inv/demo.xlsx; [ $case = stock ] && src=$work/stock.xlsx
    "$bin" screen "$src" --settings "$inv/demo-settings.toml" \
      --districts "$inv/demo-districts.geojson" --faults "$inv/demo-faults.geojson" \
      --out "$out/screening.xlsx" --json "$out/results.json" --csv "$out/priority.csv" \
      --geojson "$out/buildings.geojson" --quiet
    "$dump" "$out/screening.xlsx" | grep -v "^Screened on" > "$out/screening.tsv"
  done
  # The streaming path (forced from 1,000 rows) on the same stock as CSV: its per-row
  # tables are CSV files beside the workbook.
  # (The streaming path refuses --samples: the demo settings' samples are left out.)
  out=$work/$side/stream; mkdir -p "$out"
  grep -v '^samples *=' "$inv/demo-settings.toml" > "$work/stream-settings.toml"
  SEISTRIAGE_STREAM_FROM=1000 "$bin" screen "$work/stock.csv" --settings "$work/stream-settings.toml" \
    --districts "$inv/demo-districts.geojson" --faults "$inv/demo-faults.geojson" \
    --out "$out/screening.xlsx" --json "$out/results.json" --csv "$out/priority.csv" \
    --geojson "$out/buildings.geojson" --quiet
  "$dump" "$out/screening.xlsx" | grep -v "^Screened on" > "$out/screening.tsv"
  # `explain` of every demo building (rank order), one file.
  out=$work/$side/demo
  : > "$out/explain.txt"
  for id in $(tail -n +2 "$out/priority.csv" | cut -d, -f2); do
    "$bin" explain "$inv/demo.xlsx" "$id" --settings "$inv/demo-settings.toml" \
      --districts "$inv/demo-districts.geojson" --faults "$inv/demo-faults.geojson" >> "$out/explain.txt"
  done
done
for case in demo stock stream; do
  files="results.json priority.csv buildings.geojson screening.tsv"
  [ $case = demo ] && files="$files explain.txt"
  [ $case = stream ] && files="$files $(cd "$work/old/stream" && ls screening.*.csv)"
  for f in $files; do
    if cmp -s "$work/old/$case/$f" "$work/new/$case/$f"; then
      echo "same      $case/$f"
    else
      echo "DIFFERENT $case/$f ($(diff "$work/old/$case/$f" "$work/new/$case/$f" | grep -c '^[<>]') lines)"
      status=1
    fi
  done
done
exit $status
