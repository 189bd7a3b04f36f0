package library

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"path"
	"runtime"
	"sort"
	"strings"
	"sync"

	"skysheet/datasheet"
	"skysheet/spectra"
)

// ContentDir is the folder, below the library root, that holds the Markdown
// files.
const ContentDir = "content"

// Library is a library folder read by [Load].
type Library struct {
	Config      Config
	Materials   []*Material   // in path order
	Comparisons []*Comparison // in path order
}

// Material is one material file with its spectra and figures.
type Material struct {
	Path       string // the Markdown file, relative to the library root
	Slug       string
	Front      FrontMatter
	Body       []byte // Markdown after the front matter
	BodyLine   int    // file line on which Body starts
	Source     []byte // the whole file
	Spectrum   *spectra.Spectrum
	Conditions datasheet.Conditions // library conditions with the front matter's overrides
	Figures    *datasheet.Figures
	Inputs     []Input // the Markdown file, each spectra file in front matter order, then a sky file if any
}

// Comparison is a page that overlays several materials.
type Comparison struct {
	Path      string
	Slug      string
	Front     FrontMatter // only Title, Slug, Summary and Compare are set
	Body      []byte
	BodyLine  int
	Source    []byte
	Materials []*Material // in the order listed under compare:
}

// Input is a file read to build a page, with its SHA-256 in hex.
type Input struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
}

func hashInput(p string, data []byte) Input {
	sum := sha256.Sum256(data)
	return Input{Path: p, SHA256: hex.EncodeToString(sum[:])}
}

// Material returns the material with the given slug.
func (l *Library) Material(slug string) (*Material, bool) {
	for _, m := range l.Materials {
		if m.Slug == slug {
			return m, true
		}
	}
	return nil, false
}

// Load reads the library rooted at fsys: the config, every Markdown file
// under content/ (any depth; names starting with "." are skipped) and the
// spectra they name, and computes each material's figures. Files are read
// in parallel. Problems of every file are collected: the error, if any, is
// an [Errors] in file order, and the returned library still holds the
// config and every file that could be read.
func Load(fsys fs.FS) (*Library, error) {
	lib := &Library{}
	var errs Errors
	add := func(err error) {
		switch e := err.(type) {
		case nil:
		case Errors:
			errs = append(errs, e...)
		default:
			errs = append(errs, e)
		}
	}
	src, err := fs.ReadFile(fsys, ConfigFile)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			add(errorf(ConfigFile, 0, 0, ErrNoConfig, ""))
		} else {
			add(&Error{File: ConfigFile, Err: err})
		}
		lib.Config, _ = parseConfig(fsys, nil)
		lib.Config.Input = Input{}
	} else {
		lib.Config, err = parseConfig(fsys, src)
		add(err)
	}

	files, err := contentFiles(fsys)
	add(err)
	results := make([]fileResult, len(files))
	var wg sync.WaitGroup
	next := make(chan int)
	for range min(runtime.GOMAXPROCS(0), max(len(files), 1)) {
		wg.Go(func() {
			for i := range next {
				results[i] = readFile(fsys, files[i], lib.Config)
			}
		})
	}
	for i := range files {
		next <- i
	}
	close(next)
	wg.Wait()

	slugs := map[string]string{}
	cmpSlugs := map[string]string{}
	for _, r := range results {
		add(r.err)
		switch {
		case r.m != nil:
			if prev, dup := slugs[r.m.Slug]; dup {
				add(errorf(r.m.Path, r.slugLine, 0, ErrDuplicateSlug, "%q is also the slug of %s", r.m.Slug, prev))
				continue
			}
			slugs[r.m.Slug] = r.m.Path
			lib.Materials = append(lib.Materials, r.m)
		case r.c != nil:
			if prev, dup := cmpSlugs[r.c.Slug]; dup {
				add(errorf(r.c.Path, r.slugLine, 0, ErrDuplicateSlug, "%q is also the slug of comparison %s", r.c.Slug, prev))
				continue
			}
			cmpSlugs[r.c.Slug] = r.c.Path
			lib.Comparisons = append(lib.Comparisons, r.c)
		}
	}
	// Resolve comparisons once all materials are known. A material that
	// failed to load is still a known slug: its own error is reported.
	known := map[string]bool{}
	for _, r := range results {
		if r.slug != "" && !r.isCompare {
			known[r.slug] = true
		}
	}
	for i, r := range results {
		if r.c == nil {
			continue
		}
		for j, s := range r.c.Front.Compare {
			m, ok := lib.Material(strings.TrimSpace(s))
			switch {
			case ok:
				r.c.Materials = append(r.c.Materials, m)
			case !known[strings.TrimSpace(s)]:
				line := results[i].compareLines[j]
				add(errorf(r.c.Path, line, 0, ErrUnknownMaterial, "compare entry %q%s", s, nearestSlug(s, slugs)))
			}
		}
	}
	if len(errs) > 0 {
		return lib, errs
	}
	return lib, nil
}

