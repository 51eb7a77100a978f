package render

import (
	"bytes"
	"strings"
	"sync"

	"github.com/alecthomas/chroma/v2"
	chromahtml "github.com/alecthomas/chroma/v2/formatters/html"
	"github.com/alecthomas/chroma/v2/lexers"
	"github.com/alecthomas/chroma/v2/styles"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/renderer"
	"github.com/yuin/goldmark/util"
)

// codeFormatter writes highlighted code with CSS classes, so one stylesheet
// serves light and dark themes and print.
var codeFormatter = chromahtml.New(chromahtml.WithClasses(true), chromahtml.ClassPrefix("hl-"))

// codeBlockRenderer highlights fenced and indented code. A language chroma
// does not know is shown plain: chroma is never asked to guess, which is slow
// and unpredictable.
type codeBlockRenderer struct{}

func (r *codeBlockRenderer) RegisterFuncs(reg renderer.NodeRendererFuncRegisterer) {
	reg.Register(ast.KindFencedCodeBlock, r.render)
	reg.Register(ast.KindCodeBlock, r.render)
}

func (r *codeBlockRenderer) render(w util.BufWriter, source []byte, node ast.Node, entering bool) (ast.WalkStatus, error) {
	if !entering {
		return ast.WalkContinue, nil
	}
	var lang string
	if fenced, ok := node.(*ast.FencedCodeBlock); ok {
		lang = strings.ToLower(string(fenced.Language(source)))
	}
	var code bytes.Buffer
	lines := node.Lines()
	for i := 0; i < lines.Len(); i++ {
		seg := lines.At(i)
		code.Write(seg.Value(source))
	}
	writeCode(w, lang, code.String())
	return ast.WalkSkipChildren, nil
}

// writeCode writes one code block, highlighted when the language is known.
func writeCode(w util.BufWriter, lang, code string) {
	if lexer := lexerFor(lang); lexer != nil {
		if it, err := lexer.Tokenise(nil, code); err == nil {
			out := codeBuffers.Get().(*bytes.Buffer)
			defer codeBuffers.Put(out)
			out.Reset()
			if codeFormatter.Format(out, highlightStyle, it) == nil {
				_, _ = w.WriteString(`<div class="sg-code" data-lang="` + string(util.EscapeHTML([]byte(lang))) + `">`)
				_, _ = w.Write(out.Bytes())
				_, _ = w.WriteString("</div>\n")
				return
			}
		}
	}
	_, _ = w.WriteString(`<div class="sg-code"><pre class="hl-chroma"><code>`)
	_, _ = w.Write(util.EscapeHTML([]byte(code)))
	_, _ = w.WriteString("</code></pre></div>\n")
}

// lexerFor returns the lexer for a fence's language, or nil. Lookups are
// remembered: chroma falls back to matching a name that is not a lexer's
// against every lexer's file patterns, which is slow ("sh" is such a name).
func lexerFor(lang string) chroma.Lexer {
	if lang == "" {
		return nil
	}
	if lang == "calc" {
		lang = "toml"
	}
	if l, ok := lexerCache.Load(lang); ok {
		lexer, _ := l.(chroma.Lexer)
		return lexer
	}
	var lexer chroma.Lexer
	if l := lexers.Get(lang); l != nil {
		lexer = chroma.Coalesce(l)
	}
	lexerCache.Store(lang, lexer)
	return lexer
}

// codeBuffers hold highlighted code until it is written to the page.
var codeBuffers = sync.Pool{New: func() any { return new(bytes.Buffer) }}

var lexerCache sync.Map // language → chroma.Lexer, or nil for none

// highlightStyle only decides which token classes exist; colours come from
// the site stylesheet (see SyntaxCSS).
var highlightStyle = styles.Fallback
