package site

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"hash"
	"math"
	"reflect"
	"slices"
	"strings"
	"sync"
	"unsafe"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// digest hashes values of any type, field by field, so that an
// incremental build can tell whether what a page's output was made from
// has changed. It walks every field, unexported ones too, so that a field
// added later is covered without a word here.
type digest struct {
	h   hash.Hash
	buf []byte
	// seen numbers the pointers already walked, which guards against
	// cycles and keeps a shared value from being hashed twice.
	seen map[uintptr]int
	// placeless leaves out where the engine's values were written (the
	// File and Line fields of package calc's types): what a block shows
	// on other pages does not depend on where it stands on its own.
	placeless bool
	// twin, when set, is a placeless digest of the same values, made in
	// the same walk; placed counts the place fields being walked, which
	// the twin leaves out.
	twin   *digest
	placed int
}

// digests are reused: a build makes a few for every page and block.
var digests = sync.Pool{New: func() any {
	return &digest{h: sha256.New(), buf: make([]byte, 0, 16<<10), seen: map[uintptr]int{}}
}}

// newDigest returns an empty digest; its sum ends it.
func newDigest() *digest {
	d := digests.Get().(*digest)
	d.h.Reset()
	d.buf = d.buf[:0]
	clear(d.seen)
	d.placeless, d.twin, d.placed = false, nil, 0
	return d
}

// withTwin gives d a placeless twin (see digest.twin); sums ends both.
func (d *digest) withTwin() *digest {
	d.twin = newDigest()
	d.twin.placeless = true
	return d
}

// sums is the digest of everything added and its twin's, which leaves
// out where the values were written. Neither is used after it.
func (d *digest) sums() (placed, placeless string) {
	placeless = d.twin.sum()
	d.twin = nil
	return d.sum(), placeless
}

// Types a digest does not walk into. A Kind is part of the specgen binary,
// identified by its name; a Set, Catalog or model Inputs reach blocks
// that a block's connected digest covers (blockDigests). Curves are what
// the model drew from the inputs it saw, which the block's inputs and the
// blocks connected to it give: hashing thousands of points again would
// tell nothing more.
var (
	kindType    = reflect.TypeFor[*calc.Kind]()
	blockType   = reflect.TypeFor[*calc.Block]()
	skippedType = map[reflect.Type]bool{
		reflect.TypeFor[*calc.Set]():     true,
		reflect.TypeFor[*calc.Catalog](): true,
		reflect.TypeFor[*calc.Inputs]():  true,
		reflect.TypeFor[[]calc.Curve]():  true,
	}
	floatsType = reflect.TypeFor[[]float64]()
	// calcPackage and placeField name the fields a placeless digest
	// leaves out.
	calcPackage = reflect.TypeFor[calc.Block]().PkgPath()
	placeField  = map[string]bool{"File": true, "Line": true, "line": true, "lines": true}
	// howField names the fields no digest covers: how a chart gets its
	// curves (kept or sampled again, as the memory budget allows), not
	// what it shows.
	howField = map[string]bool{"resample": true}
)

func (d *digest) flush() {
	d.h.Write(d.buf)
	d.buf = d.buf[:0]
	if d.twin != nil {
		d.twin.flush()
	}
}

// write hashes b as it is, past the buffer.
func (d *digest) write(b []byte) {
	d.flush()
	d.h.Write(b)
	if d.twin != nil && d.placed == 0 {
		d.twin.h.Write(b)
	}
}

// sum is the digest of everything added, in hex. The digest is not used
// after it.
func (d *digest) sum() string {
	d.flush()
	var out [sha256.Size]byte
	s := hex.EncodeToString(d.h.Sum(out[:0]))
	digests.Put(d)
	return s
}

func (d *digest) num(v uint64) {
	d.buf = binary.LittleEndian.AppendUint64(d.buf, v)
	if d.twin != nil && d.placed == 0 {
		d.twin.buf = binary.LittleEndian.AppendUint64(d.twin.buf, v)
	}
	if len(d.buf) > 8192 {
		d.flush()
	}
}

func (d *digest) str(s string) {
	d.num(uint64(len(s)))
	if len(s) > 4096 {
		d.write([]byte(s))
		return
	}
	d.buf = append(d.buf, s...)
	if d.twin != nil && d.placed == 0 {
		d.twin.buf = append(d.twin.buf, s...)
	}
}

