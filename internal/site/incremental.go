package site

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"sort"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/results"
)

// buildRecord is what one build's output was made from, so that the next
// build keeps every file whose inputs have not changed.
type buildRecord struct {
	// Render is the fingerprint of what every page is rendered with
	// (renderFingerprint); another one keeps nothing.
	Render string `json:"render"`
	// Results is the key of results.json: every block as evaluated.
	Results string                `json:"results"`
	Pages   map[string]pageRecord `json:"pages"` // by source file
	// Entries are the places of the blocks' entries in results.json, by
	// block id.
	Entries map[string]resultsEntry `json:"entries"`
}

// resultsEntry is where one block's entry lies in results.json, and the
// key it was made from: the block as evaluated, with its place.
type resultsEntry struct {
	Key     string
	At, Len int64
}

// pageRecord is what one page's render produced.
type pageRecord struct {
	Key    string   `json:"key"`    // pageKey
	Files  []string `json:"files"`  // its output files, sorted
	Search []byte   `json:"search"` // its entry of the search index, as the index holds it
}

// sink receives a build's output files.
type sink struct {
	// put writes a file; it may be called from several goroutines.
	put func(name string, write func(io.Writer) error) error
	// keep takes a file as the last build left it, or reports false
	// (there was no last build, or the file is no longer as it was).
	keep func(name string) bool
	// last opens a file as the last build left it, nil when it cannot.
	last func(name string) lastFile
	// record: the build is recorded, for the next one to take over from.
	record bool
}

// rendersLike reports whether the recorded build rendered its pages as
// the site at root renders them now: then most pages will be taken over,
// and are best rendered only when written.
func (r *buildRecord) rendersLike(root string) bool {
	if r == nil {
		return false
	}
	fp, err := renderFingerprint(root)
	return err == nil && fp == r.Render
}

