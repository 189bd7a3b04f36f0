package main

import (
	"errors"
	"io/fs"
	"os"
	"sort"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
)

func init() {
	register(&command{
		name:    "review",
		args:    "[DIR]",
		summary: "review a library without rendering it: read every file and judge every claim against the spectra",
		run:     runReview,
	})
}

// reviewReport is the result of "skysheet review", grouped by file. Its JSON
// form is printed by --format json.
type reviewReport struct {
	Library   string           `json:"library"`
	Software  string           `json:"software"`
	Strict    bool             `json:"strict"`
	OK        bool             `json:"ok"`
	Counts    reviewCounts     `json:"counts"`
	Materials []reviewMaterial `json:"materials"`
}

// reviewCounts sums up a report.
type reviewCounts struct {
	Files        int `json:"files"` // Markdown files and the config
	InvalidFiles int `json:"invalid_files"`
	ClosureFails int `json:"closure_failures"`
	datasheet.VerdictCounts
}

// reviewMaterial is what was found in one file: a material, or the config or
// another file that failed to load.
type reviewMaterial struct {
	Path     string                   `json:"path"`
	Slug     string                   `json:"slug,omitempty"`
	Title    string                   `json:"title,omitempty"`
	Errors   []string                 `json:"errors"` // the file is invalid when not empty
	Inputs   []library.Input          `json:"inputs"`
	Closure  *datasheet.ClosureReport `json:"closure,omitempty"`
	Verdicts []datasheet.Verdict      `json:"verdicts"`
	Warnings []string                 `json:"warnings,omitempty"`
}

// failed reports whether the file fails the review.
func (m *reviewMaterial) failed(strict bool) bool {
	if len(m.Errors) > 0 || m.Closure != nil && !m.Closure.OK {
		return true
	}
	for _, v := range m.Verdicts {
		if v.Status == datasheet.NotSupported || strict && v.Status == datasheet.CannotCheck {
			return true
		}
	}
	return false
}

func runReview(e *env, args []string) error {
	fl := newFlags(e, commands["review"])
	format := fl.String("format", "text", "output: text (a report grouped by material), json or junit (JUnit XML)")
	strict := fl.Bool("strict", false, "also fail when a claim cannot be checked")
	maxSize := maxFileSizeFlag(fl)
	pos, err := parseFlags(fl, args)
	if err != nil {
		return err
	}
	write, ok := reviewWriters[*format]
	if !ok {
		return usagef("--format %q: want text, json or junit", *format)
	}
	dir := "."
	switch len(pos) {
	case 0:
	case 1:
		dir = pos[0]
	default:
		return usagef("one library folder at most, got %d arguments", len(pos))
	}
	fsys, closeFS, err := openLibrary(dir, *maxSize)
	if err != nil {
		return err
	}
	defer closeFS()
	lib, err := library.Load(fsys)
	r := reviewLibrary(dir, lib, err, *strict)
	out := e.stdout
	if *format != "text" {
		out = rawWriter(out) // data, not text for a person
	}
	if err := write(out, r); err != nil {
		return err
	}
	if !r.OK {
		return errSilentFailure
	}
	return nil
}

// openLibrary opens dir as a file system that cannot be left, not even by
// a symbolic link. A missing folder is bad usage.
func openLibrary(dir string, maxSize int64) (fs.FS, func(), error) {
	st, err := os.Stat(dir)
	if err != nil || !st.IsDir() {
		return nil, nil, usagef("%s is not a library folder (want a folder holding skysheet.yaml and content/)", dir)
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		return nil, nil, err
	}
	fsys := newInputFS(root, maxSize)
	return fsys, func() { fsys.Close(); root.Close() }, nil
}

// reviewLibrary evaluates every material of lib (see evaluate.Library) and
// files its verdicts and the problems found, load errors included, under
// the file they name.
func reviewLibrary(dir string, lib *library.Library, loadErr error, strict bool) *reviewReport {
	r := &reviewReport{Library: dir, Software: "skysheet " + datasheet.Version(), Strict: strict}
	byPath := map[string]*reviewMaterial{}
	get := func(p string) *reviewMaterial {
		if m, ok := byPath[p]; ok {
			return m
		}
		m := &reviewMaterial{Path: p, Errors: []string{}, Inputs: []library.Input{}, Verdicts: []datasheet.Verdict{}}
		byPath[p] = m
		return m
	}
	get(library.ConfigFile)
	var evalErr error
	if lib != nil {
		if in := lib.Config.Input; in.Path != "" {
			get(library.ConfigFile).Inputs = []library.Input{in}
		}
		for _, c := range lib.Comparisons {
			cm := get(c.Path)
			cm.Slug, cm.Title = c.Slug, c.Front.Title
		}
		var sums []*evaluate.Summary
		sums, evalErr = evaluate.Library(lib, evaluate.Options{}, nil)
		for _, s := range sums {
			cm := get(s.Path)
			cm.Slug, cm.Title, cm.Inputs, cm.Warnings = s.Slug, s.Front.Title, s.Inputs, s.Warnings
			cl := s.Figures.Closure
			cm.Closure = &cl
			cm.Verdicts = s.Verdicts
		}
	}
	for _, err := range splitErrors(library.Join(loadErr, evalErr)) {
		p := ""
		var le *library.Error
		if errors.As(err, &le) {
			p = le.File
		}
		m := get(p)
		m.Errors = append(m.Errors, err.Error())
	}

	for _, m := range byPath {
		r.Materials = append(r.Materials, *m)
	}
	sort.Slice(r.Materials, func(i, j int) bool { return r.Materials[i].Path < r.Materials[j].Path })
	r.OK = true
	for i := range r.Materials {
		m := &r.Materials[i]
		r.Counts.Files++
		if len(m.Errors) > 0 {
			r.Counts.InvalidFiles++
		}
		if m.Closure != nil && !m.Closure.OK {
			r.Counts.ClosureFails++
		}
		r.Counts.Add(m.Verdicts...)
		if m.failed(strict) {
			r.OK = false
		}
	}
	return r
}

// splitErrors returns the single errors inside err.
func splitErrors(err error) []error {
	if err == nil {
		return nil
	}
	if es, ok := err.(library.Errors); ok {
		var out []error
		for _, e := range es {
			out = append(out, splitErrors(e)...)
		}
		return out
	}
	return []error{err}
}
