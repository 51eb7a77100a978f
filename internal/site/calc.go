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

	"specgen/internal/calc"
	"specgen/internal/render"
)

// pageBlock ties a decoded block to its node in a page.
type pageBlock struct {
	block *calc.Block
	node  *render.CalcBlock
}

// parseBlocks decodes the calculation blocks of a page.
func parseBlocks(p *Page) error {
	var errs ErrorList
	for _, n := range p.Doc.CalcBlocks() {
		b, err := calc.ParseBlock(p.File, n.FenceLine+p.Doc.LineOffset, n.Source)
		if err != nil {
			errs = append(errs, fromCalc(err)...)
			continue
		}
		p.blocks = append(p.blocks, pageBlock{block: b, node: n})
	}
	return errs.sorted()
}

// fromCalc turns calc errors into site errors.
func fromCalc(err error) ErrorList {
	var list calc.Errors
	if errors.As(err, &list) {
		out := make(ErrorList, len(list))
		for i, e := range list {
			msg := e.Msg
			if e.Key != "" {
				msg = e.Key + ": " + msg
			}
			out[i] = &Error{File: e.File, Line: e.Line, Msg: msg}
		}
		return out
	}
	var one *calc.Error
	if errors.As(err, &one) {
		return fromCalc(calc.Errors{one})
	}
	return ErrorList{{Msg: err.Error()}}
}

// evaluate runs every block of the site, then resolves the value
// references of every page.
func (s *Site) evaluate() error {
	var blocks []*calc.Block
	s.blockPage = map[string]*Page{}
	for _, p := range s.Pages {
		for _, pb := range p.blocks {
			blocks = append(blocks, pb.block)
			if _, dup := s.blockPage[pb.block.ID]; !dup {
				s.blockPage[pb.block.ID] = p
			}
		}
	}
	set, err := calc.Evaluate(blocks, calc.Options{SigFigs: s.Config.SigFigs, Env: s.Config.env})
	if err != nil {
		return fromCalc(err).sorted()
	}
	s.Calc = set
	for _, p := range s.Pages {
		for _, pb := range p.blocks {
			pb.node.Eval, _ = set.Lookup(pb.block.ID)
		}
	}
	charted := map[string]bool{}
	for _, p := range s.Pages {
		for _, pb := range p.blocks {
			s.chartsTotal += len(pb.block.Show.Charts)
			charted[pb.block.ID] = charted[pb.block.ID] || len(pb.block.Show.Charts) > 0
		}
		for _, cr := range p.Doc.ChartRefs() {
			s.chartsTotal += len(cr.Names)
			for _, n := range cr.Names {
				charted[n.Block] = true
			}
		}
	}
	// Curves are only drawn from now on: a big site keeps those it charts.
	for _, e := range set.Blocks {
		if !charted[e.Block.ID] {
			e.Curves = nil
		}
	}
	items := s.cautionItems()
	for _, p := range s.Pages {
		for _, list := range p.Doc.CautionLists() {
			for _, it := range items {
				it.Href = relativeURL(p.Out, s.blockPage[it.Block].Out) + "#" + render.BlockAnchor(it.Block)
				if s.blockPage[it.Block] == p {
					it.Href = "#" + render.BlockAnchor(it.Block)
				}
				list.Items = append(list.Items, it)
			}
		}
	}
	var errs ErrorList
	for _, p := range s.Pages {
		for _, cr := range p.Doc.ChartRefs() {
			errs = append(errs, s.checkChartRef(p, cr)...)
		}
		for _, ref := range p.Doc.ValueRefs() {
			if err := s.resolveRef(p, ref); err != nil {
				errs = append(errs, err)
			}
		}
	}
	return errs.sorted()
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
	for _, pb := range p.blocks {
		add(pb.block.ID)
	}
	for _, ref := range p.Doc.ValueRefs() {
		add(ref.Block)
	}
	for _, cr := range p.Doc.ChartRefs() {
		for _, n := range cr.Names {
			add(n.Block)
		}
	}
	return ids
}

// pageCautions renders the caution boxes of every block the page shows.
func (s *Site) pageCautions(p *Page) template.HTML {
	var b strings.Builder
	w := bufio.NewWriter(&b)
	for _, id := range s.blocksShown(p) {
		e, ok := s.Calc.Lookup(id)
		if !ok {
			continue
		}
		for _, c := range e.Cautions {
			render.WriteCaution(w, c, "Rule "+c.Rule+", block "+id)
		}
	}
	_ = w.Flush()
	return template.HTML(b.String())
}

// showsPressureCalc reports whether a page holds, quotes or charts a
// calculation of a kind that involves pressure.
func (s *Site) showsPressureCalc(p *Page) bool {
	for _, id := range s.blocksShown(p) {
		if e, ok := s.Calc.Lookup(id); ok && slices.Contains(calc.PressureKinds, e.Block.Kind.Name) {
			return true
		}
	}
	return false
}

