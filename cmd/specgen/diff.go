package main

import (
	"fmt"
	"io"
	"net/url"
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
	previewURL := fs.String("preview-url", "", "address of HEAD's built site (https://...): each block links to its table there")
	maxBytes := fs.Int("max-bytes", 0, "cap the Markdown at this many bytes (a host's comment limit), leaving out whole blocks; 0: no cap")
	full := fs.String("full", "", "also write the whole Markdown report, uncapped, to this file")
	fs.Usage = func() {
		fmt.Fprintln(fs.Output(), "Usage: specgen diff [-C dir] [-format markdown|json] [-preview-url URL] [-max-bytes N -full FILE] BASE [HEAD]")
		fmt.Fprintln(fs.Output(), "\nBASE and HEAD are git revisions (HEAD defaults to the working tree) or two results.json files.")
		fmt.Fprintln(fs.Output(), "The Markdown starts with HEAD's failed claims and DANGER cautions, new or not.")
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
	if u, err := url.Parse(*previewURL); *previewURL != "" && (err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "") {
		fmt.Fprintf(stderr, "specgen diff: -preview-url %q is not allowed; give the address of the built site, e.g. https://example.org/pr-42/\n", *previewURL)
		return exitBadInput
	}
	if *maxBytes < 0 || (*maxBytes > 0 && *maxBytes < 1000) {
		fmt.Fprintf(stderr, "specgen diff: -max-bytes %d is not allowed; allowed: 0 (no cap) or 1000 and more\n", *maxBytes)
		return exitBadInput
	}
	if *format == "json" && (*maxBytes > 0 || *full != "") {
		fmt.Fprintln(stderr, "specgen diff: -max-bytes and -full shape the Markdown report; -format json is never capped")
		return exitBadInput
	}
	if *maxBytes > 0 && *full == "" {
		fmt.Fprintln(stderr, "specgen diff: -max-bytes leaves blocks out; give -full FILE for the whole report, which the capped one names")
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
		opts := calcdiff.MarkdownOptions{PreviewURL: *previewURL}
		if *full != "" {
			f, err := os.Create(*full)
			if err != nil {
				return report(stderr, err)
			}
			err = d.WriteMarkdown(f, opts)
			if cerr := f.Close(); err == nil {
				err = cerr
			}
			if err != nil {
				return report(stderr, err)
			}
		}
		opts.MaxBytes, opts.Rest = *maxBytes, *full
		if err := d.WriteMarkdown(stdout, opts); err != nil {
			return report(stderr, err)
		}
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
