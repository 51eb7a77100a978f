// Package preview serves a site from memory while its author edits it: it
// builds the site with package site, rebuilds when a source changes, and
// has open pages reload themselves or show the build's error over the last
// good site.
package preview
