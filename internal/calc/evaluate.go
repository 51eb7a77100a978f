package calc

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"runtime"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// Options are the site-wide settings of an evaluation.
type Options struct {
	SigFigs int // significant figures of displayed values (default 3)
	// Charted, when set, tells which blocks will have charts drawn; the
	// curves of the others are dropped as soon as no block needs them, so
	// that a big site does not hold them all. Nil keeps every curve.
	Charted func(id string) bool
	// Outcomes, when set, remembers what the kinds computed, so that a
	// block whose model sees the same inputs as before is not computed
	// again.
	Outcomes OutcomeStore
	// CurveBudget, when above zero, bounds the bytes of curves the set
	// keeps for charted blocks: past it, a block's curves are not kept but
	// sampled again when its chart is drawn. Curves that blocks linking to
	// it read are always kept.
	CurveBudget int64
}

// Set is every evaluated block of a site.
type Set struct {
	Blocks []*Evaluated // sorted by id
	byID   map[string]*Evaluated
	// early holds, while the set is evaluated, the early outcomes of the
	// blocks whose WithoutLinks results others quote.
	early map[string]*Evaluated
	opts  Options
	index setIndex
}

// Lookup returns the evaluated block with the given id.
func (s *Set) Lookup(id string) (*Evaluated, bool) {
	e, ok := s.byID[id]
	return e, ok
}

// quoted is the outcome a quote "=id.name" reads: the early one for a
// result its kind gives without links, when the block has one.
func (s *Set) quoted(v Value) *Evaluated {
	if e, ok := s.early[v.RefBlock]; ok {
		if spec, ok := e.Block.Kind.ResultSpec(v.RefResult); ok && spec.WithoutLinks {
			return e
		}
	}
	e, _ := s.Lookup(v.RefBlock)
	return e
}

// sameAsEarly checks that the results a block's kind declares WithoutLinks
// came out of the full evaluation as they did of the early one, which
// other blocks read: a kind whose such result did depend on its links
// would give two answers.
func (s *Set) sameAsEarly(e *Evaluated) error {
	first, ok := s.early[e.Block.ID]
	if !ok {
		return nil
	}
	for _, r := range first.Results {
		if full, _ := e.Result(r.Name); full.Value != r.Value {
			return fmt.Errorf("block %s: kind %s gives %s = %g without its links and %g with them; a result marked WithoutLinks must not depend on them", e.Block.ID, e.Block.Kind.Name, r.Name, r.Value, full.Value)
		}
	}
	return nil
}

// IDs lists every block id, sorted.
func (s *Set) IDs() []string {
	ids := make([]string, len(s.Blocks))
	for i, e := range s.Blocks {
		ids[i] = e.Block.ID
	}
	return ids
}

// Evaluated is one block with its inputs read, its results computed and its
// claims checked.
type Evaluated struct {
	Block    *Block
	Ambient  float64 // Pa absolute
	Inputs   []InputValue
	Results  []Result
	Claims   []ClaimResult
	Cautions []CautionNote
	Curves   []Curve
	Tables   []Table
	sigFigs  int
	in       *Inputs // what the model saw, for the caution rules
	set      *Set    // the blocks evaluated with it, for its charts
	// resample: Curves are not kept, and Chart samples them again from in,
	// keeping them until DropCurves. curvesMu guards both: charts of a
	// block may be drawn on several pages at once.
	resample bool
	curvesMu *sync.Mutex // shared by a block's evaluations with and without [derive]
	// customary: every input the block writes with a unit is in US
	// customary units, so its results show in them too.
	customary bool
}

// InputValue is one input as read: what was written, or the default.
type InputValue struct {
	Name  string
	Text  string // as written, or the default's text
	Value float64
	Dim   units.Dimension
	From  string // "=id.result" when the value came from another block
	Type  InputType
	// Default: not written by the user. Beside Type, so that the two
	// share a word: a big site keeps every block's inputs.
	Default bool
	Links   []string // the blocks a Link or LinkList input names
	// Values are the values of a List input written as a list (Value is
	// the first); nil otherwise.
	Values []float64
	// Label says what a Name input's choice stands for; Written is the
	// text as written when it named the choice another way ("nylon").
	Label, Written string
}