// add hashes the values, one after the other.
func (d *digest) add(values ...any) *digest {
	for _, v := range values {
		d.value(reflect.ValueOf(v))
	}
	return d
}

func (d *digest) value(v reflect.Value) {
	if !v.IsValid() {
		d.str("<nil>")
		return
	}
	t := v.Type()
	if skippedType[t] {
		return
	}
	switch t.Kind() {
	case reflect.Bool:
		if v.Bool() {
			d.num(1)
		} else {
			d.num(0)
		}
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		d.num(uint64(v.Int()))
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		d.num(v.Uint())
	case reflect.Float32, reflect.Float64:
		d.num(math.Float64bits(v.Float()))
	case reflect.Complex64, reflect.Complex128:
		c := v.Complex()
		d.num(math.Float64bits(real(c)))
		d.num(math.Float64bits(imag(c)))
	case reflect.String:
		d.str(v.String())
	case reflect.Array:
		for i := range v.Len() {
			d.value(v.Index(i))
		}
	case reflect.Slice:
		d.slice(v)
	case reflect.Map:
		d.mapValue(v)
	case reflect.Struct:
		d.str(t.String())
		for i := range v.NumField() {
			if t.PkgPath() == calcPackage && (howField[t.Field(i).Name] || placeField[t.Field(i).Name]) {
				switch {
				case howField[t.Field(i).Name] || d.placeless:
					continue
				case d.twin != nil:
					d.placed++
					d.value(v.Field(i))
					d.placed--
					continue
				}
			}
			d.value(v.Field(i))
		}
	case reflect.Pointer:
		d.pointer(v)
	case reflect.Interface:
		if v.IsNil() {
			d.str("<nil>")
			return
		}
		d.str(v.Elem().Type().String())
		d.value(v.Elem())
	default:
		// Functions and channels are code, which the binary's hash covers.
	}
}

func (d *digest) slice(v reflect.Value) {
	if v.IsNil() {
		d.str("<nil>")
		return
	}
	d.num(uint64(v.Len()))
	if v.Type() == floatsType && v.CanInterface() {
		// The bits as they lie in memory: a digest is compared on the
		// machine that made it only.
		fs := v.Interface().([]float64)
		if len(fs) > 0 {
			d.write(unsafe.Slice((*byte)(unsafe.Pointer(&fs[0])), len(fs)*8))
		}
		return
	}
	if v.Type().Elem().Kind() == reflect.Uint8 {
		d.str(string(v.Bytes()))
		return
	}
	for i := range v.Len() {
		d.value(v.Index(i))
	}
}

func (d *digest) mapValue(v reflect.Value) {
	if v.IsNil() {
		d.str("<nil>")
		return
	}
	d.num(uint64(v.Len()))
	if v.Type().Key().Kind() == reflect.String {
		keys := v.MapKeys()
		slices.SortFunc(keys, func(a, b reflect.Value) int { return strings.Compare(a.String(), b.String()) })
		for _, k := range keys {
			d.str(k.String())
			d.value(v.MapIndex(k))
		}
		return
	}
	// Other keys in a fixed order: each by its own digest.
	type entry struct {
		key string
		val reflect.Value
	}
	entries := make([]entry, 0, v.Len())
	it := v.MapRange()
	for it.Next() {
		k := newDigest()
		k.value(it.Key())
		entries = append(entries, entry{k.sum(), it.Value()})
	}
	slices.SortFunc(entries, func(a, b entry) int { return strings.Compare(a.key, b.key) })
	for _, e := range entries {
		d.str(e.key)
		d.value(e.val)
	}
}

func (d *digest) pointer(v reflect.Value) {
	if v.IsNil() {
		d.str("<nil>")
		return
	}
	switch v.Type() {
	case kindType:
		d.str("kind " + v.Elem().FieldByName("Name").String())
		return
	case blockType:
		// A block is what its source says, read by the catalog (the
		// binary and specgen.toml, which every build's fingerprint
		// covers): its decoded fields follow from these.
		b := v.Interface().(*calc.Block)
		d.add(b.ID, b.Source, b.Broken)
		if !d.placeless {
			d.placed++
			d.add(b.File, b.Line)
			d.placed--
		}
		return
	}
	if n, ok := d.seen[v.Pointer()]; ok {
		d.str("seen")
		d.num(uint64(n))
		return
	}
	d.seen[v.Pointer()] = len(d.seen)
	d.value(v.Elem())
}
