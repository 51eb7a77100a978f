package site

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// writeBenchSite writes a site of n pages shaped like real documentation:
// folders of twenty pages with headings, lists, a table, links and code in
// several languages.
func writeBenchSite(tb testing.TB, root string, n int) {
	tb.Helper()
	for i := 0; i < n; i++ {
		dir := filepath.Join(root, "content", fmt.Sprintf("section-%02d", i/20))
		if err := os.MkdirAll(dir, 0o755); err != nil {
			tb.Fatal(err)
		}
		name := fmt.Sprintf("page-%03d.md", i%20)
		if i%20 == 0 {
			name = "index.md"
		}
		var b strings.Builder
		fmt.Fprintf(&b, "+++\ntitle = \"Page %d\"\norder = %d\ndescription = \"Generated page %d.\"\n+++\n\n", i, i%20, i)
		for s := 0; s < 4; s++ {
			fmt.Fprintf(&b, "## Step %d of the build\n\nFit the part, check the clearance with a feeler gauge and note it in the log. "+
				"See [the previous page](page-%03d.md) and the [safety notes](../section-00/index.md).\n\n", s, (i+19)%20)
			b.WriteString("- clean the bore\n- oil the rings\n  - top ring first\n- fit the head\n\n")
			b.WriteString("| item | qty | note |\n|---|---:|---|\n| bolt | 4 | M6 |\n| washer | 4 | steel |\n\n")
		}
		switch i % 3 {
		case 0:
			b.WriteString("```python\nimport time\n\ndef log(p):\n    print(f\"{time.time():.0f} {p:.2f}\")\n```\n")
		case 1:
			b.WriteString("```go\npackage main\n\nfunc main() {\n\tfor i := 0; i < 3; i++ {\n\t\tprintln(i)\n\t}\n}\n```\n")
		default:
			b.WriteString("```sh\nset -e\nfor f in *.csv; do wc -l \"$f\"; done\n```\n")
		}
		if err := os.WriteFile(filepath.Join(dir, name), []byte(b.String()), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(root, "content", "index.md"), []byte("# Bench site\n"), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// BenchmarkBuild builds a generated 1,000-page site; see ns/page.
func BenchmarkBuild(b *testing.B) {
	root := b.TempDir()
	const pages = 1000
	writeBenchSite(b, root, pages)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Build(root, Options{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/(pages+1), "ns/page")
}
