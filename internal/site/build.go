package site

import (
	"bytes"
	"cmp"
	"context"
	"errors"
	"fmt"
	"html/template"
	"io"
	"maps"
	"path/filepath"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/render"
	"github.com/millrace-workshop/specgen/internal/results"
	"github.com/millrace-workshop/specgen/internal/version"
)

// StaticDir is the optional folder of a site root copied into the output as is.
const StaticDir = "static"

// DefaultOut is the output folder, relative to the site root, when none is given.
const DefaultOut = "dist"

// Options are the settings of one build.
type Options struct {
	Out string // output folder; relative paths are taken from the site root
	// Strict writes nothing when a claim fails or a DANGER caution is not
	// acknowledged.
	Strict bool
	// Progress, when set, hears how far the build is: a stage ("pages
	// read", "blocks evaluated", "pages rendered", "charts drawn") and a
	// count of total. It may be called from several
	// goroutines at once.
	Progress func(stage string, done, total int)
	// Context, when set, stops the build once it is done (Ctrl-C): the
	// unfinished output is removed and the previous one stays as it was.
	Context context.Context
}

// ErrInterrupted is returned by a build whose Context was done.
var ErrInterrupted = errors.New("build interrupted; nothing written, the previous output is as it was")

// Summary tells what a build did.
type Summary struct {
	Out      string // absolute output folder
	Pages    int
	Problems []Problem // failed claims and unacknowledged DANGER cautions
	Tally    Tally     // what the build evaluated, as check counts it
	Written  bool      // false when Strict refused to write
	UpToDate bool      // nothing had changed since the last build: nothing was redone
}

// Site is a loaded site: configuration, layouts and parsed pages.
type Site struct {
	Root    string
	Config  Config
	Pages   []*Page // sorted by content path
	nav     *navNode
	reading []*Page // reading order, for previous and next
	// readingAt is each page's place in reading.
	readingAt map[*Page]int
	md        *render.Markdown
	layouts   *layouts
	// Calc holds every evaluated calculation block of the site.
	Calc      *calc.Set
	blockPage map[string]*Page     // block id → the page that holds it
	cautions  []render.CautionItem // every caution of the site, for caution lists
	revision  *Revision
	// progress hears of charts drawn during render; charts counts them.
	progress    func(stage string, done, total int)
	charts      atomic.Int64
	chartsTotal int
	// drawsLeft counts, by block id, the charts of the block still to draw.
	drawsLeft map[string]*atomic.Int32
}

// MaxErrors is how many input problems one run reports; the rest are
// counted.
const MaxErrors = 50

// Load reads a site root: configuration, templates and every page. It
// reports every input problem of the site at once, by file and line (at
// most MaxErrors): each step goes on past a problem as far as the rest
// does not depend on it.
func Load(root string) (*Site, error) {
	if err := CheckRoot(root); err != nil {
		return nil, err
	}
	root, err := filepath.Abs(root)
	if err != nil {
		return nil, err
	}
	var problems inputerr.List
	// keep adds an input error to the problems; it returns any other error.
	keep := func(err error) error {
		if err == nil || !inputerr.Is(err) {
			return err
		}
		problems = append(problems, inputerr.From(err)...)
		return nil
	}
	reported := func() error { return problems.Capped(MaxErrors, "in this site").Sorted() }
	cfg, err := LoadConfig(root)
	if err := keep(err); err != nil {
		return nil, err
	}
	lay, err := loadLayouts(root)
	if err := keep(err); err != nil {
		return nil, err
	}
	rels, err := findPages(root)
	if err := keep(err); err != nil {
		return nil, err
	}
	if rels == nil {
		return nil, reported()
	}
	s := &Site{Root: root, Config: cfg, layouts: lay, md: render.New(render.WithRawHTML(cfg.Markdown.RawHTML))}
	pages := make([]*Page, len(rels))
	errs := make([]error, len(rels))
	calc.Parallel(len(rels), func(i int) {
		pages[i], errs[i] = loadPage(root, rels[i], s.md, cfg.catalog)
	})
	if err := keep(collect(errs)); err != nil {
		return nil, err
	}
	for _, p := range pages {
		if p != nil {
			s.Pages = append(s.Pages, p)
		}
	}
	if err := keep(checkOutputClashes(s.Pages)); err != nil {
		return nil, err
	}
	if lay != nil {
		for _, p := range s.Pages {
			if _, err := lay.lookup(p.Front.Template); err != nil {
				problems = append(problems, &inputerr.Error{File: p.File, Line: p.frontLine("template"), Msg: "front matter: " + err.Error()})
			}
		}
	}
	if err := keep(s.evaluate()); err != nil {
		return nil, err
	}
	static, err := readStatic(root)
	if err := keep(err); err != nil {
		return nil, err
	}
	names := map[string]bool{}
	for name := range static {
		names[name] = true
	}
	if lay != nil {
		problems = append(problems, s.checkLinks(names)...)
	}
	if err := reported(); err != nil {
		return nil, err
	}
	s.nav, s.reading = buildNav(s.Pages)
	s.readingAt = make(map[*Page]int, len(s.reading))
	for i, p := range s.reading {
		s.readingAt[p] = i
	}
	s.revision = revisionOf(root)
	return s, nil
}