// renderFingerprint hashes what every page is rendered with besides its
// own inputs: the specgen binary (templates embedded in it included),
// specgen.toml and the site's templates/.
func renderFingerprint(root string) (string, error) {
	self, err := binaryHash()
	if err != nil {
		return "", err
	}
	h := sha256.New()
	h.Write([]byte("specgen " + self + "\n"))
	paths := []string{filepath.Join(root, ConfigFile)}
	_ = filepath.WalkDir(filepath.Join(root, TemplatesDir), func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			paths = append(paths, p)
		}
		return nil
	})
	sort.Strings(paths)
	for _, p := range paths {
		data, err := os.ReadFile(p)
		if os.IsNotExist(err) {
			continue
		}
		if err != nil {
			return "", err
		}
		rel, _ := filepath.Rel(root, p)
		d := newDigest().add(filepath.ToSlash(rel), data)
		h.Write([]byte(d.sum()))
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// outcomesNamespace identifies the catalog the models' outcomes belong
// to: the specgen binary and specgen.toml (materials, settings).
func outcomesNamespace(root string) (string, error) {
	self, err := binaryHash()
	if err != nil {
		return "", err
	}
	config, err := os.ReadFile(filepath.Join(root, ConfigFile))
	if err != nil && !os.IsNotExist(err) {
		return "", err
	}
	return newDigest().add(self, config).sum(), nil
}

// blockDigests are the digests of every evaluated block: own, of what
// its table, charts and values show and where it stands; connected, of
// what every block connected to it by quotes, links and [derive] names,
// in either direction, shows wherever it stands: a block's charts and
// cautions may read those (a relief valve's setting marks the chart of
// the stage it protects). all covers every block with its place, the
// key of results.json.
type blockDigests struct {
	own, connected map[string]string
	all            string
}

func (s *Site) blockDigests() blockDigests {
	n := len(s.Calc.Blocks)
	own, placeless := make([]string, n), make([]string, n)
	calc.Parallel(n, func(i int) {
		own[i], placeless[i] = newDigest().withTwin().add(s.Calc.Blocks[i]).sums()
	})
	parent := map[string]string{}
	var find func(id string) string
	find = func(id string) string {
		p, ok := parent[id]
		if !ok || p == id {
			parent[id] = id
			return id
		}
		root := find(p)
		parent[id] = root
		return root
	}
	join := func(a, b string) { parent[find(a)] = find(b) }
	for _, e := range s.Calc.Blocks {
		find(e.Block.ID)
		for _, v := range e.Block.Values {
			for _, id := range v.Deps() {
				join(e.Block.ID, id)
			}
		}
		for _, d := range e.Block.Derive {
			for _, r := range d.Expr.Refs() {
				if r.Block != "" {
					join(e.Block.ID, r.Block)
				}
			}
		}
	}
	members := map[string][]int{}
	all := newDigest()
	out := blockDigests{own: make(map[string]string, n), connected: make(map[string]string, n)}
	for i, e := range s.Calc.Blocks {
		root := find(e.Block.ID)
		members[root] = append(members[root], i)
		all.add(e.Block.ID, own[i])
		out.own[e.Block.ID] = own[i]
	}
	byComponent := map[string]string{}
	for root, list := range members {
		d := newDigest()
		for _, i := range list {
			d.add(s.Calc.Blocks[i].Block.ID, placeless[i])
		}
		byComponent[root] = d.sum()
	}
	for _, e := range s.Calc.Blocks {
		out.connected[e.Block.ID] = byComponent[find(e.Block.ID)]
	}
	out.all = all.sum()
	return out
}

// pageKey is the digest of everything page p's output files and search
// entry are made from, renderFP the fingerprint of what all pages are
// rendered with: its source (which, read and rendered with what renderFP
// covers, gives its content); what its template gets besides its content (navigation, titles, previous and next, its
// cautions and alerts); and what fills its content's holes (the blocks it
// holds and charts with those connected to them, each inline value as
// shown, the links to blocks, the site's cautions when it lists them). It
// reads what renderPage reads, and must keep doing so.
func (s *Site) pageKey(p *Page, renderFP string, blocks blockDigests) string {
	d := newDigest()
	d.add(renderFP, p.File, p.Out, p.sourceSum[:], p.listsCautions)
	// The caution boxes as what they show: rendering them is the most of
	// a page's layout data.
	d.add(s.pageData(p, rootPrefix(p.Out), s.pageInfoBut(p)), s.shownCautions(p))
	for _, b := range p.blocks {
		d.add(b.ID, b.Line, blocks.own[b.ID], blocks.connected[b.ID])
		for _, v := range b.Values {
			for _, id := range v.Deps() {
				d.add(id, s.blockLink(p, id))
			}
		}
	}
	for i, ref := range p.refs {
		d.add(ref, s.shownRef(p, i))
	}
	for _, n := range p.charts {
		d.add(n, blocks.connected[n.Block])
	}
	if p.listsCautions {
		for _, it := range s.cautions {
			d.add(it, s.blockLink(p, it.Block))
		}
	}
	return d.sum()
}

// lastFile is a file of the last build, read in pieces.
type lastFile interface {
	io.ReaderAt
	io.Closer
}

// lastBytes is a file of the last build held in memory.
type lastBytes struct{ *bytes.Reader }

func (lastBytes) Close() error { return nil }

// writeResults writes results.json, taking the entry of every block whose
// key is as the last build recorded it from that build's file.
func (s *Site) writeResults(w io.Writer, to sink, previous *buildRecord, blocks blockDigests) (map[string]resultsEntry, error) {
	list := s.blocks()
	var old lastFile
	var last map[string]resultsEntry
	if previous != nil && len(previous.Entries) > 0 && blocks.own != nil {
		if old = to.last("results.json"); old != nil {
			defer old.Close()
			last = previous.Entries
		}
	}
	lens := make([]int64, len(list))
	var buf []byte
	at, err := results.WriteEntries(w, len(list), func(i int) ([]byte, error) {
		id := list[i].Block.ID
		if e, ok := last[id]; ok && e.Key == blocks.own[id] && e.At >= 0 && e.Len >= 0 && e.Len < 1<<30 {
			buf = slices.Grow(buf[:0], int(e.Len))[:e.Len]
			if _, err := old.ReadAt(buf, e.At); err == nil {
				lens[i] = e.Len
				return buf, nil
			}
		}
		b, err := results.Entry(list[i])
		lens[i] = int64(len(b))
		return b, err
	})
	if err != nil || blocks.own == nil {
		return nil, err
	}
	entries := make(map[string]resultsEntry, len(list))
	for i, e := range list {
		entries[e.Block.ID] = resultsEntry{Key: blocks.own[e.Block.ID], At: at[i], Len: lens[i]}
	}
	return entries, nil
}
