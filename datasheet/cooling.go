package datasheet

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"skysheet/spectra"
)

// CurvePoint is one point of the net cooling power against surface
// temperature, with and without sun.
type CurvePoint struct {
	SurfaceK    float64 `json:"surface_k"`
	NetWm2      Num     `json:"net_w_m2"`
	NetNightWm2 Num     `json:"net_night_w_m2"`
}

// CoolingTerms are the parts of the net cooling power at T_s = T_amb and
// what the held-constant extension of the data carries.
type CoolingTerms struct {
	RadiatedWm2    Num `json:"radiated_w_m2"`    // P_rad(T_amb)
	AtmosphericWm2 Num `json:"atmospheric_w_m2"` // P_atm, absorbed from the sky
	SolarWm2       Num `json:"solar_w_m2"`       // P_sun, absorbed sunlight
	// SolarAbsorbed is the share of the sunlight absorbed over the whole
	// ASTM G173-03 range 280–4000 nm (the chosen spectrum's weighting), on
	// which P_sun rests; SolarAbsorbedCoverage is the share of that
	// spectrum's power where the data give the absorptance.
	SolarAbsorbed         Num `json:"solar_absorbed_fraction"`
	SolarAbsorbedCoverage Num `json:"solar_absorbed_coverage"`
	EquilibriumK          Num `json:"equilibrium_k"` // T_eq with sun
	EquilibriumNightK     Num `json:"equilibrium_night_k"`
	// HeldShare is the share of the exchange band's blackbody power at
	// T_amb that falls where the emittance is held constant.
	HeldShare Num `json:"held_share"`
	// HeldEmittedWm2 is what the sample emits at T_amb over the held part.
	HeldEmittedWm2 Num `json:"held_emitted_w_m2"`
	// HeldUncertainty is, by figure key, the standard uncertainty of
	// each cooling figure from the held-constant extrapolation (see
	// heldUncertainty); empty when nothing is held.
	HeldUncertainty map[string]Num `json:"held_uncertainty"`
	// HeldBands are the parts of the exchange band where the emittance is
	// held constant, in nm (written in µm: held_bands_um).
	HeldBands []spectra.Interval `json:"-"`
}

// MarshalJSON writes the terms with the held bands in µm.
func (t CoolingTerms) MarshalJSON() ([]byte, error) {
	type plain CoolingTerms
	um := make([][2]float64, len(t.HeldBands))
	for i, b := range t.HeldBands {
		um[i] = bandOut(b, "µm")
	}
	return json.Marshal(struct {
		plain
		HeldBandsUM [][2]float64 `json:"held_bands_um"`
	}{plain(t), um})
}

// UnmarshalJSON reads the form MarshalJSON writes.
func (t *CoolingTerms) UnmarshalJSON(b []byte) error {
	type plain CoolingTerms
	var j struct {
		plain
		HeldBandsUM [][2]float64 `json:"held_bands_um"`
	}
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*t = CoolingTerms(j.plain)
	t.HeldBands = []spectra.Interval{}
	for _, x := range j.HeldBandsUM {
		t.HeldBands = append(t.HeldBands, bandFrom(x[0], x[1], "µm"))
	}
	return nil
}

// Sensitivity is one row of the sensitivity table: the change of the
// cooling figures when one condition changes.
type Sensitivity struct {
	Parameter     string  `json:"parameter"` // a key of conditions, e.g. "h_w_m2k"
	Change        float64 `json:"change"`    // in the parameter's unit
	Unit          string  `json:"unit"`
	DeltaDayWm2   Num     `json:"delta_day_w_m2"`
	DeltaNightWm2 Num     `json:"delta_night_w_m2"`
	// Changes of the equilibrium depressions T_amb − T_eq.
	DeltaEquilibriumDayK   Num    `json:"delta_equilibrium_day_k"`
	DeltaEquilibriumNightK Num    `json:"delta_equilibrium_night_k"`
	Note                   string `json:"note,omitempty"`
}

// The curve runs from T_amb + curveFromK to T_amb + curveToK in 1 K steps.
const (
	curveFromK = -40
	curveToK   = 10
)

// errNoRoot reports that P_net has no zero in the searched range.
var errNoRoot = errors.New("no surface temperature balances the energy budget between 0.05 and 10 × ambient")

// validateCooling checks the cooling conditions.
func (c Conditions) validateCooling() error {
	finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
	if !(c.AmbientK >= 150 && c.AmbientK <= 400) {
		return fmt.Errorf("ambient temperature %g K: want 150–400 K (kelvin, not °C)", c.AmbientK)
	}
	if !finite(c.DewPointC) || c.DewPointC < -80 {
		return fmt.Errorf("dew point %g °C: want a temperature in °C above −80", c.DewPointC)
	}
	if c.DewPointC+273.15 > c.AmbientK+1e-9 {
		return fmt.Errorf("dew point %g °C is above the air temperature %g K (%s °C): the dew point cannot exceed it",
			c.DewPointC, c.AmbientK, strconv.FormatFloat(c.AmbientK-273.15, 'g', 12, 64))
	}
	if !(c.IrradianceWm2 >= 0 && c.IrradianceWm2 <= 2000) {
		return fmt.Errorf("irradiance %g W/m²: want 0–2000 W/m²", c.IrradianceWm2)
	}
	if !(c.HWm2K >= 0 && c.HWm2K <= 1000) {
		return fmt.Errorf("heat-transfer coefficient h %g W m⁻² K⁻¹: want 0–1000", c.HWm2K)
	}
	if b := c.ExchangeBand; !(b.Lo >= 100 && b.Hi > b.Lo && b.Hi <= 1e6) {
		um := bandOut(b, "µm")
		return fmt.Errorf("exchange band %g–%g µm: want 0.1 ≤ low < high ≤ 1000", um[0], um[1])
	}
	if h := c.HourOfDay; h.On && !(h.V >= 0 && h.V <= 24) {
		return fmt.Errorf("hour of day %g h: want 0–24 h from local midnight, or off", h.V)
	}
	// Bounds that catch a pressure in kPa or in Pa, not the range of the
	// correlation's stations.
	if p := c.StationPressure; p.On && !(p.V >= 500 && p.V <= 1100) {
		return fmt.Errorf("station pressure %g hPa: want 500–1100 hPa (hectopascal, i.e. millibar), or off", p.V)
	}
	if !c.Sky.Clear() {
		if c.Sky.Spectrum == nil {
			return fmt.Errorf("sky %q: the spectral sky file was not read (want %q or a file with a T column)", c.Sky.File, skyClearWords)
		}
		if !c.Sky.Spectrum.Has(spectra.T) {
			return fmt.Errorf("sky %s: %w: a spectral sky needs a T column (zenith atmospheric transmittance)", c.Sky.File, spectra.ErrNoValues)
		}
	}
	return nil
}

