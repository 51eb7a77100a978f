package calc

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"hash"
	"maps"
	"math"
	"slices"

	"github.com/millrace-workshop/specgen/internal/units"
)

// OutcomeStore remembers what kinds computed, so that a block whose model
// sees exactly the inputs it saw before is not computed again (the next
// build after an edit, the preview). The key is a digest of everything the
// model sees except the catalog's settings: a store serves one catalog,
// and one build of specgen, only. Both methods may be called from several
// goroutines at once. A memo may be shared once kept: a store may hand the
// one it was given to every block that sees the same inputs, and neither
// the store nor the engine changes it.
type OutcomeStore interface {
	Outcome(key string) (*Memo, bool)
	Keep(key string, m *Memo)
}

// Memo is what a kind's Evaluate gave for one set of inputs: its outcome,
// and the block's inputs as the model left them (a model may record a
// default it took, for the caution rules).
type Memo struct {
	Results  []Result
	Cautions []CautionNote
	Curves   []Curve
	Tables   []Table
	Ambient  float64
	Values   map[string]float64
	Lists    map[string][]float64
	Given    map[string]bool
	Names    map[string]string
}

// runModel runs b's kind on in, or takes its outcome from the store when
// the kind saw the same inputs before.
func runModel(b *Block, in *Inputs, store OutcomeStore) (*Outcome, error) {
	if store == nil {
		return b.Kind.Evaluate(in)
	}
	key := in.digest(b.Kind.Name)
	if m, ok := store.Outcome(key); ok {
		// A store may give an empty map back as nil.
		in.Ambient, in.values, in.lists, in.given, in.names = m.Ambient, orEmpty(m.Values), orEmpty(m.Lists), orEmpty(m.Given), orEmpty(m.Names)
		return &Outcome{Results: m.Results, Cautions: m.Cautions, Curves: m.Curves, Tables: m.Tables}, nil
	}
	out, err := b.Kind.Evaluate(in)
	if err != nil {
		return nil, err
	}
	store.Keep(key, &Memo{Results: out.Results, Cautions: out.Cautions, Curves: out.Curves, Tables: out.Tables,
		Ambient: in.Ambient, Values: maps.Clone(in.values), Lists: maps.Clone(in.lists), Given: maps.Clone(in.given), Names: maps.Clone(in.names)})
	return out, nil
}

func orEmpty[V any](m map[string]V) map[string]V {
	if m == nil {
		return map[string]V{}
	}
	return m
}

// digest identifies what a model of kind sees in in: every value, list,
// name and flag, and each linked block as the model sees it.
func (in *Inputs) digest(kind string) string {
	d := &digester{h: sha256.New()}
	d.str(kind)
	d.inputs(in)
	return d.sum()
}

// digester writes values into a hash without ambiguity: strings carry
// their length, floats their bits.
type digester struct {
	h   hash.Hash
	buf []byte
}

func (d *digester) flush() {
	d.h.Write(d.buf)
	d.buf = d.buf[:0]
}

func (d *digester) sum() string {
	d.flush()
	return hex.EncodeToString(d.h.Sum(nil))
}

func (d *digester) num(v uint64) {
	d.buf = binary.LittleEndian.AppendUint64(d.buf, v)
	if len(d.buf) > 4096 {
		d.flush()
	}
}

func (d *digester) float(v float64) { d.num(math.Float64bits(v)) }

func (d *digester) flag(v bool) {
	if v {
		d.num(1)
	} else {
		d.num(0)
	}
}

func (d *digester) str(s string) {
	d.num(uint64(len(s)))
	d.buf = append(d.buf, s...)
}

func (d *digester) floats(vs []float64) {
	d.num(uint64(len(vs)))
	for _, v := range vs {
		d.float(v)
	}
}

