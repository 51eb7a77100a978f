package calc

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// Block is one decoded calculation block: a fenced code block whose info
// string is "calc", holding one TOML document.
type Block struct {
	ID    string
	Kind  *Kind
	Title string
	File  string // page, relative to the site root
	Line  int    // file line of the opening fence
	// Source is the block's TOML as written.
	Source string
	// Values are the inputs as written, sorted by key (Value looks one
	// up): a list takes a fraction of a map's memory, and a big site keeps
	// every block's.
	Values []Value
	// Ambient is the ambient pressure text, "" for the default.
	Ambient Value
	Expect  []Claim
	Show    Show
	// Acknowledge maps caution rule ids to the block's reason for
	// accepting them.
	Acknowledge map[string]string
	// Derive lists the results the block computes with expressions, in
	// the order its [derive] table names them.
	Derive        []Derivation
	pendingClaims []pendingClaim
	// Broken marks a block ParseBlock returned with its errors: other
	// blocks may name it, and Evaluate checks the inputs it could read,
	// but it is not evaluated, nor is any block that needs it.
	Broken  bool
	lines   []keyLine // TOML-relative line of each key, sorted by key
	catalog *Catalog
}

// Value is one input as the user wrote it.
type Value struct {
	Key  string
	Text string // the string, or the number's TOML text
	// Ref is the block and result of a "=id.result" reference, else empty.
	RefBlock, RefResult string
	// Links are the block ids a Link or LinkList input names.
	Links []string
	// Items are the values of a List input written as a list, as written.
	Items []string
	Line  int // file line
}

// Value returns the input written for key.
func (b *Block) Value(key string) (Value, bool) {
	i, ok := slices.BinarySearchFunc(b.Values, key, func(v Value, key string) int { return strings.Compare(v.Key, key) })
	if !ok {
		return Value{}, false
	}
	return b.Values[i], true
}

// Deps lists the blocks a value needs evaluated first: the one it quotes,
// or those it links to.
func (v Value) Deps() []string {
	if v.RefBlock != "" {
		return []string{v.RefBlock}
	}
	return v.Links
}

// Show is the [show] table: which results in which units, and charts.
type Show struct {
	Outputs []Output
	Charts  []string
	// FullRange: charts over an operating condition (a stage's discharge
	// pressure) span all of it, to dead-head, not the working range.
	FullRange bool
}

// Output is one entry of [show] outputs: a result and the unit to show it in.
type Output struct {
	Name string
	Unit string // "" for the result's default
}

// commonKeys are the keys every block takes besides its kind's inputs.
var commonKeys = []string{"id", "kind", "title", "ambient_pressure", "derive", "expect", "show", "acknowledge"}

// Limits on one block, far above any real block, so that a runaway or
// generated block fails quickly with one clear message.
const (
	MaxBlockLines  = 10000
	MaxBlockBytes  = 1 << 20
	MaxBlockErrors = 20 // errors reported per block; the rest are counted
)

// DefaultAmbient is the ambient pressure when a block names none (1 atm).
const DefaultAmbient = 101325.0

var idPattern = regexp.MustCompile(`^[a-z0-9][a-z0-9_-]*$`)

// refPattern matches a reference to another block's result.
var refPattern = regexp.MustCompile(`^=\s*([a-z0-9][a-z0-9_-]*)\.([a-z][a-z0-9_]*)\s*$`)

// ParseBlock decodes one calc block. file and fenceLine place it for error
// messages: TOML line k is file line fenceLine+k. With an error it still
// returns what it read, marked Broken, when the block names its id, so
// that every other problem of the site can be found in the same run.
func (c *Catalog) ParseBlock(file string, fenceLine int, src string) (*Block, error) {
	b, err := c.parseBlock(file, fenceLine, src)
	if err == nil {
		return b, nil
	}
	if b == nil {
		b = &Block{File: file, Line: fenceLine, Source: src, catalog: c}
	}
	if b.ID == "" || !idPattern.MatchString(b.ID) {
		// Not even TOML: the id as written, if it can be seen.
		m := writtenID.FindStringSubmatch(src)
		if m == nil {
			return nil, err
		}
		b.ID = m[1]
	}
	b.Broken = true
	return b, err
}

