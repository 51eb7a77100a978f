package models

import (
	"bytes"
	"cmp"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/units"
)

// referenceDir holds a folder of reference cases per kind, and tables/.
const referenceDir = "../../testdata/reference"

// blockCase is one testdata/reference/KIND/*.toml file: calc blocks as a
// user writes them (each [[blocks]] table is one block), evaluated together
// as a site build does, and checks of their results.
type blockCase struct {
	Source     string
	FromMemory bool `toml:"from_memory"`
	Note       string
	// Materials are site rows over the built-in table ([materials.NAME]).
	Materials map[string]MaterialRow
	Block     string // the block checks name unless they name their own
	Blocks    []map[string]any
	Check     []caseCheck
}

// caseCheck is one [[check]]: a result of a block of the folder's kind and
// the reference it must meet.
type caseCheck struct {
	Block  string // "" for the case's block
	Result string
	// Basis is "" to compare with Value; otherwise the kind's test computes
	// the reference (references), from Value when the basis scales it.
	Basis     string
	Value     string
	Tolerance string // "0.5%" of the reference, or an absolute quantity
	valueRead bool
}

// value reads the check's value in dim, pressures against ambient.
func (ch *caseCheck) value(t *testing.T, dim units.Dimension, ambient float64) float64 {
	t.Helper()
	ch.valueRead = true
	q, err := units.Parse(ch.Value, dim)
	if err != nil {
		t.Fatalf("%s: value: %v", ch.Result, err)
	}
	return q.Absolute(ambient)
}

// referenceFunc computes the reference of a check with a basis: block e,
// evaluated in set.
type referenceFunc func(t *testing.T, ch *caseCheck, set *calc.Set, e *calc.Evaluated) float64

// references holds each kind's own reference computations, by kind name,
// each worked apart from the model under test (numerical integration,
// other formulas, a book's value scaled); a kind whose cases use no basis
// has none.
var references = map[string]referenceFunc{
	"balance":    balanceReference,
	"compressor": compressorReference,
	"drive":      driveReference,
	"flywheel":   flywheelReference,
	"machine":    machineReference,
	"motor":      motorReference,
	"multistage": multistageReference,
	"plate":      plateReference,
	"tank":       tankReference,
	"tube":       tubeReference,
	"valve":      valveReference,
	"vacuum":     vacuumReference,
}

// TestReference runs every case of every kind of the catalog: each file
// testdata/reference/KIND/*.toml is a blockCase. Tables that are not block
// cases live in testdata/reference/tables/, each read by its own test:
// iso898-1-*.toml (TestISO898Tables), material-minimums.toml
// (TestMaterialMinimums) and slider-crank-*.toml (TestSliderCrankPosition).
func TestReference(t *testing.T) {
	for _, kind := range testCatalog.KindNames() {
		files, err := filepath.Glob(filepath.Join(referenceDir, kind, "*.toml"))
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range files {
			t.Run(kind+"/"+filepath.Base(f), func(t *testing.T) { runBlockCase(t, kind, f) })
		}
	}
}

// TestReferenceCoverage fails for a kind without a reference case, for a
// folder or file the harness would not read, and for reference
// computations of a kind the catalog lacks.
func TestReferenceCoverage(t *testing.T) {
	kinds := map[string]bool{}
	for _, kind := range testCatalog.KindNames() {
		kinds[kind] = true
		entries, _ := os.ReadDir(filepath.Join(referenceDir, kind))
		cases := 0
		for _, en := range entries {
			if en.IsDir() || filepath.Ext(en.Name()) != ".toml" {
				t.Errorf("testdata/reference/%s/%s is not a case file (*.toml); tables go in testdata/reference/tables/", kind, en.Name())
			} else {
				cases++
			}
		}
		if cases == 0 {
			t.Errorf("kind %s has no reference case: add a worked example or hand calculation with its source as testdata/reference/%s/NAME.toml (see DEVELOPERS.md, Tests)", kind, kind)
		}
	}
	entries, err := os.ReadDir(referenceDir)
	if err != nil {
		t.Fatal(err)
	}
	for _, en := range entries {
		if name := en.Name(); !en.IsDir() || (name != "tables" && !kinds[name]) {
			t.Errorf("testdata/reference/%s is neither a kind's folder nor tables/", name)
		}
	}
	for kind := range references {
		if !kinds[kind] {
			t.Errorf("references has computations for %q, which is not a kind", kind)
		}
	}
}

