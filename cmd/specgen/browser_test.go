package main

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// chromium finds Debian's headless browser; the browser tests skip without
// it (.ci/run installs it).
func chromium(t *testing.T) string {
	for _, name := range []string{"chromium", "chromium-browser", "google-chrome"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("SPECGEN_REQUIRE_BROWSER") != "" {
		t.Fatal("no chromium on PATH, and SPECGEN_REQUIRE_BROWSER is set")
	}
	t.Skip("no chromium on PATH: browser tests skipped (apt-get install chromium)")
	return ""
}

// browser starts headless Chromium and returns a context for it, with the
// console errors, exceptions and failed loads it sees.
func browser(t *testing.T) (context.Context, func() []string) {
	exe := chromium(t)
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(exe),
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1280, 900),
	)
	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelCtx := chromedp.NewContext(alloc)
	ctx, cancelTimeout := context.WithTimeout(ctx, 90*time.Second)
	t.Cleanup(func() { cancelTimeout(); cancelCtx(); cancelAlloc() })
	if err := chromedp.Do(ctx); err != nil { // start the browser
		t.Fatal(err)
	}
	var mu sync.Mutex
	var problems []string
	messages := chromedp.Console(ctx)
	go func() {
		for m, err := range messages {
			if err != nil {
				return
			}
			if m.Type == chromedp.ConsoleError || m.IsException() {
				mu.Lock()
				problems = append(problems, m.String()+" "+m.URL)
				mu.Unlock()
			}
		}
	}()
	return ctx, func() []string {
		mu.Lock()
		defer mu.Unlock()
		return append([]string(nil), problems...)
	}
}

// previewDemo serves the repository's demo site with the preview server.
func previewDemo(t *testing.T, dir string) string {
	addr, _ := startPreview(t, dir)
	return "http://" + addr + "/"
}

// a11yScript checks a page with our own small rule set: one main landmark,
// a site navigation, a language, a title; every image and chart has an
// accessible name; every link has text; text meets WCAG 2 contrast (4.5:1,
// 3:1 for large text) against its effective background.
const a11yScript = `(() => {
  const out = [];
  const q = s => Array.from(document.querySelectorAll(s));
  if (q("main").length !== 1) out.push("landmarks: " + q("main").length + " main elements, want 1");
  if (q("nav").length < 1) out.push("landmarks: no nav");
  if (!document.documentElement.lang) out.push("no lang on html");
  if (!document.title.trim()) out.push("no title");
  for (const el of q("img, svg[role=img]")) {
    let name = el.getAttribute("alt") || el.getAttribute("aria-label") || "";
    const by = el.getAttribute("aria-labelledby");
    if (by) name += by.split(/\s+/).map(id => (document.getElementById(id) || {}).textContent || "").join(" ");
    if (!name.trim()) out.push("image without a name: " + el.outerHTML.slice(0, 80));
  }
  for (const a of q("a[href]")) {
    if (!(a.textContent.trim() || a.getAttribute("aria-label"))) out.push("link without text: " + a.getAttribute("href"));
  }
  const rgb = s => { const m = s.match(/rgba?\(([\d.]+),\s*([\d.]+),\s*([\d.]+)(?:,\s*([\d.]+))?/); return m ? [+m[1], +m[2], +m[3], m[4] === undefined ? 1 : +m[4]] : null; };
  const lum = c => { const f = v => { v /= 255; return v <= 0.03928 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4); }; return 0.2126 * f(c[0]) + 0.7152 * f(c[1]) + 0.0722 * f(c[2]); };
  const bg = el => { for (let e = el; e; e = e.parentElement) { const c = rgb(getComputedStyle(e).backgroundColor); if (c && c[3] > 0.5) return c; } return [255, 255, 255, 1]; };
  const seen = new Set();
  for (const el of q("body *")) {
    if (el.closest("svg") || !Array.from(el.childNodes).some(n => n.nodeType === 3 && n.textContent.trim())) continue;
    const st = getComputedStyle(el);
    if (st.visibility === "hidden" || st.display === "none" || el.getClientRects().length === 0) continue;
    const fg = rgb(st.color), b = bg(el);
    if (!fg) continue;
    const l1 = lum(fg), l2 = lum(b), ratio = (Math.max(l1, l2) + 0.05) / (Math.min(l1, l2) + 0.05);
    const size = parseFloat(st.fontSize), bold = parseInt(st.fontWeight) >= 700;
    const need = (size >= 24 || (bold && size >= 18.66)) ? 3 : 4.5;
    const key = st.color + "/" + b.join(",") + "/" + need;
    if (ratio < need && !seen.has(key)) { seen.add(key); out.push("contrast " + ratio.toFixed(2) + " < " + need + ": " + el.tagName.toLowerCase() + "." + el.className + " \"" + el.textContent.trim().slice(0, 40) + "\""); }
  }
  return out;
})()`