// writtenID finds the id line of a block whose TOML cannot be read.
var writtenID = regexp.MustCompile(`(?m)^[ \t]*id[ \t]*=[ \t]*"([a-z0-9][a-z0-9_-]*)"[ \t]*(?:#.*)?\r?$`)

// parseBlock decodes one calc block; with an error, the block is what it
// could read, or nil.
func (c *Catalog) parseBlock(file string, fenceLine int, src string) (*Block, error) {
	b := &Block{File: file, Line: fenceLine, Source: src, catalog: c}
	if n := lineCount(src); n > MaxBlockLines || len(src) > MaxBlockBytes {
		return nil, inputerr.List{{File: file, Line: fenceLine, Msg: fmt.Sprintf("the block is %d lines and %d bytes long; a calc block holds one model's inputs, allowed: up to %d lines and %d bytes (is its closing fence missing?)", n, len(src), MaxBlockLines, MaxBlockBytes)}}
	}
	var raw map[string]any
	if _, err := toml.Decode(src, &raw); err != nil {
		return nil, b.tomlError(err)
	}
	b.lines = keyLineList(src)
	var errs inputerr.List
	fail := func(key, format string, args ...any) {
		errs = append(errs, &inputerr.Error{File: file, Line: b.lineOf(key), Key: key, Msg: fmt.Sprintf(format, args...)})
	}

	id, ok := raw["id"].(string)
	switch {
	case raw["id"] == nil:
		errs = append(errs, &inputerr.Error{File: file, Line: fenceLine, Msg: `the block has no id; add id = "name" (lower-case letters, digits, '-' and '_'), unique in the site`})
	case !ok:
		fail("id", "%s is not a string; write id = \"name\"", TOMLText(raw["id"]))
	case !idPattern.MatchString(id):
		fail("id", "%q is not allowed; an id is lower-case letters, digits, '-' and '_', starting with a letter or digit", id)
	}
	b.ID = id

	kindName, ok := raw["kind"].(string)
	switch {
	case raw["kind"] == nil:
		errs = append(errs, &inputerr.Error{File: file, Line: fenceLine, Msg: "the block has no kind; add kind = \"...\" (one of " + strings.Join(c.KindNames(), ", ") + ")"})
	case !ok:
		fail("kind", "%s is not a string; one of %s", TOMLText(raw["kind"]), strings.Join(c.KindNames(), ", "))
	default:
		k, found := c.Kind(kindName)
		if !found {
			msg := fmt.Sprintf("unknown kind %q; allowed: %s", kindName, strings.Join(c.KindNames(), ", "))
			if s := Suggest(kindName, c.KindNames()); s != "" {
				msg = fmt.Sprintf("unknown kind %q; did you mean %q? (allowed: %s)", kindName, s, strings.Join(c.KindNames(), ", "))
			}
			fail("kind", "%s", msg)
		}
		b.Kind = k
	}
	if t, present := raw["title"]; present {
		if s, ok := t.(string); ok {
			b.Title = s
		} else {
			fail("title", "%s is not a string", TOMLText(t))
		}
	}
	if len(errs) > 0 || b.Kind == nil {
		return b, errs.Sorted()
	}

	keys := make([]string, 0, len(raw))
	inputs := 0
	for k := range raw {
		keys = append(keys, k)
		if !slices.Contains(commonKeys, k) {
			inputs++
		}
	}
	sort.Strings(keys)
	b.Values = make([]Value, 0, inputs) // a big site keeps every block's: no room to spare
	if b.Kind.FreeInputs {
		// The block's own inputs join a copy of its kind.
		k := *b.Kind
		k.Inputs = slices.Clone(k.Inputs)
		b.Kind = &k
	}
	allowed := append(append([]string{}, commonKeys...), b.Kind.inputNames()...)
	for _, key := range keys {
		v := raw[key]
		switch key {
		case "id", "kind", "title":
			continue
		case "expect":
			claims, err := b.decodeExpect(v)
			errs = append(errs, err...)
			b.Expect = claims
			continue
		case "show":
			errs = append(errs, b.decodeShow(v)...)
			continue
		case "acknowledge":
			errs = append(errs, b.decodeAcknowledge(v)...)
			continue
		case "derive":
			errs = append(errs, b.decodeDerive(v)...)
			continue
		}
		if _, isInput := b.Kind.Input(key); !isInput && key != "ambient_pressure" && b.Kind.FreeInputs {
			spec, err := b.freeInput(key, v)
			if err != nil {
				errs = append(errs, err)
				continue
			}
			b.Kind.Inputs = append(b.Kind.Inputs, spec)
		}
		if _, isInput := b.Kind.Input(key); !isInput && key != "ambient_pressure" {
			msg := fmt.Sprintf("unknown key for kind %s; allowed: %s", b.Kind.Name, strings.Join(allowed, ", "))
			if s := Suggest(key, allowed); s != "" {
				msg = fmt.Sprintf("unknown key for kind %s; did you mean %q?", b.Kind.Name, s)
			}
			fail(key, "%s", msg)
			continue
		}
		val, err := b.decodeValue(key, v)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		if key == "ambient_pressure" {
			b.Ambient = val
			continue
		}
		val.Key = key
		b.Values = append(b.Values, val) // in the order of keys: sorted
	}
	for _, in := range b.Kind.Inputs {
		// A key written with a bad value has its own error already.
		if _, written := raw[in.Name]; !written && in.Default == "" && !in.Optional {
			errs = append(errs, &inputerr.Error{File: file, Line: fenceLine, Key: in.Name,
				Msg: fmt.Sprintf("missing; kind %s needs it: %s (%s)", b.Kind.Name, in.Meaning, b.takes(in))})
		}
	}
	if err := errs.Capped(MaxBlockErrors, "in this block").Sorted(); err != nil {
		return b, err
	}
	return b, nil
}

