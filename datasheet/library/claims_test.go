package library

import (
	"math"
	"testing"

	"skysheet/datasheet"
)

func TestMaterialVerdicts(t *testing.T) {
	fsys := baseFS()
	fsys["content/flat.md"].Data = []byte(`---
title: Flat white test panel
maker: Test maker (invented)
spectra:
  - file: flat/solar.csv
  - file: flat/thermal.csv
measured: {angle: 8°}
claims:
  - {figure: solar_reflectance, value: 0.9}
  - {figure: thermal_emittance, value: 0.8, tolerance: 0.02}
  - {figure: solar_reflectance, value: 0.9, basis: {angle_deg: 45}}
  - {figure: solar_reflectance, value: .nan}
---
`)
	lib, err := Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	vs := lib.Materials[0].Verdicts()
	for i, tt := range []struct {
		status   datasheet.Status
		computed float64 // NaN: not computed
	}{
		// A band-weighted mean of a constant is the constant (closed
		// form): R = 0.9 gives 0.9, and opaque R = 0.05 an emittance of
		// 1 − 0.05 = 0.95 (Kirchhoff's law).
		{datasheet.Supported, 0.9},
		{datasheet.NotSupported, 0.95},
		// The claim's 45° is compared with the 8° written under measured:
		// more than 10° apart.
		{datasheet.CannotCheck, 0.9},
		// Malformed: judged, never an error.
		{datasheet.CannotCheck, math.NaN()},
	} {
		if i >= len(vs) {
			t.Fatalf("%d verdicts, want 4", len(vs))
		}
		v := vs[i]
		got := float64(v.Computed)
		if v.Status != tt.status || math.IsNaN(got) != math.IsNaN(tt.computed) || math.Abs(got-tt.computed) > 1e-9 {
			t.Errorf("claim %d: %v, computed %g; want %v, %g (%s)", i+1, v.Status, got, tt.status, tt.computed, v.Reason)
		}
	}
	if len(vs) != 4 {
		t.Errorf("%d verdicts, want 4", len(vs))
	}

	// No claims: an empty list, not nil (it is written as [] in JSON).
	lib.Materials[0].Front.Claims = nil
	if vs := lib.Materials[0].Verdicts(); vs == nil || len(vs) != 0 {
		t.Errorf("no claims: %#v", vs)
	}
}
