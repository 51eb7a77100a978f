package site

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// derivedSite is a page with a compressor stage and a figures block that
// totals it: derived results in both.
const derivedSite = "# Totals\n\nTwo stages need =[totals.total_power W]; each uses =[lp.specific_power kJ/m3].\n\n" +
	"```calc\nid = \"lp\"\nkind = \"compressor\"\nbore = \"60 mm\"\nstroke = \"40 mm\"\nrod_length = \"100 mm\"\n" +
	"clearance_ratio = 0.04\nspeed = \"800 rpm\"\ndischarge_pressure = \"2.2 bar\"\n\n[derive]\n" +
	"specific_power = \"shaft_power / free_air_delivery\"\n```\n\n" +
	"```calc\nid = \"totals\"\nkind = \"figures\"\n\n[derive]\ntotal_power = \"lp.shaft_power * 2\"\n```\n"

// buildDerived builds derivedSite (with the bore given) and returns its
// results.json and its page.
func buildDerived(t *testing.T, bore string) (map[string]any, string) {
	t.Helper()
	root := t.TempDir()
	page := strings.Replace(derivedSite, `bore = "60 mm"`, `bore = "`+bore+`"`, 1)
	if err := os.MkdirAll(filepath.Join(root, "content"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(root, "content", "index.md"), []byte(page), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	raw, err := os.ReadFile(filepath.Join(root, DefaultOut, "results.json"))
	if err != nil {
		t.Fatal(err)
	}
	var res map[string]any
	if err := json.Unmarshal(raw, &res); err != nil {
		t.Fatal(err)
	}
	html, err := os.ReadFile(filepath.Join(root, DefaultOut, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	return res, string(html)
}

// resultOf digs one result of one block out of results.json.
func resultOf(t *testing.T, res map[string]any, id, name string) map[string]any {
	t.Helper()
	for _, b := range res["blocks"].([]any) {
		block := b.(map[string]any)
		if block["id"] == id {
			if r, ok := block["results"].(map[string]any)[name].(map[string]any); ok {
				return r
			}
		}
	}
	t.Fatalf("results.json has no %s.%s", id, name)
	return nil
}

// TestDerivedResultsInResultsJSON: derived results are results, in SI,
// beside the model's, and equal to the expression over them.
func TestDerivedResultsInResultsJSON(t *testing.T) {
	res, _ := buildDerived(t, "60 mm")
	shaft := resultOf(t, res, "lp", "shaft_power")["value"].(float64)
	fad := resultOf(t, res, "lp", "free_air_delivery")["value"].(float64)
	total := resultOf(t, res, "totals", "total_power")
	if total["unit"] != "W" || total["value"].(float64) != 2*shaft {
		t.Errorf("total_power = %v, want %g W", total, 2*shaft)
	}
	sp := resultOf(t, res, "lp", "specific_power")
	if sp["unit"] != "J/m3" || sp["value"].(float64) != shaft/fad {
		t.Errorf("specific_power = %v, want %g J/m3", sp, shaft/fad)
	}
}

// TestDerivedResultsInProse: an inline reference shows a derived value as
// its block's table does, in the unit asked for.
func TestDerivedResultsInProse(t *testing.T) {
	res, html := buildDerived(t, "60 mm")
	total := resultOf(t, res, "totals", "total_power")["display"].(string)
	if !strings.Contains(html, ">"+total+"<") {
		t.Errorf("the page does not quote total_power as %q", total)
	}
	// 224 W over 85.3 L/min is 158 J/L = 158 kJ/m³ (1 J/L = 1 kJ/m³).
	if !strings.Contains(html, ">158 kJ/m³<") {
		t.Error("the page does not quote specific_power as 158 kJ/m³")
	}
}
