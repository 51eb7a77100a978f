package main

import (
	"math"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
)

// The soft memory limit leaves a third of the live heap again as room for
// garbage, so that the collector's work per page stays the same as a very
// big site grows; below the floor it is not set tighter, and the
// collector's own pacing (twice the live heap) holds a site of a few
// thousand pages. The floor bounds the heap while a big site's pages are
// read: at 228 MB a site of 10,000 charted pages peaks near 280 MB (256
// gave 293, 200 gave 270 but a fifth more collector time at 5,000 pages).
const (
	headroomShare = 0.35
	limitFloor    = 228 << 20
)

// followLiveHeap keeps the soft memory limit at what the program holds, the
// live heap and the runtime's own memory, plus headroom, and at least
// limitFloor, set again after every collection. A fixed limit lies so close
// above a big site's live heap that the collector runs without pause; one
// that follows the live data never does.
func followLiveHeap() {
	samples := []metrics.Sample{
		{Name: "/gc/heap/live:bytes"},
		{Name: "/memory/classes/total:bytes"},
		{Name: "/memory/classes/heap/objects:bytes"},
		{Name: "/memory/classes/heap/unused:bytes"},
		{Name: "/memory/classes/heap/free:bytes"},
		{Name: "/memory/classes/heap/released:bytes"},
	}
	var afterCollection func(*gcSentinel)
	afterCollection = func(*gcSentinel) {
		metrics.Read(samples)
		v := make([]uint64, len(samples))
		for i, s := range samples {
			if s.Value.Kind() != metrics.KindUint64 {
				return // a runtime without the metric: leave the limit be
			}
			v[i] = s.Value.Uint64()
		}
		live, total := v[0], v[1]
		heap := v[2] + v[3] + v[4] + v[5]
		runtimeOwn := uint64(0)
		if total > heap {
			runtimeOwn = total - heap
		}
		headroom := uint64(float64(live) * headroomShare)
		debug.SetMemoryLimit(int64(min(max(live+runtimeOwn+headroom, limitFloor), math.MaxInt64)))
		runtime.SetFinalizer(&gcSentinel{}, afterCollection)
	}
	runtime.SetFinalizer(&gcSentinel{}, afterCollection)
}

// gcSentinel is an object nothing keeps, whose finalizer runs after the
// collection that finds it. It holds a pointer so that it is allocated on
// its own, not packed with other small objects (whose finalizers may wait).
type gcSentinel struct {
	_ *byte
	_ [16]byte
}