// lineCount is the number of lines of src, a last line without a newline
// included.
func lineCount(src string) int {
	n := strings.Count(src, "\n")
	if src != "" && !strings.HasSuffix(src, "\n") {
		n++
	}
	return n
}

// decodeValue reads one input: a quantity string, a plain number (only for
// dimensionless inputs) or a "=id.result" reference.
func (b *Block) decodeValue(key string, v any) (Value, *inputerr.Error) {
	line := b.lineOf(key)
	bad := func(format string, args ...any) (Value, *inputerr.Error) {
		return Value{}, &inputerr.Error{File: b.File, Line: line, Key: key, Msg: fmt.Sprintf(format, args...)}
	}
	dim := units.Pressure
	spec, isInput := b.Kind.Input(key)
	if isInput {
		dim = spec.Dim
		switch spec.Type {
		case Name:
			return b.decodeName(key, line, v)
		case Link, LinkList:
			return b.decodeLinks(spec, line, v)
		}
		if items, isList := v.([]any); isList && spec.List {
			return b.decodeList(spec, line, items)
		}
	}
	switch t := v.(type) {
	case string:
		if strings.HasPrefix(strings.TrimSpace(t), "=") {
			m := refPattern.FindStringSubmatch(t)
			if m == nil {
				return bad("%q is not a reference; write \"=block.result\", e.g. \"=low.discharge_temperature\"", t)
			}
			return Value{Text: strings.TrimSpace(t), RefBlock: m[1], RefResult: m[2], Line: line}, nil
		}
		return Value{Text: t, Line: line}, nil
	case int64:
		if dim != units.Dimensionless {
			return bad("%d has no unit; %s takes %s, written as a string such as \"%d %s\"", t, key, dimPhrase(dim), t, firstExample(dim))
		}
		return Value{Text: strconv.FormatInt(t, 10), Line: line}, nil
	case float64:
		if math.IsNaN(t) || math.IsInf(t, 0) {
			return bad("nan and inf are not finite numbers; write a number such as 1.3")
		}
		if dim != units.Dimensionless {
			return bad("%v has no unit; %s takes %s, written as a string such as \"%v %s\"", t, key, dimPhrase(dim), t, firstExample(dim))
		}
		return Value{Text: strconv.FormatFloat(t, 'g', -1, 64), Line: line}, nil
	}
	return bad("%s is not a quantity; write a string such as \"32 mm\"", TOMLText(v))
}