// linked is the view of e that a block linking to it gets.
func (e *Evaluated) linked() *Linked {
	l := &Linked{ID: e.Block.ID, Kind: e.Block.Kind.Name, Roles: e.Block.Kind.Roles, Ambient: e.Ambient,
		Results: map[string]float64{}, Inputs: map[string]float64{}, Names: map[string]string{}, Curves: e.Curves}
	for _, r := range e.Results {
		l.Results[r.Name] = r.Value
	}
	for _, in := range e.Inputs {
		switch {
		case in.Type == Quantity && in.Values == nil:
			l.Inputs[in.Name] = in.Value
		case in.Type == Name:
			l.Names[in.Name] = in.Text
		}
	}
	l.Model = e.in
	return l
}

// Result returns the result named name.
func (e *Evaluated) Result(name string) (Result, bool) {
	for _, r := range e.Results {
		if r.Name == name {
			return r, true
		}
	}
	return Result{}, false
}

// Release drops what only charts need (the curves, and the inputs charts
// are drawn from), for a block that draws none: a big site keeps less.
func (e *Evaluated) Release() {
	e.Curves = nil
	e.in = nil
}

// DropCurves drops the block's curves once its charts are drawn; a chart
// drawn again samples them anew. It must not run while a chart of the
// block is being drawn.
func (e *Evaluated) DropCurves() {
	e.curvesMu.Lock()
	defer e.curvesMu.Unlock()
	if e.in != nil && e.Curves != nil {
		e.Curves, e.resample = nil, true
	}
}

// ModelInputs is what the model saw (nil once released), for the caution
// rules.
func (e *Evaluated) ModelInputs() *Inputs { return e.in }

// SigFigs is the number of significant figures the block's values show.
func (e *Evaluated) SigFigs() int { return e.sigFigs }

// Failed reports whether any claim of the block fails.
func (e *Evaluated) Failed() bool {
	for _, c := range e.Claims {
		if !c.OK {
			return true
		}
	}
	return false
}

// Customary reports whether the block is written wholly in US customary
// units, and so shows its results in them.
func (e *Evaluated) Customary() bool { return e.customary }

// HoldsVacuum reports whether the block works below ambient: its kind
// holds vacuum, or the working pressure it is given is below its ambient
// (a tube pumped down).
func (e *Evaluated) HoldsVacuum() bool {
	if e.Block.Kind.Has(HoldsVacuum) {
		return true
	}
	key := e.Block.Kind.WorkingPressure.Key
	for _, in := range e.Inputs {
		if key != "" && in.Name == key {
			return in.Value < e.Ambient
		}
	}
	return false
}

