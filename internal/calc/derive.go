package calc

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"regexp"
	"slices"
	"sort"
	"strings"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// Derivation is one line of a block's [derive] table: a result the block
// computes with an expression over its own values and other blocks'.
type Derivation struct {
	Name   string
	Source string // the expression as written
	Expr   *Expr
	Line   int
}

// pendingClaim is a claim on a derived result, read once the result's
// dimension is known.
type pendingClaim struct {
	name, text string
	line       int
}

// derivedName is what a derived result may be called.
var derivedName = regexp.MustCompile(`^[a-z][a-z0-9_]*$`)

// derivation returns the block's derivation named name.
func (b *Block) derivation(name string) (Derivation, bool) {
	i := slices.IndexFunc(b.Derive, func(d Derivation) bool { return d.Name == name })
	if i < 0 {
		return Derivation{}, false
	}
	return b.Derive[i], true
}

// valueNames lists what a block's values are called: its kind's inputs and
// results and its derived results, sorted, for "did you mean".
func (b *Block) valueNames() []string {
	names := append(b.Kind.inputNames(), b.Kind.resultNames()...)
	for _, d := range b.Derive {
		names = append(names, d.Name)
	}
	sort.Strings(names)
	return slices.Compact(names)
}

// resultNames lists the block's results: its kind's, then its derived
// ones, for messages.
func (b *Block) resultNames() []string {
	names := b.Kind.resultNames()
	for _, d := range b.Derive {
		names = append(names, d.Name)
	}
	return names
}

// decodeDerive reads [derive]: result names with their expressions.
func (b *Block) decodeDerive(v any) inputerr.List {
	table, ok := v.(map[string]any)
	if !ok {
		return inputerr.List{{File: b.File, Line: b.lineOf("derive"), Key: "derive",
			Msg: "must be a table: [derive] with lines such as total_power = \"lp.shaft_power + hp.shaft_power\""}}
	}
	var errs inputerr.List
	reserved := append(functionNames(), "pi")
	for _, name := range slices.Sorted(maps.Keys(table)) {
		key := "derive." + name
		line := b.lineOf(key)
		fail := func(format string, args ...any) {
			errs = append(errs, &inputerr.Error{File: b.File, Line: line, Key: key, Msg: fmt.Sprintf(format, args...)})
		}
		src, isString := table[name].(string)
		_, isInput := b.Kind.Input(name)
		_, isResult := b.Kind.result(name)
		switch {
		case !derivedName.MatchString(name):
			fail("%q is not allowed as a result name; allowed: lower-case letters, digits and '_', starting with a letter", name)
		case slices.Contains(reserved, name):
			fail("%s is a function or constant of expressions; choose another name (not %s or pi)", name, exprFunctionList)
		case isInput:
			fail("%s is an input of kind %s; a derived result needs a name of its own", name, b.Kind.Name)
		case isResult:
			fail("%s is a result of kind %s already; a derived result needs a name of its own", name, b.Kind.Name)
		case !isString:
			fail("%s is not an expression; write a string such as \"shaft_power / free_air_delivery\"", TOMLText(table[name]))
		default:
			x, err := ParseExpr(src)
			if err != nil {
				fail("%q: %v", src, err)
				continue
			}
			b.Derive = append(b.Derive, Derivation{Name: name, Source: src, Expr: x, Line: line})
		}
	}
	return errs
}

// checkDeriveRefs checks that every qualified name of b's expressions names
// a block of the site and a value it has.
func checkDeriveRefs(b *Block, byID map[string]*Block, ids []string) inputerr.List {
	var errs inputerr.List
	for _, d := range b.Derive {
		for _, r := range d.Expr.Refs() {
			if r.Block == "" {
				continue
			}
			fail := func(format string, args ...any) {
				errs = append(errs, &inputerr.Error{File: b.File, Line: d.Line, Key: "derive." + d.Name,
					Msg: fmt.Sprintf("%q: ", d.Source) + fmt.Sprintf(format, args...)})
			}
			target, ok := byID[r.Block]
			switch {
			case ok && target.Kind == nil:
				// A broken block: what it computes is not known.
			case !ok:
				msg := fmt.Sprintf("%s names block %q, which does not exist", r, r.Block)
				if s := Suggest(r.Block, ids); s != "" {
					msg += fmt.Sprintf("; did you mean %q?", s)
				}
				fail("%s", msg)
			case !slices.Contains(target.valueNames(), r.Name):
				msg := fmt.Sprintf("block %s (%s) has no value %q", target.ID, target.Kind.Name, r.Name)
				if s := Suggest(r.Name, target.valueNames()); s != "" {
					msg += fmt.Sprintf("; did you mean %q?", s)
				}
				fail("%s", msg)
			}
		}
	}
	return errs
}

