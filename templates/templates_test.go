package templates

import (
	"html/template"
	"io/fs"
	"regexp"
	"testing"
)

func TestParse(t *testing.T) {
	tm, err := template.New("").ParseFS(FS, "*.html")
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"index", "datasheet", "listing", "compare", "review", "top", "bottom", "site-header", "site-footer", "head-extra", "chart", "material-table", "verdict", "claim-detail", "pitfall", "review-table", "note-ref"} {
		if tm.Lookup(name) == nil {
			t.Errorf("template %q is not defined", name)
		}
	}
}

// TestNoExternalResources checks that no default file loads anything from
// another host: the site must work offline.
func TestNoExternalResources(t *testing.T) {
	ext := regexp.MustCompile(`(?i)(src|href)\s*=\s*"(https?:)?//|@import|url\(\s*["']?(https?:)?//`)
	err := fs.WalkDir(FS, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := fs.ReadFile(FS, p)
		if err != nil {
			return err
		}
		if loc := ext.FindIndex(data); loc != nil {
			t.Errorf("%s loads an external resource: %q", p, data[loc[0]:loc[1]])
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
}
