package datasheet

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"skysheet/spectra"
	"skysheet/spectra/colorimetry"
)

// colorWeighting names the weighting of the colour figures, as in
// [Figure.Weighting] and the provenance.
const colorWeighting = "CIE 1931 2° observer, illuminant D65"

// colorBand is the range the colour figures sum over, nm.
var colorBand = spectra.Interval{Lo: 380, Hi: 780}

// Color is the colour of a sample's reflectance or transmittance: CIE 1931
// tristimulus values under D65 (2° observer, 1 nm summation over 380–780
// nm, Y = 100 for a perfect reflector), CIE 1976 L*a*b* with the white of
// the same tables, chromaticity, luminous reflectance or transmittance
// Y/100 and an sRGB colour for display (see docs/color.md).
type Color struct {
	// Of is "reflectance" or "transmittance".
	Of       string `json:"of"`
	XYZ      [3]Num `json:"xyz"`
	Lab      [3]Num `json:"lab"`
	XY       [2]Num `json:"xy"`
	Luminous Num    `json:"luminous"`
	// SRGB is "#rrggbb" (IEC 61966-2-1), "" when there is no colour.
	SRGB string `json:"srgb"`
	// Clipped reports that the colour lies outside the sRGB gamut and is
	// shown with its channels clipped; Note says which and by how much.
	Clipped bool   `json:"srgb_clipped"`
	Note    string `json:"srgb_note"`
	// Reason says why there is no colour ("" when there is).
	Reason string `json:"reason,omitempty"`
}

// Colors are a sample's colours: of its reflectance always, of its
// transmittance when transmittance was measured.
type Colors struct {
	Reflectance   Color  `json:"reflectance"`
	Transmittance *Color `json:"transmittance"`
}

// colorNote is said of every screen colour.
const colorNote = "Screen colour is approximate: sRGB (IEC 61966-2-1) on a calibrated display, from the D65 colour of the spectra."

// colorOf returns the colour of series x, which holds quantity of.
func colorOf(x spectra.Series, of string) Color {
	nan := Num(math.NaN())
	c := Color{Of: of, XYZ: [3]Num{nan, nan, nan}, Lab: [3]Num{nan, nan, nan}, XY: [2]Num{nan, nan}, Luminous: nan}
	t, err := colorimetry.Tristimulus(x)
	if err != nil {
		c.Reason = colorReason(err, of)
		return c
	}
	lab := t.Lab()
	c.XYZ = [3]Num{Num(t.X), Num(t.Y), Num(t.Z)}
	c.Lab = [3]Num{Num(lab.L), Num(lab.A), Num(lab.B)}
	if x, y, ok := t.Chromaticity(); ok {
		c.XY = [2]Num{Num(x), Num(y)}
	}
	c.Luminous = Num(t.Luminous())
	s := t.SRGB()
	c.SRGB, c.Clipped, c.Note = s.Hex(), s.Clipped, colorNote
	if s.Clipped {
		var parts []string
		for i, v := range s.Clip {
			switch {
			case v < 0:
				parts = append(parts, fmt.Sprintf("%c %.3f below 0", "RGB"[i], -v))
			case v > 0:
				parts = append(parts, fmt.Sprintf("%c %.3f above 1", "RGB"[i], v))
			}
		}
		c.Note += " This colour lies outside the sRGB gamut and is shown clipped (linear " + strings.Join(parts, ", ") + "): the real colour is more saturated or brighter than the swatch."
	} else {
		c.Note += " It lies within the sRGB gamut."
	}
	return c
}

// colorReason says, for a reader, why a series has no colour.
func colorReason(err error, of string) string {
	msg := strings.TrimPrefix(err.Error(), "colorimetry: ")
	if errors.Is(err, colorimetry.ErrNotCovered) {
		return "the " + of + " data do not cover 380–780 nm in one piece (" + strings.TrimPrefix(msg, colorimetry.ErrNotCovered.Error()+": ") + "; no extrapolation into the visible)"
	}
	return "no colour from the " + of + " data: " + msg
}

// addColor appends the colour figures of o to f: of the reflectance, and
// of the transmittance when s measured it.
func addColor(f *Figures, s *spectra.Spectrum, o spectra.Optics) {
	type set struct {
		x                 spectra.Series
		of                string
		lab, xy, luminous string
		labL, xyL, lumL   string
		dst               *Color
	}
	sets := []set{{o.R, "reflectance", "color_lab", "color_xy", "luminous_reflectance",
		"CIELAB colour L*, a*, b* (D65, 2°)", "Chromaticity x, y (D65, 2°)", "Luminous reflectance (D65, Y/100)", &f.Color.Reflectance}}
	if s.Has(spectra.T) {
		f.Color.Transmittance = &Color{}
		sets = append(sets, set{o.T, "transmittance", "transmitted_color_lab", "transmitted_color_xy", "luminous_transmittance",
			"Transmitted colour L*, a*, b* (D65, 2°)", "Transmitted chromaticity x, y (D65, 2°)", "Luminous transmittance (D65, Y/100)", f.Color.Transmittance})
	}
	for _, st := range sets {
		c := colorOf(st.x, st.of)
		*st.dst = c
		cov := Num(colorimetry.Coverage(st.x))
		if c.Reason == "" {
			cov = 1
		}
		fig := func(key, label string, v Num, comps []Num) {
			f.Figures = append(f.Figures, Figure{Key: key, Label: label, Value: v, Components: comps,
				Band: colorBand, BandUnit: "nm", Weighting: colorWeighting, Coverage: cov, Reason: c.Reason})
		}
		fig(st.lab, st.labL, c.Lab[0], c.Lab[:])
		fig(st.xy, st.xyL, c.XY[0], c.XY[:])
		fig(st.luminous, st.lumL, c.Luminous, nil)
	}
}

