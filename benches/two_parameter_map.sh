#!/usr/bin/env bash
# Two-parameter maps (no radius axis: every cell needs the static radii of the law in the radius range).
# Times whole `junctura map ... --summary` processes of the release binary against a baseline binary (for example
# a build of an earlier commit), on the same machine in the same run, and prints the ratio and whether the counts
# agree. Times are the best and the median wall time of RUNS runs; the load average is printed, since other
# processes share the cores.
# Usage: BASE=path/to/old/junctura [NEW=path/to/junctura] benches/two_parameter_map.sh [RUNS] [N]
# (NEW defaults to a fresh release build of this checkout).
set -euo pipefail
cd "$(dirname "$0")/.."
RUNS=${1:-3}
N=${2:-200}
BASE=${BASE:?set BASE to the baseline junctura binary}
if [ -z "${NEW:-}" ]; then
  cargo build --release --quiet --bin junctura
  NEW=target/release/junctura
fi
load() { cut -d' ' -f1-3 /proc/loadavg; }
# name | scenario | axes
MAPS=(
  "gravastar-linear (l, w)|scenarios/gravastar-linear.toml|--x l:0.01:0.2:$N --y w:0.1:1.5:$N --from 1e-3 --to 20"
  "gravastar-chaplygin (l, c)|scenarios/gravastar-chaplygin.toml|--x l:0.01:0.2:$N --y c:1e-4:0.01:$N --from 1e-3 --to 20"
  "schwarzschild wormhole (m, w)|scenarios/schwarzschild-wormhole-linear.toml|--x m:0.5:2:$N --y w:-0.95:-0.3:$N --from 1e-3 --to 60"
)
best_median() { # RUNS CMD...: prints "best median" in seconds
  local runs=$1; shift
  python3 - "$runs" "$@" <<'PY'
import subprocess, sys, time, statistics
runs = int(sys.argv[1]); cmd = sys.argv[2:]
ts = []
for _ in range(runs):
    t = time.perf_counter(); subprocess.run(cmd, check=True, stdout=subprocess.DEVNULL); ts.append(time.perf_counter() - t)
print(f"{min(ts):.3f} {statistics.median(ts):.3f}")
PY
}
echo "load average before: $(load)"
echo "| map ${N} x ${N} --summary | baseline best / median (s) | junctura best / median (s) | baseline / junctura (best) | counts equal |"
echo "|---|---:|---:|---:|---|"
for m in "${MAPS[@]}"; do
  IFS='|' read -r name scen axes <<<"$m"
  # shellcheck disable=SC2086
  same=$(python3 - "$BASE" "$NEW" map "$scen" $axes --summary <<'PY'
import json, subprocess, sys
def counts(binary):
    out = json.loads(subprocess.run([binary] + sys.argv[3:], capture_output=True, text=True, check=True).stdout)
    out.pop("provenance", None)
    return out
print("yes" if counts(sys.argv[1]) == counts(sys.argv[2]) else "NO")
PY
)
  # shellcheck disable=SC2086
  b=$(best_median "$RUNS" "$BASE" map "$scen" $axes --summary)
  # shellcheck disable=SC2086
  n=$(best_median "$RUNS" "$NEW" map "$scen" $axes --summary)
  ratio=$(python3 -c "print(f'{float(\"${b%% *}\") / float(\"${n%% *}\"):.1f}')")
  echo "| $name | ${b/ / \/ } | ${n/ / \/ } | $ratio | $same |"
done
echo "load average after: $(load)"
