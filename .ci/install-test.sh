#!/usr/bin/env bash
# install-test.sh [TAG]: "go install MODULE/cmd/specgen@TAG" works, and the
# installed specgen says TAG (default v0.1.0) when asked its version.
#
# It serves this checkout's HEAD as version TAG of the module that go.mod
# names, from a module proxy made of files in a temporary folder, and
# installs from it into an empty module cache: what a user's go install
# does against the public proxy, without the network. The dependencies
# come from this machine's module cache, also read as a file proxy.
set -euo pipefail
cd "$(dirname "$0")/.."
tag=${1:-v0.1.0}
module=$(awk '$1 == "module" { print $2; exit }' go.mod)
case ${module%%/*} in
  *.*) ;;
  *)
    echo "install-test.sh: SKIP: module path \"$module\" has no host (such as github.com/OWNER/specgen); go install cannot fetch it"
    exit 0
    ;;
esac

tmp=$(mktemp -d)
trap 'chmod -R u+w "$tmp"; rm -rf "$tmp"' EXIT
# The dependencies, in this machine's module cache, serve as a second proxy.
go mod download
deps="$(go env GOMODCACHE)/cache/download"

# A module proxy is files: MODULE/@v/list, TAG.info, TAG.mod, TAG.zip, with
# upper-case letters of the path written !lower-case.
escaped=$(printf '%s' "$module" | sed 's/[A-Z]/!\L&/g')
at="$tmp/proxy/$escaped/@v"
mkdir -p "$at"
echo "$tag" >"$at/list"
printf '{"Version":"%s","Time":"%s"}\n' "$tag" "$(git log -1 --format=%cI HEAD)" >"$at/$tag.info"
git show HEAD:go.mod >"$at/$tag.mod"
git archive --format=zip --prefix="$module@$tag/" -o "$at/$tag.zip" HEAD

mkdir -p "$tmp/home" "$tmp/bin"
# An empty module cache (the build cache is this machine's: it only saves
# compiling the standard library again), and nothing from the network: no
# checksum database either (it is a network service, and knows nothing of
# this checkout's TAG).
env -u GOFLAGS HOME="$tmp/home" GOPATH="$tmp/gopath" GOMODCACHE="$tmp/modcache" GOCACHE="$(go env GOCACHE)" \
  GOBIN="$tmp/bin" GOPROXY="file://$tmp/proxy,file://$deps" GOSUMDB=off GOTOOLCHAIN=local GOWORK=off \
  go install "$module/cmd/specgen@$tag"

said=$("$tmp/bin/specgen" version)
if [ "$said" != "specgen $tag" ]; then
  echo "install-test.sh: the installed specgen says \"$said\", want \"specgen $tag\"" >&2
  exit 1
fi
echo "install-test.sh: go install $module/cmd/specgen@$tag works; it says \"$said\""
