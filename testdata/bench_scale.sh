#!/usr/bin/env bash
# Scale benchmark (issue 6: "a folder of 100,000 small files audits with
# memory that stays flat"). For each size N given (default 25000 50000
# 100000 200000) it generates N small JPEGs (about 2 to 20 KB, with EXIF
# from exifwrite: four invented cameras, three with GPS time, so the camera
# clock models are fitted on tens of thousands of evidence points;
# internal/testkit/smallset), audits them with all four reports and
# thumbnails, and prints the wall time and the peak resident memory (GNU
# time), so flatness can be judged side by side in one run.
# Usage: testdata/bench_scale.sh [N...]. Needs go, bc and /usr/bin/time
# (Debian package "time"). Writes only under a temporary folder, removed at
# exit; the largest size needs about 1.3 GB of disk for the photos and as
# much again for the reports and the spool.
set -euo pipefail
sizes=("$@")
[ ${#sizes[@]} -gt 0 ] || sizes=(25000 50000 100000 200000)
root="$(cd "$(dirname "$0")/.." && pwd)"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
cd "$root"
go build -o "$tmp/gnomon" ./cmd/gnomon
echo "$(go version); $(nproc) cores"
for n in "${sizes[@]}"; do
	go run ./internal/testkit/smallset/gen -n "$n" -out "$tmp/ev" >/dev/null
	r=$(/usr/bin/time -f '%e %M' "$tmp/gnomon" audit "$tmp/ev" --out "$tmp/rep" --quiet 2>&1 >/dev/null | tail -1)
	set -- $r
	printf '%7d files (%4d MB): wall %7.1f s   peak RSS %5.0f MB   reports %s\n' "$n" "$(du -sm "$tmp/ev" | cut -f1)" "$1" "$(echo "$2/1024" | bc -l)" \
		"$(cd "$tmp/rep" && du -shc report.* | tail -1 | cut -f1)"
	rm -rf "$tmp/ev" "$tmp/rep"
done
