package site

import (
	"bytes"
	"context"
	"fmt"
	"io/fs"
	"maps"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/templates"
)

// incrementalSite is a small site in which every kind of dependency
// between pages occurs: a stage (lp) charted on its page, a receiver it
// fills (rx) quoting its delivery, a relief valve (rv) protecting both,
// whose setting marks the stage's delivery chart, a figures block (fig)
// deriving from the stage, a second compressor (hp) whose value the titles
// of its page and another and a page of another folder quote, and a page
// listing every caution.
var incrementalSite = map[string]string{
	"specgen.toml":       "title = \"Test workshop\"\n",
	"static/logo.txt":    "logo\n",
	"content/index.md":   "+++\ntitle = \"Workshop\"\n+++\n# Workshop\n\nThe home page.\n",
	"content/safety.md":  "+++\ntitle = \"Safety\"\norder = 9\n+++\n# Safety\n\n```cautions\n```\n",
	"content/a/index.md": "# Section A\n\nThe other compressor sweeps =[hp.swept_volume cm3].\n",
	"content/a/stage.md": "+++\ntitle = \"Stage\"\norder = 1\n+++\n# Stage\n\n```calc\nid = \"lp\"\nkind = \"compressor\"\ntitle = \"Low stage\"\n" +
		"bore = \"32 mm\"\nstroke = \"28 mm\"\nrod_length = \"70 mm\"\nclearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n\n" +
		"[show]\ncharts = [\"pv\", \"delivery\"]\n```\n",
	"content/a/tank.md": "+++\ntitle = \"Receiver\"\norder = 2\n+++\n# Receiver\n\nThe stage delivers =[lp.free_air_delivery L/min].\n\n" +
		"```calc\nid = \"rx\"\nkind = \"tank\"\ntitle = \"Receiver\"\nvolume = \"10 L\"\npressure = \"6 bar\"\nsupply = \"lp\"\n```\n",
	"content/b/relief.md": "+++\ntitle = \"Relief\"\norder = 1\n+++\n# Relief valve\n\n```calc\nid = \"rv\"\nkind = \"valve\"\ntitle = \"Relief valve\"\n" +
		"seat_diameter = \"6 mm\"\nspring_rate = \"12 N/mm\"\npreload = \"2.4 mm\"\nprotects = [\"lp\", \"rx\"]\n```\n",
	"content/b/notes.md": "+++\ntitle = \"Notes\"\norder = 2\n+++\n# Notes\n\n```calc\nid = \"fig\"\nkind = \"figures\"\ntitle = \"Figures\"\n" +
		"sweep = \"=lp.swept_volume\"\n\n[derive]\ndouble = \"2 * sweep\"\n```\n\nThe figure is =[fig.double cm3].\n",
	"content/b/summary.md": "+++\norder = 4\n+++\n# Summary: =[hp.swept_volume cm3] swept\n\nThe second compressor, in short.\n",
	"content/b/motor.md": "+++\norder = 3\n+++\n# Motor of =[hp.swept_volume cm3]\n\n```calc\nid = \"hp\"\nkind = \"compressor\"\ntitle = \"Second compressor\"\n" +
		"bore = \"25 mm\"\nstroke = \"20 mm\"\nrod_length = \"60 mm\"\nclearance_volume = \"1 cm3\"\nspeed = \"600 rpm\"\ndischarge_pressure = \"3 bar\"\n```\n",
}

// The site's pages, by output.
var incrementalPages = []string{"index.html", "safety.html", "a/index.html", "a/stage.html", "a/tank.html",
	"b/relief.html", "b/notes.html", "b/motor.html", "b/summary.html"}

// siteEdit changes a file of a site: replaces old with new in it, writes
// it whole (old == ""), or deletes it (new == "" too).
type siteEdit struct{ file, old, new string }

