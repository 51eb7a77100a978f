package units

import "testing"

func BenchmarkParse(b *testing.B) {
	inputs := []struct {
		text string
		dim  Dimension
	}{{"32 mm", Length}, {"6 bar(g)", Pressure}, {"20 °C", Temperature}, {"1.8 cm3", Volume}, {"5 N·m", Torque}}
	for i := 0; b.Loop(); i++ {
		in := inputs[i%len(inputs)]
		if _, err := Parse(in.text, in.dim); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkFormat(b *testing.B) {
	values := []float64{19.7, 0.000123, 1230000, 20, 1.23e-9, -273.15}
	for i := 0; b.Loop(); i++ {
		if Format(values[i%len(values)], 3) == "" {
			b.Fatal("empty")
		}
	}
}
