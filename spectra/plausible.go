package spectra

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
)

// Plausibility checks of the neutral reader: data that read without error
// but are likely mislabelled give a warning in [Spectrum.Warnings], not an
// error.

// isGrouped reports whether s is written like a thousands-grouped
// integer: one to three digits, a point or comma, exactly three digits
// ("2.500", "1,000").
func isGrouped(s string) bool {
	n := len(s)
	if n < 5 || n > 7 || s[n-4] != '.' && s[n-4] != ',' {
		return false
	}
	for i := range n {
		if i != n-4 && (s[i] < '0' || s[i] > '9') {
			return false
		}
	}
	return true
}

// groupedBothRE matches a number grouped by thousands with a decimal part,
// in either convention ("1,234.5", "1.234,5", "12,345,678").
var groupedBothRE = regexp.MustCompile(`^[+-]?\d{1,3}((,\d{3})+(\.\d+)?|(\.\d{3})+(,\d+)?)$`)

// Optical spectra lie between about 100 nm (vacuum ultraviolet) and
// 100 µm (far infrared); an axis wholly outside is taken as a sign of a
// mislabelled file (common practice, no source).
const (
	plausibleLoNM = 100
	plausibleHiNM = 100_000
)

// thousandsWarning returns a warning when every one of the rows axis values
// of file was written like "2.500" (grouped counted them) and the spectrum
// then lies outside the optical range: the values are likely thousands
// written with a separator (2.500 for 2500), read as decimals.
func thousandsWarning(file string, grouped, rows int, s *Spectrum) string {
	if rows == 0 || grouped < rows {
		return ""
	}
	lo, hi := s.Range()
	if lo >= plausibleLoNM && hi <= plausibleHiNM {
		return ""
	}
	return fmt.Sprintf("%s: every value of the spectral axis is written like 2.500 (three digits after a point or comma) and the spectrum then spans %.4g–%.4g nm, outside the optical range; if a thousands separator was read as a decimal point, write the numbers without grouping (2500, not 2.500)", file, lo, hi)
}

// thousandsHint returns a hint for a cell that is not a number but is
// grouped by thousands, such as "1,234.5" or "1.234,5".
func thousandsHint(s string) string {
	if !groupedBothRE.MatchString(s) {
		return ""
	}
	return " (thousands separators? write numbers without grouping, with a decimal point or, in a file separated by tabs or semicolons, a decimal comma)"
}

// The wavelengths the figures use, nm: from the ultraviolet end of the
// ASTM G173-03 table (280 nm) to the far end of the default exchange band
// (100 µm). An axis wholly outside them, in its stated unit, reads no
// figure at all.
const (
	bandsLoNM = 280
	bandsHiNM = 100_000
)

// axisUnitWarning returns a warning when the spectral axis of s, read in
// its stated unit u, lies wholly outside the wavelengths the figures use
// but inside them when read in another unit: µm values labelled nm, nm
// values labelled µm, µm values labelled cm⁻¹.
func axisUnitWarning(file string, u axis, s *Spectrum) string {
	lo, hi := s.Range()
	if overlapsBands(lo, hi) {
		return ""
	}
	type reading struct {
		name   string
		lo, hi float64 // nm
	}
	var alt []reading
	switch u {
	case axisNM: // the numbers read as µm
		alt = []reading{{"µm", lo * 1000, hi * 1000}}
	case axisUM: // as nm
		alt = []reading{{"nm", lo / 1000, hi / 1000}}
	case axisWavenumber: // the number x = 1e7/nm read as µm, or as nm
		alt = []reading{{"µm", 1e10 / hi, 1e10 / lo}, {"nm", 1e7 / hi, 1e7 / lo}}
	}
	for _, r := range alt {
		if overlapsBands(r.lo, r.hi) {
			return fmt.Sprintf("%s: the spectral axis is labelled %s and then spans %s–%s nm, outside every band the figures use (280 nm to 100 µm); read as %s it would span %s–%s nm: %s values labelled %s? Check the header of the first column",
				file, axisWords(u), fmtAxis(lo), fmtAxis(hi), r.name, fmtAxis(r.lo), fmtAxis(r.hi), r.name, axisWords(u))
		}
	}
	return ""
}

func overlapsBands(lo, hi float64) bool { return hi >= bandsLoNM && lo <= bandsHiNM }

// fmtAxis writes a wavelength in nm to four significant digits.
func fmtAxis(nm float64) string { return strconv.FormatFloat(nm, 'g', 4, 64) }

// axisWords names the unit as a reader writes it.
func axisWords(u axis) string {
	switch u {
	case axisUM:
		return "µm"
	case axisWavenumber:
		return "cm⁻¹"
	}
	return "nm"
}

// percentFloor is the largest value of a percent column below which the
// column is not suspected of holding fractions: values that all stay
// under 0.1 % read the same, near 0, either way (common practice, no
// source).
const percentFloor = 0.1

// percentWarnings returns a warning for each R, T or A column marked as
// percent whose every value (largest |value| max) is at most 1.05: the
// numbers look like fractions, and read as percent they are a hundred
// times too small.
func percentWarnings(file string, cols []column, max []float64) []string {
	var out []string
	for i, c := range cols {
		if c.q > A || !c.percent || i >= len(max) || max[i] > 1.05 || max[i] < percentFloor {
			continue
		}
		out = append(out, fmt.Sprintf("%s: column %d (%s) is marked as percent but every value is at most 1.05 (largest %g): fractions in a percent column? If so, drop the %% from the header; as it stands the values are read as at most %g %%",
			file, i+2, c.name, max[i], max[i]))
	}
	return out
}

// constUncertaintyWarnings returns a warning for a constant standard
// uncertainty in metadata of 10 % or more: likely a percentage written
// without its %, read as a fraction (0.5 for 0.5 %) (common practice, no
// source).
func constUncertaintyWarnings(file string, consts *[numQuantities]float64) []string {
	var out []string
	for _, q := range []Quantity{UR, UT} {
		if x := consts[q]; !math.IsNaN(x) && x >= 0.1 {
			out = append(out, fmt.Sprintf("%s: the metadata give %s = %g, read as a fraction (%g %%): a percentage without its %%? Write it as %g %%",
				file, q, x, 100*x, x))
		}
	}
	return out
}
