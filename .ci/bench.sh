#!/usr/bin/env bash
# bench.sh [-runs N] [-peak PAGES] [-preview PAGES] [PAGES...]: speed and memory of
# specgen build on generated sites, side by side with the floor.
#
# Two kinds of site are generated (internal/site/bench_test.go):
#   docs    shaped like real documentation: headings, lists, tables, code in four
#           languages, a calculation block with claims and inline values on four
#           pages in five, a chart on one in twenty;
#   charts  every page one compressor block with two charts, claims, inline values,
#           a parts table, an assembly list and a code sample.
# The floor is the least any generator does with the same Markdown: goldmark, chroma
# and html/template, one HTML file written per page (TestBenchFloor), timed as a
# process of its own like specgen.
#
# For each kind and size (PAGES, default 1000 5000), N times (-runs, default 3) and
# interleaved (specgen, floor, specgen, floor, ...): a cold build (no output, no
# cache), the floor, an unchanged rebuild, a rebuild after one page's prose is
# edited and one after one of its block's inputs is. Wall time is the shell's
# clock; CPU time (user + sys) and peak resident memory are GNU time's. Figures are
# medians of the runs; MB are 10^6 bytes. Then: one cold build of a chart-heavy site
# of -peak pages (default 10000; 0 skips) for its peak memory, and the preview's
# delay from saving a page to serving it on a site of -preview pages (default 300;
# 0 skips), with BenchmarkPreviewEdit (cmd/specgen). Last, a table of the targets
# with each figure and PASS or OVER, read at 1000 pages (or the first size when
# 1000 is not given) and the largest size (information: the exit status is 0
# unless a build fails), and the in-process benchmarks' allocations at that size.
set -euo pipefail
export LC_ALL=C # decimal points, whatever the locale
cd "$(dirname "$0")/.."

usage() { sed -n '2,3p' "$0" | sed 's/^# //'; }
runs=3 peak=10000 preview=300 sizes=()
while [ $# -gt 0 ]; do
  case $1 in
    -runs | -peak | -preview)
      [[ ${2-} =~ ^[0-9]+$ ]] || { echo "bench.sh: $1 takes a whole number, not \"${2-}\"" >&2; exit 2; }
      declare "${1#-}=$2"
      shift 2 ;;
    -h | -help | --help) usage; exit 0 ;;
    -*) echo "bench.sh: unknown option $1" >&2; usage >&2; exit 2 ;;
    *)
      [[ $1 =~ ^[0-9]+$ ]] && [ "$1" -ge 3 ] || { echo "bench.sh: a size is a number of pages, 3 or more, not \"$1\"" >&2; exit 2; }
      sizes+=("$1")
      shift ;;
  esac
