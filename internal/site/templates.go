package site

import (
	"fmt"
	"html/template"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"reflect"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/render"
	"github.com/millrace-workshop/specgen/templates"
)

// TemplatesDir is the optional folder of a site root whose files replace
// or add to the embedded default templates and assets.
const TemplatesDir = "templates"

// layouts is the set of page templates, each a complete HTML page, plus
// the stylesheet and other assets shipped with them.
type layouts struct {
	set    *template.Template
	names  []string          // page template names without ".html"
	assets map[string][]byte // path under assets/ → content
}

// loadLayouts reads the embedded templates, then the site's overrides.
func loadLayouts(root string) (*layouts, error) {
	files := map[string][]byte{}
	err := fs.WalkDir(templates.FS, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || path.Ext(p) == ".go" || strings.HasPrefix(p, "starter/") {
			return err
		}
		b, err := fs.ReadFile(templates.FS, p)
		files[p] = b
		return err
	})
	if err != nil {
		return nil, err
	}
	siteDir := filepath.Join(root, TemplatesDir)
	if info, err := os.Stat(siteDir); err == nil && info.IsDir() {
		err := filepath.WalkDir(siteDir, func(p string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() || strings.HasPrefix(d.Name(), ".") {
				return err
			}
			rel, err := filepath.Rel(siteDir, p)
			if err != nil {
				return err
			}
			b, err := os.ReadFile(p)
			files[filepath.ToSlash(rel)] = b
			return err
		})
		if err != nil {
			return nil, err
		}
	}
	l := &layouts{set: template.New(""), assets: map[string][]byte{}}
	names := make([]string, 0, len(files))
	for name := range files {
		names = append(names, name)
	}
	sort.Strings(names)
	for _, name := range names {
		switch {
		case strings.HasPrefix(name, "assets/"):
			l.assets[strings.TrimPrefix(name, "assets/")] = files[name]
		case path.Ext(name) == ".html" && !strings.Contains(name, "/"):
			if _, err := l.set.New(name).Parse(string(files[name])); err != nil {
				return nil, templateError(err, name, "")
			}
			if !strings.HasPrefix(name, "_") {
				l.names = append(l.names, strings.TrimSuffix(name, ".html"))
			}
		}
	}
	if l.set.Lookup("page.html") == nil {
		return nil, &inputerr.Error{File: TemplatesDir + "/page.html", Msg: "the default page template is missing"}
	}
	return l, nil
}

// lookup returns the page template for a front-matter template name.
func (l *layouts) lookup(name string) (*template.Template, error) {
	if name == "" {
		name = "page"
	}
	t := l.set.Lookup(name + ".html")
	if t == nil || strings.HasPrefix(name, "_") {
		return nil, fmt.Errorf("template %q does not exist; allowed: %s", name, strings.Join(l.names, ", "))
	}
	return t, nil
}

// templatePlace matches where text/template and html/template place an
// error: "template: page.html:12:3: ..." or "html/template:page.html:12: ...".
var templatePlace = regexp.MustCompile(`^(?:html/)?template: ?([^:\s]+\.html):(\d+):(?:\d+:)? ?(.*)$`)

// noField matches a template's use of a field its data lacks.
var noField = regexp.MustCompile(`can't evaluate field (\w+) in type \*?([\w.]+)`)

// templateData are the types a template reaches, by their Go names, so
// that a missing field is reported with the fields there are.
var templateData = map[string]reflect.Type{}

func init() {
	for _, v := range []any{PageData{}, SiteData{}, PageInfo{}, NavItem{}, Link{}, Revision{}, render.Heading{}} {
		t := reflect.TypeOf(v)
		templateData[t.String()] = t
	}
}

// templateError places a template's parse or execution error on the
// template file and line it names, and words a missing field with the
// fields there are instead of a Go type name.
func templateError(err error, name, prefix string) *inputerr.Error {
	msg := err.Error()
	e := &inputerr.Error{File: TemplatesDir + "/" + name}
	if m := templatePlace.FindStringSubmatch(msg); m != nil {
		e.File = TemplatesDir + "/" + m[1]
		e.Line, _ = strconv.Atoi(m[2])
		msg = m[3]
	}
	if m := noField.FindStringSubmatch(msg); m != nil {
		if t, ok := templateData[m[2]]; ok {
			fields := make([]string, t.NumField())
			for i := range fields {
				fields[i] = "." + t.Field(i).Name
			}
			msg = strings.Replace(msg, m[0], fmt.Sprintf("there is no field .%s here; the fields are %s", m[1], strings.Join(fields, ", ")), 1)
		}
	}
	e.Msg = prefix + "template: " + msg
	return e
}
