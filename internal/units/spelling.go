package units

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
)

// ReferenceAir says what a flow in the standard unit u is, for traces and
// messages: "air at 0 °C, 101.325 kPa(a) (DIN 1343 normal conditions), …".
func (u Unit) ReferenceAir() string {
	name := "the ISO 8778 standard reference atmosphere"
	if u.Reference == din1343 {
		name = "DIN 1343 normal conditions"
	}
	plain := func(v float64) string { return strconv.FormatFloat(math.Round(v*1e3)/1e3, 'f', -1, 64) }
	return fmt.Sprintf("air at %s kPa(a) and %s °C, dry (%s, from memory), read by mass as free air at the ambient pressure and %s °C",
		plain(u.Reference.Pressure/1e3), plain(u.Reference.Temperature-celsius0), name, plain(freeAirTemperature-celsius0))
}

// ambiguous are spellings that name one unit per dimension, by canonical
// symbol: the trade writes "ft-lb" for a torque and for an energy, and "F"
// and "C" after a temperature (common practice).
var ambiguous = map[string][]string{
	"ft lb": {"lbf ft", "ft lbf"}, "lb ft": {"lbf ft", "ft lbf"}, "ft lbf": {"lbf ft", "ft lbf"}, "lbf ft": {"lbf ft", "ft lbf"},
	"in lb": {"lbf in", "in lbf"}, "lb in": {"lbf in", "in lbf"}, "in lbf": {"lbf in", "in lbf"}, "lbf in": {"lbf in", "in lbf"},
	"F": {"degF"}, "C": {"degC"},
}

// spellingUnits maps every accepted spelling, the ambiguous ones too, to
// the units it may name, in table order.
var spellingUnits = func() map[string][]Unit {
	m := map[string][]Unit{}
	for _, e := range unitSpellings {
		m[e.key] = append(m[e.key], e.unit)
	}
	// A canonical symbol keeps its own unit first: LookupUnit("ft lbf") is
	// the energy.
	for key, symbols := range ambiguous {
		for _, sym := range symbols {
			if u := unitIndex[sym]; !containsUnit(m[key], u) {
				m[key] = append(m[key], u)
			}
		}
	}
	return m
}()

// foldedSpellings maps every spelling in lower case to the spellings it
// stands for.
var foldedSpellings = func() map[string][]string {
	m := map[string][]string{}
	for key := range spellingUnits {
		lower := strings.ToLower(key)
		m[lower] = append(m[lower], key)
	}
	return m
}()

// Known returns the unit spelled s and true, or false when s names none.
// It is LookupUnit without the error, and without the search for a near
// miss that the error's message needs: the way to ask whether a word is a
// unit.
func Known(s string) (Unit, bool) {
	u, ok, _ := lookup(normalize(s), -1)
	return u, ok
}

// LookupUnitAs returns the unit spelled s, read as the dimension want: a
// spelling that names one unit per dimension ("ft-lb") names want's. See
// LookupUnit.
func LookupUnitAs(s string, want Dimension) (Unit, error) {
	key := normalize(s)
	u, ok, why := lookup(key, want)
	if ok {
		return u, nil
	}
	text := strings.TrimSpace(s)
	if why != "" {
		return Unit{}, newError(text, ": "+why)
	}
	e := newError(text, ": unknown unit")
	accept := func(u Unit) bool { return fits(u, want) }
	if !want.valid() {
		accept = nil
	}
	if e.Suggest = suggest(key, accept); e.Suggest != "" {
		e.msg += "; did you mean " + quote(e.Suggest) + "?"
	}
	return Unit{}, e
}

// lookup finds the unit a normalized spelling names, read as want (any
// dimension when want is not valid): the spelling as written, else the one
// it is in another case, unless case changes its meaning there, which why
// then explains.
func lookup(key string, want Dimension) (u Unit, ok bool, why string) {
	if units, found := spellingUnits[key]; found {
		u := pick(units, want)
		if _, inTable := unitIndex[key]; !inTable && want.valid() && !fits(u, want) {
			return Unit{}, false, "" // "C" is a unit only after a temperature
		}
		return u, true, ""
	}
	spellings := foldedSpellings[strings.ToLower(key)]
	if len(spellings) == 0 {
		return Unit{}, false, ""
	}
	var chosen []Unit
	var named []string
	for _, sp := range spellings {
		u := pick(spellingUnits[sp], want)
		if want.valid() && !fits(u, want) {
			continue
		}
		if !containsUnit(chosen, u) {
			chosen = append(chosen, u)
			named = append(named, quote(sp))
		}
	}
	switch len(chosen) {
	case 0:
		// None fits: the first, for the message that says what it is.
		u = pick(spellingUnits[spellings[0]], want)
	case 1:
		u = chosen[0]
	default:
		return Unit{}, false, fmt.Sprintf("case matters here: %s are different units", strings.Join(named, " and "))
	}
	spelled := spellings[0]
	for _, sp := range spellings {
		if u == pick(spellingUnits[sp], want) {
			spelled = sp
			break
		}
	}
	if why := caseMeaning(key, spelled); why != "" {
		return Unit{}, false, why
	}
	return u, true, ""
}

// pick is the unit of units that reads as want, else the first.
func pick(units []Unit, want Dimension) Unit {
	for _, u := range units {
		if want.valid() && fits(u, want) {
			return u
		}
	}
	return units[0]
}

func containsUnit(units []Unit, u Unit) bool {
	for _, v := range units {
		if v == u {
			return true
		}
	}
	return false
}

// prefixCase are the letters whose case is another SI prefix.
var prefixCase = map[rune]string{'m': "milli (10⁻³)", 'M': "mega (10⁶)", 'p': "pico (10⁻¹²)", 'P': "peta (10¹⁵)"}

// caseMeaning says why written, a spelling in another case than spelled,
// may not be read as it: a prefix letter in the other case is another
// prefix ("Mbar" is not "mbar"). A spelling in capitals alone carries no
// case, and reads as any ("MM", "KW", "BAR").
func caseMeaning(written, spelled string) string {
	if strings.ToUpper(written) == written {
		return ""
	}
	w, s := []rune(written), []rune(spelled)
	for i := range w {
		starts := i == 0 || !unicode.IsLetter(w[i-1])
		if !starts || i >= len(s) || w[i] == s[i] || !prefixed(s[i:]) {
			continue
		}
		if mean, ok := prefixCase[w[i]]; ok {
			if other, ok := prefixCase[s[i]]; ok {
				return fmt.Sprintf("case matters in a unit's prefix: %q is %s, %q is %s; write %q if that is meant", string(w[i]), mean, string(s[i]), other, spelled)
			}
		}
	}
	return ""
}

// prefixed reports whether the word that starts s is a prefix and a unit
// ("mbar", "MPa"), not a unit of its own ("psi").
func prefixed(s []rune) bool {
	end := 1
	for end < len(s) && (unicode.IsLetter(s[end]) || unicode.IsDigit(s[end])) {
		end++
	}
	_, unit := spellingUnits[string(s[1:end])]
	return end > 1 && unit
}
