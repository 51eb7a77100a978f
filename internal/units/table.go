package units

import "math"

// Exact definitions (NIST SP 811 (2008) App. B, quoted from memory).
const (
	inch       = 0.0254     // m, exact
	foot       = 0.3048     // m, exact
	pound      = 0.45359237 // kg (avoirdupois), exact
	gravity    = 9.80665    // m/s2, standard acceleration of gravity, exact
	poundF     = pound * gravity
	psi        = poundF / (inch * inch)
	atm        = 101325.0 // Pa, exact
	torr       = atm / 760
	mercury    = 13595.1 // kg/m3, conventional density of mercury
	inHg       = mercury * gravity * inch
	mmHg       = mercury * gravity * 1e-3
	horse      = 550 * foot * poundF // W, the mechanical horsepower, 550 ft·lbf/s
	celsius0   = 273.15              // K at 0 degC
	rankine    = 5.0 / 9             // K per degF
	fahrenh0   = 459.67 * rankine    // K at 0 degF
	gallon     = 231 * inch * inch * inch
	revolution = 2 * math.Pi // rad
)

// Reference states of flows of standard and normal air (quoted from
// memory): the ISO 8778 standard reference atmosphere (ANR), dry air at
// 100 kPa absolute and 20 °C, which ISO 1217 takes for standard flows and
// SCFM follows; DIN 1343 normal conditions, 0 °C and 101.325 kPa, for
// Nl/min and Nm3/h. Humidity is not modelled: flows convert as dry air, by
// mass.
var (
	iso8778 = GasState{Pressure: 100e3, Temperature: celsius0 + 20}
	din1343 = GasState{Pressure: atm, Temperature: celsius0}
)

// freeAirTemperature is the temperature at which a standard flow is read
// as free air where no block says otherwise: 20 °C, a workshop's air
// (common practice).
const freeAirTemperature = celsius0 + 20

// unitDef is one row of the unit table: a canonical symbol and the other
// spellings (already in normalized form) that mean the same unit.
type unitDef struct {
	Unit
	aliases []string
}

// standardDef makes the row of a flow of air measured at the reference state ref.
func standardDef(sym string, factor float64, ref GasState, aliases ...string) unitDef {
	return unitDef{Unit{Symbol: sym, Dim: VolumeFlow, Factor: factor, Reference: ref}, aliases}
}

// vacuumDef makes the row of a vacuum gauge's unit: gauge, read downward.
func vacuumDef(sym string, factor float64, aliases ...string) unitDef {
	return unitDef{Unit{Symbol: sym, Dim: Pressure, Factor: -factor, Ref: Gauge}, aliases}
}

// def makes a table row for a unit without offset or pressure mark.
func def(sym string, dim Dimension, factor float64, aliases ...string) unitDef {
	return unitDef{Unit{Symbol: sym, Dim: dim, Factor: factor}, aliases}
}

// pressureDefs makes the plain, gauge and absolute rows of a pressure unit.
// Extra spellings of the marked forms ("psig", "barg") are given in g and a.
func pressureDefs(sym string, factor float64, plain, g, a []string) []unitDef {
	return []unitDef{
		{Unit{Symbol: sym, Dim: Pressure, Factor: factor, Ref: Unmarked}, plain},
		{Unit{Symbol: sym + "(g)", Dim: Pressure, Factor: factor, Ref: Gauge}, g},
		{Unit{Symbol: sym + "(a)", Dim: Pressure, Factor: factor, Ref: Absolute}, a},
	}
}

