package models

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// Thread is a screw thread of the 60° basic profile: ISO general-purpose
// metric (ISO 68-1) or Unified inch (ASME B1.1), lengths in metres.
type Thread struct {
	Name  string  // designation as written in the table: "M8", "M8x1", "1/4-20"
	D     float64 // nominal (basic major) diameter d
	Pitch float64 // P; 1/n for n threads per inch
	Fine  bool    // a fine-pitch thread (ISO 261), written with its pitch
	// Series is "UNC" or "UNF" for a Unified thread, "" for a metric one.
	Series string
}

// Unified reports whether the thread is a Unified inch thread.
func (t Thread) Unified() bool { return t.Series != "" }

// The basic profile of ISO 68-1: the fundamental triangle has height
// H = √3/2·P; the flanks meet the pitch line 3/8·H inside the major
// diameter, and the minor diameter d1 lies 5/8·H inside it.
const (
	// pitchDepth is (d − d2)/P = 2·(3/8)·(√3/2) = 0.649519.
	pitchDepth = 3 * 0.8660254037844386 / 4
	// stressDepth is (d − d3)/P for the d3 of ISO 898-1's stress area:
	// d3 = d1 − H/6 = d − 2·(5/8)·H − H/6 = d − (17/12)·H = d − 1.226869·P.
	stressDepth = 17 * 0.8660254037844386 / 12
	// tan30 is the tangent of the 30° flank half-angle, 0.57735.
	tan30 = 0.5773502691896258
)

// PitchDiameter is d2 = d − 0.649519·P (ISO 724).
func (t Thread) PitchDiameter() float64 { return t.D - pitchDepth*t.Pitch }

// StressDiameter is d3 = d − 1.226869·P, the minor diameter ISO 898-1 uses
// for the tensile stress area (the basic minor diameter d1 less H/6).
func (t Thread) StressDiameter() float64 { return t.D - stressDepth*t.Pitch }

// StressArea is the tensile stress area: of ISO 898-1 for a metric thread,
// A_s = π/4·((d2 + d3)/2)², and of ASME B1.1 for a Unified one,
// A_s = 0.7854·(D − 0.9743/n)² (from memory).
func (t Thread) StressArea() float64 {
	if t.Unified() {
		m := t.D - unifiedStressDepth*t.Pitch
		return 0.7854 * m * m
	}
	m := (t.PitchDiameter() + t.StressDiameter()) / 2
	return math.Pi / 4 * m * m
}

// unifiedStressDepth is (D − the stress diameter)/P of ASME B1.1's tensile
// stress area: the mean of the pitch diameter and the minor diameter
// D − 1.299038·P, (0.649519 + 1.299038)/2 = 0.9743.
const unifiedStressDepth = 0.9743

// InternalShearArea is the area that shears when the internal thread (the
// nut or tapped hole) strips over an engagement length le: the cylinder at
// the bolt's major diameter, cut where the internal thread's teeth are.
// It is the internal-thread formula of Machinery's Handbook ("Strength of
// screw threads"), A_n = π·n·L_e·D_s·(1/(2n) + 0.57735·(D_s − E_n)), with
// n = 1/P threads per unit length, at basic size: D_s = d and E_n = d2.
func (t Thread) InternalShearArea(le float64) float64 {
	return math.Pi * t.D * le * t.internalToothFraction()
}

// internalToothFraction is the part of the major-diameter cylinder that
// lies in the internal thread's teeth, 1/2 + 0.57735·(d − d2)/P (0.875 for
// the basic profile).
func (t Thread) internalToothFraction() float64 {
	return 0.5 + tan30*(t.D-t.PitchDiameter())/t.Pitch
}

// coarsePitches are the coarse pitches of ISO 261 (from memory), by
// nominal diameter in mm.
var coarsePitches = map[string]float64{
	"2": 0.4, "2.5": 0.45, "3": 0.5, "4": 0.7, "5": 0.8, "6": 1, "8": 1.25, "10": 1.5,
	"12": 1.75, "14": 2, "16": 2, "18": 2.5, "20": 2.5, "22": 2.5, "24": 3,
}

// finePitches are the common fine pitches of ISO 261 (from memory) that the
// table carries, by nominal diameter in mm.
var finePitches = map[string][]float64{
	"8": {1}, "10": {1.25, 1}, "12": {1.5, 1.25}, "14": {1.5}, "16": {1.5},
	"18": {1.5}, "20": {1.5}, "22": {1.5}, "24": {2},
}