func TestBrowserDemo(t *testing.T) {
	ctx, problems := browser(t)
	base := previewDemo(t, filepath.Join("..", ".."))
	css := func(s string) chromedp.CSS { return chromedp.CSS(s) }

	for _, pageName := range []string{"index.html", "compressor/calculations.html", "safety.html", "compressor/data-sheet.html"} {
		if err := chromedp.Do(ctx, chromedp.Navigate(base+pageName), chromedp.WaitReady(css("body"))); err != nil {
			t.Fatalf("%s: %v", pageName, err)
		}
		issues, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](a11yScript))
		if err != nil {
			t.Fatalf("%s: %v", pageName, err)
		}
		for _, i := range issues {
			t.Errorf("%s: accessibility: %s", pageName, i)
		}
	}

	// Navigation: the site navigation leads from the home page to the
	// calculations page.
	if err := chromedp.Do(ctx,
		chromedp.Navigate(base+"index.html"),
		chromedp.Click(css(`nav.sg-nav a[href$="compressor/index.html"]`)),
		chromedp.WaitVisible(css(`nav.sg-nav a[href$="calculations.html"]`)),
		chromedp.Click(css(`nav.sg-nav a[href$="calculations.html"]`)),
		chromedp.WaitVisible(css(`.sg-calc`)),
	); err != nil {
		t.Fatal(err)
	}
	title, err := chromedp.Run(ctx, chromedp.Title())
	if err != nil || !strings.HasPrefix(title, "Stage calculations") {
		t.Errorf("navigation led to %q (%v)", title, err)
	}

	// Every chart is drawn, visible and named.
	type chart struct {
		Name    string  `json:"name"`
		Width   float64 `json:"width"`
		Height  float64 `json:"height"`
		Strokes int     `json:"strokes"`
	}
	// Each chart is drawn wide and narrow; the one its width calls for shows.
	charts, err := chromedp.Run(ctx, chromedp.Evaluate[[]chart](`Array.from(document.querySelectorAll("svg.sg-chart-svg")).filter(s => s.checkVisibility()).map(s => {
		const r = s.getBoundingClientRect();
		return {name: s.getAttribute("aria-labelledby").split(" ").map(id => document.getElementById(id).textContent).join(" "),
			width: r.width, height: r.height, strokes: s.querySelectorAll("path.s0").length};
	})`))
	if err != nil {
		t.Fatal(err)
	}
	if len(charts) < 3 {
		t.Fatalf("calculations page shows %d charts, want its blocks' charts", len(charts))
	}
	for _, c := range charts {
		if c.Width < 200 || c.Height < 100 || c.Strokes == 0 || len(c.Name) < 20 {
			t.Errorf("chart %q is not visible or not named: %+v", c.Name, c)
		}
	}

	// Chart words carry a halo of the chart's own background, so that a
	// curve or grid line under a label does not strike through it.
	halo, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`Array.from(document.querySelectorAll("svg.sg-chart-svg text")).filter(t => {
		const s = getComputedStyle(t), bg = getComputedStyle(t.closest(".sg-chart")).backgroundColor;
		return !s.paintOrder.startsWith("stroke") || s.stroke !== bg || parseFloat(s.strokeWidth) < 2;
	}).map(t => t.textContent)`))
	if err != nil {
		t.Fatal(err)
	}
	if len(halo) > 0 {
		t.Errorf("chart words without a halo of the background: %q", halo)
	}

	// The formula trace expands.
	if err := chromedp.Do(ctx, chromedp.Click(css(`.sg-trace summary`))); err != nil {
		t.Fatal(err)
	}
	shown, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`document.querySelector(".sg-trace").open ? document.querySelector(".sg-trace p").getBoundingClientRect().height : 0`))
	if err != nil || shown == 0 {
		t.Errorf("formula trace did not expand (%v)", err)
	}

	// The data sheet prints to at most two A4 pages.
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"compressor/data-sheet.html"), chromedp.WaitReady(css("body"))); err != nil {
		t.Fatal(err)
	}
	pdf, err := chromedp.Run(ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4), chromedp.PDFPreferCSSPageSize()))
	if err != nil {
		t.Fatal(err)
	}
	pages := len(regexp.MustCompile(`/Type\s*/Page[^s]`).FindAll(pdf, -1))
	if pages < 1 || pages > 2 {
		t.Errorf("data sheet prints to %d pages, want 1 or 2", pages)
	}
	if dir := os.Getenv("SPECGEN_SHOT_DIR"); dir != "" {
		_ = os.WriteFile(filepath.Join(dir, "data-sheet.pdf"), pdf, 0o644)
	}
	for _, p := range problems() {
		t.Errorf("%s", p)
	}
}

