package main

import (
	"math"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"testing"
	"time"
)

// TestLimitFollowsLiveHeap: after a collection the soft memory limit is its
// floor while the live heap is small, and lies above a big live heap by its
// headroom. The limit goes on following the heap for the rest of the tests, as
// it does in the command.
func TestLimitFollowsLiveHeap(t *testing.T) {
	followLiveHeap()
	limitAfterGC := func() (limit, live int64) {
		t.Helper()
		debug.SetMemoryLimit(math.MaxInt64)
		runtime.GC()
		for deadline := time.Now().Add(5 * time.Second); time.Now().Before(deadline); time.Sleep(time.Millisecond) {
			if l := debug.SetMemoryLimit(-1); l != math.MaxInt64 {
				s := []metrics.Sample{{Name: "/gc/heap/live:bytes"}}
				metrics.Read(s)
				return l, int64(s[0].Value.Uint64())
			}
		}
		t.Fatal("no limit set within 5 s of a collection")
		return 0, 0
	}
	if small, live := limitAfterGC(); small != limitFloor {
		t.Errorf("limit %d MB with %d MB live: want the floor, %d MB", small>>20, live>>20, limitFloor>>20)
	}
	held := make([][]byte, 0, 300)
	for range 300 {
		held = append(held, make([]byte, 1<<20))
	}
	big, live := limitAfterGC()
	if want := live + int64(float64(live)*headroomShare); big < want || big > 2*want {
		t.Errorf("limit %d MB with %d MB live: want from %d MB to twice that", big>>20, live>>20, want>>20)
	}
	runtime.KeepAlive(held)
}