// unitTable lists every unit that LookupUnit knows, canonical symbol first.
var unitTable = joinDefs(
	[]unitDef{
		def("", Dimensionless, 1),
		def("%", Dimensionless, 0.01),

		def("um", Length, 1e-6),
		def("mm", Length, 1e-3),
		def("cm", Length, 1e-2),
		def("m", Length, 1),
		def("in", Length, inch, "in.", "inch", "inches", `"`, "″"),
		def("ft", Length, foot),

		def("mm2", Area, 1e-6),
		def("cm2", Area, 1e-4),
		def("m2", Area, 1),
		def("in2", Area, inch*inch),
		def("ft2", Area, foot*foot),

		def("mm3", Volume, 1e-9),
		def("cm3", Volume, 1e-6, "cc", "mL", "ml"),
		def("L", Volume, 1e-3, "l", "litre", "liter", "litres", "liters", "dm3"),
		def("m3", Volume, 1),
		def("in3", Volume, inch*inch*inch, "cu in"),
		def("ft3", Volume, foot*foot*foot, "cu ft"),
		def("gal", Volume, gallon, "gallon", "gallons", "US gal", "US gallon"), // US liquid gallon, 231 in3

		def("cm3/s", VolumeFlow, 1e-6, "cc/s", "mL/s", "ml/s"),
		def("L/min", VolumeFlow, 1e-3/60, "l/min", "lpm", "LPM"),
		def("L/s", VolumeFlow, 1e-3, "l/s"),
		def("m3/h", VolumeFlow, 1.0/3600),
		def("m3/min", VolumeFlow, 1.0/60),
		def("m3/s", VolumeFlow, 1),
		def("cfm", VolumeFlow, foot*foot*foot/60, "ft3/min", "CFM"),

		// Flows of standard and normal air (see iso8778).
		standardDef("SCFM", foot*foot*foot/60, iso8778, "scfm"),
		standardDef("l/min ANR", 1e-3/60, iso8778, "L/min ANR", "l/min(ANR)", "L/min(ANR)"),
		standardDef("Nl/min", 1e-3/60, din1343, "NL/min", "SLPM", "slpm"),
		standardDef("Nm3/h", 1.0/3600, din1343),

		// Gas throughput, as leaks and vacuum pumps are rated.
		def("Pa m3/s", Throughput, 1),
		def("mbar L/s", Throughput, 100*1e-3, "mbar l/s"),
		def("Torr L/s", Throughput, torr*1e-3, "Torr l/s", "torr L/s", "torr l/s"),
	},
	// Pressures. A plain unit reads gauge (specgen's convention for the
	// workshop habit of reading the dial); marks make it explicit.
	pressureDefs("Pa", 1, []string{"N/m2"}, nil, nil),
	// hPa is absolute in weather reports and gauge on some dials: unsettled.
	[]unitDef{
		{Unit{Symbol: "hPa", Dim: Pressure, Factor: 100, Ref: Unsettled}, nil},
		{Unit{Symbol: "hPa(g)", Dim: Pressure, Factor: 100, Ref: Gauge}, nil},
		{Unit{Symbol: "hPa(a)", Dim: Pressure, Factor: 100, Ref: Absolute}, nil},
	},
	pressureDefs("kPa", 1e3, nil, []string{"kPag"}, []string{"kPaa"}),
	pressureDefs("MPa", 1e6, nil, nil, nil),
	pressureDefs("bar", 1e5, nil, []string{"barg"}, []string{"bara"}),
	pressureDefs("mbar", 100, nil, []string{"mbarg"}, []string{"mbara"}),
	pressureDefs("psi", psi, []string{"PSI", "lbf/in2"}, []string{"psig", "PSIG"}, []string{"psia", "PSIA"}),
	pressureDefs("inHg", inHg, nil, nil, nil),
	pressureDefs("mmHg", mmHg, nil, nil, nil),
	// A vacuum gauge reads down from ambient: "25 inHg vac" is 25 inHg below it.
	[]unitDef{vacuumDef("inHg vac", inHg, "inHgV", "inHg(v)"), vacuumDef("mmHg vac", mmHg, "mmHgV", "mmHg(v)")},
	[]unitDef{
		def("ksi", Pressure, 1000*psi),
		// The standard atmosphere is absolute by definition.
		{Unit{Symbol: "atm", Dim: Pressure, Factor: atm, Ref: Absolute}, nil},
		// The torr is a vacuum unit, read from zero: absolute.
		{Unit{Symbol: "torr", Dim: Pressure, Factor: torr, Ref: Absolute}, []string{"Torr"}},

		// Pressure differences carry their own mark so that they are never
		// read back as gauge; psid is the trade's spelling, the others follow it.
		def("Pa(d)", PressureDifference, 1),
		def("kPa(d)", PressureDifference, 1e3),
		def("MPa(d)", PressureDifference, 1e6),
		def("bar(d)", PressureDifference, 1e5),
		def("mbar(d)", PressureDifference, 100),
		def("psi(d)", PressureDifference, psi, "psid", "PSID"),

		// Stress-only units; read as a pressure they are plain (gauge).
		def("N/mm2", Stress, 1e6),
		def("GPa", Stress, 1e9),

		def("K", Temperature, 1),
		{Unit{Symbol: "degC", Dim: Temperature, Factor: 1, Offset: celsius0}, []string{"deg C"}},
		{Unit{Symbol: "degF", Dim: Temperature, Factor: rankine, Offset: fahrenh0}, []string{"deg F"}},
		def("degR", Temperature, rankine, "deg R"),

		// min⁻¹ is the rotational speed of European nameplates (DIN 1301).
		def("rpm", RotationalSpeed, revolution/60, "r/min", "rev/min", "RPM", "1/min", "min 1"),
		def("rev/s", RotationalSpeed, revolution, "r/s"),
		// A rotational frequency: one revolution per second.
		def("Hz", RotationalSpeed, revolution),
		def("rad/s", RotationalSpeed, 1),

		def("rad", Angle, 1),
		def("deg", Angle, math.Pi/180),

		def("N", Force, 1),
		def("kN", Force, 1e3),
		def("lbf", Force, poundF),
		def("kgf", Force, gravity),

		def("N m", Torque, 1, "Nm", "N.m"),
		def("N mm", Torque, 1e-3, "Nmm"),
		def("kN m", Torque, 1e3, "kNm"),
		// "ft lbf", "ft-lb" and the like read as a torque or an energy as the
		// key needs (ambiguous, below).
		def("lbf in", Torque, poundF*inch),
		def("lbf ft", Torque, poundF*foot),

		def("W", Power, 1),
		def("kW", Power, 1e3),
		def("hp", Power, horse, "HP"), // mechanical horsepower, 745.6999 W

		def("J", Energy, 1),
		def("kJ", Energy, 1e3),
		def("MJ", Energy, 1e6),
		def("Wh", Energy, 3600, "W h"),
		def("kWh", Energy, 3.6e6, "kW h"),
		def("ft lbf", Energy, poundF*foot),
		def("in lbf", Energy, poundF*inch),

		def("g", Mass, 1e-3),
		def("kg", Mass, 1),
		def("lb", Mass, pound, "lbm"),

		def("kg/m3", Density, 1),
		def("g/cm3", Density, 1e3, "g/cc", "g/mL", "g/ml"),
		def("lb/ft3", Density, pound/(foot*foot*foot)),
		def("lb/in3", Density, pound/(inch*inch*inch)),

		def("N/mm", Stiffness, 1e3),
		def("N/m", Stiffness, 1),
		def("kN/m", Stiffness, 1e3),
		def("lbf/in", Stiffness, poundF/inch),

		def("ms", Time, 1e-3),
		def("s", Time, 1),
		def("min", Time, 60),
		def("h", Time, 3600, "hr"),

		def("mm/s", Velocity, 1e-3),
		def("m/s", Velocity, 1),
		def("m/min", Velocity, 1.0/60),
		def("ft/min", Velocity, foot/60, "fpm"),
		def("ft/s", Velocity, foot),

		def("m/s2", Acceleration, 1),
		def("ft/s2", Acceleration, foot),

		def("g/s", MassFlow, 1e-3),
		def("kg/s", MassFlow, 1),
		def("kg/h", MassFlow, 1.0/3600),
		def("lb/h", MassFlow, pound/3600),

		def("J/kg", SpecificEnergy, 1),
		def("kJ/kg", SpecificEnergy, 1e3),

		def("J/m3", EnergyPerVolume, 1),
		def("kJ/m3", EnergyPerVolume, 1e3),
		def("J/L", EnergyPerVolume, 1e3, "J/l"),
		def("kWh/m3", EnergyPerVolume, 3.6e6),

		def("kg m2", Inertia, 1, "kgm2"),
		def("kg mm2", Inertia, 1e-6),
		def("g cm2", Inertia, 1e-7),
		def("lb ft2", Inertia, pound*foot*foot),
		def("lb in2", Inertia, pound*inch*inch),

		// Shaft power per unit of free air delivered; kW/(m3/min) and
		// W/(L/min) are the same size.
		def("W/(m3/s)", SpecificPower, 1),
		def("kW/(m3/min)", SpecificPower, 1e3*60, "kW/m3/min"),
		def("W/(L/min)", SpecificPower, 60/1e-3, "W/L/min"),
		def("hp/cfm", SpecificPower, horse*60/(foot*foot*foot)),
	},
)

// joinDefs concatenates parts of the table.
func joinDefs(parts ...[]unitDef) []unitDef {
	var all []unitDef
	for _, p := range parts {
		all = append(all, p...)
	}
	return all
}

// indexEntry is one accepted spelling, in table order.
type indexEntry struct {
	key  string
	unit Unit
}

// unitSpellings lists every accepted spelling: each canonical symbol, then its aliases.
var unitSpellings = spellings(unitTable)

// unitIndex maps each accepted spelling to its unit.
var unitIndex = index(unitSpellings)

func spellings(defs []unitDef) []indexEntry {
	var out []indexEntry
	for _, d := range defs {
		out = append(out, indexEntry{d.Symbol, d.Unit})
		for _, a := range d.aliases {
			out = append(out, indexEntry{a, d.Unit})
		}
	}
	return out
}

func index(entries []indexEntry) map[string]Unit {
	m := make(map[string]Unit, len(entries))
	for _, e := range entries {
		m[e.key] = e.unit
	}
	return m
}