// resolveRef formats one inline value and links it to its block.
func (s *Site) resolveRef(p *Page, ref *render.ValueRef) *Error {
	line := p.Doc.Line(ref.Offset)
	written := "=[" + ref.Block + "." + ref.Result
	if ref.Unit != "" {
		written += " " + ref.Unit
	}
	written += "]"
	fail := func(format string, args ...any) *Error {
		return &Error{File: p.File, Line: line, Msg: written + ": " + fmt.Sprintf(format, args...)}
	}
	e, ok := s.Calc.Lookup(ref.Block)
	if !ok {
		msg := fmt.Sprintf("there is no block %q in the site", ref.Block)
		if sug := calc.Suggest(ref.Block, s.Calc.IDs()); sug != "" {
			msg += fmt.Sprintf("; did you mean %q?", sug)
		}
		return fail("%s", msg)
	}
	if _, ok := e.Result(ref.Result); !ok {
		names := make([]string, len(e.Results))
		for i, r := range e.Results {
			names[i] = r.Name
		}
		msg := fmt.Sprintf("block %s (%s) has no result %q", ref.Block, e.Block.Kind.Name, ref.Result)
		if sug := calc.Suggest(ref.Result, names); sug != "" {
			msg += fmt.Sprintf("; did you mean %q?", sug)
		} else {
			msg += "; results: " + strings.Join(names, ", ")
		}
		return fail("%s", msg)
	}
	shown, err := e.Format(ref.Result, ref.Unit)
	if err != nil {
		return fail("%v", err)
	}
	ref.Shown = shown
	target := s.blockPage[ref.Block]
	ref.Href = "#" + render.BlockAnchor(ref.Block)
	if target != p {
		ref.Href = relativeURL(p.Out, target.Out) + ref.Href
	}
	return nil
}

// checkChartRef checks that every line of a chart fence names a block and
// one of its kind's charts.
func (s *Site) checkChartRef(p *Page, cr *render.ChartRef) ErrorList {
	var errs ErrorList
	for _, n := range cr.Names {
		fail := func(format string, args ...any) {
			errs = append(errs, &Error{File: p.File, Line: n.Line + p.Doc.LineOffset, Msg: "chart " + n.Text + ": " + fmt.Sprintf(format, args...)})
		}
		e, ok := s.Calc.Lookup(n.Block)
		switch {
		case n.Chart == "":
			fail("write block.chart, such as bellows-lp.pv")
		case !ok:
			msg := fmt.Sprintf("there is no block %q in the site", n.Block)
			if sug := calc.Suggest(n.Block, s.Calc.IDs()); sug != "" {
				msg += fmt.Sprintf("; did you mean %q?", sug)
			}
			fail("%s", msg)
		case !slices.Contains(e.Block.Kind.Charts, n.Chart):
			allowed := strings.Join(e.Block.Kind.Charts, ", ")
			if allowed == "" {
				allowed = "none for this kind"
			}
			fail("block %s (%s) draws no chart %q; allowed: %s", n.Block, e.Block.Kind.Name, n.Chart, allowed)
		}
	}
	return errs
}

// drawCharts draws the charts the page's blocks ask for and adds their
// data files, "<page>.<block>.<chart>.csv" beside the page, to out.
func (s *Site) drawCharts(p *Page, out map[string][]byte) error {
	base := strings.TrimSuffix(p.Out, ".html")
	for _, pb := range p.blocks {
		e := pb.node.Eval
		pb.node.Charts = nil
		for _, name := range pb.block.Show.Charts {
			c, err := e.Chart(name)
			if err != nil {
				return &Error{File: p.File, Line: pb.block.LineOf("show.charts"), Msg: err.Error()}
			}
			csvName := base + "." + pb.block.ID + "." + name + ".csv"
			d, err := render.DrawChart(c, "chart-"+pb.block.ID+"-"+name, path.Base(csvName))
			if err != nil {
				return &Error{File: p.File, Line: pb.block.LineOf("show.charts"), Msg: "block " + pb.block.ID + ": " + err.Error()}
			}
			pb.node.Charts = append(pb.node.Charts, d)
			out[csvName] = d.CSV
			s.chartDrawn()
		}
	}
	for _, cr := range p.Doc.ChartRefs() {
		cr.Charts = nil
		for _, n := range cr.Names {
			e, _ := s.Calc.Lookup(n.Block)
			line := n.Line + p.Doc.LineOffset
			c, err := e.Chart(n.Chart)
			if err != nil {
				return &Error{File: p.File, Line: line, Msg: err.Error()}
			}
			csvName := base + "." + n.Block + "." + n.Chart + ".csv"
			d, err := render.DrawChart(c, "chartref-"+n.Block+"-"+n.Chart, path.Base(csvName))
			if err != nil {
				return &Error{File: p.File, Line: line, Msg: "chart " + n.Text + ": " + err.Error()}
			}
			cr.Charts = append(cr.Charts, d)
			out[csvName] = d.CSV
			s.chartDrawn()
		}
	}
	return nil
}

// chartDrawn counts a chart for the progress display.
func (s *Site) chartDrawn() {
	if n := s.charts.Add(1); s.progress != nil {
		s.progress("charts drawn", int(n), s.chartsTotal)
	}
}

// relativeURL is the link from output page from to output page to.
func relativeURL(from, to string) string {
	return strings.Repeat("../", strings.Count(from, "/")) + path.Clean(to)
}
