package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"runtime"
	"sort"
	"sync"

	"skysheet/datasheet"
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
	return newInputFS(root, maxSize), func() { root.Close() }, nil
}

// reviewLibrary judges every claim of lib and files the load errors under
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
	if lib != nil {
		if in := lib.Config.Input; in.Path != "" {
			get(library.ConfigFile).Inputs = []library.Input{in}
		}
		for _, c := range lib.Comparisons {
			cm := get(c.Path)
			cm.Slug, cm.Title = c.Slug, c.Front.Title
		}
		judged := judgeAll(lib.Materials, runtime.GOMAXPROCS(0))
		for i, mat := range lib.Materials {
			cm := get(mat.Path)
			cm.Slug, cm.Title, cm.Inputs = mat.Slug, mat.Front.Title, mat.Inputs
			if mat.Figures != nil {
				cl := mat.Figures.Closure
				cm.Closure = &cl
			}
			for i, c := range mat.Front.Claims {
				if err := c.Validate(); err != nil {
					cm.Errors = append(cm.Errors, fmt.Sprintf("%s: claim %d: %v", mat.Path, i+1, err))
				}
			}
			cm.Verdicts = judged[i]
		}
	}
	for _, err := range splitErrors(loadErr) {
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

// judgeAll judges the claims of every material with at most workers
// materials at a time. The verdicts are in the order of ms, whatever the
// number of workers.
func judgeAll(ms []*library.Material, workers int) [][]datasheet.Verdict {
	out := make([][]datasheet.Verdict, len(ms))
	next := make(chan int)
	var wg sync.WaitGroup
	for range max(1, min(workers, len(ms))) {
		wg.Go(func() {
			for i := range next {
				out[i] = ms[i].Verdicts()
			}
		})
	}
	for i := range ms {
		next <- i
	}
	close(next)
	wg.Wait()
	return out
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
