package library

import "skysheet/datasheet"

// Verdicts judges every claim of the material's front matter, in order,
// with [datasheet.Judge] against the material's spectrum, its conditions
// (the library's with its own overrides) and the angle of incidence
// written under measured. A malformed claim gets a verdict too ("cannot be
// checked", saying why); it never makes Verdicts fail. The result is never
// nil.
func (m *Material) Verdicts() []datasheet.Verdict {
	in := datasheet.JudgeInput{Spectrum: m.Spectrum, Conditions: m.Conditions, Angle: m.Front.Measured.Angle}
	out := make([]datasheet.Verdict, 0, len(m.Front.Claims))
	for _, c := range m.Front.Claims {
		out = append(out, datasheet.Judge(c, in))
	}
	return out
}
