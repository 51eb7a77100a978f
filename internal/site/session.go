package site

import (
	"crypto/sha256"
	"os"
	"path/filepath"
	"sync"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// Session builds one site into memory again and again, each build taking
// over from the last good one every file whose inputs have not changed and
// every model outcome whose inputs have not: the preview's builds.
type Session struct {
	root     string
	outcomes *outcomeStore
	pages    *pageCache
	files    map[string][]byte // the last good build's
	record   *buildRecord      // what they were made from
}

// NewSession starts a session on the site at root.
func NewSession(root string) *Session { return &Session{root: root} }

// Build builds the site into memory and returns every output file, keyed
// by output path, and the home page's path. After a failed build the last
// good one stays what the next starts from.
func (se *Session) Build() (files map[string][]byte, home string, err error) {
	// Outcomes and pages read belong to one binary and specgen.toml.
	if ns, err := outcomesNamespace(se.root); err != nil {
		se.outcomes, se.pages = nil, nil
	} else if se.outcomes == nil || se.outcomes.namespace != ns {
		se.outcomes, se.pages = newOutcomeStore(ns), newPageCache()
	}
	var outcomes calc.OutcomeStore
	if se.outcomes != nil {
		outcomes = se.outcomes
	}
	s, err := load(se.root, loadOptions{outcomes: outcomes, later: se.record.rendersLike(se.root), pages: se.pages})
	if err != nil {
		return nil, "", err
	}
	files, record, err := s.renderFiles(se.files, se.record, true)
	if err != nil {
		return nil, "", err
	}
	if se.outcomes != nil {
		se.outcomes.next()
		se.pages.next()
	}
	se.files, se.record = files, record
	return files, s.Home(), nil
}

// pageCache keeps the pages a session read, so that the next build reads
// again only the files that changed. A page is what loadPage made of its
// file; evaluation only sets its title, which lookup sets back. The
// session drops the cache when specgen.toml changes.
type pageCache struct {
	mu          sync.Mutex
	pages, read map[string]*Page // by Rel: the last build's, this one's
}

func newPageCache() *pageCache {
	return &pageCache{pages: map[string]*Page{}, read: map[string]*Page{}}
}

// lookup returns the page last read from content/rel when the file is as
// it was then, else nil.
func (c *pageCache) lookup(root, rel string) *Page {
	if c == nil {
		return nil
	}
	c.mu.Lock()
	p := c.pages[rel]
	c.mu.Unlock()
	if p == nil {
		return nil
	}
	src, err := os.ReadFile(filepath.Join(root, ContentDir, filepath.FromSlash(rel)))
	if err != nil || sha256.Sum256(src) != p.sourceSum {
		return nil
	}
	p.setHeading(func(i int) string { return p.refs[i].Written })
	c.keep(p)
	return p
}

// keep keeps a page read without a problem for the next build.
func (c *pageCache) keep(p *Page) {
	if c == nil {
		return
	}
	c.mu.Lock()
	c.read[p.Rel] = p
	c.mu.Unlock()
}

// next makes this build's pages the ones the next build looks up.
func (c *pageCache) next() {
	if c == nil {
		return
	}
	c.mu.Lock()
	c.pages, c.read = c.read, map[string]*Page{}
	c.mu.Unlock()
}
