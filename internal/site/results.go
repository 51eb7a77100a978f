package site

import (
	"bytes"
	"encoding/json"
)

// ResultsVersion is the schema version of results.json.
const ResultsVersion = 1

// resultsFile is the layout of results.json (see DESIGN.md).
type resultsFile struct {
	Version int           `json:"version"`
	Blocks  []resultBlock `json:"blocks"`
}

type resultBlock struct {
	ID       string                `json:"id"`
	Kind     string                `json:"kind"`
	Page     string                `json:"page"`
	Line     int                   `json:"line"`
	Inputs   map[string]inputJSON  `json:"inputs"`
	Results  map[string]resultJSON `json:"results"`
	Expect   []expectJSON          `json:"expect"`
	Cautions []cautionJSON         `json:"cautions"`
}

type inputJSON struct {
	Value float64 `json:"value"`
	Unit  string  `json:"unit"`
	Text  string  `json:"text"`
}

type resultJSON struct {
	Value   float64 `json:"value"`
	Unit    string  `json:"unit"`
	Display string  `json:"display"`
}

type expectJSON struct {
	Name    string `json:"name"`
	Claim   string `json:"claim"`
	OK      bool   `json:"ok"`
	Message string `json:"message"`
}

type cautionJSON struct {
	Level   string `json:"level"`
	Rule    string `json:"rule"`
	Message string `json:"message"`
}

// resultsJSON renders results.json: blocks sorted by id, map keys sorted
// (encoding/json sorts them), indented, so builds are byte-identical.
func (s *Site) resultsJSON() ([]byte, error) {
	f := resultsFile{Version: ResultsVersion, Blocks: []resultBlock{}}
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	if err := enc.Encode(f); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
