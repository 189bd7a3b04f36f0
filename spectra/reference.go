package spectra

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strings"
)

// Metadata keys of the reference-standard correction.
const (
	// ReferenceKey names, in a spectrum's metadata, the neutral-format file
	// holding the calibrated absolute reflectance of the reference standard
	// its reflectance was measured against ("reference_file" or
	// "reference file"). Readers of the CLI resolve it relative to the data
	// file.
	ReferenceKey = "reference_file"
	// referenceAppliedKey marks a spectrum already made absolute; its value
	// names the reference used.
	referenceAppliedKey = "reference_applied"
)

// The errors [ApplyReference] may return.
var (
	errReferenceRange   = errors.New("lies outside the reference's calibrated range (no extrapolation)")
	errReferenceApplied = errors.New("is already corrected against a reference standard")
	errNoReflectance    = errors.New("has no reflectance")
)

// referenceFile returns the reference file named in s's metadata under
// [ReferenceKey], and whether there is one.
func referenceFile(s *Spectrum) (string, bool) {
	v, ok := s.Get(ReferenceKey)
	v = strings.TrimSpace(v)
	return v, ok && v != ""
}

// ApplyReference returns s with its reflectance, measured relative to a
// reference standard, made absolute: R_abs(λ) = R_rel(λ) × R_ref(λ), where
// R_ref is ref's reflectance, linear between its points. A wavelength of s
// where ref has no reflectance is an error wrapping [ErrReferenceRange]:
// nothing is extrapolated. Where s has u_R the uncertainty becomes
// u_abs = √((R_ref·u_rel)² + (R_rel·u_ref)²), u_ref being ref's u_R (0 if
// absent), as for a product of uncorrelated quantities. T and A are left
// alone.
//
// The result drops [ReferenceKey] from the metadata and records the
// reference instead: "reference_applied" with its file, every metadata
// field of ref prefixed "reference ", and a note. A spectrum already marked
// as corrected is an error wrapping errReferenceApplied.
func ApplyReference(s, ref *Spectrum) (*Spectrum, error) {
	name, refName := sourceName(s), sourceName(ref)
	if v, done := s.Get(referenceAppliedKey); done {
		return nil, fmt.Errorf("spectra: %s %w (%s)", name, errReferenceApplied, v)
	}
	if !s.Has(R) {
		return nil, fmt.Errorf("spectra: %s %w to correct against a reference", name, errNoReflectance)
	}
	rr, ur := ref.Series(R), ref.Series(UR)
	if rr.Empty() {
		return nil, fmt.Errorf("spectra: reference %s %w", refName, errNoReflectance)
	}
	var ranges []string
	for _, p := range rr.Pieces {
		ranges = append(ranges, fmtNM(p.NM[0])+"–"+fmtNM(p.NM[len(p.NM)-1])+" nm")
	}
	out := s.clone()
	for _, g := range out.Segments {
		r, u := g.Values[R], g.Values[UR]
		for i, v := range r {
			if math.IsNaN(v) {
				continue
			}
			k, ok := rr.At(g.NM[i])
			if !ok {
				return nil, fmt.Errorf("spectra: %s: %s nm %w %s (%s)", name, fmtNM(g.NM[i]), errReferenceRange, refName, strings.Join(ranges, ", "))
			}
			r[i] = v * k
			if u != nil && !math.IsNaN(u[i]) {
				uref, ok := ur.At(g.NM[i])
				if !ok {
					uref = 0
				}
				u[i] = math.Hypot(k*u[i], v*uref)
			}
		}
	}
	out.Meta = out.Meta[:0]
	for _, f := range s.Meta {
		if normKey(f.Key) != ReferenceKey {
			out.Meta = append(out.Meta, f)
		}
	}
	out.Meta = append(out.Meta, Field{Key: referenceAppliedKey, Value: refName})
	for _, f := range ref.Meta {
		k := "reference " + f.Key
		if len(strings.Fields(k)) > 4 {
			k = "reference_" + f.Key
		}
		out.Meta = append(out.Meta, Field{Key: k, Value: f.Value})
	}
	note := fmt.Sprintf("Reflectance of %s was measured relative to a reference standard and made absolute as R = R_rel × R_ref, with the reference's calibrated reflectance from %s (%s)",
		name, refName, strings.Join(ranges, ", "))
	if s.Has(UR) {
		if ur.Empty() {
			note += "; u_R scaled by R_ref (the reference gives no uncertainty)."
		} else {
			note += "; u_R combines the measurement's and the reference's uncertainties (uncorrelated)."
		}
	} else {
		note += "."
	}
	out.Notes = append(out.Notes, note)
	return out, nil
}

// relativeRE matches metadata saying that reflectance was measured against
// a reference standard rather than absolutely: "relative to reference
// standard RS-0", "relative to a white standard", "relative reflectance".
var relativeRE = regexp.MustCompile(`(?i)\brelative\s+(to\s+(an?\s+|the\s+)?([\w-]+\s+)?(reference|standard)|reflectance)\b`)

// ReferenceWarning returns a warning, one sentence naming file, when the
// metadata of s say its reflectance was measured relative to a reference
// standard ("relative to reference standard RS-0" in a JCAMP-DX sampling
// procedure, say) but s names no reference file and was not corrected
// against one: its R is then relative, not absolute, and figures computed
// from it are off by the standard's own reflectance. It returns "" when
// s has no reflectance, names a reference or was corrected.
func ReferenceWarning(s *Spectrum, file string) string {
	if !s.Has(R) {
		return ""
	}
	if _, ok := referenceFile(s); ok {
		return ""
	}
	if _, done := s.Get(referenceAppliedKey); done {
		return ""
	}
	for _, f := range s.Meta {
		if strings.HasPrefix(normKey(f.Key), "reference") {
			continue // a reference's own metadata
		}
		if m := relativeRE.FindString(f.Value); m != "" {
			return fmt.Sprintf("%s: its %s says %q but no reference standard is applied, so R is relative, not absolute; give the standard's calibrated reflectance with --reference FILE or reference_file in the data file",
				file, f.Key, m)
		}
	}
	return ""
}
