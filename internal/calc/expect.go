package calc

import (
	"fmt"
	"math"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"
	"unicode"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/units"
)

// Claim is one line of a block's [expect] table: what the prose says a
// result is.
type Claim struct {
	Result string // result name
	Text   string // the claim as written
	Line   int
	Op     ClaimOp
	Value  float64 // in the claim's unit
	Unit   string
	// Tolerance is absolute, in the claim's unit; RelTol a fraction of
	// Value. At most one is set; for OpAbout with neither, the precision
	// written sets Tolerance.
	Tolerance, RelTol float64
}

// ClaimOp is how a claim compares.
type ClaimOp int

// The claim forms.
const (
	OpAbout   ClaimOp = iota // "22.5 cm3 ± 2%", "20 cm3"
	OpAtLeast                // ">= 15 L/min"
	OpAtMost                 // "<= 120 degC"
	OpAbove                  // "> 15 L/min"
	OpBelow                  // "< 120 degC"
)

var claimOps = []struct {
	prefix string
	op     ClaimOp
}{{">=", OpAtLeast}, {"≥", OpAtLeast}, {"<=", OpAtMost}, {"≤", OpAtMost}, {">", OpAbove}, {"<", OpBelow}}

// claimMistakes are signs that claims are written with elsewhere, and what
// to write instead.
var claimMistakes = []struct{ prefix, why string }{
	{"=>", `starts with "=>"; write ">="`}, {"=<", `starts with "=<"; write "<="`},
	{"> =", `starts with "> ="; write ">=" without a space`}, {"< =", `starts with "< ="; write "<=" without a space`},
	{"≧", `starts with "≧"; write ">=" or "≥"`}, {"≦", `starts with "≦"; write "<=" or "≤"`},
	{"≈", "starts with ≈; a bare value already means about: \"20 cm3\" holds from 19.5 to 20.5 cm3"},
	{"~", "starts with ~; a bare value already means about: \"20 cm3\" holds from 19.5 to 20.5 cm3"},
	{"=", "starts with =; a bare value already means about: \"20 cm3\" holds from 19.5 to 20.5 cm3"},
}

// tolSplit finds the ± of a claim.
var tolSplit = regexp.MustCompile(`\s*(±|\+/-|\+-)\s*`)

// rangeSplit finds the "to" or en dash between the ends of a range.
var rangeSplit = regexp.MustCompile(`\s+to\s+|\s*–\s*`)

// looksLikeRange matches "20-25 cm3" and "20..25 cm3": ranges written with a
// hyphen (which reads as a minus sign) or two dots.
// A mixed fraction ("1-1/2 in") is no range.
var looksLikeRange = regexp.MustCompile(`^[+-]?[0-9.]+(?:[eE][+-]?[0-9]+)?\s*(?:-|\.\.)\s*[+-]?[0-9]+(?:[^0-9/]|$)`)

const claimForms = `"22.5 cm3 ± 2%", "22.5 cm3 ± 0.5 cm3", "20 cm3" (to the precision written), "20 to 25 cm3", ">= 15 L/min", "<= 120 degC"`

