package results

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"reflect"
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// Read reads a results.json file. A file that is not one, or of another
// version, is an input error (*inputerr.Error) that says what is wrong.
func Read(path string) (*File, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, &inputerr.Error{Msg: fmt.Sprintf("%s: %v", path, err)}
	}
	var f File
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&f); err != nil {
		return nil, &inputerr.Error{File: path, Msg: "not a specgen results.json: " + jsonProblem(err)}
	}
	if f.Version == 0 {
		return nil, &inputerr.Error{File: path, Msg: "not a specgen results.json: it has no version; specgen build writes one as dist/results.json"}
	}
	if f.Version != Version {
		return nil, &inputerr.Error{File: path, Msg: fmt.Sprintf("results.json version %d; this specgen reads version %d", f.Version, Version)}
	}
	for i, blk := range f.Blocks {
		if blk.ID == "" {
			return nil, &inputerr.Error{File: path, Msg: fmt.Sprintf("not a specgen results.json: block %d of its list has no id", i+1)}
		}
	}
	return &f, nil
}

// jsonProblem says what is wrong with a JSON file without Go's type names.
func jsonProblem(err error) string {
	var te *json.UnmarshalTypeError
	var se *json.SyntaxError
	switch {
	case errors.As(err, &te) && te.Field == "":
		return "the file holds a JSON " + te.Value + "; results.json holds an object, {\"version\": 1, \"blocks\": [...]}"
	case errors.As(err, &te):
		return fmt.Sprintf("%s: a JSON %s where %s belongs", te.Field, te.Value, jsonKindWord(te.Type.Kind()))
	case errors.As(err, &se):
		return fmt.Sprintf("%s (at byte %d)", strings.TrimPrefix(se.Error(), "json: "), se.Offset)
	case errors.Is(err, io.EOF):
		return "the file is empty"
	case errors.Is(err, io.ErrUnexpectedEOF):
		return "the file ends in the middle of its JSON (cut short?)"
	}
	return strings.TrimPrefix(err.Error(), "json: ")
}

// jsonKindWord names what a Go kind reads from JSON.
func jsonKindWord(k reflect.Kind) string {
	switch k {
	case reflect.String:
		return "a string"
	case reflect.Float32, reflect.Float64:
		return "a number"
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return "a whole number"
	case reflect.Bool:
		return "true or false"
	case reflect.Slice, reflect.Array:
		return "an array"
	}
	return "an object"
}
