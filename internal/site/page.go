package site

import (
	"crypto/sha256"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"unicode/utf8"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/render"
)

// ContentDir is the folder of a site root that holds the pages.
const ContentDir = "content"

// Page is one Markdown page of the site.
type Page struct {
	File  string // path for messages, relative to the site root: "content/a/b.md"
	Rel   string // path relative to content/: "a/b.md"
	Out   string // output path relative to the output folder: "a/b.html"
	Front FrontMatter
	// frontLines maps front-matter keys to their TOML line (file line - 1).
	frontLines map[string]int
	Title      string // for navigation and <title>
	Heading    string // the page's own level-1 heading, if it opens with one
	// titleParts are the pieces of that heading, for showing the values it
	// quotes once they are known.
	titleParts []titlePart
	// body is the page's content, rendered when it was read, with holes
	// for what evaluation finds (nil for a page that could not be read,
	// or read to be rendered later). sourceSum is the hash of its file;
	// source the file itself while body waits to be rendered.
	body      *render.Prepared
	sourceSum [sha256.Size]byte
	source    []byte
	// blocks are the page's calculation blocks, decoded, in order; refs its
	// inline values and charts the lines of its chart fences.
	blocks []*calc.Block
	refs   []valueRef
	charts []chartName
	// links are the page's links and images; anchors the ids of its
	// headings, for checking links into it.
	links   []render.LinkRef
	anchors []string // sorted
	// unread marks a page that could not be read (its problem is
	// reported): it has its place, but no content, headings or blocks.
	unread bool
	// listsCautions: the page lists every caution of the site, which makes
	// it the safety page the short standard caution links to.
	listsCautions bool
}

// Dir is the page's folder relative to content/, "" for the top level.
func (p *Page) Dir() string {
	d := path.Dir(p.Rel)
	if d == "." {
		return ""
	}
	return d
}

// hasAnchor reports whether the page has an element with the id.
func (p *Page) hasAnchor(id string) bool {
	_, found := slices.BinarySearch(p.anchors, id)
	return found
}

// frontLine is the file line of a front-matter key (1 when unknown).
func (p *Page) frontLine(key string) int { return 1 + p.frontLines[key] }

// IsIndex reports whether the page is its folder's index.md.
func (p *Page) IsIndex() bool { return path.Base(p.Rel) == "index.md" }

