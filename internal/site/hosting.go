package site

import (
	"bytes"
	"encoding/xml"
	"io"
	"net/url"
	"slices"

	"github.com/millrace-workshop/specgen/internal/render"
)

// The files a build writes for web hosts besides the pages.
const (
	sitemapFile  = "sitemap.xml"
	notFoundFile = "404.html"
	// notFoundLayout lays out the 404 page; a site may replace it.
	notFoundLayout = "_notfound.html"
)

// emitHosting writes what web hosts look for: the search index, the 404
// page (unless the site has its own) and, with a base_url, sitemap.xml
// (unless the site has its own).
func (s *Site) emitHosting(put func(name string, write func(io.Writer) error) error, names *outputNames, entries []render.Packed) error {
	if err := put(searchIndexFile, func(w io.Writer) error { return writeSearchIndex(w, entries) }); err != nil {
		return err
	}
	if _, free := names.take(notFoundFile, "specgen's own "+notFoundFile); free {
		page, err := s.notFoundPage()
		if err != nil {
			return err
		}
		if err := put(notFoundFile, bytesOf(page)); err != nil {
			return err
		}
	}
	if s.Config.BaseURL == "" {
		return nil
	}
	if _, free := names.take(sitemapFile, "specgen's own "+sitemapFile); !free {
		return nil
	}
	return put(sitemapFile, bytesOf(s.sitemap()))
}

// sitemap lists the full address of every page, sorted, in the sitemap
// protocol's XML (sitemaps.org, version 0.9).
func (s *Site) sitemap() []byte {
	outs := make([]string, len(s.Pages))
	for i, p := range s.Pages {
		outs[i] = p.Out
	}
	slices.Sort(outs)
	var b bytes.Buffer
	b.WriteString(xml.Header)
	b.WriteString(`<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">` + "\n")
	for _, out := range outs {
		b.WriteString("  <url><loc>")
		_ = xml.EscapeText(&b, []byte(s.Config.BaseURL+href(out)))
		b.WriteString("</loc></url>\n")
	}
	b.WriteString("</urlset>\n")
	return b.Bytes()
}

// notFoundPage is the page a web host shows for a missing file, at any
// depth of the site (layout _notfound.html). With a base_url its links
// start at the site's root on its host ("/docs/..."), so that they work
// wherever it is shown, and it has the site's navigation; without one they
// are relative, right only in the top folder, so it links the home page
// alone.
func (s *Site) notFoundPage() ([]byte, error) {
	up := ""
	if s.Config.BaseURL != "" {
		base, err := url.Parse(s.Config.BaseURL)
		if err != nil {
			return nil, err
		}
		up = base.Path
	}
	data := PageData{
		Site: s.siteData(up),
		Page: PageInfo{Title: "Page not found", Heading: "Page not found", URL: notFoundFile},
		Root: up,
	}
	if s.Config.BaseURL != "" {
		data.Nav = navFor(s.nav, &Page{Out: notFoundFile, Rel: notFoundFile}, up)
	}
	tpl := s.layouts.set.Lookup(notFoundLayout)
	var buf bytes.Buffer
	if err := tpl.Execute(&buf, data); err != nil {
		return nil, templateError(err, notFoundLayout, "while laying out "+notFoundFile+": ")
	}
	return buf.Bytes(), nil
}
