package library

import (
	"errors"
	"testing"
	"testing/fstest"
)

// TestLoadDropsBrokenComparison checks that a comparison naming a slug that
// no material has is reported and not returned, like a material with an
// error (found by FuzzLoad; the crasher is kept in testdata/fuzz/FuzzLoad).
func TestLoadDropsBrokenComparison(t *testing.T) {
	for _, tc := range []struct {
		name, md string
		want     error
	}{
		{"only unknown slugs", "---\ntitle: c\ncompare: [nothere]\n---\n", ErrUnknownMaterial},
		{"one unknown slug", "---\ntitle: c\ncompare: [flat, nothere]\n---\n", ErrUnknownMaterial},
		{"a material that failed", "---\ntitle: c\ncompare: [flat, broken]\n---\n", ErrUnknownKey},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fsys := baseFS()
			fsys["content/z.md"] = &fstest.MapFile{Data: []byte(tc.md)}
			fsys["content/broken.md"] = &fstest.MapFile{Data: []byte("---\ntitle: b\nwrong: 1\n---\n")}
			lib, err := Load(fsys)
			if !errors.Is(err, tc.want) {
				t.Fatalf("error %v, want %v", err, tc.want)
			}
			if len(lib.Comparisons) != 0 {
				t.Errorf("the comparison was returned with %d materials", len(lib.Comparisons[0].Materials))
			}
		})
	}
}
