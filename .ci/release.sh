#!/usr/bin/env bash
# release.sh VERSION [OUT]: the release binaries of specgen.
#
# Cross-builds static binaries (no cgo) for Linux, macOS and Windows on
# amd64 and arm64 into OUT (default release/), named
# specgen_VERSION_OS_ARCH (.exe on Windows), with the version linked in, and
# writes their SHA-256 sums to OUT/SHA256SUMS. Run it on a checkout of the
# tag (the tag-driven workflow in .ci/examples/release.yml does).
# PLATFORMS (default: all six) picks a subset, e.g. PLATFORMS=linux/amd64.
set -euo pipefail
cd "$(dirname "$0")/.."
version=${1:?usage: release.sh VERSION [OUT], e.g. release.sh v0.1.0}
out=${2:-release}
if ! [[ $version =~ ^v[0-9]+\.[0-9]+\.[0-9]+(-[0-9A-Za-z.-]+)?$ ]]; then
  echo "release.sh: $version is not a version tag; write vMAJOR.MINOR.PATCH, e.g. v0.1.0" >&2
  exit 2
fi
if [ "$(git describe --tags --exact-match 2>/dev/null || true)" != "$version" ]; then
  echo "release.sh: note: HEAD is not tagged $version; the binaries say $version all the same" >&2
fi
module=$(awk '$1 == "module" { print $2; exit }' go.mod)
platforms=${PLATFORMS:-linux/amd64 linux/arm64 darwin/amd64 darwin/arm64 windows/amd64 windows/arm64}

rm -rf "$out"
mkdir -p "$out"
for platform in $platforms; do
  goos=${platform%/*}
  goarch=${platform#*/}
  exe=""
  [ "$goos" = windows ] && exe=.exe
  name="specgen_${version}_${goos}_${goarch}${exe}"
  echo "== $name"
  # -trimpath and no build IDs of this machine: the same tag builds the
  # same bytes anywhere with the same Go.
  CGO_ENABLED=0 GOOS=$goos GOARCH=$goarch go build -trimpath -buildvcs=false \
    -ldflags "-s -w -buildid= -X $module/internal/version.tag=$version" -o "$out/$name" ./cmd/specgen
done
(
  cd "$out"
  # sha256sum on Linux, shasum on macOS: the same lines either way.
  if command -v sha256sum >/dev/null 2>&1; then sha256sum -- specgen_*; else shasum -a 256 -- specgen_*; fi
) >"$out/SHA256SUMS.tmp"
mv "$out/SHA256SUMS.tmp" "$out/SHA256SUMS"

# The binary for this machine, if one was built, must name its version.
hostos=$(go env GOOS)
host="$out/specgen_${version}_${hostos}_$(go env GOARCH)"
[ "$hostos" = windows ] && host="$host.exe"
if [ -x "$host" ]; then
  said=$("$host" --version)
  if [ "$said" != "specgen $version" ]; then
    echo "release.sh: $host says \"$said\", not \"specgen $version\"" >&2
    exit 1
  fi
fi
cat "$out/SHA256SUMS"