// TestBrowserPreviewReloads edits a page while a browser shows it: the
// page reloads by itself.
func TestBrowserPreviewReloads(t *testing.T) {
	ctx, problems := browser(t)
	dir := starterSite(t)
	base := previewDemo(t, dir)
	// Give the page time to open its event stream.
	if err := chromedp.Do(ctx, chromedp.Navigate(base), chromedp.WaitReady(chromedp.CSS("body")), chromedp.Sleep(300*time.Millisecond)); err != nil {
		t.Fatal(err)
	}
	pagePath := filepath.Join(dir, "content", "index.md")
	src, _ := os.ReadFile(pagePath)
	start := time.Now()
	if err := os.WriteFile(pagePath, []byte(strings.Replace(string(src), "These pages document", "Reloaded: these pages document", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.WaitVisible(chromedp.Search(`//p[contains(., "Reloaded: these pages")]`))); err != nil {
		t.Fatal(err)
	}
	t.Logf("browser showed the edit after %v", time.Since(start).Round(time.Millisecond))

	// A broken edit shows the error over the page, styled by the preview's
	// own stylesheet: the content policy refuses inline styles.
	if err := os.WriteFile(filepath.Join(dir, "content", "broken.md"), []byte("+++\ntitel = \"oops\"\n+++\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.WaitVisible(chromedp.Search(`//*[@id="sg-preview-error"][contains(., "content/broken.md:2")]`))); err != nil {
		t.Fatal(err)
	}
	position, err := chromedp.Run(ctx, chromedp.Evaluate[string](`getComputedStyle(document.getElementById("sg-preview-error")).position`))
	if err != nil {
		t.Fatal(err)
	}
	if position != "fixed" {
		t.Errorf("the error overlay is not styled (position %q); is its stylesheet refused?", position)
	}
	for _, p := range problems() {
		// The event stream is cut when the page reloads; that is not an error of the site.
		if !strings.Contains(p, "_specgen/events") {
			t.Errorf("%s", p)
		}
	}
}

// TestA11yRulesCatchProblems runs the rule set on a page that breaks each
// rule, so that a clean result on the demo means something.
func TestA11yRulesCatchProblems(t *testing.T) {
	ctx, _ := browser(t)
	bad := `data:text/html,<html><head><title>x</title></head><body>` +
		`<p style="color:%23bbbbbb;background:%23ffffff">faint grey text</p>` +
		`<img src="data:image/gif;base64,R0lGODlhAQABAAAAACw=">` +
		`<a href="x.html"></a></body></html>`
	if err := chromedp.Do(ctx, chromedp.Navigate(bad)); err != nil {
		t.Fatal(err)
	}
	issues, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](a11yScript))
	if err != nil {
		t.Fatal(err)
	}
	all := strings.Join(issues, "\n")
	// #bbb on white: (1.05)/(0.4969+0.05) = 1.92 (WCAG 2 relative luminance, by hand).
	for _, want := range []string{"main elements", "no nav", "no lang", "image without a name", "link without text", "contrast 1.92"} {
		if !strings.Contains(all, want) {
			t.Errorf("rule set missed %q; found:\n%s", want, all)
		}
	}
}

// phoneOverflowScript opens every details box (the formula traces are the
// widest content) and returns how far the page is wider than the viewport,
// with the widest calc tables that stick out of the page body.
const phoneOverflowScript = `(() => {
  document.querySelectorAll("details").forEach(d => d.open = true);
  const vw = document.documentElement.clientWidth;
  const out = {viewport: vw, page: document.documentElement.scrollWidth, tables: 0, wide: []};
  const main = document.querySelector(".sg-body") || document.body;
  const body = main.getBoundingClientRect();
  for (const t of document.querySelectorAll(".sg-calc table")) {
    out.tables++;
    const r = t.getBoundingClientRect();
    if (r.right > body.right + 0.5) {
      let clipped = false;
      for (let p = t.parentElement; p && !p.classList.contains("sg-body"); p = p.parentElement) {
        const b = p.getBoundingClientRect();
        if (getComputedStyle(p).overflowX !== "visible" && b.right <= body.right + 0.5) { clipped = true; break; }
      }
      if (!clipped) out.wide.push(t.className + " in " + t.closest(".sg-calc").id + " ends at " + Math.round(r.right) + " px");
    }
  }
  return out;
})()`

// TestBrowserPhoneWidth loads the demo pages with calculation tables at a
// phone's width (390 px): wide tables scroll inside their own box, the
// page itself never scrolls sideways.
func TestBrowserPhoneWidth(t *testing.T) {
	ctx, problems := browser(t)
	base := previewDemo(t, filepath.Join("..", ".."))
	type overflow struct {
		Viewport float64  `json:"viewport"`
		Page     float64  `json:"page"`
		Tables   int      `json:"tables"`
		Wide     []string `json:"wide"`
	}
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(390, 900)); err != nil {
		t.Fatal(err)
	}
	tables := 0
	for _, pageName := range demoPages(t) {
		if err := chromedp.Do(ctx, chromedp.Navigate(base+pageName), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
			t.Fatalf("%s: %v", pageName, err)
		}
		o, err := chromedp.Run(ctx, chromedp.Evaluate[overflow](phoneOverflowScript))
		if err != nil {
			t.Fatalf("%s: %v", pageName, err)
		}
		if o.Viewport != 390 {
			t.Fatalf("%s: viewport is %v px wide, want 390", pageName, o.Viewport)
		}
		tables += o.Tables
		if o.Page > o.Viewport {
			t.Errorf("%s: the page is %v px wide on a %v px screen", pageName, o.Page, o.Viewport)
		}
		for _, w := range o.Wide {
			t.Errorf("%s: table sticks out of the page body: %s", pageName, w)
		}
		// What a caution says is read at the width of the page.
		narrow, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`Array.from(document.querySelectorAll(".sg-caution-list td:last-child")).filter(td => {
			const r = td.getBoundingClientRect(), body = document.querySelector(".sg-body").getBoundingClientRect();
			return r.width < body.width * 0.8 || r.right > body.right + 0.5;
		}).map(td => td.textContent.slice(0, 40))`))
		if err != nil {
			t.Fatalf("%s: %v", pageName, err)
		}
		for _, n := range narrow {
			t.Errorf("%s: a caution in the list is squeezed or cut off: %q", pageName, n)
		}
	}
	if tables == 0 {
		t.Fatal("no calc tables found on the demo pages")
	}
	for _, p := range problems() {
		t.Errorf("%s", p)
	}
}

