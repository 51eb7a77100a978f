package site

import (
	"os"
	"runtime"
	"runtime/pprof"
	"testing"
)

func TestZZHeapAfterLoad(t *testing.T) {
	root := os.Getenv("ZZ_SITE")
	if root == "" {
		t.Skip()
	}
	s, err := Load(root)
	if err != nil {
		t.Fatal(err)
	}
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	t.Logf("heap after load: %.1f MB", float64(ms.HeapAlloc)/(1<<20))
	f, _ := os.Create("/tmp/ps/heap.prof")
	pprof.WriteHeapProfile(f)
	f.Close()
	runtime.KeepAlive(s)
}
