package site

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// TestValueInHeadings: a value quoted in the page's H1 shows in the h1, the
// <title> and the other pages' navigation; one quoted in an H2 shows there
// and in the table of contents, and the anchor id is made from the
// heading's words without the reference, so it stays put when the value
// changes (a link to it from another page is checked).
func TestValueInHeadings(t *testing.T) {
	root := t.TempDir()
	block := "```calc\nid = \"a\"\nkind = \"compressor\"\nbore = \"%s\"\nstroke = \"28 mm\"\nrod_length = \"70 mm\"\n" +
		"clearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n```\n"
	page := func(bore string) string {
		return "# Sweeps =[a.swept_volume cm3] per stroke\n\n" + strings.Replace(block, "%s", bore, 1) +
			"\n## Delivery =[a.free_air_delivery L/min] at speed\n\nText.\n\n## =[a.shaft_power W]\n\nMore.\n\n### Notes\n"
	}
	writeFile(t, filepath.Join(root, "content", "index.md"), page("32 mm"))
	writeFile(t, filepath.Join(root, "content", "other.md"), "# Other\n\nSee [delivery](index.md#delivery-at-speed) and [power](index.md#shaft-power).\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	index, other := string(files["index.html"]), string(files["other.html"])
	title := regexp.MustCompile(`Sweeps \d+(\.\d+)? cm³ per stroke`)
	for _, want := range []*regexp.Regexp{
		regexp.MustCompile(`<h1>` + title.String() + `</h1>`),
		regexp.MustCompile(`<title>` + title.String() + ` · `),
		regexp.MustCompile(`<h2 id="delivery-at-speed">Delivery <a class="sg-value"[^>]*>\d+(\.\d+)? L/min</a> at speed</h2>`),
		regexp.MustCompile(`<h2 id="shaft-power"><a class="sg-value"[^>]*>\d+(\.\d+)? W</a></h2>`),
		regexp.MustCompile(`<h3 id="notes">`),
		regexp.MustCompile(`href="#delivery-at-speed"[^>]*>Delivery \d+(\.\d+)? L/min at speed<`),
	} {
		if !want.MatchString(index) {
			t.Errorf("index.html lacks %s", want)
		}
	}
	if !title.MatchString(other) {
		t.Errorf("other.html's navigation lacks the home page's title %s", title)
	}
	for name, html := range map[string]string{"index.html": index, "other.html": other} {
		if strings.Contains(html, "=[") || strings.Contains(html, "Sweeps  per") {
			t.Errorf("%s shows a reference as written or drops it", name)
		}
	}
	checkLinks(t, files)

	// A new bore changes the values, not the anchors.
	writeFile(t, filepath.Join(root, "content", "index.md"), page("40 mm"))
	if err := os.RemoveAll(filepath.Join(root, DefaultOut)); err != nil {
		t.Fatal(err)
	}
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	again := string(readTree(t, filepath.Join(root, DefaultOut))["index.html"])
	if again == index || !strings.Contains(again, `id="delivery-at-speed"`) || !strings.Contains(again, `id="shaft-power"`) {
		t.Error("with a new bore the page should change and keep its anchor ids")
	}
}
