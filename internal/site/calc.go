package site

import (
	"bufio"
	"errors"
	"fmt"
	"html/template"
	"path"
	"slices"
	"sort"
	"strings"
	"sync/atomic"

	"github.com/yuin/goldmark/util"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/render"
	"github.com/millrace-workshop/specgen/internal/units"
)

// curveBudget is how many bytes of curves the charted blocks of a site keep
// from evaluation until their charts are drawn (some 600 compressor
// blocks); past it, the curves of a block are sampled again when drawn, so
// that a big site's memory does not grow with every chart it holds.
var curveBudget int64 = 16 << 20

// valueRef is an inline value of a page, as written, with its file line.
// When Problem is set it is no well-formed reference, and Block, Result
// and Unit are a guess at what was meant.
type valueRef struct {
	Block, Result, Unit string
	Written, Problem    string
	Line                int
}

// chartName is a line of a chart fence, with its file line and the fence's
// place among the page's chart fences.
type chartName struct {
	render.ChartName
	Line  int
	Fence int
}

// readDoc takes what the build needs from a page's syntax tree: its
// calculation blocks (decoded), its inline values and its chart fences.
// The tree itself is not kept (the page is prepared from it, see
// render.Prepared), so that a big site is never held in memory whole.
func readDoc(p *Page, doc *render.Document, cat *calc.Catalog) error {
	var errs inputerr.List
	for _, n := range doc.CalcBlocks() {
		if !n.Closed {
			errs = append(errs, &inputerr.Error{File: p.File, Line: n.FenceLine + doc.LineOffset,
				Msg: "the calc block opened here is never closed; end it with a line holding only the fence (```)"})
			continue
		}
		// A fence line inside means this block was left open and a later
		// fence closed it; TOML would only complain about a backquote.
		if i, fence := openingFenceIn(n.Source); fence != "" {
			errs = append(errs, &inputerr.Error{File: p.File, Line: n.FenceLine + doc.LineOffset + 1 + i,
				Msg: fmt.Sprintf("%q inside the calc block opened at line %d: that block is not closed; end it with a line holding only the fence (```) before this one", fence, n.FenceLine+doc.LineOffset)})
			continue
		}
		b, err := cat.ParseBlock(p.File, n.FenceLine+doc.LineOffset, n.Source)
		if err != nil {
			errs = append(errs, inputerr.From(err)...)
		}
		// A broken block stays, so that what names it is not blamed too.
		if b != nil {
			p.blocks = append(p.blocks, b)
		}
	}
	refs := doc.ValueRefs()
	p.refs = make([]valueRef, 0, len(refs)) // kept to the end: no room to spare
	for _, r := range refs {
		p.refs = append(p.refs, valueRef{Block: r.Block, Result: r.Result, Unit: r.Unit,
			Written: r.Written, Problem: r.Problem, Line: doc.Line(r.Offset)})
	}
	drawn := map[string]int{} // chart name to the line that first draws it
	for fence, cr := range doc.ChartRefs() {
		if len(cr.Names) == 0 {
			errs = append(errs, &inputerr.Error{File: p.File, Line: cr.FenceLine + doc.LineOffset,
				Msg: "this chart fence names no chart; write one per line as block.chart, e.g. low.pv"})
		}
		for _, n := range cr.Names {
			line := n.Line + doc.LineOffset
			if first, seen := drawn[n.Text]; seen {
				errs = append(errs, &inputerr.Error{File: p.File, Line: line,
					Msg: fmt.Sprintf("chart %s is already drawn on this page (line %d); a page draws each chart once", n.Text, first)})
				continue
			}
			drawn[n.Text] = line
			p.charts = append(p.charts, chartName{ChartName: n, Line: line, Fence: fence})
		}
	}
	for _, list := range doc.CautionLists() {
		p.listsCautions = true
		if list.Content != "" {
			errs = append(errs, &inputerr.Error{File: p.File, Line: list.FenceLine + doc.LineOffset,
				Msg: "a cautions fence takes no content (the site fills it with every caution); leave it empty"})
		}
	}
	p.links = doc.LinkRefs()
	headings := doc.AnchorIDs()
	p.anchors = nil
	if n := len(headings) + len(p.blocks); n > 0 {
		p.anchors = append(make([]string, 0, n), headings...) // kept to the end: no room to spare
	}
	for _, b := range p.blocks {
		p.anchors = append(p.anchors, render.BlockAnchor(b.ID))
	}
	slices.Sort(p.anchors)
	p.anchors = slices.Clip(slices.Compact(p.anchors))
	return errs.Sorted()
}

