package site

import (
	"bufio"
	"encoding/gob"
	"os"
	"path/filepath"
	"slices"
	"sync"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// outcomesFile is the file of the cache that keeps the models' outcomes
// of the last builds: one gob stream, so that the types are described
// once, read whole when the next build starts. addedFile holds what
// builds since computed, so that one edited block does not rewrite them
// all; it is folded into outcomesFile once it grows.
const (
	outcomesFile = "outcomes.gob"
	addedFile    = "outcomes-added.gob"
)

// outcomeStore keeps what the models computed from one build to the next
// (a calc.OutcomeStore): in the cache folder for builds, in memory for the
// preview. It holds the last build's memos and hands them out, shared with
// every block that sees the same inputs (the engine does not change them),
// and gathers the ones this build uses, which replace them when it is
// saved.
type outcomeStore struct {
	// namespace identifies the catalog (specgen binary and specgen.toml):
	// outcomes of another never match.
	namespace string
	mu        sync.Mutex
	last      map[string]*calc.Memo // the last build's
	used      map[string]*calc.Memo // this build's, to save
	// computed: this build computed an outcome the last one did not have.
	computed bool
	// inBase are the keys outcomesFile holds, base its header's id.
	inBase map[string]bool
	base   string
}

// outcomesHeader opens each file: whose outcomes follow and, for
// outcomesFile, its id; for addedFile, the id of the outcomesFile it adds
// to.
type outcomesHeader struct{ Namespace, ID, Base string }

// outcomeEntry is one memo of a file.
type outcomeEntry struct {
	Key  string
	Memo *calc.Memo
}

// newOutcomeStore returns an empty store for a catalog.
func newOutcomeStore(namespace string) *outcomeStore {
	return &outcomeStore{namespace: namespace, last: map[string]*calc.Memo{}, used: map[string]*calc.Memo{}, inBase: map[string]bool{}}
}

// readOutcomeStore reads the outcomes builds saved in the cache folder
// dir. A file that is missing, of another catalog or cut short gives
// what it holds: those outcomes are only computed again.
func readOutcomeStore(dir, namespace string) *outcomeStore {
	o := newOutcomeStore(namespace)
	h, ok := o.readFile(filepath.Join(dir, outcomesFile), func(key string) { o.inBase[key] = true })
	if !ok {
		return o
	}
	o.base = h.ID
	if added, ok := peekHeader(filepath.Join(dir, addedFile)); ok && added.Base == o.base && added.Namespace == namespace {
		o.readFile(filepath.Join(dir, addedFile), func(string) {})
	}
	return o
}

// readFile reads one file's outcomes into last, calling each for every
// key; it reports the header and whether it was this catalog's.
func (o *outcomeStore) readFile(path string, each func(key string)) (outcomesHeader, bool) {
	var h outcomesHeader
	f, err := os.Open(path)
	if err != nil {
		return h, false
	}
	defer f.Close()
	dec := gob.NewDecoder(bufio.NewReaderSize(f, 1<<16))
	if dec.Decode(&h) != nil || h.Namespace != o.namespace {
		return h, false
	}
	for {
		var e outcomeEntry
		if dec.Decode(&e) != nil || e.Memo == nil {
			return h, true
		}
		o.last[e.Key] = e.Memo
		each(e.Key)
	}
}

// peekHeader reads the header of a file of outcomes.
func peekHeader(path string) (outcomesHeader, bool) {
	var h outcomesHeader
	f, err := os.Open(path)
	if err != nil {
		return h, false
	}
	defer f.Close()
	return h, gob.NewDecoder(bufio.NewReader(f)).Decode(&h) == nil
}

// Outcome returns the memo kept for key.
func (o *outcomeStore) Outcome(key string) (*calc.Memo, bool) {
	o.mu.Lock()
	m, ok := o.used[key]
	if !ok {
		m, ok = o.last[key]
		if ok {
			o.used[key] = m
		}
	}
	o.mu.Unlock()
	return m, ok
}

// Keep keeps the memo for key.
func (o *outcomeStore) Keep(key string, m *calc.Memo) {
	o.mu.Lock()
	o.used[key] = m
	o.computed = true
	o.mu.Unlock()
}

// next forgets the outcomes the build just finished did not use: what it
// used is what the next build starts from. It reports whether that
// differs from what the build started from.
func (o *outcomeStore) next() (changed bool) {
	o.mu.Lock()
	changed = o.computed || len(o.used) != len(o.last)
	o.last, o.used, o.computed = o.used, map[string]*calc.Memo{}, false
	o.mu.Unlock()
	return changed
}

// save writes the outcomes this build used into the cache folder dir,
// each file whole or not at all; they become what the store starts from.
// While the outcomes the base file holds and this build did not use stay
// few, only the ones it does not hold are written (addedFile); else the
// base is written afresh. A store that cannot be saved only costs the
// next build its shortcut.
func (o *outcomeStore) save(dir string) error {
	unused := 0
	for key := range o.inBase {
		if o.used[key] == nil {
			unused++
		}
	}
	computed := o.computed
	if !o.next() {
		return nil
	}
	limit := max(64, len(o.last)/10)
	if !computed && unused <= limit && o.base != "" {
		return nil // the files hold every outcome used, and few others
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	var added []string
	for key := range o.last {
		if !o.inBase[key] {
			added = append(added, key)
		}
	}
	if o.base != "" && unused <= limit && len(added) <= limit {
		return writeOutcomes(dir, addedFile, outcomesHeader{Namespace: o.namespace, Base: o.base}, added, o.last)
	}
	keys := make([]string, 0, len(o.last))
	for key := range o.last {
		keys = append(keys, key)
	}
	id := newDigest().add(o.namespace, keys).sum()
	if err := writeOutcomes(dir, outcomesFile, outcomesHeader{Namespace: o.namespace, ID: id}, keys, o.last); err != nil {
		return err
	}
	o.base, o.inBase = id, map[string]bool{}
	for _, key := range keys {
		o.inBase[key] = true
	}
	if err := os.Remove(filepath.Join(dir, addedFile)); err != nil && !os.IsNotExist(err) {
		return err
	}
	return nil
}

// writeOutcomes writes the memos of keys, sorted, as file name of dir,
// aside and then renamed.
func writeOutcomes(dir, name string, h outcomesHeader, keys []string, memos map[string]*calc.Memo) error {
	slices.Sort(keys)
	return writeGobAside(filepath.Join(dir, name), func(enc *gob.Encoder) error {
		err := enc.Encode(h)
		for _, k := range keys {
			if err == nil {
				err = enc.Encode(outcomeEntry{Key: k, Memo: memos[k]})
			}
		}
		return err
	})
}

// pendingOutcomes is the cache folder's outcome store while it is read:
// the build reads its pages meanwhile, and the first outcome it asks for
// waits for the rest.
type pendingOutcomes struct{ *pending[*outcomeStore] }

// readingOutcomes starts reading the outcomes saved in root's cache.
func readingOutcomes(root string) *pendingOutcomes {
	return &pendingOutcomes{readingCache(root, readOutcomeStore)}
}

// store waits for the store and returns it, nil when there is none.
func (p *pendingOutcomes) store() *outcomeStore { return p.wait() }

// Outcome is the store's, once it is read.
func (p *pendingOutcomes) Outcome(key string) (*calc.Memo, bool) {
	if o := p.store(); o != nil {
		return o.Outcome(key)
	}
	return nil, false
}

// Keep is the store's, once it is read.
func (p *pendingOutcomes) Keep(key string, m *calc.Memo) {
	if o := p.store(); o != nil {
		o.Keep(key, m)
	}
}
