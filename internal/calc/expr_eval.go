package calc

import (
	"fmt"
	"math"
	"strings"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/units"
)

// ExprValue is a value an expression reads or gives.
type ExprValue struct {
	SI  float64 // in SI units: a pressure absolute, a temperature in kelvin
	Dim units.Dimension
	// Unit is the unit the working shows the value in: the unit an input was
	// written in, or a result's display unit; "" for the display unit of its
	// dimension in the block's unit system (display.UnitFor).
	Unit string
}

// Eval computes the expression. lookup answers each name with its value
// (false when there is none); ambient is the block's ambient pressure (Pa,
// absolute) for gauge(); customary says the block is written in US
// customary units, and so shows its working and its result in them.
//
// Quantities keep their dimensions. Absolute pressures and temperatures are
// points on a scale: point − point is a difference (PressureDifference,
// TemperatureDifference), point ± difference a point, and adding points,
// subtracting a point from a difference, negating a point or scaling one by
// a plain number are errors. A point times or over a quantity with units
// uses its absolute value; a point over a point of its kind is a plain
// ratio. A product or quotient is named by its base-unit exponents
// (units.Named), keeps the dimension of a value scaled by a plain number,
// is a torque when an energy comes from dividing by a rotational speed or
// an angle, and an energy per volume rather than a pressure difference when
// an energy, power or specific energy went into it. A result with no named
// dimension (kg/m) is an error.
//
// The trace's Formula is the expression as written; Substituted the same
// with each name replaced by its value and unit, then the result. Pressures
// are shown absolute there, as they are computed, and temperatures in a
// product, quotient or function in K (°R in customary units).
//
// Every failure is an *ExprError; a name that lookup does not know sets its
// Unknown field.
func (x *Expr) Eval(lookup func(ExprRef) (ExprValue, bool), ambient float64, customary bool) (ExprValue, Trace, error) {
	e := &exprEval{
		x: x, lookup: lookup, ambient: ambient, customary: customary,
		vals: make([]exprVal, x.nodes), shownIn: make([]string, x.nodes), figures: display.TraceFigures,
	}
	v, err := e.eval(x.root)
	if err != nil {
		return ExprValue{}, Trace{}, err
	}
	if !v.named {
		return ExprValue{}, Trace{}, &ExprError{Msg: fmt.Sprintf(
			"the result is in %s, which is no quantity a result can be; allowed: a plain number or a named quantity (length, pressure, power, energy per volume, ...)", v.exp)}
	}
	result := e.show(v, "", false, display.TraceFigures)
	sub := "= " + result
	switch x.root.kind {
	case numberNode, piNode, nameNode:
	default:
		sub = "= " + e.trace(x.root, false) + " " + sub
	}
	return ExprValue{SI: v.si, Dim: v.dim, Unit: display.UnitFor(v.dim, customary)},
		Trace{Formula: strings.TrimSpace(x.src), Substituted: sub}, nil
}

// exprVal is a value during evaluation: SI, its base-unit exponents, and
// its named dimension unless it is a composite with none (kg/m).
type exprVal struct {
	si    float64
	exp   units.Exponents
	dim   units.Dimension
	named bool
}

// quantity makes a value of a named dimension.
func quantity(si float64, dim units.Dimension) exprVal {
	return exprVal{si: si, exp: units.ExponentsOf(dim), dim: dim, named: true}
}

// fromExponents makes a value named by its exponents, or a composite.
func fromExponents(si float64, exp units.Exponents) exprVal {
	dim, named := units.Named(exp)
	return exprVal{si: si, exp: exp, dim: dim, named: named}
}

func (v exprVal) point() bool { return v.named && units.IsPoint(v.dim) }

// plain reports whether v is a plain number (not an angle).
func (v exprVal) plain() bool { return v.named && v.dim == units.Dimensionless }

// what names v's kind for a message: "a pressure", "a plain number".
func (v exprVal) what() string {
	switch {
	case !v.named:
		return "a quantity in " + v.exp.String()
	case v.dim == units.Dimensionless:
		return "a plain number"
	}
	return v.dim.Article()
}

// exprEval is one evaluation of an expression.
type exprEval struct {
	x         *Expr
	lookup    func(ExprRef) (ExprValue, bool)
	ambient   float64
	customary bool
	vals      []exprVal // by node id, for the trace
	shownIn   []string  // by node id: the unit lookup gave a name
	figures   int       // significant figures of the trace's values
}

