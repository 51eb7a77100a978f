package calc

import (
	"fmt"
	"maps"
	"math"
	"sort"

	"github.com/millrace-workshop/specgen/internal/units"
)

// Kind is one engineering model: the inputs it takes, the results it gives
// and the function that turns one into the other.
type Kind struct {
	Name    string // the block's `kind` value
	Summary string // one line, for `specgen explain`
	Doc     string // the model written out: assumptions and formulas
	Inputs  []InputSpec
	Results []ResultSpec
	Charts  []string  // chart names a block may ask for in [show] charts
	Chart   ChartFunc // draws them
	// Roles say what the kind's blocks are, for the caution rules, the
	// links of other kinds and the site.
	Roles Role
	// WorkingPressure is the input holding the pressure the part works at,
	// which a relief valve protecting it must stay shut at; "" for none.
	WorkingPressure WorkingPressure
	// Raises lists the caution rules the model raises itself while it
	// evaluates (each a row of the rule table).
	Raises []string
	// FreeInputs lets a block give any key as an input, its dimension read
	// from the value written: a kind of figures with no model of its own.
	FreeInputs bool
	// LinkHint is added to the message when a block names one of this
	// kind where a link takes another: what to name instead.
	LinkHint string
	// CurvesOnDemand: the kind works out the points of its charts alone,
	// and cheaply, when run with Inputs.CurvesOnly. Its charted blocks are
	// then evaluated without curves, which are neither kept nor stored
	// between builds, and sampled when a chart is drawn.
	CurvesOnDemand bool
	// Evaluate computes the results from validated inputs. Input problems
	// that single-input ranges cannot catch are returned as *InputError.
	Evaluate func(in *Inputs) (*Outcome, error)
}

// Role is something a kind's blocks are, that rules and links ask about
// instead of kind names.
type Role uint

// The roles.
const (
	// HoldsPressure: a pressure calculation; its page carries the standard
	// compressed-air caution.
	HoldsPressure Role = 1 << iota
	// HoldsVacuum: works below ambient; a page whose pressure blocks all
	// hold vacuum carries the vacuum caution instead.
	HoldsVacuum
	// Delivers: a compressor stage's cylinders that deliver air into what
	// they fill and can dead-head (max_pressure) with the outlet blocked.
	Delivers
	// Crank: a slider crank turning at a speed, with torque over the
	// revolution: what a flywheel or counterweight sits on.
	Crank
	// PressurePart: a part rated for a pressure (allowable_pressure).
	PressurePart
	// Receiver: a vessel filled from the block its supply input names up to
	// its working pressure.
	Receiver
	// Relieves: a relief valve venting to ambient: it opens at ambient plus
	// its cracking_pressure and relieves the blocks its protects input names.
	Relieves
	// Wall: a wall or lid that carries a pressure difference: the
	// vacuum-vessel caution names it. One without a working pressure (a
	// lid given only the difference across it) holds neither compressed
	// air nor vacuum of its own.
	Wall
)

// Has reports whether the kind plays every role in r.
func (k *Kind) Has(r Role) bool { return k.Roles&r == r }

// Accepts reports whether a Link or LinkList input may name a block of
// kind k.
func (in InputSpec) Accepts(k *Kind) bool {
	if in.LinkAll {
		return k.Has(in.LinkRoles)
	}
	return in.LinkRoles == 0 || k.Roles&in.LinkRoles != 0
}

// WorkingPressure names a kind's working-pressure input and how messages
// call it ("target pressure").
type WorkingPressure struct {
	Key, Name string
}

// InputType is what an input's value is.
type InputType uint8

// The input types.
const (
	Quantity InputType = iota // "32 mm", a plain number, or "=id.result"
	Name                      // a name from a list: a material, a thread size
	Link                      // the id of another block: supply = "low"
	LinkList                  // a list of block ids: protects = ["receiver", "wall"]
)