// Evaluate checks every block of a site together (ids unique, references
// known and acyclic), then evaluates them in dependency order. It goes on
// past a problem as far as the rest does not depend on it: a block with a
// broken reference, in a circle or Broken is not evaluated, nor is any
// block that needs it, and every other block is. The error lists every
// problem found; the set holds the blocks that were evaluated.
func (c *Catalog) Evaluate(blocks []*Block, opts Options) (*Set, error) {
	if opts.SigFigs == 0 {
		opts.SigFigs = 3
	}
	set := &Set{byID: map[string]*Evaluated{}, opts: opts}
	var errs inputerr.List
	byID := map[string]*Block{}
	for _, b := range blocks {
		if other, dup := byID[b.ID]; dup {
			errs = append(errs, &inputerr.Error{File: b.File, Line: b.lineOf("id"), Key: "id",
				Msg: fmt.Sprintf("%q is already used by the block at %s:%d; ids are unique in the site", b.ID, other.File, other.lineOf("id"))})
			continue
		}
		byID[b.ID] = b
	}
	ids := make([]string, 0, len(byID))
	for id := range byID {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	planned := map[string]*Block{}
	for _, id := range ids {
		b := byID[id]
		if b.Kind == nil {
			continue // broken before its kind was known: nothing to check
		}
		refErrs := append(c.checkRefs(b, byID, ids), checkDeriveRefs(b, byID, ids)...)
		if len(refErrs) > 0 {
			errs = append(errs, refErrs...)
			continue
		}
		planned[id] = b
	}
	pl := plannable(planned, &errs)
	linked := map[string]bool{}
	for _, b := range planned {
		for _, v := range b.Values {
			for _, dep := range v.Deps() {
				linked[dep] = true
			}
		}
	}
	set.early = map[string]*Evaluated{}
	failed := map[string]bool{}
	var keptCurves atomic.Int64 // bytes of the charted blocks' curves kept
	for _, level := range pl.levels {
		type outcome struct {
			e   *Evaluated
			err error
		}
		outs := make([]outcome, len(level))
		var run []int
		for i, st := range level {
			if failed[st.id] || slices.ContainsFunc(pl.deps(st), func(d dependency) bool { return failed[d.id] }) {
				failed[st.id] = true
				continue
			}
			run = append(run, i)
		}
		Parallel(len(run), func(j int) {
			i := run[j]
			st := level[i]
			b := byID[st.id]
			switch st.phase {
			case early:
				outs[i].e, outs[i].err = c.evaluateBlock(b, set, opts, false, true)
				return
			case derived:
				base, _ := set.Lookup(b.ID)
				outs[i].e, outs[i].err = set.derive(base, opts)
				return
			}
			charted := opts.Charted == nil || opts.Charted(b.ID)
			overBudget := opts.CurveBudget > 0 && keptCurves.Load() >= opts.CurveBudget
			want := linked[b.ID] || (charted && !overBudget && !b.Kind.CurvesOnDemand)
			outs[i].e, outs[i].err = c.evaluateBlock(b, set, opts, want, false)
			switch {
			case outs[i].err != nil:
			case !want:
				// Drop curves at once: a level can hold thousands of blocks.
				outs[i].e.Curves = nil
				outs[i].e.resample = charted
			case !linked[b.ID]:
				keptCurves.Add(curveBytes(outs[i].e.Curves))
			}
		})
		for _, i := range run {
			st, o := level[i], outs[i]
			b := byID[st.id]
			if errors.Is(o.err, errBroken) {
				failed[b.ID] = true
				continue
			}
			if o.err != nil {
				var list inputerr.List
				if errors.As(o.err, &list) {
					errs = append(errs, list...)
				} else {
					errs = append(errs, &inputerr.Error{File: b.File, Line: b.Line, Msg: o.err.Error()})
				}
				failed[b.ID] = true
				continue
			}
			if st.phase == early {
				set.early[b.ID] = o.e
				continue
			}
			set.byID[b.ID] = o.e
		}
	}
	set.early = nil
	for _, id := range ids {
		// A block whose later step failed (its [derive]) is incomplete.
		if failed[id] {
			delete(set.byID, id)
		}
		if e, ok := set.byID[id]; ok {
			e.set = set
			set.Blocks = append(set.Blocks, e)
		}
	}
	c.applyRules(set)
	if err := errs.Sorted(); err != nil {
		return set, err
	}
	return set, nil
}

// errBroken is what evaluating a Broken block gives once its inputs read
// without error: it fails without a problem of its own.
var errBroken = errors.New("block not evaluated: it has problems of its own")

// plannable orders the planned blocks for evaluation. A block that needs
// one left out is left out too, with no problem of its own; a circle of
// references is added to errs and its blocks left out.
func plannable(planned map[string]*Block, errs *inputerr.List) *plan {
	for {
		// What needs a block left out is left out, until nothing changes.
		for changed := true; changed; {
			changed = false
			for id, b := range planned {
				if slices.ContainsFunc(b.needs(), func(d string) bool { return planned[d] == nil }) {
					delete(planned, id)
					changed = true
				}
			}
		}
		ids := slices.Sorted(maps.Keys(planned))
		pl, circle, err := makePlan(planned, ids)
		if err == nil {
			return pl
		}
		*errs = append(*errs, inputerr.From(err)...)
		for _, id := range circle {
			delete(planned, id)
		}
	}
}

// needs lists the blocks b reads values of: those its inputs quote or
// link to, and those its [derive] expressions name.
func (b *Block) needs() []string {
	var ids []string
	for _, v := range b.Values {
		ids = append(ids, v.Deps()...)
	}
	for _, d := range b.Derive {
		for _, r := range d.Expr.Refs() {
			if r.Block != "" {
				ids = append(ids, r.Block)
			}
		}
	}
	return ids
}

// linkCandidates are the blocks a key of b could name: any other block, of
// the kinds the input takes if it says.
func linkCandidates(b *Block, in InputSpec, byID map[string]*Block, ids []string) []string {
	var out []string
	for _, id := range ids {
		if t := byID[id]; t != b && in.Accepts(t.Kind) {
			out = append(out, id)
		}
	}
	return out
}

// checkRefs checks that every "=id.result" of b names a block and one of
// its results, of the input's dimension.
func (c *Catalog) checkRefs(b *Block, byID map[string]*Block, ids []string) inputerr.List {
	var errs inputerr.List
	for _, v := range b.Values {
		key := v.Key
		fail := func(msg string) { errs = append(errs, &inputerr.Error{File: b.File, Line: v.Line, Key: key, Msg: msg}) }
		if len(v.Links) > 0 {
			in, _ := b.Kind.Input(key)
			for _, id := range v.Links {
				target, ok := byID[id]
				switch {
				case ok && target.Kind == nil:
					// A broken block: what it is, is not known.
				case !ok:
					msg := fmt.Sprintf("names block %q, which does not exist", id)
					if s := Suggest(id, linkCandidates(b, in, byID, ids)); s != "" {
						msg += fmt.Sprintf("; did you mean %q?", s)
					}
					fail(msg)
				case target == b:
					fail(fmt.Sprintf("names its own block %q", id))
				case !in.Accepts(target.Kind):
					msg := fmt.Sprintf("block %q is a %s; %s takes a %s block", id, target.Kind.Name, key, strings.Join(c.KindsAccepted(in), " or "))
					if target.Kind.LinkHint != "" {
						msg += " (" + target.Kind.LinkHint + ")"
					}
					fail(msg)
				}
			}
			continue
		}
		if v.RefBlock == "" {
			continue
		}
		target, ok := byID[v.RefBlock]
		if !ok {
			msg := fmt.Sprintf("%q refers to block %q, which does not exist", v.Text, v.RefBlock)
			if s := Suggest(v.RefBlock, linkCandidates(b, InputSpec{}, byID, ids)); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			}
			fail(msg)
			continue
		}
		if target == b {
			fail(fmt.Sprintf("%q refers to its own block", v.Text))
			continue
		}
		if target.Kind == nil {
			continue // a broken block: its results are not known
		}
		if _, derived := target.derivation(v.RefResult); derived {
			continue // its dimension is checked when it is read
		}
		spec, ok := target.Kind.result(v.RefResult)
		if inSpec, isInput := target.Kind.Input(v.RefResult); !ok && isInput {
			if inSpec.Type != Quantity {
				fail(fmt.Sprintf("%q: %s is a %s input of block %s, not a quantity", v.Text, v.RefResult, "name or link", target.ID))
				continue
			}
			spec, ok = ResultSpec{Name: inSpec.Name, Dim: inSpec.Dim}, true
		}
		if !ok {
			msg := fmt.Sprintf("%q: block %s (%s) has no result %q", v.Text, target.ID, target.Kind.Name, v.RefResult)
			if s := Suggest(v.RefResult, target.Kind.resultNames()); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			}
			fail(msg)
			continue
		}
		in, _ := b.Kind.Input(key)
		if in.Dim != anyDimension && spec.Dim != in.Dim {
			fail(fmt.Sprintf("%q is %s; %s takes %s", v.Text, dimPhrase(spec.Dim), key, dimPhrase(in.Dim)))
		}
	}
	return errs
}

