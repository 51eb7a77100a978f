package render

import (
	"bufio"
	"bytes"
	"io"
	"strings"
	"testing"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/models"
	"github.com/millrace-workshop/specgen/internal/units"
)

const stageBlock = `id = "low"
kind = "compressor"
title = "Low <stage> & co"
bore = "28 mm"
stroke = "32 mm"
rod_length = "70 mm"
clearance_volume = "1.5 cm3"
speed = "900 rpm"
discharge_pressure = "6 bar"

[expect]
swept_volume = "79 cm3"
free_air_delivery = ">= 10 L/min"

[show]
outputs = ["free_air_delivery L/min", "max_pressure psi"]
`

func evaluated(t testing.TB, src string) *calc.Evaluated {
	t.Helper()
	b, err := testCatalog(t).ParseBlock("content/x.md", 10, src)
	if err != nil {
		t.Fatal(err)
	}
	set, err := testCatalog(t).Evaluate([]*calc.Block{b}, calc.Options{SigFigs: 3})
	if err != nil {
		t.Fatal(err)
	}
	e, _ := set.Lookup(b.ID)
	return e
}

func TestCalcBlockHTML(t *testing.T) {
	e := evaluated(t, stageBlock)
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	WriteCalcBlock(w, e, stageBlock, nil, nil)
	_ = w.Flush()
	out := buf.String()
	for _, want := range []string{
		`id="calc-low"`,
		`Low &lt;stage&gt; &amp; co`, // titles are escaped
		`sg-calc-failed`,
		// π/4 · 28² · 32 mm³ = 19 704 mm³ (by hand): the failed claim shows the truth.
		"<span class=\"sg-claim-mark\">FAILS</span> <code>swept_volume</code> claimed 79\u00a0cm³, computed <strong>19.7\u00a0cm³</strong>",
		// Claims read with the signs and units of print.
		"claimed ≥ 10\u00a0L/min",
		"<td class=\"sg-num\">1.5\u00a0cm³", // as written, in print's units
		`<span class="sg-claim-mark">holds</span> <code>free_air_delivery</code>`,
		// 6 bar gauge on 1 atm: 7.01325 bar absolute. Each figure keeps
		// its unit on its line; the pair may break at the dot.
		"<td class=\"sg-num\">6.00\u00a0bar(g) · 7.01\u00a0bar(a)",
		"<td class=\"sg-num\">32\u00a0mm",
		`<span class="sg-note">default</span>`,
		// Each working is named for its result, not twenty "working"s in a row.
		`<tr class="sg-work"><td colspan="2"><details class="sg-trace"><summary>working<span class="sg-sr"> for piston_area</span></summary>`,
		// Names wrap after an underscore, not inside a word.
		`<tbody class="sg-result"><tr><th scope="row"><code>free_<wbr>air_<wbr>delivery</code>`,
		// The rest wait in a closed group; the failed claim's result is
		// not among them.
		`<details class="sg-calc-more"><summary>other results (`,
		`<tbody class="sg-result sg-flag-failed"><tr><th scope="row"><code>swept_<wbr>volume</code> <span class="sg-flag sg-flag-claim">claim fails</span>`,
		`<th scope="row"><code>rod_<wbr>length</code>`,
		`psig · `,
	} {
		if !strings.Contains(out, want) {
			t.Errorf("block HTML lacks %s", want)
		}
	}
	// [show] outputs come first, in their order.
	if strings.Index(out, "<code>free_<wbr>air_<wbr>delivery</code>") > strings.Index(out, "<code>piston_<wbr>area</code>") {
		t.Error("shown outputs are not listed first")
	}
}

func TestValueRefRendering(t *testing.T) {
	md := New()
	doc := md.Parse([]byte("It sweeps =[low.swept_volume cm3] per stroke.\n"), 0)
	refs := doc.ValueRefs()
	if len(refs) != 1 || refs[0].Block != "low" || refs[0].Result != "swept_volume" || refs[0].Unit != "cm3" {
		t.Fatalf("refs = %+v", refs)
	}
	refs[0].Shown, refs[0].Href = "19.7 cm³", "#calc-low"
	html, err := md.Render(doc)
	if err != nil {
		t.Fatal(err)
	}
	want := `<p>It sweeps <a class="sg-value" href="#calc-low" title="from calculation low.swept_volume">19.7 cm³</a> per stroke.</p>`
	if !strings.Contains(string(html), want) {
		t.Errorf("got %s", html)
	}
}

func BenchmarkRenderCalcBlock(b *testing.B) {
	e := evaluated(b, stageBlock)
	w := bufio.NewWriter(io.Discard)
	b.ReportAllocs()
	for b.Loop() {
		WriteCalcBlock(w, e, stageBlock, nil, nil)
	}
}

