package results

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/units"
	"github.com/millrace-workshop/specgen/internal/version"
)

// Version is the schema version of results.json.
const Version = 1

// File is the layout of results.json (see DESIGN.md).
type File struct {
	Version int `json:"version"`
	// Generator is the specgen that wrote the file ("specgen v0.1.0"); files
	// written before it was recorded have none.
	Generator string  `json:"generator,omitempty"`
	Blocks    []Block `json:"blocks"`
	// NoSite is set for a revision without the site's content/ (before
	// the documentation was added): no blocks.
	NoSite bool `json:"-"`
	// Commit names the git commit the results were evaluated at ("" when
	// unknown, as for a results.json file): its hash, and " with
	// uncommitted changes" for a working tree that differs from it.
	Commit string `json:"-"`
	// Quotes are the places in the pages' prose that quote a block's value
	// (=[id.name]), by "id.name"; nil when unknown.
	Quotes map[string][]Place `json:"-"`
}

// Place is a line of a page.
type Place struct {
	File string // relative to the site root
	Line int
}

// Block is one block in results.json.
type Block struct {
	ID       string            `json:"id"`
	Kind     string            `json:"kind"`
	Page     string            `json:"page"`
	Line     int               `json:"line"`
	Inputs   map[string]Input  `json:"inputs"`
	Results  map[string]Result `json:"results"`
	Expect   []Claim           `json:"expect"`
	Cautions []Caution         `json:"cautions"`
}

// Input is one input: SI value and unit, and the text as written.
type Input struct {
	Value float64 `json:"value"`
	Unit  string  `json:"unit"`
	Text  string  `json:"text"`
}

// Result is one result: SI value and unit, and how pages show it.
type Result struct {
	Value   float64 `json:"value"`
	Unit    string  `json:"unit"`
	Display string  `json:"display"`
}

// Claim is one checked claim (an entry of a block's "expect").
type Claim struct {
	Name    string `json:"name"`
	Claim   string `json:"claim"`
	OK      bool   `json:"ok"`
	Message string `json:"message"`
}

// Caution is one caution.
type Caution struct {
	Level        string `json:"level"`
	Rule         string `json:"rule"`
	Message      string `json:"message"`
	Acknowledged string `json:"acknowledged,omitempty"` // the block's reason for accepting it
}

// Write writes results.json one block at a time, as json's indented
// encoding of the whole file would (blocks in the order given, sorted by
// id; keys sorted), so that a big site's results are never held in memory
// whole.
func Write(w io.Writer, blocks []*calc.Evaluated) error {
	_, err := WriteEntries(w, len(blocks), func(i int) ([]byte, error) { return Entry(blocks[i]) })
	return err
}

// Entry is one evaluated block's entry of results.json as Write writes it.
func Entry(e *calc.Evaluated) ([]byte, error) { return json.MarshalIndent(blockOf(e), "    ", "  ") }

// WriteEntries is Write with the n blocks' entries given by entry, each as
// Entry makes it; what entry returns is written before it is called again.
// It returns where each entry starts in what it wrote, so that a later
// build can take those of unchanged blocks over.
func WriteEntries(w io.Writer, n int, entry func(i int) ([]byte, error)) ([]int64, error) {
	cw := &countingWriter{w: w}
	bw := bufio.NewWriterSize(cw, 64<<10) // a big site's file is megabytes
	generator, err := json.Marshal(version.Generator())
	if err != nil {
		return nil, err
	}
	fmt.Fprintf(bw, "{\n  \"version\": %d,\n  \"generator\": %s,\n", Version, generator)
	if n == 0 {
		bw.WriteString("  \"blocks\": []\n}\n")
		return nil, bw.Flush()
	}
	bw.WriteString("  \"blocks\": [\n")
	at := make([]int64, n)
	for i := range n {
		b, err := entry(i)
		if err != nil {
			return nil, err
		}
		bw.WriteString("    ")
		at[i] = cw.n + int64(bw.Buffered())
		bw.Write(b)
		if i < n-1 {
			bw.WriteString(",")
		}
		bw.WriteString("\n")
	}
	bw.WriteString("  ]\n}\n")
	return at, bw.Flush()
}

// countingWriter counts what it passes on.
type countingWriter struct {
	w io.Writer
	n int64
}

func (c *countingWriter) Write(p []byte) (int, error) {
	n, err := c.w.Write(p)
	c.n += int64(n)
	return n, err
}

// Of returns the contents of results.json for evaluated blocks, sorted by id.
func Of(blocks []*calc.Evaluated) File {
	f := File{Version: Version, Generator: version.Generator(), Blocks: []Block{}}
	for _, e := range blocks {
		f.Blocks = append(f.Blocks, blockOf(e))
	}
	return f
}

// blockOf is one evaluated block's entry of results.json.
func blockOf(e *calc.Evaluated) Block {
	b := Block{
		ID:       e.Block.ID,
		Kind:     e.Block.Kind.Name,
		Page:     e.Block.File,
		Line:     e.Block.Line,
		Inputs:   map[string]Input{},
		Results:  map[string]Result{},
		Expect:   []Claim{},
		Cautions: []Caution{},
	}
	for _, in := range e.Inputs {
		b.Inputs[in.Name] = Input{Value: in.Value, Unit: siUnit(in.Dim), Text: in.Text}
	}
	for _, r := range e.Results {
		display, err := e.Format(r.Name, "")
		if err != nil {
			display = units.Format(r.Value, e.SigFigs())
		}
		b.Results[r.Name] = Result{Value: r.Value, Unit: siUnit(r.Dim), Display: display}
	}
	for _, c := range e.Claims {
		b.Expect = append(b.Expect, Claim{Name: c.Claim.Result, Claim: c.Claim.Text, OK: c.OK, Message: c.Message})
	}
	for _, c := range e.Cautions {
		b.Cautions = append(b.Cautions, Caution{Level: c.Level.String(), Rule: c.Rule, Message: c.Message, Acknowledged: c.Acknowledged})
	}
	return b
}

// siUnit is the SI unit results.json states for a dimension; pressures are
// absolute and say so.
func siUnit(d units.Dimension) string {
	if d == units.Pressure {
		return "Pa(a)"
	}
	return units.DefaultUnit(d)
}