// Parallel runs f(0..n-1) on all cores and returns when all are done.
func Parallel(n int, f func(i int)) {
	workers := min(runtime.GOMAXPROCS(0), n)
	// Each worker takes the next index from a counter: no goroutine hands
	// them out, and none waits on another between items.
	var next atomic.Int64
	work := func() {
		for i := int(next.Add(1) - 1); i < n; i = int(next.Add(1) - 1) {
			f(i)
		}
	}
	var wg sync.WaitGroup
	for range workers - 1 {
		wg.Go(work)
	}
	work()
	wg.Wait()
}

// evaluateBlock reads a block's inputs (references from set), runs its
// model and checks its claims.
// evaluateBlock reads a block's inputs and runs its model; early runs it
// without the block's links, for the results marked WithoutLinks only.
func (c *Catalog) evaluateBlock(b *Block, set *Set, opts Options, wantCurves, early bool) (*Evaluated, error) {
	e := &Evaluated{Block: b, Ambient: DefaultAmbient, sigFigs: opts.SigFigs, curvesMu: new(sync.Mutex)}
	var errs inputerr.List
	fail := func(key string, line int, msg string) {
		errs = append(errs, &inputerr.Error{File: b.File, Line: line, Key: key, Msg: msg})
	}
	if b.Ambient.Text != "" {
		q, err := units.Parse(b.Ambient.Text, units.Pressure)
		switch {
		case err != nil:
			fail("ambient_pressure", b.Ambient.Line, err.Error())
		case q.Unit.Ref != units.Absolute && q.Unit.Ref != units.Unsettled:
			fail("ambient_pressure", b.Ambient.Line, fmt.Sprintf("%q must be an absolute pressure, e.g. \"1 atm\", \"101.3 kPa(a)\", \"1013 hPa\", \"14.7 psia\"", b.Ambient.Text))
		case q.Value < 1e3 || q.Value > 2e5:
			fail("ambient_pressure", b.Ambient.Line, fmt.Sprintf("%q is not an atmosphere a workshop sees; allowed: 10 kPa(a) to 200 kPa(a)", b.Ambient.Text))
		default:
			e.Ambient = q.Value
		}
	}
	in := &Inputs{Ambient: e.Ambient, values: map[string]float64{}, lists: map[string][]float64{}, given: map[string]bool{},
		names: map[string]string{}, links: map[string][]*Linked{}, env: c.env, noCurves: !wantCurves, linksWithheld: early}
	// At most one input a spec; cut to size below, as a big site keeps
	// every block's.
	e.Inputs = make([]InputValue, 0, len(b.Kind.Inputs))
	systems := map[units.UnitSystem]int{} // of the units the block is written in
	linkedSystems := map[bool]int{}       // of the blocks it links to, by Customary
	for _, spec := range b.Kind.Inputs {
		v, given := b.Value(spec.Name)
		switch spec.Type {
		case Name:
			if !given && (spec.Default == "" || !defaultApplies(spec, b)) {
				continue
			}
			text, line := spec.Default, b.Line
			if given {
				text, line = v.Text, v.Line
			}
			written := text
			if spec.Choices != nil {
				choices := spec.Choices(c.env)
				if resolved, ok := resolveChoice(spec, c.env, text); ok {
					text = resolved
				}
				if !contains(choices, text) {
					msg := fmt.Sprintf("%q is not known; allowed: %s", text, strings.Join(choices, ", "))
					suggest := Suggest(text, choices)
					if spec.Suggest != nil {
						suggest = spec.Suggest(c.env, text)
					}
					if s := suggest; s != "" {
						msg = fmt.Sprintf("%q is not known; did you mean %q? (allowed: %s)", text, s, strings.Join(choices, ", "))
					}
					fail(spec.Name, line, msg)
					continue
				}
			}
			in.SetName(spec.Name, text, given)
			iv := InputValue{Name: spec.Name, Text: text, Default: !given, Type: Name}
			if written != text {
				iv.Written = written
			}
			if spec.Label != nil {
				iv.Label = spec.Label(c.env, text)
			}
			e.Inputs = append(e.Inputs, iv)
			continue
		case Link, LinkList:
			if !given || early {
				continue
			}
			var linked []*Linked
			for _, id := range v.Links {
				src, _ := set.Lookup(id)
				linked = append(linked, src.linked())
				linkedSystems[src.customary]++
			}
			in.SetLinks(spec.Name, linked)
			e.Inputs = append(e.Inputs, InputValue{Name: spec.Name, Text: v.Text, Type: spec.Type, Links: v.Links})
			continue
		}
		if given && len(v.Items) > 0 {
			vs, ok := readList(spec, v, e.Ambient, opts.SigFigs, systems, fail)
			if ok {
				e.Inputs = append(e.Inputs, InputValue{Name: spec.Name, Text: v.Text, Value: vs[0], Values: vs, Dim: spec.Dim})
				in.SetList(spec.Name, vs)
			}
			continue
		}
		text := spec.Default
		line := b.Line
		if given {
			text, line = v.Text, v.Line
		} else if text == "" {
			continue
		}
		iv := InputValue{Name: spec.Name, Text: text, Dim: spec.Dim, Default: !given}
		var value float64
		var shownUnit string
		if given && v.RefBlock != "" {
			src := set.quoted(v)
			si, dim, unit, found := src.Quantity(v.RefResult)
			if !found {
				fail(spec.Name, line, fmt.Sprintf("%q: block %s has no value for %s (an optional input it leaves out)", v.Text, v.RefBlock, v.RefResult))
				continue
			}
			if spec.Dim == anyDimension {
				iv.Dim = dim
			} else if dim != spec.Dim {
				// Only a derived value's dimension is first known here.
				fail(spec.Name, line, fmt.Sprintf("%q is %s; %s takes %s", v.Text, dimPhrase(dim), spec.Name, dimPhrase(spec.Dim)))
				continue
			}
			value = si
			iv.From = v.Text
			shown, err := src.Format(v.RefResult, "")
			if err == nil {
				iv.Text = shown
			}
			shownUnit = unit
		} else {
			q, err := units.Parse(text, spec.Dim)
			if err != nil {
				fail(spec.Name, line, err.Error())
				continue
			}
			if msg := pressureReadingProblem(spec, q, e.Ambient); msg != "" {
				fail(spec.Name, line, msg)
				continue
			}
			value = q.Absolute(e.Ambient)
			if spec.Absolute && q.Unit.Ref == units.Unsettled {
				value = q.Value
			}
			shownUnit = q.Unit.Symbol
			if given {
				systems[units.SystemOf(q.Unit.Symbol)]++
			}
		}
		if !spec.Range.Contains(value) {
			fail(spec.Name, line, fmt.Sprintf("%q is out of range; allowed: %s", iv.Text, describeRange(spec, shownUnit, e.Ambient, opts.SigFigs)))
			continue
		}
		iv.Value = value
		e.Inputs = append(e.Inputs, iv)
		in.Set(spec.Name, value, given)
	}
	if err := errs.Sorted(); err != nil {
		return nil, err
	}
	if b.Broken {
		return nil, errBroken
	}
	switch {
	case len(e.Inputs) == 0:
		e.Inputs = nil
	case len(e.Inputs) < cap(e.Inputs):
		e.Inputs = slices.Clone(e.Inputs)
	}
	e.customary = systems[units.Customary] > 0 && systems[units.Metric] == 0
	if systems[units.Customary]+systems[units.Metric] == 0 {
		// A block that writes no unit (a machine listing its stages) reads
		// in the units of the blocks it links to, when they agree.
		e.customary = linkedSystems[true] > 0 && linkedSystems[false] == 0
	}
	in.customary = e.customary
	out, err := runModel(b, in, opts.Outcomes)
	if err != nil {
		var ie *InputError
		if errors.As(err, &ie) {
			line := b.Line
			if v, ok := b.Value(ie.Key); ok {
				line = v.Line
			}
			return nil, inputerr.List{{File: b.File, Line: line, Key: ie.Key, Msg: ie.Message}}
		}
		return nil, inputerr.List{{File: b.File, Line: b.Line, Msg: fmt.Sprintf("block %s: %v", b.ID, err)}}
	}
	if bad := nonFinite(out); bad != "" {
		return nil, inputerr.List{{File: b.File, Line: b.Line, Msg: fmt.Sprintf("block %s: %s is not a finite number with the inputs %s; check that they describe a real machine", b.ID, bad, givenInputs(e.Inputs))}}
	}
	for _, c := range out.Cautions {
		// A caution outside the rule table could be neither explained nor
		// acknowledged.
		if !slices.Contains(b.Kind.Raises, c.Rule) {
			return nil, fmt.Errorf("block %s: kind %s raised caution %q, which it does not list in Raises", b.ID, b.Kind.Name, c.Rule)
		}
	}
	if early {
		e.Results = nil
		for _, r := range out.Results {
			if spec, ok := b.Kind.ResultSpec(r.Name); ok && spec.WithoutLinks {
				e.Results = append(e.Results, r)
			}
		}
		return e, nil
	}
	// The outcome may be a memo other blocks share: what the set adds
	// (cautions the rules raise, their acknowledgements) goes to copies.
	e.Results, e.Curves, e.Tables = slices.Clip(out.Results), slices.Clip(out.Curves), slices.Clip(out.Tables)
	e.Cautions = slices.Clone(out.Cautions)
	e.in = in
	if err := set.sameAsEarly(e); err != nil {
		return nil, err
	}
	for _, c := range b.Expect {
		r, ok := e.Result(c.Result)
		if !ok {
			return nil, inputerr.List{{File: b.File, Line: c.Line, Key: "expect." + c.Result, Msg: "the block computes no " + c.Result + " with these inputs" + meaningAside(b.Kind.resultMeaning(c.Result))}}
		}
		fail := func(msg string) error {
			return inputerr.List{{File: b.File, Line: c.Line, Key: "expect." + c.Result, Msg: msg}}
		}
		if why := c.MarkFor(r.Value, r.Dim, e.Ambient, b.Kind.Has(HoldsVacuum), opts.SigFigs); why != "" {
			return nil, fail(why)
		}
		si, err := e.siIn(r, c.Unit)
		if err != nil {
			return nil, fail(fmt.Sprintf("%q: %v", c.Text, err))
		}
		e.Claims = append(e.Claims, c.Check(si, r.Dim, e.Ambient, opts.SigFigs))
	}
	if err := checkShownComputed(e); err != nil {
		return nil, err
	}
	return e, nil
}