// evaluate runs every block of the site, then checks the value
// references and chart fences of every page, and lists every problem
// found.
func (s *Site) evaluate() error {
	var blocks []*calc.Block
	s.blockPage = map[string]*Page{}
	for _, p := range s.Pages {
		for _, b := range p.blocks {
			blocks = append(blocks, b)
			if _, dup := s.blockPage[b.ID]; !dup {
				s.blockPage[b.ID] = p
			}
		}
	}
	charted := map[string]bool{}
	draws := map[string]int32{}
	for _, p := range s.Pages {
		for _, b := range p.blocks {
			s.chartsTotal += len(b.Show.Charts)
			charted[b.ID] = charted[b.ID] || len(b.Show.Charts) > 0
			draws[b.ID] += int32(len(b.Show.Charts))
		}
		for _, n := range p.charts {
			s.chartsTotal++
			charted[n.Block] = true
			draws[n.Block]++
		}
	}
	s.drawsLeft = make(map[string]*atomic.Int32, len(draws))
	for id, n := range draws {
		s.drawsLeft[id] = new(atomic.Int32)
		s.drawsLeft[id].Store(n)
	}
	set, err := s.Config.catalog.Evaluate(blocks, calc.Options{SigFigs: s.Config.SigFigs,
		Charted: func(id string) bool { return charted[id] }, CurveBudget: curveBudget, Outcomes: s.outcomes})
	var errs inputerr.List
	if err != nil {
		errs = inputerr.From(err)
	}
	s.Calc = set
	// A value or chart of a block that has problems of its own (or needs
	// one that has) is not checked: the block's problems are reported.
	unevaluated := func(id string) bool {
		_, known := s.blockPage[id]
		_, evaluated := set.Lookup(id)
		return known && !evaluated
	}
	// Each inline value is formatted once, here, and shown from then on.
	views := make([][]refView, len(s.Pages))
	pageErrs := make([][]*inputerr.Error, len(s.Pages))
	calc.Parallel(len(s.Pages), func(i int) {
		p := s.Pages[i]
		for _, n := range p.charts {
			if unevaluated(n.Block) {
				continue
			}
			if err := s.checkChartName(p, n); err != nil {
				pageErrs[i] = append(pageErrs[i], err)
			}
		}
		views[i] = make([]refView, len(p.refs))
		for j, ref := range p.refs {
			if ref.Problem == "" && unevaluated(ref.Block) {
				continue
			}
			var err *inputerr.Error
			if views[i][j], err = s.formatRef(p, ref); err != nil {
				pageErrs[i] = append(pageErrs[i], err)
			}
		}
	})
	s.refViews = make(map[*Page][]refView, len(s.Pages))
	for i, p := range s.Pages {
		s.refViews[p] = views[i]
		for _, err := range pageErrs[i] {
			errs = append(errs, err)
		}
	}
	if len(errs) == 0 {
		// A title that quotes a value shows it, in <title> and navigation too.
		for _, p := range s.Pages {
			p.setHeading(func(i int) string { return s.shownRef(p, i).Shown })
		}
	}
	// Curves are only drawn from now on: a big site keeps those it charts.
	for _, e := range set.Blocks {
		if !charted[e.Block.ID] {
			e.Release()
		}
	}
	s.cautions = s.cautionItems()
	return errs.Sorted()
}

