#!/usr/bin/env bash
# Wall time, rows per second and peak memory of `lodestone mean` on directions tables of 10^2 ... 10^6
# rows (invented data: Fisher-distributed directions, 10 per site), with the release binary.
# Usage: bash benches/cli_times.sh [DIR]   (DIR defaults to target/cli-times; run on request only)
set -euo pipefail
cd "$(dirname "$0")/.."
dir="${1:-target/cli-times}"
mkdir -p "$dir"
cargo build --release --quiet
bin="$PWD/target/release/lodestone"

cat > "$dir/gen.py" <<'PY'
import sys
import numpy as np
n, path, sites = int(sys.argv[1]), sys.argv[2], int(sys.argv[3])
rng = np.random.default_rng(n)
k = 40.0
u, phi = rng.random(n), rng.random(n) * 2 * np.pi
ct = 1 + np.log1p(u * np.expm1(-2 * k)) / k
st = np.sqrt(np.maximum(0, 1 - ct * ct))
# about a mean of dec 0, inc 0 (north): x = cos t, y = sin t cos phi, z = sin t sin phi
dec = np.degrees(np.arctan2(st * np.cos(phi), ct)) % 360
inc = np.degrees(np.arcsin(np.clip(st * np.sin(phi), -1, 1)))
with open(path, "w") as out:
    out.write("site,specimen,dec,inc,lat,lon\n")
    for i in range(n):
        site = i // 10 if sites == 0 else (i // 10) % sites
        out.write(f"Q{site},Q{site}-{i},{dec[i]:.1f},{inc[i]:.1f},47.25,281.5\n")
PY
# mean-N.csv: one site per 10 rows (the groups grow with the rows); sites-N.csv: the same kind of rows
# in 100 sites, 10 adjacent rows per site, cycling (a fixed number of groups).
for n in 100 10000 100000 1000000; do
  [ -s "$dir/mean-$n.csv" ] || python3 "$dir/gen.py" "$n" "$dir/mean-$n.csv" 0
  [ -s "$dir/sites-$n.csv" ] || python3 "$dir/gen.py" "$n" "$dir/sites-$n.csv" 100
done

median() { sort -n | awk '{a[NR]=$1} END {print a[int((NR+1)/2)]}'; }

printf '%-16s %-9s %12s %14s %14s\n' file format "wall s" "rows/s" "max RSS MiB"
for f in "$dir"/sites-{10000,100000,1000000}.csv "$dir"/mean-{100,10000,100000,1000000}.csv; do
  n=$(($(wc -l < "$f") - 1))
  for fmt in csv json; do
    runs=5; [ "$n" -le 100 ] && runs=21
    walls=(); rss=0
    for _ in $(seq "$runs"); do
      /usr/bin/time -f '%e %M' -o "$dir/time.txt" "$bin" mean "$f" --format "$fmt" --quiet > /dev/null
      read -r w m < "$dir/time.txt"
      walls+=("$w"); [ "$m" -gt "$rss" ] && rss=$m
    done
    w=$(printf '%s\n' "${walls[@]}" | median)
    rate=$(awk -v n="$n" -v w="$w" 'BEGIN { if (w > 0) printf "%.0f", n / w; else print "-" }')
    printf '%-16s %-9s %12s %14s %14.1f\n' "$(basename "$f")" "$fmt" "$w" "$rate" "$(awk -v m="$rss" 'BEGIN{print m/1024}')"
  done
done

# The 100-row case at millisecond resolution (the /usr/bin/time wall clock has 10 ms steps).
if command -v hyperfine > /dev/null; then
  hyperfine -N --warmup 3 "$bin mean $dir/mean-100.csv --quiet"
else
  python3 - "$bin" "$dir/mean-100.csv" <<'PY'
import subprocess, sys, time
t = []
for _ in range(50):
    s = time.perf_counter()
    subprocess.run([sys.argv[1], "mean", sys.argv[2], "--quiet"], stdout=subprocess.DEVNULL, check=True)
    t.append(time.perf_counter() - s)
t.sort()
print(f"100-row mean: median wall {1000 * t[len(t) // 2]:.1f} ms, min {1000 * t[0]:.1f} ms over {len(t)} runs")
PY
fi