// skyFor returns the sky of c.
func skyFor(c Conditions) (Sky, error) {
	if c.Sky.Clear() {
		return ClearSky(c), nil
	}
	return spectralSky(c.Sky.Spectrum, c.Sky.File, c.AmbientK)
}

// lc is a value of a piece of a series, linear between two of its points:
// (1−f)·V[j] + f·V[j+1]; f == 0 means V[j] alone.
type lc struct {
	p, j int
	f    float64
}

func (l lc) eval(s spectra.Series) float64 {
	v := s.Pieces[l.p].V
	if l.f == 0 {
		return v[l.j]
	}
	return (1-l.f)*v[l.j] + l.f*v[l.j+1]
}

// coolSpan is the interval [nodes[a], nodes[a+1]] of the cooling grid.
type coolSpan struct {
	a           int
	left, right lc      // emittance at the two ends, seen from inside
	skyL, skyR  float64 // hemispherical sky emissivity at the two ends
	held        bool    // the emittance is held constant here
}

// coolGrid is the integration grid of the exchange band for one sample's
// wavelengths, one sky and one air temperature. P_rad and P_atm are sums
// over its spans by the trapezoid rule; the nodes are the band limits, the
// data's points, the ends of the data and the middles of gaps between them
// (where the held value switches), the sky's breakpoints and a geometric
// reference grid. Planck's factors are precomputed per node.
type coolGrid struct {
	ambientK  float64
	nodes     []float64 // nm
	c1, x     []float64 // B(λ, T) = c1/expm1(x/T)
	bAmb      []float64 // B(λ, T_amb), W m⁻² sr⁻¹ nm⁻¹
	spans     []coolSpan
	pieceLen  []int        // lengths of the emittance pieces the grid was built for
	bbPower   float64      // π ∫ B(T_amb) over the band, W/m²
	heldPower float64      // π ∫ B(T_amb) over the held part, W/m²
	held      [][2]float64 // held ranges, nm
	// steps are kept for the root searches (bracketSteps); den holds the
	// Planck denominators at the temperatures that many states ask for
	// (pradShared), shared by every grid with the same nodes.
	steps []float64
	den   *planckTable
}

// planckTable holds exp(x/T) − 1 at every node of the cooling grids whose
// nodes give x (x = hc/λk), by temperature T, for up to
// maxPlanckTableValues values in all.
type planckTable struct {
	x   []float64
	mu  sync.Mutex
	den map[float64][]float64
}

// maxPlanckTableValues bounds a planckTable: 8 MiB of float64.
const maxPlanckTableValues = 1 << 20

// at returns exp(x/t) − 1 at every node, computing them the first time,
// or false when the table is full.
func (p *planckTable) at(t float64) ([]float64, bool) {
	p.mu.Lock()
	defer p.mu.Unlock()
	if den, ok := p.den[t]; ok {
		return den, true
	}
	if (len(p.den)+1)*len(p.x) > maxPlanckTableValues {
		return nil, false
	}
	inv := 1 / t
	den := make([]float64, len(p.x))
	for i, x := range p.x {
		den[i] = math.Exp(x*inv) - 1
	}
	p.den[t] = den
	return den, true
}

// planckTables are the tables of the grids built last, the most recent
// first: materials measured on the same instruments have the same nodes,
// and their interpolants of P_rad ask at the same temperatures (see
// coolState.smooth).
var planckTables struct {
	sync.Mutex
	list []*planckTable
}

// maxPlanckTables bounds planckTables.
const maxPlanckTables = 4

// planckTableFor returns the table of a grid whose nodes give x.
func planckTableFor(x []float64) *planckTable {
	pt := &planckTables
	pt.Lock()
	defer pt.Unlock()
	for i, p := range pt.list {
		if slices.Equal(p.x, x) {
			copy(pt.list[1:i+1], pt.list[:i])
			pt.list[0] = p
			return p
		}
	}
	p := &planckTable{x: x, den: map[float64][]float64{}}
	pt.list = slices.Insert(pt.list, 0, p)
	if len(pt.list) > maxPlanckTables {
		pt.list = pt.list[:maxPlanckTables]
	}
	return p
}

// newCoolGrid returns the grid for emittance series a, or nil when a does
// not reach into the band at all.
func newCoolGrid(a spectra.Series, sky Sky, band spectra.Interval, ambientK float64) *coolGrid {
	return newCoolGridStep(a, sky, band, ambientK, referenceStep)
}