// text is node n as written, quoted for a message.
func (e *exprEval) text(n *exprNode) string {
	return fmt.Sprintf("%q", strings.TrimSpace(e.x.src[n.pos:n.end]))
}

// fail makes an error pointing at node n.
func (e *exprEval) fail(n *exprNode, format string, args ...any) *ExprError {
	return &ExprError{Col: column(e.x.src, n.at), Msg: fmt.Sprintf(format, args...)}
}

func (e *exprEval) eval(n *exprNode) (exprVal, error) {
	var v exprVal
	var err error
	switch n.kind {
	case numberNode:
		v = quantity(n.num, units.Dimensionless)
	case piNode:
		v = quantity(math.Pi, units.Dimensionless)
	case nameNode:
		v, err = e.name(n)
	case parenNode:
		v, err = e.eval(n.args[0])
	case negNode:
		if v, err = e.eval(n.args[0]); err == nil && v.point() {
			err = e.fail(n, "%s negates %s, a point on a scale; negate a difference instead (%s)", e.text(n), v.what(), differenceHint(v.dim))
		}
		v.si = -v.si
	case binaryNode:
		v, err = e.binary(n)
	case callNode:
		v, err = e.call(n)
	}
	if err != nil {
		return exprVal{}, err
	}
	if math.IsNaN(v.si) || math.IsInf(v.si, 0) {
		return exprVal{}, e.fail(n, "%s is not a finite number (too large)", e.text(n))
	}
	e.vals[n.id] = v
	return v, nil
}

// name looks a name up.
func (e *exprEval) name(n *exprNode) (exprVal, error) {
	got, ok := e.lookup(n.ref)
	if !ok {
		ref := n.ref
		msg := fmt.Sprintf("unknown name %q", ref.String())
		if strings.Contains(ref.Block, "-") {
			msg += " (read as block " + ref.Block + "); for a subtraction, write spaces around the minus"
		}
		err := e.fail(n, "%s", msg)
		err.Unknown = &ref
		return exprVal{}, err
	}
	if math.IsNaN(got.SI) || math.IsInf(got.SI, 0) || units.DefaultUnit(got.Dim) == "" && got.Dim != units.Dimensionless {
		return exprVal{}, e.fail(n, "%s has no finite value of a known dimension", n.ref)
	}
	e.shownIn[n.id] = got.Unit
	return quantity(got.SI, got.Dim), nil
}

func (e *exprEval) binary(n *exprNode) (exprVal, error) {
	l, err := e.eval(n.args[0])
	if err != nil {
		return exprVal{}, err
	}
	r, err := e.eval(n.args[1])
	if err != nil {
		return exprVal{}, err
	}
	switch n.op {
	case '+', '-':
		return e.sum(n, l, r)
	case '*', '/':
		return e.product(n, l, r)
	}
	return e.power(n, l, r)
}

// sum is l + r or l − r.
func (e *exprEval) sum(n *exprNode, l, r exprVal) (exprVal, error) {
	minus := n.op == '-'
	si := l.si + r.si
	word := "plus"
	if minus {
		si, word = l.si-r.si, "minus"
	}
	e.figures = max(e.figures, display.FiguresFor(math.Max(math.Abs(l.si), math.Abs(r.si)), si))
	mismatch := func() error {
		msg := fmt.Sprintf("%s is %s %s %s; + and - need two values of one kind", e.text(n), l.what(), word, r.what())
		if l.exp == r.exp {
			msg += fmt.Sprintf(" (%s and %s share their SI units but are different quantities)", l.dim, r.dim)
		}
		return e.fail(n, "%s", msg)
	}
	if l.exp != r.exp {
		return exprVal{}, mismatch()
	}
	switch {
	case l.point() && r.point():
		if minus {
			return quantity(si, pointDifference(l.dim)), nil
		}
		return exprVal{}, e.fail(n, "%s adds two %ss, points on a scale, which do not add; subtract them for a %s, or add a difference to one (%s)",
			e.text(n), l.dim, pointDifference(l.dim), differenceHint(l.dim))
	case l.point() || r.point():
		p, d := l, r
		if r.point() {
			p, d = r, l
		}
		if !d.named || !differs(p.dim, d.dim) {
			return exprVal{}, mismatch()
		}
		if r.point() && minus {
			return exprVal{}, e.fail(n, "%s is %s minus %s, which is no quantity; allowed: %s - %s (a %s), %s ± a difference (a %s)",
				e.text(n), l.what(), r.what(), p.dim, p.dim, pointDifference(p.dim), p.dim, p.dim)
		}
		if si < 0 {
			return exprVal{}, e.fail(n, "%s comes out below absolute zero (%s)", e.text(n), e.show(quantity(si, p.dim), "", true, display.TraceFigures))
		}
		return quantity(si, p.dim), nil
	}
	v, ok := sameKind(l, r)
	if !ok {
		return exprVal{}, mismatch()
	}
	v.si = si
	return v, nil
}