// ParseClaim reads a claim about a result of dimension dim.
func ParseClaim(result, text string, dim units.Dimension) (Claim, error) {
	c := Claim{Result: result, Text: text}
	s := strings.TrimSpace(text)
	bad := func(why string) (Claim, error) {
		return c, fmt.Errorf("%q %s; a claim reads like %s", text, why, claimForms)
	}
	for _, m := range claimMistakes {
		if strings.HasPrefix(s, m.prefix) {
			return bad(m.why)
		}
	}
	for _, o := range claimOps {
		if strings.HasPrefix(s, o.prefix) {
			c.Op = o.op
			s = strings.TrimSpace(s[len(o.prefix):])
			break
		}
	}
	// "(22.5 ± 0.5) cm3": the unit after the parenthesis is the claim's.
	if inner, unit, ok := parenthesized(s); ok {
		if c.Op != OpAbout || !tolSplit.MatchString(inner) {
			return bad("has parentheses; they only group a value and its tolerance, as in \"(22.5 ± 0.5) cm3\"")
		}
		loc := tolSplit.FindStringIndex(inner)
		main, tol := strings.TrimSpace(inner[:loc[0]]), strings.TrimSpace(inner[loc[1]:])
		if _, isPlain := plainNumber(main); !isPlain {
			return bad("puts a unit inside the parentheses; write \"(22.5 ± 0.5) cm3\", the unit after them")
		}
		if _, isPlain := plainNumber(tol); !isPlain && !strings.HasSuffix(tol, "%") {
			return bad("puts a unit inside the parentheses; write \"(22.5 ± 0.5) cm3\", the unit after them")
		}
		// Without a unit after them they group a plain number ("(0.04 ± 0.001)").
		s = strings.TrimSpace(main+" "+unit) + " ± " + tol
	}
	main, tol := s, ""
	if loc := tolSplit.FindStringIndex(s); loc != nil {
		if c.Op != OpAbout {
			return bad("mixes a bound with a tolerance")
		}
		main, tol = s[:loc[0]], strings.TrimSpace(s[loc[1]:])
		if tol == "" {
			return bad("has no tolerance after ±")
		}
	}
	if main == "" {
		return bad("has no value")
	}
	if c.Op == OpAbout && tol == "" {
		if loc := rangeSplit.FindStringIndex(main); loc != nil {
			return c.parseRange(main[:loc[0]], main[loc[1]:], dim)
		}
		if looksLikeRange.MatchString(main) {
			return bad("looks like a range; write its ends with \"to\", as in \"20 to 25 cm3\"")
		}
	}
	// "22.5 ± 0.5 cm3": the tolerance's unit serves the bare value too.
	if _, isPlain := plainNumber(main); isPlain && tol != "" && dim != units.Dimensionless {
		if tq, err := units.Parse(tol, tolDimension(dim)); err == nil && tq.Unit.Symbol != "" {
			main, tol = main+" "+tq.Unit.Symbol, tq.Number
		}
	}
	q, err := units.Parse(main, dim)
	if err != nil {
		return c, fmt.Errorf("%s; a claim reads like %s", err.Error(), claimForms)
	}
	if why := unsettled(q); why != "" {
		return bad(why)
	}
	c.Unit = q.Unit.Symbol
	c.Value, _ = strconv.ParseFloat(q.Number, 64)
	switch {
	case tol == "" && c.Op == OpAbout:
		c.Tolerance = halfLastDigit(q.Number)
		if math.IsInf(c.Tolerance, 0) {
			return bad("has an exponent too large to tell its precision; write the number with a smaller exponent and a tolerance")
		}
	case strings.HasSuffix(tol, "%") && q.Unit.Offset != 0 && dim == units.Temperature:
		return bad("takes a percentage of a temperature on a scale with an offset, which has no meaning (1 % of 20 °C is not 1 % of the temperature); give the tolerance in degrees, e.g. \"± 5 degC\", or claim in K")
	case strings.HasSuffix(tol, "%") && c.Unit == "%":
		// "85 % ± 2 %" reads as 83..87 % and as 83.3..86.7 %.
		pct := strings.TrimSpace(strings.TrimSuffix(tol, "%"))
		return bad(fmt.Sprintf("gives a percentage a tolerance in %%, which reads two ways; write \"%s %% ± %s\" for ± %s percentage points, or \"%s ± %s%%\" for ± %s %% of the value",
			q.Number, pct, pct, strconv.FormatFloat(c.Value/100, 'g', -1, 64), pct, pct))
	case strings.HasSuffix(tol, "%"):
		f, ok := plainNumber(strings.TrimSpace(strings.TrimSuffix(tol, "%")))
		if !ok || f < 0 {
			return bad("has a tolerance that is not a percentage")
		}
		if f >= 100 {
			return bad("has a tolerance of 100 % or more, which says nothing about the value; allowed: below 100 %")
		}
		c.RelTol = f / 100
	case tol != "":
		f, ok := plainNumber(tol)
		if !ok {
			// A tolerance with its own unit: convert to the claim's unit.
			tq, terr := units.Parse(tol, differenceOf(dim))
			if terr != nil {
				return c, fmt.Errorf("tolerance %s; a claim reads like %s", terr.Error(), claimForms)
			}
			// A tolerance is a difference: scale it, never offset it.
			f = tq.Value / q.Unit.Factor
		}
		if f < 0 || math.IsInf(f, 0) || math.IsNaN(f) {
			return bad("has a negative or endless tolerance")
		}
		if c.Value != 0 && f >= math.Abs(c.Value) {
			return bad("has a tolerance as large as the value itself, which says nothing about it; allowed: below the value")
		}
		c.Tolerance = math.Abs(f)
	}
	return c, nil
}

