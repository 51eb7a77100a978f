// Package results is the schema of results.json, the machine-readable
// record of every calculation block a build evaluated: its types, writing
// the file block by block from evaluated blocks, and reading one back.
package results
