package datasheet

import (
	"fmt"
	"math"

	"skysheet/spectra"
)

// maxUVFactor caps the UV protection factor 1/T_ery. An erythemal
// transmittance at or below 1/maxUVFactor (0.001) is at the noise floor of a
// transmittance measurement, where its inverse means little (common
// practice, no source): the factor is then not given, only that it exceeds
// the cap.
const maxUVFactor = 1000

// UVProtection is the erythemally weighted UV transmittance of a sample and
// the protection factor it implies.
type UVProtection struct {
	// Transmittance is T_ery = ∫ T s_er E dλ / ∫ s_er E dλ over the covered
	// part of 280–400 nm; NaN when no data fall in the band.
	Transmittance Num `json:"transmittance"`
	// Coverage is the share of ∫ s_er E dλ over 280–400 nm that the data
	// cover.
	Coverage Num `json:"coverage"`
	// Factor is 1/T_ery; NaN when T_ery is unknown or at most
	// 1/MaxUVFactor.
	Factor Num `json:"factor"`
	// AboveCap reports that T_ery ≤ 1/MaxUVFactor: the factor exceeds
	// MaxUVFactor and is not given.
	AboveCap bool   `json:"above_cap"`
	Note     string `json:"note"`
}

// ErythemalTransmittance returns the erythemally weighted UV transmittance
// of the transmittance series t: t weighted by [spectra.ErythemalSolar] (the
// CIE erythema action spectrum of ISO 17166 times the ASTM G173-03 global
// tilt irradiance) over 280–400 nm, and the protection factor 1/T_ery with
// the cap maxUVFactor. It is an estimate on a different solar spectrum
// from the one textile UV-protection standards use, not a rating; the Note
// says so.
func ErythemalTransmittance(t spectra.Series) UVProtection {
	band := spectra.ErythemalBandNM
	m := spectra.BandMean(t, spectra.ErythemalSolar(), band.Lo, band.Hi)
	u := UVProtection{Transmittance: Num(m.Value), Coverage: Num(m.Coverage), Factor: Num(math.NaN())}
	u.Note = "Erythemally weighted UV transmittance: the CIE erythema action spectrum (ISO 17166 / CIE S 007) times the " +
		"ASTM G173-03 global tilt spectrum over 280–400 nm, and the protection factor 1/T_ery it implies. An estimate on " +
		"a different solar spectrum from the one textile UV-protection standards use, not a rating."
	switch {
	case math.IsNaN(m.Value):
		u.Coverage = 0
		u.Note += " No transmittance data fall in 280–400 nm."
	case m.Value <= 1.0/maxUVFactor:
		u.AboveCap = true
		u.Note += fmt.Sprintf(" T_ery %.2g is at most %g, the noise floor of a transmittance measurement: the factor "+
			"exceeds %d and is not given.", m.Value, 1.0/maxUVFactor, maxUVFactor)
	default:
		u.Factor = Num(1 / m.Value)
	}
	if c := m.Coverage; c > 0 && c < 1 {
		u.Note += fmt.Sprintf(" The data cover %.1f %% of the weighting.", 100*c)
	}
	return u
}
