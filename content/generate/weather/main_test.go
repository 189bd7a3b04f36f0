package main

import (
	"bytes"
	"strings"
	"testing"
	"time"

	"skysheet/datasheet/weather"
)

// TestSeriesUpToDate fails when the committed series differ from what the
// generator writes.
func TestSeriesUpToDate(t *testing.T) {
	var out, errs bytes.Buffer
	if code := run([]string{"-check", "-root", "../../.."}, &out, &errs); code != 0 {
		t.Fatalf("weather -check exited %d (run `go run ./content/generate/weather` from the root):\n%s", code, errs.String())
	}
}

func TestDeterministic(t *testing.T) {
	a, b := files(), files()
	for i := range a {
		if !bytes.Equal(a[i].data, b[i].data) {
			t.Errorf("%s differs between two runs", a[i].path)
		}
	}
}

// TestReaderAccepts reads each series with the weather reader: a full year of
// hours with every column, marked as invented.
func TestReaderAccepts(t *testing.T) {
	for _, f := range files() {
		s, err := weather.Parse(bytes.NewReader(f.data), f.path)
		if err != nil {
			t.Fatalf("%s: %v", f.path, err)
		}
		if len(s.Hours) != 8760 {
			t.Errorf("%s: %d hours, want 8760 (2025)", f.path, len(s.Hours))
		}
		for _, q := range weather.Quantities {
			if !s.Has(q) {
				t.Errorf("%s: no %s column", f.path, q)
			}
		}
		first, last := s.Hours[0].Time, s.Hours[len(s.Hours)-1].Time
		if first.Month() != time.January || first.Day() != 1 || first.Hour() != 0 || last.Month() != time.December || last.Day() != 31 || last.Hour() != 23 {
			t.Errorf("%s: %v to %v, want the clock year 2025", f.path, first, last)
		}
		if !strings.HasPrefix(string(f.data), "# Invented, synthetic, not measured") || !strings.Contains(s.Name, "(invented)") {
			t.Errorf("%s: not marked as invented in its first line and its name", f.path)
		}
		// Night: no sunlight at local midnight (the sites lie between
		// 20° and 35° N, where the sun never shines at midnight).
		for _, h := range s.Hours {
			if h.Time.Hour() == 0 && h.GlobalWm2 != 0 {
				t.Fatalf("%s: %v W/m² at %v", f.path, h.GlobalWm2, h.Time)
			}
		}
	}
}