func (e siteEdit) apply(t *testing.T, root string) {
	t.Helper()
	p := filepath.Join(root, filepath.FromSlash(e.file))
	switch {
	case e.old == "" && e.new == "":
		if err := os.RemoveAll(p); err != nil {
			t.Fatal(err)
		}
		return
	case e.old == "":
		writeFile(t, p, e.new)
		return
	}
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(b, []byte(e.old)) {
		t.Fatalf("%s does not hold %q", e.file, e.old)
	}
	writeFile(t, p, strings.Replace(string(b), e.old, e.new, 1))
}

// pageOverride is the default page template with a line of the site's own.
func pageOverride(t *testing.T) string {
	b, err := fs.ReadFile(templates.FS, "page.html")
	if err != nil {
		t.Fatal(err)
	}
	return strings.Replace(string(b), "</body>", "<p>Printed by the workshop.</p></body>", 1)
}

// incrementalCase is an edit of incrementalSite and the pages it makes
// again.
type incrementalCase struct {
	name   string
	setup  []siteEdit // before the first build
	edits  []siteEdit
	remade []string // page outputs made again; nil: every page
	// commit: the site is a git repository, and the edit a new commit
	// (the revision data sheets show).
	commit bool
	// binary: the edited site is built by another specgen binary.
	binary bool
	// sameTimes: the edits keep each file's size and modification time,
	// and the first build's look at the sources is trusted at once: only
	// the files' change times tell the edit.
	sameTimes bool
}