// findPages lists content/**/*.md, sorted, skipping hidden files and folders.
func findPages(root string) ([]string, error) {
	dir := filepath.Join(root, ContentDir)
	info, err := os.Stat(dir)
	if err != nil || !info.IsDir() {
		return nil, &inputerr.Error{Msg: fmt.Sprintf("no content/ folder in %s; a site root holds content/ with Markdown pages (use -C to point at the site root)", root)}
	}
	var rels []string
	err = filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		name := d.Name()
		if p != dir && strings.HasPrefix(name, ".") {
			if d.IsDir() {
				return filepath.SkipDir
			}
			return nil
		}
		// WalkDir does not follow a linked folder; its pages would be
		// missing from the site without a word.
		if d.Type()&fs.ModeSymlink != 0 && !strings.EqualFold(filepath.Ext(name), ".md") {
			if info, err := os.Stat(p); err == nil && info.IsDir() {
				rel, _ := filepath.Rel(dir, p)
				return &inputerr.Error{File: ContentDir + "/" + filepath.ToSlash(rel), Msg: "is a symbolic link to a folder, which specgen does not follow (its pages would be left out); move or copy the folder into content/"}
			}
		}
		if !d.IsDir() && strings.EqualFold(filepath.Ext(name), ".md") {
			rel, err := filepath.Rel(dir, p)
			if err != nil {
				return err
			}
			if !utf8.ValidString(rel) {
				return &inputerr.Error{File: ContentDir + "/" + strings.ToValidUTF8(filepath.ToSlash(rel), "\uFFFD"), Msg: "the file name is not UTF-8 text (written in another encoding); rename the file, or its links and title would be garbled"}
			}
			// Only index.md becomes index.html, the page a web server
			// shows for its folder; INDEX.MD would not be found there.
			if strings.EqualFold(name, "index.md") && name != "index.md" {
				return &inputerr.Error{File: ContentDir + "/" + filepath.ToSlash(rel), Msg: "rename it index.md, in lower case: a folder's own page is index.md, written as index.html, the page web servers show for the folder"}
			}
			if d.Type()&fs.ModeSymlink != 0 {
				return &inputerr.Error{File: ContentDir + "/" + filepath.ToSlash(rel), Msg: "is a symbolic link; content/ holds plain files only, so nothing outside the site root is published by accident"}
			}
			rels = append(rels, filepath.ToSlash(rel))
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	if len(rels) == 0 {
		return nil, &inputerr.Error{File: ContentDir, Msg: "no Markdown pages (*.md) in content/"}
	}
	sort.Strings(rels)
	return rels, nil
}

// PageOutput is the output path of the page whose source is file
// ("content/a/b.md" → "a/b.html").
func PageOutput(file string) string {
	rel := strings.TrimPrefix(file, ContentDir+"/")
	return strings.TrimSuffix(rel, path.Ext(rel)) + ".html"
}

// loadPage reads and parses one page. With an input error in its body it
// still returns the page, with what could be read, so that the site's
// other problems can be found in the same run.
// With later, the page's content is not rendered yet (prepare renders it
// when it is written): an incremental build writes few of its pages.
func loadPage(root, rel string, md *render.Markdown, cat *calc.Catalog, later bool) (*Page, error) {
	file := ContentDir + "/" + rel
	src, err := os.ReadFile(filepath.Join(root, ContentDir, filepath.FromSlash(rel)))
	if err != nil {
		return nil, err
	}
	// A page that cannot be read still has its place, so that links to it
	// are not blamed as well.
	unread := &Page{File: file, Rel: rel, Out: PageOutput(file), Title: titleFromName(rel), unread: true}
	if !utf8.Valid(src) {
		return unread, &inputerr.Error{File: file, Line: firstInvalidUTF8Line(src), Msg: "not UTF-8 text; save the page as UTF-8"}
	}
	fm, lines, body, offset, fmErr := parseFrontMatter(file, src)
	if body == nil && fmErr != nil {
		return unread, fmErr
	}
	p := &Page{File: file, Rel: rel, Out: PageOutput(file), Front: fm, frontLines: lines, sourceSum: sha256.Sum256(src)}
	doc := md.Parse(body, offset)
	refs := 0
	for _, part := range doc.TakeTitle() {
		if part.Ref == nil {
			p.titleParts = append(p.titleParts, titlePart{Text: part.Text, Ref: -1})
			continue
		}
		// The title's references come first in doc.ValueRefs.
		p.titleParts = append(p.titleParts, titlePart{Ref: refs})
		refs++
	}
	docErr := readDoc(p, doc, cat)
	if later {
		p.source = src
	} else if err := p.prepareDoc(doc, md); err != nil {
		return p, err
	}
	// Until the values are known, a reference in the title reads as written.
	p.setHeading(func(i int) string { return p.refs[i].Written })
	if fmErr != nil {
		return p, inputerr.Join(fmErr, docErr)
	}
	return p, docErr
}

// rootPrefix is the way up from output page out to the site's root: "",
// "../", ...
func rootPrefix(out string) string { return strings.Repeat("../", strings.Count(out, "/")) }

// prepareDoc renders the page's content from its syntax tree, read as
// loadPage reads it, with holes for what evaluation finds.
func (p *Page) prepareDoc(doc *render.Document, md *render.Markdown) error {
	doc.RelativeFromRoot(rootPrefix(p.Out))
	body, err := md.Prepare(doc)
	if err != nil {
		return &inputerr.Error{File: p.File, Msg: "rendering: " + err.Error()}
	}
	p.body = body
	return nil
}

// prepare renders the content of a page loaded to be rendered later from
// its source, as loadPage would have; the source goes. A page made from
// its form (pageForms) reads its file under root again, which must be
// as it was.
func (p *Page) prepare(root string, md *render.Markdown, cat *calc.Catalog) error {
	if p.body != nil || p.unread {
		return nil
	}
	if p.source == nil {
		src, err := os.ReadFile(filepath.Join(root, ContentDir, filepath.FromSlash(p.Rel)))
		if err != nil {
			return err
		}
		if sha256.Sum256(src) != p.sourceSum {
			return &inputerr.Error{File: p.File, Msg: "changed while the site was being built; build again"}
		}
		p.source = src
	}
	_, _, body, offset, _ := parseFrontMatter(p.File, p.source)
	doc := md.Parse(body, offset)
	doc.TakeTitle()
	// The tree goes through what loadPage did to it; the page's own
	// findings were kept then.
	_ = readDoc(&Page{File: p.File, Rel: p.Rel, Out: p.Out}, doc, cat)
	p.source = nil
	return p.prepareDoc(doc, md)
}

// titlePart is a piece of a page's level-1 heading: text, or (Ref >= 0)
// the value of the page's inline value p.refs[Ref].
type titlePart struct {
	Text string
	Ref  int
}

// setHeading sets the page's Heading from its level-1 heading, with value
// giving the text of each inline value in it, and its Title: the front
// matter's title, else that heading, else one made from the file name.
func (p *Page) setHeading(value func(ref int) string) {
	var b strings.Builder
	for _, part := range p.titleParts {
		if part.Ref >= 0 && part.Ref < len(p.refs) {
			b.WriteString(value(part.Ref))
		} else {
			b.WriteString(part.Text)
		}
	}
	p.Heading = b.String()
	p.Title = p.Front.Title
	if p.Title == "" {
		p.Title = p.Heading
	}
	if p.Title == "" {
		p.Title = titleFromName(p.Rel)
	}
}

// titleFromName makes "tank-fill.md" into "Tank fill".
func titleFromName(rel string) string {
	name := strings.TrimSuffix(path.Base(rel), path.Ext(rel))
	if name == "index" {
		name = path.Base(path.Dir(rel))
		if name == "." {
			return "Home"
		}
	}
	name = strings.NewReplacer("-", " ", "_", " ").Replace(name)
	if name == "" {
		return rel
	}
	r, size := utf8.DecodeRuneInString(name)
	return strings.ToUpper(string(r)) + name[size:]
}

func firstInvalidUTF8Line(src []byte) int {
	line := 1
	for i := 0; i < len(src); {
		r, size := utf8.DecodeRune(src[i:])
		if r == utf8.RuneError && size == 1 {
			return line
		}
		if r == '\n' {
			line++
		}
		i += size
	}
	return line
}

// checkOutputClashes reports two pages that would write the same file,
// such as "a.md" and "A.md" on a case-insensitive disk, or "a.MD".
func checkOutputClashes(pages []*Page) error {
	seen := map[string]*Page{}
	var errs inputerr.List
	for _, p := range pages {
		key := strings.ToLower(p.Out)
		if other, ok := seen[key]; ok {
			errs = append(errs, &inputerr.Error{File: p.File, Msg: fmt.Sprintf("writes the same page as %s (%s); rename one", other.File, p.Out)})
			continue
		}
		seen[key] = p
	}
	return errs.Sorted()
}
