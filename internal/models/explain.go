package models

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/units"
)

// ExplainKinds writes the list of kinds with their one-line summaries.
func ExplainKinds(w io.Writer, cat *calc.Catalog) {
	fmt.Fprintln(w, "Kinds of calculation block (specgen explain KIND for one):")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	for _, name := range cat.KindNames() {
		k, _ := cat.Kind(name)
		fmt.Fprintf(tw, "  %s\t%s\n", k.Name, k.Summary)
	}
	_ = tw.Flush()
	fmt.Fprintln(w, "\nEvery block also takes: id (required), kind (required), title, ambient_pressure (absolute, default 1 atm),")
	fmt.Fprintln(w, "[expect] claims such as displacement = \"22.5 cm3 ± 2%\", [show] outputs = [\"name unit\", ...],")
	fmt.Fprintln(w, "[acknowledge] rule-id = \"reason\" to accept a caution (it stays on the page with the reason), and [derive]")
	fmt.Fprintln(w, "name = \"expression\" for results of its own (specgen explain figures says how).")
	fmt.Fprintln(w, "\nAlso: specgen explain materials, specgen explain cautions.")
}

// ExplainCautions writes the caution rules.
func ExplainCautions(w io.Writer, cat *calc.Catalog) {
	fmt.Fprintln(w, "Caution rules (signal words after ANSI Z535: NOTICE, CAUTION, WARNING, DANGER).")
	fmt.Fprintln(w, "An unacknowledged DANGER makes check and build -strict exit 1.")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	for _, r := range cat.Rules() {
		fmt.Fprintf(tw, "  %s\tup to %s\t%s\n", r.ID, r.Level, r.Summary)
	}
	_ = tw.Flush()
	fmt.Fprintf(w, "\nEvery page with a pressure calculation also carries the standard caution:\n  %s\n", StandardCaution)
	fmt.Fprintf(w, "or, when all of them are vacuum calculations:\n  %s\n", StandardVacuumCaution)
}

// ExplainMaterials writes the materials of env with their main properties.
func ExplainMaterials(w io.Writer, env *Env) {
	fmt.Fprintln(w, "Materials (typical values: verify for your material; add or override under [materials] in specgen.toml):")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "  name\tclass\ttensile\tyield\tcode S\tservice limit\tminimum factor\tsource")
	for _, name := range env.Materials.Names() {
		m, _ := env.Materials.Lookup(name)
		yield := "-"
		if m.YieldStrength > 0 {
			yield = units.Format(m.YieldStrength/1e6, 3) + " MPa"
		}
		class := string(m.Class)
		if m.Printable {
			class += ", printable"
		}
		code := "-"
		if m.Class != Plastic {
			code = units.Format(codeStress(m)/1e6, 3) + " MPa"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s MPa\t%s\t%s\t%s °C\t%s\t%s\n", m.Name, class, units.Format(m.TensileStrength/1e6, 3), yield, code,
			units.Format(m.TemperatureLimit()-273.15, 3), units.Format(env.Safety.MinimumFor(m), 2), m.Source)
	}
	_ = tw.Flush()
	fmt.Fprintln(w, "\nservice limit: the continuous-use temperature (common practice), or the heat deflection temperature when lower,")
	fmt.Fprintln(w, "that the hot-discharge caution holds discharge temperatures against; minimum factor: the site's minimum safety")
	fmt.Fprintln(w, "factor for the material's class (specgen.toml [safety]); a dash under yield: no yield point, so safety factors")
	fmt.Fprintln(w, "use the tensile strength; code S: the allowable stress of the code figures (code_allowable_pressure), the row's")
	fmt.Fprintln(w, "allowable_stress or the lesser of tensile/3.5 and 2/3 of yield; a dash: a plastic, which gets no code figure.")
	fmt.Fprintln(w, "\nOther names a block may use (case, spaces and underscores do not matter):")
	for _, name := range env.Materials.Names() {
		if m, _ := env.Materials.Lookup(name); len(m.Aliases) > 0 {
			fmt.Fprintf(w, "  %s: %s\n", name, strings.Join(m.Aliases, ", "))
		}
	}
}

// ExplainKind writes one kind's documentation: the model, its inputs with
// defaults and units, and its results with units and meanings.
func ExplainKind(w io.Writer, cat *calc.Catalog, k *calc.Kind) {
	fmt.Fprintf(w, "%s: %s\n\n", k.Name, k.Summary)
	fmt.Fprintln(w, strings.TrimSpace(k.Doc))
	if k.FreeInputs {
		return
	}
	fmt.Fprintln(w, "\nInputs (pressures are gauge unless marked absolute: \"bar(a)\", \"psia\"; \"atm\" is absolute):")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "  name\tdefault\tunits\tmeaning")
	for _, in := range k.Inputs {
		def := in.Default
		if def != "" && in.DefaultWith != "" {
			def += " (with " + in.DefaultWith + ")"
		}
		switch {
		case def == "" && in.Optional:
			def = "(optional)"
		case def == "":
			def = "(required)"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", in.Name, def, inputHint(cat, in), in.Meaning)
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

// inputHint says what an input takes: units, a block id or a name.
func inputHint(cat *calc.Catalog, in calc.InputSpec) string {
	switch in.Type {
	case calc.Link:
		return "block id" + linkKinds(cat, in)
	case calc.LinkList:
		return "list of block ids" + linkKinds(cat, in)
	case calc.Name:
		return "name"
	}
	hint := in.Dim.String() + ": " + in.Dim.Examples()
	if in.Dim == units.Dimensionless {
		hint = "number"
	}
	if in.List {
		hint += "; one value, or a list"
	}
	return hint
}

func linkKinds(cat *calc.Catalog, in calc.InputSpec) string {
	if in.LinkRoles == 0 {
		return ""
	}
	return " (" + strings.Join(cat.KindsAccepted(in), ", ") + ")"
}