// pageCharts are the charts drawn for a page: by the file line of the
// block that shows them, and by chart fence.
type pageCharts struct {
	blocks map[int][]*render.DrawnChart
	fences map[int][]*render.DrawnChart
}

// fill writes a hole of page p's prepared content: what the evaluation
// found for each block (its results, found by the line of its fence, with
// its charts and the links to the blocks it names), each inline value (its
// text and link), each chart fence (its charts) and each caution list (the
// site's cautions). The page was checked when it was read, so nothing here
// fails.
func (s *Site) fill(p *Page, charts pageCharts) func(w util.BufWriter, h render.Hole) {
	byLine := make(map[int]*calc.Block, len(p.blocks))
	for _, b := range p.blocks {
		byLine[b.Line] = b
	}
	return func(w util.BufWriter, h render.Hole) {
		switch h.Kind {
		case render.HoleBlock:
			b, ok := byLine[h.Line]
			if !ok {
				render.WriteBlockAt(w, nil, h.Source, nil, nil, h.Level)
				return
			}
			e, _ := s.Calc.Lookup(b.ID)
			links := map[string]string{}
			for _, v := range b.Values {
				for _, id := range v.Deps() {
					links[id] = s.blockLink(p, id)
				}
			}
			render.WriteBlockAt(w, e, h.Source, charts.blocks[h.Line], links, h.Level)
		case render.HoleValue:
			ref, v := p.refs[h.Index], s.shownRef(p, h.Index)
			render.WriteValue(w, ref.Block, ref.Result, v.Shown, v.Href)
		case render.HoleChartRef:
			render.WriteChartRef(w, charts.fences[h.Index])
		case render.HoleCautions:
			items := make([]render.CautionItem, len(s.cautions))
			for i, it := range s.cautions {
				it.Href = s.blockLink(p, it.Block)
				items[i] = it
			}
			render.WriteCautionList(w, items)
		}
	}
}

// refText is the text of page p's ref-th inline value as its headings and
// search entry show it: its value, or as written when it has none.
func (s *Site) refText(p *Page, ref int) string {
	if v := s.shownRef(p, ref); v.Shown != "" {
		return v.Shown
	}
	return p.refs[ref].Written
}

// blockLink is the link from page p to a block's table.
func (s *Site) blockLink(p *Page, id string) string {
	target := s.blockPage[id]
	if target == p {
		return "#" + render.BlockAnchor(id)
	}
	return relativeURL(p.Out, target.Out) + "#" + render.BlockAnchor(id)
}

// cautionItems lists every caution of the site, the most severe first,
// then by block id.
func (s *Site) cautionItems() []render.CautionItem {
	var items []render.CautionItem
	for _, e := range s.Calc.Blocks {
		for _, c := range e.Cautions {
			items = append(items, render.CautionItem{CautionNote: c, Block: e.Block.ID, BlockTitle: e.Block.Title})
		}
	}
	sort.SliceStable(items, func(i, j int) bool {
		if items[i].Level != items[j].Level {
			return items[i].Level > items[j].Level
		}
		return items[i].Block < items[j].Block
	})
	return items
}

// blocksShown lists the ids of the blocks a page holds, quotes or charts,
// in first-use order.
func (s *Site) blocksShown(p *Page) []string {
	var ids []string
	add := func(id string) {
		if !slices.Contains(ids, id) {
			ids = append(ids, id)
		}
	}
	for _, b := range p.blocks {
		add(b.ID)
	}
	for _, ref := range p.refs {
		add(ref.Block)
	}
	for _, n := range p.charts {
		add(n.Block)
	}
	return ids
}

// shownCaution is a caution of a block a page shows.
type shownCaution struct {
	Block string
	Note  calc.CautionNote
}

// shownCautions lists the cautions of every block the page shows, in the
// order its caution boxes show them (pageCautions).
func (s *Site) shownCautions(p *Page) []shownCaution {
	var list []shownCaution
	for _, id := range s.blocksShown(p) {
		e, ok := s.Calc.Lookup(id)
		if !ok {
			continue
		}
		for _, c := range e.Cautions {
			list = append(list, shownCaution{Block: id, Note: c})
		}
	}
	return list
}

