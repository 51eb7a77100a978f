package render

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestDrawCompressorCharts draws every chart of a compressor block and
// checks what every chart must have.
func TestDrawCompressorCharts(t *testing.T) {
	e := evaluated(t, stageBlock)
	for _, name := range e.Block.Kind.Charts {
		c, err := e.Chart(name)
		if err != nil {
			t.Fatal(err)
		}
		d, err := DrawChart(c, "chart-low-"+name, "x.low."+name+".csv")
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for _, want := range []string{`role="img"`, "<title id=", "<desc id=", `aria-labelledby="chart-low-` + name + `-title`} {
			if !strings.Contains(d.HTML, want) {
				t.Errorf("%s: lacks %s", name, want)
			}
		}
		if strings.Contains(d.HTML, "<?xml") || strings.Contains(d.HTML, "NaN") || strings.Contains(d.HTML, "Inf") {
			t.Errorf("%s: prolog or non-number in SVG", name)
		}
		if len(d.CSV) == 0 {
			t.Errorf("%s: no CSV", name)
		}
		if dir := os.Getenv("SPECGEN_CHART_DIR"); dir != "" {
			page := "<!DOCTYPE html><html><head><meta charset=utf-8><link rel=stylesheet href=specgen.css></head><body><main class=sg-body style='max-width:50rem;margin:2rem'>" + d.HTML + "</main></body></html>"
			_ = os.WriteFile(filepath.Join(dir, name+".html"), []byte(page), 0o644)
		}
	}
}
