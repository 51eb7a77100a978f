package calc

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"specgen/internal/units"
)

// ExplainKinds writes the list of kinds with their one-line summaries.
func ExplainKinds(w io.Writer) {
	fmt.Fprintln(w, "Kinds of calculation block (specgen explain KIND for one):")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	for _, name := range KindNames() {
		k, _ := LookupKind(name)
		fmt.Fprintf(tw, "  %s\t%s\n", k.Name, k.Summary)
	}
	_ = tw.Flush()
	fmt.Fprintln(w, "\nEvery block also takes: id (required), kind (required), title, ambient_pressure (absolute, default 1 atm),")
	fmt.Fprintln(w, "[expect] claims such as displacement = \"22.5 cm3 ± 2%\", and [show] outputs = [\"name unit\", ...].")
}

// Explain writes one kind's documentation: the model, its inputs with
// defaults and units, and its results with units and meanings.
func (k *Kind) Explain(w io.Writer) {
	fmt.Fprintf(w, "%s: %s\n\n", k.Name, k.Summary)
	fmt.Fprintln(w, strings.TrimSpace(k.Doc))
	fmt.Fprintln(w, "\nInputs (pressures are gauge unless marked absolute: \"bar(a)\", \"psia\"; \"atm\" is absolute):")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "  name\tdefault\tunits\tmeaning")
	for _, in := range k.Inputs {
		def := in.Default
		switch {
		case def == "" && in.Optional:
			def = "(optional)"
		case def == "":
			def = "(required)"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", in.Name, def, unitsHint(in.Dim), in.Meaning)
	}
	_ = tw.Flush()
	fmt.Fprintln(w, "\nResults (results.json holds SI values; pressures absolute):")
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "  name\tshown in\tSI\tmeaning")
	for _, r := range k.Results {
		shown := r.Unit
		if shown == "" {
			shown = "-"
		}
		si := units.DefaultUnit(r.Dim)
		if r.Dim == units.Pressure {
			si = "Pa(a)"
		}
		if si == "" {
			si = "-"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", r.Name, shown, si, r.Meaning)
	}
	_ = tw.Flush()
	if len(k.Charts) > 0 {
		fmt.Fprintf(w, "\nCharts ([show] charts): %s\n", strings.Join(k.Charts, ", "))
	}
}

func unitsHint(d units.Dimension) string {
	if d == units.Dimensionless {
		return "number"
	}
	return d.String() + ": " + d.Examples()
}
