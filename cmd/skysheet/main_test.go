package main

import (
	"strings"
	"testing"
)

func TestExitCodes(t *testing.T) {
	for _, tt := range []struct {
		name string
		args []string
		code int
		out  string // substring of stdout+stderr
	}{
		{"help", []string{"help"}, 0, "Verbs:"},
		{"no verb", nil, 2, "Usage"},
		{"unknown verb", []string{"frobnicate"}, 2, "unknown verb"},
		{"figures -h", []string{"figures", "-h"}, 0, "-solar-band"},
		{"figures no files", []string{"figures"}, 2, "no spectrum files"},
		{"figures bad flag", []string{"figures", "--nope", "x.csv"}, 2, "flag provided but not defined"},
		{"figures bad band", []string{"figures", "--solar-band", "2500,280", "x.csv"}, 2, "LO < HI"},
		{"figures band outside G173", []string{"figures", "--solar-band", "200,2500", "../../testdata/white-uvvis.csv"}, 2, "G173"},
		{"figures missing file", []string{"figures", "no-such-file.csv"}, 1, "no-such-file.csv"},
		{"figures ok", []string{"figures", "../../testdata/white-uvvis.csv", "../../testdata/white-ftir.tsv"}, 0, "Solar reflectance"},
		{"figures flags after files", []string{"figures", "../../testdata/white-uvvis.csv", "--json"}, 0, `"solar_reflectance"`},
	} {
		t.Run(tt.name, func(t *testing.T) {
			code, out, errs := runCLI(tt.args...)
			if code != tt.code {
				t.Errorf("exit %d, want %d\nstdout: %s\nstderr: %s", code, tt.code, out, errs)
			}
			if !strings.Contains(out+errs, tt.out) {
				t.Errorf("output lacks %q\nstdout: %s\nstderr: %s", tt.out, out, errs)
			}
		})
	}
}

func TestBadDataMessage(t *testing.T) {
	name := writeFile(t, "white.csv", "wavelength_nm;R\n400;0,5\n500;0,9x\n")
	code, _, errs := runCLI("figures", name)
	if code != 1 {
		t.Errorf("exit %d, want 1", code)
	}
	if want := name + `:3: column 2 (R): "0,9x" is not a number`; !strings.Contains(errs, want) {
		t.Errorf("stderr %q lacks %q", errs, want)
	}
}

// TestHelpListsVerbs checks that "skysheet help" lists exactly the verbs,
// and that the verbs they replaced are unknown.
func TestHelpListsVerbs(t *testing.T) {
	code, out, _ := runCLI("help")
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	_, list, ok := strings.Cut(out, "Verbs:\n")
	if !ok {
		t.Fatalf("no verb list in\n%s", out)
	}
	list, _, _ = strings.Cut(list, "\n\n")
	var got []string
	for line := range strings.Lines(list) {
		got = append(got, strings.Fields(line)[0])
	}
	want := []string{"figures", "import", "init", "preview", "render", "review", "splice", "version"}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("help lists %v, want %v", got, want)
	}
	for _, old := range []string{"build", "serve", "check", "new"} {
		if code, _, errs := runCLI(old); code != 2 || !strings.Contains(errs, "unknown verb") {
			t.Errorf("%s: exit %d, %q; want an unknown verb", old, code, errs)
		}
	}
}
