package units_test

import (
	"fmt"

	"github.com/millrace-workshop/specgen/internal/units"
)

func ExampleParse() {
	q, err := units.Parse("6 bar", units.Pressure)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(q.Value, q.Unit.Ref == units.Unmarked, q.Absolute(101325))

	_, err = units.Parse("28 psi", units.Length)
	fmt.Println(err)
	// Output:
	// 600000 true 701325
	// "28 psi" is a pressure; takes a length (mm, cm, m, in, ft)
}

func ExampleFormat() {
	fmt.Println(units.Format(19.66, 3), units.Format(20, 3), units.Format(0.000123, 3), units.Format(1.23e-9, 3))
	// Output: 19.7 20.0 0.000123 1.23e-9
}

func ExampleFromSI() {
	// 7 bar absolute shown in plain (gauge) bar at standard atmosphere.
	v, err := units.FromSI(700000, units.Pressure, "bar", 101325)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(units.Format(v, 3), units.DefaultUnit(units.Pressure))
	// Output: 5.99 Pa
}
