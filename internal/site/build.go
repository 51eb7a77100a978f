package site

import (
	"bytes"
	"cmp"
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"html/template"
	"io"
	"maps"
	"os"
	"path"
	"path/filepath"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/render"
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

// plainBudget is how many bytes of prepared pages and search entries a
// build keeps as they are before it deflates the rest: a site of a few
// thousand pages spends no time packing, a bigger one holds this much
// more than the deflated data.
const plainBudget = 16 << 20

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
	packer    *render.Packer // of md, and of the search entries
	layouts   *layouts
	// Calc holds every evaluated calculation block of the site.
	Calc      *calc.Set
	blockPage map[string]*Page     // block id → the page that holds it
	cautions  []render.CautionItem // every caution of the site, for caution lists
	refViews  map[*Page][]refView  // each page's inline values as shown
	// listingPages list every caution of the site, in page order.
	listingPages []*Page
	revision     *Revision
	generator    string // version.Generator, read once
	// outcomes, when set, keeps the models' outcomes between builds.
	outcomes calc.OutcomeStore
	// progress hears of charts drawn during render; charts counts them.
	progress    func(stage string, done, total int)
	charts      atomic.Int64
	chartsTotal int
	// drawsLeft counts, by block id, the charts of the block still to draw.
	drawsLeft map[string]*atomic.Int32
	// writtenOnce: the site is written once (Build), so a page's prepared
	// content goes as soon as the page is written.
	writtenOnce bool
}

// MaxErrors is how many input problems one run reports; the rest are
// counted.
const MaxErrors = 50

// Load reads a site root: configuration, templates and every page. It
// reports every input problem of the site at once, by file and line (at
// most MaxErrors): each step goes on past a problem as far as the rest
// does not depend on it.
func Load(root string) (*Site, error) { return load(root, loadOptions{}) }

// loadOptions are what a build that follows another brings to Load.
type loadOptions struct {
	outcomes calc.OutcomeStore // keeps the models' outcomes
	// later: pages are rendered only when written (Page.prepare), for a
	// build that takes most of them over from the last one.
	later bool
	pages *pageCache // the pages last read, to read again only changed ones
	// forms are what the last builds took from each page's source, used
	// for pages whose hash in sums (by path from content/) is as it was
	// then; pages read from their files join them.
	forms *pageForms
	sums  map[string][sha256.Size]byte
	// revision, when revisionRead, is the git revision already read (nil
	// outside git), which the pages show.
	revision     *Revision
	revisionRead bool
}

// load is Load with what the last build left.
func load(root string, opt loadOptions) (*Site, error) {
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
	packer := render.NewPacker(plainBudget)
	s := &Site{Root: root, Config: cfg, layouts: lay, packer: packer, outcomes: opt.outcomes, generator: version.Generator(),
		md: render.New(render.WithRawHTML(cfg.Markdown.RawHTML), render.WithPacker(packer))}
	pages := make([]*Page, len(rels))
	errs := make([]error, len(rels))
	calc.Parallel(len(rels), func(i int) {
		if pages[i] = opt.pages.lookup(root, rels[i]); pages[i] != nil {
			return
		}
		if sum, ok := opt.sums[rels[i]]; ok && opt.later {
			if pages[i] = opt.forms.page(rels[i], sum, cfg.catalog); pages[i] != nil {
				return
			}
		}
		pages[i], errs[i] = loadPage(root, rels[i], s.md, cfg.catalog, opt.later)
		if errs[i] == nil {
			opt.pages.keep(pages[i])
			opt.forms.keep(pages[i])
		}
	})
	opt.forms.loaded()
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
	s.revision = opt.revision
	if !opt.revisionRead {
		s.revision = revisionOf(root)
	}
	for _, p := range s.Pages {
		if p.listsCautions {
			s.listingPages = append(s.listingPages, p)
		}
	}
	return s, nil
}

