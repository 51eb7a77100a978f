package site

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
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

// TestExecutableID checks the build ID read from this test's own binary
// against the one the Go tool reads, and that a file without one is known
// by the hash of its whole content, which it stands in for.
func TestExecutableID(t *testing.T) {
	exe, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("the go tool is not installed")
	}
	out, err := exec.Command(goTool, "tool", "buildid", exe).Output()
	if err != nil {
		t.Fatalf("go tool buildid: %v", err)
	}
	want := strings.TrimSpace(string(out))
	if got := goBuildID(exe); runtime.GOOS == "linux" && got != want {
		t.Errorf("build ID %q, the go tool reads %q", got, want)
	}
	plain := filepath.Join(t.TempDir(), "plain")
	writeFile(t, plain, "not an executable")
	id, err := executableID(plain)
	if err != nil {
		t.Fatal(err)
	}
	if sum := sha256.Sum256([]byte("not an executable")); id != hex.EncodeToString(sum[:]) {
		t.Errorf("a file without a build ID is known as %q, not by its hash", id)
	}
}

// TestSourceStatsSettled: a source's recorded hash is taken over only when
// the file had last changed racyAge or more before the build looked at
// it, and only where its change time is known.
func TestSourceStatsSettled(t *testing.T) {
	taken := time.Now().UnixNano()
	stats := sourceStats{Taken: taken}
	old := taken - int64(racyAge) - 1
	for _, c := range []struct {
		name         string
		mtime, ctime int64
		want         bool
	}{
		{"changed well before", old, old, true},
		{"written within the disk's tick", taken - 1, taken - 1, false},
		{"its time set back", old, taken - 1, false},
		{"no change time known", old, 0, false},
	} {
		if got := stats.settled(sourceStat{MTime: c.mtime, CTime: c.ctime}); got != c.want {
			t.Errorf("%s: settled = %v, want %v", c.name, got, c.want)
		}
	}
}