// newCoolGridStep is newCoolGrid with a given relative step of the
// reference grid.
func newCoolGridStep(a spectra.Series, sky Sky, band spectra.Interval, ambientK, step float64) *coolGrid {
	lo, hi := band.Lo, band.Hi
	type cover struct {
		p      int
		lo, hi float64
	}
	var cov []cover
	g := &coolGrid{ambientK: ambientK}
	nodes := []float64{lo, hi}
	for p, pc := range a.Pieces {
		g.pieceLen = append(g.pieceLen, len(pc.NM))
		x, y := math.Max(lo, pc.NM[0]), math.Min(hi, pc.NM[len(pc.NM)-1])
		if !(y > x) {
			continue
		}
		cov = append(cov, cover{p, x, y})
		nodes = append(nodes, x, y)
		for _, nm := range pc.NM {
			if nm > lo && nm < hi {
				nodes = append(nodes, nm)
			}
		}
	}
	if len(cov) == 0 {
		return nil
	}
	for i := 1; i < len(cov); i++ {
		nodes = append(nodes, (cov[i-1].hi+cov[i].lo)/2)
	}
	nodes = append(nodes, sky.skyBreaks(lo, hi)...)
	nodes = append(nodes, geometricGrid(lo, hi, step)...)
	g.nodes = sortUnique(nodes)
	n := len(g.nodes)
	g.c1, g.x, g.bAmb = make([]float64, n), make([]float64, n), make([]float64, n)
	const h, c, k = spectra.PlanckConstant, spectra.SpeedOfLight, spectra.Boltzmann
	for i, nm := range g.nodes {
		l := nm * 1e-9
		g.c1[i] = 2 * h * c * c / (l * l * l * l * l) * 1e-9
		g.x[i] = h * c / (l * k)
		g.bAmb[i] = g.c1[i] / math.Expm1(g.x[i]/ambientK)
	}
	g.den = planckTableFor(g.x)
	// lcAt is the value at nm of piece p, whose first point at or after
	// nm is j.
	lcAt := func(p, j int, nm float64) lc {
		v := a.Pieces[p].NM
		if j < len(v) && v[j] == nm {
			return lc{p: p, j: j}
		}
		return lc{p: p, j: j - 1, f: (nm - v[j-1]) / (v[j] - v[j-1])}
	}
	at := func(p int, nm float64) lc { return lcAt(p, sort.SearchFloat64s(a.Pieces[p].NM, nm), nm) }
	// The spans inside a piece ask for increasing wavelengths: a cursor
	// per piece finds what at finds without a search each time.
	cursors := make([]nmCursor, len(a.Pieces))
	for p, pc := range a.Pieces {
		cursors[p].nm = pc.NM
	}
	atNext := func(p int, nm float64) lc {
		j, _ := cursors[p].find(nm)
		return lcAt(p, j, nm)
	}
	g.spans = make([]coolSpan, n-1)
	for i := range g.spans {
		x0, x1 := g.nodes[i], g.nodes[i+1]
		m := (x0 + x1) / 2
		sp := coolSpan{a: i}
		inside := -1
		for ci, cv := range cov {
			if m > cv.lo && m < cv.hi {
				inside = ci
				break
			}
		}
		if inside >= 0 {
			sp.left, sp.right = atNext(cov[inside].p, x0), atNext(cov[inside].p, x1)
		} else {
			// Hold the nearest measured value.
			best := math.Inf(1)
			for _, cv := range cov {
				if d := cv.lo - m; d > 0 && d < best {
					best, sp.left = d, at(cv.p, cv.lo)
				}
				if d := m - cv.hi; d > 0 && d < best {
					best, sp.left = d, at(cv.p, cv.hi)
				}
			}
			sp.right, sp.held = sp.left, true
			if k := len(g.held) - 1; k >= 0 && g.held[k][1] == x0 {
				g.held[k][1] = x1
			} else {
				g.held = append(g.held, [2]float64{x0, x1})
			}
		}
		g.spans[i] = sp
		pw := math.Pi * (x1 - x0) / 2 * (g.bAmb[i] + g.bAmb[i+1])
		g.bbPower += pw
		if sp.held {
			g.heldPower += pw
		}
	}
	g.setSky(sky)
	return g
}

// setSky sets the hemispherical sky emissivity at the ends of every span.
// The grid's nodes must include the sky's breakpoints.
func (g *coolGrid) setSky(sky Sky) {
	hemi := map[float64]float64{}
	hemiOf := func(e float64) float64 {
		v, ok := hemi[e]
		if !ok {
			v = hemispherical(e)
			hemi[e] = v
		}
		return v
	}
	for i := range g.spans {
		sp := &g.spans[i]
		a, b := g.nodes[sp.a], g.nodes[sp.a+1]
		if sky.Model != skyModelSpectral {
			sp.skyL, sp.skyR = sky.hemisphericalOn(a, b)
			continue
		}
		ea, eb := sky.zenithOn(a, b)
		sp.skyL, sp.skyR = hemiOf(ea), hemiOf(eb)
	}
}

// withSky returns a copy of g under another clear sky (whose breakpoints,
// the window edges, are already nodes of g).
func (g *coolGrid) withSky(sky Sky) *coolGrid {
	h := *g
	h.spans = append([]coolSpan(nil), g.spans...)
	h.setSky(sky)
	return &h
}

// fits reports whether the grid was built for series with a's shape.
func (g *coolGrid) fits(a spectra.Series) bool {
	if len(a.Pieces) != len(g.pieceLen) {
		return false
	}
	for i, p := range a.Pieces {
		if len(p.NM) != g.pieceLen[i] {
			return false
		}
	}
	return true
}

// coolState is a grid loaded with one emittance series.
type coolState struct {
	g        *coolGrid
	a        spectra.Series
	wrad     []float64  // per node: Σ (Δλ/2)·ε, so that P_rad(T) = π Σ wrad·B
	wc, xs   []float64  // see compact
	idx      []int32    // the node of each of wc
	patm     float64    // P_atm, W/m²
	heldEmit float64    // π ∫ ε B(T_amb) over the held part, W/m²
	k        float64    // ε = k·a: the near-normal to hemispherical ratio, or 1
	fit      *smoothFit // P_rad(T) about T_amb, once smooth has made it
}

// load loads emittance k·a, where a is the data's emittance and k converts
// it to hemispherical (1 for none).
func (g *coolGrid) load(a spectra.Series, k float64) *coolState {
	return g.loadHeld(a, k, math.NaN())
}

// loadHeld is load with the emittance where it is held constant replaced
// by held, unless held is NaN (the extrapolation's alternatives: the tests
// check heldChange against it).
func (g *coolGrid) loadHeld(a spectra.Series, k, held float64) *coolState {
	s := &coolState{g: g, a: a, wrad: make([]float64, len(g.nodes)), k: k}
	for _, sp := range g.spans {
		d := (g.nodes[sp.a+1] - g.nodes[sp.a]) / 2
		el, er := k*sp.left.eval(a), k*sp.right.eval(a)
		if sp.held && !math.IsNaN(held) {
			el, er = held, held
		}
		s.wrad[sp.a] += d * el
		s.wrad[sp.a+1] += d * er
		s.patm += g.atm(sp, el, er)
		if sp.held {
			s.heldEmit += d * (el*g.bAmb[sp.a] + er*g.bAmb[sp.a+1])
		}
	}
	s.patm *= math.Pi
	s.heldEmit *= math.Pi
	s.compact()
	return s
}

