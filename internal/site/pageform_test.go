package site

import (
	"crypto/sha256"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/millrace-workshop/specgen/internal/render"
)

// TestPageFormKeepsPage reads every page of incrementalSite from its file,
// keeps its form, saves and reads the forms back, and checks that each
// page made from its form is the page read from the file, field by field,
// but for the source the file's page holds until it is rendered. A field
// added to Page that loadPage sets and the form does not keep fails here.
func TestPageFormKeepsPage(t *testing.T) {
	root := t.TempDir()
	for name, text := range incrementalSite {
		writeFile(t, filepath.Join(root, filepath.FromSlash(name)), text)
	}
	writeFile(t, filepath.Join(root, "content", "links.md"), "+++\ntitle = \"Links\"\ndescription = \"Where to go\"\n+++\n"+
		"# Links to =[lp.swept_volume cm3]\n\nSee [the stage](a/stage.md#stage) and ![a logo](logo.txt).\n\n"+
		"```chart\nlp.pv\n```\n\n## More\n\nText.\n")
	cfg, err := LoadConfig(root)
	if err != nil {
		t.Fatal(err)
	}
	md := render.New(render.WithRawHTML(cfg.Markdown.RawHTML))
	rels, err := findPages(root)
	if err != nil {
		t.Fatal(err)
	}
	forms := &pageForms{namespace: "ns", last: map[string]pageFormEntry{}, used: map[string]pageFormEntry{}}
	read := map[string]*Page{}
	for _, rel := range rels {
		p, err := loadPage(root, rel, md, cfg.catalog, true)
		if err != nil {
			t.Fatal(err)
		}
		forms.keep(p)
		read[rel] = p
	}
	dir := t.TempDir()
	if err := forms.save(dir); err != nil {
		t.Fatal(err)
	}
	back := readPageForms(dir, "ns")
	for _, rel := range rels {
		want := *read[rel]
		if want.source == nil {
			t.Fatalf("%s: loadPage kept no source to render later", rel)
		}
		want.source = nil
		got := back.page(rel, want.sourceSum, cfg.catalog)
		if got == nil {
			t.Fatalf("%s: no page made from its form", rel)
		}
		// A block's kind is compared by name: a kind that takes free
		// inputs is copied for each block, and its functions compare
		// unequal.
		if len(got.blocks) != len(want.blocks) {
			t.Fatalf("%s: %d blocks from the form, %d from the file", rel, len(got.blocks), len(want.blocks))
		}
		for i := range got.blocks {
			g, w := *got.blocks[i], *want.blocks[i]
			if g.Kind.Name != w.Kind.Name {
				t.Errorf("%s: block %s is a %s from the form, a %s from the file", rel, w.ID, g.Kind.Name, w.Kind.Name)
			}
			g.Kind, w.Kind = nil, nil
			if !reflect.DeepEqual(g, w) {
				t.Errorf("%s: block %s from the form differs from the file's", rel, w.ID)
			}
		}
		got.blocks, want.blocks = nil, nil
		gv, wv := reflect.ValueOf(got).Elem(), reflect.ValueOf(&want).Elem()
		for i := range gv.NumField() {
			if !reflect.DeepEqual(fieldValue(gv.Field(i)), fieldValue(wv.Field(i))) {
				t.Errorf("%s: %s from the form differs from the file's", rel, gv.Type().Field(i).Name)
			}
		}
		if err := got.prepare(root, md, cfg.catalog); err != nil || got.body == nil || got.source != nil {
			t.Errorf("%s: the page made from its form was not rendered from its file: %v", rel, err)
		}
	}
	if readPageForms(dir, "another catalog").page(rels[0], read[rels[0]].sourceSum, cfg.catalog) != nil {
		t.Error("a form read with another catalog was used")
	}
	if back.page(rels[0], sha256.Sum256([]byte("other text")), cfg.catalog) != nil {
		t.Error("a form was used for a file whose text changed")
	}
}

// fieldValue is the value of an addressable struct field, unexported
// ones too, for comparing.
func fieldValue(v reflect.Value) any {
	return reflect.NewAt(v.Type(), v.Addr().UnsafePointer()).Elem().Interface()
}

// TestDigestTwin checks a digest with a placeless twin against the two
// walks it stands in for, on every block of the demo site: the digest is
// the placed one, the twin's the placeless one.
func TestDigestTwin(t *testing.T) {
	s, err := Load(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range s.Calc.Blocks {
		placed, placeless := newDigest().withTwin().add(e).sums()
		if want := newDigest().add(e).sum(); placed != want {
			t.Errorf("block %s: the digest with a twin differs from the digest alone", e.Block.ID)
		}
		d := newDigest()
		d.placeless = true
		if want := d.add(e).sum(); placeless != want {
			t.Errorf("block %s: the twin differs from a placeless digest", e.Block.ID)
		}
		if placed == placeless {
			t.Errorf("block %s: the twin covers where the block stands", e.Block.ID)
		}
	}
}