// readList parses the items of a List input written as a list, each in
// range, counting the unit systems they are written in.
func readList(spec InputSpec, v Value, ambient float64, sigFigs int, systems map[units.UnitSystem]int, fail func(key string, line int, msg string)) ([]float64, bool) {
	vs := make([]float64, 0, len(v.Items))
	for _, item := range v.Items {
		q, err := units.Parse(item, spec.Dim)
		if err != nil {
			fail(spec.Name, v.Line, err.Error())
			return nil, false
		}
		value := q.Absolute(ambient)
		if !spec.Range.Contains(value) {
			fail(spec.Name, v.Line, fmt.Sprintf("%q is out of range; allowed: %s", item, describeRange(spec, q.Unit.Symbol, ambient, sigFigs)))
			return nil, false
		}
		systems[units.SystemOf(q.Unit.Symbol)]++
		vs = append(vs, value)
	}
	return vs, true
}

// checkShownComputed checks that every result [show] outputs names was
// computed: a kind declares some results only for some inputs (a tank's
// hoop_stress needs its wall), and the table would silently leave it out.
func checkShownComputed(e *Evaluated) inputerr.List {
	b := e.Block
	var errs inputerr.List
	for _, o := range b.Show.Outputs {
		r, found := e.Result(o.Name)
		if found {
			if _, err := e.siIn(r, o.Unit); err != nil {
				errs = append(errs, &inputerr.Error{File: b.File, Line: b.LineOf("show.outputs"), Key: "show.outputs",
					Msg: fmt.Sprintf("%q: %v", o.Name+" "+o.Unit, err)})
			}
		}
		if _, derived := b.derivation(o.Name); found || derived {
			continue
		}
		written := o.Name
		if o.Unit != "" {
			written += " " + o.Unit
		}
		names := make([]string, len(e.Results))
		for i, r := range e.Results {
			names[i] = r.Name
		}
		errs = append(errs, &inputerr.Error{File: b.File, Line: b.LineOf("show.outputs"), Key: "show.outputs",
			Msg: fmt.Sprintf("%q: block %s computes no %s with its inputs%s; it computes %s",
				written, b.ID, o.Name, meaningAside(b.Kind.resultMeaning(o.Name)), strings.Join(names, ", "))})
	}
	return errs
}