// TestBrowserLongWords: a long unbroken word, web address or code span in
// prose, a heading, a table or the navigation wraps; the page never
// scrolls sideways, at a desk's width or a phone's.
func TestBrowserLongWords(t *testing.T) {
	ctx, problems := browser(t)
	long := strings.Repeat("x", 180)
	root := writeSite(t, map[string]string{
		"content/index.md": "# Home " + long + "\n\nA word: " + long + "\n\nhttps://example.invalid/" + long + "\n\n`code " + long + "`\n\n" +
			"- item " + long + "\n\n| a | b |\n|---|---|\n| " + long + " | " + long + " |\n",
		"content/" + strings.Repeat("y", 120) + ".md": "# " + strings.Repeat("y", 120) + "\n",
	})
	base := previewDemo(t, root)
	for _, width := range []int64{1300, 390} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(width, 900)); err != nil {
			t.Fatal(err)
		}
		if err := chromedp.Do(ctx, chromedp.Navigate(base+"index.html"), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
			t.Fatal(err)
		}
		type size struct {
			Viewport float64 `json:"viewport"`
			Page     float64 `json:"page"`
		}
		s, err := chromedp.Run(ctx, chromedp.Evaluate[size](`({viewport: document.documentElement.clientWidth, page: document.documentElement.scrollWidth})`))
		if err != nil {
			t.Fatal(err)
		}
		if s.Viewport != float64(width) {
			t.Fatalf("viewport is %v px wide, want %d", s.Viewport, width)
		}
		if s.Page > s.Viewport {
			t.Errorf("at %d px the page is %v px wide: a long word does not wrap", width, s.Page)
		}
	}
	for _, p := range problems() {
		t.Errorf("%s", p)
	}
}