// Build loads the site at root and writes it to the output folder. The
// previous output stays untouched unless the whole build succeeds. When
// nothing the build reads has changed since the last build into the same
// folder, and that output is as it was left, nothing is redone; otherwise
// only the files whose inputs changed are made again, and the others are
// taken over from the last build (see incremental.go).
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
	last := readManifest(root, out)
	// The output is looked over while the inputs are read.
	intact := make(chan bool, 1)
	go func() { intact <- last.intact(out) }()
	fp, revision, sums, sources, fpErr := fingerprint(root, out, last)
	wasIntact := <-intact
	if wasIntact && fpErr == nil && last.Fingerprint == fp {
		return &Summary{Out: out, Pages: last.Pages, Problems: last.Problems, Tally: last.Tally, UpToDate: true,
			Written: !opts.Strict || len(last.Problems) == 0}, nil
	}
	// What the last build left is read while the pages are.
	outcomes, forms := readingOutcomes(root), readingPageForms(root)
	reusable := make(chan *lastOutput, 1)
	go func() { reusable <- last.reusable(root, out, wasIntact) }()
	s, err := load(root, loadOptions{outcomes: outcomes, later: last.rendersLike(root), revision: revision, revisionRead: fpErr == nil,
		forms: forms.forms(), sums: sums})
	takeOver := <-reusable
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
	s.writtenOnce = true
	sum, record, files, settled, err := s.write(opts, takeOver, true)
	if err != nil {
		return nil, err
	}
	sum.Problems, sum.Tally = problems, tally
	if o := outcomes.store(); o != nil {
		_ = o.save(filepath.Join(root, CacheDir))
	}
	if f := forms.forms(); f != nil {
		_ = f.save(filepath.Join(root, CacheDir))
	}
	if fpErr == nil {
		remember(root, out, fp, sources, sum.Pages, problems, tally, record, files)
	}
	if err := settled(); err != nil {
		return nil, err
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
	sum, _, _, settled, err := s.write(opts, nil, false)
	if err != nil {
		return nil, err
	}
	return sum, settled()
}

// write renders the site into a staging folder beside the output and
// swaps it into place. Files whose inputs are as last recorded are hard
// links to the last output (copies where the disk has no links), never
// written through: the last output stays as it was until the swap. It
// returns this build's record and its output files as the manifest keeps
// them (nil when they could not all be read). Without record it makes
// neither. The old output may still be going when it returns: settled
// waits for it.
func (s *Site) write(opts Options, last *lastOutput, record bool) (*Summary, *buildRecord, map[string]outputFile, func() error, error) {
	out := outputPath(s.Root, opts.Out)
	if err := checkOutputDir(s.Root, out); err != nil {
		return nil, nil, nil, nil, err
	}
	st, err := newStaging(out)
	if err != nil {
		return nil, nil, nil, nil, err
	}
	interrupted := func() bool { return opts.Context != nil && opts.Context.Err() != nil }
	var mu sync.Mutex
	written, kept := []string{OutputMarker}, map[string]outputFile{}
	to := sink{
		put: func(name string, write func(io.Writer) error) error {
			if interrupted() {
				return ErrInterrupted
			}
			mu.Lock()
			_, linked := kept[name]
			written = append(written, name)
			mu.Unlock()
			if linked {
				// A file kept before its page had to be made again is a
				// link to the last output: never write through it.
				_ = os.Remove(filepath.Join(st.dir, filepath.FromSlash(name)))
			}
			return st.create(name, write)
		},
		last: last.open,
		keep: func(name string) bool {
			if interrupted() || !last.linkInto(st.dir, name) {
				return false
			}
			mu.Lock()
			kept[name] = last.files[name]
			mu.Unlock()
			return true
		},
		record: record,
	}
	var previous *buildRecord
	if last != nil {
		previous = last.record
		s.makeFolders(st)
	}
	made, err := s.emit(to, opts.Progress, previous)
	if err == nil && interrupted() {
		err = ErrInterrupted
	}
	if err != nil {
		st.abandon()
		return nil, nil, nil, nil, err
	}
	if err := st.commit(); err != nil {
		st.abandon()
		return nil, nil, nil, nil, err
	}
	if !record {
		return &Summary{Out: out, Pages: len(s.Pages), Written: true}, nil, nil, st.settled, nil
	}
	// Kept files are as the last manifest has them; written ones (and
	// any kept one written over after all) are looked at.
	files := kept
	for _, name := range written {
		info, err := os.Lstat(filepath.Join(out, filepath.FromSlash(name)))
		if err != nil {
			files = nil
			break
		}
		files[name] = outputFile{Size: info.Size(), ModTime: info.ModTime().UnixNano()}
	}
	return &Summary{Out: out, Pages: len(s.Pages), Written: true}, made, files, st.settled, nil
}

