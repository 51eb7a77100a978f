package results_test

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/millrace-workshop/specgen/internal/results"
	"github.com/millrace-workshop/specgen/internal/site"
)

// TestWriteMatchesWholeEncoding: results.json written block by block is
// byte for byte what encoding the whole file at once gives, and reads back
// as the same contents. The demo site has blocks of every kind.
func TestWriteMatchesWholeEncoding(t *testing.T) {
	s, err := site.Load(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Calc.Blocks) < 2 {
		t.Fatalf("the demo has %d blocks; the test needs several", len(s.Calc.Blocks))
	}
	var streamed bytes.Buffer
	if err := results.Write(&streamed, s.Calc.Blocks); err != nil {
		t.Fatal(err)
	}
	whole := s.Results()
	want, err := json.MarshalIndent(whole, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	want = append(want, '\n')
	if !bytes.Equal(streamed.Bytes(), want) {
		t.Fatalf("streamed results.json differs from the whole encoding:\n%s\nwant:\n%s", streamed.Bytes(), want)
	}

	// Each entry is where WriteEntries says, as Entry makes it.
	var again bytes.Buffer
	at, err := results.WriteEntries(&again, len(s.Calc.Blocks), func(i int) ([]byte, error) { return results.Entry(s.Calc.Blocks[i]) })
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(again.Bytes(), streamed.Bytes()) {
		t.Error("WriteEntries wrote another file than Write")
	}
	for i, e := range s.Calc.Blocks {
		entry, err := results.Entry(e)
		if err != nil {
			t.Fatal(err)
		}
		if end := at[i] + int64(len(entry)); end > int64(again.Len()) || !bytes.Equal(again.Bytes()[at[i]:end], entry) {
			t.Errorf("block %s: its entry is not at %d", e.Block.ID, at[i])
		}
	}

	path := filepath.Join(t.TempDir(), "results.json")
	if err := os.WriteFile(path, streamed.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	back, err := results.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	// What the site knows besides results.json is not in the file.
	whole.Quotes, whole.Commit = nil, ""
	if !reflect.DeepEqual(*back, whole) {
		t.Error("results.json read back differs from what was written")
	}
}

// TestWriteNoBlocks: a site without calculations still writes a valid
// file, with an empty list rather than null.
func TestWriteNoBlocks(t *testing.T) {
	var b bytes.Buffer
	if err := results.Write(&b, nil); err != nil {
		t.Fatal(err)
	}
	want, _ := json.MarshalIndent(results.Of(nil), "", "  ")
	if got := b.String(); got != string(want)+"\n" {
		t.Errorf("got %q, want %q", got, want)
	}
}