// nearestSlug suggests a known slug close to s.
func nearestSlug(s string, slugs map[string]string) string {
	keys := make([]string, 0, len(slugs))
	for k := range slugs {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	best, bestD := "", -1
	for _, k := range keys {
		if d := editDistance(s, k); bestD < 0 || d < bestD {
			best, bestD = k, d
		}
	}
	if best == "" {
		return ""
	}
	return fmt.Sprintf(" (nearest slug %q)", best)
}

// contentFiles lists the Markdown files under content/, sorted.
func contentFiles(fsys fs.FS) ([]string, error) {
	var files []string
	err := fs.WalkDir(fsys, ContentDir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if p != ContentDir && strings.HasPrefix(d.Name(), ".") {
			if d.IsDir() {
				return fs.SkipDir
			}
			return nil
		}
		if !d.IsDir() && strings.EqualFold(path.Ext(p), ".md") {
			files = append(files, p)
		}
		return nil
	})
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, errorf(ContentDir, 0, 0, ErrMissing, "no %s/ folder: materials go in %s/*.md", ContentDir, ContentDir)
		}
		return nil, &Error{File: ContentDir, Err: err}
	}
	sort.Strings(files)
	return files, nil
}

// fileResult is what readFile found in one content file.
type fileResult struct {
	m            *Material
	c            *Comparison
	slug         string
	slugLine     int
	compareLines []int
	isCompare    bool
	err          error
}