// makeFolders makes in the staging folder the folder of every page,
// parents first, once each, so that a page's files taken over from the
// last build are linked at the first try. Every folder made holds a page
// or a folder that does, as in a build made afresh.
func (s *Site) makeFolders(st *staging) {
	folders := map[string]bool{}
	for _, p := range s.Pages {
		for dir := path.Dir(p.Out); dir != "." && !folders[dir]; dir = path.Dir(dir) {
			folders[dir] = true
		}
	}
	for _, dir := range slices.Sorted(maps.Keys(folders)) {
		p := filepath.Join(st.dir, filepath.FromSlash(dir))
		if os.Mkdir(p, 0o755) == nil {
			st.made.Store(p, true)
		}
	}
}

// Render produces every output file in memory, keyed by output path (the
// preview serves them from there).
func (s *Site) Render() (map[string][]byte, error) {
	files, _, err := s.renderFiles(nil, nil, false)
	return files, err
}

// renderFiles is Render, taking over from files, the last build's, every
// file whose inputs are as previous records them; with record, it returns
// this build's record.
func (s *Site) renderFiles(files map[string][]byte, previous *buildRecord, record bool) (map[string][]byte, *buildRecord, error) {
	made := map[string][]byte{}
	var mu sync.Mutex
	to := sink{
		put: func(name string, write func(io.Writer) error) error {
			var buf bytes.Buffer
			if err := write(&buf); err != nil {
				return err
			}
			mu.Lock()
			made[name] = buf.Bytes()
			mu.Unlock()
			return nil
		},
		last: func(name string) lastFile {
			if data, ok := files[name]; ok {
				return lastBytes{bytes.NewReader(data)}
			}
			return nil
		},
		keep: func(name string) bool {
			data, ok := files[name]
			if ok {
				mu.Lock()
				made[name] = data
				mu.Unlock()
			}
			return ok
		},
		record: record,
	}
	rec, err := s.emit(to, nil, previous)
	return made, rec, err
}

// bytesOf is a writer func for data already in memory.
func bytesOf(data []byte) func(io.Writer) error {
	return func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	}
}

