package site

import (
	"bytes"
	"html"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"
)

// goldmarkHTML is goldmark's own rendering of a Markdown snippet, the
// reference the page pipeline must agree with.
func goldmarkHTML(t *testing.T, md string) string {
	t.Helper()
	var buf bytes.Buffer
	if err := goldmark.New(goldmark.WithExtensions(extension.GFM)).Convert([]byte(md), &buf); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

var tags = regexp.MustCompile(`<[^>]*>`)

// textOf is the text a reader sees of an HTML fragment.
func textOf(fragment string) string {
	return html.UnescapeString(tags.ReplaceAllString(fragment, ""))
}

// TestHeadingTextAsRendered: the heading text specgen writes itself (the
// page's h1, <title>, the "On this page" list) reads as goldmark's own
// rendering of the same heading. The cases follow the CommonMark spec's
// sections on backslash escapes, entity and numeric character references,
// ATX headings, code spans and emphasis (0.31.2, from memory).
func TestHeadingTextAsRendered(t *testing.T) {
	cases := []string{
		`foo \#`,
		`\*not emphasized*`,
		`\[not a link](/foo)`,
		`AT&amp;T`,
		`&copy; 2024 &amp; &MadeUpEntity;`,
		`&#35; &#1234; &#x22; &#XD06; &#0;`,
		`\&amp; is written &amp;amp;`,
		"`AT&amp;T` and `a\\*b`",
		"*emphasis* and **strong** and ~~struck~~",
		`foo\`,
		`&nbsp;spaced`,
		`a < b > c "quoted" 'single'`,
	}
	for _, heading := range cases {
		t.Run(heading, func(t *testing.T) {
			root := t.TempDir()
			writeFile(t, filepath.Join(root, "content", "index.md"),
				"# "+heading+"\n\nText.\n\n## "+heading+"\n\nMore.\n\n## Other\n\nEnd.\n")
			if _, err := Build(root, Options{}); err != nil {
				t.Fatal(err)
			}
			page := string(readTree(t, filepath.Join(root, DefaultOut))["index.html"])
			ref := regexp.MustCompile(`(?s)<h1[^>]*>(.*?)</h1>`).FindStringSubmatch(goldmarkHTML(t, "# "+heading+"\n"))
			if ref == nil {
				t.Fatalf("goldmark wrote no h1 for %q", heading)
			}
			want := textOf(ref[1])
			for _, place := range []struct{ name, pattern string }{
				{"h1", `(?s)<header class="sg-page-head">\s*<h1>(.*?)</h1>`},
				{"<title>", `<title>(.*?) · `},
				{"contents", `(?s)<nav class="sg-toc".*?<li><a href="#[^"]*">(.*?)</a>`},
			} {
				m := regexp.MustCompile(place.pattern).FindStringSubmatch(page)
				if m == nil {
					t.Errorf("%s: not found in the page", place.name)
					continue
				}
				if got := textOf(m[1]); got != want {
					t.Errorf("%s reads %q; goldmark renders %q", place.name, got, want)
				}
			}
		})
	}
}

// TestLinkCheckAsRendered: the link check looks for the file a link's
// rendered href reaches, as goldmark writes it (escapes and references
// resolved, the rest percent-encoded) and a browser decodes it, not for
// the destination as written. A link inside an image's description is
// shown as alternative text only and is not checked.
func TestLinkCheckAsRendered(t *testing.T) {
	cases := []string{
		`f&ouml;&ouml;.txt`,
		`/f&ouml;&ouml;.txt`,
		`bar\*.txt`,
		`caf%C3%A9.txt`,
		`my%20file.txt`,
		`<my file.txt>`,
		`a&amp;b.txt`,
		`&#x66;ile.txt`,
		`\&amp;.txt`,
		`sub/x%2Dy.txt`,
	}
	href := regexp.MustCompile(`href="([^"]*)"`)
	for _, dest := range cases {
		t.Run(dest, func(t *testing.T) {
			link := "[the file](" + dest + ")"
			m := href.FindStringSubmatch(goldmarkHTML(t, link+"\n"))
			if m == nil {
				t.Fatalf("goldmark wrote no href for %s", link)
			}
			u, err := url.Parse(html.UnescapeString(m[1]))
			if err != nil {
				t.Fatal(err)
			}
			reached := strings.TrimPrefix(u.Path, "/")

			site := func(file string) error {
				root := t.TempDir()
				writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n\nSee "+link+".\n")
				writeFile(t, filepath.Join(root, StaticDir, filepath.FromSlash(file)), "data\n")
				_, err := Build(root, Options{})
				return err
			}
			if err := site(reached); err != nil {
				t.Errorf("the rendered link reaches static/%s, which exists, but the check refuses it: %v", reached, err)
			}
			written := strings.TrimPrefix(strings.Trim(dest, "<>"), "/")
			if written != reached {
				if err := site(written); err == nil || !strings.Contains(err.Error(), "link") {
					t.Errorf("static/%s exists as written but the rendered link reaches %s; the check passed it (%v)", written, reached, err)
				}
			}
		})
	}

	t.Run("link in an image description", func(t *testing.T) {
		root := t.TempDir()
		writeFile(t, filepath.Join(root, "content", "index.md"), "# Home\n\n![see [a page](missing.md) here](pic.png)\n")
		writeFile(t, filepath.Join(root, StaticDir, "pic.png"), "png\n")
		if _, err := Build(root, Options{}); err != nil {
			t.Errorf("a link in an image's description is checked as a link: %v", err)
		}
		page, _ := os.ReadFile(filepath.Join(root, DefaultOut, "index.html"))
		if !strings.Contains(string(page), `alt="see a page here"`) {
			t.Errorf("the image's description is not its alternative text: %s", page)
		}
	})
}
