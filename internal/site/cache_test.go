package site

import (
	"os"
	"path/filepath"
	"testing"
	"time"
)

// TestUnchangedRebuild: a second build of an unchanged site redoes
// nothing; any change to an input or to the output makes it build again.
func TestUnchangedRebuild(t *testing.T) {
	root := buildCopy(t, "basic")
	build := func() *Summary {
		t.Helper()
		sum, err := Build(root, Options{})
		if err != nil {
			t.Fatal(err)
		}
		return sum
	}
	if build().UpToDate {
		t.Fatal("the first build claims to be up to date")
	}
	if !build().UpToDate {
		t.Fatal("an unchanged rebuild was redone")
	}
	out := filepath.Join(root, DefaultOut)
	changes := []struct {
		name   string
		change func()
	}{
		{"page edited", func() { appendTo(t, filepath.Join(root, "content", "index.md"), "\nMore.\n") }},
		{"config edited", func() { appendTo(t, filepath.Join(root, ConfigFile), "\n# comment\n") }},
		{"static file added", func() { writeFile(t, filepath.Join(root, "static", "new.txt"), "new") }},
		{"output file deleted", func() { _ = os.Remove(filepath.Join(out, "notes.txt")) }},
		{"output file edited", func() {
			p := filepath.Join(out, "index.html")
			appendTo(t, p, "<!-- edited -->")
			later := time.Now().Add(time.Hour)
			_ = os.Chtimes(p, later, later)
		}},
		{"stray output file", func() { writeFile(t, filepath.Join(out, "stray.html"), "x") }},
		{"cache deleted", func() { _ = os.RemoveAll(filepath.Join(root, CacheDir)) }},
	}
	for _, c := range changes {
		c.change()
		if build().UpToDate {
			t.Errorf("%s: the rebuild was skipped", c.name)
		}
		if !build().UpToDate {
			t.Errorf("%s: the build after the rebuild was redone", c.name)
		}
	}
	if _, err := os.Stat(filepath.Join(out, "stray.html")); err == nil {
		t.Error("a rebuild kept a stray file in the output")
	}
}

func appendTo(t *testing.T, path, text string) {
	t.Helper()
	f, err := os.OpenFile(path, os.O_APPEND|os.O_WRONLY, 0o644)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if _, err := f.WriteString(text); err != nil {
		t.Fatal(err)
	}
}

func writeFile(t *testing.T, path, text string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

// BenchmarkRebuildUnchanged builds the generated 1,000-page site again
// with nothing changed: the target is half of BenchmarkFloor or less.
func BenchmarkRebuildUnchanged(b *testing.B) {
	root := b.TempDir()
	const pages = 1000
	WriteBenchSite(b, root, pages)
	if _, err := Build(root, Options{}); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		sum, err := Build(root, Options{})
		if err != nil || !sum.UpToDate {
			b.Fatalf("not up to date: %v", err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(pages+1), "ns/page")
}