// atm returns the trapezoid term of span sp in the sum for P_atm/π, for
// emittance el and er at its two ends.
func (g *coolGrid) atm(sp coolSpan, el, er float64) float64 {
	d := (g.nodes[sp.a+1] - g.nodes[sp.a]) / 2
	return d * (el*sp.skyL*g.bAmb[sp.a] + er*sp.skyR*g.bAmb[sp.a+1])
}

// underSky returns s under the sky of g, a copy of s's grid under another
// sky (withSky): P_atm is summed again as load sums it; P_rad's sums and
// interpolant are shared.
func (s *coolState) underSky(g *coolGrid) *coolState {
	u := *s
	u.g = g
	u.patm = 0
	for _, sp := range g.spans {
		u.patm += g.atm(sp, s.k*sp.left.eval(s.a), s.k*sp.right.eval(s.a))
	}
	u.patm *= math.Pi
	return &u
}

// planck returns B(λ, T) at every node.
func (g *coolGrid) planck(t float64) []float64 {
	if t == g.ambientK {
		return g.bAmb
	}
	b := make([]float64, len(g.nodes))
	for i := range b {
		b[i] = g.c1[i] / math.Expm1(g.x[i]/t)
	}
	return b
}

// prad returns P_rad(T) = π ∫ ε B(λ, T) dλ over the band, W/m².
func (s *coolState) prad(t float64) float64 {
	g := s.g
	var sum float64
	if t == g.ambientK {
		for i, w := range s.wrad {
			sum += w * g.bAmb[i]
		}
		return math.Pi * sum
	}
	inv := 1 / t
	x := s.xs[:len(s.wc)]
	for i, wc := range s.wc {
		sum += wc / (math.Exp(x[i]*inv) - 1)
	}
	return math.Pi * sum
}

// compact keeps, for prad, the nodes where wrad is not zero, in order,
// with wrad·c1 there: the sum over them is the sum over every node, term
// for term (w·c1 is the product the sum would form first).
func (s *coolState) compact() {
	g := s.g
	s.wc, s.xs, s.idx = make([]float64, 0, len(s.wrad)), make([]float64, 0, len(s.wrad)), make([]int32, 0, len(s.wrad))
	for i, w := range s.wrad {
		if w != 0 {
			s.wc, s.xs, s.idx = append(s.wc, w*g.c1[i]), append(s.xs, g.x[i]), append(s.idx, int32(i))
		}
	}
}

// net returns P_net(T) = P_rad(T) − P_atm − P_sun − h (T_amb − T).
func (s *coolState) net(t, psun, h float64) float64 {
	return s.prad(t) - s.patm - psun - h*(s.g.ambientK-t)
}

// The surface temperatures T_amb + smoothBelowK … T_amb + smoothAboveK
// hold the cooling curve and most equilibria; over them smooth
// interpolates P_rad.
const (
	smoothBelowK = curveFromK
	smoothAboveK = 40
	// smoothTol is the accuracy, relative to P_rad, that the interpolant
	// must reach to be used.
	smoothTol = 1e-13
)

// smooth interpolates P_rad(T) over T_amb + smoothBelowK … smoothAboveK
// for a state that is asked for it many times (the curve, the equilibria
// of the sensitivity table, the slopes): a smoothFit at 18 temperatures
// replaces a full sum at each. Its temperatures are the same for every
// state of a grid with the same air temperature, so their Planck
// denominators are kept (pradShared). P_rad is a sum of Bose-Einstein terms,
// analytic near that range, and is kept only when resolved to smoothTol.
func (s *coolState) smooth() {
	lo, hi := s.g.ambientK+smoothBelowK, s.g.ambientK+smoothAboveK
	if !(lo > 0) || math.IsInf(hi, 0) {
		return
	}
	if p := newSmoothFit(s.pradShared, lo, hi); p.converged(smoothTol) {
		s.fit = p
	}
}

// pradNear is prad, from the interpolant where there is one.
func (s *coolState) pradNear(t float64) float64 {
	if s.fit != nil && s.fit.covers(t) {
		return s.fit.at(t)
	}
	return s.prad(t)
}

// netNear is net with pradNear.
func (s *coolState) netNear(t, psun, h float64) float64 {
	return s.pradNear(t) - s.patm - psun - h*(s.g.ambientK-t)
}

// equilibrium returns T_eq where P_net(T_eq) = 0 to 1e-9 K: with the
// interpolant and refined on the sums when the state has one and T_eq is
// in its range (equilibriumNear), else by bracketing and Brent's method.
// P_net increases with T.
func (s *coolState) equilibrium(psun, h float64) (float64, error) {
	if t, ok := s.equilibriumNear(psun, h, true); ok {
		return t, nil
	}
	ta := s.g.ambientK
	lo, hi := s.g.searchRange()
	steps := s.g.bracketSteps(lo, hi)
	f := func(t float64) float64 {
		if slices.Contains(steps, t) { // a first step of every search: shared
			return s.pradShared(t) - s.patm - psun - h*(s.g.ambientK-t)
		}
		return s.net(t, psun, h)
	}
	return increasingRoot(f, ta, lo, hi)
}

// searchRange is the range of surface temperatures in which equilibrium
// looks for T_eq.
func (g *coolGrid) searchRange() (lo, hi float64) { return 0.05 * g.ambientK, 10 * g.ambientK }

// equilibriumNear finds T_eq with the interpolant, when the state has one
// and T_eq lies in its range; check refines it on P_net itself (see
// refine). Unchecked, it is as close as the interpolant is to P_rad
// (smoothTol, about 1e-11 K). ok is false otherwise.
func (s *coolState) equilibriumNear(psun, h float64, check bool) (t float64, ok bool) {
	p := s.fit
	if p == nil {
		return 0, false
	}
	f := func(t float64) float64 { return s.netNear(t, psun, h) }
	flo, fhi := f(p.lo), f(p.hi)
	if !(flo <= 0 && fhi >= 0) {
		return 0, false
	}
	t = brent(f, p.lo, p.hi, flo, fhi, 1e-10)
	if !check {
		return t, true
	}
	return s.refine(t, p.slope(t)+h, psun, h)
}

