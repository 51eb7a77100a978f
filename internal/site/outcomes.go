package site

import (
	"bytes"
	"crypto/sha256"
	"encoding/gob"
	"encoding/hex"
	"os"
	"path/filepath"
	"strings"
	"sync"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// outcomesDir is the folder of the cache that keeps the models' outcomes.
const outcomesDir = "outcomes"

// outcomeStore keeps what the models computed from one build to the next
// (a calc.OutcomeStore): one file each in the cache folder for builds, in
// memory for the preview. Each memo is kept encoded, so that what one
// build hands out is never shared with another.
type outcomeStore struct {
	// namespace identifies the catalog (specgen binary and specgen.toml):
	// outcomes of another never match.
	namespace string
	dir       string // the cache folder's outcomes, "" for memory only
	mu        sync.Mutex
	memory    map[string][]byte
	used      map[string]bool // names read or kept since the last prune
}

// newOutcomeStore keeps outcomes in dir, or in memory when dir is "".
func newOutcomeStore(namespace, dir string) *outcomeStore {
	return &outcomeStore{namespace: namespace, dir: dir, memory: map[string][]byte{}, used: map[string]bool{}}
}

// name is the store's name for a model's inputs.
func (o *outcomeStore) name(key string) string {
	sum := sha256.Sum256([]byte(o.namespace + "\x00" + key))
	return hex.EncodeToString(sum[:])
}

// Outcome returns the memo kept for key.
func (o *outcomeStore) Outcome(key string) (*calc.Memo, bool) {
	name := o.name(key)
	var data []byte
	if o.dir == "" {
		o.mu.Lock()
		data = o.memory[name]
		o.mu.Unlock()
	} else {
		data, _ = os.ReadFile(filepath.Join(o.dir, name))
	}
	if data == nil {
		return nil, false
	}
	var m calc.Memo
	// A file cut short or from elsewhere is computed again.
	if gob.NewDecoder(bytes.NewReader(data)).Decode(&m) != nil {
		return nil, false
	}
	o.mu.Lock()
	o.used[name] = true
	o.mu.Unlock()
	return &m, true
}

// Keep stores the memo for key. A memo that cannot be kept only costs
// the next build its computation.
func (o *outcomeStore) Keep(key string, m *calc.Memo) {
	var b bytes.Buffer
	if gob.NewEncoder(&b).Encode(m) != nil {
		return
	}
	name := o.name(key)
	o.mu.Lock()
	o.used[name] = true
	if o.dir == "" {
		o.memory[name] = b.Bytes()
	}
	o.mu.Unlock()
	if o.dir == "" {
		return
	}
	if os.MkdirAll(o.dir, 0o755) != nil {
		return
	}
	// Written aside and renamed, so that no reader sees half a file.
	tmp, err := os.CreateTemp(o.dir, ".keep-")
	if err != nil {
		return
	}
	_, werr := tmp.Write(b.Bytes())
	if cerr := tmp.Close(); werr != nil || cerr != nil || os.Rename(tmp.Name(), filepath.Join(o.dir, name)) != nil {
		_ = os.Remove(tmp.Name())
	}
}

// prune forgets the outcomes the builds since the last prune did not use:
// in memory at once; on disk once they outnumber the used ones, so that
// the folder stays about the size of one site's outcomes.
func (o *outcomeStore) prune() {
	o.mu.Lock()
	defer o.mu.Unlock()
	used := o.used
	o.used = map[string]bool{}
	if o.dir == "" {
		for name := range o.memory {
			if !used[name] {
				delete(o.memory, name)
			}
		}
		return
	}
	entries, err := os.ReadDir(o.dir)
	if err != nil || len(entries) <= 2*len(used)+64 {
		return
	}
	for _, e := range entries {
		if !used[e.Name()] || strings.HasPrefix(e.Name(), ".") {
			_ = os.Remove(filepath.Join(o.dir, e.Name()))
		}
	}
}
