package weather

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"
	"time"

	"skysheet/spectra"
)

// FuzzParse checks that Parse never panics, that every error is a
// *spectra.ParseError naming the file, and that an accepted series keeps the
// format's promises and reads back the same after Write.
func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob("testdata/*.csv")
	for _, name := range files {
		if data, err := os.ReadFile(name); err == nil {
			f.Add(data)
		}
	}
	f.Add([]byte(rows(3)))
	f.Add([]byte("time,ghi (W/m2),dew point [K],air temperature (K),cloud fraction (%)\n2026-01-01T00:00Z,0,270,280,50\n2026-01-01T01:00+00:00,1,271,281,0\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		s, err := Parse(bytes.NewReader(in), "fuzz.csv")
		if err != nil {
			var pe *spectra.ParseError
			if !errors.As(err, &pe) || pe.File != "fuzz.csv" {
				t.Fatalf("error %v is not a *spectra.ParseError naming the file", err)
			}
			return
		}
		if len(s.Hours) == 0 {
			t.Fatal("a series of no hours accepted")
		}
		for q := Time; q <= GlobalHorizontal; q++ {
			if !s.Has(q) {
				t.Fatalf("accepted without %s", q)
			}
		}
		for i, h := range s.Hours {
			if i > 0 && h.Time.Sub(s.Hours[i-1].Time) != time.Hour {
				t.Fatalf("hour %d: step %v", i, h.Time.Sub(s.Hours[i-1].Time))
			}
			in := func(v, lo, hi float64, q Quantity) {
				if s.Has(q) {
					if !(v >= lo && v <= hi) {
						t.Fatalf("hour %d: %s = %v accepted", i, q, v)
					}
				} else if !math.IsNaN(v) {
					t.Fatalf("hour %d: %s = %v without a column", i, q, v)
				}
			}
			in(h.AirC, -90, 60, AirTemperature)
			in(h.DewPointC, -100, 60, DewPoint)
			in(h.GlobalWm2, 0, 1500, GlobalHorizontal)
			in(h.WindMS, 0, 100, WindSpeed)
			in(h.CloudFraction, 0, 1, CloudFraction)
			in(h.PressureHPa, 300, 1100, StationPressure)
			if h.DewPointC > h.AirC+DewPointSlackK {
				t.Fatalf("hour %d: dew point %v above air %v", i, h.DewPointC, h.AirC)
			}
		}
		var buf bytes.Buffer
		if err := Write(&buf, s); err != nil {
			t.Fatal(err)
		}
		back, err := Parse(&buf, "fuzz.csv")
		if err != nil {
			t.Fatalf("written series does not read back: %v\n%s", err, buf.String())
		}
		checkSame(t, s, back)
	})
}
