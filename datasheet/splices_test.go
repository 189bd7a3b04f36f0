package datasheet

import (
	"encoding/json"
	"strings"
	"testing"

	"skysheet/spectra"
)

func TestComputeSplices(t *testing.T) {
	parse := func(name, in string) *spectra.Spectrum {
		s, err := spectra.Parse(strings.NewReader(in), name)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	a := parse("a.csv", "wavelength_nm,R\n300,0.8\n2000,0.8\n2600,0.8\n")
	b := parse("b.csv", "wavelength_nm,R\n2400,0.83\n2600,0.83\n25000,0.05\n")
	for _, tt := range []struct {
		name  string
		parts []*spectra.Spectrum
		want  string
	}{
		{"none", []*spectra.Spectrum{a}, `"splices":[]`},
		// offset = mean(f − g) = 0.8 − 0.83 over the overlap (closed form);
		// a mean mismatch of 0.03 exceeds the default tolerance 0.02
		{"one", []*spectra.Spectrum{a, b}, `"splices":[{"quantity":"R","junction_nm":2500,"overlap_nm":[2400,2600],"method":"offset","adjusted":"b.csv","fixed":"a.csv","offset_or_scale":-0.03`},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s, err := spectra.Join(tt.parts, spectra.SpliceOptions{})
			if err != nil {
				t.Fatal(err)
			}
			f, err := compute(s, DefaultConditions())
			if err != nil {
				t.Fatal(err)
			}
			j, err := json.Marshal(f)
			if err != nil {
				t.Fatal(err)
			}
			got := string(j)
			if i := strings.Index(got, `"splices":`); i < 0 || !strings.HasPrefix(got[i:], strings.Replace(tt.want, "-0.03", "", 1)) {
				t.Errorf("JSON %s\nwant %s", got, tt.want)
			}
			if tt.name == "one" {
				r := f.Splices[0]
				if d := r.Value + 0.03; d > 1e-12 || d < -1e-12 || !r.Flagged || r.MismatchMax-0.03 > 1e-12 {
					t.Errorf("record %+v", r)
				}
				for _, k := range []string{"junction_nm", "method", "adjusted", "offset_or_scale", "mismatch_mean", "mismatch_max", "tolerance", "flagged"} {
					if !strings.Contains(got, `"`+k+`":`) {
						t.Errorf("key %s missing", k)
					}
				}
			}
		})
	}
}
