#!/usr/bin/env bash
# Ranking benchmark: invented synthetic catalogs of N targets (written by
# cmd/benchrank from package rank/synth) imported, then
# ranked end to end with 10,000 Monte Carlo samples each. Prints wall time and
# peak resident memory (GNU time) of the import and of the ranking.
#
#   bash bench/rank.sh                          # N = 1000 2000 5000 10000
#   SIZES="1000" SAMPLES=2000 bash bench/rank.sh
#
# Goal (issue 4): 10,000 × 10,000 in at most 20 s and 1 GiB; 1,000 × 10,000 in
# at most 2 s; cost linear in targets × samples.
set -euo pipefail
cd "$(dirname "$0")/.."
. bench/lib.sh
ensure_tools

out=bench/out
samples=${SAMPLES:-10000}
mkdir -p "$out"
go build -o "$out/tidesift" ./cmd/tidesift
go build -o "$out/benchrank" ./cmd/benchrank

printf '%-8s %-8s %-8s %9s %9s %14s\n' targets samples step wall_s rss_MiB us/target/ksample
for n in ${SIZES:-1000 2000 5000 10000}; do
	csv="$out/targets-$n.csv"
	# The ranking engine's own synthetic catalogs (package rank/synth), written
	# in the canonical layout, so the end-to-end figures match its benchmarks.
	[ -s "$csv" ] || "$out/benchrank" -n "$n" -csv "$csv" >/dev/null
	db="$out/rank-$n.db"
	rm -f "$db" "$db-wal" "$db-shm"
	timed "import" "$out/tidesift" --db "$db" import "$csv"
	printf '%-8s %-8s %-8s %9s %9s\n' "$n" "-" import "$WALL" "$RSS"
	timed "rank" "$out/tidesift" --db "$db" rank --samples "$samples" --seed 1 --format json
	per=$(awk -v w="$WALL" -v n="$n" -v s="$samples" 'BEGIN { printf "%.2f", w * 1e6 / n / (s / 1000) }')
	printf '%-8s %-8s %-8s %9s %9s %14s\n' "$n" "$samples" rank "$WALL" "$RSS" "$per"
done