func TestBlockSourceHighlighting(t *testing.T) {
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	writeBlockSource(w, "id = \"a<b\" # note\r\n[expect]\nn = 1.3\nok = true\nlist = [\"x\", 'y']\n", 0)
	_ = w.Flush()
	want := `<span class="hl-nx">id </span><span class="hl-p">=</span> <span class="hl-s2">&#34;a&lt;b&#34;</span> <span class="hl-c1"># note</span>` + "\r\n" +
		`<span class="hl-kt">[expect]</span>` + "\n" +
		`<span class="hl-nx">n </span><span class="hl-p">=</span> <span class="hl-m">1.3</span>` + "\n" +
		`<span class="hl-nx">ok </span><span class="hl-p">=</span> <span class="hl-kc">true</span>` + "\n" +
		`<span class="hl-nx">list </span><span class="hl-p">=</span> <span class="hl-p">[</span><span class="hl-s2">&#34;x&#34;</span><span class="hl-p">,</span> <span class="hl-s2">&#39;y&#39;</span><span class="hl-p">]</span>` + "\n"
	if got := buf.String(); !strings.Contains(got, want) {
		t.Errorf("got\n%s\nwant it to hold\n%s", got, want)
	}
}

// TestCustomaryDefaults: a block written in US customary units shows the
// defaults it did not write in its units too (20 °C = 68 °F).
func TestCustomaryDefaults(t *testing.T) {
	e := evaluated(t, `id = "twin"
kind = "compressor"
bore = "2 in"
stroke = "1.5 in"
rod_length = "3.5 in"
clearance_volume = "0.25 in3"
speed = "1450 rpm"
discharge_pressure = "116 psi"
`)
	table := inputTable(e)
	for _, want := range []string{"68.0\u00a0°F", "116\u00a0psig · 131\u00a0psia"} {
		if !strings.Contains(table, want) {
			t.Errorf("inputs lack %q:\n%s", want, table)
		}
	}
}

// inputTable is the HTML of e's input table.
func inputTable(e *calc.Evaluated) string {
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	writeInputs(w, e, nil)
	_ = w.Flush()
	return buf.String()
}

// TestVacuumGaugeResolvesAbsolute: beside 6.11 mbar(a) the gauge figure
// must not round to -1010 mbar(g), which hides the vacuum's quality.
func TestVacuumGaugeResolvesAbsolute(t *testing.T) {
	e := evaluated(t, stageBlock)
	// 611 Pa absolute on 101325 Pa: -100714 Pa = -1007.14 mbar(g).
	if got := display.PressurePair(611, "mbar", e.Ambient, e.SigFigs()); got != "6.11 mbar(a) · -1007 mbar(g)" {
		t.Errorf("pressurePair = %q, want \"6.11 mbar(a) · -1007 mbar(g)\"", got)
	}
}

// A material named by an alias shows the material it resolved to, its
// label and what the author wrote, so a reviewer sees which row was used.
func TestMaterialInputShowsLabel(t *testing.T) {
	src := `id = "sleeve"
kind = "tube"
inner_diameter = "32 mm"
wall_thickness = "3 mm"
pressure = "1 bar"
material = "Nylon"
`
	e := evaluated(t, src)
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	WriteCalcBlock(w, e, src, nil, nil)
	_ = w.Flush()
	want := `<td class="sg-num">pa12 <span class="sg-note">Nylon PA12 (printed, SLS or FDM)</span> <span class="sg-note">written “Nylon”</span></td>`
	if !strings.Contains(buf.String(), want) {
		t.Errorf("block HTML lacks %s", want)
	}
	var text strings.Builder
	WriteText(&text, e)
	if want := "Nylon PA12 (printed, SLS or FDM); written “Nylon”"; !strings.Contains(text.String(), want) {
		t.Errorf("text form lacks %q:\n%s", want, text.String())
	}
}

// A caution's figures keep their units on their line in a narrow box.
func TestCautionKeepsUnits(t *testing.T) {
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	WriteCaution(w, calc.CautionNote{Level: calc.Danger, Message: "discharge temperature 415 °C against 60.0 °C, block 3"}, "")
	_ = w.Flush()
	if want := "415\u00a0°C against 60.0\u00a0°C, block 3"; !strings.Contains(buf.String(), want) {
		t.Errorf("caution lacks %q:\n%s", want, buf.String())
	}
}

