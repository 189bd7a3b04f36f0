package datasheet

import (
	"encoding/json"
	"fmt"
	"math"
	"sort"
	"strconv"
	"sync"

	"skysheet/spectra"
)

// The sky models, as [Sky.Model] names them.
const (
	// skyModelClear is the clear two-band sky: emissivity 1 outside the
	// atmospheric window and a constant inside it, set by the dew point.
	skyModelClear = skyClearWords
	// skyModelSpectral is a sky given as a zenith transmittance spectrum.
	skyModelSpectral = "spectral"
)

// skyRangeNM bounds the broadband integrals of a spectral sky, nm.
var skyRangeNM = [2]float64{1000, 1e6}

// skyWindow is the atmospheric window of the clear two-band sky, 8–13 µm.
// It is part of the sky model and does not follow the window band of the
// emittance figures.
var skyWindow = spectra.Interval{Lo: 8000, Hi: 13000}

// Sky is the downward thermal emission of the atmosphere seen by a
// horizontal surface: a zenith spectral emissivity ε_sky(λ, 0) and its
// angular extension ε_sky(λ, θ) = 1 − (1 − ε_sky(λ, 0))^(1/cos θ). Its
// exported fields describe it for the output; build one with [ClearSky] or
// spectralSky.
type Sky struct {
	Model  string `json:"model"`            // "clear two-band" or "spectral"
	Source string `json:"source,omitempty"` // spectral sky: the file it came from
	// AmbientK is the air temperature whose blackbody weights the broadband
	// figures below.
	AmbientK float64 `json:"ambient_k"`
	// DewPointC is the dew point behind the clear sky; null for a spectral
	// sky.
	DewPointC Num `json:"dew_point_c"`
	// Emissivity is the broadband clear-sky emissivity ε_sky: from the dew
	// point correlation for the clear sky, the blackbody-weighted zenith
	// emissivity for a spectral sky.
	Emissivity Num `json:"emissivity"`
	// ZenithEmissivity is the blackbody-weighted mean of ε_sky(λ, 0) at
	// AmbientK over all wavelengths as modelled; it differs from Emissivity
	// only when the window emissivity was clamped.
	ZenithEmissivity Num `json:"zenith_emissivity"`
	// HemisphericalEmissivity is the effective emissivity of the whole sky
	// hemisphere seen by a horizontal blackbody at AmbientK: downward flux
	// over σT⁴.
	HemisphericalEmissivity Num `json:"hemispherical_emissivity"`
	// Window is the atmospheric window of the two-band model, in nm
	// (written in µm: window_um).
	Window spectra.Interval `json:"-"`
	// WindowFraction is F_w, the fraction of blackbody emission at AmbientK
	// that falls in the window.
	WindowFraction Num `json:"window_fraction"`
	// WindowEmissivity is ε_w, the zenith emissivity inside the window
	// (for a spectral sky, its blackbody-weighted mean there).
	WindowEmissivity Num `json:"window_emissivity"`
	// Clamped reports that the dew point asked for a window emissivity
	// outside 0..1 and it was clamped.
	Clamped bool `json:"clamped"`
	// Description says all of the above in plain words.
	Description string `json:"description"`

	zenith spectra.Series // spectral sky: ε(λ, 0) = 1 − T(λ), clipped to 0..1
}

// skyWindowUM is skyWindow in µm, for sentences.
var skyWindowUM = bandOut(skyWindow, "µm")

// skyJSON is the JSON form of a Sky.
type skyJSON struct {
	Model                   string     `json:"model"`
	Source                  string     `json:"source,omitempty"`
	AmbientK                float64    `json:"ambient_k"`
	DewPointC               Num        `json:"dew_point_c"`
	Emissivity              Num        `json:"emissivity"`
	ZenithEmissivity        Num        `json:"zenith_emissivity"`
	HemisphericalEmissivity Num        `json:"hemispherical_emissivity"`
	WindowUM                [2]float64 `json:"window_um"`
	WindowFraction          Num        `json:"window_fraction"`
	WindowEmissivity        Num        `json:"window_emissivity"`
	Clamped                 bool       `json:"clamped"`
	Description             string     `json:"description"`
}