// decodeList reads a List input written as a list: quantity strings, or
// plain numbers for a dimensionless input; references are taken one value
// at a time, not in a list.
func (b *Block) decodeList(spec InputSpec, line int, items []any) (Value, *inputerr.Error) {
	bad := func(format string, args ...any) (Value, *inputerr.Error) {
		return Value{}, &inputerr.Error{File: b.File, Line: line, Key: spec.Name, Msg: fmt.Sprintf(format, args...)}
	}
	if len(items) == 0 {
		return bad("an empty list; give one value for all, or a list with one value each (%s)", spec.Dim.Examples())
	}
	var texts []string
	for _, item := range items {
		var text string
		switch t := item.(type) {
		case string:
			text = strings.TrimSpace(t)
		case int64:
			text = strconv.FormatInt(t, 10)
		case float64:
			text = strconv.FormatFloat(t, 'g', -1, 64)
		}
		switch {
		case text == "":
			return bad("%s in the list is not a quantity; write each value as a string with its unit (%s)", TOMLText(item), spec.Dim.Examples())
		case strings.HasPrefix(text, "="):
			return bad("%q: a reference stands alone, not in a list; write %s = %q for all, or the values themselves", text, spec.Name, text)
		}
		if _, isString := item.(string); !isString && spec.Dim != units.Dimensionless {
			return bad("%s has no unit; %s takes %s, written as strings such as \"%s %s\"", text, spec.Name, dimPhrase(spec.Dim), text, firstExample(spec.Dim))
		}
		texts = append(texts, text)
	}
	return Value{Text: strings.Join(texts, ", "), Items: texts, Line: line}, nil
}

// decodeName reads a Name input: a string, a number written bare (a
// property class such as 8.8) or a boolean ("true", "false").
func (b *Block) decodeName(key string, line int, v any) (Value, *inputerr.Error) {
	switch t := v.(type) {
	case string:
		if strings.TrimSpace(t) == "" {
			return Value{}, &inputerr.Error{File: b.File, Line: line, Key: key, Msg: "must not be empty"}
		}
		return Value{Text: strings.TrimSpace(t), Line: line}, nil
	case int64:
		return Value{Text: strconv.FormatInt(t, 10), Line: line}, nil
	case float64:
		return Value{Text: strconv.FormatFloat(t, 'f', -1, 64), Line: line}, nil
	case bool:
		return Value{Text: strconv.FormatBool(t), Line: line}, nil
	}
	return Value{}, &inputerr.Error{File: b.File, Line: line, Key: key, Msg: fmt.Sprintf("%s is not a name; write a string", TOMLText(v))}
}

// decodeLinks reads a Link (one block id) or LinkList (an array of ids).
func (b *Block) decodeLinks(spec InputSpec, line int, v any) (Value, *inputerr.Error) {
	bad := func(format string, args ...any) (Value, *inputerr.Error) {
		return Value{}, &inputerr.Error{File: b.File, Line: line, Key: spec.Name, Msg: fmt.Sprintf(format, args...)}
	}
	var ids []string
	switch t := v.(type) {
	case string:
		ids = []string{t}
	case []any:
		if spec.Type != LinkList {
			return bad("takes one block id, such as \"low\"; not a list")
		}
		for _, item := range t {
			s, ok := item.(string)
			if !ok {
				return bad("%s is not a block id; write a list of strings such as [\"receiver\"]", TOMLText(item))
			}
			ids = append(ids, s)
		}
	default:
		return bad("%s is not a block id; write the id of another block as a string", TOMLText(v))
	}
	for _, id := range ids {
		if !idPattern.MatchString(id) {
			return bad("%q is not a block id (lower-case letters, digits, '-' and '_')", id)
		}
	}
	if len(ids) == 0 {
		return bad("names no block")
	}
	return Value{Text: strings.Join(ids, ", "), Links: ids, Line: line}, nil
}

