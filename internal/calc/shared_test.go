package calc

import (
	"bytes"
	"encoding/gob"
	"strings"
	"sync"
	"testing"

	"github.com/millrace-workshop/specgen/internal/units"
)

// sharingStore hands out the very memo it was given, as the site's store
// does, and keeps each memo's encoding as it was kept.
type sharingStore struct {
	mu   sync.Mutex
	m    map[string]*Memo
	kept map[string][]byte
}

func (s *sharingStore) Outcome(key string) (*Memo, bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	m, ok := s.m[key]
	return m, ok
}

func (s *sharingStore) Keep(key string, m *Memo) {
	var b bytes.Buffer
	if err := gob.NewEncoder(&b).Encode(m); err != nil {
		panic(err)
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	s.m[key], s.kept[key] = m, b.Bytes()
}

// TestSharedOutcomeUnchanged evaluates two blocks whose models see the same
// inputs, so that they share one memo, one acknowledging a caution its
// model raises and one with a caution a rule adds: each gets its own
// cautions, sorted by level with its own acknowledgements, and the memo
// stays as it was kept, also when a second evaluation serves both from it.
func TestSharedOutcomeUnchanged(t *testing.T) {
	stage := &Kind{Name: "test-stage", Raises: []string{"hot", "burst"},
		Inputs:  []InputSpec{{Name: "speed", Dim: units.RotationalSpeed, Range: Positive, Meaning: "m"}},
		Results: []ResultSpec{{Name: "power", Dim: units.Power, Unit: "W", Meaning: "m"}},
		Evaluate: func(in *Inputs) (*Outcome, error) {
			return &Outcome{Results: []Result{{Name: "power", Value: 3 * in.Value("speed"), Dim: units.Power}},
				Cautions: []CautionNote{{Level: Notice, Rule: "hot", Message: "runs hot"}, {Level: Warning, Rule: "burst", Message: "may burst"}},
				Curves:   []Curve{{Name: "power", X: []float64{0, 1}, Y: []float64{0, 3}}}}, nil
		}}
	loud := Rule{ID: "loud", Level: Warning, Check: func(s *Set) []Raised {
		var r []Raised
		for _, e := range s.Blocks {
			if e.Block.ID == "b" {
				r = append(r, Raised{Block: e, Note: CautionNote{Level: Caution, Message: "loud"}})
			}
		}
		return r
	}}
	cat, err := NewCatalog([]*Kind{stage}, []Rule{{ID: "hot", Level: Notice}, {ID: "burst", Level: Warning}, loud}, nil)
	if err != nil {
		t.Fatal(err)
	}
	const (
		guarded = "id = \"a\"\nkind = \"test-stage\"\nspeed = \"10 rad/s\"\n\n[acknowledge]\nhot = \"guarded\"\n"
		plain   = "id = \"b\"\nkind = \"test-stage\"\nspeed = \"10 rad/s\"\n"
	)
	store := &sharingStore{m: map[string]*Memo{}, kept: map[string][]byte{}}
	for run := range 2 {
		set, err := cat.Evaluate(parseSources(t, cat, guarded, plain), Options{Outcomes: store})
		if err != nil {
			t.Fatal(err)
		}
		want := map[string]string{"a": "burst: , hot: guarded", "b": "burst: , loud: , hot: "}
		for id, w := range want {
			var got []string
			for _, c := range mustLookup(t, set, id).Cautions {
				got = append(got, c.Rule+": "+c.Acknowledged)
			}
			if g := strings.Join(got, ", "); g != w {
				t.Errorf("run %d: block %s: cautions %q, want %q (by level, with their acknowledgements)", run, id, g, w)
			}
		}
		if len(store.m) != 1 {
			t.Fatalf("run %d: the store holds %d memos, want 1 for both blocks", run, len(store.m))
		}
		for key, m := range store.m {
			var b bytes.Buffer
			if err := gob.NewEncoder(&b).Encode(m); err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(b.Bytes(), store.kept[key]) {
				t.Errorf("run %d: the shared memo changed after it was kept: %+v", run, m)
			}
		}
	}
}