// pageCautions renders the caution boxes of the cautions shown.
func pageCautions(shown []shownCaution) template.HTML {
	var b strings.Builder
	w := bufio.NewWriter(&b)
	for _, c := range shown {
		render.WriteCaution(w, c.Note, "Rule "+c.Note.Rule+", block "+c.Block)
	}
	_ = w.Flush()
	return template.HTML(b.String())
}

// pressureCalcs reports whether any of the blocks ids is a calculation of
// a kind that involves pressure, and whether those are vacuum calculations:
// at least one holds vacuum and none holds compressed air (a lid given only
// the pressure difference across it is neither).
func (s *Site) pressureCalcs(ids []string) (any, allVacuum bool) {
	vacuum, compressed := false, false
	for _, id := range ids {
		e, ok := s.Calc.Lookup(id)
		if !ok || !e.Block.Kind.Has(calc.HoldsPressure) {
			continue
		}
		any = true
		switch {
		case e.HoldsVacuum():
			vacuum = true
		case e.Block.Kind.Has(calc.Wall) && e.Block.Kind.WorkingPressure.Key == "":
		default:
			compressed = true
		}
	}
	return any, vacuum && !compressed
}

// refView is an inline value as shown: its text and its link.
type refView struct{ Shown, Href string }

// shownRef is page p's i-th inline value as shown, formatted when the site
// was evaluated (zero when it could not be).
func (s *Site) shownRef(p *Page, i int) refView {
	if views, ok := s.refViews[p]; ok {
		return views[i]
	}
	v, _ := s.formatRef(p, p.refs[i])
	return v
}

// formatRef formats one inline value and links it to its block, or says
// what is wrong with it.
func (s *Site) formatRef(p *Page, ref valueRef) (refView, *inputerr.Error) {
	written := "=[" + ref.Block + "." + ref.Result
	if ref.Unit != "" {
		written += " " + ref.Unit
	}
	written += "]"
	fail := func(format string, args ...any) (refView, *inputerr.Error) {
		return refView{}, &inputerr.Error{File: p.File, Line: ref.Line, Msg: written + ": " + fmt.Sprintf(format, args...)}
	}
	if ref.Problem != "" {
		written = ref.Written
		msg := ref.Problem + "; a value reference is " + render.ValueRefForms
		if hint := s.refHint(p, ref); hint != "" {
			msg += "; " + hint
		}
		if strings.HasSuffix(msg, "?") {
			msg += " "
		} else {
			msg += ". "
		}
		return fail("%sTo show it as text, write it in a code span (`%s`) or escape the equals sign (\\%s)", msg, ref.Written, ref.Written)
	}
	e, ok := s.Calc.Lookup(ref.Block)
	if !ok {
		msg := fmt.Sprintf("there is no block %q in the site", ref.Block)
		if sug := calc.Suggest(ref.Block, s.Calc.IDs()); sug != "" {
			msg += fmt.Sprintf("; did you mean %q?", sug)
		}
		return fail("%s", msg)
	}
	if spec, declared := e.Block.Kind.ResultSpec(ref.Result); declared {
		if _, _, _, ok := e.Quantity(ref.Result); !ok {
			return fail("block %s computes no %s with its inputs (%s)", ref.Block, ref.Result, spec.Meaning)
		}
	}
	if _, _, _, ok := e.Quantity(ref.Result); !ok {
		names := make([]string, len(e.Results))
		for i, r := range e.Results {
			names[i] = r.Name
		}
		msg := fmt.Sprintf("block %s (%s) has no result %q", ref.Block, e.Block.Kind.Name, ref.Result)
		if sug := calc.Suggest(ref.Result, names); sug != "" {
			msg += fmt.Sprintf("; did you mean %q?", sug)
		} else {
			msg += "; results: " + listOrNone(names)
		}
		return fail("%s", msg)
	}
	shown, err := e.Format(ref.Result, ref.Unit)
	if err != nil {
		var ue *units.Error
		if _, dim, _, _ := e.Quantity(ref.Result); errors.As(err, &ue) && ue.Suggest == "" && strings.Contains(err.Error(), "unknown unit") {
			// Say which units would do, as a wrong-dimension unit does.
			if ex := dim.Examples(); ex != "" {
				return fail("%v; %s is %s: %s", err, ref.Result, withArticle(dim.String()), ex)
			}
		}
		return fail("%v", err)
	}
	return refView{Shown: display.Minus(shown), Href: s.blockLink(p, ref.Block)}, nil
}

