package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReferenceConfined checks that a data file's reference_file is read
// only inside the data file's folder, unless the same file is given with
// --reference, and that no content of a file that is not a spectrum is
// echoed.
func TestReferenceConfined(t *testing.T) {
	top := t.TempDir()
	dir := filepath.Join(top, "data")
	secret := "TOPSECRET-first-line"
	writeNew(t, filepath.Join(top, "outside.csv"), "wavelength_nm,R\n200,0.5\n3000,0.5\n")
	writeNew(t, filepath.Join(top, "secret.txt"), secret+"\n")
	writeNew(t, filepath.Join(dir, "std", "notes.txt"), secret+"\nmore\n")
	if err := os.Symlink(filepath.Join(top, "outside.csv"), filepath.Join(dir, "link.csv")); err != nil {
		t.Skip("no symbolic links:", err)
	}
	sample := func(ref string) string {
		p := filepath.Join(dir, "s.csv")
		writeAt(t, p, "# reference_file: "+ref+"\nwavelength_nm,R\n280,0.8\n2500,0.7\n")
		return p
	}
	for _, tc := range []struct {
		name, ref string
		extra     []string
		code      int
		want      string
	}{
		{"up and out", "../outside.csv", nil, 1, "leaves the folder of the data file"},
		{"absolute", filepath.Join(top, "secret.txt"), nil, 1, "leaves the folder of the data file"},
		{"a link out", "link.csv", nil, 1, "leaves the folder of the data file"},
		{"not a spectrum", "std/notes.txt", nil, 1, "notes.txt:1: column 1: is not a known spectral axis"},
		{"given on the command line too", "../outside.csv", []string{"--reference", filepath.Join(top, "outside.csv")}, 0, "Solar reflectance"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			args := append(append([]string{"figures"}, tc.extra...), sample(tc.ref))
			code, out, errs := runCLI(args...)
			if code != tc.code || !strings.Contains(out+errs, tc.want) {
				t.Errorf("exit %d, want %d and %q:\n%s%s", code, tc.code, tc.want, out, errs)
			}
			if strings.Contains(out+errs, secret) {
				t.Errorf("file content echoed: %s", errs)
			}
			if code == 1 && tc.want == "leaves the folder of the data file" && !strings.Contains(errs, "--reference") {
				t.Errorf("the message does not say how to go on: %s", errs)
			}
		})
	}
	_, err := resolveReference(sample("../outside.csv"), "../outside.csv", "")
	if !errors.Is(err, errReferenceOutside) {
		t.Errorf("error %v, want errReferenceOutside", err)
	}
}