// incrementalCases are the edits, one of each way a page's output can
// depend on another file.
func incrementalCases(t *testing.T) []incrementalCase {
	component := []string{"a/stage.html", "a/tank.html", "b/relief.html", "b/notes.html"}
	return []incrementalCase{
		{name: "page prose", edits: []siteEdit{{"content/b/notes.md", "The figure is", "Checked twice, the figure is"}},
			remade: []string{"b/notes.html"}},
		{name: "a value another folder's page and a title quote", edits: []siteEdit{{"content/b/motor.md", `stroke = "20 mm"`, `stroke = "22 mm"`}},
			// motor's and summary's titles are in folder b's navigation,
			// summary's in safety's previous link; the caution list shows
			// hp's dead-head.
			remade: []string{"a/index.html", "b/motor.html", "b/relief.html", "b/notes.html", "b/summary.html", "safety.html"}},
		{name: "a quoted, linked and derived-from block", edits: []siteEdit{{"content/a/stage.md", `stroke = "28 mm"`, `stroke = "30 mm"`}},
			remade: component},
		{name: "a relief setting the stage's chart marks", edits: []siteEdit{{"content/b/relief.md", `preload = "2.4 mm"`, `preload = "2.6 mm"`}},
			remade: component},
		{name: "prose above a block, which moves it down its page", edits: []siteEdit{{"content/a/stage.md", "# Stage\n", "# Stage\n\nWith a new gasket.\n"}},
			remade: []string{"a/stage.html"}},
		{name: "a title in the navigation", edits: []siteEdit{{"content/a/tank.md", `title = "Receiver"`, `title = "Air receiver"`}},
			// Folder b comes first ("B" before "Section A"): safety
			// follows the receiver in reading order.
			remade: []string{"a/index.html", "a/stage.html", "a/tank.html", "safety.html"}},
		{name: "an order", edits: []siteEdit{{"content/a/tank.md", "order = 2", "order = 0"}},
			remade: []string{"a/index.html", "a/stage.html", "a/tank.html", "safety.html"}},
		// Folder b has no index.md: its first page is its link everywhere.
		{name: "the order of a folder's first page", edits: []siteEdit{{"content/b/notes.md", "order = 2", "order = 0"}}},
		{name: "a new page", edits: []siteEdit{{"content/a/new.md", "", "+++\ntitle = \"New\"\norder = 3\n+++\n# New\n\nNew page.\n"}},
			remade: []string{"a/index.html", "a/stage.html", "a/tank.html", "a/new.html", "safety.html"}},
		{name: "a folder's only page deleted", setup: []siteEdit{{"content/c/only.md", "", "# Only\n\nThe one page of c.\n"}},
			edits: []siteEdit{{"content/c/only.md", "", ""}}},
		{name: "a deleted page", edits: []siteEdit{{"content/b/notes.md", "", ""}},
			// fig leaves lp's component.
			remade: []string{"a/stage.html", "a/tank.html", "b/relief.html", "b/motor.html", "b/summary.html"}},
		{name: "a caution disappears", edits: []siteEdit{{"content/a/tank.md", `volume = "10 L"`, `volume = "0.05 L"`}},
			remade: append([]string{"safety.html"}, component...)},
		{name: "a caution appears", setup: []siteEdit{{"content/a/tank.md", `volume = "10 L"`, `volume = "0.05 L"`}},
			edits:  []siteEdit{{"content/a/tank.md", `volume = "0.05 L"`, `volume = "10 L"`}},
			remade: append([]string{"safety.html"}, component...)},
		{name: "a static file", edits: []siteEdit{{"static/logo.txt", "logo", "new logo"}}, remade: []string{}},
		{name: "an output page edited by hand", edits: []siteEdit{{"dist/b/notes.html", "</html>", "<!-- by hand --></html>"}},
			remade: []string{"b/notes.html"}},
		{name: "an output file deleted by hand", edits: []siteEdit{{"dist/a/stage.lp.pv.csv", "", ""}},
			remade: []string{"a/stage.html"}},
		// Entries of unchanged blocks are taken from the last results.json
		// only while it is as that build left it.
		{name: "results.json edited by hand, then a block", edits: []siteEdit{{"dist/results.json", `"id": "hp"`, `"id": "hp by hand"`},
			{"content/a/stage.md", `stroke = "28 mm"`, `stroke = "30 mm"`}}, remade: component},
		{name: "specgen.toml", edits: []siteEdit{{"specgen.toml", "Test workshop", "The workshop"}}},
		{name: "a new commit", commit: true, edits: []siteEdit{{"content/index.md", "The home page.", "The home page, committed."}}},
		{name: "a template", edits: []siteEdit{{"templates/page.html", "", pageOverride(t)}}},
		{name: "a page rewritten at its size and time", sameTimes: true,
			edits: []siteEdit{{"content/b/notes.md", "The figure is", "The figure IS"}}, remade: []string{"b/notes.html"}},
		{name: "a quoted block rewritten at its size and time", sameTimes: true,
			edits: []siteEdit{{"content/a/stage.md", `stroke = "28 mm"`, `stroke = "30 mm"`}}, remade: component},
		{name: "a new specgen binary", binary: true, edits: []siteEdit{{"content/b/notes.md", "The figure is", "Checked twice, the figure is"}}},
		// The cache is safe to delete or damage, each file of it.
		{name: "the cache deleted", edits: []siteEdit{{CacheDir, "", ""}, {"content/b/notes.md", "The figure is", "Checked twice, the figure is"}}},
		{name: "the page forms deleted", edits: []siteEdit{{CacheDir + "/" + pageFormsFile, "", ""},
			{"content/b/notes.md", "The figure is", "Checked twice, the figure is"}}, remade: []string{"b/notes.html"}},
		{name: "the page forms damaged", edits: []siteEdit{{CacheDir + "/" + pageFormsFile, "", "not a gob stream"},
			{"content/b/notes.md", "The figure is", "Checked twice, the figure is"}}, remade: []string{"b/notes.html"}},
		{name: "the outcomes damaged", edits: []siteEdit{{CacheDir + "/" + outcomesFile, "", "not a gob stream"},
			{"content/a/stage.md", `stroke = "28 mm"`, `stroke = "30 mm"`}}, remade: component},
	}
}

