#!/usr/bin/env bash
# Times the reference reader (Debian's libimage-exiftool-perl, `exiftool -n -json`)
# and `gnomon meta --json` over the same folder of N realistic multi-megabyte
# JPEGs (3000x2000, about 2.7 MB, written by internal/testkit/benchset), in
# the same run, and prints the ratio. Usage: bench_vs_exiftool.sh [N] (default 1000).
# Needs: go, exiftool. Writes only to a temporary folder, removed at exit.
set -euo pipefail
n="${1:-1000}"
here="$(cd "$(dirname "$0")" && pwd)"
root="$(cd "$here/../.." && pwd)"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
cd "$root"
go build -o "$tmp/gnomon" ./cmd/gnomon
go run ./internal/testkit/benchset/gen -n "$n" -out "$tmp/photos"
echo "exiftool $(exiftool -ver); $(go version)"
cat "$tmp"/photos/* > /dev/null # warm the page cache so both readers see the same state

secs() { local s e; s=$(date +%s.%N); "$@" > /dev/null; e=$(date +%s.%N); echo "$e - $s" | bc -l; }
t_ref=$(secs exiftool -n -json "$tmp/photos")
t_meta=$(secs "$tmp/gnomon" meta --json --no-hash "$tmp/photos")
t_hash=$(secs "$tmp/gnomon" meta --json "$tmp/photos")
mb=$(du -sm "$tmp/photos" | cut -f1)
printf 'files: %d (%d MB)\n' "$n" "$mb"
printf 'exiftool -n -json:            %8.3f s  (%.2f ms/file)\n' "$t_ref" "$(echo "$t_ref*1000/$n" | bc -l)"
printf 'gnomon meta --json --no-hash: %8.3f s  (%.3f ms/file)  %.1fx faster\n' "$t_meta" "$(echo "$t_meta*1000/$n" | bc -l)" "$(echo "$t_ref/$t_meta" | bc -l)"
printf 'gnomon meta --json (SHA-256): %8.3f s  (%.0f MB/s)  %.1fx faster\n' "$t_hash" "$(echo "$mb/$t_hash" | bc -l)" "$(echo "$t_ref/$t_hash" | bc -l)"
