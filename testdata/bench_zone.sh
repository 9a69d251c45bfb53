#!/usr/bin/env bash
# Zone finder benchmark (issue 12: "start in a tenth of a second"). Runs
# solarcheck/zone/internal/zonebench once per finder, each in a fresh process
# under GNU time, and prints side by side: the time to the first answer
# (loading included), the bytes allocated and kept, the time per lookup over
# 100,000 points uniform over the sphere (cold: first pass; warm: second), the
# share of points with no answer and with several zones, and the peak
# resident memory of the whole process.
# Usage: testdata/bench_zone.sh. Needs go and /usr/bin/time (Debian package
# "time"). Writes only a temporary binary, removed at exit.
set -euo pipefail
root="$(cd "$(dirname "$0")/.." && pwd)"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
cd "$root"
go build -o "$tmp/zonebench" ./solarcheck/zone/internal/zonebench
echo "$(go version); $(nproc) cores; $(date -u +%Y-%m-%d)"
for f in gnomon exact fuzzy default; do
	out=$(/usr/bin/time -f '%M' "$tmp/zonebench" -finder "$f" 2>"$tmp/rss")
	printf '%s  peak RSS %4.0f MB\n' "$out" "$(echo "$(tail -1 "$tmp/rss")/1024" | bc -l)"
done
