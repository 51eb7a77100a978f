package calc

import (
	"bytes"
	"encoding/gob"
	"reflect"
	"sync"
	"sync/atomic"
	"testing"
)

// gobStore keeps memos encoded, as a real store does, so that what it
// hands out is never shared with what it was given.
type gobStore struct {
	mu   sync.Mutex
	m    map[string][]byte
	hits atomic.Int64
}

func (s *gobStore) Outcome(key string) (*Memo, bool) {
	s.mu.Lock()
	b, ok := s.m[key]
	s.mu.Unlock()
	if !ok {
		return nil, false
	}
	var m Memo
	if err := gob.NewDecoder(bytes.NewReader(b)).Decode(&m); err != nil {
		return nil, false
	}
	s.hits.Add(1)
	return &m, true
}

func (s *gobStore) Keep(key string, m *Memo) {
	var b bytes.Buffer
	if err := gob.NewEncoder(&b).Encode(m); err != nil {
		panic(err)
	}
	s.mu.Lock()
	s.m[key] = b.Bytes()
	s.mu.Unlock()
}

// TestOutcomeStore checks that an evaluation served from the store is the
// evaluation computed afresh, inputs the model filled in included, and
// that a change upstream of a block (the speed a linked block quotes) is
// computed again.
func TestOutcomeStore(t *testing.T) {
	cat := driveAndLoad(t, true)
	var calls atomic.Int64
	for _, k := range cat.kinds {
		run := k.Evaluate
		k.Evaluate = func(in *Inputs) (*Outcome, error) {
			calls.Add(1)
			if !in.Has("note") {
				in.SetName("note", "filled in by the model", false)
			}
			return run(in)
		}
	}
	store := &gobStore{m: map[string][]byte{}}
	evaluate := func(srcs ...string) *Set {
		t.Helper()
		set, err := cat.Evaluate(parseSources(t, cat, srcs...), Options{Outcomes: store})
		if err != nil {
			t.Fatal(err)
		}
		return set
	}
	fresh := evaluate(driverSource, loadSource)
	computed := calls.Load()
	again := evaluate(driverSource, loadSource)
	if calls.Load() != computed {
		t.Errorf("the second evaluation ran the models %d times; want none", calls.Load()-computed)
	}
	if store.hits.Load() != computed {
		t.Errorf("store hits = %d, want %d", store.hits.Load(), computed)
	}
	for _, id := range []string{"belt", "pump"} {
		a, _ := fresh.Lookup(id)
		b, _ := again.Lookup(id)
		if !reflect.DeepEqual(a.Results, b.Results) || !reflect.DeepEqual(a.Inputs, b.Inputs) || !reflect.DeepEqual(a.Claims, b.Claims) {
			t.Errorf("%s: served from the store differs from computed", id)
		}
		if a.in.NameOf("note") != b.in.NameOf("note") || b.in.NameOf("note") == "" {
			t.Errorf("%s: the input the model filled in is %q from the store, %q computed", id, b.in.NameOf("note"), a.in.NameOf("note"))
		}
	}
	before := calls.Load()
	faster := evaluate(driverSource[:len(driverSource)-len("motor_speed = \"40 rad/s\"\nload = \"pump\"\n")]+
		"motor_speed = \"50 rad/s\"\nload = \"pump\"\n", loadSource)
	// Every model call sees a changed input: the belt's own speed, the
	// pump's quoted one, the belt's linked pump.
	if got := calls.Load() - before; got != computed {
		t.Errorf("after the drive's speed changed the models ran %d times, want %d", got, computed)
	}
	if r, _ := mustLookup(t, faster, "pump").Result("power"); r.Value != 75 {
		t.Errorf("pump power = %g W, want 75 (3 W per rad/s of 50/2 rad/s)", r.Value)
	}
}

func mustLookup(t *testing.T, s *Set, id string) *Evaluated {
	t.Helper()
	e, ok := s.Lookup(id)
	if !ok {
		t.Fatalf("no block %s", id)
	}
	return e
}

// TestCurveBinary checks that a curve reads back as it was written, and
// that MarshalBinary writes every field Curve has.
func TestCurveBinary(t *testing.T) {
	c := Curve{Name: "pv", XDim: 3, YDim: 7, X: []float64{0, 1.5e-6, -2}, Y: []float64{101325, 6e5, 0.25}, Dashed: true}
	b, err := c.MarshalBinary()
	if err != nil {
		t.Fatal(err)
	}
	var back Curve
	if err := back.UnmarshalBinary(b); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(back, c) {
		t.Errorf("read back %+v, want %+v", back, c)
	}
	if err := back.UnmarshalBinary(b[:len(b)-3]); err == nil {
		t.Error("curve data cut short was read without an error")
	}
	written := []string{"Name", "XDim", "YDim", "X", "Y", "Dashed"}
	typ := reflect.TypeFor[Curve]()
	if typ.NumField() != len(written) {
		t.Errorf("Curve has %d fields; MarshalBinary writes %v: write the new one too", typ.NumField(), written)
	}
	for _, name := range written {
		if _, ok := typ.FieldByName(name); !ok {
			t.Errorf("Curve has no field %s, which MarshalBinary writes", name)
		}
	}
}
