package site

import (
	"bufio"
	"crypto/sha256"
	"encoding/gob"
	"os"
	"path/filepath"
	"slices"
	"sync"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/render"
)

// pageFormsFile is the file of the cache that keeps what loading took
// from each page's source the last time (pageForm), so that a build after
// an edit parses only the pages that changed. pageFormsFormat changes
// whenever pageForm does.
const (
	pageFormsFile   = "pages.gob"
	pageFormsFormat = 1
)

// pageForm is what loadPage takes from a page's source besides its
// rendered content: with the page's path and the catalog it gives the
// Page loadPage gives, but for body and source (TestPageFormKeepsPage).
type pageForm struct {
	Front         FrontMatter
	FrontLines    map[string]int
	TitleParts    []titlePart
	Blocks        []blockSource
	Refs          []valueRef
	Charts        []chartName
	Links         []render.LinkRef
	Anchors       []string
	ListsCautions bool
}

// blockSource is a calc block as its page holds it: its file line and
// TOML, which the catalog decodes again.
type blockSource struct {
	Line   int
	Source string
}

// pageFormsHeader opens the file: its format and the catalog and
// Markdown settings the forms were read with (outcomesNamespace).
type pageFormsHeader struct {
	Format    int
	Namespace string
}

// pageFormEntry is one page of the file: its path from content/, the
// hash of its source and its form.
type pageFormEntry struct {
	Rel  string
	Sum  [sha256.Size]byte
	Form *pageForm
}

// pageForms keeps the forms of the last build's pages and gathers this
// build's. It is safe for concurrent use.
type pageForms struct {
	namespace string
	mu        sync.Mutex
	last      map[string]pageFormEntry // by Rel
	used      map[string]pageFormEntry
	// added: this build read a page the file did not hold as it is.
	added bool
	// held is how many forms the file held.
	held int
}

// readPageForms reads the forms kept in the cache folder dir; a file that
// is missing, of another format or namespace, or cut short gives what it
// holds.
func readPageForms(dir, namespace string) *pageForms {
	f := &pageForms{namespace: namespace, last: map[string]pageFormEntry{}, used: map[string]pageFormEntry{}}
	file, err := os.Open(filepath.Join(dir, pageFormsFile))
	if err != nil {
		return f
	}
	defer file.Close()
	dec := gob.NewDecoder(bufio.NewReaderSize(file, 1<<16))
	var h pageFormsHeader
	if dec.Decode(&h) != nil || h.Format != pageFormsFormat || h.Namespace != namespace {
		return f
	}
	for {
		var e pageFormEntry
		if dec.Decode(&e) != nil || e.Form == nil {
			return f
		}
		f.last[e.Rel] = e
		f.held++
	}
}

// loaded drops the forms the build did not use: every page is read.
func (f *pageForms) loaded() {
	if f == nil {
		return
	}
	f.mu.Lock()
	f.last = nil
	f.mu.Unlock()
}

// page makes the page content/rel from its form when the file's hash is
// sum and its calc blocks decode as they did; else it returns nil and
// the page is read from its file. The page is rendered later, from its
// file (Page.prepare).
func (f *pageForms) page(rel string, sum [sha256.Size]byte, cat *calc.Catalog) *Page {
	if f == nil {
		return nil
	}
	f.mu.Lock()
	e, ok := f.last[rel]
	f.mu.Unlock()
	if !ok || e.Sum != sum {
		return nil
	}
	form := e.Form
	file := ContentDir + "/" + rel
	p := &Page{File: file, Rel: rel, Out: PageOutput(file), Front: form.Front, frontLines: form.FrontLines,
		sourceSum: sum, titleParts: form.TitleParts, refs: notNil(form.Refs), charts: form.Charts, links: form.Links,
		anchors: form.Anchors, listsCautions: form.ListsCautions}
	for _, b := range form.Blocks {
		block, err := cat.ParseBlock(file, b.Line, b.Source)
		if err != nil {
			return nil
		}
		p.blocks = append(p.blocks, block)
	}
	p.setHeading(func(i int) string { return p.refs[i].Written })
	f.mu.Lock()
	f.used[rel] = e
	f.mu.Unlock()
	return p
}

// keep keeps the form of page p, read from its file without a problem.
func (f *pageForms) keep(p *Page) {
	if f == nil {
		return
	}
	form := &pageForm{Front: p.Front, FrontLines: p.frontLines, TitleParts: p.titleParts, Refs: p.refs, Charts: p.charts,
		Links: p.links, Anchors: p.anchors, ListsCautions: p.listsCautions}
	for _, b := range p.blocks {
		form.Blocks = append(form.Blocks, blockSource{Line: b.Line, Source: b.Source})
	}
	f.mu.Lock()
	f.used[p.Rel] = pageFormEntry{Rel: p.Rel, Sum: p.sourceSum, Form: form}
	f.added = true
	f.mu.Unlock()
}

// save writes the forms of this build's pages into the cache folder dir,
// whole or not at all, when they differ from what the file holds. A file
// that cannot be written only costs the next build its shortcut.
func (f *pageForms) save(dir string) error {
	if !f.added && len(f.used) == f.held {
		return nil
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	rels := make([]string, 0, len(f.used))
	for rel := range f.used {
		rels = append(rels, rel)
	}
	slices.Sort(rels)
	return writeGobAside(filepath.Join(dir, pageFormsFile), func(enc *gob.Encoder) error {
		if err := enc.Encode(pageFormsHeader{Format: pageFormsFormat, Namespace: f.namespace}); err != nil {
			return err
		}
		for _, rel := range rels {
			if err := enc.Encode(f.used[rel]); err != nil {
				return err
			}
		}
		return nil
	})
}

// writeGobAside writes a file of gob values, aside and then renamed.
func writeGobAside(path string, write func(*gob.Encoder) error) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+"-")
	if err != nil {
		return err
	}
	w := bufio.NewWriterSize(tmp, 1<<16)
	err = write(gob.NewEncoder(w))
	if err == nil {
		err = w.Flush()
	}
	if cerr := tmp.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Chmod(tmp.Name(), 0o644)
	}
	if err == nil {
		err = os.Rename(tmp.Name(), path)
	}
	if err != nil {
		_ = os.Remove(tmp.Name())
	}
	return err
}

// notNil gives an empty slice for nil: gob gives an empty slice back as
// nil, where a page read from its file has an empty one.
func notNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}

// pendingForms is the cache folder's page forms while they are read.
type pendingForms struct{ *pending[*pageForms] }

// readingPageForms starts reading the page forms saved in root's cache.
func readingPageForms(root string) *pendingForms {
	return &pendingForms{readingCache(root, readPageForms)}
}

// forms waits for the forms and returns them, nil when there are none.
func (p *pendingForms) forms() *pageForms {
	if p == nil {
		return nil
	}
	return p.wait()
}