// Build loads the site at root and writes it to the output folder. The
// previous output stays untouched unless the whole build succeeds. When
// nothing the build reads has changed since the last build into the same
// folder, and that output is as it was left, nothing is redone.
func Build(root string, opts Options) (*Summary, error) {
	if err := CheckRoot(root); err != nil {
		return nil, err
	}
	root, err := filepath.Abs(root)
	if err != nil {
		return nil, err
	}
	out := outputPath(root, opts.Out)
	if err := checkOutputDir(root, out); err != nil {
		return nil, err
	}
	fp, fpErr := fingerprint(root, out)
	if fpErr == nil {
		if m, ok := upToDate(root, out, fp); ok {
			return &Summary{Out: out, Pages: m.Pages, Problems: m.Problems, Tally: m.Tally, UpToDate: true,
				Written: !opts.Strict || len(m.Problems) == 0}, nil
		}
	}
	s, err := Load(root)
	if err != nil {
		return nil, err
	}
	if opts.Progress != nil {
		opts.Progress("pages read", len(s.Pages), len(s.Pages))
		opts.Progress("blocks evaluated", len(s.Calc.Blocks), len(s.Calc.Blocks))
	}
	problems, tally := s.Problems(), s.Tally()
	if opts.Strict && len(problems) > 0 {
		return &Summary{Out: out, Pages: len(s.Pages), Problems: problems, Tally: tally}, nil
	}
	sum, err := s.Write(opts)
	if err != nil {
		return nil, err
	}
	sum.Problems, sum.Tally = problems, tally
	if fpErr == nil {
		remember(root, out, fp, sum.Pages, problems, tally)
	}
	return sum, nil
}

// outputPath resolves the output folder against the site root.
func outputPath(root, out string) string {
	if out == "" {
		out = DefaultOut
	}
	if !filepath.IsAbs(out) {
		out = filepath.Join(root, out)
	}
	return filepath.Clean(out)
}

// Write renders every page and swaps the finished output into place.
func (s *Site) Write(opts Options) (*Summary, error) {
	out := outputPath(s.Root, opts.Out)
	if err := checkOutputDir(s.Root, out); err != nil {
		return nil, err
	}
	st, err := newStaging(out)
	if err != nil {
		return nil, err
	}
	put := st.create
	if ctx := opts.Context; ctx != nil {
		put = func(name string, write func(io.Writer) error) error {
			if ctx.Err() != nil {
				return ErrInterrupted
			}
			return st.create(name, write)
		}
	}
	err = s.emit(put, opts.Progress)
	if err != nil {
		st.abandon()
		return nil, err
	}
	if err := st.commit(); err != nil {
		st.abandon()
		return nil, err
	}
	return &Summary{Out: out, Pages: len(s.Pages), Written: true}, nil
}

// Render produces every output file in memory, keyed by output path (the
// preview serves them from there).
func (s *Site) Render() (map[string][]byte, error) {
	files := map[string][]byte{}
	var mu sync.Mutex
	err := s.emit(func(name string, write func(io.Writer) error) error {
		var buf bytes.Buffer
		if err := write(&buf); err != nil {
			return err
		}
		mu.Lock()
		files[name] = buf.Bytes()
		mu.Unlock()
		return nil
	}, nil)
	return files, err
}

