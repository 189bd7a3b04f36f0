package spectra

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"skysheet/spectra/msg"
)

// Measurement is what one file says about how its data were taken, beyond
// the values: the spectral resolution and, for infrared data, whether the
// emittance is near-normal or hemispherical. The readers give one per file.
type Measurement struct {
	Source string
	// Lo and Hi are the file's first and last wavelength, nm.
	Lo, Hi float64
	// Resolution is the file's "resolution" metadata, else the default of
	// its axis unit (see [DefaultResolution]); ResolutionStated tells which.
	Resolution       Resolution
	ResolutionStated bool
	// Emittance is the basis the file's "emittance" metadata states;
	// EmittanceUnstated when it states none. EmittanceFrom says where it
	// was stated when not in the file (a material's front matter, say).
	Emittance     EmittanceBasis
	EmittanceFrom string
}

// Resolution is the spectral resolution of a measurement: the width of one
// resolution element, over which the errors of neighbouring points are
// correlated. NM is a width in nm, Wavenumber one in cm⁻¹; where both are
// set, the wider applies at each wavelength.
type Resolution struct {
	NM, Wavenumber float64
}

// Width returns the width of a resolution element at wavelength nm, in nm:
// a width Δν̃ in cm⁻¹ is λ²Δν̃ in wavelength.
func (r Resolution) Width(nm float64) float64 {
	return math.Max(r.NM, nm*nm*r.Wavenumber*1e-7)
}

// String writes the resolution as metadata does: "2 nm", "4 cm-1" or
// "2 nm or 4 cm-1".
func (r Resolution) String() string {
	var parts []string
	if r.NM > 0 {
		parts = append(parts, strconv.FormatFloat(r.NM, 'g', -1, 64)+" nm")
	}
	if r.Wavenumber > 0 {
		parts = append(parts, strconv.FormatFloat(r.Wavenumber, 'g', -1, 64)+" cm-1")
	}
	return strings.Join(parts, " or ")
}

// DefaultResolution returns the resolution assumed for a file that states
// none, by the unit of its spectral axis: 2 nm for a wavelength axis in nm
// (UV-Vis-NIR spectrophotometers), 4 cm⁻¹ for a wavenumber axis (FTIR), and
// for an axis in µm, used for both, the wider of the two at each
// wavelength. These are usual settings of the instruments: common
// practice, no source.
func DefaultResolution(unit string) Resolution {
	// unit is "nm", "cm-1" or anything else for µm.
	switch unit {
	case "nm":
		return Resolution{NM: 2}
	case "cm-1":
		return Resolution{Wavenumber: 4}
	}
	return Resolution{NM: 2, Wavenumber: 4}
}

// EmittanceBasis says over which directions an emittance was measured.
type EmittanceBasis int

// The emittance bases. An FTIR measurement with a reflectance accessory
// gives near-normal emittance; an emissometer, or the standards behind the
// SRI, total hemispherical.
const (
	EmittanceUnstated      EmittanceBasis = iota
	EmittanceNearNormal                   // "near-normal"
	EmittanceHemispherical                // "hemispherical"
)

// String returns "near-normal", "hemispherical" or "" when unstated.
func (b EmittanceBasis) String() string {
	switch b {
	case EmittanceNearNormal:
		return "near-normal"
	case EmittanceHemispherical:
		return "hemispherical"
	}
	return ""
}

// MarshalText writes the String form.
func (b EmittanceBasis) MarshalText() ([]byte, error) { return []byte(b.String()), nil }

// UnmarshalText reads "near-normal" (also "near normal", "normal") or
// "hemispherical" (also "total hemispherical"), without regard to case;
// "" is unstated.
func (b *EmittanceBasis) UnmarshalText(t []byte) error {
	v, err := ParseEmittanceBasis(string(t))
	if err != nil {
		return err
	}
	*b = v
	return nil
}

// ParseEmittanceBasis reads the text form of an emittance basis.
func ParseEmittanceBasis(s string) (EmittanceBasis, error) {
	switch strings.Join(strings.Fields(strings.ToLower(strings.ReplaceAll(s, "-", " "))), " ") {
	case "":
		return EmittanceUnstated, nil
	case "near normal", "normal":
		return EmittanceNearNormal, nil
	case "hemispherical", "total hemispherical":
		return EmittanceHemispherical, nil
	}
	return EmittanceUnstated, fmt.Errorf("emittance %s: want near-normal or hemispherical", msg.Quote(s))
}

// Metadata keys for a file's measurement (see [Measurement]).
const (
	resolutionKey = "resolution"
	emittanceKey  = "emittance"
)

