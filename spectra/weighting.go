package spectra

import (
	_ "embed"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
)

// Weighting is a spectral weighting function w(λ) ≥ 0.
type Weighting interface {
	// At returns w at wavelength nm; zero outside the weighting's range.
	At(nm float64) float64
	// Knots returns, in increasing order, the wavelengths strictly inside
	// (lo, hi) at which w must be sampled: a table's own points, or a
	// uniform grid for a formula.
	Knots(lo, hi float64) []float64
	// String names the weighting for reports, e.g. "ASTM G173-03 global tilt".
	String() string
}

// Physical constants, exact in SI since 2019 (CODATA 2018).
const (
	PlanckConstant = 6.62607015e-34 // J s
	SpeedOfLight   = 299792458.0    // m s⁻¹
	Boltzmann      = 1.380649e-23   // J K⁻¹
)

// StefanBoltzmann is σ = 2π⁵k⁴/(15h³c²) in W m⁻² K⁻⁴, derived from the exact
// constants above.
var StefanBoltzmann = 2 * math.Pow(math.Pi, 5) * math.Pow(Boltzmann, 4) /
	(15 * math.Pow(PlanckConstant, 3) * SpeedOfLight * SpeedOfLight)

// Planck returns the blackbody spectral radiance B(λ, T) in
// W m⁻² sr⁻¹ nm⁻¹ at wavelength nm and temperature kelvin.
func Planck(nm, kelvin float64) float64 {
	l := nm * 1e-9
	x := PlanckConstant * SpeedOfLight / (l * Boltzmann * kelvin)
	return 2 * PlanckConstant * SpeedOfLight * SpeedOfLight / (l * l * l * l * l) / math.Expm1(x) * 1e-9
}

// PlanckStepNM is the spacing of the uniform grid on which a [Blackbody]
// weighting is sampled, in addition to the data's own wavelengths. Halving it
// changes thermal figures by less than 1e-6 (checked in the tests).
const PlanckStepNM = 10.0

// Blackbody is the Planck weighting B(λ, T) at temperature K (kelvin).
type Blackbody struct{ K float64 }

// At returns B(λ, T) in W m⁻² sr⁻¹ nm⁻¹.
func (b Blackbody) At(nm float64) float64 {
	if nm <= 0 {
		return 0
	}
	return Planck(nm, b.K)
}

// Knots returns the multiples of [PlanckStepNM] strictly inside (lo, hi).
func (b Blackbody) Knots(lo, hi float64) []float64 {
	var out []float64
	for x := math.Floor(lo/PlanckStepNM+1) * PlanckStepNM; x < hi; x += PlanckStepNM {
		if x > lo {
			out = append(out, x)
		}
	}
	return out
}

func (b Blackbody) String() string {
	return fmt.Sprintf("Planck blackbody at %s K", strconv.FormatFloat(b.K, 'f', -1, 64))
}

// table is a tabulated weighting, linear between its points.
type table struct {
	name  string
	nm, w []float64
}

func (t *table) At(nm float64) float64 {
	if nm < t.nm[0] || nm > t.nm[len(t.nm)-1] {
		return 0
	}
	return Piece{NM: t.nm, V: t.w}.at(nm)
}

func (t *table) Knots(lo, hi float64) []float64 {
	i := sort.Search(len(t.nm), func(i int) bool { return t.nm[i] > lo })
	j := sort.Search(len(t.nm), func(i int) bool { return t.nm[i] >= hi })
	if i >= j {
		return nil
	}
	// Full slice expression: a caller that appends must not write into
	// the table.
	return t.nm[i:j:j]
}

func (t *table) String() string { return t.name }

// weightReader reads a weighting at increasing wavelengths: a table with a
// cursor (the same values as At, without a search for each), any other
// weighting through At.
type weightReader struct {
	w Weighting
	t *table
	c cursor
}