// bytesOf is a writer func for data already in memory.
func bytesOf(data []byte) func(io.Writer) error {
	return func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	}
}

// emit hands every output file to put, with a func that writes its
// contents: pages as soon as each is rendered, results.json block by
// block, so that a big site is never held in memory whole. put may be
// called from several goroutines. Two files with one name are an error.
func (s *Site) emit(put func(name string, write func(io.Writer) error) error, progress func(stage string, done, total int)) error {
	static, err := readStatic(s.Root)
	if err != nil {
		return err
	}
	if err := put("results.json", func(w io.Writer) error { return results.Write(w, s.blocks()) }); err != nil {
		return err
	}
	fixed := map[string][]byte{"assets/syntax.css": render.SyntaxCSS()}
	for name, data := range s.layouts.assets {
		fixed["assets/"+name] = data
	}
	names := newOutputNames()
	names.take("results.json", "specgen's own results.json")
	names.take(searchIndexFile, "specgen's own "+searchIndexFile)
	for _, name := range slices.Sorted(maps.Keys(fixed)) {
		names.take(name, "specgen's own "+name)
		if err := put(name, bytesOf(fixed[name])); err != nil {
			return err
		}
	}
	for _, name := range slices.Sorted(maps.Keys(static)) {
		if other, ok := names.take(name, StaticDir+"/"+name); !ok {
			return &inputerr.Error{File: StaticDir + "/" + name, Msg: fmt.Sprintf("its output %s clashes with %s; rename the file", name, other)}
		}
		if err := put(name, bytesOf(static[name])); err != nil {
			return err
		}
	}
	// Pages take their names in order before rendering in parallel, so
	// that which of two clashing files is blamed never depends on timing.
	var clashes inputerr.List
	for _, p := range s.Pages {
		if other, ok := names.take(p.Out, p.File); !ok {
			clashes = append(clashes, &inputerr.Error{File: p.File, Msg: fmt.Sprintf("its output %s clashes with %s; rename one", p.Out, other)})
		}
	}
	if err := clashes.Sorted(); err != nil {
		return err
	}
	claim := func(p *Page, name string) error {
		if name == p.Out {
			return nil
		}
		if other, ok := names.take(name, p.File); !ok {
			return &inputerr.Error{File: p.File, Msg: fmt.Sprintf("its output %s clashes with %s; rename one", name, other)}
		}
		return nil
	}
	errs := make([]error, len(s.Pages))
	entries := make([]render.Packed, len(s.Pages))
	s.progress = progress
	var rendered atomic.Int64
	calc.Parallel(len(s.Pages), func(i int) {
		p := s.Pages[i]
		files, entry, err := s.renderPage(p)
		if err == nil {
			entries[i], err = entry.packed()
		}
		if err != nil {
			errs[i] = err
			return
		}
		for _, name := range slices.Sorted(maps.Keys(files)) {
			if err := claim(p, name); err != nil {
				errs[i] = err
				return
			}
			if err := put(name, bytesOf(files[name])); err != nil {
				errs[i] = err
				return
			}
		}
		if n := rendered.Add(1); progress != nil {
			progress("pages rendered", int(n), len(s.Pages))
		}
	})
	if err := collect(errs); err != nil {
		return err
	}
	return s.emitHosting(put, names, entries)
}

// PageData is what a page template receives.
type PageData struct {
	Site        SiteData
	Page        PageInfo
	Root        string // relative prefix from the page to the site root: "", "../", ...
	Nav         []NavItem
	Breadcrumbs []Link
	Prev, Next  *Link
}

// SiteData describes the site for templates.
type SiteData struct {
	Title       string
	Description string
	Home        string    // URL of the home page, relative to the current page
	Revision    *Revision // the git commit built from, nil outside git
	Generator   string    // the specgen that built the site: "specgen v0.1.0"
}

// PageInfo describes the current page for templates.
type PageInfo struct {
	Title       string
	Heading     string // the visible h1: the page's own heading, else the title
	Description string
	Source      string // the Markdown file, relative to the site root
	URL         string // the page's own output path from the site root
	Content     template.HTML
	TOC         []render.Heading // nested by level
	TOCCount    int              // headings in the TOC, all levels
	// Caution is the standard compressed-air caution: the box on pages
	// that hold a pressure calculation, a one-line strip on pages that
	// only quote or chart one, else empty.
	Caution template.HTML
	// Alert says under the title that a block the page shows has a
	// failed claim or an unacknowledged DANGER, else empty.
	Alert template.HTML
	// Cautions are the caution boxes of every block the page shows or
	// quotes, for layouts that gather them (the spec layout).
	Cautions template.HTML
	// Canonical is the page's full address when specgen.toml gives
	// base_url, else empty.
	Canonical string
}

