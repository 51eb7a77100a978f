package site

import (
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

const stagePage = "# Stage\n\n```calc\nid = \"stage\"\nkind = \"compressor\"\nbore = \"28 mm\"\nstroke = \"32 mm\"\nrod_length = \"70 mm\"\n" +
	"clearance_volume = \"1.8 cm3\"\nspeed = \"900 rpm\"\ndischarge_pressure = \"6 bar\"\n%s```\n"

// TestCautionStripOnQuotingPages: the page that holds a pressure
// calculation carries the full standard caution; a page that only quotes
// it carries the one-line strip, linked to the page that lists the site's
// cautions; a page with no figures carries neither.
func TestCautionStripOnQuotingPages(t *testing.T) {
	root := t.TempDir()
	writeFile(t, filepath.Join(root, "content", "index.md"), strings.Replace(stagePage, "%s", "", 1))
	writeFile(t, filepath.Join(root, "content", "sheet", "ratings.md"), "# Ratings\n\nIt delivers =[stage.free_air_delivery L/min].\n")
	writeFile(t, filepath.Join(root, "content", "safety.md"), "# Safety\n\n```cautions\n```\n")
	writeFile(t, filepath.Join(root, "content", "about.md"), "# About\n\nNo figures here.\n")
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	full, strip := "Compressed air stores energy", `<p class="sg-caution-strip"`
	for page, want := range map[string][2]bool{"index.html": {true, false}, "sheet/ratings.html": {false, true}, "about.html": {false, false}, "safety.html": {false, false}} {
		html := string(files[page])
		if strings.Contains(html, full) != want[0] || strings.Contains(html, strip) != want[1] {
			t.Errorf("%s: full caution %v, strip %v; want %v, %v", page, strings.Contains(html, full), strings.Contains(html, strip), want[0], want[1])
		}
	}
	if !strings.Contains(string(files["sheet/ratings.html"]), `<a href="../safety.html">Read the safety page.</a>`) {
		t.Error("the strip does not link to the page that lists the cautions")
	}
	checkLinks(t, files)
}

// TestPageAlert: a page showing a block with a failed claim or an
// unacknowledged DANGER says so under its title, linked to the block; an
// acknowledged DANGER and held claims say nothing there.
func TestPageAlert(t *testing.T) {
	root := t.TempDir()
	failing := strings.Replace(stagePage, "%s", "\n[expect]\nswept_volume = \"79 cm3\"\n", 1)
	writeFile(t, filepath.Join(root, "content", "index.md"), failing)
	writeFile(t, filepath.Join(root, "content", "quotes.md"), "# Quotes\n\nIt sweeps =[stage.swept_volume cm3].\n")
	choked := "# Choked\n\n```calc\nid = \"choked\"\nkind = \"compressor\"\nbore = \"32 mm\"\nstroke = \"28 mm\"\nrod_length = \"70 mm\"\n" +
		"clearance_ratio = 0.3\nspeed = \"900 rpm\"\ndischarge_pressure = \"8 bar\"\n%s```\n"
	writeFile(t, filepath.Join(root, "content", "choked.md"), strings.Replace(choked, "%s", "", 1))
	writeFile(t, filepath.Join(root, "content", "accepted.md"), strings.Replace(strings.ReplaceAll(choked, "choked", "accepted"), "%s",
		"\n[acknowledge]\nno-delivery = \"a demonstration of dead-head\"\nrelief-unnamed = \"a demonstration\"\n", 1))
	if _, err := Build(root, Options{}); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, filepath.Join(root, DefaultOut))
	head := regexp.MustCompile(`(?s)<header class="sg-page-head">.*?</header>`)
	for page, want := range map[string]string{
		"index.html":    `claim fails</span> <code>swept_volume</code> in <a href="#calc-stage">stage</a>`,
		"quotes.html":   `claim fails</span> <code>swept_volume</code> in <a href="index.html#calc-stage">stage</a>`,
		"choked.html":   `DANGER</span> not acknowledged: <code>no-delivery</code> in <a href="#calc-choked">choked</a>`,
		"accepted.html": "",
	} {
		got := head.FindString(string(files[page]))
		switch {
		case want == "" && strings.Contains(got, "sg-page-alert"):
			t.Errorf("%s: an alert under the title, though nothing fails:\n%s", page, got)
		case want != "" && !strings.Contains(got, want):
			t.Errorf("%s: the page head lacks %s:\n%s", page, want, got)
		}
	}
}