// InputSpec describes one input key of a kind.
type InputSpec struct {
	Name    string
	Type    InputType
	Dim     units.Dimension // for Quantity inputs
	Default string          // as the user would write it; "" means required unless Optional
	// DefaultWith names the input without which Default does not apply
	// (a tank's closed_ends means nothing without its wall's material).
	DefaultWith string
	// Optional inputs may be left out; the model decides what their absence
	// means (one of two alternatives, say).
	Optional bool
	Range    Range
	Meaning  string // one line
	// Absolute asks for an absolute pressure (a vacuum target): written
	// absolute ("20 mbar(a)", "torr", plain "hPa") or as an explicit gauge
	// or vacuum reading ("-900 mbar(g)", "27 inHg vac"), which the block's
	// ambient converts; a plain unit, which reads gauge, is refused there
	// as a likely slip.
	Absolute bool
	// BelowAmbient marks a pressure input that is below ambient in every
	// use (a vacuum), where a bare inHg or mmHg could be meant absolute or
	// as a vacuum gauge reads it, and so is refused. Absolute implies it.
	BelowAmbient bool
	// List lets a Quantity input take a list of values as well as one
	// value (a temperature for every intercooler, or one for each); the
	// model reads them with ValuesOf.
	List bool
	// LinkRoles are the roles of the blocks a Link or LinkList input may
	// name, any one of them (every one with LinkAll); zero allows any block.
	LinkRoles Role
	LinkAll   bool
	// Choices lists the values a Name input allows (for messages and
	// checks); nil allows any non-empty name the model checks itself.
	Choices func(env any) []string
	// Resolve maps another way of writing a choice (other case, an alias
	// such as "nylon" for "pa12") to the choice; nil accepts choices only.
	Resolve func(env any, text string) (string, bool)
	// Label says what a choice stands for, for people ("Mild steel S235"
	// for "s235"); nil when the choice says it itself.
	Label func(env any, choice string) string
	// Suggest proposes a choice for text that is none ("" for none); nil
	// proposes the nearest by spelling.
	Suggest func(env any, text string) string
}

// Range bounds an input's SI value. A zero Range allows every finite value.
type Range struct {
	Min, Max         float64
	HasMin, HasMax   bool
	MinOpen, MaxOpen bool // the bound itself is excluded
}

// Positive allows values above zero.
var Positive = Range{Min: 0, HasMin: true, MinOpen: true}

// NonNegative allows zero and values above it.
var NonNegative = Range{Min: 0, HasMin: true}

// Between allows min <= v <= max.
func Between(min, max float64) Range {
	return Range{Min: min, Max: max, HasMin: true, HasMax: true}
}

// Contains reports whether v lies in the range.
func (r Range) Contains(v float64) bool {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return false
	}
	if r.HasMin && (v < r.Min || (r.MinOpen && v == r.Min)) {
		return false
	}
	if r.HasMax && (v > r.Max || (r.MaxOpen && v == r.Max)) {
		return false
	}
	return true
}

// ResultSpec describes one result of a kind.
type ResultSpec struct {
	Name    string
	Dim     units.Dimension
	Unit    string // default display unit
	Meaning string
	// Factor marks a safety factor, checked against the site's minimum.
	// FactorMaterial names the Name input holding the part's material;
	// "" means a ductile metal (steel bolts).
	Factor         bool
	FactorMaterial string
	// WithoutLinks marks a result the model computes from the block's own
	// inputs alone, without the blocks its Link inputs name: another block
	// may quote it even where the block links back to that one (a drive's
	// crank speed, quoted by the stage it drives, whose power the drive
	// reads). The model gives these when Inputs.LinksWithheld.
	WithoutLinks bool
}

// Inputs holds a block's validated input values in SI units, pressures
// absolute, with defaults filled in.
type Inputs struct {
	Ambient float64 // ambient pressure, Pa absolute
	values  map[string]float64
	lists   map[string][]float64 // List inputs given as a list
	given   map[string]bool
	names   map[string]string
	links   map[string][]*Linked
	env     any
	// noCurves tells the model that nothing will draw or read its curves.
	noCurves bool
	// curvesOnly: a chart's second run of the model, of which only the
	// curves are read.
	curvesOnly bool
	// customary: the block is written in US customary units.
	customary bool
	// linksWithheld: an early evaluation, with no Link inputs, for the
	// results marked WithoutLinks.
	linksWithheld bool
}

