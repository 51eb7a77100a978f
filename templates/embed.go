// Package templates holds the default page layouts and stylesheet, embedded
// into the specgen binary. A site's own templates/ folder overrides them
// file by file.
package templates

import "embed"

// FS holds the page templates (*.html; names starting with "_" are
// partials) and assets/ (copied to the output's assets/ folder).
//
//go:embed *.html assets
var FS embed.FS
