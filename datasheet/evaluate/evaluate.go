package evaluate

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strconv"
	"sync"

	"skysheet/datasheet"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// Summary is what is kept of an evaluated material once its page is
// written: enough for the index, the listings, catalog.json and the
// review. It holds no spectra.
type Summary struct {
	*library.Material
	Figures  *datasheet.Figures
	Verdicts []datasheet.Verdict // one per claim, in front matter order; never nil
	// Inputs are every file the material rests on, with its SHA-256: the
	// Markdown file, the spectrum files and reference standards in the
	// order read, then a spectral sky file.
	Inputs []library.Input
	// Worn holds, for each comparison page (by slug) that lists the
	// material and names a reference, its figures as a textile: UV
	// through it and, when the page names a skin, the heat reaching the
	// skin beneath. Nil when there is none.
	Worn map[string]*Worn
	// Warnings are sentences about the data that a reader should notice
	// but that do not stop the page: the readers' plausibility warnings,
	// then each splice whose mismatch exceeds its tolerance.
	Warnings []string
}

// Material is everything evaluated for one material: its summary, and the
// sample and optics that its page draws.
type Material struct {
	Summary
	Sample *spectra.Spectrum // the joined spectrum of its files
	Optics spectra.Optics    // R, T and A of Sample, resolved once
	// Solar and Thermal are the weightings of the solar and thermal
	// figures under the material's conditions, for charts to shade.
	Solar, Thermal spectra.Weighting
}

// Options control an evaluation.
type Options struct {
	// Workers is the number of materials evaluated at once; 0 means
	// runtime.GOMAXPROCS(0).
	Workers int
	// Progress, if set, is called after each material with the number
	// done and the total, from one goroutine at a time.
	Progress func(done, total int)
	// Reuse, if set, is called for each material, from a worker, before
	// it is evaluated. When it returns a summary (one kept from an earlier
	// evaluation of the same inputs), that summary is the material's: it
	// is neither evaluated nor given to each. When it returns an error,
	// that is the material's error.
	Reuse func(*library.Material) (*Summary, error)
}

// Library evaluates every material of lib, Workers at a time. When each is
// not nil it is called with every evaluated material, from the worker
// that evaluated it, as soon as it is done; calls may run at the same
// time. Only the material's Summary is kept afterwards (of figures over a
// weather series, only the totals and months).
//
// It returns the summaries of the materials that were evaluated (and
// whose callback succeeded), in library order. The error, if any, is a
// [library.Errors] with the problems of every other material, in library
// order.
func Library(lib *library.Library, opt Options, each func(*Material) error) ([]*Summary, error) {
	wear := wearing(lib)
	n := len(lib.Materials)
	sums := make([]*Summary, n)
	errs := make([]error, n)
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	next := make(chan int)
	done := make(chan struct{})
	var wg sync.WaitGroup
	for range min(workers, max(n, 1)) {
		wg.Go(func() {
			for i := range next {
				sums[i], errs[i] = evaluateOne(lib, lib.Materials[i], wear, opt.Reuse, each)
				done <- struct{}{}
			}
		})
	}
	go func() {
		for i := range n {
			next <- i
		}
		close(next)
		wg.Wait()
		close(done)
	}()
	k := 0
	for range done {
		k++
		if opt.Progress != nil {
			opt.Progress(k, n)
		}
	}
	var out []*Summary
	var all library.Errors
	for i := range n {
		if sums[i] != nil {
			out = append(out, sums[i])
		}
		all = appendErrors(all, errs[i])
	}
	if len(all) > 0 {
		return out, all
	}
	return out, nil
}

// evaluateOne returns what Library keeps of lm: a summary that reuse
// gives, else lm evaluated and passed to each.
func evaluateOne(lib *library.Library, lm *library.Material, wear *wearPlan, reuse func(*library.Material) (*Summary, error), each func(*Material) error) (*Summary, error) {
	if reuse != nil {
		if s, err := reuse(lm); s != nil || err != nil {
			return s, err
		}
	}
	m, err := evaluate(lib, lm)
	if err != nil {
		return nil, err
	}
	m.Worn = wear.of(m)
	if each != nil {
		if err := each(m); err != nil {
			return nil, err
		}
	}
	return m.Kept(), nil
}

// Kept returns what [Library] keeps of m once its callback has returned:
// a copy of its Summary (m and its spectra can go) holding, of figures
// over a weather series, only the totals and months.
func (m *Material) Kept() *Summary {
	s := m.Summary
	if f := s.Figures; f != nil && f.Weather != nil {
		g := *f
		g.Weather = f.Weather.Totals()
		s.Figures = &g
	}
	return &s
}

// All evaluates every material of lib as [Library] does and returns the
// whole results, in library order: for tests and small libraries.
func All(lib *library.Library, opt Options) ([]*Material, error) {
	out := make([]*Material, len(lib.Materials))
	index := make(map[*library.Material]int, len(lib.Materials))
	for i, m := range lib.Materials {
		index[m] = i
	}
	_, err := Library(lib, opt, func(m *Material) error {
		out[index[m.Material]] = m
		return nil
	})
	kept := out[:0]
	for _, m := range out {
		if m != nil {
			kept = append(kept, m)
		}
	}
	return kept, err
}

