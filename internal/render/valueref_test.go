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
		{"an assignment is text", "x = [1, 2]\n", nil, "<p>x = [1, 2]</p>"},
		{"equals then link is text", "a = [b](c.html)\n", nil, `<p>a = <a href="c.html">b</a></p>`},
		{"equals alone is text", "a == b, c=d\n", nil, "<p>a == b, c=d</p>"},
		{"reference with unit", "Delivery =[low.fad L/min] at speed.\n",
			[]ref{{"low", "fad", "L/min", 1}}, `Delivery <span class="sg-value" title="from calculation low.fad">`},
		{"unit with a space and a mark", "=[low.peak_torque N m] and =[low.max_pressure bar(a)]\n",
			[]ref{{"low", "peak_torque", "N m", 1}, {"low", "max_pressure", "bar(a)", 1}}, ""},
		{"at line start", "=[low.x]\n", []ref{{"low", "x", "", 1}}, `<p><span class="sg-value"`},
		{"two on a line", "LP =[bellows-lp.pressure_ratio], HP =[bellows-hp.pressure_ratio].\n",
			[]ref{{"bellows-lp", "pressure_ratio", "", 1}, {"bellows-hp", "pressure_ratio", "", 1}}, ""},
		{"spaces inside the brackets", "=[ low.x ]\n", []ref{{"low", "x", "", 1}}, ""},
		{"no-break space before the unit", "=[low.fad\u00a0L/min]\n", []ref{{"low", "fad", "L/min", 1}}, ""},
		{"thin spaces", "=[\u2009low.fad\u2009cm3\u202f]\n", []ref{{"low", "fad", "cm3", 1}}, ""},
		{"on a later line", "First line.\nSecond =[hp_2.swept_volume cm3].\n",
			[]ref{{"hp_2", "swept_volume", "cm3", 2}}, ""},
		{"in emphasis", "*=[low.x]*\n", []ref{{"low", "x", "", 1}}, `<em><span class="sg-value"`},
		{"in a list item", "- one\n- =[low.x]\n", []ref{{"low", "x", "", 2}}, `<li><span class="sg-value"`},
		{"in a code span", "Write `=[low.x]` to quote.\n", nil, "<code>=[low.x]</code>"},
		{"in a fenced code block", "```\n=[low.x]\n```\n", nil, "=[low.x]"},
		{"escaped", "\\=[low.x]\n", nil, "<p>=[low.x]</p>"},
		{"escaped, malformed", "\\=[low]\n", nil, "<p>=[low]</p>"},
		{"in a code span, malformed", "`=[]` and `=[a.b.c]`\n", nil, "<code>=[]</code> and <code>=[a.b.c]</code>"},
	}
	md := New()
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			const offset = 4 // front matter lines before the body
			doc := md.Parse([]byte(c.src), offset)
			got := doc.ValueRefs()
			for _, r := range got {
				if r.Problem != "" {
					t.Errorf("%q: %s: %s", c.src, r.Written, r.Problem)
				}
			}
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

// TestMalformedValueRefs: every "=[...]" in prose that is no well-formed
// reference is read as one with a Problem, what was written and a guess at
// what was meant, and renders (unchecked) as the text written.
func TestMalformedValueRefs(t *testing.T) {
	cases := []struct {
		src, written, problem string
		block, result, unit   string // the guess; block "-": not checked
	}{
		{"It is =[a] here.\n", "=[a]", "names a block but no result", "a", "", ""},
		{"a=[b]\n", "=[b]", "names a block but no result", "b", "", ""},
		{"=[a.]\n", "=[a.]", "no result name after the dot", "a", "", ""},
		{"=[.swept_volume]\n", "=[.swept_volume]", "no block id before the dot", "", "swept_volume", ""},
		{"=[]\n", "=[]", "the reference is empty", "", "", ""},
		{"=[  ]\n", "=[  ]", "the reference is empty", "", "", ""},
		{"=[A.swept_volume]\n", "=[A.swept_volume]", `block id "A" may hold only lower-case letters`, "a", "swept_volume", ""},
		{"=[a.swept-volume cm3]\n", "=[a.swept-volume cm3]", `result name "swept-volume" may hold only letters, digits and '_'`, "a", "swept_volume", "cm3"},
		{"=[a.swept_volume,cm3]\n", "=[a.swept_volume,cm3]", `the unit is set apart with "," instead of a space`, "a", "swept_volume", "cm3"},
		{"=[a.b.c]\n", "=[a.b.c]", "has more than one dot", "a", "b", "c"},
		{"=[a.swept_volume, cm3]\n", "=[a.swept_volume, cm3]", `the unit is set apart with "," instead of a space`, "a", "swept_volume", "cm3"},
		{"=[a.swept_volume;\u00a0cm3]\n", "=[a.swept_volume;\u00a0cm3]", `the unit is set apart with ";"`, "a", "swept_volume", "cm3"},
		{"Wrapped =[low.free_air_delivery\nL/min] here.\n", "=[low.free_air_delivery", "no closing ] on this line", "low", "free_air_delivery", ""},
		{"# Title =[a]\n", "=[a]", "names a block but no result", "a", "", ""},
		{"| h |\n|---|\n| =[a.b |\n", "=[a.b", "no closing ]", "a", "b", ""},
		{"x=[0, 1) and y\n", "=[0, 1) and y", "no closing ]", "-", "", ""},
	}
	md := New()
	for _, c := range cases {
		doc := md.Parse([]byte(c.src), 0)
		refs := doc.ValueRefs()
		if len(refs) != 1 {
			t.Errorf("%q: %d references, want 1", c.src, len(refs))
			continue
		}
		r := refs[0]
		if r.Written != c.written || !strings.Contains(r.Problem, c.problem) {
			t.Errorf("%q: written %q, problem %q; want %q, %q", c.src, r.Written, r.Problem, c.written, c.problem)
		}
		if c.block != "-" && (r.Block != c.block || r.Result != c.result || r.Unit != c.unit) {
			t.Errorf("%q: guessed %q.%q %q, want %q.%q %q", c.src, r.Block, r.Result, r.Unit, c.block, c.result, c.unit)
		}
		out, err := md.Render(doc)
		if err != nil {
			t.Fatal(err)
		}
		if strings.Contains(string(out), "sg-value") || !strings.Contains(string(out), "=[") {
			t.Errorf("%q: rendered %s, want the text as written", c.src, out)
		}
	}
}
