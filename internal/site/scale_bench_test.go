package site

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// writeChartedSite writes a site of n pages where every page holds a
// compressor block that draws two charts (p-V and torque), in folders of
// perFolder pages each: the shape that weighs most on memory (every block
// has curves) and, with big folders, on navigation.
func writeChartedSite(tb testing.TB, root string, n, perFolder int) {
	tb.Helper()
	for i := 0; i < n; i++ {
		dir := filepath.Join(root, "content", fmt.Sprintf("folder-%03d", i/perFolder))
		if err := os.MkdirAll(dir, 0o755); err != nil {
			tb.Fatal(err)
		}
		name := fmt.Sprintf("stage-%05d.md", i)
		if i%perFolder == 0 {
			name = "index.md"
		}
		id := fmt.Sprintf("stage-%05d", i)
		var b strings.Builder
		fmt.Fprintf(&b, "+++\ntitle = \"Stage %d\"\norder = %d\n+++\n\n", i, i%perFolder)
		for s := 0; s < 3; s++ {
			fmt.Fprintf(&b, "## Step %d\n\nFit the part and check the clearance with a feeler gauge; the stage sweeps "+
				"=[%s.swept_volume cm3].\n\n- clean the bore\n- oil the rings\n\n| item | qty |\n|---|---:|\n| bolt | 4 |\n\n", s, id)
		}
		fmt.Fprintf(&b, "```go\npackage main\n\nfunc main() { println(%d) }\n```\n\n", i)
		fmt.Fprintf(&b, "```calc\nid = %q\nkind = \"compressor\"\ntitle = \"Stage %d\"\nbore = \"%d mm\"\nstroke = \"30 mm\"\n"+
			"rod_length = \"75 mm\"\nclearance_ratio = 0.05\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n\n"+
			"[expect]\nswept_volume = \">= 1 cm3\"\n\n[show]\noutputs = [\"swept_volume cm3\", \"free_air_delivery L/min\"]\n"+
			"charts = [\"pv\", \"torque\"]\n```\n", id, i, 25+i%30)
		if err := os.WriteFile(filepath.Join(dir, name), []byte(b.String()), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(root, "content", "index.md"), []byte("# Charted site\n"), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// TestWriteChartedSite writes the charted site into $SPECGEN_CHARTED_SITE
// ($SPECGEN_CHARTED_PAGES pages, default 1000, in folders of
// $SPECGEN_CHARTED_FOLDER, default 250), for measuring a built binary's
// peak memory; it does nothing otherwise.
func TestWriteChartedSite(t *testing.T) {
	dir := os.Getenv("SPECGEN_CHARTED_SITE")
	if dir == "" {
		t.Skip("set SPECGEN_CHARTED_SITE to write the charted site")
	}
	n, perFolder := 1000, 250
	for env, v := range map[string]*int{"SPECGEN_CHARTED_PAGES": &n, "SPECGEN_CHARTED_FOLDER": &perFolder} {
		if s := os.Getenv(env); s != "" {
			if _, err := fmt.Sscan(s, v); err != nil {
				t.Fatalf("%s: %v", env, err)
			}
		}
	}
	writeChartedSite(t, dir, n, perFolder)
}

// benchCharted builds a charted site cold and reports the time per page
// and the live heap the render starts from (what the loaded site holds).
func benchCharted(b *testing.B, pages int) {
	root := b.TempDir()
	writeChartedSite(b, root, pages, 250)
	b.ReportAllocs()
	var live uint64
	for b.Loop() {
		s, err := Load(root)
		if err != nil {
			b.Fatal(err)
		}
		runtime.GC()
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		live = max(live, ms.HeapAlloc)
		if _, err := s.Write(Options{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(pages+1), "ns/page")
	b.ReportMetric(float64(live)/(1<<20), "MB-loaded")
}

// BenchmarkChartedBuild1k and 5k build sites where every page draws two
// charts: time per page should not grow with the site, nor the memory a
// loaded site holds faster than its pages.
func BenchmarkChartedBuild1k(b *testing.B) { benchCharted(b, 1000) }
func BenchmarkChartedBuild5k(b *testing.B) { benchCharted(b, 5000) }
