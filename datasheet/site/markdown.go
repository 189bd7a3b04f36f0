package site

import (
	"bytes"
	"html/template"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/parser"
	"github.com/yuin/goldmark/renderer/html"
	"github.com/yuin/goldmark/text"
	"github.com/yuin/goldmark/util"
)

// markdown converts Markdown bodies to HTML: tables and footnotes on; raw
// HTML dropped unless allowHTML; headings moved so that the body's top
// level is h3, under the page's own section heading (h2).
type markdown struct{ md goldmark.Markdown }

func newMarkdown(allowHTML bool) markdown {
	var ropts []goldmark.Option
	if allowHTML {
		ropts = append(ropts, goldmark.WithRendererOptions(html.WithUnsafe()))
	}
	ropts = append(ropts,
		goldmark.WithExtensions(extension.Table, extension.Footnote),
		goldmark.WithParserOptions(parser.WithASTTransformers(util.Prioritized(demote{}, 100))),
	)
	return markdown{goldmark.New(ropts...)}
}

// render returns the HTML of a body. goldmark escapes text and drops
// dangerous link schemes, and without WithUnsafe it omits raw HTML.
func (m markdown) render(src []byte) (template.HTML, error) {
	var buf bytes.Buffer
	if err := m.md.Convert(src, &buf); err != nil {
		return "", err
	}
	return template.HTML(buf.String()), nil
}

// demote moves every heading by the same number of levels, so that the
// body's top level is h3 and no level is skipped below the page's h2
// (at most h6).
type demote struct{}

func (demote) Transform(doc *ast.Document, _ text.Reader, _ parser.Context) {
	var hs []*ast.Heading
	top := 7
	_ = ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if h, ok := n.(*ast.Heading); ok && entering {
			hs = append(hs, h)
			top = min(top, h.Level)
		}
		return ast.WalkContinue, nil
	})
	for _, h := range hs {
		h.Level = min(h.Level+3-top, 6)
	}
}