// writeIncrementalSite writes incrementalSite into root with the case's
// setup, committed when the case commits.
func writeIncrementalSite(t *testing.T, root string, c incrementalCase) {
	t.Helper()
	for name, text := range incrementalSite {
		writeFile(t, filepath.Join(root, filepath.FromSlash(name)), text)
	}
	for _, e := range c.setup {
		e.apply(t, root)
	}
	if c.sameTimes {
		racy := racyAge
		racyAge = 0
		t.Cleanup(func() { racyAge = racy })
		// The disk's clock may not have ticked since the files were
		// written: the build must look at them later than that.
		time.Sleep(20 * time.Millisecond)
	}
	if c.commit {
		if _, err := exec.LookPath("git"); err != nil {
			t.Skip("git is not installed")
		}
		gitIn(t, root, "init", "-q")
		gitIn(t, root, "add", "-A")
		gitIn(t, root, "commit", "-q", "-m", "The site")
	}
}

// editIncrementalSite makes the case's edits, and commits them when the
// case commits.
func editIncrementalSite(t *testing.T, root string, c incrementalCase) {
	t.Helper()
	for _, e := range c.edits {
		p := filepath.Join(root, filepath.FromSlash(e.file))
		before, err := os.Stat(p)
		e.apply(t, root)
		if c.sameTimes {
			after, err2 := os.Stat(p)
			if err != nil || err2 != nil || after.Size() != before.Size() {
				t.Fatalf("%s: the edit does not keep the file's size", e.file)
			}
			if err := os.Chtimes(p, before.ModTime(), before.ModTime()); err != nil {
				t.Fatal(err)
			}
		}
	}
	if c.commit {
		gitIn(t, root, "commit", "-q", "-a", "-m", "An edit")
	}
	if c.binary {
		running := binaryHash
		binaryHash = func() (string, error) { return "another specgen", nil }
		t.Cleanup(func() { binaryHash = running })
	}
}

// gitIn runs git in dir as a fixed author.
func gitIn(t *testing.T, dir string, args ...string) {
	t.Helper()
	cmd := exec.Command("git", append([]string{"-C", dir, "-c", "user.name=Test", "-c", "user.email=test@example.invalid",
		"-c", "commit.gpgsign=false"}, args...)...)
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("git %v: %v\n%s", args, err, out)
	}
}