// fileMeta is what the metadata of one file set while it is read.
type fileMeta struct {
	consts [numQuantities]float64 // constant uncertainties, NaN if none
	// res is the stated resolution, in resUnit, or in the unit of the
	// file's axis (known only at the end) when resUnit is "".
	res     float64
	resUnit string // "nm" or "cm-1"; "" for the axis unit
	stated  bool
	basis   EmittanceBasis
}

func newFileMeta() *fileMeta {
	m := &fileMeta{}
	for i := range m.consts {
		m.consts[i] = math.NaN()
	}
	return m
}

// setResolution reads a "resolution" value: a positive number, optionally
// followed by nm, µm or cm⁻¹ (also um, micrometers, cm-1, 1/cm); a bare
// number is in the unit of the file's axis.
func (m *fileMeta) setResolution(v string) error {
	s := strings.TrimSpace(v)
	i := strings.IndexFunc(s, func(r rune) bool {
		return !(r >= '0' && r <= '9' || r == '.' || r == 'e' || r == 'E' || r == '+' || r == '-')
	})
	num, unit := s, ""
	if i >= 0 {
		num, unit = strings.TrimSpace(s[:i]), strings.TrimSpace(s[i:])
	}
	x, err := strconv.ParseFloat(num, 64)
	bad := fmt.Errorf("%w: resolution: %s: want a positive width such as 2 nm, 0.002 µm or 4 cm-1", errBadMetadata, msg.Quote(v))
	if err != nil || !(x > 0) || math.IsInf(x, 0) {
		return bad
	}
	switch strings.ToLower(strings.ReplaceAll(unit, " ", "")) {
	case "":
	case "nm", "nanometers", "nanometres":
		unit = "nm"
	case "µm", "μm", "um", "micron", "microns", "micrometers", "micrometres":
		x, unit = x*1000, "nm"
	case "cm-1", "cm⁻¹", "1/cm", "cm^-1", "wavenumbers":
		unit = "cm-1"
	default:
		return bad
	}
	m.res, m.resUnit, m.stated = x, unit, true
	return nil
}

// measurement returns the measurement of file name, read with a spectral
// axis in unit ("nm", "um" or "cm-1"), once s holds its segments.
func (m *fileMeta) measurement(name, unit string, s *Spectrum) Measurement {
	out := Measurement{Source: name, Emittance: m.basis, Resolution: DefaultResolution(unit)}
	out.Lo, out.Hi = s.Range()
	if m.stated {
		u := m.resUnit
		x := m.res
		if u == "" {
			switch unit {
			case "um":
				u, x = "nm", x*1000
			default:
				u = unit
			}
		}
		if u == "cm-1" {
			out.Resolution = Resolution{Wavenumber: x}
		} else {
			out.Resolution = Resolution{NM: x}
		}
		out.ResolutionStated = true
	}
	return out
}

// MeasurementAt returns the measurement behind the value at wavelength nm
// of segment g of s, and false when s does not say (a spectrum built
// without a reader).
func (s *Spectrum) MeasurementAt(g *Segment, nm float64) (Measurement, bool) {
	var fallback *Measurement
	for i := range s.Measurements {
		m := &s.Measurements[i]
		if !sourceIn(g.Source, m.Source) {
			continue
		}
		if nm >= m.Lo && nm <= m.Hi {
			return *m, true
		}
		if fallback == nil {
			fallback = m
		}
	}
	if fallback != nil {
		return *fallback, true
	}
	return Measurement{}, false
}

// MeasurementOf reports whether measurement k of s is behind segment g:
// its file is among the segment's sources (see MeasurementAt).
func (s *Spectrum) MeasurementOf(g *Segment, k int) bool {
	return sourceIn(g.Source, s.Measurements[k].Source)
}

// sourceIn reports whether file is among the sources of a segment, which
// names one file or, for files joined where they touch, several joined by
// "+".
func sourceIn(segSource, file string) bool {
	if segSource == file {
		return true
	}
	// Is file one of the "+"-separated names, without building "+file+"
	// (asked for every row of a spectrum)?
	for i := 0; i+len(file) <= len(segSource); {
		j := strings.Index(segSource[i:], file)
		if j < 0 {
			return false
		}
		p := i + j
		q := p + len(file)
		if (p == 0 || segSource[p-1] == '+') && (q == len(segSource) || segSource[q] == '+') && (p > 0 || q < len(segSource)) {
			return true
		}
		i = p + 1
	}
	return false
}

// String returns the unit as [DefaultResolution] takes it.
func (a axis) String() string {
	switch a {
	case axisUM:
		return "um"
	case axisWavenumber:
		return "cm-1"
	}
	return "nm"
}

// String returns the unit as [DefaultResolution] takes it.
func (x jcampX) String() string {
	switch x {
	case xUM:
		return "um"
	case xWavenumber:
		return "cm-1"
	}
	return "nm"
}
