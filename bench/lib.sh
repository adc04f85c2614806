# Shared helpers of the benchmark scripts (sourced, not run).

# ensure_tools installs what the benchmarks need from the system packages when
# missing: GNU time for peak memory, and (for import.sh) the sqlite3 shell.
ensure_tools() {
	local missing=()
	[ -x /usr/bin/time ] || missing+=(time)
	for t in "$@"; do command -v "$t" >/dev/null || missing+=("$t"); done
	if [ ${#missing[@]} -gt 0 ]; then
		echo "installing ${missing[*]} from the system packages" >&2
		if [ "$(id -u)" -eq 0 ]; then
			apt-get update -qq && apt-get install -y -qq "${missing[@]}" >/dev/null
		else
			sudo apt-get update -qq && sudo apt-get install -y -qq "${missing[@]}" >/dev/null
		fi
	fi
}

# timed LABEL CMD... runs CMD under /usr/bin/time -v, its stdout discarded,
# and sets WALL (seconds), RSS (MiB) and CPU (user + system seconds) from the report.
timed() {
	local label=$1
	shift
	local report
	report="$(mktemp)"
	if ! /usr/bin/time -v "$@" >/dev/null 2>"$report"; then
		echo "$label failed:" >&2
		cat "$report" >&2
		rm -f "$report"
		return 1
	fi
	WALL="$(awk -F': ' '/Elapsed \(wall clock\)/ {
		n = split($2, p, ":"); s = 0
		for (i = 1; i <= n; i++) s = s * 60 + p[i]
		printf "%.2f", s }' "$report")"
	RSS="$(awk -F': ' '/Maximum resident set size/ { printf "%.0f", $2 / 1024 }' "$report")"
	CPU="$(awk -F': ' '/User time|System time/ { s += $2 } END { printf "%.2f", s }' "$report")"
	rm -f "$report"
}
