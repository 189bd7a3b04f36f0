package main

import (
	"bytes"
	"strings"
	"testing"
)

// runCLI runs one command line in-process and returns exit status and output.
func runCLI(args ...string) (int, string, string) {
	var out, errb bytes.Buffer
	code := run(&env{stdout: &out, stderr: &errb, stdin: strings.NewReader("")}, args)
	return code, out.String(), errb.String()
}

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
	dir := t.TempDir()
	name := dir + "/white.csv"
	writeFile(t, name, "wavelength_nm;R\n400;0,5\n500;0,9x\n")
	code, _, errs := runCLI("figures", name)
	if code != 1 {
		t.Errorf("exit %d, want 1", code)
	}
	if want := name + `:3: column 2 (R): "0,9x" is not a number`; !strings.Contains(errs, want) {
		t.Errorf("stderr %q lacks %q", errs, want)
	}
}