// refHint guesses what a malformed inline value meant: "did you mean
// =[block.result unit]?" when its guessed parts name a block and one of its
// results, or the block's results when only the block is clear.
func (s *Site) refHint(p *Page, ref valueRef) string {
	var e *calc.Evaluated
	switch {
	case ref.Block == "" && ref.Result != "":
		// "=[.swept_volume]": the one block of the page, else of the
		// site, that has the result.
		var onPage []*calc.Evaluated
		for _, b := range p.blocks {
			if ev, ok := s.Calc.Lookup(b.ID); ok {
				onPage = append(onPage, ev)
			}
		}
		found := blocksWith(ref.Result, onPage)
		if len(found) == 0 {
			found = blocksWith(ref.Result, s.Calc.Blocks)
		}
		if len(found) != 1 {
			return ""
		}
		e = found[0]
	case ref.Block != "":
		var ok bool
		if e, ok = s.Calc.Lookup(ref.Block); !ok {
			e, _ = s.Calc.Lookup(calc.Suggest(ref.Block, s.Calc.IDs()))
		}
	}
	if e == nil {
		return ""
	}
	names := make([]string, len(e.Results))
	for i, r := range e.Results {
		names[i] = r.Name
	}
	result := ref.Result
	if _, _, _, ok := e.Quantity(result); !ok {
		result = calc.Suggest(result, names)
	}
	if result == "" {
		return fmt.Sprintf("block %s (%s) has results %s", e.Block.ID, e.Block.Kind.Name, listOrNone(names))
	}
	sug := "=[" + e.Block.ID + "." + result
	if _, err := e.Format(result, ref.Unit); ref.Unit != "" && err == nil {
		sug += " " + ref.Unit
	}
	return "did you mean " + sug + "]?"
}

// blocksWith lists the blocks among list that have a result or input name.
func blocksWith(name string, list []*calc.Evaluated) []*calc.Evaluated {
	var out []*calc.Evaluated
	for _, e := range list {
		if _, _, _, ok := e.Quantity(name); ok {
			out = append(out, e)
		}
	}
	return out
}

// checkChartName checks that a line of a chart fence names a block and
// one of its kind's charts.
func (s *Site) checkChartName(p *Page, n chartName) *inputerr.Error {
	fail := func(format string, args ...any) *inputerr.Error {
		return &inputerr.Error{File: p.File, Line: n.Line, Msg: "chart " + n.Text + ": " + fmt.Sprintf(format, args...)}
	}
	e, ok := s.Calc.Lookup(n.Block)
	switch {
	case n.Chart == "" || n.Block == "":
		return fail("write block.chart, such as bellows-lp.pv")
	case !ok:
		msg := fmt.Sprintf("there is no block %q in the site", n.Block)
		if sug := calc.Suggest(n.Block, s.Calc.IDs()); sug != "" {
			msg += fmt.Sprintf("; did you mean %q?", sug)
		}
		return fail("%s", msg)
	case !slices.Contains(e.Block.Kind.Charts, n.Chart):
		allowed := strings.Join(e.Block.Kind.Charts, ", ")
		if allowed == "" {
			allowed = "none for this kind"
		}
		return fail("block %s (%s) draws no chart %q; allowed: %s", n.Block, e.Block.Kind.Name, n.Chart, allowed)
	}
	return nil
}