// MarshalJSON writes the sky with its window in µm.
func (k Sky) MarshalJSON() ([]byte, error) {
	return json.Marshal(skyJSON{k.Model, k.Source, k.AmbientK, k.DewPointC, k.Emissivity, k.ZenithEmissivity,
		k.HemisphericalEmissivity, bandOut(k.Window, "µm"), k.WindowFraction, k.WindowEmissivity, k.Clamped, k.Description})
}

// UnmarshalJSON reads the form MarshalJSON writes; a spectral sky's data
// are not in it.
func (k *Sky) UnmarshalJSON(b []byte) error {
	var j skyJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*k = Sky{Model: j.Model, Source: j.Source, AmbientK: j.AmbientK, DewPointC: j.DewPointC, Emissivity: j.Emissivity,
		ZenithEmissivity: j.ZenithEmissivity, HemisphericalEmissivity: j.HemisphericalEmissivity,
		Window: bandFrom(j.WindowUM[0], j.WindowUM[1], "µm"), WindowFraction: j.WindowFraction,
		WindowEmissivity: j.WindowEmissivity, Clamped: j.Clamped, Description: j.Description}
	return nil
}

// BerdahlMartin returns the broadband clear-sky emissivity for a dew point
// in °C after Berdahl & Martin (1984): 0.711 + 0.56 x + 0.73 x², x = T_dp/100.
func BerdahlMartin(dewPointC float64) float64 {
	x := dewPointC / 100
	return 0.711 + 0.56*x + 0.73*x*x
}

// ClearSky returns the clear two-band sky for a dew point (°C) at an air
// temperature (K): emissivity 1 outside 8–13 µm and ε_w inside, with
// ε_w = 1 − (1 − ε_sky)/F_w clamped to 0..1, so that the blackbody-weighted
// mean at ambientK equals ε_sky from [BerdahlMartin] unless clamped.
func ClearSky(dewPointC, ambientK float64) Sky {
	eps := BerdahlMartin(dewPointC)
	fw := blackbodyFraction(skyWindow.Lo, skyWindow.Hi, ambientK)
	ew := 1 - (1-eps)/fw
	clamped := ew < 0 || ew > 1
	ew = math.Max(0, math.Min(1, ew))
	k := Sky{Model: skyModelClear, AmbientK: ambientK, DewPointC: Num(dewPointC), Emissivity: Num(eps),
		Window: skyWindow, WindowFraction: Num(fw), WindowEmissivity: Num(ew), Clamped: clamped}
	k.ZenithEmissivity = Num(1 - fw*(1-ew))
	k.HemisphericalEmissivity = Num(1 - fw*(1-hemispherical(ew)))
	k.Description = fmt.Sprintf("Clear sky, two-band model: broadband emissivity %.3f from the dew point %s °C "+
		"(Berdahl & Martin 1984 correlation); emissivity 1 outside %g–%g µm and %.3f inside, so that a %s K "+
		"blackbody sees the same mean (%.1f %% of its emission falls in %g–%g µm).",
		eps, fmtG(dewPointC), skyWindowUM[0], skyWindowUM[1], ew, fmtG(ambientK), 100*fw, skyWindowUM[0], skyWindowUM[1])
	if clamped {
		k.Description += fmt.Sprintf(" The window emissivity this asks for, %.3f, lies outside 0..1 and was clamped "+
			"to %g: the sky's broadband emissivity becomes %.3f instead of %.3f.", 1-(1-eps)/fw, ew, float64(k.ZenithEmissivity), eps)
	}
	k.Description += angularWords(k)
	return k
}

