package site

import (
	"regexp"
	"strings"
	"testing"
)

// TestMarkdownHeadings checks that a body's headings keep their order and
// steps, with the top one at h3 (under the page's h2) and none skipped.
func TestMarkdownHeadings(t *testing.T) {
	tag := regexp.MustCompile(`<h(\d)>`)
	for _, tc := range []struct{ src, want string }{
		{"# A\n\n## B\n\n### C\n", "345"},
		{"## A\n\ntext\n\n### B\n\n## C\n", "343"},
		{"#### A\n\n##### B\n", "34"},
		{"# A\n\n###### F\n", "36"},                 // h8 is none: h6 at most
		{"## A\n\n#### B (a step skipped)\n", "35"}, // the author's steps are kept
		{"no heading\n", ""},
	} {
		html, err := newMarkdown(false).render([]byte(tc.src))
		if err != nil {
			t.Fatal(err)
		}
		var got strings.Builder
		for _, m := range tag.FindAllStringSubmatch(string(html), -1) {
			got.WriteString(m[1])
		}
		if got.String() != tc.want {
			t.Errorf("%q: heading levels %q, want %q (%s)", tc.src, got.String(), tc.want, html)
		}
	}
}