// threads is the thread table, in order of diameter, coarse before fine
// and fine pitches from coarse to fine.
var threads = buildThreads()

func buildThreads() []Thread {
	sizes := make([]string, 0, len(coarsePitches))
	for d := range coarsePitches {
		sizes = append(sizes, d)
	}
	mm := func(s string) float64 {
		v, _ := strconv.ParseFloat(s, 64)
		return v
	}
	sort.Slice(sizes, func(i, j int) bool { return mm(sizes[i]) < mm(sizes[j]) })
	var out []Thread
	for _, d := range sizes {
		out = append(out, Thread{Name: "M" + d, D: mm(d) / 1e3, Pitch: coarsePitches[d] / 1e3})
		for _, p := range finePitches[d] {
			out = append(out, Thread{Name: "M" + d + "x" + strconv.FormatFloat(p, 'f', -1, 64), D: mm(d) / 1e3, Pitch: p / 1e3, Fine: true})
		}
	}
	for _, u := range unifiedSizes {
		for _, series := range []struct {
			name string
			tpi  float64
		}{{"UNC", u.unc}, {"UNF", u.unf}} {
			out = append(out, Thread{Name: u.size + "-" + strconv.FormatFloat(series.tpi, 'f', -1, 64), D: u.d * inch,
				Pitch: inch / series.tpi, Fine: series.name == "UNF", Series: series.name})
		}
	}
	return out
}

// inch is the inch in metres (exact).
const inch = 0.0254

// unifiedSizes are the Unified sizes from #4 to 1 in of ASME B1.1 (from
// memory): the size as written, its basic major diameter in inches
// (0.060 + 0.013·N for the number sizes) and the threads per inch of its
// coarse (UNC) and fine (UNF) series.
var unifiedSizes = []struct {
	size     string
	d        float64
	unc, unf float64
}{
	{"#4", 0.112, 40, 48}, {"#5", 0.125, 40, 44}, {"#6", 0.138, 32, 40}, {"#8", 0.164, 32, 36},
	{"#10", 0.190, 24, 32}, {"#12", 0.216, 24, 28}, {"1/4", 0.25, 20, 28}, {"5/16", 0.3125, 18, 24},
	{"3/8", 0.375, 16, 24}, {"7/16", 0.4375, 14, 20}, {"1/2", 0.5, 13, 20}, {"9/16", 0.5625, 12, 18},
	{"5/8", 0.625, 11, 18}, {"3/4", 0.75, 10, 16}, {"7/8", 0.875, 9, 14}, {"1", 1, 8, 12},
}

// ThreadNames lists the designations of the thread table: the metric
// threads by diameter, then the Unified ones.
func ThreadNames() []string {
	return append(threadNames(false), threadNames(true)...)
}

// threadNames lists the designations of the metric or the Unified threads.
func threadNames(unified bool) []string {
	var names []string
	for _, t := range threads {
		if t.Unified() == unified {
			names = append(names, t.Name)
		}
	}
	return names
}

// LookupThread returns the thread of the table named name: "M8" (coarse),
// "M8x1" (fine). A designation with the same diameter and pitch in other
// digits is the same thread: "M8x1.25" is M8, "M8x1.0" is M8x1, "M8.0" is
// M8. Numbers are plain decimals: exponents ("M1e1"), signs ("M+8"),
// leading zeros ("M08") and a dangling "x" or "." are refused, since
// strconv would read them as a size the writer may not have meant.
// Anything else is an error that suggests the nearest designations and
// lists the table.
func LookupThread(name string) (Thread, error) {
	if d, p, ok := parseDesignation(name); ok {
		for _, t := range threads {
			if !t.Unified() && sameMM(t.D, d) && (p == 0 && !t.Fine || sameMM(t.Pitch, p)) {
				return t, nil
			}
		}
	}
	if looksUnified(name) {
		return lookupUnified(name)
	}
	list := "ISO metric threads: " + strings.Join(threadNames(false), ", ")
	if why, guess := designationFault(name); why != "" {
		msg := fmt.Sprintf("%q is not an ISO 261 designation: %s; write M, the nominal diameter in mm and, for a fine thread, \"x\" and the pitch in mm, in plain decimals", name, why)
		// An exponent or a bare point hides the size meant; a guess would mislead.
		if s := suggestThreads(name); len(s) > 0 && guess {
			return Thread{}, fmt.Errorf("%s; did you mean %s? (%s)", msg, quoteOr(s), list)
		}
		return Thread{}, fmt.Errorf("%s, as \"M8\" or \"M8x1\" (%s)", msg, list)
	}
	if s := suggestThreads(name); len(s) > 0 {
		return Thread{}, fmt.Errorf("%q is not known; did you mean %s? (%s)", name, quoteOr(s), list)
	}
	if !strings.HasPrefix(strings.ToUpper(strings.TrimSpace(name)), "M") {
		list += "; Unified threads: " + strings.Join(threadNames(true), ", ")
		return Thread{}, fmt.Errorf("%q is not known; write a metric thread as \"M8\" (coarse) or \"M8x1\" (fine), a Unified one as \"1/4-20\" (%s)", name, list)
	}
	return Thread{}, fmt.Errorf("%q is not known; write a coarse thread as \"M8\" or a fine one as \"M8x1\" (%s)", name, list)
}