done
[ ${#sizes[@]} -gt 0 ] || sizes=(1000 5000)
[ "$runs" -ge 1 ] || { echo "bench.sh: -runs must be 1 or more" >&2; exit 2; }
[ -x /usr/bin/time ] || { echo "bench.sh: needs GNU time at /usr/bin/time (Debian: apt-get install time)" >&2; exit 2; }
ref=${sizes[0]} # the size the ratios of the targets are read at
for n in "${sizes[@]}"; do [ "$n" != 1000 ] || ref=1000; done
big=${sizes[-1]} # the size whose CPU per page is held to ref's
for n in "${sizes[@]}"; do [ "$n" -le "$big" ] || big=$n; done

work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
go build -o "$work/specgen" ./cmd/specgen
go test -c -o "$work/site.test" ./internal/site

# gen KIND PAGES DIR writes a generated site.
gen() {
  SPECGEN_BENCH_SITE=$3 SPECGEN_BENCH_KIND=$1 SPECGEN_BENCH_PAGES=$2 \
    "$work/site.test" -test.run '^TestWriteBenchSite$' >"$work/log" 2>&1 || { cat "$work/log" >&2; exit 1; }
}

# figures[KEY.wall|cpu|rss] gather one value per run, separated by spaces.
declare -A figures
# measure KEY COMMAND... runs the command once and adds its wall time (s), CPU time
# (s) and peak memory (MB) to the figures under KEY.
measure() {
  local key=$1 start end user sys rss
  shift
  start=$EPOCHREALTIME
  if ! /usr/bin/time -f '%U %S %M' -o "$work/time" "$@" >"$work/log" 2>&1; then
    echo "bench.sh: failed: $*" >&2
    cat "$work/log" >&2
    exit 1
  fi
  end=$EPOCHREALTIME
  read -r user sys rss <"$work/time"
  figures[$key.wall]+="$(awk -v a="$start" -v b="$end" 'BEGIN { printf "%.4f", b - a }') "
  figures[$key.cpu]+="$(awk -v u="$user" -v s="$sys" 'BEGIN { printf "%.2f", u + s }') "
  figures[$key.rss]+="$(awk -v k="$rss" 'BEGIN { printf "%.1f", k * 1024 / 1e6 }') "
}

# median KEY prints the median of a figure's values ("" when there are none).
median() {
  # shellcheck disable=SC2086 # the values are split on purpose
  printf '%s\n' ${figures[$1]-} | sort -g | awk 'NF { v[++n] = $1 }
    END { if (n) printf "%.6g", (n % 2 ? v[(n + 1) / 2] : (v[n / 2] + v[n / 2 + 1]) / 2) }'
}

# per_page SECONDS PAGES prints milliseconds per page.
per_page() { awk -v s="$1" -v n="$2" 'BEGIN { printf "%.2f", s * 1000 / n }'; }

# ratio A B prints A/B to two decimals.
ratio() { awk -v a="$1" -v b="$2" 'BEGIN { printf "%.2f", (b > 0 ? a / b : 0) }'; }

# edited_page PAGES prints the page the edits go to: one near the middle of the site
# that is not a section's index and holds a block (benchEditedPage's choice).
edited_page() {
  local i=$(($1 / 2))
  while [ $((i % 20)) = 0 ] || [ $((i % 5)) = 4 ]; do i=$((i + 1)); done
  printf 'content/part-%02d/section-%02d/page-%03d.md' $((i / 200)) $((i / 20 % 10)) $((i % 20))
}

# edit FILE PATTERN REPLACEMENT changes the first line matching PATTERN, and fails
# when none does.
edit() {
  grep -q "$2" "$1" || { echo "bench.sh: $1 has no line matching $2" >&2; exit 1; }
  sed -i "0,/$2/s//$3/" "$1"
}

kinds=(docs charts)
declare -A title=([docs]="documentation site" [charts]="chart-heavy site")
for n in "${sizes[@]}"; do
  for kind in "${kinds[@]}"; do
    site=$work/site
    gen "$kind" "$n" "$site"
    page=$site/$(edited_page "$n")
    k=$kind.$n
    for r in $(seq "$runs"); do
      rm -rf "$site/dist" "$site/.specgen-cache" "$work/floor"
      measure "$k.cold" "$work/specgen" build -quiet -C "$site"
      measure "$k.floor" env SPECGEN_FLOOR_SITE="$site" SPECGEN_FLOOR_OUT="$work/floor" "$work/site.test" -test.run '^TestBenchFloor$'
      measure "$k.unchanged" "$work/specgen" build -quiet -C "$site"
      edit "$page" "Fit the part" "Fit the part (revision $r)"
      measure "$k.prose" "$work/specgen" build -quiet -C "$site"
      # A bore of a decimal millimetre differs from the generated whole ones.
      edit "$page" '^bore = "[0-9.]* mm"' "bore = \"$((40 + r)).5 mm\""
      measure "$k.input" "$work/specgen" build -quiet -C "$site"
    done
    rm -rf "$site" "$work/floor"
    cold=$(median "$k.cold.wall") ccpu=$(median "$k.cold.cpu") fcpu=$(median "$k.floor.cpu") fwall=$(median "$k.floor.wall")
    echo "== ${title[$kind]}, $n pages: medians of $runs interleaved run(s)"
    printf '%-26s %9s %9s %11s %9s\n' "" "wall s" "CPU s" "CPU/page" "peak MB"
    printf '%-26s %9.3f %9.2f %8.2f ms %9.1f\n' "specgen cold build" "$cold" "$ccpu" "$(per_page "$ccpu" "$n")" "$(median "$k.cold.rss")"
    printf '%-26s %9.3f %9.2f %8.2f ms %9.1f\n' "floor" "$fwall" "$fcpu" "$(per_page "$fcpu" "$n")" "$(median "$k.floor.rss")"
    printf '%-26s %8.2f× %8.2f×\n' "specgen / floor" "$(ratio "$cold" "$fwall")" "$(ratio "$ccpu" "$fcpu")"
    for step in unchanged:"unchanged rebuild" prose:"one page's prose edited" input:"one block input edited"; do
      w=$(median "$k.${step%%:*}.wall") c=$(median "$k.${step%%:*}.cpu")
      printf '%-26s %9.3f %9.2f   %s× the cold build (CPU %s×)\n' "${step#*:}" "$w" "$c" "$(ratio "$w" "$cold")" "$(ratio "$c" "$ccpu")"
    done
    echo
  done
done

if [ "$peak" -gt 0 ]; then
  if [ -z "${figures[charts.$peak.cold.rss]-}" ]; then
    site=$work/site
    gen charts "$peak" "$site"
    measure "charts.$peak.cold" "$work/specgen" build -quiet -C "$site"
    rm -rf "$site"
  fi
  printf '== chart-heavy site, %d pages: cold build %.3f s wall, %.2f s CPU, %.1f MB peak\n' "$peak" \
    "$(median "charts.$peak.cold.wall")" "$(median "charts.$peak.cold.cpu")" "$(median "charts.$peak.cold.rss")"
  echo
fi

declare -A latency
if [ "$preview" -gt 0 ]; then
  for kind in "${kinds[@]}"; do
    site=$work/site
    gen "$kind" "$preview" "$site"
    SPECGEN_BENCH_SITE=$site go test ./cmd/specgen -run '^$' -bench '^BenchmarkPreviewEdit$' -benchtime "$((runs * 3))x" >"$work/log" 2>&1 ||
      { cat "$work/log" >&2; exit 1; }
    latency[$kind]=$(awk '/^BenchmarkPreviewEdit/ { for (i = 2; i <= NF; i++) if ($i == "ms/edit") print $(i - 1) }' "$work/log")
    [ -n "${latency[$kind]}" ] || { echo "bench.sh: BenchmarkPreviewEdit reported no ms/edit" >&2; cat "$work/log" >&2; exit 1; }
    rm -rf "$site"
    echo "== preview, ${title[$kind]} of $preview pages: an edited page served ${latency[$kind]} ms after the save (median of $((runs * 3)) edits)"
  done
  echo
fi

# target LABEL FIGURE LIMIT UNIT prints a row of the targets' table; UNIT is two
# characters wide.
target() {
  [ -n "$2" ] || return 0
  printf '%s %9s %s ≤ %4s %s  %s\n' "$(awk -v f="$2" -v l="$3" 'BEGIN { print (f <= l ? "PASS" : "OVER") }')" "$2" "$4" "$3" "$4" "$1"
}
echo "== targets (PASS or OVER; figures from this run on this machine)"
for kind in charts docs; do
  k=$kind.$ref
  cold=$(median "$k.cold.wall")
  target "${title[$kind]}, $ref pages: cold CPU / floor CPU" "$(ratio "$(median "$k.cold.cpu")" "$(median "$k.floor.cpu")")" 2.5 "× "
  target "${title[$kind]}, $ref pages: unchanged rebuild / cold" "$(ratio "$(median "$k.unchanged.wall")" "$cold")" 0.1 "× "
  target "${title[$kind]}, $ref pages: prose edit rebuild / cold" "$(ratio "$(median "$k.prose.wall")" "$cold")" 0.2 "× "
  target "${title[$kind]}, $ref pages: input edit rebuild / cold" "$(ratio "$(median "$k.input.wall")" "$cold")" 0.2 "× "
  if [ "$big" != "$ref" ]; then
    target "${title[$kind]}: CPU per page, $big / $ref pages" \
      "$(awk -v a="$(median "$kind.$big.cold.cpu")" -v na="$big" -v b="$(median "$k.cold.cpu")" -v nb="$ref" 'BEGIN { printf "%.2f", (b > 0 ? (a / na) / (b / nb) : 0) }')" 1.3 "× "
  fi
done
[ "$peak" = 0 ] || target "chart-heavy site, $peak pages: peak memory" "$(median "charts.$peak.cold.rss")" 300 MB
[ "$preview" = 0 ] || for kind in charts docs; do
  target "preview, ${title[$kind]} of $preview pages: save to served" "$(awk -v m="${latency[$kind]}" 'BEGIN { printf "%.3f", m / 1000 }')" 0.3 "s "
done
echo

echo "== in-process benchmarks at $ref pages (allocations per build)"
SPECGEN_BENCH_PAGES=$ref go test ./internal/site -run '^$' -bench '^Benchmark((Build|Floor)(Charts)?|RebuildEdit)$' -benchtime 1x -benchmem | grep '^Benchmark'