// The site-wide list keeps figures with their units as the boxes do.
func TestCautionListKeepsUnits(t *testing.T) {
	n := &CautionList{Items: []CautionItem{{CautionNote: calc.CautionNote{Level: calc.Warning, Message: "rated 60.0 °C"}, Block: "a", Href: "#a"}}}
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	if _, err := (&calcRenderer{}).renderCautionList(w, nil, n, true); err != nil {
		t.Fatal(err)
	}
	_ = w.Flush()
	if !strings.Contains(buf.String(), "rated 60.0\u00a0°C") {
		t.Errorf("caution list lacks the joined figure:\n%s", buf.String())
	}
}

func TestGroupFigures(t *testing.T) {
	for in, want := range map[string]string{
		"6140000 W":                 "6\u00a0140\u00a0000 W",
		"1510000 L/min":             "1\u00a0510\u00a0000 L/min",
		"2500 W":                    "2500 W",
		"0.0000161 mbar(a)":         "0.0000161 mbar(a)",
		"-1013.25 mbar(g)":          "-1013.25 mbar(g)",
		"12345.6 N":                 "12345.6 N",
		"4330 psig · 143000 psia":   "4330 psig · 143\u00a0000 psia",
		"tank-20000 holds -25000 J": "tank-20000 holds -25\u00a0000 J",
	} {
		if got := groupFigures(in); got != want {
			t.Errorf("groupFigures(%q) = %q, want %q", in, got, want)
		}
	}
}

// A large result's figure is grouped in the table as on the chart.
func TestLargeResultGrouped(t *testing.T) {
	src := `id = "big"
kind = "compressor"
bore = "400 mm"
stroke = "500 mm"
rod_length = "1200 mm"
clearance_ratio = 0.04
speed = "2000 rpm"
cylinders = 12
discharge_pressure = "40 bar"
`
	e := evaluated(t, src)
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	writeResults(w, e, nil)
	_ = w.Flush()
	// 12 · π/4 · (0.4 m)² · 0.5 m = 0.754 m³ per revolution, 2000 rpm: 1 510 000 L/min.
	if want := "<td class=\"sg-num\">1\u00a0510\u00a0000\u00a0L/min</td>"; !strings.Contains(buf.String(), want) {
		t.Errorf("results lack %q", want)
	}
}

func TestValueRefGrouped(t *testing.T) {
	md := New()
	doc := md.Parse([]byte("It takes =[big.shaft_power W].\n"), 0)
	refs := doc.ValueRefs()
	refs[0].Shown, refs[0].Href = "6140000 W", "#calc-big"
	html, err := md.Render(doc)
	if err != nil {
		t.Fatal(err)
	}
	if want := ">6\u00a0140\u00a0000 W</a>"; !strings.Contains(string(html), want) {
		t.Errorf("got %s", html)
	}
}

// A block's title is one level below the heading it stands under, so that
// the outline never skips a level.
func TestCalcTitleLevel(t *testing.T) {
	fence := "```calc\n" + stageBlock + "```\n"
	for _, c := range []struct{ md, want string }{
		{fence, "<h2 class=\"sg-calc-title\""},
		{"## Stage\n\n" + fence, "<h3 class=\"sg-calc-title\""},
		{"## Stage\n\n### Low\n\nText.\n\n" + fence, "<h4 class=\"sg-calc-title\""},
		{"### Low\n\n> " + strings.ReplaceAll(fence, "\n", "\n> ") + "\n", "<h4 class=\"sg-calc-title\""},
	} {
		md := New()
		doc := md.Parse([]byte(c.md), 0)
		for _, b := range doc.CalcBlocks() {
			b.Eval = evaluated(t, stageBlock)
		}
		html, err := md.Render(doc)
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(string(html), c.want) {
			t.Errorf("%q: no %s in\n%.300s", c.md[:20], c.want, html)
		}
	}
}

// An extra table's long figures are grouped as the results are.
func TestExtraTableGrouped(t *testing.T) {
	e := evaluated(t, stageBlock)
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	writeTable(w, e, calc.Table{Title: "t",
		X: calc.Axis{Label: "Time", Dim: units.Time, Unit: "s"}, Y: calc.Axis{Label: "Time", Dim: units.Time, Unit: "s"},
		XS: []float64{127000}, YS: []float64{5}})
	_ = w.Flush()
	if want := "<td class=\"sg-num\">127\u00a0000</td>"; !strings.Contains(buf.String(), want) {
		t.Errorf("table lacks %q:\n%s", want, buf.String())
	}
}