// unifiedDesignation is a Unified designation: an optional "#" or "No.",
// the size (a number size, a fraction or a whole inch), a hyphen, the
// threads per inch, and optionally the series.
var unifiedDesignation = regexp.MustCompile(`(?i)^(?:#|no\.?)?([0-9]+(?:/[0-9]+)?)-([0-9]+)-?(UNC|UNF)?$`)

// looksUnified reports whether name is written as an inch thread: with a
// fraction, a "#", a hyphen after a leading number, or a series.
func looksUnified(name string) bool {
	n := strings.ToUpper(name)
	return strings.ContainsAny(n, "/#") || strings.Contains(n, "UNC") || strings.Contains(n, "UNF") ||
		strings.HasPrefix(n, "NO") || leadingNumberHyphen.MatchString(n)
}

// leadingNumberHyphen matches a designation that starts "10-" or "1 -".
var leadingNumberHyphen = regexp.MustCompile(`^[0-9]+ ?-`)

// lookupUnified returns the Unified thread name designates, or an error
// that suggests Unified threads only: the series of the same size, or the
// sizes on either side.
func lookupUnified(name string) (Thread, error) {
	list := "Unified threads, ASME B1.1: " + strings.Join(threadNames(true), ", ")
	m := unifiedDesignation.FindStringSubmatch(strings.ReplaceAll(strings.TrimSpace(name), " ", ""))
	if m == nil {
		return Thread{}, fmt.Errorf("%q is not a Unified designation; write the size, a hyphen and the threads per inch, as \"1/4-20\" or \"#10-32\", optionally with the series (\"1/4-20 UNC\") (%s)", name, list)
	}
	size := m[1]
	if !strings.Contains(size, "/") && size != "1" {
		size = "#" + size
	}
	tpi, series := m[2], strings.ToUpper(m[3])
	var same []string
	for _, t := range threads {
		if !t.Unified() || !strings.HasPrefix(t.Name, size+"-") {
			continue
		}
		if t.Name == size+"-"+tpi {
			if series != "" && series != t.Series {
				return Thread{}, fmt.Errorf("%q: %s is the %s series, not %s (%s)", name, t.Name, t.Series, series, list)
			}
			return t, nil
		}
		same = append(same, t.Name)
	}
	if len(same) > 0 {
		return Thread{}, fmt.Errorf("%q is not known; did you mean %s? (%s)", name, quoteOr(same), list)
	}
	if near := nearUnified(size); len(near) > 0 {
		return Thread{}, fmt.Errorf("%q is not known; did you mean %s? (%s)", name, quoteOr(near), list)
	}
	return Thread{}, fmt.Errorf("%q is not known (%s)", name, list)
}

// nearUnified lists the coarse threads of the Unified sizes on either side
// of size ("3/16", "#7"), or none when size is no size.
func nearUnified(size string) []string {
	var d float64
	if num, ok := strings.CutPrefix(size, "#"); ok {
		n, err := strconv.Atoi(num)
		if err != nil {
			return nil
		}
		d = 0.060 + 0.013*float64(n)
	} else {
		a, b, isFraction := strings.Cut(size, "/")
		x, errA := strconv.ParseFloat(a, 64)
		y, errB := strconv.ParseFloat(b, 64)
		switch {
		case !isFraction:
			d = x
		case errA != nil || errB != nil || y == 0:
			return nil
		default:
			d = x / y
		}
	}
	var below, above string
	for _, u := range unifiedSizes {
		name := u.size + "-" + strconv.FormatFloat(u.unc, 'f', -1, 64)
		switch {
		case u.d < d:
			below = name
		case above == "":
			above = name
		}
	}
	var near []string
	for _, n := range []string{below, above} {
		if n != "" {
			near = append(near, n)
		}
	}
	return near
}

