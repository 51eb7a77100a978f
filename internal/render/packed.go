package render

import (
	"bytes"
	"compress/flate"
	"io"
	"sync"
	"sync/atomic"
)

// Packed is data held in memory until it is written: what a site holds of
// every page until its end (its HTML, its text), kept as it is while a
// Packer's budget lasts and deflated beyond, where it shrinks some
// fourfold at a few microseconds a page.
type Packed struct {
	z     []byte // deflated; nil when plain holds the data
	plain []byte
	n     int
}

// Packer packs data for a site: the first plainBudget bytes are kept as
// they are, the rest deflated, so that a small site spends no time on it
// and a big one holds a fixed amount more than the deflated data. It is
// safe for concurrent use.
type Packer struct{ plainLeft atomic.Int64 }

// NewPacker returns a Packer that keeps up to plainBudget bytes plain.
func NewPacker(plainBudget int64) *Packer {
	p := &Packer{}
	p.plainLeft.Store(plainBudget)
	return p
}

// Pack packs b, which it may keep: the caller must not change b after.
// A nil Packer deflates everything.
func (p *Packer) Pack(b []byte) (Packed, error) {
	if p != nil && p.plainLeft.Add(-int64(len(b))) >= 0 {
		return Packed{plain: b, n: len(b)}, nil
	}
	return deflate(b)
}

// Compressors are reused: each holds some hundreds of kilobytes of state.
var (
	compressors = sync.Pool{New: func() any {
		w, _ := flate.NewWriter(nil, flate.BestSpeed) // a valid level: no error
		return w
	}}
	decompressors = sync.Pool{New: func() any { return flate.NewReader(bytes.NewReader(nil)) }}
)

// deflate packs b deflated.
func deflate(b []byte) (Packed, error) {
	var out bytes.Buffer
	zw := compressors.Get().(*flate.Writer)
	defer compressors.Put(zw)
	zw.Reset(&out)
	if _, err := zw.Write(b); err != nil {
		return Packed{}, err
	}
	if err := zw.Close(); err != nil {
		return Packed{}, err
	}
	return Packed{z: bytes.Clone(out.Bytes()), n: len(b)}, nil
}

// Bytes returns the packed data; the caller must not change it.
func (p Packed) Bytes() ([]byte, error) {
	if p.z == nil {
		return p.plain, nil
	}
	zr := decompressors.Get().(io.ReadCloser)
	defer decompressors.Put(zr)
	if err := zr.(flate.Resetter).Reset(bytes.NewReader(p.z), nil); err != nil {
		return nil, err
	}
	out := make([]byte, p.n)
	if _, err := io.ReadFull(zr, out); err != nil {
		return nil, err
	}
	return out, nil
}