// spectralSky returns the sky whose zenith emissivity is 1 − T(λ), T being
// the transmittance column of s (values clipped to 0..1). Outside the
// wavelengths s covers, and across gaps between its segments, the sky is
// taken as opaque (emissivity 1). name is the file name, for the output.
// It returns an error when s has no usable T column.
func spectralSky(s *spectra.Spectrum, name string, ambientK float64) (Sky, error) {
	if s == nil {
		return Sky{}, fmt.Errorf("sky %s: no spectrum", name)
	}
	tr := s.Series(spectra.T)
	var z spectra.Series
	for _, p := range tr.Pieces {
		if len(p.NM) < 2 {
			continue
		}
		v := make([]float64, len(p.V))
		for i, t := range p.V {
			v[i] = math.Max(0, math.Min(1, 1-t))
		}
		z.Pieces = append(z.Pieces, spectra.Piece{NM: p.NM, V: v})
	}
	if z.Empty() {
		return Sky{}, fmt.Errorf("sky %s: %w: a spectral sky needs a T column (zenith atmospheric transmittance) with at least two values in one segment", name, spectra.ErrNoValues)
	}
	k := Sky{Model: skyModelSpectral, Source: name, AmbientK: ambientK, DewPointC: Num(math.NaN()),
		Window: skyWindow, zenith: z}
	// Broadband figures: ε = 1 outside the file, so only the transmitted
	// part needs integrating over the file's range, and only where a
	// blackbody near ambient emits at all (1 µm to 1 mm: outside, less than
	// 1e-5 of its power).
	lo, hi := z.Range()
	sigmaT4 := spectra.StefanBoltzmann * math.Pow(ambientK, 4)
	var transZ, transH float64
	var grid []float64
	if a, b := math.Max(lo, skyRangeNM[0]), math.Min(hi, skyRangeNM[1]); b > a {
		grid = skyGrid(k, a, b)
	}
	for i := 1; i < len(grid); i++ {
		a, b := grid[i-1], grid[i]
		ea, eb := k.zenithOn(a, b)
		ba, bb := spectra.Planck(a, ambientK), spectra.Planck(b, ambientK)
		transZ += (b - a) / 2 * ((1-ea)*ba + (1-eb)*bb)
		transH += (b - a) / 2 * ((1-hemispherical(ea))*ba + (1-hemispherical(eb))*bb)
	}
	k.ZenithEmissivity = Num(1 - math.Pi*transZ/sigmaT4)
	k.Emissivity = k.ZenithEmissivity
	k.HemisphericalEmissivity = Num(1 - math.Pi*transH/sigmaT4)
	wlo, whi := skyWindow.Lo, skyWindow.Hi
	k.WindowFraction = Num(blackbodyFraction(wlo, whi, ambientK))
	var we, w float64
	wg := skyGrid(k, wlo, whi)
	for i := 1; i < len(wg); i++ {
		a, b := wg[i-1], wg[i]
		ea, eb := k.zenithOn(a, b)
		ba, bb := spectra.Planck(a, ambientK), spectra.Planck(b, ambientK)
		we += (b - a) / 2 * (ea*ba + eb*bb)
		w += (b - a) / 2 * (ba + bb)
	}
	k.WindowEmissivity = Num(we / w)
	k.Description = fmt.Sprintf("Spectral sky from %s: zenith emissivity 1 − T(λ) from its transmittance column over %s–%s µm, "+
		"opaque (emissivity 1) outside that range; blackbody-weighted zenith emissivity %.3f at %s K, %.3f over %g–%g µm.",
		name, fmtG(lo/1000), fmtG(hi/1000), float64(k.ZenithEmissivity), fmtG(ambientK), float64(k.WindowEmissivity), skyWindowUM[0], skyWindowUM[1])
	k.Description += angularWords(k)
	return k, nil
}

func angularWords(k Sky) string {
	return fmt.Sprintf(" Away from the zenith ε(λ, θ) = 1 − (1 − ε(λ, 0))^(1/cos θ) (common practice); over the "+
		"whole hemisphere the sky's effective emissivity is %.3f. The surface is taken as diffuse: its emittance "+
		"does not depend on angle.", float64(k.HemisphericalEmissivity))
}

