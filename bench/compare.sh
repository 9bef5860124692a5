#!/usr/bin/env bash
# Time `syz eval` on an invented catalogue against the hand-written Python routes.
#
# Usage: bench/compare.sh [N]        (N systems, default 2000; run from anywhere)
#
# Generates N systems into a temporary folder, builds the release CLI, runs
#   python3 bench/peer.py DIR                              (astropy + uncertainties, linear)
#   python3 bench/peer_mc.py DIR                           (numpy, Monte Carlo, 10^4 samples)
#   syz eval --format csv --propagation linear DIR         (first-order propagation)
#   syz eval --format json --propagation linear DIR        (the same, as JSON)
#   syz eval --format csv DIR                              (Monte Carlo, 10^4 samples)
# and, on a copy with asymmetric uncertainties replaced by their mean (bench/symmetric_copy.py,
# the catalogue as the peers read it), the first peer and the linear CSV run again,
# under /usr/bin/time -v, and prints wall-clock times, the ratios of each peer's time to
# syz's next to their targets, and peak resident memory. `syz check --propagation linear
# DIR` is run once to show the catalogue is clean.
set -euo pipefail

N="${1:-2000}"
ROOT="$(cd "$(dirname "$0")/.." && pwd)"
cd "$ROOT"

if [ ! -x /usr/bin/time ]; then
  echo "error: /usr/bin/time is missing (apt-get install -y time)" >&2
  exit 1
fi
python3 -c 'import astropy, uncertainties, numpy' 2>/dev/null || {
  echo "error: the peers need astropy, uncertainties and numpy (pip install astropy uncertainties numpy)" >&2
  exit 1
}

WORK="$(mktemp -d)"
trap 'rm -rf "$WORK"' EXIT
DIR="$WORK/catalogue"
OUT="$WORK/out"
mkdir -p "$OUT"

echo "== generating $N systems into $DIR"
python3 bench/generate_catalogue.py "$N" "$DIR"
echo "   $(ls "$DIR" | wc -l) files, $(grep -h -c '^  planet ' "$DIR"/*.syz | paste -sd+ | bc) planets," \
  "$(grep -h -c 'transit_depth' "$DIR"/*.syz | paste -sd+ | bc) transiting"

echo "== building the release CLI"
CARGO_BUILD_JOBS="${CARGO_BUILD_JOBS:-1}" cargo build --release -q -p syzygy-cli
SYZ="$ROOT/target/release/syz"

echo "== syz check --propagation linear"
set +e
"$SYZ" check --propagation linear "$DIR" >"$OUT/check.txt" 2>&1
CHECK_RC=$?
set -e
echo "   exit status $CHECK_RC; last lines:"
tail -n 3 "$OUT/check.txt" | sed 's/^/   | /'

# run NAME CMD...: time one command, keep its stdout; sets WALL_<NAME> and RSS_<NAME>.
run() {
  local name="$1"; shift
  local log="$OUT/$name.time"
  local t0 t1
  t0=$(date +%s.%N)
  /usr/bin/time -v -o "$log" "$@" >"$OUT/$name.csv" 2>"$OUT/$name.err" || {
    echo "error: $name failed; see below" >&2
    tail -n 20 "$OUT/$name.err" >&2
    exit 1
  }
  t1=$(date +%s.%N)
  local wall rss
  wall=$(echo "$t1 - $t0" | bc -l)
  rss=$(awk -F': ' '/Maximum resident set size/ {print $2}' "$log")
  printf -v "WALL_$name" '%s' "$wall"
  printf -v "RSS_$name" '%s' "$rss"
  printf '   %-8s %8.2f s   peak RSS %7.1f MiB   (%s lines of output)\n' \
    "$name" "$wall" "$(echo "$rss / 1024" | bc -l)" "$(wc -l <"$OUT/$name.csv")"
}

echo "== timing"
run peer python3 bench/peer.py "$DIR" /dev/stdout
run peermc python3 bench/peer_mc.py "$DIR" /dev/stdout 10000
run linear "$SYZ" eval --format csv --propagation linear "$DIR"
run json "$SYZ" eval --format json --propagation linear "$DIR"
run mc "$SYZ" eval --format csv --samples 10000 "$DIR"
# The same catalogue as the peers read it (asymmetric uncertainties replaced by the mean of
# their two sides): what first order costs when only the other reasons to sample remain.
python3 bench/symmetric_copy.py "$DIR" "$WORK/symmetric"
run peersym python3 bench/peer.py "$WORK/symmetric" /dev/stdout
run linsym "$SYZ" eval --format csv --propagation linear "$WORK/symmetric"

# ratio A B TARGET LABEL: print A/B against its target.
ratio() {
  local r
  r=$(echo "$1 / $2" | bc -l)
  printf '   %-44s = %7.1f x   (target %s x: %s)\n' "$4" "$r" "$3" \
    "$(if (( $(echo "$r >= $3" | bc -l) )); then echo met; else echo not met; fi)"
}

echo "== summary (N = $N)"
ratio "$WALL_peer" "$WALL_linear" 40 "astropy+uncertainties / syz linear CSV"
ratio "$WALL_peer" "$WALL_json" 15 "astropy+uncertainties / syz linear JSON"
ratio "$WALL_peermc" "$WALL_mc" 3 "numpy Monte Carlo / syz Monte Carlo CSV"
printf '   %-44s = %7.1f x   (no target: both read the same numbers)\n' \
  "symmetric copy: peer / syz linear CSV" "$(echo "$WALL_peersym / $WALL_linsym" | bc -l)"
printf '   peak RSS: peer %.1f MiB, numpy peer %.1f MiB, linear %.1f MiB, JSON %.1f MiB, Monte Carlo %.1f MiB\n' \
  "$(echo "$RSS_peer / 1024" | bc -l)" "$(echo "$RSS_peermc / 1024" | bc -l)" \
  "$(echo "$RSS_linear / 1024" | bc -l)" "$(echo "$RSS_json / 1024" | bc -l)" \
  "$(echo "$RSS_mc / 1024" | bc -l)"
