package datasheet

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"skysheet/spectra"
)

// TestNMCursor checks nmCursor.find against a binary search of the whole
// list (sort.SearchFloat64s) for wavelengths read in order, repeated,
// going back and jumping ahead.
func TestNMCursor(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	for range 100 {
		var nm []float64
		x := 0.0
		for range r.IntN(40) {
			x += 0.5 + r.Float64()
			nm = append(nm, x)
		}
		c := nmCursor{nm: nm}
		q := -1.0
		for range 200 {
			switch r.IntN(6) {
			case 0:
				q -= 5 * r.Float64()
			case 1:
				q += 20 * r.Float64()
			case 2:
				if len(nm) > 0 {
					q = nm[r.IntN(len(nm))]
				}
			case 3:
			default:
				q += r.Float64()
			}
			want := sort.SearchFloat64s(nm, q)
			got, ok := c.find(q)
			if got != want || ok != (want < len(nm) && nm[want] == q) {
				t.Fatalf("find(%v) in %v = %d %v, want %d", q, nm, got, ok, want)
			}
		}
	}
}

// TestSpreadWindows checks that spread, summing over the rows windows
// finds, gives to the bit what the sum that looks for the end of each
// row's window as it goes gives (the form it replaces).
func TestSpreadWindows(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 10))
	for range 50 {
		rt := &rowTable{}
		pos := 0.0
		for k := range 300 {
			if r.IntN(40) == 0 {
				pos = 10 * r.Float64()
			}
			pos += 0.4 * r.Float64()
			rt.nm, rt.pos, rt.group = append(rt.nm, float64(k)), append(rt.pos, pos), append(rt.group, k/100)
		}
		for range 3 {
			b := make([]float64, len(rt.nm))
			for k := range b {
				if r.IntN(3) > 0 {
					b[k] = r.NormFloat64()
				}
			}
			var sum float64
			for k := range b {
				x := b[k]
				if x == 0 {
					continue
				}
				sum += x * x
				for l := k + 1; l < len(b) && rt.group[l] == rt.group[k]; l++ {
					d := rt.pos[l] - rt.pos[k]
					if d >= 1 {
						break
					}
					sum += 2 * x * b[l] * (1 - d)
				}
			}
			if got, want := rt.spread(b), math.Sqrt(math.Max(0, sum)); math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("spread %v, want %v", got, want)
			}
		}
	}
}

// TestPradShared checks that P_rad from the grid's kept Planck
// denominators is prad's to the bit, for states of one grid loaded with
// different emittances, at every temperature a root search tries first.
func TestPradShared(t *testing.T) {
	s := whiteSample(t)
	c := DefaultConditions()
	o := spectra.Resolve(s, c.ClosureTol)
	sky, err := skyFor(c)
	if err != nil {
		t.Fatal(err)
	}
	g := newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)
	if g == nil {
		t.Fatal("no grid")
	}
	steps := g.bracketSteps(0.05*c.AmbientK, 10*c.AmbientK)
	if len(steps) < 4 {
		t.Fatalf("steps %v", steps)
	}
	for _, k := range []float64{1, 0.93} {
		st := g.load(o.A, k)
		for _, temp := range steps {
			if got, want := st.pradShared(temp), st.prad(temp); math.Float64bits(got) != math.Float64bits(want) {
				t.Errorf("k %g, %g K: %v, prad %v", k, temp, got, want)
			}
		}
	}
	if len(g.den.den) == 0 {
		t.Error("no denominators kept")
	}
}

// TestPlanckTables checks the Planck denominators kept across grids: two
// grids with the same nodes share one table and another grid gets its own;
// the interpolant of P_rad made from the table is the one made from prad,
// coefficient for coefficient to the bit; and a full table gives prad's
// sums without keeping more.
func TestPlanckTables(t *testing.T) {
	c := DefaultConditions()
	sky, err := skyFor(c)
	if err != nil {
		t.Fatal(err)
	}
	o := spectra.Resolve(whiteSample(t), c.ClosureTol)
	g1 := newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)
	g2 := newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)
	other := newCoolGrid(spectra.Resolve(selectiveSample(), c.ClosureTol).A, sky, c.ExchangeBand, c.AmbientK)
	if g1 == nil || g2 == nil || other == nil {
		t.Fatal("no grid")
	}
	if g1.den != g2.den || g1.den == other.den {
		t.Errorf("tables: same nodes %p, %p; other nodes %p", g1.den, g2.den, other.den)
	}
	s := g2.load(o.A, 0.97)
	lo, hi := c.AmbientK+smoothBelowK, c.AmbientK+smoothAboveK
	byTable, bySums := newSmoothFit(s.pradShared, lo, hi), newSmoothFit(s.prad, lo, hi)
	for j := range byTable.c {
		if math.Float64bits(byTable.c[j]) != math.Float64bits(bySums.c[j]) {
			t.Errorf("coefficient %d: %v from the table, %v from prad", j, byTable.c[j], bySums.c[j])
		}
	}
	full := &planckTable{x: g1.x, den: map[float64][]float64{}}
	for i := 0; (i+1)*len(full.x) <= maxPlanckTableValues; i++ {
		full.den[-1-float64(i)] = nil // temperatures never asked for
	}
	h := *g1
	h.den = full
	st := h.load(o.A, 1)
	kept := len(full.den)
	if got, want := st.pradShared(290), st.prad(290); math.Float64bits(got) != math.Float64bits(want) {
		t.Errorf("full table: %v, prad %v", got, want)
	}
	if len(full.den) != kept {
		t.Errorf("a full table kept %d temperatures, had %d", len(full.den), kept)
	}
}
