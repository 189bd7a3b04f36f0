// Package spectra reads, checks and integrates measured optical spectra:
// the data model ([Spectrum], [Series]), the readers of the neutral column
// format and JCAMP-DX ([Decode], and [ReadSample] for the files of one
// sample with their reference standards and splices), [Write], the
// resolution of R, T and A with the closure check ([Resolve]) and
// band-weighted means under the embedded solar spectra and Planck's law
// ([BandMean]). It knows nothing of figures of merit, pages or libraries.
//
// # Units and conventions
//
// Wavelengths are held in nanometres, strictly increasing. Reflectance (R),
// transmittance (T) and absorptance (A) are fractions, never percent; readers
// convert percent and wavenumbers at the edge. Standard uncertainties of R and
// T are absolute fractions.
//
// A [Spectrum] is one sample, possibly read from several files. Its data are
// split into segments: within a segment a quantity is linear between its own
// points; between segments nothing is assumed, so a gap between two files
// lowers the coverage of a band instead of being bridged.
//
// # Weighted means
//
// [BandMean] computes F = ∫ x w dλ / ∫ w dλ over the part of a band that the
// data cover, with x and w each linear between their own points, evaluated on
// the union of both grids by the trapezoid rule. Coverage is ∫ w over the
// covered part divided by ∫ w over the whole band. Weightings are the embedded
// ASTM G173-03 tables ([SolarGlobal], [SolarDirect]) and the Planck spectral
// radiance ([Blackbody]).
//
// # Errors
//
// Readers never panic on bad input: they return a *[ParseError] naming the
// file, line and column. Functions on a valid [Spectrum] may panic when a
// documented invariant is broken by the caller (a bug, not bad data).
package spectra
