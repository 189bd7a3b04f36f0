// Package datasheet turns a measured [spectra.Spectrum] into figures of merit
// under stated conditions: solar reflectance, transmittance and absorptance,
// thermal and atmospheric-window emittance, the closure check, and the
// cooling figures under a stated sky — net cooling power by day and by night,
// the equilibrium temperature below ambient, the Solar Reflectance Index of
// ASTM E1980 — with their standard uncertainties when the data give those of
// R and T. judgeOne checks a claimed figure against the spectra it rests on.
//
// Band figures are fractions; cooling powers are in W/m² and temperatures in
// kelvin. Every figure records its band, weighting (for the cooling figures:
// the sky, air, h and sun) and the share of the weighting its data cover, so
// that a reviewer can reproduce it from the definitions in the README and in
// docs/cooling.md.
//
// Two tables hold what the rest of the program asks about: the conditions
// ([Conditions.List], [Conditions.Set]: keys, labels and units, bands in
// nm inside the program) and the kinds of figures ([Figure.Kind]: how a
// figure's number reads and is written, and which conditions it rests
// on). The package writes no HTML and reads no files: package
// datasheet/evaluate applies it to a library's materials, and the site
// renders the result.
package datasheet
