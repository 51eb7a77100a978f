package render

import (
	"bufio"
	"html"
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/renderer"
	"github.com/yuin/goldmark/util"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// calcRenderer writes calculation blocks and inline values.
type calcRenderer struct{}

func (r *calcRenderer) RegisterFuncs(reg renderer.NodeRendererFuncRegisterer) {
	reg.Register(KindCalcBlock, r.renderBlock)
	reg.Register(KindValueRef, r.renderValue)
	reg.Register(KindCautionList, r.renderCautionList)
	reg.Register(KindChartRef, r.renderChartRef)
}

func (r *calcRenderer) renderValue(w util.BufWriter, source []byte, node ast.Node, entering bool) (ast.WalkStatus, error) {
	if !entering {
		return ast.WalkContinue, nil
	}
	n := node.(*ValueRef)
	if n.prep != nil {
		n.prep.hole(w, n, Hole{Kind: HoleValue})
		return ast.WalkSkipChildren, nil
	}
	if n.Problem != "" {
		// No reference: only reachable when a page is rendered without
		// the site's checks, which refuse it.
		_, _ = w.WriteString(esc(string(source[n.Offset:n.End])))
		return ast.WalkSkipChildren, nil
	}
	WriteValue(w, n.Block, n.Result, n.Shown, n.Href)
	return ast.WalkSkipChildren, nil
}

// WriteValue writes an inline value of block's result: shown, linked to
// href when it is not empty.
func WriteValue(w util.BufWriter, block, result, shown, href string) {
	name := esc(block + "." + result)
	text := esc(shownValue(shown))
	if shown == "" {
		// Only reachable when a page is rendered without evaluation.
		text = "=[" + name + "]"
	}
	if href != "" {
		_, _ = w.WriteString(`<a class="sg-value" href="` + esc(href) + `" title="from calculation ` + name + `">` + text + `</a>`)
	} else {
		_, _ = w.WriteString(`<span class="sg-value" title="from calculation ` + name + `">` + text + `</span>`)
	}
}

func (r *calcRenderer) renderBlock(w util.BufWriter, source []byte, node ast.Node, entering bool) (ast.WalkStatus, error) {
	if !entering {
		return ast.WalkContinue, nil
	}
	n := node.(*CalcBlock)
	if n.prep != nil {
		n.prep.hole(w, n, Hole{Kind: HoleBlock, Line: n.FenceLine + n.prep.lineOffset, Level: headingLevelAfter(n), Source: n.Source})
		return ast.WalkSkipChildren, nil
	}
	WriteBlockAt(w, n.Eval, n.Source, n.Charts, n.Links, headingLevelAfter(n))
	return ast.WalkSkipChildren, nil
}

// WriteBlockAt writes a calculation block whose title takes heading level
// level where it stands: evaluated as WriteCalcBlock does, or, when e is
// nil, its source as code.
func WriteBlockAt(w util.BufWriter, e *calc.Evaluated, source string, charts []*DrawnChart, links map[string]string, level int) {
	if e == nil {
		writeCode(w, "toml", source)
		return
	}
	writeCalcBlock(w, e, source, charts, links, level)
}

// headingLevelAfter is the level a block's title takes where the block
// stands: one below the heading before it (h2 straight under the page's
// title), so that headings never skip a level for a screen reader's
// outline.
func headingLevelAfter(n ast.Node) int {
	for at := n; at != nil; at = at.Parent() {
		for p := at.PreviousSibling(); p != nil; p = p.PreviousSibling() {
			if h, ok := p.(*ast.Heading); ok {
				return min(h.Level+1, 6)
			}
		}
	}
	return 2
}

// Each calc table sits in its own box that scrolls sideways, so that a
// wide one (a long formula, a long result name) on a phone does not make
// the whole page scroll.
const (
	scrollOpen  = `<div class="sg-calc-scroll">`
	scrollClose = "</div>\n"
)

// BlockAnchor is the id of a block's section in its page.
func BlockAnchor(id string) string { return "calc-" + id }

// WriteCalcBlock writes one evaluated block: inputs, results with their
// working, claims, cautions and the block's source. links maps the ids of
// blocks its inputs name or quote to their tables (nil for no links).
func WriteCalcBlock(w util.BufWriter, e *calc.Evaluated, source string, charts []*DrawnChart, links map[string]string) {
	writeCalcBlock(w, e, source, charts, links, 3)
}

func writeCalcBlock(w util.BufWriter, e *calc.Evaluated, source string, charts []*DrawnChart, links map[string]string, level int) {
	h := "h" + strconv.Itoa(level)
	b := e.Block
	anchor := BlockAnchor(b.ID)
	title := b.Title
	if title == "" {
		title = b.ID
	}
	ws := func(s ...string) {
		for _, x := range s {
			_, _ = w.WriteString(x)
		}
	}
	state := "sg-calc-ok"
	if e.Failed() {
		state = "sg-calc-failed"
	}
	ws(`<section class="sg-calc `, state, `" id="`, esc(anchor), `" aria-labelledby="`, esc(anchor), `-title">`, "\n")
	ws(`<header class="sg-calc-head"><`, h, ` class="sg-calc-title" id="`, esc(anchor), `-title">`, esc(title), `</`, h, `>`)
	ws(`<p class="sg-calc-meta"><span>`, esc(b.Kind.Name), `</span> <code>`, esc(b.ID), `</code></p></header>`, "\n")

	for i, c := range e.Cautions {
		source := "Rule " + c.Rule + ", block " + b.ID
		if c.Result != "" {
			source = "Rule " + c.Rule + " on " + c.Result + ", block " + b.ID
		}
		writeCautionBox(w, c, source, cautionAnchor(b.ID, i))
	}
	if len(e.Claims) > 0 {
		ws(`<ul class="sg-claims" aria-label="Claims in the text">`, "\n")
		for _, c := range e.Claims {
			cls, word := "sg-claim-held", "holds"
			if !c.OK {
				cls, word = "sg-claim-failed", "FAILS"
			}
			computed := c.Shown
			ws(`<li class="`, cls, `"><span class="sg-claim-mark">`, word, `</span> <code>`, esc(c.Claim.Result), `</code> claimed `,
				keepWithUnit(esc(display.Written(c.Claim.Text))), `, computed <strong>`, keepWithUnit(esc(shownValue(strings.TrimSpace(computed)))), "</strong></li>\n")
		}
		ws("</ul>\n")
	}

	ws(`<div class="sg-calc-tables">`, "\n")
	writeInputs(w, e, links)
	writeResults(w, e, resultMarks(e))
	for _, t := range e.Tables {
		writeTable(w, e, t)
	}
	ws("</div>\n")
	if len(charts) > 0 {
		ws(`<div class="sg-calc-charts">`, "\n")
		for _, c := range charts {
			ws(c.HTML)
		}
		ws("</div>\n")
	}
	ws(`<details class="sg-calc-source"><summary>Block source</summary>`, "\n")
	writeBlockSource(w, source, b.Line+1)
	ws("</details>\n</section>\n")
}

func writeInputs(w util.BufWriter, e *calc.Evaluated, links map[string]string) {
	_, _ = w.WriteString(scrollOpen + `<table class="sg-calc-in"><caption>Inputs</caption><thead><tr><th scope="col">Input</th><th scope="col" class="sg-num">Value</th></tr></thead><tbody>` + "\n")
	link := func(id, text string) string {
		if href, ok := links[id]; ok {
			return `<a href="` + esc(href) + `">` + text + `</a>`
		}
		return text
	}
	for _, in := range e.Inputs {
		value := esc(in.Text)
		if in.Type == calc.Quantity {
			value = esc(display.Written(in.Text))
		}
		switch {
		case in.Dim == units.Pressure && in.Type == calc.Quantity:
			unit := unitOf(in.Text)
			if in.Default && e.Customary() {
				unit = units.CustomaryFor(unit)
			}
			value = esc(shownValue(display.PressurePair(in.Value, unit, e.Ambient, e.SigFigs())))
		case in.Default && e.Customary() && in.Type == calc.Quantity && in.Dim != units.Dimensionless:
			// A default is written in SI; a customary block reads it in its own units.
			if q, err := units.Parse(in.Text, in.Dim); err == nil {
				if s, err := display.Value(in.Value, in.Dim, units.CustomaryFor(q.Unit.Symbol), e.Ambient, e.SigFigs()); err == nil {
					value = esc(shownValue(s))
				}
			}
		case len(in.Links) > 0:
			parts := make([]string, len(in.Links))
			for i, id := range in.Links {
				parts[i] = link(id, esc(id))
			}
			value = strings.Join(parts, ", ")
		}
		if len(in.Links) == 0 {
			value = keepWithUnit(value)
		}
		note := ""
		if in.Label != "" {
			value += ` <span class="sg-note">` + esc(in.Label) + `</span>`
		}
		if in.Written != "" {
			value += ` <span class="sg-note">written “` + esc(in.Written) + `”</span>`
		}
		switch {
		case in.Default:
			note = ` <span class="sg-note">default</span>`
		case in.From != "":
			ref := strings.TrimPrefix(in.From, "=")
			id, _, _ := strings.Cut(ref, ".")
			note = ` <span class="sg-note">from ` + link(id, `<code>`+esc(ref)+`</code>`) + `</span>`
		}
		_, _ = w.WriteString(`<tr><th scope="row"><code>` + breakable(in.Name) + `</code></th><td class="sg-num">` + value + note + "</td></tr>\n")
	}
	_, _ = w.WriteString("</tbody></table>" + scrollClose)
}

// writeResults writes the results: those [show] names first, in its order,
// with any result a caution marks or a claim fails; the others follow in
// a closed group, so that the figures the author chose stand out. Each
// result is a group of rows: its name, meaning and value, and its working
// in a row of the table's full width under it.
func writeResults(w util.BufWriter, e *calc.Evaluated, marks map[string]resultMark) {
	main, others := resultGroups(e, marks)
	_, _ = w.WriteString(scrollOpen + `<table class="sg-calc-out"><caption>Results</caption>` + resultHead + "\n")
	for _, r := range main {
		writeResult(w, e, r, marks[r.Name])
	}
	_, _ = w.WriteString("</table>" + scrollClose)
	if len(others) == 0 {
		return
	}
	_, _ = w.WriteString(`<details class="sg-calc-more"><summary>other results (` + strconv.Itoa(len(others)) + `)</summary>` + "\n" +
		scrollOpen + `<table class="sg-calc-out" aria-label="Other results">` + resultHead + "\n")
	for _, r := range others {
		writeResult(w, e, r, marks[r.Name])
	}
	_, _ = w.WriteString("</table>" + scrollClose + "</details>\n")
}

const resultHead = `<thead><tr><th scope="col">Result</th><th scope="col" class="sg-num">Value</th></tr></thead>`

// resultGroups splits a block's results into those shown first and the
// others. Without [show] outputs every result is shown.
func resultGroups(e *calc.Evaluated, marks map[string]resultMark) (main, others []calc.Result) {
	if len(e.Block.Show.Outputs) == 0 {
		return e.Results, nil
	}
	taken := map[string]bool{}
	for _, o := range e.Block.Show.Outputs {
		if r, ok := e.Result(o.Name); ok && !taken[r.Name] {
			taken[r.Name] = true
			main = append(main, r)
		}
	}
	for _, r := range e.Results {
		if _, marked := marks[r.Name]; marked && !taken[r.Name] {
			taken[r.Name] = true
			main = append(main, r)
		}
	}
	for _, r := range e.Results {
		if !taken[r.Name] {
			others = append(others, r)
		}
	}
	return main, others
}

// resultMark is what marks a result's row: the most severe caution it
// raised (Level 0 for none) and its failed claim.
type resultMark struct {
	Level  calc.Level
	Anchor string // the caution's box
	Failed bool
}

// resultMarks finds the results a block's cautions name and its failed
// claims are about.
func resultMarks(e *calc.Evaluated) map[string]resultMark {
	marks := map[string]resultMark{}
	for i, c := range e.Cautions {
		if m := marks[c.Result]; c.Result != "" && c.Level > m.Level {
			m.Level, m.Anchor = c.Level, cautionAnchor(e.Block.ID, i)
			marks[c.Result] = m
		}
	}
	for _, c := range e.Claims {
		if !c.OK {
			m := marks[c.Claim.Result]
			m.Failed = true
			marks[c.Claim.Result] = m
		}
	}
	return marks
}

// cautionAnchor is the id of a block's i-th caution box.
func cautionAnchor(id string, i int) string { return BlockAnchor(id) + "-caution-" + strconv.Itoa(i+1) }

// writeResult writes one result: its row, marked when a caution or a failed
// claim is about it, and the row of its working.
func writeResult(w util.BufWriter, e *calc.Evaluated, r calc.Result, m resultMark) {
	value, err := e.Format(r.Name, "")
	if err != nil {
		value = units.Format(r.Value, e.SigFigs())
	}
	if r.Dim == units.Pressure {
		value = display.PressurePair(r.Value, e.DisplayUnit(r.Name), e.Ambient, e.SigFigs())
	}
	meaning := ""
	if m := e.Meaning(r.Name); m != "" {
		meaning = `<span class="sg-meaning">` + esc(m) + `</span>`
	}
	cls, flags := "sg-result", ""
	if m.Level > 0 {
		word := m.Level.String()
		cls += " sg-flag-" + strings.ToLower(word)
		flags += ` <a class="sg-flag sg-level-` + strings.ToLower(word) + `" href="#` + esc(m.Anchor) + `">` + word + `<span class="sg-sr"> caution on this result</span></a>`
	}
	if m.Failed {
		cls += " sg-flag-failed"
		flags += ` <span class="sg-flag sg-flag-claim">claim fails</span>`
	}
	_, _ = w.WriteString(`<tbody class="` + cls + `"><tr><th scope="row"><code>` + breakable(r.Name) + `</code>` + flags + meaning +
		`</th><td class="sg-num">` + keepWithUnit(esc(shownValue(value))) + "</td></tr>\n")
	if r.Trace.Formula != "" {
		_, _ = w.WriteString(`<tr class="sg-work"><td colspan="2"><details class="sg-trace"><summary>working<span class="sg-sr"> for ` + esc(r.Name) + `</span></summary><div class="sg-trace-body"><p><code>` + esc(display.Minus(r.Trace.Formula)) + `</code></p>`)
		if r.Trace.Substituted != "" {
			_, _ = w.WriteString(`<p><code>` + esc(display.Minus(r.Trace.Substituted)) + `</code></p>`)
		}
		_, _ = w.WriteString(`<p><code>= ` + esc(display.Minus(value)) + "</code></p></div></details></td></tr>\n")
	}
	_, _ = w.WriteString("</tbody>\n")
}

// writeTable writes one of a block's extra tables, two columns.
func writeTable(w util.BufWriter, e *calc.Evaluated, t calc.Table) {
	head := func(a calc.Axis) string {
		unit := units.Pretty(a.Unit)
		if a.Dim == units.Pressure {
			unit = strings.TrimSuffix(unit, "(g)") + ", gauge"
		}
		return esc(a.Label) + " (" + esc(unit) + ")"
	}
	_, _ = w.WriteString(scrollOpen + `<table class="sg-calc-extra"><caption>` + esc(t.Title) + `</caption><thead><tr><th scope="col">` +
		head(t.X) + `</th><th scope="col">` + head(t.Y) + "</th></tr></thead><tbody>\n")
	for i := range t.XS {
		x, errX := units.FromSI(t.XS[i], t.X.Dim, t.X.Unit, e.Ambient)
		y, errY := units.FromSI(t.YS[i], t.Y.Dim, t.Y.Unit, e.Ambient)
		if errX != nil || errY != nil {
			continue
		}
		_, _ = w.WriteString(`<tr><td class="sg-num">` + shownValue(units.Format(x, e.SigFigs())) + `</td><td class="sg-num">` + shownValue(units.Format(y, e.SigFigs())) + "</td></tr>\n")
	}
	_, _ = w.WriteString("</tbody></table>" + scrollClose)
}

// unitOf is the unit part of a quantity text such as "6 bar".
func unitOf(text string) string {
	q, err := units.Parse(text, units.Pressure)
	if err != nil {
		return "bar"
	}
	return q.Unit.Symbol
}

// WriteCaution writes one caution box with its signal word, and the
// block's acknowledgement when it has one.
func WriteCaution(w util.BufWriter, c calc.CautionNote, source string) {
	writeCautionBox(w, c, source, "")
}

// writeCautionBox writes a caution box, with an id when anchor is set.
func writeCautionBox(w util.BufWriter, c calc.CautionNote, source, anchor string) {
	word := c.Level.String()
	id := ""
	if anchor != "" {
		id = ` id="` + esc(anchor) + `"`
	}
	// ANSI Z535 puts the safety-alert symbol before DANGER, WARNING and
	// CAUTION only: NOTICE is no hazard to persons.
	icon := `<span class="sg-caution-icon" aria-hidden="true"></span>`
	if c.Level == calc.Notice {
		icon = ""
	}
	_, _ = w.WriteString(`<aside class="sg-caution sg-caution-` + strings.ToLower(word) + `"` + id + ` role="note" aria-label="` + word + `">` +
		`<p class="sg-caution-word">` + icon + word + `</p>` +
		`<div class="sg-caution-body"><p class="sg-caution-text">` + keepWithUnit(esc(display.Minus(c.Message))) + `</p>`)
	if c.Acknowledged != "" {
		_, _ = w.WriteString(`<p class="sg-caution-ack"><strong>Acknowledged:</strong> ` + esc(c.Acknowledged) + `</p>`)
	}
	if source != "" {
		_, _ = w.WriteString(`<p class="sg-caution-source">` + esc(source) + `</p>`)
	}
	_, _ = w.WriteString("</div></aside>\n")
}

// StandardCautionHTML is the box every page with a pressure calculation
// carries, with the message that fits it (calc.StandardCaution or
// calc.StandardVacuumCaution).
func StandardCautionHTML(message string) string {
	var b strings.Builder
	w := bufio.NewWriter(&b)
	_, _ = w.WriteString(`<div class="sg-standard-caution">`)
	WriteCaution(w, calc.CautionNote{Level: calc.Warning, Message: message}, "")
	_, _ = w.WriteString("</div>\n")
	_ = w.Flush()
	return b.String()
}

func esc(s string) string { return html.EscapeString(s) }

// keepWithUnit joins a number to the word after it with a no-break space,
// so that a narrow column or caution box does not put "415" on one line
// and "°C" on the next: each digit, space and non-space becomes digit,
// no-break space and the same, scanning on after the non-space.
func keepWithUnit(s string) string {
	var b strings.Builder
	last := 0
	for i := 0; i+2 < len(s); i++ {
		if s[i] < '0' || s[i] > '9' || s[i+1] != ' ' || strings.IndexByte(" \t\n\f\r", s[i+2]) >= 0 {
			continue
		}
		if b.Len() == 0 {
			b.Grow(len(s) + 8)
		}
		b.WriteString(s[last : i+1])
		b.WriteString("\u00a0")
		last = i + 2
		_, size := utf8.DecodeRuneInString(s[i+2:])
		i += 1 + size
	}
	if last == 0 {
		return s
	}
	b.WriteString(s[last:])
	return b.String()
}

// breakable lets a long result or input name wrap after its underscores
// in a narrow column (discharge_<wbr>temperature), not at any letter.
func breakable(name string) string { return strings.ReplaceAll(esc(name), "_", "_<wbr>") }

// shownValue is a computed value as a page shows it: long whole numbers
// grouped, negative numbers with a minus sign.
func shownValue(s string) string { return display.Minus(groupFigures(s)) }

// hasDigitRun reports whether s holds n ASCII digits in a row.
func hasDigitRun(s string, n int) bool {
	run := 0
	for i := 0; i < len(s); i++ {
		if s[i] >= '0' && s[i] <= '9' {
			if run++; run >= n {
				return true
			}
		} else {
			run = 0
		}
	}
	return false
}

var figure = regexp.MustCompile(`[-\w.]*\d[\w.]*`)

// groupFigures groups the digits of the whole numbers of five or more
// digits in a shown value (6 140 000 W) as the chart ticks do; a decimal
// fraction or a word with digits in it (an id) is left as it is.
func groupFigures(s string) string {
	if !hasDigitRun(s, 5) {
		return s // no whole number long enough to group
	}
	return groupEachFigure(s)
}

// groupEachFigure is groupFigures without its shortcut.
func groupEachFigure(s string) string {
	return figure.ReplaceAllStringFunc(s, func(f string) string {
		digits := strings.TrimPrefix(f, "-")
		for _, r := range digits {
			if r < '0' || r > '9' {
				return f
			}
		}
		return groupDigits(f)
	})
}