// sameMM reports whether a length in metres is v millimetres, to a
// thousandth of a micrometre.
func sameMM(m, v float64) bool { return math.Abs(m*1e3-v) < 1e-6 }

// designation is the form of an ISO 261 designation: M, the diameter and
// an optional "x" and pitch, both plain decimals without leading zeros.
var designation = regexp.MustCompile(`^M((?:0|[1-9][0-9]*)(?:\.[0-9]+)?)(?:x((?:0|[1-9][0-9]*)(?:\.[0-9]+)?))?$`)

// parseDesignation reads "M10x1.25" as 10 and 1.25 (mm; pitch 0 when not
// written); ok is false when name is not of that form.
func parseDesignation(name string) (d, p float64, ok bool) {
	m := designation.FindStringSubmatch(name)
	if m == nil {
		return 0, 0, false
	}
	d, err := strconv.ParseFloat(m[1], 64)
	if err != nil || !(d > 0 && d < 1e4) {
		return 0, 0, false
	}
	if m[2] != "" {
		if p, err = strconv.ParseFloat(m[2], 64); err != nil || !(p > 0 && p < d) {
			return 0, 0, false
		}
	}
	return d, p, true
}

// designationFault names what makes an M-designation's numbers unreadable
// ("" when nothing of the kinds users write by mistake), and whether
// tidyDesignation can guess the size meant.
func designationFault(name string) (why string, guess bool) {
	rest, ok := strings.CutPrefix(name, "M")
	if !ok || designation.MatchString(name) {
		return "", false
	}
	switch {
	case exponent.MatchString(rest):
		return "an exponent is not a size", false
	case strings.ContainsAny(rest, "+-"):
		return "a size has no sign", true
	case strings.HasPrefix(rest, ".") || strings.Contains(rest, "x."):
		return "a size starts with a digit, as 0.8", false
	case leadingZero.MatchString(rest):
		return "a size has no leading zero", true
	case strings.HasSuffix(rest, "x") || strings.HasSuffix(rest, "."):
		return "the designation ends in \"" + rest[len(rest)-1:] + "\"", true
	}
	return "", false
}

// exponent matches a number in exponent form: "1e1", "1.25E-3".
var exponent = regexp.MustCompile(`[0-9.][eE][+-]?[0-9]`)

// leadingZero matches a number written with a leading zero: "08", "x01".
var leadingZero = regexp.MustCompile(`(^|[^0-9.])0+([0-9])`)

// tidyDesignation drops what designationFault can guess past: signs,
// leading zeros and a dangling "x" or ".", for suggestions.
func tidyDesignation(s string) string {
	s = strings.NewReplacer("+", "", "-", "").Replace(s)
	s = leadingZero.ReplaceAllString(s, "${1}${2}")
	return strings.TrimRight(s, "x.")
}

// suggestThreads proposes designations for a name that is not in the
// table: the same one written in the table's style ("m8" → "M8"), the
// threads of the same diameter (another pitch), or the sizes on either
// side of a diameter the table lacks.
func suggestThreads(name string) []string {
	norm := strings.NewReplacer(" ", "", "×", "x", "X", "x", ",", ".").Replace(strings.TrimSpace(name))
	if strings.HasPrefix(norm, "m") {
		norm = "M" + norm[1:]
	}
	norm = tidyDesignation(norm)
	if norm != name {
		if t, err := LookupThread(norm); err == nil {
			return []string{t.Name}
		}
	}
	d, _, ok := parseDesignation(norm)
	if !ok {
		if s := calc.Suggest(name, threadNames(false)); s != "" {
			return []string{s}
		}
		return nil
	}
	var same []string
	var below, above *Thread
	for i, t := range threads {
		switch {
		case t.Unified():
		case sameMM(t.D, d):
			same = append(same, t.Name)
		case t.Fine:
		case t.D*1e3 < d:
			below = &threads[i]
		case above == nil:
			above = &threads[i]
		}
	}
	if len(same) > 0 {
		return same
	}
	var near []string
	for _, t := range []*Thread{below, above} {
		if t != nil {
			near = append(near, t.Name)
		}
	}
	return near
}

// quoteOr joins quoted names with commas and a final "or".
func quoteOr(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = strconv.Quote(n)
	}
	if len(q) == 1 {
		return q[0]
	}
	return strings.Join(q[:len(q)-1], ", ") + " or " + q[len(q)-1]
}
