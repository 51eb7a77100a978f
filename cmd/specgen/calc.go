package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/models"
	"github.com/millrace-workshop/specgen/internal/render"
)

func runCalc(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("calc", "calc [-sig N] FILE.toml", stderr)
	sig := fs.Int("sig", 3, "significant figures of the values shown (2 to 8)")
	pos, code := parseOnly(fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) != 1 {
		fmt.Fprintln(stderr, "specgen calc: give one TOML file holding one calculation block")
		fs.Usage()
		return exitBadInput
	}
	if *sig < 2 || *sig > 8 {
		fmt.Fprintf(stderr, "specgen calc: -sig %d is out of range; allowed: 2 to 8\n", *sig)
		return exitBadInput
	}
	file := pos[0]
	// A page parses as TOML (a heading is a comment) and would only be
	// told that it lacks an id.
	if strings.EqualFold(filepath.Ext(file), ".md") {
		fmt.Fprintf(stderr, "specgen calc: %s is a Markdown page; calc reads one block's TOML (the lines inside a calc fence) from its own file. To evaluate the blocks of pages, run specgen check\n", file)
		return exitBadInput
	}
	src, err := os.ReadFile(file)
	if err != nil {
		fmt.Fprintln(stderr, "specgen calc:", err)
		return exitBadInput
	}
	cat, err := models.NewCatalog(nil)
	if err != nil {
		fmt.Fprintln(stderr, "specgen calc:", err)
		return exitBadInput
	}
	b, parseErr := cat.ParseBlock(file, 0, string(src))
	if b == nil {
		fmt.Fprintln(stderr, parseErr)
		return exitBadInput
	}
	// A broken block's inputs are checked too: every problem in one run.
	set, err := cat.Evaluate([]*calc.Block{b}, calc.Options{SigFigs: *sig})
	if all := inputerr.Join(parseErr, err); all != nil {
		fmt.Fprintln(stderr, all)
		return exitBadInput
	}
	e, _ := set.Lookup(b.ID)
	render.WriteText(stdout, e)
	if e.Failed() {
		return exitFailed
	}
	for _, c := range e.Cautions {
		if c.Level >= calc.Danger && c.Acknowledged == "" {
			return exitFailed
		}
	}
	return exitOK
}

func runExplain(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("explain", "explain [KIND|materials|cautions]\n\n"+
		"With no argument, lists the kinds of calculation block. With a kind, prints its model, assumptions and\n"+
		"limits, its inputs with defaults and allowed ranges, its results and charts. 'materials' lists the\n"+
		"built-in materials with their sources; 'cautions' lists the caution rules.", stderr)
	pos, code := parseOnly(fs, args)
	if code >= 0 {
		return code
	}
	cat, err := models.NewCatalog(nil)
	if err != nil {
		fmt.Fprintln(stderr, "specgen explain:", err)
		return exitBadInput
	}
	switch len(pos) {
	case 0:
		models.ExplainKinds(stdout, cat)
		return exitOK
	case 1:
		switch pos[0] {
		case "cautions":
			models.ExplainCautions(stdout, cat)
			return exitOK
		case "materials":
			models.ExplainMaterials(stdout, models.DefaultEnv())
			return exitOK
		}
		k, ok := cat.Kind(pos[0])
		if !ok {
			msg := fmt.Sprintf("specgen explain: unknown kind %q", pos[0])
			if s := calc.Suggest(pos[0], cat.KindNames()); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			}
			fmt.Fprintln(stderr, msg)
			models.ExplainKinds(stderr, cat)
			return exitBadInput
		}
		models.ExplainKind(stdout, cat, k)
		return exitOK
	}
	fmt.Fprintln(stderr, "specgen explain: give at most one kind")
	return exitBadInput
}
