#!/usr/bin/env bash
# calc-diff.sh BASE [OUT]: the calculation review of a pull request, for any CI.
#
# Writes the calculation diff between BASE (a git revision, e.g. the pull
# request's target branch) and the checkout to OUT (default calc-diff.md),
# whatever state the checkout is in: its failed claims and DANGER cautions
# come first, and a site that does not build says why. The report is capped
# at MAX_BYTES; the whole one is OUT with -full before .md
# (calc-diff-full.md), for the CI job to keep as an artifact. Then the
# report is posted, and only then does the script exit, non-zero when the
# checkout fails its check.
#
# Environment (all optional):
#   SPECGEN       the program (default: specgen on the PATH, else go run ./cmd/specgen)
#   SITE          the site root (default .)
#   MAX_BYTES     cap of the report (default 60000: a pull-request comment holds 65536 characters)
#   PREVIEW_URL   address of the checkout's built site: each block links to its table there
#   GITHUB_STEP_SUMMARY  (set by GitHub Actions) the report is added to the job summary, which
#                 works for pull requests from forks too
#   GH_PR         with GITHUB_REPOSITORY and the gh program: the pull request whose one comment
#                 is edited in place on every push (found by its hidden first line), or written
#   POST_COMMENT  without GH_PR: a command that posts the file it is given, e.g.
#                 "gh pr comment 42 --body-file"
#
# Exit status: 0 the checkout passes its check; 1 a claim fails or a DANGER
# caution is not acknowledged (new or not); 2 bad input (the site at BASE or
# in the checkout does not build).
set -uo pipefail
base=${1:?usage: calc-diff.sh BASE [OUT]}
out=${2:-calc-diff.md}
full="${out%.md}-full.md"
site=${SITE:-.}
max=${MAX_BYTES:-60000}
if [ -n "${SPECGEN:-}" ]; then
  specgen=$SPECGEN
elif command -v specgen >/dev/null 2>&1; then
  specgen=specgen
else
  specgen="go run ./cmd/specgen"
fi
# The report's first line, by which the comment is found again
# (calcdiff.Marker).
marker='<!-- specgen:calc-diff -->'

errors=$(mktemp)
trap 'rm -f "$errors"' EXIT

# 1. The report, whatever the checkout's state.
$specgen diff -C "$site" -max-bytes "$max" -full "$full" ${PREVIEW_URL:+-preview-url "$PREVIEW_URL"} "$base" >"$out" 2>"$errors"
diff_status=$?
if [ "$diff_status" -eq 2 ]; then
  {
    echo "$marker"
    echo "### Calculation changes: \`$base\` → the pull request"
    echo
    echo "**The calculations could not be compared:** a site does not build. specgen says:"
    echo
    echo '```'
    head -c "$((max - 500))" "$errors"
    echo
    echo '```'
  } >"$out"
  cp "$out" "$full"
fi
cat "$out"

# 2. The verdict on the checkout: every failed claim and DANGER, new or not.
status=0
if [ "$diff_status" -eq 2 ]; then
  cat "$errors" >&2
  status=2
else
  $specgen check -C "$site" >/dev/null 2>&1
  status=$?
fi

# 3. Post the report, then exit with the verdict.
warn() { echo "calc-diff.sh: $*" >&2; }
if [ -n "${GITHUB_STEP_SUMMARY:-}" ]; then
  cat "$out" >>"$GITHUB_STEP_SUMMARY" || warn "writing the job summary failed"
fi
if [ -n "${GH_PR:-}" ]; then
  repo=${GITHUB_REPOSITORY:?GH_PR needs GITHUB_REPOSITORY (owner/name)}
  id=$(gh api --paginate "repos/$repo/issues/$GH_PR/comments" \
    --jq ".[] | select(.body | startswith(\"$marker\")) | .id" | head -n 1)
  if [ -n "$id" ]; then
    gh api -X PATCH "repos/$repo/issues/comments/$id" -F "body=@$out" >/dev/null || warn "editing comment $id failed"
  else
    gh api "repos/$repo/issues/$GH_PR/comments" -F "body=@$out" >/dev/null || warn "posting the comment failed"
  fi
elif [ -n "${POST_COMMENT:-}" ]; then
  $POST_COMMENT "$out" || warn "posting the comment failed"
fi
exit "$status"