// pointDifference is the dimension of the difference of two points of dim.
func pointDifference(point units.Dimension) units.Dimension {
	if point == units.Temperature {
		return units.TemperatureDifference
	}
	return units.PressureDifference
}

// differs reports whether d is a difference of the point dimension: a
// stress counts as a pressure difference.
func differs(point, d units.Dimension) bool {
	if point == units.Temperature {
		return d == units.TemperatureDifference
	}
	return d == units.PressureDifference || d == units.Stress
}

// differenceHint says how a difference of point dimension dim is written.
func differenceHint(dim units.Dimension) string {
	if dim == units.Temperature {
		return "t - t0, or an interval in K or degR"
	}
	return "gauge(p), p - p0, or an input in bar(d) or psid"
}

// sameKind returns the kind that two non-point values of equal exponents
// share, for a sum or min and max: their own, an angle for an angle and a
// plain number, a pressure difference for a stress and a pressure
// difference. Energy and torque, or an energy per volume and a pressure
// difference, are not one kind.
func sameKind(a, b exprVal) (exprVal, bool) {
	pair := func(x, y units.Dimension) bool {
		return (a.dim == x && b.dim == y) || (a.dim == y && b.dim == x)
	}
	switch {
	case a.exp != b.exp || a.named != b.named:
		return a, false
	case !a.named || a.dim == b.dim:
		return a, true
	case pair(units.Dimensionless, units.Angle):
		return quantity(a.si, units.Angle), true
	case pair(units.Stress, units.PressureDifference):
		return quantity(a.si, units.PressureDifference), true
	}
	return a, false
}

// product is l × r or l ÷ r.
func (e *exprEval) product(n *exprNode, l, r exprVal) (exprVal, error) {
	divide := n.op == '/'
	switch {
	case l.point() && r.exp.IsZero(), r.point() && l.exp.IsZero() && !divide:
		p := l
		if r.point() {
			p = r
		}
		return exprVal{}, e.fail(n, "%s scales %s, a point on a scale, from %s; scale a difference instead (%s)",
			e.text(n), p.what(), zeroOf(p.dim), differenceHint(p.dim))
	case divide && r.si == 0:
		return exprVal{}, e.fail(n, "%s divides by zero: %s is 0", e.text(n), e.text(n.args[1]))
	case divide && l.point() && r.point() && l.dim == r.dim:
		return quantity(l.si/r.si, units.Dimensionless), nil
	}
	si, exp := l.si*r.si, l.exp.Times(r.exp)
	if divide {
		si, exp = l.si/r.si, l.exp.Over(r.exp)
	}
	switch {
	case l.plain() && !divide:
		r.si = si
		return r, nil
	case r.plain():
		l.si = si
		return l, nil
	}
	v := fromExponents(si, exp)
	switch {
	case v.dim == units.Energy && divide && r.named && (r.dim == units.RotationalSpeed || r.dim == units.Angle):
		v.dim = units.Torque // P/ω, E/θ
	case v.dim == units.PressureDifference && (energyLike(l) || energyLike(r)):
		v.dim = units.EnergyPerVolume // P/Q, E/V, ρ·w
	}
	return v, nil
}

// energyLike reports whether v is an energy, a power or a specific energy,
// whose quotient by a volume is an energy per volume, not a pressure.
func energyLike(v exprVal) bool {
	return v.named && (v.dim == units.Energy || v.dim == units.Power || v.dim == units.SpecificEnergy)
}

// zeroOf says where a point's scale starts.
func zeroOf(dim units.Dimension) string {
	if dim == units.Temperature {
		return "absolute zero"
	}
	return "a perfect vacuum"
}

