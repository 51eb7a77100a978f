// Package units parses, converts and formats engineering quantities.
//
// A quantity is written as a number and a unit, "32 mm", "6 bar(g)",
// "20 degC", and is read as a Dimension chosen by the caller, which settles
// what the unit alone leaves open: a pressure unit read as a Stress takes no
// gauge or absolute mark, and a temperature read as a TemperatureDifference
// has no offset. Values are held in SI units; pressures keep the reference
// they were written in (plain units read gauge) until Quantity.Absolute adds
// the ambient pressure. Conversion factors follow NIST SP 811 (2008),
// Appendix B, built from the exact definitions of the inch, the pound and
// standard gravity.
//
// Format writes numbers to a given count of significant figures for tables
// and prose. The package knows nothing of the machines it measures.
package units
