#!/usr/bin/env bash
# bench.sh [PAGES...]: speed and memory of specgen build on generated sites.
#
# For each size (default 1000 5000 10000 pages) it writes a site shaped like
# real documentation (headings, lists, tables, code in four languages, a
# calculation block with claims and inline values on four pages in five, a
# chart on one in twenty), then times a cold build and an unchanged rebuild
# and reads the peak memory (GNU time's maximum resident set size). Then it
# runs the benchmarks that put specgen beside the floor (plain goldmark +
# chroma + html/template on the same Markdown) in one run on one machine.
set -euo pipefail
cd "$(dirname "$0")/.."
sizes=("$@")
[ ${#sizes[@]} -gt 0 ] || sizes=(1000 5000 10000)
bin=$(mktemp -d)/specgen
go build -o "$bin" ./cmd/specgen
timer=(/usr/bin/time -f "%e s, %M kB peak")
command -v /usr/bin/time >/dev/null || timer=()
for n in "${sizes[@]}"; do
  site=$(mktemp -d)
  SPECGEN_BENCH_SITE="$site" SPECGEN_BENCH_PAGES="$n" go test ./internal/site -run TestWriteBenchSite -count=1 >/dev/null
  echo "== $n pages"
  printf 'cold build:        '; "${timer[@]}" "$bin" build -quiet -C "$site" 2>&1 | tail -1
  printf 'unchanged rebuild: '; "${timer[@]}" "$bin" build -quiet -C "$site" 2>&1 | tail -1
  rm -rf "$site"
done
echo "== benchmarks (ns/page; the floor is the least any generator does with the same pages)"
go test ./internal/site -run '^$' -bench 'Build$|Floor|RebuildUnchanged' -benchtime 3x -benchmem | grep Benchmark