// TestIncrementalNeverStale edits the site in each way a page's output can
// depend on another file, builds again over the last build, builds the
// edited site afresh elsewhere, and compares every file byte for byte. It
// also checks that exactly the pages that depend on the edit were made
// again: the others are the last build's files (hard links to them).
func TestIncrementalNeverStale(t *testing.T) {
	for _, c := range incrementalCases(t) {
		t.Run(c.name, func(t *testing.T) {
			root := t.TempDir()
			writeIncrementalSite(t, root, c)
			if _, err := Build(root, Options{}); err != nil {
				t.Fatal(err)
			}
			before := inodes(t, filepath.Join(root, DefaultOut))
			editIncrementalSite(t, root, c)
			sum, err := Build(root, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if sum.UpToDate {
				t.Fatal("the edit was not noticed")
			}
			cold := t.TempDir()
			if err := os.CopyFS(cold, os.DirFS(root)); err != nil {
				t.Fatal(err)
			}
			if err := os.RemoveAll(filepath.Join(cold, CacheDir)); err != nil {
				t.Fatal(err)
			}
			if err := os.RemoveAll(filepath.Join(cold, DefaultOut)); err != nil {
				t.Fatal(err)
			}
			if _, err := Build(cold, Options{}); err != nil {
				t.Fatal(err)
			}
			sameTree(t, filepath.Join(root, DefaultOut), filepath.Join(cold, DefaultOut))
			after := inodes(t, filepath.Join(root, DefaultOut))
			pages := slices.Clone(incrementalPages)
			for _, e := range c.edits {
				if out := PageOutput(e.file); strings.HasPrefix(e.file, ContentDir+"/") && !slices.Contains(pages, out) {
					pages = append(pages, out)
				}
			}
			for _, page := range pages {
				ino, ok := after[page]
				if !ok {
					continue // deleted
				}
				want := c.remade == nil || slices.Contains(c.remade, page)
				if remade := ino != before[page]; remade != want {
					t.Errorf("%s: made again = %v, want %v", page, remade, want)
				}
			}
		})
	}
}

// inodes maps every file of an output folder to its inode: a page kept
// from the last build keeps its inode.
func inodes(t *testing.T, dir string) map[string]uint64 {
	t.Helper()
	out := map[string]uint64{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		info, err := d.Info()
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		if st, ok := info.Sys().(*syscall.Stat_t); ok {
			out[filepath.ToSlash(rel)] = st.Ino
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// sameTree fails unless folders a and b hold the same files with the same
// bytes, in the same folders.
func sameTree(t *testing.T, a, b string) {
	t.Helper()
	if da, db := folders(t, a), folders(t, b); !slices.Equal(da, db) {
		t.Errorf("the incremental build has the folders %q, a fresh one %q", da, db)
	}
	fa, fb := readTree(t, a), readTree(t, b)
	for _, name := range slices.Sorted(maps.Keys(fa)) {
		other, ok := fb[name]
		switch {
		case !ok:
			t.Errorf("%s: only in the incremental build", name)
		case !bytes.Equal(fa[name], other):
			t.Errorf("%s: the incremental build differs from a fresh one (stale)", name)
		}
	}
	for name := range fb {
		if _, ok := fa[name]; !ok {
			t.Errorf("%s: missing from the incremental build", name)
		}
	}
}

// TestMemoIsPlainData keeps the models' memos copyable and storable:
// exported fields only, and no interfaces, functions or channels, which
// neither the store's copy nor gob could keep.
func TestMemoIsPlainData(t *testing.T) {
	seen := map[reflect.Type]bool{}
	var check func(t2 reflect.Type, path string)
	check = func(t2 reflect.Type, path string) {
		if seen[t2] {
			return
		}
		seen[t2] = true
		switch t2.Kind() {
		case reflect.Interface, reflect.Func, reflect.Chan, reflect.UnsafePointer:
			t.Errorf("%s is a %s", path, t2.Kind())
		case reflect.Pointer, reflect.Slice, reflect.Array:
			check(t2.Elem(), path+"[]")
		case reflect.Map:
			check(t2.Key(), path+" key")
			check(t2.Elem(), path+" value")
		case reflect.Struct:
			for i := range t2.NumField() {
				f := t2.Field(i)
				if !f.IsExported() {
					t.Errorf("%s.%s is unexported", path, f.Name)
				}
				check(f.Type, path+"."+f.Name)
			}
		}
	}
	check(reflect.TypeFor[calc.Memo](), "Memo")
}

// TestOutcomeStoreRoundTrip checks that what a build saves, the next one
// reads back as it was.
func TestOutcomeStoreRoundTrip(t *testing.T) {
	dir := t.TempDir()
	m := &calc.Memo{Results: []calc.Result{{Name: "swept_volume", Value: 2.25e-5, Trace: calc.Trace{Formula: "Vs = A · s"}}},
		Curves: []calc.Curve{{Name: "pv", X: []float64{1, 2}, Y: []float64{3, 4}}},
		Values: map[string]float64{"bore": 0.032}, Given: map[string]bool{"bore": true}}
	o := newOutcomeStore("ns")
	o.Keep("k", m)
	if err := o.save(dir); err != nil {
		t.Fatal(err)
	}
	back := readOutcomeStore(dir, "ns")
	got, ok := back.Outcome("k")
	if !ok {
		t.Fatal("the saved outcome was not read back")
	}
	if !reflect.DeepEqual(got, m) {
		t.Errorf("read back %+v, want %+v", got, m)
	}
	if _, ok := readOutcomeStore(dir, "other").Outcome("k"); ok {
		t.Error("outcomes of another catalog were served")
	}
}

// TestIncrementalInterrupted stops an incremental build part way, after
// it has taken some pages over from the last output: that output stays as
// it was, and no staging folder is left.
func TestIncrementalInterrupted(t *testing.T) {
	root := t.TempDir()
	for name, text := range incrementalSite {
		writeFile(t, filepath.Join(root, filepath.FromSlash(name)), text)
	}
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(root, DefaultOut)
	before := treeHash(t, out)
	siteEdit{"content/b/notes.md", "The figure is", "Checked twice, the figure is"}.apply(t, root)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	_, err := Build(root, Options{Context: ctx, Progress: func(stage string, done, total int) {
		if stage == "pages rendered" && done == 3 {
			cancel()
		}
	}})
	checkInterrupted(t, err, root, out, before)
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	if treeHash(t, out) == before {
		t.Error("the build after the interrupted one did not take the edit")
	}
}

// TestOutcomeStoreAdds checks that a build computing a few outcomes adds
// them beside the saved ones, that the next build reads both, and that
// once the saved ones are mostly unused they are written afresh.
func TestOutcomeStoreAdds(t *testing.T) {
	dir := t.TempDir()
	memo := func(v float64) *calc.Memo { return &calc.Memo{Results: []calc.Result{{Name: "r", Value: v}}} }
	o := newOutcomeStore("ns")
	for i := range 100 {
		o.Keep(fmt.Sprint("k", i), memo(float64(i)))
	}
	if err := o.save(dir); err != nil {
		t.Fatal(err)
	}
	o = readOutcomeStore(dir, "ns")
	for i := range 100 {
		if _, ok := o.Outcome(fmt.Sprint("k", i)); !ok {
			t.Fatalf("k%d was not read back", i)
		}
	}
	o.Keep("new", memo(-1))
	if err := o.save(dir); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, addedFile)); err != nil {
		t.Fatalf("one new outcome was not added beside the others: %v", err)
	}
	o = readOutcomeStore(dir, "ns")
	if m, ok := o.Outcome("new"); !ok || m.Results[0].Value != -1 {
		t.Fatal("the added outcome was not read back")
	}
	for i := range 30 {
		o.Outcome(fmt.Sprint("k", i))
	}
	if err := o.save(dir); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, addedFile)); !os.IsNotExist(err) {
		t.Errorf("with most saved outcomes unused the store was not written afresh: %v", err)
	}
	o = readOutcomeStore(dir, "ns")
	if _, ok := o.Outcome("k50"); ok {
		t.Error("an outcome no build used was kept")
	}
	for _, key := range []string{"k0", "k29", "new"} {
		if _, ok := o.Outcome(key); !ok {
			t.Errorf("%s, used, was not kept", key)
		}
	}
}

