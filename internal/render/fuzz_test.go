package render

import (
	"bytes"
	"strings"
	"testing"
	"unicode/utf8"
)

// FuzzValueRef feeds arbitrary Markdown through Parse and Render: neither
// may panic; valid UTF-8 renders as valid UTF-8; every value reference
// found starts at its Offset with "=[" and its block and result; text
// without "=[" holds no value reference and renders none; a malformed one
// says why and renders as text.
func FuzzValueRef(f *testing.F) {
	for _, s := range []string{
		"It sweeps =[low.swept_volume cm3] per stroke.\n",
		"=[low.x] at the start, =[hp.free_air_delivery L/min] later.\n",
		"a=[b] and x = [1, 2] are text.\n",
		"`=[low.swept_volume]` in code, ``=[a.b c]`` too.\n",
		"```\n=[low.swept_volume]\n```\n",
		"```calc\nid = \"low\"\nkind = \"compressor\"\n```\n\nSee =[low.bore mm].\n",
		"# Title =[low.peak_torque N m]\n\n| a | b |\n|---|---|\n| =[low.x] | =[low.y bar(a)] |\n",
		"> =[low.x\n> ]\n",
		"- =[low.x]\n  - =[lo-w_2.y_z psi]\n",
		"Setext\n===\n\n=[\n=[]\n=[.]\n=[a.]\n=[A.b]\n",
		"[link](=[low.x]) and ![img](x \"=[low.y]\")\n",
		"=[low.x <b>]\n<span>=[low.y]</span>\n",
		"Footnote[^1].\n\n[^1]: =[low.swept_volume cm3]\n",
		"\\=[low.x] escaped, **=[low.y]** strong\n",
		"=[low.x ünit ³]\n",
		"\xff=[low.x]\xfe\n",
	} {
		f.Add(s)
	}
	md := New()
	f.Fuzz(func(t *testing.T, src string) {
		doc := md.Parse([]byte(src), 0)
		all := doc.ValueRefs()
		var refs []*ValueRef // the well-formed ones
		for _, r := range all {
			if r.Offset < 0 || r.Offset > len(src) || !bytes.HasPrefix([]byte(src[r.Offset:]), []byte("=[")) {
				t.Fatalf("reference to %s.%s at offset %d is not where the source has =[", r.Block, r.Result, r.Offset)
			}
			if r.End <= r.Offset || r.End > len(src) {
				t.Fatalf("reference at %d ends at %d", r.Offset, r.End)
			}
			if r.Problem != "" {
				if !strings.HasPrefix(r.Written, "=[") {
					t.Fatalf("malformed reference at %d written as %q", r.Offset, r.Written)
				}
				continue
			}
			if r.Block == "" || r.Result == "" {
				t.Fatalf("reference at %d has an empty part: %+v", r.Offset, r)
			}
			refs = append(refs, r)
		}
		if !bytes.Contains([]byte(src), []byte("=[")) && len(all) > 0 {
			t.Fatalf("%d references in text without =[", len(all))
		}
		out, err := md.Render(doc)
		if err != nil {
			t.Fatalf("Render: %v", err)
		}
		if utf8.ValidString(src) && !utf8.Valid(out) {
			t.Fatalf("valid UTF-8 rendered as invalid UTF-8: %q", out)
		}
		if got := bytes.Count(out, []byte(`class="sg-value"`)); got != len(refs) && !bytes.Contains([]byte(src), []byte("sg-value")) {
			t.Fatalf("%d references rendered as %d values", len(refs), got)
		}
	})
}
