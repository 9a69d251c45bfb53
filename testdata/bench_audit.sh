#!/usr/bin/env bash
# Audit benchmark (issue: the audit end to end). In one run, over the same
# folder of N generated multi-megabyte JPEGs (3000x2000, about 2.7 MB each,
# camera-like EXIF; internal/testkit/benchset), it times:
#   0. gnomon audit --formats json (the JSON report only);
#   1. gnomon audit without thumbnails (all four reports);
#   2. a single-threaded Go crypto/sha256 pass over the files (the floor:
#      every byte must be hashed);
#   3. sha256sum over the files;
#   4. gnomon audit with thumbnails (from the embedded previews);
#   5. the thumbnail cost when a photo has no usable preview (a full decode),
#      per photo, over 50 photos without one;
# and the peak resident memory of each audit (GNU time), plus the audit's
# peak memory at N/4 to show whether it grows with the number of photos;
# then the fixed cost: the wall time and peak memory of an audit of one
# photo, and the wall time of gnomon selftest.
# The four timings the ratios come from (the hash pass and the three audits)
# are taken in R interleaved rounds, and each ratio is the median over the
# rounds of that round's audit time over that round's hash pass (paired, so a
# machine busy with other work skews both sides alike).
# Usage: testdata/bench_audit.sh [N [R]] (default 2000 files, 3 rounds). Needs go, sha256sum and
# /usr/bin/time (Debian package "time"). Writes only under a temporary
# folder, removed at exit. The page cache is warmed first so every contender
# reads from memory.
set -euo pipefail
n="${1:-2000}"
rounds="${2:-3}"
root="$(cd "$(dirname "$0")/.." && pwd)"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
cd "$root"
go build -o "$tmp/gnomon" ./cmd/gnomon
go build -o "$tmp/hashpass" ./internal/testkit/hashpass
go run ./internal/testkit/benchset/gen -thumb -n "$n" -out "$tmp/photos"
go run ./internal/testkit/benchset/gen -thumb -n "$((n / 4))" -out "$tmp/quarter"
go run ./internal/testkit/benchset/gen -n 50 -out "$tmp/nopreview"
mb=$(du -sm "$tmp/photos" | cut -f1)
echo "$(go version); $(nproc) cores; $n files, $mb MB; load average $(cut -d' ' -f1-3 /proc/loadavg)"
cat "$tmp"/photos/* > /dev/null

secs() { local s e; s=$(date +%s.%N); "$@" > /dev/null 2>&1; e=$(date +%s.%N); echo "$e - $s" | bc -l; }
peak() { /usr/bin/time -f '%M' "$@" 2>&1 >/dev/null | tail -1; } # KB

median() { printf '%s\n' "$@" | sort -g | awk '{v[NR]=$1} END{print (NR%2) ? v[(NR+1)/2] : (v[NR/2]+v[NR/2+1])/2}'; }
hs=() js=() as=() ts=() rj=() ra=() rt=()
for ((r = 0; r < rounds; r++)); do
	rm -rf "$tmp/r0" "$tmp/r1" "$tmp/r2"
	h=$(secs "$tmp/hashpass" "$tmp/photos")
	j=$(secs "$tmp/gnomon" audit "$tmp/photos" --out "$tmp/r0" --quiet --formats json)
	a=$(secs "$tmp/gnomon" audit "$tmp/photos" --out "$tmp/r1" --quiet --thumbnails=false)
	t=$(secs "$tmp/gnomon" audit "$tmp/photos" --out "$tmp/r2" --quiet)
	hs+=("$h") js+=("$j") as+=("$a") ts+=("$t")
	rj+=("$(echo "$j/$h" | bc -l)") ra+=("$(echo "$a/$h" | bc -l)") rt+=("$(echo "$t/$h" | bc -l)")
done
t_hash=$(median "${hs[@]}") t_json=$(median "${js[@]}") t_audit=$(median "${as[@]}") t_thumb=$(median "${ts[@]}")
q_json=$(median "${rj[@]}") q_audit=$(median "${ra[@]}") q_thumb=$(median "${rt[@]}")
t_sum=$(secs sh -c "find '$tmp/photos' -type f -print0 | xargs -0 sha256sum")
t_decode=$(secs "$tmp/gnomon" audit "$tmp/nopreview" --out "$tmp/r5" --quiet)
t_nodecode=$(secs "$tmp/gnomon" audit "$tmp/nopreview" --out "$tmp/r6" --quiet --thumbnails=false)
m_full=$(peak "$tmp/gnomon" audit "$tmp/photos" --out "$tmp/r3" --quiet --thumbnails=false)
m_quarter=$(peak "$tmp/gnomon" audit "$tmp/quarter" --out "$tmp/r4" --quiet --thumbnails=false)
one="$tmp/photos/$(ls "$tmp/photos" | head -1)"
m_one=$(peak "$tmp/gnomon" audit "$one" --out "$tmp/r7" --quiet)
t_one=$(secs "$tmp/gnomon" audit "$one" --out "$tmp/r8" --quiet)
t_self=$(secs "$tmp/gnomon" selftest)

printf 'single-threaded crypto/sha256 pass: %8.2f s  (%.0f MB/s)\n' "$t_hash" "$(echo "$mb/$t_hash" | bc -l)"
printf 'sha256sum:                          %8.2f s  (%.2fx the hash pass)\n' "$t_sum" "$(echo "$t_sum/$t_hash" | bc -l)"
printf 'gnomon audit --formats json:        %8.2f s  (%.2fx the hash pass)\n' "$t_json" "$q_json"
printf 'gnomon audit, no thumbnails:        %8.2f s  (%.2fx the hash pass)\n' "$t_audit" "$q_audit"
printf 'gnomon audit, with thumbnails:      %8.2f s  (%.2fx the hash pass)\n' "$t_thumb" "$q_thumb"
echo "(medians of $rounds rounds; each ratio is the median of the rounds' paired ratios)"
printf 'thumbnail without a preview (full decode): %.0f ms per photo (50 photos, 2 workers)\n' "$(echo "($t_decode-$t_nodecode)*1000/50" | bc -l)"
printf 'gnomon audit of one photo:          %8.2f s  peak RSS %.0f MB\n' "$t_one" "$(echo "$m_one/1024" | bc -l)"
printf 'gnomon selftest:                    %8.2f s\n' "$t_self"
printf 'peak RSS, audit of %d files:  %6.0f MB\n' "$n" "$(echo "$m_full/1024" | bc -l)"
printf 'peak RSS, audit of %d files:  %6.0f MB\n' "$((n / 4))" "$(echo "$m_quarter/1024" | bc -l)"