// refine returns T_eq from t, close to it, and slope, about ∂P_net/∂T
// near it: secant steps on P_net itself, the first with slope, until a step
// is below 1e-10 K, well within equilibrium's 1e-9 K. ok is false when
// that takes more than 8 evaluations or a step leaves equilibrium's range
// (its search then runs). P_net increases with T, so the root is unique.
func (s *coolState) refine(t, slope, psun, h float64) (float64, bool) {
	const tol = 1e-10
	lo, hi := s.g.searchRange()
	f := s.net(t, psun, h)
	if f == 0 {
		return t, true
	}
	if !(slope > 0) || math.IsInf(slope, 0) {
		return 0, false
	}
	step := -f / slope
	for range 8 {
		if math.Abs(step) <= tol {
			return t + step, true
		}
		t1 := t + step
		if !(t1 > lo && t1 < hi) {
			return 0, false
		}
		f1 := s.net(t1, psun, h)
		if f1 == 0 {
			return t1, true
		}
		if f1 == f {
			return 0, false
		}
		step = -f1 * (t1 - t) / (f1 - f)
		t, f = t1, f1
	}
	return 0, false
}

// bracketSteps returns the temperatures increasingRoot, searching from
// T_amb within [lo, hi], tries first whatever the state: T_amb ∓ 4, 8, 16 …
// K, computed as it computes them.
func (g *coolGrid) bracketSteps(lo, hi float64) []float64 {
	if g.steps == nil {
		x0 := g.ambientK
		for step := 4.0; ; step *= 2 {
			a, b := math.Max(lo, x0-step), math.Min(hi, x0+step)
			g.steps = append(g.steps, a, b)
			if a == lo && b == hi || step > 1e9 { // the second: a NaN ambient
				break
			}
		}
	}
	return g.steps
}

// pradShared is prad at a temperature that many states are asked at (the
// interpolant's points, bracketSteps): the Planck denominators
// exp(x/T) − 1 of every node at t are kept in the grid's planckTable, so
// that each state after the first only sums. The terms and their order are
// prad's.
func (s *coolState) pradShared(t float64) float64 {
	g := s.g
	if t == g.ambientK {
		return s.prad(t)
	}
	den, ok := g.den.at(t)
	if !ok {
		return s.prad(t)
	}
	var sum float64
	idx := s.idx[:len(s.wc)]
	for k, wc := range s.wc {
		sum += wc / den[idx[k]]
	}
	return math.Pi * sum
}

// increasingRoot finds the zero of an increasing function f within
// [lo, hi], searching outward from x0.
func increasingRoot(f func(float64) float64, x0, lo, hi float64) (float64, error) {
	f0 := f(x0)
	switch {
	case math.IsNaN(f0):
		return math.NaN(), errNoRoot
	case f0 == 0:
		return x0, nil
	}
	a, b, fa, fb := x0, x0, f0, f0
	for step := 4.0; ; step *= 2 {
		if f0 > 0 {
			b, fb = a, fa
			a = math.Max(lo, x0-step)
			fa = f(a)
			if fa <= 0 {
				break
			}
			if a == lo {
				return math.NaN(), errNoRoot
			}
		} else {
			a, fa = b, fb
			b = math.Min(hi, x0+step)
			fb = f(b)
			if fb >= 0 {
				break
			}
			if b == hi {
				return math.NaN(), errNoRoot
			}
		}
	}
	return brent(f, a, b, fa, fb, 1e-9), nil
}