// power is base ^ exponent.
func (e *exprEval) power(n *exprNode, base, exponent exprVal) (exprVal, error) {
	if !exponent.exp.IsZero() {
		return exprVal{}, e.fail(n, "%s: the exponent of ^ must be a plain number; %s is %s", e.text(n), e.text(n.args[1]), exponent.what())
	}
	y := exponent.si
	si := math.Pow(base.si, y)
	switch {
	case base.si == 0 && y < 0:
		return exprVal{}, e.fail(n, "%s divides by zero: %s is 0", e.text(n), e.text(n.args[0]))
	case base.si < 0 && y != math.Trunc(y):
		return exprVal{}, e.fail(n, "%s raises a negative value (%s) to a fractional power, which is not a number", e.text(n), e.show(base, "", true, display.TraceFigures))
	case y == 1:
		base.si = si
		return base, nil
	case base.exp.IsZero():
		return quantity(si, units.Dimensionless), nil
	}
	exp, ok := rootOf(base.exp, y)
	if !ok {
		return exprVal{}, e.fail(n, "%s: %s to the power %s has no dimension; a power of a quantity with units must leave whole powers of m, kg, s and K (the square root of an area is a length)",
			e.text(n), base.what(), display.NumberSig(y, "", 6))
	}
	return fromExponents(si, exp), nil
}

// rootOf returns exp raised to y, a whole number or a fraction with a
// small denominator, when that leaves whole exponents.
func rootOf(exp units.Exponents, y float64) (units.Exponents, bool) {
	for den := 1; den <= 12; den++ {
		num := math.Round(y * float64(den))
		if math.Abs(y*float64(den)-num) <= 1e-9*math.Max(1, math.Abs(num)) && math.Abs(num) <= 1000 {
			return exp.Power(int(num), den)
		}
	}
	return exp, false
}

// call applies a function.
func (e *exprEval) call(n *exprNode) (exprVal, error) {
	args := make([]exprVal, len(n.args))
	for i, a := range n.args {
		v, err := e.eval(a)
		if err != nil {
			return exprVal{}, err
		}
		args[i] = v
	}
	a := args[0]
	arg := e.text(n.args[0])
	switch n.text {
	case "sqrt":
		if a.si < 0 {
			return exprVal{}, e.fail(n, "%s: the square root of a negative value (%s is %s)", e.text(n), arg, e.show(a, e.shownIn[n.args[0].id], true, display.TraceFigures))
		}
		return e.power(n, a, quantity(0.5, units.Dimensionless))
	case "abs":
		a.si = math.Abs(a.si)
		return a, nil
	case "min", "max":
		return e.extreme(n, args)
	case "gauge":
		switch {
		case a.named && a.dim == units.Pressure:
			e.figures = max(e.figures, display.FiguresFor(a.si, a.si-e.ambient))
			return quantity(a.si-e.ambient, units.PressureDifference), nil
		case a.named && differs(units.Pressure, a.dim):
			return exprVal{}, e.fail(n, "gauge() takes a pressure; %s is already %s, which has no gauge reading", arg, a.what())
		}
		return exprVal{}, e.fail(n, "gauge() takes a pressure; %s is %s", arg, a.what())
	}
	if !a.exp.IsZero() {
		takes := "a plain number (divide by a value of the same kind for a ratio)"
		if n.text == "sin" || n.text == "cos" || n.text == "tan" {
			takes = "an angle or a plain number (radians)"
		}
		return exprVal{}, e.fail(n, "%s takes %s; %s is %s", n.text, takes, arg, a.what())
	}
	switch n.text {
	case "ln", "log10":
		if a.si <= 0 {
			return exprVal{}, e.fail(n, "%s: the logarithm of %s, which is not a positive number", e.text(n), display.NumberSig(a.si, "", display.TraceFigures))
		}
		if n.text == "ln" {
			return quantity(math.Log(a.si), units.Dimensionless), nil
		}
		return quantity(math.Log10(a.si), units.Dimensionless), nil
	case "exp":
		return quantity(math.Exp(a.si), units.Dimensionless), nil
	case "sin":
		return quantity(math.Sin(a.si), units.Dimensionless), nil
	case "cos":
		return quantity(math.Cos(a.si), units.Dimensionless), nil
	}
	return quantity(math.Tan(a.si), units.Dimensionless), nil
}

// extreme is min or max of values of one kind: points of one dimension, or
// non-points that sameKind accepts.
func (e *exprEval) extreme(n *exprNode, args []exprVal) (exprVal, error) {
	best := args[0]
	for i, a := range args[1:] {
		kind, ok := sameKind(best, a)
		if best.point() != a.point() || (best.point() && best.dim != a.dim) {
			ok = false
		}
		if !ok {
			return exprVal{}, e.fail(n, "%s takes values of one kind; %s is %s, %s is %s",
				n.text, e.text(n.args[0]), args[0].what(), e.text(n.args[i+1]), a.what())
		}
		best = kind
		if (n.text == "min") == (a.si < best.si) {
			best.si = a.si
		}
	}
	return best, nil
}
