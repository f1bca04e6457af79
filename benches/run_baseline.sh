#!/usr/bin/env bash
# Performance run: builds the release binary and the hand-written bench, then in ONE run on this machine times
#  1. junctura map (radius, beta2) 3000 x 3000 --summary (whole process) against the SymPy + NumPy baseline,
#  2. junctura map (radius, q) 3000 x 3000 against a hand-written closed-form Rust loop (1 and 2 threads),
#  3. 1 against 2 threads on the big maps,
#  4. peak memory (max RSS) of a 10000 x 10000 --summary map,
# and prints a table of ratios. Times are the best (minimum) and median wall time of several runs; the load
# average is printed before and after, since other processes share the cores.
# Usage: benches/run_baseline.sh [RUNS]     (needs python3; installs benches/baseline/requirements.txt if missing)
set -euo pipefail
cd "$(dirname "$0")/.."
RUNS=${1:-10}
cargo build --release --quiet
cargo bench --no-run --quiet --bench handwritten 2>/dev/null
python3 -c "import sympy, numpy" 2>/dev/null || python3 -m pip install -q -r benches/baseline/requirements.txt
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
BIN=target/release/junctura
S=scenarios/reissner-nordstrom-wormhole.toml
load() { cut -d' ' -f1-3 /proc/loadavg; }
LOAD_BEFORE=$(load)
# Radius ranges start at 1.05 times the outer horizon r+ = m + sqrt(m^2 - q^2) (m = 1): q = 0.5 and q = 0.95.
LO1=$(python3 -c "print(repr(1.05 * (1 + 0.75 ** 0.5)))")
LOQ=$(python3 -c "print(repr(1.05 * (1 + (1 - 0.95 ** 2) ** 0.5)))")
MAP1="$BIN map $S --set q=0.5 --x radius:$LO1:10:3000 --y beta2:-3:3:3000 --summary"
MAP2="$BIN map $S --x radius:$LOQ:10:3000 --y q:0:0.95:3000 --beta2 -0.5 --summary"
BIG="$BIN map $S --set q=0.5 --x radius:$LO1:10:10000 --y beta2:-3:3:10000 --summary"
PY="python3 benches/baseline/map_baseline.py --n 3000 --q 0.5"

# timeit NAME RUNS COMMAND...: writes "min median" (seconds) to $TMP/NAME.
timeit() {
    local name=$1 runs=$2
    shift 2
    if command -v hyperfine >/dev/null; then
        hyperfine --style none --shell=none --warmup 1 --runs "$runs" --export-json "$TMP/$name.json" "$*" >/dev/null
        python3 -c "import json,statistics as s; t=json.load(open('$TMP/$name.json'))['results'][0]['times']; print(min(t), s.median(t))" >"$TMP/$name"
    else
        local ts=() t0 t1
        "$@" >/dev/null
        for _ in $(seq "$runs"); do
            t0=$(date +%s%N); "$@" >/dev/null; t1=$(date +%s%N)
            ts+=("$(( t1 - t0 ))")
        done
        printf '%s\n' "${ts[@]}" | sort -n | awk '{a[NR]=$1} END {printf "%.6f %.6f\n", a[1]/1e9, a[int((NR+1)/2)]/1e9}' >"$TMP/$name"
    fi
}
get() { cut -d' ' -f"$2" "$TMP/$1"; }

# Counts: junctura's summary against the baseline's (the script exits non-zero if they differ).
$MAP1 >"$TMP/map1.json"
$PY --check "$TMP/map1.json" | tee "$TMP/py_check.txt"

timeit map1 "$RUNS" $MAP1
timeit py 3 $PY
timeit map2_1t "$RUNS" env RAYON_NUM_THREADS=1 $MAP2
timeit map2_2t "$RUNS" env RAYON_NUM_THREADS=2 $MAP2
timeit big_1t 5 env RAYON_NUM_THREADS=1 $BIG
timeit big_2t 5 env RAYON_NUM_THREADS=2 $BIG
timeit map1_1t "$RUNS" env RAYON_NUM_THREADS=1 $MAP1
timeit map1_2t "$RUNS" env RAYON_NUM_THREADS=2 $MAP1
/usr/bin/time -v $BIG 2>"$TMP/rss.txt" >/dev/null
RSS_KB=$(awk -F: '/Maximum resident set size/ {gsub(/ /, "", $2); print $2}' "$TMP/rss.txt")
cargo bench --quiet --bench handwritten 2>/dev/null | tee "$TMP/hand.txt"
hv() { awk -v k="$1" '$1 == k {print $2}' "$TMP/hand.txt"; }
LOAD_AFTER=$(load)

