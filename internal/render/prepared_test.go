package render

import (
	"bytes"
	"fmt"
	"testing"

	"github.com/yuin/goldmark/util"
)

// preparedPage holds one of each kind of hole, values in a heading, in a
// table and in an image's text, a malformed reference and code.
const preparedPage = "# Stage =[low.bore mm]\n\n" +
	"## Sweep of =[low.swept_volume cm3]\n\nIt sweeps =[low.swept_volume cm3]; =[low] is no reference.\n\n" +
	"| a | b |\n|---|---|\n| =[low.speed rpm] | ![at =[low.speed rpm]](p.png) |\n\n" +
	"```calc\nid = \"low\"\nkind = \"compressor\"\n```\n\n" +
	"```chart\nlow.pv\nlow.torque\n```\n\n" +
	"```cautions\n```\n\n" +
	"```go\npackage main\n```\n"

// TestPreparedMatchesRender: a page prepared once and filled writes what
// rendering its parsed tree, with the same values set on the nodes, does;
// its headings and text have their values in the same places.
func TestPreparedMatchesRender(t *testing.T) {
	md := New()
	value := func(i int) string { return fmt.Sprintf("%d.5 units", i) }
	charts := []*DrawnChart{{HTML: "<svg>pv</svg>"}, {HTML: "<svg>torque</svg>"}}
	items := []CautionItem{{Block: "low", BlockTitle: "Low stage", Href: "#calc-low"}}

	doc := md.Parse([]byte(preparedPage), 4)
	doc.TakeTitle()
	for i, r := range doc.ValueRefs() {
		r.Shown, r.Href = value(i), fmt.Sprintf("#v%d", i)
	}
	for _, c := range doc.ChartRefs() {
		c.Charts = charts
	}
	for _, c := range doc.CautionLists() {
		c.Items = items
	}
	want, err := md.Render(doc)
	if err != nil {
		t.Fatal(err)
	}

	doc = md.Parse([]byte(preparedPage), 4)
	doc.TakeTitle()
	refs := doc.ValueRefs()
	prep, err := md.Prepare(doc)
	if err != nil {
		t.Fatal(err)
	}
	holes := map[HoleKind]int{}
	var got bytes.Buffer
	err = prep.Write(&got, func(w util.BufWriter, h Hole) {
		holes[h.Kind]++
		switch h.Kind {
		case HoleValue:
			r := refs[h.Index]
			WriteValue(w, r.Block, r.Result, value(h.Index), fmt.Sprintf("#v%d", h.Index))
		case HoleBlock:
			if h.Line != 15 || h.Level != 3 {
				t.Errorf("block hole at line %d, level %d; want the fence's file line 15, under an h2: level 3", h.Line, h.Level)
			}
			WriteBlockAt(w, nil, h.Source, nil, nil, h.Level)
		case HoleChartRef:
			WriteChartRef(w, charts)
		case HoleCautions:
			WriteCautionList(w, items)
		}
	})
	if err != nil {
		t.Fatal(err)
	}
	if got.String() != string(want) {
		t.Errorf("prepared and filled:\n%s\nrendered from the tree:\n%s", got.String(), want)
	}
	if !bytes.Contains(got.Bytes(), []byte("=[low] is no reference")) {
		t.Errorf("the malformed reference is not written as it stands:\n%s", got.String())
	}
	// The image's text is written by goldmark itself, so three values
	// leave a hole; the title's was taken with it.
	if holes[HoleValue] != 3 || holes[HoleBlock] != 1 || holes[HoleChartRef] != 1 || holes[HoleCautions] != 1 {
		t.Errorf("holes by kind %v; want 3 values, 1 block, 1 chart fence, 1 caution list", holes)
	}
	headings := prep.HeadingsWith(value)
	if len(headings) != 1 || headings[0].Text != "Sweep of 1.5 units" || headings[0].ID == "" {
		t.Errorf("headings %+v; want one, \"Sweep of 1.5 units\" with its id", headings)
	}
	text, err := prep.SearchText(value)
	if err != nil {
		t.Fatal(err)
	}
	for _, part := range []string{"Sweep of 1.5 units\n", "It sweeps 2.5 units; ", "3.5 units"} {
		if !bytes.Contains([]byte(text), []byte(part)) {
			t.Errorf("text %q lacks %q", text, part)
		}
	}
}