// describeRange words an input's allowed range in the unit the user wrote;
// a pressure's range is on its absolute value, so it is worded absolute.
func describeRange(spec InputSpec, unit string, ambient float64, sig int) string {
	if spec.Dim == units.Pressure {
		unit = display.AbsoluteUnit(unit)
	}
	show := func(v float64) string {
		if unit == "" || spec.Dim == units.Dimensionless {
			if v == math.Trunc(v) && math.Abs(v) < 1e9 {
				return strconv.FormatFloat(v, 'f', -1, 64)
			}
			return units.Format(v, sig)
		}
		s, err := display.Value(v, spec.Dim, unit, ambient, sig)
		if err != nil {
			return units.Format(v, sig)
		}
		return trimBound(s)
	}
	r := spec.Range
	var parts []string
	if r.HasMin {
		op := ">="
		if r.MinOpen {
			op = ">"
		}
		parts = append(parts, op+" "+show(r.Min))
	}
	if r.HasMax {
		op := "<="
		if r.MaxOpen {
			op = "<"
		}
		parts = append(parts, op+" "+show(r.Max))
	}
	if len(parts) == 0 {
		return "a finite value"
	}
	return strings.Join(parts, " and ")
}

// nonFinite names the first result, curve or table of out that holds a NaN
// or an infinity, or returns "".
func nonFinite(out *Outcome) string {
	finite := func(vs ...float64) bool {
		for _, v := range vs {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return false
			}
		}
		return true
	}
	for _, r := range out.Results {
		if !finite(r.Value) {
			return "result " + r.Name
		}
	}
	for _, c := range out.Curves {
		if !finite(c.X...) || !finite(c.Y...) {
			return "a point of its " + c.Name + " curve"
		}
	}
	for _, t := range out.Tables {
		if !finite(t.XS...) || !finite(t.YS...) {
			return "a point of its table " + strconv.Quote(t.Title)
		}
	}
	return ""
}

