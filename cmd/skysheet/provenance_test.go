package main

import (
	"encoding/json"
	"strings"
	"testing"

	"skysheet/datasheet"
)

func TestFiguresProvenance(t *testing.T) {
	files := []string{"../../testdata/white-uvvis.csv", "../../testdata/white-ftir.tsv"}
	// sha256sum (GNU coreutils 9.1) of the two files as committed.
	sums := []string{
		"b34978e72d0b2b21cab3cc3baa2ae0292b5e1c6233e721e1d32d535815df4e16",
		"edadd46b2ede040d563c81056f06c386c862c9f71236cbda41f9e7aa604d2cd4",
	}
	code, out, errs := runCLI(append([]string{"figures"}, files...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{
		"Provenance:",
		"software: skysheet ",
		"input: " + files[0] + " sha256 " + sums[0],
		"input: " + files[1] + " sha256 " + sums[1],
		"weighting: ASTM G173-03 global tilt — ASTM G173-03 (reapproved 2012)",
		"weighting: Planck blackbody at 300 K — Planck's law with the exact SI constants h, c, k (CODATA 2018)",
		"Planck grid step 10 nm",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	code, out, errs = runCLI(append([]string{"figures", "--json"}, files...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var f datasheet.Figures
	if err := json.Unmarshal([]byte(out), &f); err != nil {
		t.Fatal(err)
	}
	p := f.Provenance
	if len(p.Inputs) != 2 || p.Inputs[0].SHA256 != sums[0] || p.Inputs[1].SHA256 != sums[1] || p.Inputs[1].Name != files[1] {
		t.Errorf("JSON provenance inputs = %+v", p.Inputs)
	}
	if len(p.Weightings) != 4 || p.Settings.PlanckStepNM != 10 || p.Settings.ClosureTolerance != 0.02 {
		t.Errorf("JSON provenance = %+v", p)
	}
}
