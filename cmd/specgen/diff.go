package main

import (
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calcdiff"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/results"
	"github.com/millrace-workshop/specgen/internal/site"
)

func runDiff(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("diff", "diff [-C dir] [-format markdown|json] BASE [HEAD]", stderr)
	dir := fs.String("C", ".", "site root: the folder holding content/")
	format := fs.String("format", "markdown", "output format: markdown or json")
	fs.Usage = func() {
		fmt.Fprintln(fs.Output(), "Usage: specgen diff [-C dir] [-format markdown|json] BASE [HEAD]")
		fmt.Fprintln(fs.Output(), "\nBASE and HEAD are git revisions (HEAD defaults to the working tree) or two results.json files.")
		fmt.Fprintln(fs.Output(), "Exit status 1 when a claim newly fails or a DANGER caution newly appears.\n\nOptions:")
		fs.PrintDefaults()
	}
	pos, code := parseOnly(fs, args)
	if code >= 0 {
		return code
	}
	if *format != "markdown" && *format != "json" {
		fmt.Fprintf(stderr, "specgen diff: -format %q is not allowed; allowed: markdown, json\n", *format)
		return exitBadInput
	}
	if len(pos) < 1 || len(pos) > 2 {
		if len(pos) == 0 {
			fmt.Fprintln(stderr, "specgen diff: give BASE, a git revision or a results.json file (and HEAD to compare it with, else the working tree)")
		} else {
			fmt.Fprintf(stderr, "specgen diff: unexpected argument %q; give BASE and at most HEAD\n", pos[2])
		}
		fs.Usage()
		return exitBadInput
	}
	base, err := resultsFor(*dir, pos[0])
	if err != nil {
		return report(stderr, err)
	}
	headName := "working tree"
	var head *results.File
	if len(pos) == 2 {
		headName = pos[1]
		head, err = resultsFor(*dir, pos[1])
	} else {
		head, err = calcdiff.ResultsOf(*dir)
	}
	if err != nil {
		return report(stderr, err)
	}
	d := calcdiff.Compare(base, head)
	d.Base, d.Head = pos[0], headName
	for _, side := range []struct {
		name string
		f    *results.File
		verb string
	}{{d.Base, base, "added"}, {d.Head, head, "removed"}} {
		if side.f.NoSite {
			d.Notes = append(d.Notes, fmt.Sprintf("There is no site at %s (no content/ folder in %s), so every block counts as %s.", side.name, *dir, side.verb))
		}
	}
	if *format == "json" {
		if err := d.WriteJSON(stdout); err != nil {
			return report(stderr, err)
		}
	} else {
		d.WriteMarkdown(stdout)
	}
	if d.Failed() {
		return exitFailed
	}
	return exitOK
}

// resultsFor reads a results.json file, or evaluates the site at a git
// revision.
func resultsFor(dir, arg string) (*results.File, error) {
	if strings.HasSuffix(arg, ".json") {
		if _, err := os.Stat(arg); err == nil {
			return results.Read(arg)
		}
		if !calcdiff.IsRevision(dir, arg) {
			return nil, &inputerr.Error{Msg: fmt.Sprintf("%s: no such file (nor a git revision); give a results.json file, such as the dist/results.json that specgen build writes", arg)}
		}
	}
	return calcdiff.ResultsAt(dir, arg)
}

func runInit(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("init", "init DIR\n\n"+
		"Writes specgen.toml and content/ with a home page and an example page (a compressor block, its relief\n"+
		"valve, claims and a chart) into DIR, an empty or new folder. Then: specgen build -C DIR.", stderr)
	pos, code := parseOnly(fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) != 1 {
		fmt.Fprintln(stderr, "specgen init: give the folder for the new site, e.g. specgen init docs")
		return exitBadInput
	}
	files, err := site.Init(pos[0])
	if err != nil {
		return report(stderr, err)
	}
	for _, f := range files {
		fmt.Fprintf(stdout, "wrote %s\n", f)
	}
	fmt.Fprintf(stdout, "next: specgen build -C %s, then open %s\n", pos[0], pos[0]+"/dist/index.html")
	return exitOK
}
