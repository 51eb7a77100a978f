#!/usr/bin/env bash
# calc-diff.sh BASE [OUT]: the calculation review of a change, for any CI.
#
# Builds the site at the current commit (failing on a failed claim or an
# unacknowledged DANGER), then writes the calculation diff between BASE (a
# git revision, e.g. the pull request's target branch) and HEAD to OUT
# (default calc-diff.md), as Markdown ready to post as a comment.
#
# If POST_COMMENT is set, it is run with OUT as its argument to post the
# comment (for example: POST_COMMENT="gh pr comment 42 --body-file").
#
# Exit status: that of the build when it fails; else that of specgen diff
# (0 nothing worse, 1 a claim newly fails or a DANGER newly appears, 2 bad
# input). SPECGEN (default: go run ./cmd/specgen) and SITE (default .) pick
# the program and the site root.
set -uo pipefail
base=${1:?usage: calc-diff.sh BASE [OUT]}
out=${2:-calc-diff.md}
specgen=${SPECGEN:-go run ./cmd/specgen}
site=${SITE:-.}

$specgen build -strict -C "$site" || exit $?
$specgen diff -C "$site" "$base" HEAD >"$out"
status=$?
cat "$out"
if [ -n "${POST_COMMENT:-}" ] && [ "$status" -ne 2 ]; then
  $POST_COMMENT "$out" || echo "calc-diff.sh: posting the comment failed" >&2
fi
exit "$status"
