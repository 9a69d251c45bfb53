#!/usr/bin/env bash
# Scale benchmark (issue 6: "a folder of 100,000 small files audits with
# memory that stays flat"). Generates N small JPEGs (about 2 to 20 KB, with
# EXIF from exifwrite: four invented cameras, three with GPS time, so the
# camera clock models are fitted on tens of thousands of evidence points;
# internal/benchtools/smallset), then audits the first quarter and the whole
# folder with all four reports and thumbnails, and prints the wall time and
# the peak resident memory (GNU time) of each, so flatness can be judged.
# Usage: testdata/bench_scale.sh [N] (default 100000). Needs go and
# /usr/bin/time (Debian package "time"). Writes only under a temporary
# folder, removed at exit.
set -euo pipefail
n="${1:-100000}"
q=$((n / 4))
root="$(cd "$(dirname "$0")/.." && pwd)"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
cd "$root"
go build -o "$tmp/gnomon" ./cmd/gnomon
go run ./internal/benchtools/smallset/gen -n "$q" -out "$tmp/quarter"
go run ./internal/benchtools/smallset/gen -n "$n" -out "$tmp/full"
echo "$(go version); $(nproc) cores; $q and $n files ($(du -sm "$tmp/quarter" | cut -f1) and $(du -sm "$tmp/full" | cut -f1) MB)"

measure() { # label dir out
	local r
	r=$(/usr/bin/time -f '%e %M' "$tmp/gnomon" audit "$2" --out "$3" --quiet 2>&1 >/dev/null | tail -1)
	set -- "$1" $r
	printf '%-22s wall %8.1f s   peak RSS %6.0f MB\n' "$1" "$2" "$(echo "$3/1024" | bc -l)"
}
measure "audit of $q files:" "$tmp/quarter" "$tmp/rq"
measure "audit of $n files:" "$tmp/full" "$tmp/rf"
printf 'report sizes (%d files): %s\n' "$n" "$(cd "$tmp/rf" && du -sh report.* | tr '\n\t' '  ')"