// runBlockCase evaluates the case in file and checks its results; its
// checks must be of blocks of kind.
func runBlockCase(t *testing.T, kind, file string) {
	var c blockCase
	md, err := toml.DecodeFile(file, &c)
	if err != nil {
		t.Fatal(err)
	}
	// A block's own tables ([blocks.derive]) are the block's to judge.
	if un := slices.DeleteFunc(md.Undecoded(), func(k toml.Key) bool { return k[0] == "blocks" }); len(un) > 0 {
		t.Fatalf("unknown keys %v", un)
	}
	if c.Source == "" || c.Note == "" || len(c.Blocks) == 0 || len(c.Check) == 0 {
		t.Fatal("a case needs a source, a note, blocks and checks")
	}
	cat := testCatalog
	if len(c.Materials) > 0 {
		cat = catalogWith(t, &Env{Materials: mustMaterials(t, c.Materials), Safety: DefaultSafety})
	}
	set, err := evaluateIn(t, cat, c.Blocks)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range set.Blocks {
		checkFinite(t, e)
	}
	for i := range c.Check {
		ch := &c.Check[i]
		id := cmp.Or(ch.Block, c.Block)
		e, ok := set.Lookup(id)
		if !ok {
			t.Errorf("%s: no block %q", ch.Result, id)
			continue
		}
		if e.Block.Kind.Name != kind {
			t.Errorf("%s: block %s is a %s; a case in testdata/reference/%s checks %s blocks", ch.Result, id, e.Block.Kind.Name, kind, kind)
			continue
		}
		r, ok := e.Result(ch.Result)
		if !ok {
			t.Errorf("block %s has no result %q", id, ch.Result)
			continue
		}
		var want float64
		if ch.Basis == "" {
			want = ch.value(t, r.Dim, e.Ambient)
		} else {
			reference, ok := references[kind]
			if !ok {
				t.Fatalf("%s: basis %q, but the %s tests compute no references", ch.Result, ch.Basis, kind)
			}
			want = reference(t, ch, set, e)
			if ch.Value != "" && !ch.valueRead {
				t.Errorf("%s: basis %q does not use the value %q", ch.Result, ch.Basis, ch.Value)
			}
		}
		tol := tolerance(t, ch.Tolerance, r.Dim, want)
		t.Logf("%s.%s = %.9g SI, want %.9g ± %.3g (%s)", id, ch.Result, r.Value, want, tol, ch.Basis)
		if math.Abs(r.Value-want) > tol {
			t.Errorf("%s.%s = %.9g SI, want %s = %.9g SI ± %.3g (%s; %s)", id, ch.Result, r.Value, cmp.Or(ch.Value, ch.Basis), want, tol, ch.Basis, c.Source)
		}
	}
}

// checkFinite checks that every result of e is finite with a worked trace
// and every point of its curves finite.
func checkFinite(t *testing.T, e *calc.Evaluated) {
	t.Helper()
	for _, r := range e.Results {
		if math.IsNaN(r.Value) || math.IsInf(r.Value, 0) || r.Trace.Formula == "" || !strings.HasPrefix(r.Trace.Substituted, "= ") {
			t.Errorf("%s.%s = %g with trace %q / %q", e.Block.ID, r.Name, r.Value, r.Trace.Formula, r.Trace.Substituted)
		}
	}
	for _, c := range e.Curves {
		for i := range c.X {
			if math.IsNaN(c.X[i]+c.Y[i]) || math.IsInf(c.X[i]+c.Y[i], 0) {
				t.Errorf("%s: curve %s point %d is (%g, %g)", e.Block.ID, c.Name, i, c.X[i], c.Y[i])
			}
		}
	}
}

// tolerance reads "0.5%" (of want) or an absolute quantity; temperatures
// and pressures are read as differences.
func tolerance(t *testing.T, s string, dim units.Dimension, want float64) float64 {
	t.Helper()
	if pct, ok := strings.CutSuffix(strings.TrimSpace(s), "%"); ok {
		q, err := units.Parse(pct, units.Dimensionless)
		if err != nil {
			t.Fatalf("tolerance %q: %v", s, err)
		}
		return math.Abs(want) * q.Value / 100
	}
	switch dim {
	case units.Temperature:
		dim = units.TemperatureDifference
	case units.Pressure:
		dim = units.Stress
	}
	q, err := units.Parse(s, dim)
	if err != nil {
		t.Fatalf("tolerance %q: %v", s, err)
	}
	return q.Value
}

// evaluateBlocks parses calc blocks written as TOML tables and evaluates
// them together with the built-in materials.
func evaluateBlocks(t *testing.T, tables []map[string]any) (*calc.Set, error) {
	t.Helper()
	return evaluateIn(t, testCatalog, tables)
}

// evaluateIn parses calc blocks written as TOML tables and evaluates them
// together in cat, as a site build does.
func evaluateIn(t *testing.T, cat *calc.Catalog, tables []map[string]any) (*calc.Set, error) {
	t.Helper()
	var blocks []*calc.Block
	for i, table := range tables {
		var buf bytes.Buffer
		if err := toml.NewEncoder(&buf).Encode(table); err != nil {
			t.Fatal(err)
		}
		b, err := cat.ParseBlock("reference.md", 100*i, buf.String())
		if err != nil {
			t.Fatalf("block %d: %v\n%s", i, err, buf.String())
		}
		blocks = append(blocks, b)
	}
	return cat.Evaluate(blocks, calc.Options{})
}

// inputValue returns the SI value of e's input name.
func inputValue(t *testing.T, e *calc.Evaluated, name string) (float64, bool) {
	t.Helper()
	for _, in := range e.Inputs {
		if in.Name == name {
			return in.Value, true
		}
	}
	return 0, false
}

// mustInput returns the SI value of e's input name, which e must have.
func mustInput(t *testing.T, e *calc.Evaluated, name string) float64 {
	t.Helper()
	v, ok := inputValue(t, e, name)
	if !ok {
		t.Fatalf("block %s has no input %s", e.Block.ID, name)
	}
	return v
}

// mustResult returns the SI value of e's result name, which e must have.
func mustResult(t *testing.T, e *calc.Evaluated, name string) float64 {
	t.Helper()
	r, ok := e.Result(name)
	if !ok {
		t.Fatalf("block %s has no result %s", e.Block.ID, name)
	}
	return r.Value
}

// inletPressure returns e's inlet_pressure, or its ambient when it has none.
func inletPressure(t *testing.T, e *calc.Evaluated) float64 {
	t.Helper()
	if p, ok := inputValue(t, e, "inlet_pressure"); ok {
		return p
	}
	return e.Ambient
}
