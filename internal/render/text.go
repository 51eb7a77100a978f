package render

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// WriteText writes an evaluated block as plain text for a terminal:
// inputs, results with their working, claims and cautions.
func WriteText(w io.Writer, e *calc.Evaluated) {
	b := e.Block
	title := b.Title
	if title == "" {
		title = b.ID
	}
	fmt.Fprintf(w, "%s (%s %s)\n\nInputs\n", title, b.Kind.Name, b.ID)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	for _, in := range e.Inputs {
		value := in.Text
		if in.Dim == units.Pressure {
			value = display.PressurePair(in.Value, unitOf(in.Text), e.Ambient, e.SigFigs())
		}
		var notes []string
		switch {
		case in.Default:
			notes = append(notes, "(default)")
		case in.From != "":
			notes = append(notes, "(from "+in.From+")")
		}
		if in.Label != "" {
			notes = append(notes, in.Label)
		}
		if in.Written != "" {
			notes = append(notes, "written “"+in.Written+"”")
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\n", in.Name, value, strings.Join(notes, "; "))
	}
	_ = tw.Flush()
	fmt.Fprintln(w, "\nResults")
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	for _, r := range e.Results {
		value, err := e.Format(r.Name, "")
		if err != nil {
			value = units.Format(r.Value, e.SigFigs())
		}
		if r.Dim == units.Pressure {
			value = display.PressurePair(r.Value, e.DisplayUnit(r.Name), e.Ambient, e.SigFigs())
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", r.Name, value, r.Trace.Formula, r.Trace.Substituted)
	}
	_ = tw.Flush()
	if len(e.Claims) > 0 {
		fmt.Fprintln(w, "\nClaims")
		for _, c := range e.Claims {
			mark := "holds"
			if !c.OK {
				mark = "FAILS"
			}
			fmt.Fprintf(w, "  %-5s  %s\n", mark, c.Message)
		}
	}
	if len(e.Cautions) > 0 {
		fmt.Fprintln(w, "\nCautions")
		for _, c := range e.Cautions {
			fmt.Fprintf(w, "  %s [%s] %s\n", c.Level, c.Rule, c.Message)
		}
	}
}
