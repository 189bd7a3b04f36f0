package library

import "skysheet/datasheet"

// Verdicts judges every claim of the material's front matter, in order,
// with [datasheet.JudgeAll] against the material's spectrum, its conditions
// (the library's with its own overrides) and the angle of incidence
// written under measured. Claims on the material's own conditions reuse its
// figures; each other basis is computed once. A malformed claim gets a verdict too ("cannot be
// checked", saying why); it never makes Verdicts fail. The result is never
// nil.
func (m *Material) Verdicts() []datasheet.Verdict {
	in := datasheet.JudgeInput{Spectrum: m.Spectrum, Conditions: m.Conditions, Figures: m.Figures, Angle: m.Front.Measured.Angle}
	return datasheet.JudgeAll(m.Front.Claims, in)
}
