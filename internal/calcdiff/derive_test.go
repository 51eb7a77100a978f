package calcdiff

import (
	"os"
	"path/filepath"
	"testing"
)

// TestDiffCarriesDerivedValues: a changed input shows its effect on the
// derived values that use it, in this block and in another.
func TestDiffCarriesDerivedValues(t *testing.T) {
	page := func(bore string) string {
		return "# Totals\n\n```calc\nid = \"lp\"\nkind = \"compressor\"\nbore = \"" + bore + "\"\nstroke = \"40 mm\"\n" +
			"rod_length = \"100 mm\"\nclearance_ratio = 0.04\nspeed = \"800 rpm\"\ndischarge_pressure = \"2.2 bar\"\n\n" +
			"```\n\n" +
			"```calc\nid = \"totals\"\nkind = \"figures\"\nunrelated = \"2 kW\"\n\n[derive]\n" +
			"total_power = \"lp.shaft_power * 2\"\nspare = \"unrelated * 2\"\n```\n"
	}
	evaluate := func(bore string) string {
		root := t.TempDir()
		if err := os.MkdirAll(filepath.Join(root, "content"), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(root, "content", "index.md"), []byte(page(bore)), 0o644); err != nil {
			t.Fatal(err)
		}
		return root
	}
	base, err := ResultsOf(evaluate("60 mm"))
	if err != nil {
		t.Fatal(err)
	}
	head, err := ResultsOf(evaluate("66 mm"))
	if err != nil {
		t.Fatal(err)
	}
	d := Compare(base, head)
	moved := map[string]*float64{}
	for _, b := range d.Changed {
		for _, r := range b.Results {
			moved[b.ID+"."+r.Name] = r.Change
		}
	}
	// Power grows with the bore squared, 1.21 times, and the total with it.
	if c := moved["totals.total_power"]; c == nil || *c < 0.15 || *c > 0.25 {
		t.Errorf("totals.total_power moved by %v; want about +21 %%", c)
	}
	if _, ok := moved["totals.spare"]; ok {
		t.Error("totals.spare, which uses no changed value, is listed as moved")
	}
}
