package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestEscapeWriter(t *testing.T) {
	for _, tc := range []struct {
		name   string
		writes []string
		want   string
	}{
		{"plain text and Unicode pass", []string{"Solar reflectance 0.95, 8–13 µm, é\n\tnext"}, "Solar reflectance 0.95, 8–13 µm, é\n\tnext"},
		{"an escape sequence", []string{"a\x1b[2Jb"}, `a\x1b[2Jb`},
		{"carriage return and bell", []string{"x\ry\a"}, `x\x0dy\x07`},
		{"DEL", []string{"\x7f"}, `\x7f`},
		{"a C1 control (CSI)", []string{"a\u009b31mb"}, `a\u009b31mb`},
		{"a byte that is not UTF-8", []string{"a\x9bb\xff"}, `a\x9bb\xff`},
		{"a rune cut between writes", []string{"caf\xc3", "\xa9!"}, "café!"},
		{"a C1 control cut between writes", []string{"x\xc2", "\x9by"}, `x\u009by`},
		{"an unfinished sequence at the end", []string{"ok\xe2\x80"}, `ok\xe2\x80`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			w := escaping(&b)
			for _, s := range tc.writes {
				if n, err := w.Write([]byte(s)); n != len(s) || err != nil {
					t.Fatalf("Write = %d, %v", n, err)
				}
			}
			flushAll(w)
			if b.String() != tc.want {
				t.Errorf("got %q, want %q", b.String(), tc.want)
			}
		})
	}
}

// TestTextOutputEscapesControls checks the review report, the figures table
// and error messages with control characters in titles and file names.
func TestTextOutputEscapesControls(t *testing.T) {
	lib := copyLibrary(t)
	md := filepath.Join(lib, "content", "roof", "basalt.md")
	src, _ := os.ReadFile(md)
	writeAt(t, md, strings.Replace(string(src), "title: Basalt roof coating (invented)", `title: "\e[2J\e]0;owned\a Basalt"`, 1))
	_, out, errs := runCLI("review", lib)
	if strings.ContainsAny(out+errs, "\x1b\a") || !strings.Contains(out, `\x1b[2J\x1b]0;owned\x07 Basalt`) {
		t.Errorf("review text report:\n%s%s", out, errs)
	}
	// JSON keeps the title as data (encoding/json escapes it itself).
	if _, out, _ := runCLI("review", lib, "--format", "json"); !strings.Contains(out, `\u001b[2J`) {
		t.Errorf("review JSON lost the title")
	}

	dir := t.TempDir()
	name := filepath.Join(dir, "a\x1b[31mred.csv")
	writeAt(t, name, "wavelength_nm,R\n300,0.5\n2500,0.5\n")
	code, out, errs := runCLI("figures", name)
	if code != 0 || strings.Contains(out, "\x1b") || !strings.Contains(out, `a\x1b[31mred.csv`) {
		t.Errorf("figures: exit %d\n%s%s", code, out, errs)
	}
	_, _, errs = runCLI("figures", filepath.Join(dir, "no\x1b[31mfile.csv"))
	if strings.Contains(errs, "\x1b") || !strings.Contains(errs, `no\x1b[31mfile.csv`) {
		t.Errorf("error message %q", errs)
	}
}