row() { awk -v n="$1" -v v="$2" -v t="$3" -v ok="$4" 'BEGIN {printf "| %-66s | %10s | %-10s | %-4s |\n", n, v, t, ok}'; }
check() { awk -v v="$1" -v op="$2" -v t="$3" 'BEGIN {ok = (op == ">=") ? v >= t : v < t; print ok ? "yes" : "no"}'; }
ratio() { awk -v a="$1" -v b="$2" 'BEGIN {printf "%.2f", a / b}'; }
echo
echo "load average (1, 5, 15 min): before $LOAD_BEFORE, after $LOAD_AFTER; $(nproc) cores; best of $RUNS runs unless noted"
printf '| %-66s | %10s | %-10s | %-4s |\n' measurement value target met
printf '|%s|%s|%s|%s|\n' "$(printf -- '-%.0s' {1..68})" "$(printf -- '-%.0s' {1..12})" "$(printf -- '-%.0s' {1..12})" "------"
M1=$(get map1 1); PYT=$(get py 1)
row "junctura map (radius, beta2) 3000^2 --summary, whole process (s)" "$(printf %.4f "$M1")" "< 0.050" "$(check "$M1" "<" 0.050)"
row "SymPy + NumPy baseline, same map, whole process (s, best of 3)" "$(printf %.3f "$PYT")" "" ""
R=$(ratio "$PYT" "$M1"); row "baseline / junctura" "$R" ">= 20" "$(check "$R" ">=" 20)"
row "counts equal (stable, unstable)" "$(grep -q 'True' "$TMP/py_check.txt" && echo yes || echo no)" "yes" ""
H1=$(hv handwritten_1t_s); H2=$(hv handwritten_2t_s); J1=$(hv junctura_1t_s); J2=$(hv junctura_2t_s)
row "(radius, q) 3000^2: hand-written loop, 1 thread (s)" "$H1" "" ""
row "(radius, q) 3000^2: junctura library, 1 thread (s)" "$J1" "" ""
R=$(ratio "$J1" "$H1"); row "junctura / hand-written, 1 thread" "$R" "<= 5" "$(check "$R" "<" 5.0001)"
R=$(ratio "$J2" "$H2"); row "junctura / hand-written, 2 threads" "$R" "<= 5" "$(check "$R" "<" 5.0001)"
C2=$(get map2_2t 1); R=$(ratio "$C2" "$H2"); row "junctura CLI whole process / hand-written loop, 2 threads" "$R" "<= 5" "$(check "$R" "<" 5.0001)"
row "hand-written counts equal junctura's" "$(hv counts_equal)" "true" ""
R=$(ratio "$(get map2_1t 1)" "$C2"); row "(radius, q) 3000^2 CLI: 1 thread / 2 threads" "$R" ">= 1.7" "$(check "$R" ">=" 1.7)"
R=$(ratio "$(get big_1t 1)" "$(get big_2t 1)"); row "(radius, beta2) 10000^2 CLI: 1 thread / 2 threads (best of 5)" "$R" ">= 1.7" "$(check "$R" ">=" 1.7)"
R=$(ratio "$(get map1_1t 1)" "$(get map1_2t 1)"); row "(radius, beta2) 3000^2 CLI: 1 thread / 2 threads" "$R" "" ""
R=$(ratio "$H1" "$H2"); row "control: hand-written loop 1 thread / 2 threads (free cores)" "$R" "" ""
row "(radius, beta2) 10000^2 --summary: 2 threads, whole process (s)" "$(printf %.3f "$(get big_2t 1)")" "" ""
MIB=$(awk -v k="$RSS_KB" 'BEGIN {printf "%.1f", k / 1024}')
row "(radius, beta2) 10000^2 --summary: peak RSS (MiB)" "$MIB" "< 100" "$(check "$MIB" "<" 100)"
