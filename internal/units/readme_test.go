package units

import (
	"bytes"
	"flag"
	"fmt"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the README's unit list from the unit table")

// The README's unit list lies between these lines.
const (
	readmeUnitsBegin = "<!-- units: generated from internal/units/table.go by go test ./internal/units -run README -update; do not edit -->\n"
	readmeUnitsEnd   = "<!-- end of units -->\n"
)

// unitList writes the table of units the README shows: every quantity of
// the unit table, in its order, with each unit's other spellings. The
// marked forms of a pressure unit are listed with it.
func unitList() string {
	var dims []Dimension
	rows := map[Dimension][]string{}
	spellings := map[string][]string{} // plain symbol → spellings, marked forms included
	for _, d := range unitTable {
		if d.Symbol == "" {
			continue
		}
		base, mark := pressureMark(d.Symbol)
		if mark == "(g)" || mark == "(a)" {
			spellings[base] = append(spellings[base], append([]string{d.Symbol}, d.aliases...)...)
			continue
		}
		if !slices.Contains(dims, d.Dim) {
			dims = append(dims, d.Dim)
		}
		rows[d.Dim] = append(rows[d.Dim], d.Symbol)
		spellings[d.Symbol] = append(spellings[d.Symbol], d.aliases...)
	}
	var b strings.Builder
	b.WriteString("| quantity | units (and other spellings) |\n|---|---|\n")
	for _, dim := range dims {
		var cells []string
		for _, sym := range rows[dim] {
			cell := code(sym)
			if alt := spellings[sym]; len(alt) > 0 {
				quoted := make([]string, len(alt))
				for i, a := range alt {
					quoted[i] = code(a)
				}
				cell += " (" + strings.Join(quoted, ", ") + ")"
			}
			cells = append(cells, cell)
		}
		fmt.Fprintf(&b, "| %s | %s |\n", dim, strings.Join(cells, ", "))
	}
	var either []string
	for _, key := range slices.Sorted(maps.Keys(ambiguous)) {
		if _, inTable := unitIndex[key]; !inTable {
			either = append(either, code(key))
		}
	}
	fmt.Fprintf(&b, "\nRead as the quantity the key takes (a torque or an energy; degrees after a temperature): %s. "+
		"A space in a spelling stands for `·`, `*` or `-` too.\n", strings.Join(either, ", "))
	return b.String()
}

// code writes a spelling as Markdown code, a pipe escaped for the table.
func code(s string) string {
	return "`" + strings.ReplaceAll(s, "|", `\|`) + "`"
}

// TestREADMEUnits: the README's unit list is the one the table makes;
// -update rewrites it.
func TestREADMEUnits(t *testing.T) {
	path := filepath.Join("..", "..", "README.md")
	readme, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	begin := bytes.Index(readme, []byte(readmeUnitsBegin))
	end := bytes.Index(readme, []byte(readmeUnitsEnd))
	if begin < 0 || end < begin {
		t.Fatalf("README.md lacks the lines that enclose the unit list:\n%s%s", readmeUnitsBegin, readmeUnitsEnd)
	}
	from := begin + len(readmeUnitsBegin)
	want := unitList()
	if string(readme[from:end]) == want {
		return
	}
	if !*update {
		t.Fatalf("README.md's unit list differs from the unit table; run go test ./internal/units -run README -update and review the diff")
	}
	out := append(append(append([]byte{}, readme[:from]...), want...), readme[end:]...)
	if err := os.WriteFile(path, out, 0o644); err != nil {
		t.Fatal(err)
	}
}