func newWeightReader(w Weighting) weightReader {
	r := weightReader{w: w}
	if t, ok := w.(*table); ok {
		r.t, r.c = t, cursor{p: Piece{NM: t.nm, V: t.w}}
	}
	return r
}

func (r *weightReader) at(nm float64) float64 {
	if r.t == nil {
		return r.w.At(nm)
	}
	v, ok := r.c.value(nm)
	if !ok {
		return 0 // outside the table, as At
	}
	return v
}

//go:embed astm-g173-03.csv
var g173CSV string

var (
	g173Once            sync.Once
	g173Global, g173Dir *table
)

func loadG173() {
	lines := strings.Split(strings.TrimSpace(g173CSV), "\n")
	g173Global = &table{name: "ASTM G173-03 global tilt"}
	g173Dir = &table{name: "ASTM G173-03 direct + circumsolar"}
	for _, ln := range lines[2:] {
		f := strings.Split(strings.TrimSpace(ln), ",")
		nm, err1 := strconv.ParseFloat(f[0], 64)
		gl, err2 := strconv.ParseFloat(f[2], 64)
		di, err3 := strconv.ParseFloat(f[3], 64)
		if err1 != nil || err2 != nil || err3 != nil {
			panic("spectra: embedded ASTM G173-03 table is corrupt: " + ln)
		}
		g173Global.nm = append(g173Global.nm, nm)
		g173Global.w = append(g173Global.w, gl)
		g173Dir.w = append(g173Dir.w, di)
	}
	g173Dir.nm = g173Global.nm
}

// SolarGlobal returns the ASTM G173-03 global tilt (37°) spectral irradiance,
// W m⁻² nm⁻¹, 280–4000 nm.
func SolarGlobal() Weighting { g173Once.Do(loadG173); return g173Global }

// SolarDirect returns the ASTM G173-03 direct + circumsolar spectral
// irradiance, W m⁻² nm⁻¹, 280–4000 nm.
func SolarDirect() Weighting { g173Once.Do(loadG173); return g173Dir }

// SolarRangeNM is the wavelength range of the ASTM G173-03 tables.
var SolarRangeNM = Interval{280, 4000}

// Mean is the result of [BandMean].
type Mean struct {
	// Value is ∫ x w dλ / ∫ w dλ over the covered part; NaN when nothing of
	// the band is covered.
	Value float64
	// Coverage is ∫ w over the covered part / ∫ w over the whole band.
	Coverage float64
	// Covered lists the covered parts of the band.
	Covered []Interval
	// WX and W are ∫ x w dλ and ∫ w dλ over the covered part; WBand is ∫ w dλ
	// over the whole band.
	WX, W, WBand float64
	// Coef[i][j] is ∂Value/∂x.Pieces[i].V[j]: Value = Σ Coef·x. Pieces that
	// miss the band have nil rows.
	Coef [][]float64
}

