package calcdiff

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/results"
)

// stage is a results.json block of a compressor stage whose free air
// delivery (m3/s) is claimed as written.
func stage(id string, fad float64, claim string, ok bool) results.Block {
	return results.Block{ID: id, Kind: "compressor", Page: "content/pumps/" + id + ".md", Line: 12,
		Inputs:  map[string]results.Input{"speed": {Value: fad * 1e5, Unit: "rad/s", Text: fmt.Sprintf("%g rpm", fad*1e6)}},
		Results: map[string]results.Result{"free_air_delivery": {Value: fad, Unit: "m3/s", Display: fmt.Sprintf("%.3g L/min", fad*6e4)}},
		Expect:  []results.Claim{{Name: "free_air_delivery", Claim: claim, OK: ok, Message: "free_air_delivery: claim " + claim}},
	}
}

// TestWeakenedClaim: a claim whose text alone changed shows both texts,
// whether each holds, and that it now allows more.
func TestWeakenedClaim(t *testing.T) {
	base := &results.File{Blocks: []results.Block{stage("lp", 1.3e-3, ">= 80 L/min", false)}, Commit: "a1b2c3d4e5f6"}
	head := &results.File{Blocks: []results.Block{stage("lp", 1.3e-3, ">= 70 L/min", true)}, Commit: "0f9e8d7c6b5a",
		Quotes: map[string][]results.Place{"lp.free_air_delivery": {{File: "content/index.md", Line: 4}}}}
	d := Compare(base, head)
	d.Base, d.Head = "origin/main", "HEAD"
	var b bytes.Buffer
	if err := d.WriteMarkdown(&b, MarkdownOptions{PreviewURL: "https://preview.example.invalid/pr-9/"}); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"### Calculation changes: `origin/main` (a1b2c3d4e5f6) → `HEAD` (0f9e8d7c6b5a)",
		"#### [`lp`](https://preview.example.invalid/pr-9/pumps/lp.html#calc-lp) (compressor, content/pumps/lp.md:12)",
		"- Claim `free_air_delivery` newly holds, weakened: was `>= 80 L/min` (failed), now `>= 70 L/min` (holds)",
	} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("report lacks %q:\n%s", want, b.String())
		}
	}
}

// TestQuotedValues: the report names the lines of prose that quote a
// changed value, and only those, linked to the built page when there is
// one.
func TestQuotedValues(t *testing.T) {
	base := &results.File{Blocks: []results.Block{stage("lp", 1.3e-3, ">= 70 L/min", true)}}
	head := &results.File{Blocks: []results.Block{stage("lp", 1.4e-3, ">= 70 L/min", true)},
		Quotes: map[string][]results.Place{"lp.free_air_delivery": {{File: "content/index.md", Line: 4}}, "lp.swept_volume": {{File: "content/a.md", Line: 2}}}}
	d := Compare(base, head)
	var b bytes.Buffer
	if err := d.WriteMarkdown(&b, MarkdownOptions{PreviewURL: "https://preview.example.invalid/"}); err != nil {
		t.Fatal(err)
	}
	// swept_volume did not change: content/a.md need not be reread.
	want := "Prose quoting a changed value, to reread: [content/index.md:4](https://preview.example.invalid/index.html) (`free_air_delivery`).\n"
	if !strings.Contains(b.String(), want) {
		t.Errorf("report lacks %q:\n%s", want, b.String())
	}
}

// TestCappedReport: past the cap whole blocks are left out and counted,
// and the note names the file with the whole report.
func TestCappedReport(t *testing.T) {
	var base, head results.File
	for i := range 200 {
		id := fmt.Sprintf("stage-%03d", i)
		base.Blocks = append(base.Blocks, stage(id, 1e-3, ">= 50 L/min", true))
		head.Blocks = append(head.Blocks, stage(id, 2e-3, ">= 50 L/min", true))
	}
	d := Compare(&base, &head)
	d.Base, d.Head = "main", "HEAD"
	var whole, capped bytes.Buffer
	if err := d.WriteMarkdown(&whole, MarkdownOptions{}); err != nil {
		t.Fatal(err)
	}
	if err := d.WriteMarkdown(&capped, MarkdownOptions{MaxBytes: 20000, Rest: "calc-diff-full.md"}); err != nil {
		t.Fatal(err)
	}
	if whole.Len() <= 20000 {
		t.Fatalf("the whole report is %d bytes; the test needs more than the cap", whole.Len())
	}
	if capped.Len() > 20000 {
		t.Errorf("capped report is %d bytes, above the cap of 20000", capped.Len())
	}
	shown := strings.Count(capped.String(), "\n#### ")
	note := fmt.Sprintf("_%d blocks more not shown: this report is capped at 20000 bytes. The whole report is the file `calc-diff-full.md`", 200-shown)
	if shown == 0 || !strings.Contains(capped.String(), note) {
		t.Errorf("%d blocks shown; capped report lacks %q:\n%s", shown, note, capped.String()[capped.Len()-400:])
	}
	if !strings.HasPrefix(capped.String(), Marker+"\n") {
		t.Error("the capped report does not start with the marker")
	}
}

// TestJSONNumbers: the JSON diff carries the SI values before and after.
func TestJSONNumbers(t *testing.T) {
	d := Compare(&results.File{Blocks: []results.Block{stage("lp", 1e-3, ">= 50 L/min", true)}},
		&results.File{Blocks: []results.Block{stage("lp", 1.5e-3, ">= 50 L/min", true)}})
	var b bytes.Buffer
	if err := d.WriteJSON(&b); err != nil {
		t.Fatal(err)
	}
	var got struct {
		Changed []struct {
			Line    int `json:"line"`
			Results []struct {
				Name   string   `json:"name"`
				Before *float64 `json:"before_value"`
				After  *float64 `json:"after_value"`
			} `json:"results"`
		} `json:"changed"`
	}
	if err := json.Unmarshal(b.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Changed) != 1 || got.Changed[0].Line != 12 || len(got.Changed[0].Results) != 1 {
		t.Fatalf("changed: %+v\n%s", got.Changed, b.String())
	}
	r := got.Changed[0].Results[0]
	if r.Before == nil || r.After == nil || *r.Before != 1e-3 || *r.After != 1.5e-3 {
		t.Errorf("free_air_delivery before %v, after %v; want 0.001 and 0.0015", r.Before, r.After)
	}
}