// zenithAt returns the zenith spectral emissivity ε_sky(λ, 0) at nm. At a
// window edge of the two-band sky it returns the window value.
func (k Sky) zenithAt(nm float64) float64 {
	if k.Model == skyModelSpectral {
		if v, ok := k.zenith.At(nm); ok {
			return v
		}
		return 1
	}
	if nm >= skyWindow.Lo && nm <= skyWindow.Hi {
		return float64(k.WindowEmissivity)
	}
	return 1
}

// at returns ε_sky(λ, θ) = 1 − (1 − ε_sky(λ, 0))^(1/cos θ) for a direction
// with cos θ = mu, 0 < mu ≤ 1.
func (k Sky) at(nm, mu float64) float64 {
	return 1 - math.Pow(1-k.zenithAt(nm), 1/mu)
}

// zenithOn returns the zenith emissivity at a and b as seen from inside the
// interval (a, b), which must hold no breakpoint of the sky (see skyBreaks).
func (k Sky) zenithOn(a, b float64) (ea, eb float64) {
	m := (a + b) / 2
	if k.Model == skyModelSpectral {
		for _, p := range k.zenith.Pieces {
			if m > p.NM[0] && m < p.NM[len(p.NM)-1] {
				pc := spectra.Series{Pieces: []spectra.Piece{p}}
				ea, _ = pc.At(a)
				eb, _ = pc.At(b)
				return ea, eb
			}
		}
		return 1, 1
	}
	if m > skyWindow.Lo && m < skyWindow.Hi {
		w := float64(k.WindowEmissivity)
		return w, w
	}
	return 1, 1
}

// skyBreaks returns the wavelengths strictly inside (lo, hi) at which the
// sky's zenith emissivity has a kink or a step.
func (k Sky) skyBreaks(lo, hi float64) []float64 {
	var out []float64
	if k.Model == skyModelSpectral {
		for _, p := range k.zenith.Pieces {
			for _, nm := range p.NM {
				if nm > lo && nm < hi {
					out = append(out, nm)
				}
			}
		}
		return out
	}
	for _, nm := range []float64{skyWindow.Lo, skyWindow.Hi} {
		if nm > lo && nm < hi {
			out = append(out, nm)
		}
	}
	return out
}

// skyGrid is the sky's breakpoints and the reference grid over [lo, hi].
func skyGrid(k Sky, lo, hi float64) []float64 {
	g := append([]float64{lo, hi}, k.skyBreaks(lo, hi)...)
	g = append(g, referenceGrid(lo, hi)...)
	return sortUnique(g)
}

// Angular quadrature. The hemispherical emissivity of a sky layer whose
// zenith emissivity is e is
//
//	h(e) = 2 ∫₀¹ μ (1 − (1 − e)^(1/μ)) dμ = 1 − 2 ∫₀¹ μ t^(1/μ) dμ,  t = 1 − e,
//
// (μ = cos θ). The integrand has a boundary layer near μ = 0 when t is close
// to 1, so the rule integrates over s with μ = s²; with angularNodes
// Gauss–Legendre nodes it agrees with a 200-node rule and with the closed
// form 1 − 2E₃(−ln t) to 1e-7 (tested).
const angularNodes = 20

var (
	angularOnce sync.Once
	angularS    []float64 // nodes s on (0, 1)
	angularW    []float64 // weights × ds/dμ factor 2s × μ
)

func loadAngular() {
	x, w := gaussLegendre(angularNodes)
	angularS = make([]float64, len(x))
	angularW = make([]float64, len(x))
	for i := range x {
		s := (x[i] + 1) / 2
		angularS[i] = s
		angularW[i] = w[i] / 2 * 2 * s * s * s // dμ = 2s ds, times μ = s²
	}
}

// hemispherical returns h(e) for a zenith emissivity e (clipped to 0..1).
func hemispherical(e float64) float64 {
	return hemisphericalRule(e, angularNodes)
}

