#!/usr/bin/env bash
# Import benchmark: an invented canonical CSV of N rows imported by
# `tidesift import` (parsing, unit conversion, validation, one revision),
# beside the sqlite3 shell's `.import` of the same file into a plain table.
# Then an update: the same moons with every value changed (gencsv -seed 2)
# imported into that catalog, each value superseding the one before.
# Prints wall time, peak resident memory and CPU time (user + system; GNU
# time) for each. Our import reads and writes on two goroutines, so its CPU
# time may exceed its wall time.
#
#   bash bench/import.sh                 # N = 100000 and 1000000
#   SIZES="10000" bash bench/import.sh   # a quick run
#
# Files go to bench/out/ (ignored by git). Goal (issue 5): our import at most
# 2× the shell's time, peak memory at most 256 MiB and flat in N.
set -euo pipefail
cd "$(dirname "$0")/.."
. bench/lib.sh
ensure_tools sqlite3

out=bench/out
mkdir -p "$out"
go build -o "$out/tidesift" ./cmd/tidesift
go build -o "$out/gencsv" ./bench/gencsv

printf '%-9s %-22s %9s %9s %9s\n' rows what wall_s rss_MiB cpu_s
for n in ${SIZES:-100000 1000000}; do
	csv="$out/moons-$n.csv"
	[ -s "$csv" ] || "$out/gencsv" -n "$n" -o "$csv"
	upd="$out/moons-$n-seed2.csv"
	[ -s "$upd" ] || "$out/gencsv" -n "$n" -seed 2 -o "$upd"

	rm -f "$out/import-$n.db" "$out/import-$n.db-wal" "$out/import-$n.db-shm"
	timed "tidesift import" env TIDESIFT_DB="$out/import-$n.db" "$out/tidesift" import "$csv"
	ours=$WALL
	printf '%-9s %-22s %9s %9s %9s\n' "$n" "tidesift import" "$WALL" "$RSS" "$CPU"

	rm -f "$out/sqlite-$n.db"
	timed "sqlite3 .import" sqlite3 "$out/sqlite-$n.db" ".import --csv $csv moons"
	printf '%-9s %-22s %9s %9s %9s\n' "$n" "sqlite3 .import" "$WALL" "$RSS" "$CPU"
	awk -v a="$ours" -v b="$WALL" 'BEGIN { if (b > 0) printf "%-9s %-22s %9.2f\n", "", "ratio (ours/shell)", a / b }'

	timed "tidesift update" env TIDESIFT_DB="$out/import-$n.db" "$out/tidesift" import "$upd"
	printf '%-9s %-22s %9s %9s %9s\n' "$n" "tidesift update" "$WALL" "$RSS" "$CPU"
done