// TestBrowserSearchFromDisk: the search box works on a site opened from
// disk (file://), from a page in a folder: typing finds pages by title,
// heading and text, and a result leads to the page and heading.
func TestBrowserSearchFromDisk(t *testing.T) {
	ctx, problems := browser(t)
	root := writeSite(t, map[string]string{
		"content/index.md":          "# Home\n\nThe workshop's machines.\n",
		"content/pump/index.md":     "# Pump\n\nThe vacuum pump.\n",
		"content/pump/valves.md":    "# Valves\n\n## Reed springs\n\nSpring steel reeds, cut by hand.\n",
		"content/bench/receiver.md": "# Receiver\n\nA welded tank.\n",
	})
	var out, errb strings.Builder
	if code := run([]string{"build", "-quiet", "-C", root}, &out, &errb); code != exitOK {
		t.Fatalf("build: exit %d: %s", code, errb.String())
	}
	page := "file://" + filepath.ToSlash(filepath.Join(root, "dist", "bench", "receiver.html"))
	if err := chromedp.Do(ctx, chromedp.Navigate(page), chromedp.WaitVisible(chromedp.CSS("#sg-search-q"))); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.SendKeys(chromedp.CSS("#sg-search-q"), "reed"),
		chromedp.WaitVisible(chromedp.CSS(".sg-search-results a"))); err != nil {
		t.Fatal(err)
	}
	found, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`Array.from(document.querySelectorAll(".sg-search-results a")).map(a => a.getAttribute("href") + " " + a.textContent)`))
	if err != nil {
		t.Fatal(err)
	}
	if len(found) != 1 || !strings.HasPrefix(found[0], "../pump/valves.html#reed-springs Valves › Reed springs") {
		t.Errorf("searching reed found %q", found)
	}
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(".sg-search-results a")), chromedp.WaitVisible(chromedp.CSS("#reed-springs"))); err != nil {
		t.Fatal(err)
	}
	if where, err := chromedp.Run(ctx, chromedp.Location()); err != nil || !strings.HasSuffix(where, "/dist/pump/valves.html#reed-springs") {
		t.Errorf("the result led to %q (%v)", where, err)
	}
	for _, p := range problems() {
		t.Errorf("%s", p)
	}
}