// drawCharts draws the charts the page's blocks and chart fences ask for,
// and adds their data files, "<page>.<block>.<chart>.csv" beside the page,
// to out.
func (s *Site) drawCharts(p *Page, out map[string][]byte) (pageCharts, error) {
	drawn := pageCharts{blocks: map[int][]*render.DrawnChart{}, fences: map[int][]*render.DrawnChart{}}
	draw := func(id, chart, prefix string, line int) (*render.DrawnChart, error) {
		e, _ := s.Calc.Lookup(id)
		c, err := e.Chart(chart)
		if err != nil {
			return nil, &inputerr.Error{File: p.File, Line: line, Msg: err.Error()}
		}
		csvName := chartDataName(p, id, chart)
		d, err := render.DrawChart(c, prefix+id+"-"+chart, href(path.Base(csvName)))
		if err != nil {
			return nil, &inputerr.Error{File: p.File, Line: line, Msg: "block " + id + ": chart " + chart + ": " + err.Error()}
		}
		out[csvName] = d.CSV
		s.chartDone(id)
		return d, nil
	}
	for _, b := range p.blocks {
		for _, chart := range b.Show.Charts {
			d, err := draw(b.ID, chart, "chart-", b.LineOf("show.charts"))
			if err != nil {
				return drawn, err
			}
			drawn.blocks[b.Line] = append(drawn.blocks[b.Line], d)
		}
	}
	for _, n := range p.charts {
		d, err := draw(n.Block, n.Chart, "chartref-", n.Line)
		if err != nil {
			return drawn, err
		}
		drawn.fences[n.Fence] = append(drawn.fences[n.Fence], d)
	}
	return drawn, nil
}

// chartDataName is the output path of the data file of block id's chart
// drawn on page p.
func chartDataName(p *Page, id, chart string) string {
	return strings.TrimSuffix(p.Out, ".html") + "." + id + "." + chart + ".csv"
}

// chartDataNames lists the data files the charts of page p will write.
func chartDataNames(p *Page) []string {
	var names []string
	for _, b := range p.blocks {
		for _, chart := range b.Show.Charts {
			names = append(names, chartDataName(p, b.ID, chart))
		}
	}
	for _, n := range p.charts {
		names = append(names, chartDataName(p, n.Block, n.Chart))
	}
	return names
}

// chartDone counts a chart of block id as drawn, or kept from the last
// build. Once the block's last chart is, its curves go (a chart drawn
// again, by a rebuild of the page, samples them anew).
func (s *Site) chartDone(id string) {
	s.chartDrawn()
	if left := s.drawsLeft[id]; left != nil && left.Add(-1) == 0 {
		if e, ok := s.Calc.Lookup(id); ok {
			e.DropCurves()
		}
	}
}

// chartDrawn counts a chart for the progress display.
func (s *Site) chartDrawn() {
	if n := s.charts.Add(1); s.progress != nil {
		s.progress("charts drawn", int(n), s.chartsTotal)
	}
}

// relativeURL is the link from output page from to output page to.
func relativeURL(from, to string) string {
	return href(strings.Repeat("../", strings.Count(from, "/")) + path.Clean(to))
}

// listOrNone joins names for a message, or says "none".
func listOrNone(names []string) string {
	if len(names) == 0 {
		return "none"
	}
	return strings.Join(names, ", ")
}

// withArticle puts "a" or "an" before a noun.
func withArticle(noun string) string {
	if noun != "" && strings.ContainsRune("aeiou", rune(noun[0])) {
		return "an " + noun
	}
	return "a " + noun
}

// openingFenceIn finds a line of a calc block's source that opens a fence
// ("```chart", "~~~"), with its index.
func openingFenceIn(src string) (int, string) {
	for i, line := range strings.Split(src, "\n") {
		t := strings.TrimSpace(line)
		if strings.HasPrefix(t, "```") || strings.HasPrefix(t, "~~~") {
			return i, t
		}
	}
	return 0, ""
}
