package render

import (
	"bytes"
	"fmt"
	"sync"
	"testing"
)

// TestPackerBudget checks that a Packer keeps data plain while its budget
// lasts, deflates beyond it, and gives back every byte either way.
func TestPackerBudget(t *testing.T) {
	page := func(i int) []byte {
		return bytes.Repeat([]byte(fmt.Sprintf("<p>page %d: bore 32 mm, stroke 28 mm</p>\n", i)), 50+i)
	}
	for _, budget := range []int64{0, 10_000, 1 << 30} {
		p := NewPacker(budget)
		var plain int64
		for i := range 40 {
			data := page(i)
			packed, err := p.Pack(bytes.Clone(data))
			if err != nil {
				t.Fatal(err)
			}
			if packed.z == nil {
				plain += int64(len(data))
			}
			got, err := packed.Bytes()
			if err != nil || !bytes.Equal(got, data) {
				t.Fatalf("budget %d, page %d: got back %d bytes (%v), want %d", budget, i, len(got), err, len(data))
			}
		}
		if plain > budget || (budget > 1<<20 && plain == 0) {
			t.Errorf("budget %d: %d bytes kept plain", budget, plain)
		}
	}
	var none *Packer // deflates all
	packed, err := none.Pack([]byte("text"))
	if err != nil || packed.z == nil {
		t.Errorf("a nil Packer kept the data plain (%v)", err)
	}
}

// TestPackerConcurrent packs from many goroutines against one budget.
func TestPackerConcurrent(t *testing.T) {
	p := NewPacker(64 << 10)
	var wg sync.WaitGroup
	for g := range 8 {
		wg.Go(func() {
			for i := range 100 {
				data := bytes.Repeat([]byte{byte('a' + g)}, 1000+i)
				packed, err := p.Pack(bytes.Clone(data))
				if err != nil {
					t.Error(err)
					return
				}
				if got, err := packed.Bytes(); err != nil || !bytes.Equal(got, data) {
					t.Errorf("goroutine %d, item %d: data not given back", g, i)
					return
				}
			}
		})
	}
	wg.Wait()
}