// givenInputs lists the inputs a block wrote (not the defaults) as
// name = "text", for messages that blame their combination.
func givenInputs(in []InputValue) string {
	var parts []string
	for _, v := range in {
		if !v.Default {
			parts = append(parts, fmt.Sprintf("%s = %q", v.Name, v.Text))
		}
	}
	if len(parts) == 0 {
		return "(all defaults)"
	}
	return strings.Join(parts, ", ")
}

// resolveChoice maps text to one of spec's choices through spec.Resolve.
func resolveChoice(spec InputSpec, env any, text string) (string, bool) {
	if spec.Resolve == nil {
		return "", false
	}
	return spec.Resolve(env, text)
}

// defaultApplies reports whether spec's default holds in block b: always,
// unless it depends on an input b leaves out.
func defaultApplies(spec InputSpec, b *Block) bool {
	if spec.DefaultWith == "" {
		return true
	}
	_, given := b.Value(spec.DefaultWith)
	return given
}

// meaningAside puts a result's meaning in brackets, or nothing without one.
func meaningAside(meaning string) string {
	if meaning == "" {
		return ""
	}
	return " (" + meaning + ")"
}

// trimBound drops the trailing zeros significant figures add to a range's
// bound ("0.0000100 bar(a)" is "0.00001 bar(a)"): a bound is exact.
func trimBound(s string) string {
	num, unit, _ := strings.Cut(s, " ")
	if !strings.Contains(num, ".") || strings.ContainsAny(num, "eE") {
		return s
	}
	num = strings.TrimSuffix(strings.TrimRight(num, "0"), ".")
	if unit == "" {
		return num
	}
	return num + " " + unit
}

// curveBytes is the memory the samples of curves take.
func curveBytes(curves []Curve) int64 {
	var n int
	for _, c := range curves {
		n += cap(c.X) + cap(c.Y)
	}
	return int64(n) * 8
}