// deriveOrder sorts a block's derivations so that each comes after those
// of the block it uses, or reports a circle among them.
func deriveOrder(b *Block) ([]Derivation, error) {
	const (
		active = iota + 1
		done
	)
	state := map[string]int{}
	var order []Derivation
	var stack []string
	var visit func(d Derivation) error
	visit = func(d Derivation) error {
		state[d.Name] = active
		stack = append(stack, d.Name)
		for _, r := range d.Expr.Refs() {
			dep, ok := b.derivation(r.Name)
			if r.Block != "" || !ok {
				continue
			}
			switch state[dep.Name] {
			case active:
				start := slices.Index(stack, dep.Name)
				circle := append(append([]string{}, stack[start:]...), dep.Name)
				return inputerr.List{{File: b.File, Line: d.Line, Key: "derive." + d.Name,
					Msg: "derived results go round in a circle: " + strings.Join(circle, " → ") + "; give one of them as a value, or compute it another way"}}
			case 0:
				if err := visit(dep); err != nil {
					return err
				}
			}
		}
		stack = stack[:len(stack)-1]
		state[d.Name] = done
		order = append(order, d)
		return nil
	}
	for _, d := range b.Derive {
		if state[d.Name] == 0 {
			if err := visit(d); err != nil {
				return nil, err
			}
		}
	}
	return order, nil
}

// derive computes a block's derived results over its evaluation base and
// checks the claims on them; it returns a new evaluation, so that blocks
// reading base meanwhile see it unchanged.
func (s *Set) derive(base *Evaluated, opts Options) (*Evaluated, error) {
	b := base.Block
	e := *base
	e.Results = slices.Clone(base.Results)
	e.Claims = slices.Clone(base.Claims)
	order, err := deriveOrder(b)
	if err != nil {
		return nil, err
	}
	for _, d := range order {
		key := "derive." + d.Name
		fail := func(msg string) error {
			return inputerr.List{{File: b.File, Line: d.Line, Key: key, Msg: fmt.Sprintf("%q: %s", d.Source, msg)}}
		}
		lookup := func(r ExprRef) (ExprValue, bool) {
			from := &e
			if r.Block != "" {
				var ok bool
				if from, ok = s.Lookup(r.Block); !ok {
					return ExprValue{}, false
				}
			}
			si, dim, unit, ok := from.Quantity(r.Name)
			return ExprValue{SI: si, Dim: dim, Unit: unit}, ok
		}
		v, trace, err := d.Expr.Eval(lookup, e.Ambient, e.customary)
		if err != nil {
			msg := err.Error()
			var xe *ExprError
			if errors.As(err, &xe) && xe.Unknown != nil {
				owner := b
				if xe.Unknown.Block != "" {
					if t, ok := s.Lookup(xe.Unknown.Block); ok {
						owner = t.Block
					}
				}
				names := owner.valueNames()
				switch {
				case slices.Contains(names, xe.Unknown.Name):
					// Declared, but not computed or given for these inputs.
					msg = fmt.Sprintf("%s: block %s has no value for %s with its inputs%s", xe.Unknown, owner.ID, xe.Unknown.Name, meaningAside(owner.Kind.resultMeaning(xe.Unknown.Name)))
				case Suggest(xe.Unknown.Name, names) != "":
					msg += fmt.Sprintf("; did you mean %q?", Suggest(xe.Unknown.Name, names))
				default:
					msg += "; names here: " + strings.Join(names, ", ")
				}
			}
			return nil, fail(msg)
		}
		if math.IsNaN(v.SI) || math.IsInf(v.SI, 0) {
			return nil, fail(fmt.Sprintf("is not a finite number (%s); check for a division by zero or the log of a value at or below zero", trace.Substituted))
		}
		e.Results = append(e.Results, Result{Name: d.Name, Value: v.SI, Dim: v.Dim, Trace: trace})
	}
	if err := checkDerivedShown(&e); err != nil {
		return nil, err
	}
	for _, c := range b.pendingClaims {
		r, _ := e.Result(c.name)
		claim, err := ParseClaim(c.name, c.text, r.Dim)
		if err != nil {
			return nil, inputerr.List{{File: b.File, Line: c.line, Key: "expect." + c.name, Msg: err.Error()}}
		}
		claim.Line = c.line
		e.Claims = append(e.Claims, claim.Check(r.Value, r.Dim, e.Ambient, opts.SigFigs))
	}
	return &e, nil
}

// checkDerivedShown checks the units [show] asks for derived results, now
// that their dimensions are known.
func checkDerivedShown(e *Evaluated) error {
	var errs inputerr.List
	for _, o := range e.Block.Show.Outputs {
		if _, derived := e.Block.derivation(o.Name); !derived || o.Unit == "" {
			continue
		}
		r, _ := e.Result(o.Name)
		if _, err := units.FromSI(1, r.Dim, o.Unit, 0); err != nil {
			errs = append(errs, &inputerr.Error{File: e.Block.File, Line: e.Block.lineOf("show.outputs"), Key: "show.outputs",
				Msg: fmt.Sprintf("%s: %v; %s is %s, shown by default in %s", o.Name, err, o.Name, dimPhrase(r.Dim), display.UnitFor(r.Dim, e.customary))})
		}
	}
	return errs.Sorted()
}
