package display

import "testing"

// TestWritten: what an author wrote reads in the units' display form with
// typeset signs, and a space before % as before any unit (ISO 80000-1);
// its figures untouched.
func TestWritten(t *testing.T) {
	for in, want := range map[string]string{
		"4.5 cm3":            "4.5 cm³",
		"20 degC":            "20 °C",
		"-20 degC":           "−20 °C",
		"240 g":              "240 g",
		"0.85":               "0.85",
		"2.50 N m":           "2.50 N·m",
		"4.5cm3":             "4.5 cm³",
		"<= 120 degC":        "≤ 120 °C",
		">= 80 L/min":        "≥ 80 L/min",
		"113 cm3 ± 2%":       "113 cm³ ± 2 %",
		"113 cm3 +- 2%":      "113 cm³ ± 2 %",
		"(22.5 +/- 0.5) cm3": "(22.5 ± 0.5) cm³",
		"20 to 25 cm3":       "20 to 25 cm³",
		"-5 to -2 degC":      "−5 to −2 °C",
		"3.21 bar(a) ± 2%":   "3.21 bar(a) ± 2 %",
		"<= 30 psig":         "≤ 30 psig",
		"2e-5 m":             "2e-5 m",
		"stainless-304":      "stainless-304",
		"  12   kg m2  ":     "12 kg·m²",
		"≥ 0.9":              "≥ 0.9",
	} {
		if got := Written(in); got != want {
			t.Errorf("Written(%q) = %q, want %q", in, got, want)
		}
	}
}

func TestMinus(t *testing.T) {
	for in, want := range map[string]string{
		"-3.2 °C":                      "−3.2 °C",
		"9.05 mbar(a) · -1010 mbar(g)": "9.05 mbar(a) · −1010 mbar(g)",
		"(-0.5)":                       "(−0.5)",
		"1.2e-5":                       "1.2e-5",
		"high-pressure":                "high-pressure",
		"x = -.5":                      "x = −.5",
	} {
		if got := Minus(in); got != want {
			t.Errorf("Minus(%q) = %q, want %q", in, got, want)
		}
	}
}