// parseRange reads a range claim "20 to 25 cm3" (or "20 cm3 to 25 cm3") as
// the band between its ends, both included.
func (c Claim) parseRange(lo, hi string, dim units.Dimension) (Claim, error) {
	lo, hi = strings.TrimSpace(lo), strings.TrimSpace(hi)
	fail := func(why string) (Claim, error) {
		return c, fmt.Errorf("%q %s; a claim reads like %s", c.Text, why, claimForms)
	}
	if lo == "" && hi != "" {
		return fail("starts with a dash, which joins the ends of a range; write a minus sign as - or −")
	}
	if lo == "" || hi == "" {
		return fail("is a range without two ends")
	}
	hq, err := units.Parse(hi, dim)
	if err != nil {
		return c, fmt.Errorf("upper end of the range: %s; a claim reads like %s", err.Error(), claimForms)
	}
	if _, isPlain := plainNumber(lo); isPlain && hq.Unit.Symbol != "" {
		lo += " " + hq.Unit.Symbol
	}
	lq, err := units.Parse(lo, dim)
	if err != nil {
		return c, fmt.Errorf("lower end of the range: %s; a claim reads like %s", err.Error(), claimForms)
	}
	if why := unsettled(hq); why != "" {
		return fail(why)
	}
	if lq.Unit.Symbol != hq.Unit.Symbol {
		return fail(fmt.Sprintf("gives the ends of the range different units (%s, %s); write both in one unit, as in \"20 to 25 cm3\"",
			lq.Unit.Symbol, hq.Unit.Symbol))
	}
	a, _ := strconv.ParseFloat(lq.Number, 64)
	b, _ := strconv.ParseFloat(hq.Number, 64)
	half := b/2 - a/2 // halves first: no overflow near the largest float
	if !(half > 0) || math.IsInf(half, 0) {
		return fail("is a range whose lower end is not below its upper end; write the lower end first")
	}
	c.Unit, c.Value, c.Tolerance = hq.Unit.Symbol, a+half, half
	return c, nil
}

// unsettled says why a pressure claimed in a unit the trade reads either
// way (plain hPa) cannot be checked, or "".
func unsettled(q units.Quantity) string {
	if q.Dim != units.Pressure || q.Unit.Ref != units.Unsettled {
		return ""
	}
	return fmt.Sprintf("is in plain %s, which is read absolute in weather reports and gauge on some dials; write %s(a) or %s(g)", q.Unit.Symbol, q.Unit.Symbol, q.Unit.Symbol)
}

// parenthesized splits "(22.5 ± 0.5) cm3" into what the parentheses hold
// and the unit after them.
func parenthesized(s string) (inner, unit string, ok bool) {
	if !strings.HasPrefix(s, "(") {
		return "", "", false
	}
	end := strings.IndexByte(s, ')')
	if end < 0 {
		return "", "", false
	}
	return strings.TrimSpace(s[1:end]), strings.TrimSpace(s[end+1:]), true
}

// plainNumber reads s as a number without unit, in the syntax quantities
// use (no hexadecimal, digit separators, "Inf" or "NaN").
func plainNumber(s string) (float64, bool) {
	q, err := units.Parse(s, units.Dimensionless)
	if err != nil || q.Unit.Symbol != "" {
		return 0, false
	}
	return q.Value, true
}

// tolDimension is the dimension a tolerance is read in when its unit also
// serves the value ("6 ± 0.1 bar(a)", "120 ± 2 degC"): the value's own,
// but a temperature tolerance is not checked against absolute zero.
func tolDimension(dim units.Dimension) units.Dimension {
	if dim == units.Temperature {
		return units.TemperatureDifference
	}
	return dim
}

// differenceOf is the dimension of a difference of dim: a tolerance on a
// temperature is a temperature difference; on a pressure, a stress-like
// difference that is neither gauge nor absolute.
func differenceOf(dim units.Dimension) units.Dimension {
	switch dim {
	case units.Temperature:
		return units.TemperatureDifference
	case units.Pressure:
		return units.Stress
	}
	return dim
}