// BandMean returns the w-weighted mean of x over the band [lo, hi] nm.
// x and w are each linear between their own points; the integrals use the
// trapezoid rule on the union of x's points, w's knots and the band limits.
// It panics if lo >= hi.
func BandMean(x Series, w Weighting, lo, hi float64) Mean {
	if !(lo < hi) {
		panic(fmt.Sprintf("spectra: BandMean: empty band [%g, %g]", lo, hi))
	}
	m := Mean{Coef: make([][]float64, len(x.Pieces))}
	for i, p := range x.Pieces {
		a, b := math.Max(lo, p.NM[0]), math.Min(hi, p.NM[len(p.NM)-1])
		if !(b > a) {
			continue
		}
		m.Covered = append(m.Covered, Interval{a, b})
		c := make([]float64, len(p.NM))
		grid := unionGrid(a, b, p.NM, w.Knots(a, b))
		wr := newWeightReader(w)
		// t[k] is the trapezoid weight of grid point k, times w there.
		j := sort.SearchFloat64s(p.NM, a) // data interval [j-1, j] or point j
		for k, g := range grid {
			var t float64
			if k > 0 {
				t += (g - grid[k-1]) / 2
			}
			if k < len(grid)-1 {
				t += (grid[k+1] - g) / 2
			}
			t *= wr.at(g)
			m.W += t
			for j < len(p.NM)-1 && p.NM[j] < g {
				j++
			}
			if p.NM[j] == g {
				c[j] += t
				m.WX += t * p.V[j]
				continue
			}
			f := (g - p.NM[j-1]) / (p.NM[j] - p.NM[j-1])
			c[j-1] += t * (1 - f)
			c[j] += t * f
			m.WX += t * ((1-f)*p.V[j-1] + f*p.V[j])
		}
		m.Coef[i] = c
	}
	m.WBand = integrateWeight(w, lo, hi)
	switch {
	case m.W > 0:
		m.Value = m.WX / m.W
		for _, c := range m.Coef {
			for j := range c {
				c[j] /= m.W
			}
		}
	default:
		m.Value = math.NaN()
	}
	if m.WBand > 0 {
		m.Coverage = math.Min(1, m.W/m.WBand)
	}
	if len(m.Covered) == 1 && m.Covered[0] == (Interval{lo, hi}) {
		m.Coverage = 1
	}
	return m
}

// integrateWeight returns ∫ w dλ over [lo, hi] by the trapezoid rule on w's
// knots and the limits. The integrals of the package's own weightings are
// kept: every figure of every material asks for the same few.
func integrateWeight(w Weighting, lo, hi float64) float64 {
	switch w.(type) {
	case *table, Blackbody, *erythemal: // comparable, and fixed once made
	default:
		return integrateWeightOnce(w, lo, hi)
	}
	k := weightKey{w, lo, hi}
	if v, ok := weightIntegrals.Load(k); ok {
		return v.(float64)
	}
	v := integrateWeightOnce(w, lo, hi)
	if weightIntegralsStored.Add(1) <= maxWeightIntegrals {
		weightIntegrals.Store(k, v)
	}
	return v
}

// weightKey is a band of a weighting.
type weightKey struct {
	w      Weighting
	lo, hi float64
}

var (
	weightIntegrals       sync.Map // weightKey → float64
	weightIntegralsStored atomic.Int64
)

// maxWeightIntegrals bounds weightIntegrals: beyond it, integrals are
// computed each time.
const maxWeightIntegrals = 4096

// integrateWeightOnce is integrateWeight without the cache.
func integrateWeightOnce(w Weighting, lo, hi float64) float64 {
	grid := unionGrid(lo, hi, nil, w.Knots(lo, hi))
	wr := newWeightReader(w)
	var sum float64
	prev := wr.at(grid[0])
	for k := 1; k < len(grid); k++ {
		cur := wr.at(grid[k])
		sum += (grid[k] - grid[k-1]) * (prev + cur) / 2
		prev = cur
	}
	return sum
}

// weightIntegral returns ∫ w dλ over [lo, hi] nm by the trapezoid rule on the
// weighting's knots and the band limits (exact for a tabulated weighting).
func weightIntegral(w Weighting, lo, hi float64) float64 { return integrateWeight(w, lo, hi) }

// unionGrid merges a, b and the sorted slices xs and ys restricted to (a, b)
// into one sorted grid without duplicates.
func unionGrid(a, b float64, xs, ys []float64) []float64 {
	out := make([]float64, 0, len(xs)+len(ys)+2)
	out = append(out, a)
	i := sort.Search(len(xs), func(i int) bool { return xs[i] > a })
	j := sort.Search(len(ys), func(i int) bool { return ys[i] > a })
	for {
		var v float64
		switch {
		case i < len(xs) && (j >= len(ys) || xs[i] <= ys[j]):
			v = xs[i]
			i++
		case j < len(ys):
			v = ys[j]
			j++
		default:
			v = b
		}
		if v >= b {
			break
		}
		if v > out[len(out)-1] {
			out = append(out, v)
		}
	}
	return append(out, b)
}