// colorSource is the provenance of the colour figures' tables.
func colorSource() WeightingSource {
	return WeightingSource{Name: colorWeighting,
		Version: "CIE 1931 2° colour-matching functions and CIE standard illuminant D65, 1 nm, 380–780 nm (CIE 015, ISO 11664-1 and -2), embedded table; 1 nm summation as in ASTM E308",
		SHA256:  colorimetry.TableSHA256()}
}

// colorMetric is how a claim of a multi-component figure measures its
// distance from the computed value.
type colorMetric struct {
	name  string // "ΔE*ab"
	words string // "CIE 1976 ΔE*ab"
	dist  func(a, b []float64) float64
}

// The names a claim's delta_e may take.
const (
	DeltaE76   = "cie76"
	DeltaE2000 = "ciede2000"
)

// metricOf returns the distance a claim of kind k uses, given its delta_e.
func metricOf(k Kind, deltaE string) (colorMetric, error) {
	lab := func(v []float64) colorimetry.Lab { return colorimetry.Lab{L: v[0], A: v[1], B: v[2]} }
	switch {
	case k == KindLab && (deltaE == "" || deltaE == DeltaE76):
		return colorMetric{"ΔE*ab", "CIE 1976 ΔE*ab", func(a, b []float64) float64 { return colorimetry.DeltaE76(lab(a), lab(b)) }}, nil
	case k == KindLab && deltaE == DeltaE2000:
		return colorMetric{"ΔE00", "CIEDE2000 ΔE00", func(a, b []float64) float64 { return colorimetry.DeltaE2000(lab(a), lab(b)) }}, nil
	case k == KindLab:
		return colorMetric{}, fmt.Errorf("delta_e %q: want %s or %s", deltaE, DeltaE76, DeltaE2000)
	case k == KindChromaticity && deltaE == "":
		return colorMetric{"Δxy", "distance in x, y", func(a, b []float64) float64 { return math.Hypot(a[0]-b[0], a[1]-b[1]) }}, nil
	case k == KindChromaticity:
		return colorMetric{}, fmt.Errorf("delta_e %q: a chromaticity claim is judged by its distance in x, y; delta_e is for L*a*b* claims", deltaE)
	}
	return colorMetric{}, fmt.Errorf("delta_e %q: only claims of an L*a*b* colour take delta_e", deltaE)
}

// componentNames are the names of the components of a multi-component
// kind.
func (k Kind) componentNames() []string {
	switch k {
	case KindLab:
		return []string{"L*", "a*", "b*"}
	case KindChromaticity:
		return []string{"x", "y"}
	}
	return nil
}

// FormatValues writes the components of a value of kind k with their
// names: "L* 52.14, a* 24.31, b* 18.02", "x 0.4123, y 0.3567"; "n/a"
// when any is NaN. For a single-component kind it writes v[0] as
// [Kind.Format] does, without a unit.
func (k Kind) FormatValues(v []float64) string {
	names := k.componentNames()
	if names == nil || len(v) != len(names) {
		if len(v) == 0 {
			return "n/a"
		}
		return k.Format(v[0], "")
	}
	parts := make([]string, len(v))
	for i, x := range v {
		if math.IsNaN(x) {
			return "n/a"
		}
		parts[i] = names[i] + " " + k.Format(x, "")
	}
	return strings.Join(parts, ", ")
}

// IsColor reports whether f is one of the colour figures (L*a*b*,
// chromaticity, luminous reflectance or transmittance), which rest on the
// data over 380–780 nm under D65.
func (f Figure) IsColor() bool { return specOf(f).color }

// Text writes the figure's value for a reader: all its components for a
// colour, a temperature difference as where the surface settles, any
// other value as its kind formats it with its unit; "n/a" when unknown.
func (f Figure) Text() string {
	k := f.Kind()
	if k.componentNames() != nil {
		v := make([]float64, len(f.Components))
		for i, x := range f.Components {
			v[i] = float64(x)
		}
		return k.FormatValues(v)
	}
	return k.Words(float64(f.Value), f.Unit)
}

// claimedValuesText writes the claimed components without rounding:
// "L* 52, a* 24.5, b* 18".
func claimedValuesText(k Kind, v []float64) string {
	names := k.componentNames()
	parts := make([]string, len(v))
	for i, x := range v {
		parts[i] = strconv.FormatFloat(x, 'g', -1, 64)
		if i < len(names) {
			parts[i] = names[i] + " " + parts[i]
		}
	}
	return strings.Join(parts, ", ")
}

// ColorDifference returns the colour difference between the reflected
// colours of a and b, CIE 1976 ΔE*ab and CIEDE2000 ΔE00; ok is false when
// either has no colour.
func ColorDifference(a, b *Figures) (de76, de2000 float64, ok bool) {
	if a == nil || b == nil {
		return 0, 0, false
	}
	la, lb := a.Color.Reflectance.Lab, b.Color.Reflectance.Lab
	for i := range la {
		if math.IsNaN(float64(la[i])) || math.IsNaN(float64(lb[i])) {
			return 0, 0, false
		}
	}
	x := colorimetry.Lab{L: float64(la[0]), A: float64(la[1]), B: float64(la[2])}
	y := colorimetry.Lab{L: float64(lb[0]), A: float64(lb[1]), B: float64(lb[2])}
	return colorimetry.DeltaE76(x, y), colorimetry.DeltaE2000(x, y), true
}