// hemisphericalRule evaluates h(e) with an n-node rule; n == angularNodes
// uses the cached nodes.
func hemisphericalRule(e float64, n int) float64 {
	t := 1 - e
	switch {
	case t <= 0:
		return 1
	case t >= 1:
		return 0
	}
	lt := math.Log(t)
	var s, w []float64
	if n == angularNodes {
		angularOnce.Do(loadAngular)
		s, w = angularS, angularW
	} else {
		x, wx := gaussLegendre(n)
		s, w = make([]float64, n), make([]float64, n)
		for i := range x {
			si := (x[i] + 1) / 2
			s[i], w[i] = si, wx[i]*si*si*si
		}
	}
	var sum float64
	for i, si := range s {
		sum += w[i] * math.Exp(lt/(si*si))
	}
	return 1 - 2*sum
}

// gaussLegendre returns the n nodes and weights of the Gauss–Legendre rule
// on [−1, 1], by Newton's iteration on the Legendre polynomial P_n.
func gaussLegendre(n int) (x, w []float64) {
	x, w = make([]float64, n), make([]float64, n)
	for i := 0; i < (n+1)/2; i++ {
		z := math.Cos(math.Pi * (float64(i) + 0.75) / (float64(n) + 0.5))
		var dp float64
		for range 100 {
			p1, p0 := 1.0, 0.0
			for j := 1; j <= n; j++ {
				p1, p0 = ((2*float64(j)-1)*z*p1-(float64(j)-1)*p0)/float64(j), p1
			}
			dp = float64(n) * (z*p1 - p0) / (z*z - 1)
			dz := p1 / dp
			z -= dz
			if math.Abs(dz) < 1e-16 {
				break
			}
		}
		x[i], x[n-1-i] = -z, z
		w[i] = 2 / ((1 - z*z) * dp * dp)
		w[n-1-i] = w[i]
	}
	return x, w
}

// blackbodyFraction returns the fraction of blackbody emission at kelvin
// that falls between lo and hi nm, from the series
// F(0→λ) = 15/π⁴ Σₙ e^(−nζ)/n (ζ³ + 3ζ²/n + 6ζ/n² + 6/n³), ζ = hc/(λkT).
func blackbodyFraction(lo, hi, kelvin float64) float64 {
	return belowFraction(hi, kelvin) - belowFraction(lo, kelvin)
}

// belowFraction returns the fraction of blackbody emission below nm.
func belowFraction(nm, kelvin float64) float64 {
	if nm <= 0 {
		return 0
	}
	z := spectra.PlanckConstant * spectra.SpeedOfLight / (nm * 1e-9 * spectra.Boltzmann * kelvin)
	var sum float64
	for n := 1.0; n < 1e5; n++ {
		term := math.Exp(-n*z) / n * (z*z*z + 3*z*z/n + 6*z/(n*n) + 6/(n*n*n))
		sum += term
		if term < 1e-17*sum {
			break
		}
	}
	return 15 / math.Pow(math.Pi, 4) * sum
}

// referenceStep is the relative spacing of the reference wavelength grid of
// the cooling integrals: nodes at lo·(1+referenceStep)^k. Refining it
// fourfold changes cooling powers by less than 0.01 W/m² and equilibrium
// temperatures by less than 0.001 K (tested; about 0.001 W/m² in practice).
const referenceStep = 1.0 / 200

// referenceGrid returns the geometric reference nodes strictly inside (lo, hi).
func referenceGrid(lo, hi float64) []float64 {
	return geometricGrid(lo, hi, referenceStep)
}

func geometricGrid(lo, hi, step float64) []float64 {
	n := int(math.Ceil(math.Log(hi/lo) / math.Log1p(step)))
	out := make([]float64, 0, n)
	for k := 1; k < n; k++ {
		nm := lo * math.Pow(1+step, float64(k))
		if nm > lo && nm < hi {
			out = append(out, nm)
		}
	}
	return out
}

// sortUnique sorts g and drops repeats.
func sortUnique(g []float64) []float64 {
	sort.Float64s(g)
	out := g[:0]
	for i, v := range g {
		if i == 0 || v > out[len(out)-1] {
			out = append(out, v)
		}
	}
	return out
}

func fmtG(x float64) string { return strconv.FormatFloat(x, 'g', 6, 64) }