// halfLastDigit is half a unit in the last written digit: "20" → 0.5,
// "19.70" → 0.005, "2.5e3" → 50.
func halfLastDigit(num string) float64 {
	mant, exp := num, 0
	if i := strings.IndexAny(num, "eE"); i >= 0 {
		mant = num[:i]
		exp, _ = strconv.Atoi(num[i+1:])
	}
	decimals := 0
	if i := strings.IndexByte(mant, '.'); i >= 0 {
		decimals = len(mant) - i - 1
	}
	return 0.5 * math.Pow(10, float64(exp-decimals))
}

// ClaimResult is a claim checked against the computed value.
type ClaimResult struct {
	Claim    Claim
	OK       bool
	Computed float64 // in the claim's unit
	Shown    string  // the computed value as the message shows it, with its unit
	Message  string
}

// Check compares the claim with a result's SI value.
func (c Claim) Check(si float64, dim units.Dimension, ambient float64, sig int) ClaimResult {
	v, err := units.FromSI(si, dim, c.Unit, ambient)
	r := ClaimResult{Claim: c, Computed: v}
	if err != nil {
		r.Message = fmt.Sprintf("%s: cannot compare: %v", c.Result, err)
		return r
	}
	r.OK = c.holds(v)
	figs := c.figuresToShow(v, sig, r.OK)
	if dim == units.Pressure {
		// As tables and inline values show it: a gauge vacuum gets the
		// figures that keep it from hiding the absolute value.
		figs = max(figs, display.PressureFigures(si, c.Unit, ambient, sig))
	}
	computed := withUnit(units.Format(v, figs), c.Unit)
	r.Shown = computed
	absolute, absOK := c.readAbsolute(si, dim, ambient)
	switch {
	case r.OK:
		r.Message = fmt.Sprintf("%s: claim %q holds: computed %s", c.Result, c.Text, computed)
	case absOK:
		r.Message = fmt.Sprintf("%s: claim %q fails%s: computed %s (a plain %s reads gauge; read as %s the claim would hold)",
			c.Result, c.Text, c.band(sig), computed, c.Unit, absolute)
	default:
		r.Message = fmt.Sprintf("%s: claim %q fails%s: computed %s", c.Result, c.Text, c.band(sig), computed)
	}
	if u, err := units.LookupUnitAs(c.Unit, dim); err == nil && u.Standard() {
		at, _ := display.Value(ambient, units.Pressure, "kPa(a)", ambient, sig)
		r.Message += fmt.Sprintf(" (%s is %s, here %s)", c.Unit, u.ReferenceAir(), at)
	}
	return r
}

// MarkFor says why a claim about a vacuum result (one below ambient, or
// any pressure result of a kind that holds vacuum) cannot be checked when
// it is written in a plain pressure unit: plain units read gauge, but below
// ambient "5 mbar" is what vacuum practice writes for an absolute pressure,
// so the claim must say which it means. "" when the claim is marked or the
// result is no vacuum.
func (c Claim) MarkFor(si float64, dim units.Dimension, ambient float64, vacuum bool, sig int) string {
	if dim != units.Pressure || !(vacuum || si < ambient) {
		return ""
	}
	if u, ok := units.Known(c.Unit); !ok || u.Ref != units.Unmarked {
		return ""
	}
	absolute := display.AbsoluteUnit(c.Unit)
	return fmt.Sprintf("%q is in plain %s, which reads gauge, about a vacuum result (%s); write %s or %s(g)",
		c.Text, c.Unit, display.PressurePair(si, c.Unit, ambient, sig), absolute, c.Unit)
}

// readAbsolute is, for a pressure claimed in a plain (gauge) unit that has
// an absolute form, that form ("bar(a)") and whether the claim would hold
// read in it; "" otherwise.
func (c Claim) readAbsolute(si float64, dim units.Dimension, ambient float64) (string, bool) {
	if dim != units.Pressure {
		return "", false
	}
	if u, ok := units.Known(c.Unit); !ok || u.Ref != units.Unmarked {
		return "", false
	}
	abs, ok := units.Known(c.Unit + "(a)")
	if !ok {
		return "", false
	}
	v, err := units.FromSI(si, dim, abs.Symbol, ambient)
	if err != nil {
		return "", false
	}
	return abs.Symbol, c.holds(v)
}