// readFile reads one content file.
func readFile(fsys fs.FS, file string, cfg Config) fileResult {
	var r fileResult
	src, err := fs.ReadFile(fsys, file)
	if err != nil {
		r.err = &Error{File: file, Err: err}
		return r
	}
	yamlText, body, bodyLine, err := splitFront(file, src)
	if err != nil {
		r.err = err
		return r
	}
	fm, fl, d, err := parseFront(file, yamlText)
	if err != nil {
		// Known by its slug all the same, so that comparisons listing it
		// do not report it missing on top of its own errors.
		r.err, r.isCompare = err, len(fm.Compare) > 0
		if r.slug = fm.Slug; r.slug == "" {
			r.slug = Slugify(strings.TrimSuffix(path.Base(file), path.Ext(file)))
		}
		return r
	}
	var errs Errors
	slugNode := valueNode(fl.root, "slug")
	r.slugLine = slugNode.Line + d.offset
	if fm.Slug == "" {
		r.slug = Slugify(strings.TrimSuffix(path.Base(file), path.Ext(file)))
		r.slugLine = 1
		if r.slug == "" {
			errs = append(errs, errorf(file, 1, 0, ErrBadSlug, "cannot make a slug from the file name: add slug: to the front matter"))
		}
	} else {
		r.slug = fm.Slug
		if Slugify(fm.Slug) != fm.Slug {
			errs = append(errs, d.at(slugNode, ErrBadSlug, "%q: want lower-case letters, digits and single hyphens, e.g. %q", fm.Slug, Slugify(fm.Slug)))
		}
	}
	fm.Slug = r.slug
	if len(fm.Compare) > 0 {
		r.isCompare = true
		c := &Comparison{Path: file, Slug: r.slug, Front: fm, Body: body, BodyLine: bodyLine, Source: src}
		for _, n := range fl.compare {
			r.compareLines = append(r.compareLines, n.Line+d.offset)
		}
		if len(errs) > 0 {
			r.err = errs
			return r
		}
		r.c = c
		return r
	}
	m := &Material{Path: file, Slug: r.slug, Front: fm, Body: body, BodyLine: bodyLine, Source: src,
		Inputs: []Input{hashInput(file, src)}}
	d.fsys = fsys
	var sky *Input
	m.Conditions, sky, err = d.apply(fm.Conditions, cfg.Conditions)
	if err != nil {
		errs = append(errs, err)
	}
	if sky == nil && m.Conditions.Sky.Spectrum != nil {
		sky = cfg.skyInput // the config's sky file
	}
	paths := make([]string, 0, len(fm.Spectra))
	lines := make([]int, 0, len(fm.Spectra))
	for i, ref := range fm.Spectra {
		line := fl.spectra[i].Line + d.offset
		p, err := resolvePath(file, ref.File)
		if err != nil {
			errs = append(errs, &Error{File: file, Line: line, Err: fmt.Errorf("spectra file %q: %w", ref.File, err)})
			continue
		}
		paths, lines = append(paths, p), append(lines, line)
	}
	if len(paths) > 0 {
		s, err := spectra.ReadSample(fsys, paths, spectra.SampleOptions{Resolve: resolvePath})
		for _, e := range splitJoined(err) {
			var fe *spectra.FileError
			line := valueNode(fl.root, "spectra").Line + d.offset
			if errors.As(e, &fe) && fe.Index >= 0 {
				line = lines[fe.Index]
			}
			errs = append(errs, &Error{File: file, Line: line, Err: fmt.Errorf("%w: %w", ErrSpectrum, e)})
		}
		if err == nil && len(errs) == 0 {
			for _, in := range s.Inputs {
				m.Inputs = append(m.Inputs, Input{Path: in.Name, SHA256: in.SHA256})
			}
			if sky != nil {
				m.Inputs = append(m.Inputs, *sky)
			}
			m.Spectrum = s
			m.Figures, err = datasheet.Compute(s, spectra.Resolve(s, m.Conditions.ClosureTol), m.Conditions)
			if err != nil {
				errs = append(errs, &Error{File: file, Err: fmt.Errorf("%w: %w", ErrConditions, err)})
			}
		}
	}
	if len(errs) > 0 {
		r.err = errs
		return r
	}
	r.m = m
	return r
}

// splitJoined returns the errors joined in err by errors.Join, or err
// itself.
func splitJoined(err error) []error {
	if err == nil {
		return nil
	}
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		return j.Unwrap()
	}
	return []error{err}
}

// unwrapPath drops the *fs.PathError wrapper, whose path repeats ours.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// resolvePath returns the library path of ref, written in file. It returns
// ErrPath or ErrEscapes for paths that are malformed or leave the library.
func resolvePath(file, ref string) (string, error) {
	ref = strings.TrimSpace(ref)
	switch {
	case ref == "":
		return "", ErrMissing
	case strings.Contains(ref, `\`):
		return "", fmt.Errorf("%w: use forward slashes", ErrPath)
	case path.IsAbs(ref) || len(ref) >= 2 && ref[1] == ':':
		return "", fmt.Errorf("%w: absolute paths are not allowed; give the path relative to the Markdown file", ErrEscapes)
	}
	p := path.Join(path.Dir(file), ref)
	if p == ".." || strings.HasPrefix(p, "../") {
		return "", ErrEscapes
	}
	if !fs.ValidPath(p) || p == "." {
		return "", ErrPath
	}
	return p, nil
}

// Slugify returns s as a URL path segment: lower-case ASCII letters and
// digits, other runs of characters replaced by one hyphen, no hyphen at
// either end. It returns "" when s has no letter or digit.
func Slugify(s string) string {
	var b strings.Builder
	dash := false
	for _, r := range strings.ToLower(s) {
		if r >= 'a' && r <= 'z' || r >= '0' && r <= '9' {
			if dash && b.Len() > 0 {
				b.WriteByte('-')
			}
			dash = false
			b.WriteRune(r)
			continue
		}
		dash = true
	}
	return b.String()
}
