package library

import (
	"errors"
	"strings"
	"testing"
	"testing/fstest"
)

// TestLongValueCut checks that front matter and config messages quote at
// most a readable part of an offending value.
func TestLongValueCut(t *testing.T) {
	huge := strings.Repeat("y", 1<<20)
	for _, tc := range []struct {
		name, md, config string
		want             error
	}{
		{"unknown key", strings.Replace(goodMaterial, "tags:", huge[:1000]+": 1\ntags:", 1), "title: x\n", ErrUnknownKey},
		{"bad slug", strings.Replace(goodMaterial, "tags:", "slug: "+huge+"!\ntags:", 1), "title: x\n", ErrBadSlug},
		{"unknown compare entry", "---\ntitle: t\ncompare: [" + huge + "]\n---\n", "title: x\n", ErrUnknownMaterial},
		{"site address", "---\ntitle: t\ncompare: [flat]\n---\n", "site_address: " + huge + "\n", ErrType},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fsys := baseFS()
			fsys["content/z.md"] = &fstest.MapFile{Data: []byte(tc.md)}
			fsys["skysheet.yaml"] = &fstest.MapFile{Data: []byte(tc.config)}
			_, err := Load(fsys)
			if !errors.Is(err, tc.want) {
				t.Fatalf("error %.300v, want %v", err, tc.want)
			}
			if msg := err.Error(); len(msg) > 2000 || !strings.Contains(msg, "y…") {
				t.Errorf("message of %d bytes, want the value cut to 40 characters and …: %.300s", len(msg), msg)
			}
		})
	}
}