// testCatalog is every kind and caution rule with the built-in materials.
func testCatalog(t testing.TB) *calc.Catalog {
	t.Helper()
	c, err := models.NewCatalog(nil)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// TestVacuumTargetReadings: a vacuum target written as a gauge or vacuum
// reading, or in plain hPa, is converted with the block's ambient and its
// input row shows both readings. At 1 atm: -900 mbar(g) is 101 325 − 90 000
// = 11 325 Pa(a) = 113 mbar(a); 27 inHg vac is 101 325 − 27 · 3386.389
// = 9892.5 Pa(a) = 2.92 inHg(a) (NIST SP 811 App. B: 1 inHg = 3386.389 Pa);
// plain hPa on an absolute input reads absolute: 100 hPa = 100 hPa(a).
func TestVacuumTargetReadings(t *testing.T) {
	for _, c := range []struct{ target, want string }{
		{"-900 mbar(g)", "113 mbar(a) · −900 mbar(g)"},
		{"27 inHg vac", "2.92 inHg(a) · −27.0 inHg(g)"},
		{"100 hPa", "100 hPa(a) · −913 hPa(g)"},
	} {
		e := evaluated(t, `id = "pot"
kind = "vacuum"
bore = "50 mm"
stroke = "40 mm"
rod_length = "100 mm"
clearance_ratio = 0.02
speed = "1200 rpm"
vessel_volume = "20 L"
target_pressure = "`+c.target+`"
`)
		table := inputTable(e)
		// The table keeps each number with its unit by a no-break space.
		if !strings.Contains(strings.ReplaceAll(table, "\u00a0", " "), esc(c.want)) {
			t.Errorf("target %q: input table lacks %q:\n%s", c.target, c.want, table)
		}
	}
}

// TestResultGroups: the results [show] names come first in its order, then
// any result a caution marks or a claim fails (the stage block fails its
// swept_volume claim and, with no relief valve named, its max_pressure
// carries a NOTICE); the rest are the other results. A block without
// [show] outputs shows every result.
func TestResultGroups(t *testing.T) {
	names := func(rs []calc.Result) string {
		var out []string
		for _, r := range rs {
			out = append(out, r.Name)
		}
		return strings.Join(out, " ")
	}
	blockWith := func(show, extra string) string {
		return strings.Replace(stageBlock, `outputs = ["free_air_delivery L/min", "max_pressure psi"]`, show, 1) + extra
	}
	for _, c := range []struct {
		name, src string
		marks     map[string]resultMark
		main      string
		others    int
	}{
		{"shown first, failed claim after", stageBlock, nil, "free_air_delivery max_pressure swept_volume", 18},
		{"no outputs: all", blockWith(`outputs = []`, ""), nil, "", 0},
		{"caution marks one", blockWith(`outputs = ["shaft_power W"]`, ""),
			map[string]resultMark{"discharge_temperature": {Level: calc.Warning}}, "shaft_power swept_volume max_pressure discharge_temperature", 17},
		{"order of [show]", blockWith(`outputs = ["mean_torque", "piston_area"]`, ""), nil, "mean_torque piston_area swept_volume max_pressure", 17},
	} {
		t.Run(c.name, func(t *testing.T) {
			e := evaluated(t, c.src)
			marks := resultMarks(e)
			for k, v := range c.marks {
				marks[k] = v
			}
			main, others := resultGroups(e, marks)
			want := c.main
			if want == "" {
				want = names(e.Results)
			}
			if got := names(main); !strings.HasPrefix(got, want) || len(main)+len(others) != len(e.Results) {
				t.Errorf("shown first: %s; want %s, and %d in all", got, want, len(e.Results))
			}
			if len(others) != c.others {
				t.Errorf("%d other results, want %d: %s", len(others), c.others, names(others))
			}
		})
	}
}

// TestCautionMarksItsRow: a block caution's result row carries its signal
// word, linked to the caution's box.
func TestCautionMarksItsRow(t *testing.T) {
	e := evaluated(t, `id = "choked"
kind = "compressor"
bore = "32 mm"
stroke = "28 mm"
rod_length = "70 mm"
clearance_ratio = 0.3
speed = "900 rpm"
discharge_pressure = "8 bar"
`)
	var buf bytes.Buffer
	w := bufio.NewWriter(&buf)
	WriteCalcBlock(w, e, "", nil, nil)
	_ = w.Flush()
	out := buf.String()
	for _, want := range []string{
		`<aside class="sg-caution sg-caution-danger" id="calc-choked-caution-1"`,
		`Rule no-delivery on volumetric_efficiency, block choked`,
		`<tbody class="sg-result sg-flag-danger"><tr><th scope="row"><code>volumetric_<wbr>efficiency</code> <a class="sg-flag sg-level-danger" href="#calc-choked-caution-1">DANGER`,
	} {
		if !strings.Contains(out, want) {
			t.Errorf("block HTML lacks %s", want)
		}
	}
}
