package site

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"

	"specgen/internal/calc"

	"specgen/internal/units"
)

// ResultsVersion is the schema version of results.json.
const ResultsVersion = 1

// ResultsFile is the layout of results.json (see DESIGN.md).
type ResultsFile struct {
	Version int           `json:"version"`
	Blocks  []ResultBlock `json:"blocks"`
	// NoSite is set by ResultsAt for a revision without the site's
	// content/ (before the documentation was added): no blocks.
	NoSite bool `json:"-"`
}

// ResultBlock is one block in results.json.
type ResultBlock struct {
	ID       string                `json:"id"`
	Kind     string                `json:"kind"`
	Page     string                `json:"page"`
	Line     int                   `json:"line"`
	Inputs   map[string]InputJSON  `json:"inputs"`
	Results  map[string]ResultJSON `json:"results"`
	Expect   []ExpectJSON          `json:"expect"`
	Cautions []CautionJSON         `json:"cautions"`
}

// InputJSON is one input: SI value and unit, and the text as written.
type InputJSON struct {
	Value float64 `json:"value"`
	Unit  string  `json:"unit"`
	Text  string  `json:"text"`
}

// ResultJSON is one result: SI value and unit, and how pages show it.
type ResultJSON struct {
	Value   float64 `json:"value"`
	Unit    string  `json:"unit"`
	Display string  `json:"display"`
}

// ExpectJSON is one checked claim.
type ExpectJSON struct {
	Name    string `json:"name"`
	Claim   string `json:"claim"`
	OK      bool   `json:"ok"`
	Message string `json:"message"`
}

// CautionJSON is one caution.
type CautionJSON struct {
	Level        string `json:"level"`
	Rule         string `json:"rule"`
	Message      string `json:"message"`
	Acknowledged string `json:"acknowledged,omitempty"` // the block's reason for accepting it
}

// writeResults writes results.json one block at a time, as json's indented
// encoding of the whole file would (blocks sorted by id, keys sorted), so
// that a big site's results are never held in memory whole.
func (s *Site) writeResults(w io.Writer) error {
	bw := bufio.NewWriter(w)
	blocks := 0
	if s.Calc != nil {
		blocks = len(s.Calc.Blocks)
	}
	if blocks == 0 {
		fmt.Fprintf(bw, "{\n  \"version\": %d,\n  \"blocks\": []\n}\n", ResultsVersion)
		return bw.Flush()
	}
	fmt.Fprintf(bw, "{\n  \"version\": %d,\n  \"blocks\": [\n", ResultsVersion)
	for i, e := range s.Calc.Blocks {
		b, err := json.MarshalIndent(resultBlock(e), "    ", "  ")
		if err != nil {
			return err
		}
		bw.WriteString("    ")
		bw.Write(b)
		if i < blocks-1 {
			bw.WriteString(",")
		}
		bw.WriteString("\n")
	}
	bw.WriteString("  ]\n}\n")
	return bw.Flush()
}

// Results returns the contents of results.json.
func (s *Site) Results() ResultsFile {
	f := ResultsFile{Version: ResultsVersion, Blocks: []ResultBlock{}}
	if s.Calc == nil {
		return f
	}
	for _, e := range s.Calc.Blocks {
		f.Blocks = append(f.Blocks, resultBlock(e))
	}
	return f
}

// resultBlock is one block's entry of results.json.
func resultBlock(e *calc.Evaluated) ResultBlock {
	b := ResultBlock{
		ID:       e.Block.ID,
		Kind:     e.Block.Kind.Name,
		Page:     e.Block.File,
		Line:     e.Block.Line,
		Inputs:   map[string]InputJSON{},
		Results:  map[string]ResultJSON{},
		Expect:   []ExpectJSON{},
		Cautions: []CautionJSON{},
	}
	for _, in := range e.Inputs {
		b.Inputs[in.Name] = InputJSON{Value: in.Value, Unit: siUnit(in.Dim), Text: in.Text}
	}
	for _, r := range e.Results {
		display, err := e.Format(r.Name, "")
		if err != nil {
			display = units.Format(r.Value, e.SigFigs())
		}
		b.Results[r.Name] = ResultJSON{Value: r.Value, Unit: siUnit(r.Dim), Display: display}
	}
	for _, c := range e.Claims {
		b.Expect = append(b.Expect, ExpectJSON{Name: c.Claim.Result, Claim: c.Claim.Text, OK: c.OK, Message: c.Message})
	}
	for _, c := range e.Cautions {
		b.Cautions = append(b.Cautions, CautionJSON{Level: c.Level.String(), Rule: c.Rule, Message: c.Message, Acknowledged: c.Acknowledged})
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
