// Package models holds the engineering of specgen: one file per kind of
// calculation block (its inputs with defaults and ranges, its results, the
// model written out for `specgen explain`, its formulas with their working,
// its charts beside it), the cylinder and gas pieces several kinds share,
// the materials and thread tables, and the caution rules with their
// thresholds. NewCatalog hands all of it to the engine in internal/calc.
//
// A new kind is one file here and one line in kinds.go; it declares its
// roles (calc.Role) so that the rules and the site treat it rightly without
// naming it.
package models
