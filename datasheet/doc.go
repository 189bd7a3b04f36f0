// Package datasheet turns a measured [spectra.Spectrum] into figures of merit
// under stated conditions: solar reflectance, transmittance and absorptance,
// thermal and atmospheric-window emittance, and the closure check. [Judge]
// checks a claimed figure against the spectra it rests on.
//
// Figures are fractions. Every figure records its band, weighting and the
// share of the weighting its data cover, so that a reviewer can reproduce it
// from the definitions in the README. The package writes no HTML: pages,
// charts and the site live in sub-packages that consume [Figures].
package datasheet
