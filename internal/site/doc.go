// Package site builds a specgen site: it walks content/, reads the site
// configuration, evaluates calculation blocks, lays pages out with the
// templates and writes the output folder.
package site
