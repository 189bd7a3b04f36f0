package datasheet

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"skysheet/spectra"
)

// maxRefractiveIndex is the largest refractive index the conversion
// accepts: above it a surface is no longer a usual dielectric coating.
const maxRefractiveIndex = 5

// EmittanceBasis says over which directions the emittance behind the
// figures was measured, and whether the cooling figures and the SRI were
// converted to hemispherical (see docs/cooling.md, "Near-normal or
// hemispherical").
type EmittanceBasis struct {
	// Data is the basis of the infrared data: near-normal (the default for
	// FTIR data) or hemispherical; From says where that comes from.
	Data spectra.EmittanceBasis `json:"data"`
	From string                 `json:"from"`
	// Figures is the basis of the cooling figures and the SRI: Data, or
	// hemispherical when near-normal data were converted.
	Figures spectra.EmittanceBasis `json:"figures"`
	// RefractiveIndex and Ratio are the conversion's n and its
	// hemispherical/normal emittance ratio; null when there is none.
	RefractiveIndex Num `json:"refractive_index"`
	Ratio           Num `json:"ratio"`
}

// Words describes the basis in a few words, e.g. "near-normal (default
// for FTIR data)".
func (b EmittanceBasis) Words() string {
	s := b.Data.String() + " (" + b.From + ")"
	if !math.IsNaN(float64(b.Ratio)) {
		s += fmt.Sprintf("; cooling figures and SRI converted to hemispherical as a smooth dielectric of n %s (× %.3f)",
			fmtG(float64(b.RefractiveIndex)), float64(b.Ratio))
	}
	return s
}

// short is the basis of the cooling figures and the SRI as their
// weighting names it.
func (b EmittanceBasis) short() string {
	switch {
	case b.Figures == spectra.EmittanceUnstated:
		return ""
	case b.Ratio > 0:
		return fmt.Sprintf("hemispherical emittance (from near-normal, n %s)", fmtG(float64(b.RefractiveIndex)))
	}
	return b.Figures.String() + " emittance"
}

// emittanceBasisOf returns the basis of s's infrared data under c: the
// basis the files reaching into the exchange band state, near-normal when
// none does (FTIR data are usually near-normal), and the conversion when c
// asks for one and the data are near-normal.
func emittanceBasisOf(s *spectra.Spectrum, c Conditions) EmittanceBasis {
	nan := Num(math.NaN())
	b := EmittanceBasis{Data: spectra.EmittanceNearNormal, From: "default for FTIR data", RefractiveIndex: nan, Ratio: nan}
	var stated []string
	var bases []spectra.EmittanceBasis
	for _, m := range s.Measurements {
		if m.Hi <= c.ExchangeBand.Lo || m.Emittance == spectra.EmittanceUnstated {
			continue
		}
		from := m.Source
		if m.EmittanceFrom != "" {
			from = m.EmittanceFrom
		}
		if !slices.Contains(stated, from) {
			stated = append(stated, from)
		}
		bases = append(bases, m.Emittance)
	}
	switch {
	case len(bases) == 0:
	case allSame(bases):
		b.Data, b.From = bases[0], "stated in "+strings.Join(stated, ", ")
	default:
		b.From = "the files disagree (" + strings.Join(stated, ", ") + "); taken as near-normal"
	}
	b.Figures = b.Data
	if n := c.RefractiveIndex; n.On && b.Data == spectra.EmittanceNearNormal {
		b.RefractiveIndex, b.Ratio = Num(n.V), Num(hemisphericalRatio(n.V))
		b.Figures = spectra.EmittanceHemispherical
	}
	return b
}

func allSame[T comparable](xs []T) bool {
	for _, x := range xs {
		if x != xs[0] {
			return false
		}
	}
	return true
}

// fresnelReflectance returns the reflectance of unpolarised light on a
// smooth surface of a non-absorbing dielectric of index n, from air, at
// μ = cos θ: (R_s + R_p)/2 by the Fresnel equations.
func fresnelReflectance(n, mu float64) float64 {
	sin2 := 1 - mu*mu
	ct := math.Sqrt(1 - sin2/(n*n)) // cos of the refracted angle (Snell)
	rs := (mu - n*ct) / (mu + n*ct)
	rp := (n*mu - ct) / (n*mu + ct)
	return (rs*rs + rp*rp) / 2
}

// hemisphericalRatio returns ε_h/ε_n for a smooth, opaque, non-absorbing
// dielectric of index n: ε(μ) = 1 − R(μ) by Kirchhoff's law and the
// Fresnel equations, ε_n = ε(1) = 1 − ((n−1)/(n+1))² and ε_h =
// 2 ∫₀¹ ε(μ) μ dμ, by a 48-node Gauss–Legendre rule in μ (the integrand
// is smooth in μ for n > 1). About 0.95 at n = 1.5.
func hemisphericalRatio(n float64) float64 {
	var h float64
	for i, x := range hemiX {
		mu := (x + 1) / 2 // [−1, 1] → [0, 1]: dμ = dx/2
		h += hemiW[i] * (1 - fresnelReflectance(n, mu)) * mu
	}
	r := (n - 1) / (n + 1)
	return h / (1 - r*r)
}

// hemiX and hemiW are the nodes and weights of hemisphericalRatio's rule.
var hemiX, hemiW = gaussLegendre(48)

// withEmittanceRatio returns o with its emittance (A) multiplied by ratio,
// for the cooling integrals; o itself when ratio is 1.
func withEmittanceRatio(o spectra.Optics, ratio float64) spectra.Optics {
	if ratio == 1 {
		return o
	}
	a := spectra.Series{Pieces: make([]spectra.Piece, len(o.A.Pieces))}
	for i, p := range o.A.Pieces {
		v := make([]float64, len(p.V))
		for j, x := range p.V {
			v[j] = ratio * x
		}
		a.Pieces[i] = spectra.Piece{NM: p.NM, V: v}
	}
	o.A = a
	return o
}