// decodeAcknowledge reads [acknowledge]: caution rule ids with reasons.
func (b *Block) decodeAcknowledge(v any) inputerr.List {
	table, ok := v.(map[string]any)
	if !ok {
		return inputerr.List{{File: b.File, Line: b.lineOf("acknowledge"), Key: "acknowledge",
			Msg: "must be a table: [acknowledge] with lines such as stored-energy = \"why this is accepted\""}}
	}
	var errs inputerr.List
	b.Acknowledge = map[string]string{}
	ids := b.catalog.RuleIDs()
	for _, rule := range slices.Sorted(maps.Keys(table)) {
		key := "acknowledge." + rule
		reason, isString := table[rule].(string)
		switch {
		case !slices.Contains(ids, rule):
			msg := fmt.Sprintf("unknown caution rule %q; rules: %s", rule, strings.Join(ids, ", "))
			if s := Suggest(rule, ids); s != "" {
				msg = fmt.Sprintf("unknown caution rule %q; did you mean %q?", rule, s)
			}
			errs = append(errs, &inputerr.Error{File: b.File, Line: b.lineOf(key), Key: key, Msg: msg})
		case !isString || strings.TrimSpace(reason) == "":
			errs = append(errs, &inputerr.Error{File: b.File, Line: b.lineOf(key), Key: key,
				Msg: "give the reason as a string; an acknowledgement without a reason is not accepted"})
		default:
			b.Acknowledge[rule] = strings.TrimSpace(reason)
		}
	}
	return errs
}

// LineOf is the file line of a key ("show.charts" for a key in a table).
func (b *Block) LineOf(key string) int { return b.lineOf(key) }

// lineOf is the file line of a key ("expect.displacement" for tables).
func (b *Block) lineOf(key string) int {
	byKey := func(kl keyLine, key string) int { return strings.Compare(kl.key, key) }
	if i, ok := slices.BinarySearchFunc(b.lines, key, byKey); ok {
		return b.Line + int(b.lines[i].line)
	}
	// A key written as a table (bore.x = ..., or [bore]) is on the line of
	// its first entry; the table's keys sort together.
	first := int32(0)
	i, _ := slices.BinarySearchFunc(b.lines, key+".", byKey)
	for _, kl := range b.lines[i:] {
		if !strings.HasPrefix(kl.key, key+".") {
			break
		}
		if first == 0 || kl.line < first {
			first = kl.line
		}
	}
	return b.Line + int(first)
}

// tomlError places a TOML syntax error on its file line.
func (b *Block) tomlError(err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		line := max(pe.Position.Line, 1)
		if s := pe.Position.Start; s > 0 && s <= len(b.Source) {
			line = strings.Count(b.Source[:s], "\n") + 1
		}
		msg := "TOML: " + pe.Message
		if pe.LastKey != "" && !strings.Contains(pe.Message, pe.LastKey) {
			msg = pe.LastKey + ": " + msg
		}
		return inputerr.List{{File: b.File, Line: b.Line + line, Msg: msg}}
	}
	return inputerr.List{{File: b.File, Line: b.Line, Msg: "TOML: " + err.Error()}}
}

// TOMLText shows a decoded TOML value as the user would have written it.
func TOMLText(v any) string {
	switch t := v.(type) {
	case string:
		return strconv.Quote(t)
	case []any:
		return "an array"
	case map[string]any:
		return "a table"
	case bool:
		return strconv.FormatBool(t)
	}
	return fmt.Sprint(v)
}

// takes says what an input takes, for messages.
func (b *Block) takes(in InputSpec) string {
	switch in.Type {
	case Name:
		if in.Choices != nil {
			return "one of " + strings.Join(in.Choices(b.catalog.env), ", ")
		}
		return "a name"
	case Link:
		return "the id of another block"
	case LinkList:
		return "a list of block ids"
	}
	return in.Dim.Examples()
}

func dimPhrase(d units.Dimension) string {
	return "a " + d.String() + " (" + d.Examples() + ")"
}

func firstExample(d units.Dimension) string {
	ex, _, _ := strings.Cut(d.Examples(), ",")
	return strings.TrimSpace(ex)
}
