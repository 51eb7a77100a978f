package calc

import (
	"sync/atomic"
	"testing"
)

// TestParallelRunsEachOnce checks that Parallel calls f once for every
// index, whatever the count against the number of cores.
func TestParallelRunsEachOnce(t *testing.T) {
	for _, n := range []int{0, 1, 2, 3, 1000} {
		calls := make([]atomic.Int32, n)
		Parallel(n, func(i int) { calls[i].Add(1) })
		for i := range calls {
			if got := calls[i].Load(); got != 1 {
				t.Errorf("n=%d: index %d run %d times", n, i, got)
			}
		}
	}
}
