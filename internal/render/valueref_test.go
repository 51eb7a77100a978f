package render

import (
	"strings"
	"testing"
)

// TestValueRefParsing tells value references from ordinary text: which
// "=[...]" the inline parser reads, with what block, result, unit and
// line, and what stays text.
func TestValueRefParsing(t *testing.T) {
	type ref struct {
		block, result, unit string
		line                int
	}
	cases := []struct {
		name string
		src  string
		refs []ref
		html string // a substring of the rendered page (references unresolved)
	}{
		{"no dot is text", "a=[b]\n", nil, "<p>a=[b]</p>"},
		{"an assignment is text", "x = [1, 2]\n", nil, "<p>x = [1, 2]</p>"},
		{"reference with unit", "Delivery =[low.fad L/min] at speed.\n",
			[]ref{{"low", "fad", "L/min", 1}}, `Delivery <span class="sg-value" title="from calculation low.fad">`},
		{"unit with a space and a mark", "=[low.peak_torque N m] and =[low.max_pressure bar(a)]\n",
			[]ref{{"low", "peak_torque", "N m", 1}, {"low", "max_pressure", "bar(a)", 1}}, ""},
		{"at line start", "=[low.x]\n", []ref{{"low", "x", "", 1}}, `<p><span class="sg-value"`},
		{"two on a line", "LP =[bellows-lp.pressure_ratio], HP =[bellows-hp.pressure_ratio].\n",
			[]ref{{"bellows-lp", "pressure_ratio", "", 1}, {"bellows-hp", "pressure_ratio", "", 1}}, ""},
		{"spaces inside the brackets", "=[ low.x ]\n", []ref{{"low", "x", "", 1}}, ""},
		{"on a later line", "First line.\nSecond =[hp_2.swept_volume cm3].\n",
			[]ref{{"hp_2", "swept_volume", "cm3", 2}}, ""},
		{"in emphasis", "*=[low.x]*\n", []ref{{"low", "x", "", 1}}, `<em><span class="sg-value"`},
		{"in a list item", "- one\n- =[low.x]\n", []ref{{"low", "x", "", 2}}, `<li><span class="sg-value"`},
		{"in a code span", "Write `=[low.x]` to quote.\n", nil, "<code>=[low.x]</code>"},
		{"in a fenced code block", "```\n=[low.x]\n```\n", nil, "=[low.x]"},
		{"escaped", "\\=[low.x]\n", nil, "<p>=[low.x]</p>"},
		{"unclosed", "=[low.x\n", nil, "<p>=[low.x</p>"},
		{"upper-case block", "=[Low.x]\n", nil, "<p>=[Low.x]</p>"},
		{"two dots", "=[low.x.y]\n", nil, "<p>=[low.x.y]</p>"},
		{"no result", "=[low.]\n", nil, "<p>=[low.]</p>"},
		{"empty", "=[]\n", nil, "<p>=[]</p>"},
	}
	md := New()
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			const offset = 4 // front matter lines before the body
			doc := md.Parse([]byte(c.src), offset)
			got := doc.ValueRefs()
			if len(got) != len(c.refs) {
				t.Fatalf("%q: %d references, want %d", c.src, len(got), len(c.refs))
			}
			for i, r := range got {
				w := c.refs[i]
				if r.Block != w.block || r.Result != w.result || r.Unit != w.unit {
					t.Errorf("%q: reference %d = %s.%s %q, want %s.%s %q", c.src, i, r.Block, r.Result, r.Unit, w.block, w.result, w.unit)
				}
				if line := doc.Line(r.Offset); line != w.line+offset {
					t.Errorf("%q: reference %d on line %d, want %d", c.src, i, line, w.line+offset)
				}
			}
			out, err := md.Render(doc)
			if err != nil {
				t.Fatal(err)
			}
			if n := strings.Count(string(out), `class="sg-value"`); n != len(c.refs) {
				t.Errorf("%q: %d values rendered, want %d: %s", c.src, n, len(c.refs), out)
			}
			if !strings.Contains(string(out), c.html) {
				t.Errorf("%q: rendered %s, want it to contain %s", c.src, out, c.html)
			}
		})
	}
}
