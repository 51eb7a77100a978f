package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"unicode"

	"github.com/chromedp/chromedp"

	"github.com/millrace-workshop/specgen/internal/display"
	"github.com/millrace-workshop/specgen/internal/site"
)

// demoPages lists the output page of every page of the demo site, so that a
// new page is checked too.
func demoPages(t *testing.T) []string {
	t.Helper()
	var pages []string
	content := filepath.Join("..", "..", "content")
	err := filepath.WalkDir(content, func(p string, d os.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(p, ".md") {
			rel, _ := filepath.Rel(content, p)
			pages = append(pages, strings.TrimSuffix(filepath.ToSlash(rel), ".md")+".html")
		}
		return err
	})
	if err != nil || len(pages) < 10 {
		t.Fatalf("demo pages: %v (%d found)", err, len(pages))
	}
	return pages
}

// phoneScript measures a page as a phone shows it: where its first
// paragraph starts, whether the site navigation and the page's contents
// are folded away, whether the path to the page shows, and the smallest
// text of the charts on screen, in CSS pixels.
const phoneScript = `(() => {
  const first = document.querySelector(".sg-body > p");
  const shown = el => !!el && el.checkVisibility();
  let smallest = 1e9, charts = 0;
  for (const svg of document.querySelectorAll("svg.sg-chart-svg")) {
    if (!shown(svg)) continue;
    charts++;
    const scale = svg.getBoundingClientRect().width / svg.viewBox.baseVal.width;
    for (const t of svg.querySelectorAll("text")) smallest = Math.min(smallest, parseFloat(t.getAttribute("font-size")) * scale);
  }
  return {
    first: first ? first.getBoundingClientRect().top + window.scrollY : -1,
    open: document.querySelectorAll("details.sg-fold[open]").length,
    navShown: shown(document.querySelector(".sg-nav li a")),
    tocShown: shown(document.querySelector(".sg-toc li a")),
    crumbs: !document.querySelector(".sg-crumbs") || shown(document.querySelector(".sg-crumbs li:last-child")),
    charts: charts,
    smallest: smallest,
  };
})()`

type phoneView struct {
	First    float64 `json:"first"`
	Open     int     `json:"open"`
	NavShown bool    `json:"navShown"`
	TOCShown bool    `json:"tocShown"`
	Crumbs   bool    `json:"crumbs"`
	Charts   int     `json:"charts"`
	Smallest float64 `json:"smallest"`
}

// TestBrowserPhone opens every demo page on a 375 × 844 px phone: the
// first paragraph starts on the first screen, the site navigation and the
// page's contents are closed disclosure elements that open with a tap (no
// script), the path to the page shows, and chart text is 12 px or more.
// On a desk the same elements show their lists.
func TestBrowserPhone(t *testing.T) {
	ctx, problems := browser(t)
	base := previewDemo(t, filepath.Join("..", ".."))
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(375, 844)); err != nil {
		t.Fatal(err)
	}
	charts := 0
	for _, page := range demoPages(t) {
		if err := chromedp.Do(ctx, chromedp.Navigate(base+page), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
			t.Fatalf("%s: %v", page, err)
		}
		v, err := chromedp.Run(ctx, chromedp.Evaluate[phoneView](phoneScript))
		if err != nil {
			t.Fatalf("%s: %v", page, err)
		}
		t.Logf("%s: first paragraph at %.0f px", page, v.First)
		switch {
		case v.First < 0:
			t.Errorf("%s: no paragraph in the page body", page)
		case v.First > 844-24:
			t.Errorf("%s: the first paragraph starts %.0f px down, below the first 844 px screen", page, v.First)
		}
		if v.Open != 0 || v.NavShown || v.TOCShown {
			t.Errorf("%s: navigation and contents are not folded away on a phone: %+v", page, v)
		}
		if !v.Crumbs {
			t.Errorf("%s: the path to the page is hidden on a phone", page)
		}
		if v.Charts > 0 && v.Smallest < 12-0.05 {
			t.Errorf("%s: chart text %.1f px on a phone, want 12 px or more", page, v.Smallest)
		}
		charts += v.Charts
	}
	if charts == 0 {
		t.Error("no chart shown on a phone")
	}

	// A tap opens the navigation, without script.
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"compressor/calculations.html"), chromedp.WaitReady(chromedp.CSS("body")),
		chromedp.Click(chromedp.CSS(".sg-nav summary")), chromedp.WaitVisible(chromedp.CSS(`.sg-nav a[aria-current="page"]`))); err != nil {
		t.Errorf("the navigation does not open: %v", err)
	}

	// On a desk the lists show, though the elements are closed.
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(1300, 900), chromedp.Navigate(base+"compressor/calculations.html"), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
		t.Fatal(err)
	}
	v, err := chromedp.Run(ctx, chromedp.Evaluate[phoneView](phoneScript))
	if err != nil {
		t.Fatal(err)
	}
	if !v.NavShown || !v.TOCShown {
		t.Errorf("on a desk the navigation or contents are hidden: %+v", v)
	}
	if v.Charts == 0 || v.Smallest < 10-0.05 {
		t.Errorf("chart text %.1f px on a desk, want 10 px or more", v.Smallest)
	}
	for _, p := range problems() {
		t.Errorf("%s", p)
	}
}

