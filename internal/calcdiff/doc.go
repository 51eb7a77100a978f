// Package calcdiff compares the calculations of two evaluations of a site
// (two results.json files, two git revisions, or one of them and the
// working tree): blocks added, removed, renamed or changed, claims that
// newly fail and DANGER cautions that newly appear, written as Markdown
// for a pull request or as JSON.
package calcdiff