// withUnit writes a number with a unit symbol as tables show it: "20.0 cm³",
// "0.850", and an angle's degree sign without a space, "90.0°".
func withUnit(num, unit string) string {
	switch p := units.Pretty(unit); p {
	case "":
		return num
	case "°":
		return num + p
	default:
		return num + " " + p
	}
}

// band words what an "about" claim allows, " (holds from 1179.5 to
// 1180.5 N)", so that a failure shows why a near value fails; other claims
// say it themselves.
func (c Claim) band(sig int) string {
	if c.Op != OpAbout {
		return ""
	}
	tol := c.Tolerance + c.RelTol*math.Abs(c.Value)
	bound := func(v float64) string {
		mant, exp, _ := strings.Cut(units.Format(v, max(sig, 3)+3), "e")
		if strings.Contains(mant, ".") {
			mant = strings.TrimSuffix(strings.TrimRight(mant, "0"), ".")
		}
		if exp != "" {
			return mant + "e" + exp
		}
		return mant
	}
	return fmt.Sprintf(" (it holds from %s to %s)", bound(c.Value-tol), withUnit(bound(c.Value+tol), c.Unit))
}

// holds reports whether v, in the claim's unit, satisfies the claim.
func (c Claim) holds(v float64) bool {
	// Guard against binary rounding deciding a claim at its edge.
	eps := 1e-9 * math.Max(math.Abs(v), math.Abs(c.Value))
	switch c.Op {
	case OpAbout:
		tol := c.Tolerance + c.RelTol*math.Abs(c.Value)
		return math.Abs(v-c.Value) <= tol+eps
	case OpAtLeast:
		return v >= c.Value-eps
	case OpAtMost:
		return v <= c.Value+eps
	case OpAbove:
		return v > c.Value
	case OpBelow:
		return v < c.Value
	}
	return false
}

// figuresToShow is how many significant figures make a computed value
// show its verdict: a failed claim must not print a rounded value that
// looks as if it held ("20.5" against "20 cm3" when it is 20.51), nor a
// claim that holds on its edge one that looks outside ("2.01" against
// "2 ± 0.005" when it is 2.005).
func (c Claim) figuresToShow(v float64, sig int, ok bool) int {
	figs := max(sig, 3)
	for figs < 8 {
		shown, err := strconv.ParseFloat(units.Format(v, figs), 64)
		if err != nil || c.holds(shown) == ok {
			break
		}
		figs++
	}
	return figs
}

// decodeExpect reads the [expect] table.
func (b *Block) decodeExpect(v any) ([]Claim, inputerr.List) {
	table, ok := v.(map[string]any)
	if !ok {
		return nil, inputerr.List{{File: b.File, Line: b.lineOf("expect"), Key: "expect", Msg: "must be a table: [expect] with lines such as displacement = \"22.5 cm3 ± 2%\""}}
	}
	names := make([]string, 0, len(table))
	for k := range table {
		names = append(names, k)
	}
	sort.Strings(names)
	var claims []Claim
	var errs inputerr.List
	for _, name := range names {
		key := "expect." + name
		line := b.lineOf(key)
		fail := func(msg string) { errs = append(errs, &inputerr.Error{File: b.File, Line: line, Key: key, Msg: msg}) }
		spec, found := b.Kind.result(name)
		if _, isInput := b.Kind.Input(name); !found && isInput {
			fail(fmt.Sprintf("%s is an input of kind %s, set above [expect]; claims are about results: %s", name, b.Kind.Name, strings.Join(b.resultNames(), ", ")))
			continue
		}
		if _, derived := b.derivation(name); derived {
			// Its dimension, which the claim is read in, comes with its value.
			if text, isString := table[name].(string); isString {
				b.pendingClaims = append(b.pendingClaims, pendingClaim{name: name, text: text, line: line})
			} else {
				fail(fmt.Sprintf("%s is not a claim; write a string such as %s", TOMLText(table[name]), claimForms))
			}
			continue
		}
		if !found {
			msg := fmt.Sprintf("kind %s has no result %q; results: %s", b.Kind.Name, name, strings.Join(b.resultNames(), ", "))
			if s := Suggest(name, b.resultNames()); s != "" {
				msg = fmt.Sprintf("kind %s has no result %q; did you mean %q?", b.Kind.Name, name, s)
			}
			fail(msg)
			continue
		}
		text, isString := table[name].(string)
		if !isString {
			fail(fmt.Sprintf("%s is not a claim; write a string such as %s", TOMLText(table[name]), claimForms))
			continue
		}
		c, err := ParseClaim(name, text, spec.Dim)
		if err != nil {
			fail(err.Error())
			continue
		}
		c.Line = line
		claims = append(claims, c)
	}
	return claims, errs
}