// TestBrowserPrintCalculations prints the stage-calculations page to A4:
// at most ten pages, holding every result's formula and substituted
// figures (the working is printed in full), read back with pdftotext.
func TestBrowserPrintCalculations(t *testing.T) {
	pdftotext, err := exec.LookPath("pdftotext")
	if err != nil {
		if os.Getenv("SPECGEN_REQUIRE_BROWSER") != "" {
			t.Fatal("no pdftotext on PATH (apt-get install poppler-utils), and SPECGEN_REQUIRE_BROWSER is set")
		}
		t.Skip("no pdftotext on PATH: print test skipped (apt-get install poppler-utils)")
	}
	ctx, problems := browser(t)
	root := filepath.Join("..", "..")
	base := previewDemo(t, root)
	const page = "compressor/calculations.html"
	if err := chromedp.Do(ctx, chromedp.Navigate(base+page), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
		t.Fatal(err)
	}
	pdf, err := chromedp.Run(ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4), chromedp.PDFPreferCSSPageSize()))
	if err != nil {
		t.Fatal(err)
	}
	pages := len(regexp.MustCompile(`/Type\s*/Page[^s]`).FindAll(pdf, -1))
	t.Logf("%s prints to %d A4 pages", page, pages)
	if pages < 1 || pages > 10 {
		t.Errorf("%s prints to %d A4 pages, want at most 10", page, pages)
	}
	file := filepath.Join(t.TempDir(), "calculations.pdf")
	if err := os.WriteFile(file, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	// -raw keeps each column's words in the order they were drawn.
	text, err := exec.Command(pdftotext, "-raw", file, "-").Output()
	if err != nil {
		t.Fatal(err)
	}
	squeeze := func(s string) string {
		return strings.Map(func(r rune) rune {
			if unicode.IsSpace(r) {
				return -1
			}
			return r
		}, s)
	}
	printed := squeeze(string(text))
	s, err := site.Load(root)
	if err != nil {
		t.Fatal(err)
	}
	formulas := 0
	for _, e := range s.Calc.Blocks {
		if e.Block.File != "content/compressor/calculations.md" {
			continue
		}
		for _, r := range e.Results {
			if r.Trace.Formula == "" {
				continue
			}
			formulas++
			if working := squeeze(display.Minus(r.Trace.Formula + r.Trace.Substituted)); !strings.Contains(printed, working) {
				t.Errorf("the printed page lacks the working of %s.%s: %s %s", e.Block.ID, r.Name, r.Trace.Formula, r.Trace.Substituted)
			}
		}
	}
	if formulas < 40 {
		t.Errorf("only %d formulas on the page; the test reads the wrong page", formulas)
	}
	for _, p := range problems() {
		t.Errorf("%s", p)
	}
}