// LinksWithheld reports an early evaluation: the block's Link inputs are
// not given, and only the results marked WithoutLinks are wanted.
func (in *Inputs) LinksWithheld() bool { return in.linksWithheld }

// NewInputs returns inputs with no values yet, at an ambient pressure (Pa
// absolute) in the site settings env, for evaluating a kind directly.
func NewInputs(ambient float64, env any) *Inputs {
	return &Inputs{Ambient: ambient, values: map[string]float64{}, lists: map[string][]float64{}, given: map[string]bool{},
		names: map[string]string{}, links: map[string][]*Linked{}, env: env}
}

// Customary reports whether the block is written in US customary units,
// for a model that lays out tables in round numbers of them.
func (in *Inputs) Customary() bool { return in.customary }

// sampling is a copy of in for running the model again for its curves
// alone; the model may write to its own copy.
func (in *Inputs) sampling() *Inputs {
	cp := *in
	cp.values, cp.lists, cp.given = maps.Clone(in.values), maps.Clone(in.lists), maps.Clone(in.given)
	cp.names, cp.links = maps.Clone(in.names), maps.Clone(in.links)
	cp.noCurves, cp.curvesOnly = false, true
	return &cp
}

// CurvesOnly reports a run of the model for a chart whose curves were not
// kept: only the outcome's Curves are read, and they must come out as the
// first run's would have, so a model may skip its results to get them.
func (in *Inputs) CurvesOnly() bool { return in.curvesOnly }

// WantCurves reports whether the block's curves are used (by its charts or
// by a block that links to it); a model may skip sampling them otherwise.
func (in *Inputs) WantCurves() bool { return !in.noCurves }

// SetName stores a Name input.
func (in *Inputs) SetName(key, value string, given bool) {
	in.names[key] = value
	in.given[key] = given
}

// SetLinks stores the blocks a Link or LinkList input names.
func (in *Inputs) SetLinks(key string, linked []*Linked) {
	in.links[key] = linked
	in.given[key] = true
}

// NameOf returns a Name input ("" when absent).
func (in *Inputs) NameOf(key string) string { return in.names[key] }

// LinkOf returns the block a Link input names, or nil.
func (in *Inputs) LinkOf(key string) *Linked {
	if l := in.links[key]; len(l) > 0 {
		return l[0]
	}
	return nil
}

// LinksOf returns the blocks a LinkList input names.
func (in *Inputs) LinksOf(key string) []*Linked { return in.links[key] }

// Env returns the site settings the block is evaluated in, as the
// catalog holds them.
func (in *Inputs) Env() any { return in.env }

// Linked is another block's evaluation, as a block that links to it sees it.
type Linked struct {
	ID, Kind string
	Roles    Role
	Ambient  float64
	Results  map[string]float64 // SI
	Inputs   map[string]float64 // SI, with defaults
	Names    map[string]string
	Curves   []Curve
	// Model is what its model saw: every input, lists and links
	// included, for a model that evaluates it again under other
	// conditions (a receiver filled from a machine re-solves the machine
	// at each tank pressure). Nil once the block is released.
	Model *Inputs
}

// Set stores a value; given says whether the user wrote it (not a default).
func (in *Inputs) Set(name string, v float64, given bool) {
	in.values[name] = v
	in.given[name] = given
}

// SetList stores a List input given as a list of SI values.
func (in *Inputs) SetList(name string, vs []float64) {
	in.lists[name] = vs
	in.given[name] = true
}

// Value returns an input's SI value (0 when absent).
func (in *Inputs) Value(name string) float64 { return in.values[name] }

// ValuesOf returns a List input's values: the list as given, or its one
// value; nil when absent.
func (in *Inputs) ValuesOf(name string) []float64 {
	if vs, ok := in.lists[name]; ok {
		return vs
	}
	if v, ok := in.values[name]; ok {
		return []float64{v}
	}
	return nil
}

