#!/bin/sh
# Time `syz import` on an invented table of ROWS rows (default 100000): bench/import.sh [ROWS]
# Builds the release binary, writes the table and its mapping to a temporary folder, imports
# it, and checks a sample of the files written. Figures: docs/performance.md.
set -eu
rows=${1:-100000}
here=$(cd "$(dirname "$0")/.." && pwd)
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cargo build --release --quiet -p syzygy-cli --manifest-path "$here/Cargo.toml"
syz="$here/target/release/syz"
python3 "$here/bench/generate_table.py" "$rows" "$work"
echo "table: $(wc -c < "$work/table.csv") bytes, $rows rows"
/usr/bin/time -f "import: %e s wall, %M KiB peak resident" "$syz" import "$work/table.csv" --mapping "$work/table.toml" -o "$work/out"
echo "files: $(ls "$work/out" | wc -l)"
find "$work/out" -name "*.syz" | sort | head -200 | xargs "$syz" check --propagation linear | tail -1
