package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/site"
)

// checkReport is the -format json output of check.
type checkReport struct {
	Version  int            `json:"version"`
	OK       bool           `json:"ok"`
	Tally    site.Tally     `json:"tally"`
	Problems []site.Problem `json:"problems"` // failed claims and unacknowledged DANGER cautions
	Notices  []site.Problem `json:"notices"`  // the other cautions, which do not fail a check
	// Errors are bad input (exit 2): the site could not be evaluated, so
	// the tally is empty. A tool reading stdout gets JSON either way.
	Errors []inputError `json:"errors"`
}

// inputError is one bad-input message of check -format json.
type inputError struct {
	File    string `json:"file"` // relative to the site root; "" when no file is to blame
	Line    int    `json:"line"` // 0 when the whole file is meant
	Message string `json:"message"`
}

// inputErrors lists err's messages for JSON, or nil when err is not bad
// input.
func inputErrors(err error) []inputError {
	var list inputerr.List
	var one *inputerr.Error
	switch {
	case errors.As(err, &list):
	case errors.As(err, &one):
		list = inputerr.List{one}
	default:
		return nil
	}
	out := make([]inputError, len(list))
	for i, e := range list {
		msg := e.Msg
		if e.Key != "" {
			msg = e.Key + ": " + msg
		}
		out[i] = inputError{File: e.File, Line: e.Line, Message: msg}
	}
	return out
}

func runCheck(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("check", "check [-C dir] [-format text|json]\n\n"+
		"Evaluates every calculation block and claim and lists failed claims and cautions, writing nothing.\n"+
		"Exit status: 0 all is well, 1 a claim fails or a DANGER caution is not acknowledged, 2 bad input.", stderr)
	dir := fs.String("C", ".", "site root: the folder holding content/")
	format := fs.String("format", "text", "output format: text or json")
	if code := parseFlags(fs, args); code >= 0 {
		return code
	}
	if *format != "text" && *format != "json" {
		fmt.Fprintf(stderr, "specgen check: -format %q is not allowed; allowed: text, json\n", *format)
		return exitBadInput
	}
	s, err := site.Load(*dir)
	if err != nil {
		if errs := inputErrors(err); *format == "json" && errs != nil {
			writeJSON(stdout, checkReport{Version: 1, Problems: []site.Problem{}, Notices: []site.Problem{}, Errors: errs})
		}
		return report(stderr, err)
	}
	problems, notices := s.Problems(), s.Notices()
	tally := s.Tally()
	if *format == "json" {
		if problems == nil {
			problems = []site.Problem{}
		}
		if notices == nil {
			notices = []site.Problem{}
		}
		if err := writeJSON(stdout, checkReport{Version: 1, OK: len(problems) == 0, Tally: tally, Problems: problems, Notices: notices, Errors: []inputError{}}); err != nil {
			return report(stderr, err)
		}
	} else {
		printProblems(stdout, problems)
		printProblems(stdout, notices)
		fmt.Fprintln(stdout, tallyLine(tally))
	}
	if len(problems) > 0 {
		return exitFailed
	}
	return exitOK
}

func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false) // messages hold "<=" and "->": keep them readable
	return enc.Encode(v)
}

// tallyLine is the one-line summary check and build end with.
func tallyLine(t site.Tally) string {
	return fmt.Sprintf("%s, %s, %s (%d failed), %s (%d DANGER not acknowledged)",
		count(t.Pages, "page"), count(t.Blocks, "block"), count(t.Claims, "claim"), t.FailedClaims,
		count(t.Cautions, "caution"), t.Dangers)
}

// count writes "1 block", "2 blocks".
func count(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// printProblems writes one line per failed claim or DANGER caution.
func printProblems(w io.Writer, problems []site.Problem) {
	for _, p := range problems {
		if p.Type == "caution" {
			fmt.Fprintf(w, "%s:%d: %s: %s [%s]: %s\n", p.File, p.Line, p.Block, p.Level, p.Name, p.Message)
			continue
		}
		fmt.Fprintf(w, "%s:%d: %s: %s\n", p.File, p.Line, p.Block, p.Message)
	}
}
