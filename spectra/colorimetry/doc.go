// Package colorimetry computes the colour of a sample from its spectral
// reflectance or transmittance: CIE 1931 tristimulus values under
// illuminant D65, chromaticity, CIE 1976 L*a*b*, luminous reflectance, an
// sRGB colour for display, and colour differences.
//
// # Method
//
// [Tristimulus] sums over 380–780 nm at 1 nm (the 1 nm summation of ASTM
// E308) with the CIE 1931 2° colour-matching functions and the CIE D65
// relative spectral power of the embedded tables
// (cie-1931-2deg-d65.csv, provenance in cie-1931-2deg-d65.md), normalised
// so that a perfect reflector has Y = 100. The same tables give the white
// point ([White]) used for L*a*b*, so that a perfect reflector is exactly
// L* = 100, a* = b* = 0.
//
// # Units and conventions
//
// Wavelengths are in nm; reflectance and transmittance are fractions, as in
// package spectra. X, Y, Z are on the scale Y = 100 for a perfect reflector
// or transmitter; [XYZ.Luminous] is Y/100, a fraction. L* runs from 0
// (black) to 100 (the white). sRGB values are in [0, 1].
//
// # Coverage
//
// The data must cover 380–780 nm in one piece of the [spectra.Series];
// otherwise there is no colour and [Tristimulus] returns an error wrapping
// [ErrNotCovered] that names the missing parts. Nothing is extrapolated.
//
// # Display
//
// [XYZ.SRGB] converts to sRGB by IEC 61966-2-1 and clips channels that
// fall outside [0, 1], reporting which and by how much: a screen shows
// such a colour only approximately.
//
// # Colour differences
//
// [DeltaE76] is the CIE 1976 ΔE*ab; [DeltaE2000] is CIEDE2000, checked
// against the 34 test pairs of Sharma, Wu and Dalal (2005).
package colorimetry