// Has reports whether the input has a value, given or default.
func (in *Inputs) Has(name string) bool {
	if _, ok := in.values[name]; ok {
		return true
	}
	if _, ok := in.lists[name]; ok {
		return true
	}
	_, ok := in.names[name]
	return ok || len(in.links[name]) > 0
}

// Given reports whether the user wrote the input.
func (in *Inputs) Given(name string) bool { return in.given[name] }

// Names returns the names of all inputs with a value, sorted.
func (in *Inputs) Names() []string {
	names := make([]string, 0, len(in.values))
	for k := range in.values {
		names = append(names, k)
	}
	sort.Strings(names)
	return names
}

// Result is one computed value with the working that produced it.
type Result struct {
	Name  string
	Value float64 // SI; pressures absolute
	Dim   units.Dimension
	Trace Trace
	// Gas is, for a volume flow of air, the state its volume is measured
	// at (free air at the inlet, say), which normal flow units (Nl/min)
	// convert from by mass; zero for a swept volume, which has none.
	Gas units.GasState
}

// Trace is the working behind a result, as a reviewer would check it by hand.
type Trace struct {
	Formula     string // symbolic, e.g. "Vs = A · s"
	Substituted string // the same with numbers and units, e.g. "= 804 mm2 · 28 mm"
}

// Level is a caution's signal word (ANSI Z535), in rising order of hazard.
type Level int

// The signal words.
const (
	Notice Level = iota + 1
	Caution
	Warning
	Danger
)

func (l Level) String() string {
	switch l {
	case Notice:
		return "NOTICE"
	case Caution:
		return "CAUTION"
	case Warning:
		return "WARNING"
	case Danger:
		return "DANGER"
	}
	return fmt.Sprintf("Level(%d)", int(l))
}

// CautionNote is one caution raised by a block's numbers.
type CautionNote struct {
	Level   Level
	Rule    string // our rule id, e.g. "no-delivery"
	Message string
	// Result is the result whose value raised it, which a table marks;
	// empty when what the block is made of, not a figure, raised it.
	Result string
	// Acknowledged is the block's reason for accepting this caution, from
	// its [acknowledge] table; an acknowledged caution is still shown.
	Acknowledged string
}

// Curve is a sampled series for charts, in SI units.
type Curve struct {
	Name   string
	XDim   units.Dimension
	YDim   units.Dimension
	X, Y   []float64
	Dashed bool
}

// Outcome is everything a kind computes for one block.
type Outcome struct {
	Results  []Result
	Cautions []CautionNote
	Curves   []Curve
	Tables   []Table
	// What a chart is drawn with besides: the block's [show] full_range,
	// its id, and the blocks evaluated with it (nil outside a set).
	FullRange bool
	ID        string
	Set       *Set
}

// InputError is a problem with one input that its range cannot express,
// such as a rod shorter than the crank radius.
type InputError struct {
	Key     string // the input to blame (its line is reported)
	Message string // what is wrong and what is allowed
}

func (e *InputError) Error() string { return e.Key + ": " + e.Message }

// Input returns the kind's input spec named name.
func (k *Kind) Input(name string) (InputSpec, bool) {
	for _, in := range k.Inputs {
		if in.Name == name {
			return in, true
		}
	}
	return InputSpec{}, false
}

// ResultSpec returns the kind's result spec named name.
func (k *Kind) ResultSpec(name string) (ResultSpec, bool) { return k.result(name) }

// resultMeaning is a result's one-line meaning, which says when an
// optional result is computed.
func (k *Kind) resultMeaning(name string) string {
	r, _ := k.result(name)
	return r.Meaning
}

// result returns the kind's result spec named name.
func (k *Kind) result(name string) (ResultSpec, bool) {
	for _, r := range k.Results {
		if r.Name == name {
			return r, true
		}
	}
	return ResultSpec{}, false
}

func (k *Kind) inputNames() []string {
	names := make([]string, len(k.Inputs))
	for i, in := range k.Inputs {
		names[i] = in.Name
	}
	return names
}

func (k *Kind) resultNames() []string {
	names := make([]string, len(k.Results))
	for i, r := range k.Results {
		names[i] = r.Name
	}
	return names
}
