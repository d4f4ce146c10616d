#!/usr/bin/env bash
# Peak memory (max RSS) of `lodestone correlate` against synthetic time scales of 300 and 1 000 chrons
# (invented data: gamma intervals, shape 2, mean 0.25 Myr; a column of 40 zones sampled at 12 m/Myr,
# 12 levels per chron on average, from the 100th chron on, as in benches/correlate.rs).
# Usage: bash benches/correlate_memory.sh [DIR] [BIN]   (BIN defaults to the release binary, built here)
set -euo pipefail
cd "$(dirname "$0")/.."
dir="${1:-target/correlate-memory}"
bin="${2:-}"
mkdir -p "$dir"
if [ -z "$bin" ]; then
  cargo build --release --quiet
  bin="$PWD/target/release/lodestone"
fi
cat > "$dir/gen.py" <<'PY'
import sys, random
n, scale_path, levels_path = int(sys.argv[1]), sys.argv[2], sys.argv[3]
rnd = random.Random(n)
ages = [0.0]
for _ in range(n):
    ages.append(ages[-1] + rnd.gammavariate(2.0, 0.125))
with open(scale_path, "w") as f:
    f.write("young,old,polarity\n")
    for i in range(n):
        f.write(f"{ages[i]:.6f},{ages[i+1]:.6f},{'N' if i % 2 == 0 else 'R'}\n")
a0, a1 = ages[100] + 0.01, ages[140] - 0.01
m = 12 * 40
with open(levels_path, "w") as f:
    f.write("vgp_lat,height\n")
    for k in range(m):
        age = a1 - (a1 - a0) * k / (m - 1)          # base of the column is the oldest
        i = max(j for j in range(n) if ages[j] <= age)
        f.write(f"{80 if i % 2 == 0 else -80},{12 * (a1 - age):.4f}\n")
PY
printf '%-8s %10s %14s\n' chrons "wall s" "max RSS MiB"
for n in 300 1000; do
  python3 "$dir/gen.py" "$n" "$dir/scale-$n.csv" "$dir/levels-$n.csv"
  /usr/bin/time -v "$bin" correlate "$dir/levels-$n.csv" "$dir/scale-$n.csv" --format json --quiet \
    > "$dir/out-$n.json" 2> "$dir/time-$n.txt"
  wall=$(grep "Elapsed (wall" "$dir/time-$n.txt" | awk '{print $NF}')
  rss=$(grep "Maximum resident" "$dir/time-$n.txt" | awk '{printf "%.1f", $NF/1024}')
  printf '%-8s %10s %14s\n' "$n" "$wall" "$rss"
done
