// Package templates holds the default page layouts and stylesheet, embedded
// into the specgen binary. A site's own templates/ folder overrides them
// file by file.
package templates

import "embed"

// FS holds the page templates (*.html; names starting with "_" are
// partials), assets/ (copied to the output's assets/ folder) and starter/
// (the new site that specgen init writes).
//
//go:embed *.html assets starter
var FS embed.FS