// Home is the output path of the home page: content/index.md, or the
// first page in reading order when the site has none.
func (s *Site) Home() string {
	if s.nav.Page != nil || len(s.reading) == 0 {
		return "index.html"
	}
	return s.reading[0].Out
}

// renderPage lays out one page; it returns the page and the chart data
// files beside it, keyed by output path, and the page's entry of the
// search index.
func (s *Site) renderPage(p *Page) (map[string][]byte, searchEntry, error) {
	out := map[string][]byte{}
	up := rootPrefix(p.Out)
	charts, err := s.drawCharts(p, out)
	if err != nil {
		return nil, searchEntry{}, err
	}
	var body bytes.Buffer
	if err := p.body.Write(&body, s.fill(p, charts)); err != nil {
		return nil, searchEntry{}, err
	}
	headings := p.body.HeadingsWith(func(ref int) string { return s.refText(p, ref) })
	info := PageInfo{
		Title:       p.Title,
		Heading:     cmp.Or(p.Heading, p.Title),
		Description: p.Front.Description,
		Source:      p.File,
		URL:         p.Out,
		Content:     template.HTML(body.String()),
		TOCCount:    len(headings),
		Caution:     s.standardCaution(p),
		Alert:       s.pageAlert(p),
		Cautions:    s.pageCautions(p),
		TOC:         render.Nest(headings),
	}
	if s.Config.BaseURL != "" {
		info.Canonical = s.Config.BaseURL + href(p.Out)
	}
	page, err := s.layout(p, up, info)
	if err != nil {
		return nil, searchEntry{}, err
	}
	out[p.Out] = page
	text, err := p.body.SearchText(func(ref int) string { return s.refText(p, ref) })
	if err != nil {
		return nil, searchEntry{}, err
	}
	return out, newSearchEntry(p, text, headings), nil
}

// siteData describes the site to a page whose way up to the site's root
// is rootPrefix.
func (s *Site) siteData(rootPrefix string) SiteData {
	return SiteData{Title: s.Config.Title, Description: s.Config.Description, Home: href(rootPrefix + s.Home()), Revision: s.revision,
		Generator: version.Generator()}
}

// layout lays out page p, whose way up to the site's root is rootPrefix,
// with its layout template: info and the site's navigation around it.
func (s *Site) layout(p *Page, rootPrefix string, info PageInfo) ([]byte, error) {
	data := PageData{
		Site:        s.siteData(rootPrefix),
		Page:        info,
		Root:        rootPrefix,
		Nav:         navFor(s.nav, p, rootPrefix),
		Breadcrumbs: breadcrumbsFor(s.nav, p, rootPrefix),
	}
	if i, ok := s.readingAt[p]; ok {
		if i > 0 {
			data.Prev = &Link{Title: s.reading[i-1].Title, URL: href(rootPrefix + s.reading[i-1].Out)}
		}
		if i+1 < len(s.reading) {
			data.Next = &Link{Title: s.reading[i+1].Title, URL: href(rootPrefix + s.reading[i+1].Out)}
		}
	}
	tpl, err := s.layouts.lookup(p.Front.Template)
	if err != nil {
		return nil, &inputerr.Error{File: p.File, Msg: err.Error()}
	}
	var buf bytes.Buffer
	if err := tpl.Execute(&buf, data); err != nil {
		return nil, templateError(err, tpl.Name(), "while laying out "+p.File+": ")
	}
	return buf.Bytes(), nil
}

// collect joins the input errors of a parallel step, sorted by place; a
// failure of the machine wins over input errors.
func collect(errs []error) error {
	var list inputerr.List
	for _, err := range errs {
		switch e := err.(type) {
		case nil:
		case *inputerr.Error:
			list = append(list, e)
		case inputerr.List:
			list = append(list, e...)
		default:
			return err
		}
	}
	return list.Sorted()
}
