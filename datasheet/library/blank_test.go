package library

import (
	"strings"
	"testing"
	"testing/fstest"
)

// TestBlanks checks that every value and body line still holding a blank
// is an error at its line and column, all reported at once, and that a
// filled-in file loads.
func TestBlanks(t *testing.T) {
	src := strings.NewReplacer(
		"maker: Test maker (invented)", `maker: "FILL IN: who made it"`,
		"tags: [white, test]", `tags: [white, "FILL IN: more tags"]`,
		"  angle: 8°", `  angle: "FILL IN: the angle"`,
		"Text.", "Some text, then FILL IN: what to look for.",
	).Replace(goodMaterial)
	fsys := baseFS()
	fsys["content/flat.md"] = &fstest.MapFile{Data: []byte(src)}
	_, err := Load(fsys)
	checkErrors(t, err, []errAt{
		{ErrBlank, "content/flat.md", 3, "maker: who made it"},
		{ErrBlank, "content/flat.md", 5, "tags[2]: more tags"},
		{ErrBlank, "content/flat.md", 13, "measured.angle: the angle"},
		{ErrBlank, "content/flat.md", 21, "in the text: FILL IN: what to look for."},
	})
	if es := err.(Errors); len(es) == 4 {
		if c := es[0].(*Error).Column; c != 8 {
			t.Errorf("maker: column %d, want 8", c)
		}
		if c := es[3].(*Error).Column; c != 17 {
			t.Errorf("body: column %d, want 17", c)
		}
	}
	if _, err := Load(baseFS()); err != nil {
		t.Errorf("without blanks: %v", err)
	}
}