// decodeShow reads the [show] table.
func (b *Block) decodeShow(v any) inputerr.List {
	table, ok := v.(map[string]any)
	if !ok {
		return inputerr.List{{File: b.File, Line: b.lineOf("show"), Key: "show", Msg: "must be a table: [show] with outputs = [...] and charts = [...]"}}
	}
	var errs inputerr.List
	keys := make([]string, 0, len(table))
	for k := range table {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		key := "show." + k
		line := b.lineOf(key)
		fail := func(msg string) { errs = append(errs, &inputerr.Error{File: b.File, Line: line, Key: key, Msg: msg}) }
		if k == "full_range" {
			full, isBool := table[k].(bool)
			if !isBool {
				fail(fmt.Sprintf("%s is not true or false; write full_range = true for charts over the whole range, to dead-head", TOMLText(table[k])))
			}
			b.Show.FullRange = full
			continue
		}
		list, isList := table[k].([]any)
		if k != "outputs" && k != "charts" {
			fail("unknown key; [show] takes outputs, charts and full_range")
			continue
		}
		if !isList {
			fail(fmt.Sprintf("%s is not a list; write %s = [\"...\"]", TOMLText(table[k]), k))
			continue
		}
		for _, item := range list {
			s, isString := item.(string)
			if !isString {
				fail(fmt.Sprintf("%s is not a string", TOMLText(item)))
				continue
			}
			if k == "charts" {
				if !contains(b.Kind.Charts, s) {
					allowed := "none for this kind"
					if len(b.Kind.Charts) > 0 {
						allowed = strings.Join(b.Kind.Charts, ", ")
					}
					fail(fmt.Sprintf("unknown chart %q; allowed: %s", s, allowed))
					continue
				}
				if contains(b.Show.Charts, s) {
					fail(fmt.Sprintf("chart %q is listed twice; a block draws each chart once", s))
					continue
				}
				b.Show.Charts = append(b.Show.Charts, s)
				continue
			}
			// Any space sets the unit apart: a tab or a no-break space too.
			name, unit := strings.TrimSpace(s), ""
			if i := strings.IndexFunc(name, unicode.IsSpace); i >= 0 {
				name, unit = name[:i], name[i:]
			}
			spec, found := b.Kind.result(name)
			if _, derived := b.derivation(name); derived {
				// Its unit is checked once its dimension is known.
				spec, found = ResultSpec{Name: name, Dim: units.Dimension(-1)}, true
			}
			if !found {
				msg := fmt.Sprintf("kind %s has no result %q; results: %s", b.Kind.Name, name, strings.Join(b.resultNames(), ", "))
				if sug := Suggest(name, b.resultNames()); sug != "" {
					msg = fmt.Sprintf("kind %s has no result %q; did you mean %q?", b.Kind.Name, name, sug)
				}
				fail(msg)
				continue
			}
			unit = strings.TrimSpace(unit)
			if unit != "" && spec.Dim >= 0 {
				if _, err := units.FromSI(1, spec.Dim, unit, 0); err != nil {
					fail(fmt.Sprintf("%s: %v; %s is %s", name, err, name, dimPhrase(spec.Dim)))
					continue
				}
			}
			if slices.ContainsFunc(b.Show.Outputs, func(o Output) bool { return o.Name == name }) {
				fail(fmt.Sprintf("%s is listed twice; the table shows a result once, in one unit (quote it in others with =[%s.%s unit] in the prose)", name, b.ID, name))
				continue
			}
			b.Show.Outputs = append(b.Show.Outputs, Output{Name: name, Unit: unit})
		}
	}
	return errs
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