// emit hands every output file to the sink: pages as soon as each is
// rendered, results.json block by block, so that a big site is never held
// in memory whole. With the record of the last build, every page whose
// key is as recorded, and results.json when no block changed, is kept
// rather than made again. put may be called from several goroutines. Two
// files with one name are an error. It returns this build's record, nil
// unless the sink asks for one.
func (s *Site) emit(to sink, progress func(stage string, done, total int), previous *buildRecord) (*buildRecord, error) {
	put := to.put
	static, err := readStatic(s.Root)
	if err != nil {
		return nil, err
	}
	// Keys are worked out only for a build that is recorded.
	var renderFP string
	var blocks blockDigests
	if to.record {
		if renderFP, err = renderFingerprint(s.Root); err != nil {
			return nil, err
		}
		blocks = s.blockDigests()
	}
	if !to.record || previous != nil && previous.Render != renderFP {
		previous = nil
	}
	record := &buildRecord{Render: renderFP, Results: blocks.all}
	// results.json is written while the pages are; emit returns only
	// once it is.
	resultsWritten := make(chan error, 1)
	waitResults := sync.OnceValue(func() error { return <-resultsWritten })
	defer waitResults()
	if previous == nil || previous.Results != blocks.all || !to.keep("results.json") {
		go func() {
			resultsWritten <- put("results.json", func(w io.Writer) error {
				var err error
				record.Entries, err = s.writeResults(w, to, previous, blocks)
				return err
			})
		}()
	} else {
		record.Entries = previous.Entries
		resultsWritten <- nil
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
			return nil, err
		}
	}
	for _, name := range slices.Sorted(maps.Keys(static)) {
		if other, ok := names.take(name, StaticDir+"/"+name); !ok {
			return nil, &inputerr.Error{File: StaticDir + "/" + name, Msg: fmt.Sprintf("its output %s clashes with %s; rename the file", name, other)}
		}
		if err := put(name, bytesOf(static[name])); err != nil {
			return nil, err
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
		return nil, err
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
	records := make([]pageRecord, len(s.Pages))
	s.progress = progress
	var rendered atomic.Int64
	calc.Parallel(len(s.Pages), func(i int) {
		p := s.Pages[i]
		key := ""
		if to.record {
			key = s.pageKey(p, renderFP, blocks)
		}
		if rec, ok := previous.page(p.File, key); ok && keepAll(to, rec.Files) {
			for _, name := range rec.Files {
				if err := claim(p, name); err != nil {
					errs[i] = err
					return
				}
			}
			packed, err := s.packer.Pack(rec.Search)
			if err != nil {
				errs[i] = err
				return
			}
			entries[i], records[i] = packed, rec
			for _, b := range p.blocks {
				for range b.Show.Charts {
					s.chartDone(b.ID)
				}
			}
			for _, n := range p.charts {
				s.chartDone(n.Block)
			}
		} else {
			files, entry, err := s.renderPage(p)
			var search []byte
			if err == nil {
				search, err = entry.json()
			}
			if err == nil {
				entries[i], err = s.packer.Pack(search)
			}
			if err != nil {
				errs[i] = err
				return
			}
			records[i] = pageRecord{Key: key, Files: slices.Sorted(maps.Keys(files)), Search: search}
			for _, name := range records[i].Files {
				if err := claim(p, name); err != nil {
					errs[i] = err
					return
				}
				if err := put(name, bytesOf(files[name])); err != nil {
					errs[i] = err
					return
				}
			}
			if s.writtenOnce {
				p.body = nil
			}
		}
		if n := rendered.Add(1); progress != nil {
			progress("pages rendered", int(n), len(s.Pages))
		}
	})
	if err := collect(errs); err != nil {
		return nil, err
	}
	if err := waitResults(); err != nil {
		return nil, err
	}
	if err := s.emitHosting(put, names, entries); err != nil || !to.record {
		return nil, err
	}
	// Made last: the pages' prepared content has gone by now.
	record.Pages = make(map[string]pageRecord, len(s.Pages))
	for i, p := range s.Pages {
		record.Pages[p.File] = records[i]
	}
	return record, nil
}

// keepAll keeps every one of a page's files from the last build, or
// reports false when one cannot be kept (the page is then made again,
// writing over the ones kept).
func keepAll(to sink, names []string) bool {
	for _, name := range names {
		if !to.keep(name) {
			return false
		}
	}
	return true
}

// page is the record of page file in the last build when it was made
// from what key says, the page's inputs now.
func (r *buildRecord) page(file, key string) (pageRecord, bool) {
	if r == nil {
		return pageRecord{}, false
	}
	rec, ok := r.Pages[file]
	return rec, ok && rec.Key == key
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

// bodyBuffers hold pages' bodies while they are laid out: a page's body
// is some tens of kilobytes, written in many small pieces.
var bodyBuffers = sync.Pool{New: func() any { return new(bytes.Buffer) }}

// layoutRoom is what a layout adds to a page's body, the most of it
// navigation, which is bounded (navReach), with room to spare.
const layoutRoom = 24 << 10

// contentMark stands for a page's content while its layout runs: no
// template text or escaped value holds a NUL. Escaped, in an attribute or
// a script, its NULs are gone but its words are not.
const (
	contentMark      = "\x00specgen-content-mark\x00"
	contentMarkWords = "content-mark"
)

// layoutWith lays out page p with content, its rendered Markdown. The
// layout runs with a mark where the content goes, which is then put in
// its place: the tens of kilobytes of a page's content are copied once,
// not passed through the template's printing. A layout that shows the
// content other than once, as it is, runs again with the content itself.
func (s *Site) layoutWith(p *Page, rootPrefix string, info PageInfo, content []byte) ([]byte, error) {
	info.Content = contentMark
	framed, err := s.layout(p, rootPrefix, info)
	if err != nil {
		return nil, err
	}
	if at := bytes.Index(framed, []byte(contentMark)); at >= 0 && bytes.Count(framed, []byte(contentMarkWords)) == 1 {
		page := make([]byte, 0, len(framed)-len(contentMark)+len(content))
		page = append(page, framed[:at]...)
		page = append(page, content...)
		return append(page, framed[at+len(contentMark):]...), nil
	}
	info.Content = template.HTML(content)
	return s.layout(p, rootPrefix, info)
}

// renderPage lays out one page; it returns the page and the chart data
// files beside it, keyed by output path, and the page's entry of the
// search index.
func (s *Site) renderPage(p *Page) (map[string][]byte, searchEntry, error) {
	out := map[string][]byte{}
	if err := p.prepare(s.Root, s.md, s.Config.catalog); err != nil {
		return nil, searchEntry{}, err
	}
	up := rootPrefix(p.Out)
	charts, err := s.drawCharts(p, out)
	if err != nil {
		return nil, searchEntry{}, err
	}
	body := bodyBuffers.Get().(*bytes.Buffer)
	defer bodyBuffers.Put(body)
	body.Reset()
	if err := p.body.Write(body, s.fill(p, charts)); err != nil {
		return nil, searchEntry{}, err
	}
	headings := p.body.HeadingsWith(func(ref int) string { return s.refText(p, ref) })
	info := s.pageInfo(p)
	info.TOCCount = len(headings)
	info.TOC = render.Nest(headings)
	page, err := s.layoutWith(p, up, info, body.Bytes())
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

// pageInfo describes page p to its template, all but what its Markdown
// renders to (Content and the TOC).
func (s *Site) pageInfo(p *Page) PageInfo {
	info := s.pageInfoBut(p)
	info.Cautions = pageCautions(s.shownCautions(p))
	return info
}

// pageInfoBut is pageInfo but for Cautions, which shownCautions lists the
// makings of.
func (s *Site) pageInfoBut(p *Page) PageInfo {
	info := PageInfo{
		Title:       p.Title,
		Heading:     cmp.Or(p.Heading, p.Title),
		Description: p.Front.Description,
		Source:      p.File,
		URL:         p.Out,
		Caution:     s.standardCaution(p),
		Alert:       s.pageAlert(p),
	}
	if s.Config.BaseURL != "" {
		info.Canonical = s.Config.BaseURL + href(p.Out)
	}
	return info
}

// siteData describes the site to a page whose way up to the site's root
// is rootPrefix.
func (s *Site) siteData(rootPrefix string) SiteData {
	return SiteData{Title: s.Config.Title, Description: s.Config.Description, Home: href(rootPrefix + s.Home()), Revision: s.revision,
		Generator: s.generator}
}

// layout lays out page p, whose way up to the site's root is rootPrefix,
// with its layout template: info and the site's navigation around it.
func (s *Site) layout(p *Page, rootPrefix string, info PageInfo) ([]byte, error) {
	data := s.pageData(p, rootPrefix, info)
	tpl, err := s.layouts.lookup(p.Front.Template)
	if err != nil {
		return nil, &inputerr.Error{File: p.File, Msg: err.Error()}
	}
	var buf bytes.Buffer
	buf.Grow(len(info.Content) + layoutRoom) // one allocation for most layouts
	if err := tpl.Execute(&buf, data); err != nil {
		return nil, templateError(err, tpl.Name(), "while laying out "+p.File+": ")
	}
	return buf.Bytes(), nil
}

// pageData is what page p's template gets: info and the site's
// navigation around it.
func (s *Site) pageData(p *Page, rootPrefix string, info PageInfo) PageData {
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
	return data
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
