package spectra

import (
	"fmt"
	"regexp"
)

// Plausibility checks of the neutral reader: data that read without error
// but are likely mislabelled give a warning in [Spectrum.Warnings], not an
// error.

// groupedRE matches a number written like a thousands-grouped integer:
// one to three digits, a point or comma, exactly three digits ("2.500",
// "1,000").
var groupedRE = regexp.MustCompile(`^\d{1,3}[.,]\d{3}$`)

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