func (d *digester) inputs(in *Inputs) {
	if in == nil {
		d.str("nil")
		return
	}
	d.float(in.Ambient)
	d.flag(in.noCurves)
	d.flag(in.customary)
	d.flag(in.linksWithheld)
	d.num(uint64(len(in.values)))
	for _, k := range slices.Sorted(maps.Keys(in.values)) {
		d.str(k)
		d.float(in.values[k])
	}
	d.num(uint64(len(in.lists)))
	for _, k := range slices.Sorted(maps.Keys(in.lists)) {
		d.str(k)
		d.floats(in.lists[k])
	}
	d.num(uint64(len(in.given)))
	for _, k := range slices.Sorted(maps.Keys(in.given)) {
		d.str(k)
		d.flag(in.given[k])
	}
	d.num(uint64(len(in.names)))
	for _, k := range slices.Sorted(maps.Keys(in.names)) {
		d.str(k)
		d.str(in.names[k])
	}
	d.num(uint64(len(in.links)))
	for _, k := range slices.Sorted(maps.Keys(in.links)) {
		d.str(k)
		d.num(uint64(len(in.links[k])))
		for _, l := range in.links[k] {
			d.linked(l)
		}
	}
}

func (d *digester) linked(l *Linked) {
	d.str(l.ID)
	d.str(l.Kind)
	d.num(uint64(l.Roles))
	d.float(l.Ambient)
	for _, m := range []map[string]float64{l.Results, l.Inputs} {
		d.num(uint64(len(m)))
		for _, k := range slices.Sorted(maps.Keys(m)) {
			d.str(k)
			d.float(m[k])
		}
	}
	d.num(uint64(len(l.Names)))
	for _, k := range slices.Sorted(maps.Keys(l.Names)) {
		d.str(k)
		d.str(l.Names[k])
	}
	d.num(uint64(len(l.Curves)))
	for _, c := range l.Curves {
		d.str(c.Name)
		d.num(uint64(c.XDim))
		d.num(uint64(c.YDim))
		d.floats(c.X)
		d.floats(c.Y)
		d.flag(c.Dashed)
	}
	d.inputs(l.Model)
}

// MarshalBinary writes a curve with its points as their bits, which gob
// would write one by one: an outcome store keeps thousands of points a
// block. TestCurveBinary fails when Curve gains a field this leaves out.
func (c Curve) MarshalBinary() ([]byte, error) {
	b := make([]byte, 0, 64+len(c.Name)+8*(len(c.X)+len(c.Y)))
	b = binary.AppendUvarint(b, uint64(len(c.Name)))
	b = append(b, c.Name...)
	b = binary.AppendVarint(b, int64(c.XDim))
	b = binary.AppendVarint(b, int64(c.YDim))
	if c.Dashed {
		b = append(b, 1)
	} else {
		b = append(b, 0)
	}
	for _, vs := range [][]float64{c.X, c.Y} {
		b = binary.AppendUvarint(b, uint64(len(vs)))
		for _, v := range vs {
			b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
		}
	}
	return b, nil
}

// errCurveData is the error of a curve's bits that do not read back.
var errCurveData = errors.New("curve data cut short")

// UnmarshalBinary reads what MarshalBinary wrote.
func (c *Curve) UnmarshalBinary(b []byte) error {
	uvarint := func() (uint64, bool) {
		v, n := binary.Uvarint(b)
		if n <= 0 {
			return 0, false
		}
		b = b[n:]
		return v, true
	}
	varint := func() (int64, bool) {
		v, n := binary.Varint(b)
		if n <= 0 {
			return 0, false
		}
		b = b[n:]
		return v, true
	}
	n, ok := uvarint()
	if !ok || uint64(len(b)) < n {
		return errCurveData
	}
	c.Name, b = string(b[:n]), b[n:]
	x, okX := varint()
	y, okY := varint()
	if !okX || !okY || len(b) < 1 {
		return errCurveData
	}
	c.XDim, c.YDim, c.Dashed, b = units.Dimension(x), units.Dimension(y), b[0] == 1, b[1:]
	nx, ok := uvarint()
	if !ok || uint64(len(b))/8 < nx {
		return errCurveData
	}
	xs := b[:8*nx]
	b = b[8*nx:]
	ny, ok := uvarint()
	if !ok || uint64(len(b))/8 != ny {
		return errCurveData
	}
	// One array holds both, X capped so that appending to it copies.
	points := make([]float64, nx+ny)
	readFloats(points[:nx], xs)
	readFloats(points[nx:], b)
	c.X, c.Y = points[:nx:nx], points[nx:]
	return nil
}

// readFloats sets vs from the little-endian bits in b, eight bytes each.
func readFloats(vs []float64, b []byte) {
	b = b[:8*len(vs)]
	for i := range vs {
		vs[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i : 8*i+8]))
	}
}
