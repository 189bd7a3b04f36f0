package weather

import (
	"math"
	"testing"
	"time"
)

func TestConvectiveH(t *testing.T) {
	// Watmuff, Charters & Proctor (1977), as given by Duffie & Beckman,
	// Solar Engineering of Thermal Processes §3.15: h = 2.8 + 3.0 V
	// (from memory), recomputed here at each wind speed.
	for _, v := range []float64{0, 0.5, 1, 2.5, 5, ConvectiveMaxWindMS} {
		want := 2.8 + 3.0*v
		if got := ConvectiveH(v); math.Abs(got-want) > 1e-12 {
			t.Errorf("ConvectiveH(%g) = %g, want %g", v, got, want)
		}
	}
	// The same source's reading of McAdams's 5.7 + 3.8 V (from memory):
	// it includes radiation and free convection, so it lies above the
	// convective part at every wind speed of the range.
	for v := 0.0; v <= ConvectiveMaxWindMS; v += 0.5 {
		if mcAdams := 5.7 + 3.8*v; ConvectiveH(v) >= mcAdams {
			t.Errorf("V = %g: %g not below McAdams's %g", v, ConvectiveH(v), mcAdams)
		}
	}
	for _, bad := range []float64{-0.1, math.NaN()} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("ConvectiveH(%v) did not panic", bad)
				}
			}()
			ConvectiveH(bad)
		}()
	}
}

func TestCloudySkyEmissivity(t *testing.T) {
	// Crawford & Duchon (1999): ε = c + (1 − c) ε_clear (from memory),
	// recomputed here; the limits c = 0 (clear) and c = 1 (overcast,
	// black clouds) follow from it.
	cases := []struct{ clear, c, want float64 }{
		{0.774, 0, 0.774},
		{0.774, 1, 1},
		{0.774, 0.5, 0.5 + 0.5*0.774},
		{0.65, 0.3, 0.3 + 0.7*0.65},
		{0, 0.25, 0.25},
	}
	for _, c := range cases {
		if got := CloudySkyEmissivity(c.clear, c.c); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("CloudySkyEmissivity(%g, %g) = %g, want %g", c.clear, c.c, got, c.want)
		}
	}
	for _, bad := range [][2]float64{{0.7, -0.01}, {0.7, 1.01}, {1.1, 0.5}, {0.7, math.NaN()}} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("CloudySkyEmissivity(%v) did not panic", bad)
				}
			}()
			CloudySkyEmissivity(bad[0], bad[1])
		}()
	}
}

func TestBerdahlMartinTerms(t *testing.T) {
	// Berdahl & Martin (1984), Solar Energy 32, 663 (from memory):
	// Δε = 0.013 cos(2π t/24) and Δε = 0.00012 (P − 1000), P in hPa;
	// recomputed here.
	for _, c := range []struct{ hour, want float64 }{
		{0, 0.013},
		{6, 0},
		{12, -0.013},
		{18, 0},
		{24, 0.013},
		{3, 0.013 * math.Sqrt2 / 2}, // cos(π/4) = √2/2
		{14.5, 0.013 * math.Cos(2*math.Pi*14.5/24)},
	} {
		if got := HourTerm(c.hour); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("HourTerm(%g) = %g, want %g", c.hour, got, c.want)
		}
	}
	for _, c := range []struct{ p, want float64 }{
		{1000, 0},
		{900, -0.012},
		{1013.25, 0.00159}, // the standard atmosphere at sea level, 1013.25 hPa (ISO 2533)
		{850, 0.00012 * -150},
	} {
		if got := PressureTerm(c.p); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("PressureTerm(%g) = %g, want %g", c.p, got, c.want)
		}
	}
}

func TestHourOfDay(t *testing.T) {
	plus2 := time.FixedZone("", 2*3600)
	cases := []struct {
		t    time.Time
		want float64
	}{
		{time.Date(2026, 7, 1, 0, 0, 0, 0, plus2), 0},
		{time.Date(2026, 7, 1, 13, 30, 0, 0, plus2), 13.5},
		{time.Date(2026, 7, 1, 23, 59, 59, 500_000_000, plus2), 23 + 59.0/60 + 59.5/3600},
		// The same instant read in UTC is two hours earlier on the clock.
		{time.Date(2026, 7, 1, 13, 30, 0, 0, plus2).UTC(), 11.5},
	}
	for _, c := range cases {
		if got := HourOfDay(c.t); math.Abs(got-c.want) > 1e-9 {
			t.Errorf("HourOfDay(%v) = %v, want %v", c.t, got, c.want)
		}
	}
}