// brent returns a zero of f in [a, b], where fa = f(a) and fb = f(b) have
// opposite signs (or one is zero), to within tol (Brent's method).
func brent(f func(float64) float64, a, b, fa, fb, tol float64) float64 {
	if fa == 0 {
		return a
	}
	if fb == 0 {
		return b
	}
	c, fc := b, fb
	var d, e float64
	for range 300 {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol1 := 4e-16*math.Abs(b) + tol/2
		xm := (c - b) / 2
		if math.Abs(xm) <= tol1 || fb == 0 {
			return b
		}
		if math.Abs(e) >= tol1 && math.Abs(fa) > math.Abs(fb) {
			s := fb / fa
			var p, q float64
			if a == c {
				p, q = 2*xm*s, 1-s
			} else {
				q0, r := fa/fc, fb/fc
				p = s * (2*xm*q0*(q0-r) - (b-a)*(r-1))
				q = (q0 - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			}
			p = math.Abs(p)
			if 2*p < math.Min(3*xm*q-math.Abs(tol1*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = xm, xm
			}
		} else {
			d, e = xm, xm
		}
		a, fa = b, fb
		if math.Abs(d) > tol1 {
			b += d
		} else {
			b += math.Copysign(tol1, xm)
		}
		fb = f(b)
	}
	return b
}

// gradA returns ∂(P_rad(T) − P_atm)/∂ε at every point of the emittance
// series, W/m² per unit emittance.
func (s *coolState) gradA(t float64) [][]float64 {
	g := s.g
	bt := g.planck(t)
	out := make([][]float64, len(s.a.Pieces))
	put := func(l lc, w float64) {
		if out[l.p] == nil {
			out[l.p] = make([]float64, len(s.a.Pieces[l.p].V))
		}
		out[l.p][l.j] += (1 - l.f) * w
		if l.f != 0 {
			out[l.p][l.j+1] += l.f * w
		}
	}
	for _, sp := range g.spans {
		d := s.k * math.Pi * (g.nodes[sp.a+1] - g.nodes[sp.a]) / 2
		put(sp.left, d*(bt[sp.a]-sp.skyL*g.bAmb[sp.a]))
		put(sp.right, d*(bt[sp.a+1]-sp.skyR*g.bAmb[sp.a+1]))
	}
	return out
}

// slope returns ∂P_net/∂T at t, W m⁻² K⁻¹: the interpolant's where
// there is one, else a central difference.
func (s *coolState) slope(t, h float64) float64 {
	if s.fit != nil && s.fit.covers(t) {
		return s.fit.slope(t) + h
	}
	const dt = 0.01
	return (s.prad(t+dt)-s.prad(t-dt))/(2*dt) + h
}

// cooling is the cooling computation for one set of conditions.
type cooling struct {
	c   Conditions
	sky Sky
	sun spectra.Weighting
	g   *coolGrid // nil: no emittance data in the exchange band
	// basis is the emittance basis of the figures, named in their
	// weighting; ratio multiplies the data's emittance in the exchange
	// band to make it hemispherical (0: none).
	basis EmittanceBasis
	ratio float64
	// unchecked takes the equilibria from the interpolant alone, when
	// there is one (the sensitivity table's, which shows changes of
	// tenths of a kelvin).
	unchecked bool
}

// coolFigures are the scalar results of one evaluation.
type coolFigures struct {
	day, night     float64 // P_net(T_amb), W/m²
	eqDay, eqNight float64 // T_eq, K
	prad, patm     float64
	psun           float64
	state          *coolState
	errDay, errNgt error
}

// evaluate computes the cooling figures for emittance a and solar
// absorptance alpha (NaN when unknown). P_rad is interpolated first: the
// state will be asked for much more (see coolState.smooth).
func (m *cooling) evaluate(a spectra.Series, alpha float64) coolFigures {
	nan := math.NaN()
	r := coolFigures{day: nan, night: nan, eqDay: nan, eqNight: nan, prad: nan, patm: nan, psun: nan}
	if m.g == nil {
		return r
	}
	if !m.g.fits(a) {
		m.g = newCoolGrid(a, m.sky, m.c.ExchangeBand, m.c.AmbientK)
	}
	k := 1.0
	if m.ratio > 0 {
		k = m.ratio
	}
	s := m.g.load(a, k)
	s.smooth()
	return m.figuresOf(s, alpha)
}

// figuresOf computes the cooling figures of a loaded state.
func (m *cooling) figuresOf(s *coolState, alpha float64) coolFigures {
	r := coolFigures{eqDay: math.NaN(), state: s}
	r.prad, r.patm = s.prad(m.c.AmbientK), s.patm
	r.psun = m.c.IrradianceWm2 * alpha
	r.night = r.prad - r.patm
	r.day = r.night - r.psun
	h := m.c.HWm2K
	eq := func(psun float64) (float64, error) {
		if m.unchecked {
			if t, ok := s.equilibriumNear(psun, h, false); ok {
				return t, nil
			}
		}
		return s.equilibrium(psun, h)
	}
	r.eqNight, r.errNgt = eq(0)
	if !math.IsNaN(alpha) {
		r.eqDay, r.errDay = eq(r.psun)
	}
	return r
}

// weighting describes the cooling conditions in one line, for the figures
// table.
func (m *cooling) weighting(withSun, withH bool) string {
	c := m.c
	var out string
	if m.sky.Model == skyModelClear {
		out = fmt.Sprintf("clear two-band sky, dew point %s °C", fmtG(c.DewPointC))
		if c.HourOfDay.On {
			out += fmt.Sprintf(", hour %s h", fmtG(c.HourOfDay.V))
		}
		if c.StationPressure.On {
			out += fmt.Sprintf(", station pressure %s hPa", fmtG(c.StationPressure.V))
		}
		out += fmt.Sprintf("; air %s K", fmtG(c.AmbientK))
	} else {
		out = fmt.Sprintf("spectral sky %s; air %s K", m.sky.Source, fmtG(c.AmbientK))
	}
	if withH {
		out += fmt.Sprintf("; h %s W m⁻² K⁻¹", fmtG(c.HWm2K))
	}
	if withSun {
		out += fmt.Sprintf("; sun %s W/m², %s shape", fmtG(c.IrradianceWm2), m.sun)
	} else {
		out += "; no sun"
	}
	if b := m.basis.short(); b != "" {
		out += "; " + b
	}
	return out
}

// addCooling computes the cooling figures of o into f, with the curve and
// the sensitivity table. grads holds the gradients of the figures already
// in f and receives those of the new ones.
func (m *cooling) addCooling(f *Figures, o spectra.Optics, grads map[string]gradient) {
	c := m.c
	sa := absorbedSun(o.A, m.sun)
	alpha, sunReason := sa.Value, ""
	if sa.Coverage < minSunCoverage {
		alpha = math.NaN()
		sunReason = fmt.Sprintf("the data cover only %.1f %% of the %s power over %g–%g nm, on which the absorbed sunlight rests "+
			"(at least %g %% is needed)", 100*sa.Coverage, m.sun, spectra.SolarRangeNM.Lo, spectra.SolarRangeNM.Hi, 100*minSunCoverage)
	}
	r := m.evaluate(o.A, alpha)
	f.Sky = m.sky
	f.CoolingPowerWm2, f.CoolingPowerNightWm2 = Num(r.day), Num(r.night)
	f.EquilibriumDeltaK = Num(c.AmbientK - r.eqDay)
	f.EquilibriumDeltaNightK = Num(c.AmbientK - r.eqNight)
	f.CoolingTerms = CoolingTerms{RadiatedWm2: Num(r.prad), AtmosphericWm2: Num(r.patm), SolarWm2: Num(r.psun),
		SolarAbsorbed: Num(alpha), SolarAbsorbedCoverage: Num(sa.Coverage), EquilibriumK: Num(r.eqDay), EquilibriumNightK: Num(r.eqNight),
		HeldShare: Num(math.NaN()), HeldEmittedWm2: Num(math.NaN()), HeldBands: []spectra.Interval{}, HeldUncertainty: map[string]Num{}}
	f.HeldPowerWm2 = Num(math.NaN())
	if m.g != nil {
		f.HeldPowerWm2 = Num(m.g.heldPower)
		f.CoolingTerms.HeldShare = Num(m.g.heldPower / m.g.bbPower)
		f.CoolingTerms.HeldEmittedWm2 = Num(r.state.heldEmit)
		for _, h := range m.g.held {
			f.CoolingTerms.HeldBands = append(f.CoolingTerms.HeldBands, spectra.Interval{Lo: h[0], Hi: h[1]})
		}
		f.CoolingTerms.HeldUncertainty = m.heldUncertainty(r)
	}
	cov := 0.0 // share of the band's blackbody power where the emittance is measured
	if m.g != nil {
		cov = 1 - m.g.heldPower/m.g.bbPower
	}
	band := c.ExchangeBand
	fig := func(key, label, unit string, v Num, sun, h bool, coverage float64) {
		x := Figure{Key: key, Label: label, Value: v, Unit: unit, Band: band, BandUnit: "µm",
			Weighting: m.weighting(sun, h), Coverage: Num(coverage)}
		if sun && m.g != nil {
			x.Reason = sunReason
		}
		f.Figures = append(f.Figures, x)
	}
	dayCov := math.Min(cov, sa.Coverage)
	fig("cooling_power_w_m2", "Cooling power at ambient, with sun", "W/m²", f.CoolingPowerWm2, true, false, dayCov)
	fig("cooling_power_night_w_m2", "Cooling power at ambient, at night", "W/m²", f.CoolingPowerNightWm2, false, false, cov)
	fig("equilibrium_delta_k", "Equilibrium with sun", "K", f.EquilibriumDeltaK, true, true, dayCov)
	fig("equilibrium_delta_night_k", "Equilibrium at night", "K", f.EquilibriumDeltaNightK, false, true, cov)
	if grads != nil {
		grads[absorbedSunKey] = gradient{spectra.A: sa.Coef}
		if r.state != nil {
			m.addGradients(grads, r, c)
		}
	}
	f.CoolingCurve = []CurvePoint{}
	if r.state != nil {
		for d := curveFromK; d <= curveToK; d++ {
			t := c.AmbientK + float64(d)
			night := r.state.netNear(t, 0, c.HWm2K)
			f.CoolingCurve = append(f.CoolingCurve, CurvePoint{SurfaceK: t, NetWm2: Num(night - r.psun), NetNightWm2: Num(night)})
		}
	}
	f.Sensitivity = m.sensitivity(alpha, r)
	f.Assumptions = append(f.Assumptions, m.assumptions(r, sa)...)
}

// heldAlternatives are the emittances the extrapolation beyond the data is
// compared with: most coatings, paints and polymers are close to black
// beyond 25 µm (common practice, no source).
var heldAlternatives = []float64{0.9, 1}

// heldUncertainty returns the standard uncertainty of each cooling figure
// from holding the nearest measured emittance constant beyond the data:
// the figure is recomputed with the held part at each of heldAlternatives
// instead, and the largest change a is taken as the half-width of a
// rectangular distribution, u = a/√3 (JCGM 100:2008 4.3.7, from memory).
// The powers are recomputed exactly (they are linear in ε: heldChange sums
// the change over the held part alone); the equilibria are moved by the
// change of P_net at the equilibrium over ∂P_net/∂T_s there, which saves
// the root searches. The map is empty when nothing is held.
func (m *cooling) heldUncertainty(base coolFigures) map[string]Num {
	out := map[string]Num{}
	if m.g == nil || len(m.g.held) == 0 || base.state == nil {
		return out
	}
	c := m.c
	s := base.state
	var dDay, dNight, dEqDay, dEqNight float64
	var slopeNight, slopeDay float64
	if !math.IsNaN(base.eqNight) {
		slopeNight = s.slope(base.eqNight, c.HWm2K)
	}
	if !math.IsNaN(base.eqDay) {
		slopeDay = s.slope(base.eqDay, c.HWm2K)
	}
	for _, e := range heldAlternatives {
		ch := s.heldChange(e)
		d := ch(c.AmbientK) // the sun's term does not change
		if math.Abs(d) < 1e-9 {
			d = 0 // rounding: the held part cancels (a black sky there)
		}
		dDay, dNight = math.Max(dDay, math.Abs(d)), math.Max(dNight, math.Abs(d))
		if !math.IsNaN(base.eqNight) {
			dEqNight = math.Max(dEqNight, math.Abs(ch(base.eqNight)/slopeNight))
		}
		if !math.IsNaN(base.eqDay) {
			dEqDay = math.Max(dEqDay, math.Abs(ch(base.eqDay)/slopeDay))
		}
	}
	set := func(key string, v, a float64) {
		if !math.IsNaN(v) {
			out[key] = Num(a / math.Sqrt(3))
		}
	}
	set("cooling_power_w_m2", base.day, dDay)
	set("cooling_power_night_w_m2", base.night, dNight)
	set("equilibrium_delta_k", base.eqDay, dEqDay)
	set("equilibrium_delta_night_k", base.eqNight, dEqNight)
	return out
}

// heldChange returns the change of P_rad(T) − P_atm, as a function of T,
// when the emittance over the held part of the band is held instead of
// the nearest measured value: the same trapezoid sums as load's, over the
// held spans only.
func (s *coolState) heldChange(held float64) func(t float64) float64 {
	g := s.g
	var nodes []int32
	var dw []float64 // per node of nodes: Σ (Δλ/2)·Δε
	var dpatm float64
	add := func(i int, w float64) {
		if k := len(nodes) - 1; k >= 0 && nodes[k] == int32(i) {
			dw[k] += w
			return
		}
		nodes, dw = append(nodes, int32(i)), append(dw, w)
	}
	for _, sp := range g.spans {
		if !sp.held {
			continue
		}
		d := (g.nodes[sp.a+1] - g.nodes[sp.a]) / 2
		dl, dr := held-s.k*sp.left.eval(s.a), held-s.k*sp.right.eval(s.a)
		add(sp.a, d*dl)
		add(sp.a+1, d*dr)
		dpatm += g.atm(sp, dl, dr)
	}
	return func(t float64) float64 {
		var sum float64
		for k, i := range nodes {
			b := g.bAmb[i]
			if t != g.ambientK {
				b = g.c1[i] / math.Expm1(g.x[i]/t)
			}
			sum += dw[k] * b
		}
		return math.Pi * (sum - dpatm)
	}
}

// minSunCoverage is the share of the solar spectrum's power over
// 280–4000 nm that the data must cover for the absorbed sunlight, and so
// the figures with sun, to be given (common practice, no source).
const minSunCoverage = 0.9

// absorbedSunKey names the gradient of the absorbed share of sunlight
// among the figures' gradients; it is not a figure.
const absorbedSunKey = "cooling_terms.solar_absorbed_fraction"

// absorbedSun returns the share of sunlight that a surface of spectral
// absorptance a absorbs over the whole range of the ASTM G173-03 tables,
// 280–4000 nm, weighted by sun: ∫ α E dλ / ∫ E dλ over the part the data
// cover, with that part's share of the spectrum's power as its coverage.
// P_sun is the stated irradiance times it: the spectrum's shape scaled to
// the irradiance.
func absorbedSun(a spectra.Series, sun spectra.Weighting) spectra.Mean {
	return spectra.BandMean(a, sun, spectra.SolarRangeNM.Lo, spectra.SolarRangeNM.Hi)
}

// addGradients stores the gradients of the cooling figures.
func (m *cooling) addGradients(grads map[string]gradient, r coolFigures, c Conditions) {
	gAlpha := grads[absorbedSunKey]
	night := gradient{spectra.A: r.state.gradA(c.AmbientK)}
	grads["cooling_power_night_w_m2"] = night
	grads["cooling_power_w_m2"] = night.plus(-c.IrradianceWm2, gAlpha)
	// T_amb − T_eq: ∂/∂x = (∂P_net/∂x)/(∂P_net/∂T) at T_eq.
	if !math.IsNaN(r.eqNight) {
		grads["equilibrium_delta_night_k"] = gradient{spectra.A: r.state.gradA(r.eqNight)}.scale(1 / r.state.slope(r.eqNight, c.HWm2K))
	}
	if !math.IsNaN(r.eqDay) {
		g := gradient{spectra.A: r.state.gradA(r.eqDay)}.plus(-c.IrradianceWm2, gAlpha)
		grads["equilibrium_delta_k"] = g.scale(1 / r.state.slope(r.eqDay, c.HWm2K))
	}
}

// sensitivity returns the change of the cooling figures when h or the dew
// point change.
func (m *cooling) sensitivity(alpha float64, base coolFigures) []Sensitivity {
	out := []Sensitivity{}
	if m.g == nil {
		return out
	}
	c := m.c
	// P_rad does not depend on h or the sky: every row shares the base
	// state's sums and interpolant.
	row := func(param, unit string, change float64, alt Conditions, note string) {
		mm := &cooling{c: alt, sun: m.sun, sky: m.sky, g: m.g, basis: m.basis, ratio: m.ratio, unchecked: true}
		s := base.state
		if alt.DewPointC != c.DewPointC {
			mm.sky = ClearSky(alt)
			mm.g = m.g.withSky(mm.sky)
			s = s.underSky(mm.g)
		}
		r := mm.figuresOf(s, alpha)
		out = append(out, Sensitivity{Parameter: param, Change: change, Unit: unit,
			DeltaDayWm2: Num(r.day - base.day), DeltaNightWm2: Num(r.night - base.night),
			DeltaEquilibriumDayK:   Num(base.eqDay - r.eqDay),
			DeltaEquilibriumNightK: Num(base.eqNight - r.eqNight), Note: note})
	}
	for _, dh := range []float64{+1, -1} {
		alt := c
		alt.HWm2K += dh
		if alt.HWm2K >= 0 {
			row("h_w_m2k", "W m⁻² K⁻¹", dh, alt, "the cooling power at T_s = T_amb does not depend on h")
		}
	}
	if c.Sky.Clear() {
		for _, dd := range []float64{+5, -5} {
			alt := c
			alt.DewPointC += dd
			if alt.validateCooling() == nil {
				note := ""
				if alt := ClearSky(alt); m.sky.Clamped && alt.Clamped && alt.WindowHemisphericalEmissivity == m.sky.WindowHemisphericalEmissivity {
					note = fmt.Sprintf("the window emissivity stays clamped at %g", float64(alt.WindowHemisphericalEmissivity))
				}
				row("dew_point_c", "°C", dd, alt, note)
			}
		}
	}
	return out
}

// assumptions states the cooling model in sentences.
func (m *cooling) assumptions(r coolFigures, sa spectra.Mean) []string {
	c := m.c
	ex := bandOut(c.ExchangeBand, "µm")
	var out []string
	out = append(out, "Sky: "+m.sky.Description)
	if k := m.sky; k.Clamped {
		out = append(out, fmt.Sprintf("Outside the sky model: the correlation's emissivity %.4f lies beyond what the two-band sky "+
			"can represent at %s K (%.4f to 1, the window %s); the cooling figures are those of a sky of emissivity %.4f.",
			float64(k.Emissivity), fmtG(k.AmbientK), 1-float64(k.WindowFraction),
			map[bool]string{true: "fully transparent at the dry end", false: "opaque at the humid end"}[k.WindowHemisphericalEmissivity == 0],
			float64(k.HemisphericalEmissivity)))
	}
	if m.g == nil {
		return append(out, fmt.Sprintf("No emittance data reach into the exchange band %g–%g µm: cooling figures cannot be computed.",
			ex[0], ex[1]))
	}
	lo, hi := spectra.SolarRangeNM.Lo, spectra.SolarRangeNM.Hi
	sun := fmt.Sprintf("P_sun = %s W/m² × %.4f, the share of the %s sunlight absorbed over %g–%g nm",
		fmtG(c.IrradianceWm2), sa.Value, m.sun, lo, hi)
	if sa.Coverage < minSunCoverage {
		sun = fmt.Sprintf("P_sun not given: the data cover %.1f %% of the %s sunlight over %g–%g nm (at least %g %% is needed)",
			100*sa.Coverage, m.sun, lo, hi, 100*minSunCoverage)
	} else if sa.Coverage < 1 {
		sun += fmt.Sprintf(" (mean over the %.1f %% the data cover)", 100*sa.Coverage)
	}
	out = append(out, fmt.Sprintf("Cooling: P_net(T_s) = P_rad(T_s) − P_atm − P_sun − h (T_amb − T_s) with P_rad and P_atm over %g–%g µm, "+
		"air at %s K, h = %s W m⁻² K⁻¹, %s; the cooling power is P_net at T_s = T_amb.",
		ex[0], ex[1], fmtG(c.AmbientK), fmtG(c.HWm2K), sun))
	if len(m.g.held) > 0 {
		var parts []string
		for _, h := range m.g.held {
			parts = append(parts, fmt.Sprintf("%s–%s µm", fmtG(h[0]/1000), fmtG(h[1]/1000)))
		}
		out = append(out, fmt.Sprintf("The data stop short of the exchange band over %s: the nearest measured emittance is held constant there. "+
			"That part carries %.1f W/m² of blackbody power at %s K (%.1f %% of the band's), of which the sample emits %.1f W/m².",
			strings.Join(parts, ", "), m.g.heldPower, fmtG(c.AmbientK), 100*m.g.heldPower/m.g.bbPower, r.state.heldEmit))
	}
	if r.errDay != nil && !math.IsNaN(r.psun) {
		out = append(out, "Equilibrium with sun: "+r.errDay.Error()+".")
	}
	if r.errNgt != nil {
		out = append(out, "Equilibrium at night: "+r.errNgt.Error()+".")
	}
	return out
}
