package site

import (
	"bufio"
	"encoding/gob"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"sync"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// outcomesFile is the file of the cache that keeps the models' outcomes
// of the last build: one gob stream, so that the types are described
// once, read whole when the next build starts.
const outcomesFile = "outcomes.gob"

// outcomeStore keeps what the models computed from one build to the next
// (a calc.OutcomeStore): in the cache folder for builds, in memory for the
// preview. It holds the last build's memos and hands out copies, and
// gathers the ones this build uses, which replace them when it is saved.
type outcomeStore struct {
	// namespace identifies the catalog (specgen binary and specgen.toml):
	// outcomes of another never match.
	namespace string
	mu        sync.Mutex
	last      map[string]*calc.Memo // the last build's
	used      map[string]*calc.Memo // this build's, to save
	// computed: this build computed an outcome the last one did not have.
	computed bool
}

// outcomesHeader opens the file: whose outcomes follow.
type outcomesHeader struct{ Namespace string }

// outcomeEntry is one memo of the file.
type outcomeEntry struct {
	Key  string
	Memo *calc.Memo
}

// newOutcomeStore returns an empty store for a catalog.
func newOutcomeStore(namespace string) *outcomeStore {
	return &outcomeStore{namespace: namespace, last: map[string]*calc.Memo{}, used: map[string]*calc.Memo{}}
}

// readOutcomeStore reads the outcomes a build saved in the cache folder
// dir. A file that is missing, of another catalog or cut short gives
// what it holds: those outcomes are only computed again.
func readOutcomeStore(dir, namespace string) *outcomeStore {
	o := newOutcomeStore(namespace)
	f, err := os.Open(filepath.Join(dir, outcomesFile))
	if err != nil {
		return o
	}
	defer f.Close()
	dec := gob.NewDecoder(bufio.NewReaderSize(f, 1<<16))
	var h outcomesHeader
	if dec.Decode(&h) != nil || h.Namespace != namespace {
		return o
	}
	for {
		var e outcomeEntry
		if dec.Decode(&e) != nil || e.Memo == nil {
			return o
		}
		o.last[e.Key] = e.Memo
	}
}

// Outcome returns a copy of the memo kept for key.
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
	if !ok {
		return nil, false
	}
	return deepCopy(m), true
}

// Keep keeps a copy of the memo for key.
func (o *outcomeStore) Keep(key string, m *calc.Memo) {
	m = deepCopy(m)
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
// whole or not at all; they become what the store starts from. A store
// that cannot be saved only costs the next build its shortcut.
func (o *outcomeStore) save(dir string) error {
	if !o.next() {
		return nil
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	tmp, err := os.CreateTemp(dir, "."+outcomesFile+"-")
	if err != nil {
		return err
	}
	w := bufio.NewWriterSize(tmp, 1<<16)
	err = o.write(w)
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
		err = os.Rename(tmp.Name(), filepath.Join(dir, outcomesFile))
	}
	if err != nil {
		_ = os.Remove(tmp.Name())
	}
	return err
}

// write encodes the store's outcomes, sorted by key.
func (o *outcomeStore) write(w io.Writer) error {
	enc := gob.NewEncoder(w)
	if err := enc.Encode(outcomesHeader{Namespace: o.namespace}); err != nil {
		return err
	}
	keys := make([]string, 0, len(o.last))
	for k := range o.last {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		if err := enc.Encode(outcomeEntry{Key: k, Memo: o.last[k]}); err != nil {
			return err
		}
	}
	return nil
}

// deepCopy copies a memo and everything it reaches, so that neither the
// store nor the build it hands memos to sees the other's changes.
func deepCopy(m *calc.Memo) *calc.Memo {
	return copyValue(reflect.ValueOf(m)).Interface().(*calc.Memo)
}

func copyValue(v reflect.Value) reflect.Value {
	switch v.Kind() {
	case reflect.Pointer:
		if v.IsNil() {
			return v
		}
		c := reflect.New(v.Type().Elem())
		c.Elem().Set(copyValue(v.Elem()))
		return c
	case reflect.Slice:
		if v.IsNil() {
			return v
		}
		c := reflect.MakeSlice(v.Type(), v.Len(), v.Len())
		if plainKind(v.Type().Elem().Kind()) {
			reflect.Copy(c, v)
			return c
		}
		for i := range v.Len() {
			c.Index(i).Set(copyValue(v.Index(i)))
		}
		return c
	case reflect.Map:
		if v.IsNil() {
			return v
		}
		c := reflect.MakeMapWithSize(v.Type(), v.Len())
		it := v.MapRange()
		for it.Next() {
			c.SetMapIndex(it.Key(), copyValue(it.Value()))
		}
		return c
	case reflect.Struct:
		c := reflect.New(v.Type()).Elem()
		for i := range v.NumField() {
			c.Field(i).Set(copyValue(v.Field(i)))
		}
		return c
	}
	// Memos are plain data: exported fields, no interfaces, functions or
	// channels (TestMemoIsPlainData), which gob could not keep either.
	return v
}

// plainKind reports whether values of kind k hold no references.
func plainKind(k reflect.Kind) bool {
	return k >= reflect.Bool && k <= reflect.Complex128 || k == reflect.String
}