// TestSessionNeverStale makes each edit of incrementalCases between two
// builds of a preview's session and compares what the second gives with
// a fresh render of the edited site, file by file.
func TestSessionNeverStale(t *testing.T) {
	for _, c := range incrementalCases(t) {
		if strings.HasPrefix(c.edits[0].file, DefaultOut+"/") || strings.HasPrefix(c.edits[0].file, CacheDir) {
			continue // the preview writes no output folder and no cache
		}
		t.Run(c.name, func(t *testing.T) {
			root := t.TempDir()
			writeIncrementalSite(t, root, c)
			se := NewSession(root)
			if _, _, err := se.Build(); err != nil {
				t.Fatal(err)
			}
			editIncrementalSite(t, root, c)
			got, _, err := se.Build()
			if err != nil {
				t.Fatal(err)
			}
			s, err := Load(root)
			if err != nil {
				t.Fatal(err)
			}
			want, err := s.Render()
			if err != nil {
				t.Fatal(err)
			}
			for _, name := range slices.Sorted(maps.Keys(want)) {
				if !bytes.Equal(got[name], want[name]) {
					t.Errorf("%s: the session's build differs from a fresh one (stale)", name)
				}
			}
			for name := range got {
				if _, ok := want[name]; !ok {
					t.Errorf("%s: only in the session's build", name)
				}
			}
		})
	}
}

// folders lists the folders within dir, sorted.
func folders(t *testing.T, dir string) []string {
	t.Helper()
	var list []string
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err == nil && d.IsDir() && p != dir {
			rel, _ := filepath.Rel(dir, p)
			list = append(list, filepath.ToSlash(rel))
		}
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	slices.Sort(list)
	return list
}
