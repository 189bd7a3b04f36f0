package main

import "math"

// Building blocks of the synthetic spectra. Wavelengths are in nm,
// wavenumbers in cm⁻¹, scattering and absorption coefficients in mm⁻¹ (bulk
// absorption of glass in cm⁻¹, as glass makers quote it).

// wavenumber converts a wavelength in nm to a wavenumber in cm⁻¹.
func wavenumber(nm float64) float64 { return 1e7 / nm }

// lorentz is a Lorentzian line of unit height centred on x0 with full width
// at half maximum fwhm.
func lorentz(x, x0, fwhm float64) float64 {
	d := 2 * (x - x0) / fwhm
	return 1 / (1 + d*d)
}

// gauss is a Gaussian line of unit height centred on x0 with full width at
// half maximum fwhm.
func gauss(x, x0, fwhm float64) float64 {
	s := fwhm / (2 * math.Sqrt(2*math.Ln2))
	d := (x - x0) / s
	return math.Exp(-d * d / 2)
}

// rise is a logistic step from 0 (x ≪ x0) to 1 (x ≫ x0) of width w.
func rise(x, x0, w float64) float64 { return 1 / (1 + math.Exp(-(x-x0)/w)) }

// fall is a logistic step from 1 (x ≪ x0) to 0 (x ≫ x0) of width w.
func fall(x, x0, w float64) float64 { return 1 - rise(x, x0, w) }

// clamp01 keeps v within 0..1.
func clamp01(v float64) float64 { return math.Max(0, math.Min(1, v)) }

// band is one absorption band in wavenumber: centre, full width at half
// maximum, and peak absorption coefficient (mm⁻¹).
type band struct{ centre, fwhm, k float64 }

// bands is a set of absorption bands of one substance.
type bands []band

// at sums the bands' absorption coefficients at wavenumber nu. Vibrational
// bands of solids are closer to Gaussian than Lorentzian in their wings; a
// Gaussian core with a weak Lorentzian wing keeps the spectra smooth without
// letting distant wings fill every gap.
func (bs bands) at(nu float64) float64 {
	k := 0.0
	for _, b := range bs {
		k += b.k * (0.85*gauss(nu, b.centre, b.fwhm) + 0.15*lorentz(nu, b.centre, b.fwhm))
	}
	return k
}

// fresnel is the normal-incidence reflectance of an interface between air
// and a non-absorbing medium of refractive index n: ((n−1)/(n+1))².
func fresnel(n float64) float64 {
	r := (n - 1) / (n + 1)
	return r * r
}

// kmSlab is the Kubelka–Munk two-flux solution for a layer of thickness x
// (mm) with absorption coefficient k and scattering coefficient s (mm⁻¹),
// lit with diffuse light and with no backing: its diffuse reflectance and
// transmittance. With a = 1 + k/s and b = √(a²−1),
// R = sinh(bsx) / (a sinh(bsx) + b cosh(bsx)) and
// T = b / (a sinh(bsx) + b cosh(bsx)).
func kmSlab(k, s, x float64) (r, t float64) {
	switch {
	case s <= 0:
		return 0, math.Exp(-2 * k * x) // diffuse light: mean path twice the thickness
	case k/s < 1e-9:
		return s * x / (1 + s*x), 1 / (1 + s*x)
	}
	a := 1 + k/s
	b := math.Sqrt(a*a - 1)
	y := b * s * x
	if y > 40 { // sinh ≈ cosh ≈ e^y / 2
		return 1 / (a + b), 2 * b * math.Exp(-y) / (a + b)
	}
	sh, ch := math.Sinh(y), math.Cosh(y)
	d := a*sh + b*ch
	return sh / d, b / d
}

// kmInfinite is the Kubelka–Munk reflectance of an optically thick layer,
// R∞ = 1 + k/s − √((k/s)² + 2k/s).
func kmInfinite(k, s float64) float64 {
	q := k / s
	return 1 + q - math.Sqrt(q*q+2*q)
}

// onBacking puts a layer of diffuse reflectance r and transmittance t over a
// backing of reflectance rg, summing the multiple reflections between them:
// R = r + t² rg / (1 − r rg).
func onBacking(r, t, rg float64) float64 { return r + t*t*rg/(1-r*rg) }

// saunderson corrects a body reflectance rb (and transmittance tb) for the
// front surface: r0 is the specular reflectance of the surface for the
// incoming beam (counted, since an integrating sphere collects it) and ri
// the internal reflectance met by diffuse light leaving the layer.
// R = r0 + (1−r0)(1−ri) rb / (1 − ri rb).
func saunderson(rb, tb, r0, ri float64) (r, t float64) {
	d := 1 - ri*rb
	return r0 + (1-r0)*(1-ri)*rb/d, (1 - r0) * (1 - ri) * tb / d
}

// incoherentSlab is a plane slab with two equal surfaces of reflectance r and
// internal transmittance tau, summing the multiple reflections without
// interference (thick glass): T = (1−r)² τ / (1 − r² τ²) and
// R = r + (1−r)² r τ² / (1 − r² τ²).
func incoherentSlab(r, tau float64) (rs, ts float64) {
	den := 1 - r*r*tau*tau
	return r + (1-r)*(1-r)*r*tau*tau/den, (1 - r) * (1 - r) * tau / den
}

// silver is the normal-incidence reflectance of an opaque silver mirror: high
// through the visible and infrared, with the deep minimum near 320 nm where
// its free-electron (plasma) resonance meets the interband absorption.
func silver(nm float64) float64 {
	ir := 0.992 - 0.07*math.Exp(-(nm-330)/140) // climbs from the edge to the infrared plateau
	if nm > 2500 {
		ir = 0.992 + 0.003*rise(nm, 8000, 3000)
	}
	edge := rise(nm, 326, 4.5)       // steep edge above the plasma minimum
	inter := 0.22 * fall(nm, 316, 5) // interband reflectance in the deep UV
	return clamp01(ir*edge + inter*(1-edge))
}