// Sample evaluates one sample under conditions c, outside a library: its
// optics and figures, and a verdict for each of claims (judged as a
// library's are, on the basis each states, else on c). Its inputs are those
// of s.
func Sample(s *spectra.Spectrum, c datasheet.Conditions, claims ...datasheet.Claim) (*Material, error) {
	o := spectra.Resolve(s, c.ClosureTol)
	f, err := datasheet.Compute(s, o, c)
	if err != nil {
		return nil, err
	}
	m := &Material{Sample: s, Optics: o}
	m.Solar, m.Thermal = c.Weightings()
	m.Figures, m.Warnings = f, append(slices.Clip(s.Warnings), warnings(f)...)
	m.Verdicts = datasheet.JudgeAll(claims, datasheet.JudgeInput{Spectrum: s, Optics: &o, Conditions: c, Figures: f})
	for _, in := range s.Inputs {
		m.Inputs = append(m.Inputs, library.Input{Path: in.Name, SHA256: in.SHA256})
	}
	return m, nil
}

// Stack evaluates layers stacked top first under conditions c, outside a
// library, as [datasheet.ComputeStack] computes them: the stack's optics
// and figures, as for a measured sample. Its inputs are the layers'.
func Stack(layers []datasheet.Layer, c datasheet.Conditions) (*Material, error) {
	st, err := datasheet.ComputeStack(layers, c)
	if err != nil {
		return nil, err
	}
	m := &Material{Sample: st.Sample, Optics: st.Optics.Optics}
	m.Solar, m.Thermal = c.Weightings()
	m.Figures, m.Verdicts, m.Warnings = st.Figures, []datasheet.Verdict{}, warnings(st.Figures)
	for _, in := range st.Sample.Inputs {
		m.Inputs = append(m.Inputs, library.Input{Path: in.Name, SHA256: in.SHA256})
	}
	return m, nil
}

// evaluate reads, computes and judges one material.
func evaluate(lib *library.Library, lm *library.Material) (*Material, error) {
	if lm.Stack != nil {
		return evaluateStack(lib, lm)
	}
	s, inputs, err := lib.ReadSample(lm)
	if err != nil {
		return nil, err
	}
	c := lm.Conditions
	if b := lm.Front.Measured.Emittance; b != spectra.EmittanceUnstated {
		for i := range s.Measurements {
			if m := &s.Measurements[i]; m.Emittance == spectra.EmittanceUnstated {
				m.Emittance, m.EmittanceFrom = b, lm.Path
			}
		}
	}
	o := spectra.Resolve(s, c.ClosureTol)
	f, err := datasheet.Compute(s, o, c)
	if err != nil {
		return nil, &library.Error{File: lm.Path, Err: fmt.Errorf("%w: %w", library.ErrConditions, err)}
	}
	m := &Material{Summary: Summary{Material: lm, Figures: f, Inputs: inputs, Warnings: append(slices.Clip(s.Warnings), warnings(f)...)}, Sample: s, Optics: o}
	m.Solar, m.Thermal = c.Weightings()
	m.Verdicts = datasheet.JudgeAll(lm.Front.Claims, datasheet.JudgeInput{Spectrum: s, Optics: &o, Conditions: c,
		Figures: f, Angle: lm.Front.Measured.Angle})
	return m, nil
}

// evaluateStack reads a stack's layers and computes and judges the stack.
func evaluateStack(lib *library.Library, lm *library.Material) (*Material, error) {
	samples, inputs, err := lib.ReadLayers(lm)
	if err != nil {
		return nil, err
	}
	layers := make([]datasheet.Layer, len(lm.Stack))
	for i, l := range lm.Stack {
		layers[i] = datasheet.Layer{Name: l.Name, Sample: samples[i], Conductor: l.Conductor}
		if l.Material != nil {
			layers[i].Slug = l.Material.Slug
		}
	}
	c := lm.Conditions
	st, err := datasheet.ComputeStack(layers, c)
	if err != nil {
		return nil, &library.Error{File: lm.Path, Err: fmt.Errorf("%w: %w", library.ErrConditions, err)}
	}
	f := st.Figures
	var warn []string
	for _, s := range samples {
		warn = append(warn, s.Warnings...)
	}
	m := &Material{Summary: Summary{Material: lm, Figures: f, Inputs: inputs, Warnings: append(warn, warnings(f)...)}, Sample: st.Sample, Optics: st.Optics.Optics}
	m.Solar, m.Thermal = c.Weightings()
	m.Verdicts = datasheet.JudgeAll(lm.Front.Claims, datasheet.JudgeInput{Spectrum: st.Sample, Optics: &m.Optics, Conditions: f.Conditions,
		Figures: f, Angle: lm.Front.Measured.Angle})
	return m, nil
}

// warnings returns the warnings about the data behind figures f; the
// readers' own warnings are the sample's.
func warnings(f *datasheet.Figures) []string {
	var out []string
	for _, r := range f.Splices {
		if r.Flagged {
			out = append(out, fmt.Sprintf("The splice of %s at %s nm leaves a mean mismatch of %.4f before correction, above %g.",
				r.Quantity, fmtNM(r.JunctionNM), r.MismatchMean, r.Tolerance))
		}
	}
	return out
}

// appendErrors appends err, or the errors in it when it is a
// library.Errors, to es.
func appendErrors(es library.Errors, err error) library.Errors {
	var le library.Errors
	switch {
	case err == nil:
		return es
	case errors.As(err, &le):
		return append(es, le...)
	}
	return append(es, err)
}

// fmtNM writes a wavelength to 0.01 nm.
func fmtNM(nm float64) string { return strconv.FormatFloat(math.Round(nm*100)/100, 'f', -1, 64) }
