// Package calc is the calculation engine: it decodes calculation blocks
// (TOML inside a Markdown fence) and validates their inputs, orders the
// blocks of a site by their references to each other, evaluates them with
// the models a Catalog holds, checks the claims that the prose makes, and
// runs the caution rules over the results. It knows nothing of any
// particular kind, of HTML or of files: the models arrive as data
// (internal/models builds the Catalog), and a kind's roles, not its name,
// tell the engine and the rules what its blocks are.
package calc
