package library

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path"
	"runtime"
	"slices"
	"sort"
	"strings"
	"sync"
	"time"

	"skysheet/datasheet"
	"skysheet/spectra"
	"skysheet/spectra/msg"
)

// ContentDir is the folder, below the library root, that holds the Markdown
// files.
const ContentDir = "content"

// Library is a library folder read by [Load].
type Library struct {
	Config      Config
	Materials   []*Material   // in path order
	Comparisons []*Comparison // in path order

	fsys   fs.FS     // the library folder, for ReadSample
	loaded time.Time // when Load began reading it, for Stamps
	// seen holds what Load learnt of the spectrum files it checked, by
	// path (an fs.FileInfo): their stamps need not look again.
	seen *sync.Map
}

// Material is one material file: its front matter, body and conditions,
// and where its spectrum files are. Its spectra are read by
// [Library.ReadSample].
type Material struct {
	Path  string // the Markdown file, relative to the library root
	Slug  string
	Front FrontMatter
	// Body is the Markdown after the front matter and Source the whole
	// file; both nil when the load took the file from its FrontCache
	// without reading it (see Text).
	Body       []byte
	BodyLine   int // file line on which Body starts
	Source     []byte
	Conditions datasheet.Conditions // library conditions with the front matter's overrides
	Input      Input                // the Markdown file and its SHA-256
	// Stack holds the layers, top first, of a material declared as a stack
	// (its figures are computed from theirs); nil for a measured material.
	Stack []*Layer

	spectra     []spectrumFile // the spectra entries, in front matter order
	spectraLine int            // file line of the "spectra:" key
	files       condFiles      // the sky and weather files of the conditions, if any
	fsys        fs.FS          // to read Source and Body when the load did not (see Text)
}

// Text returns the Markdown file's whole text and its body after the
// front matter: Source and Body, or, when the load did not read the file
// (see FrontCache), the file read now, which must be the one loaded (its
// SHA-256 that of Input).
func (m *Material) Text() (source, body []byte, err error) {
	if m.Source != nil || m.fsys == nil {
		return m.Source, m.Body, nil
	}
	src, err := fs.ReadFile(m.fsys, m.Path)
	if err != nil {
		return nil, nil, &Error{File: m.Path, Err: err}
	}
	if hashInput(m.Path, src) != m.Input {
		return nil, nil, &Error{File: m.Path, Err: errors.New("changed while the library was being used: load it again")}
	}
	_, body, _, err = splitFront(m.Path, src)
	if err != nil {
		return nil, nil, err
	}
	return src, body, nil
}

// spectrumFile is a spectra entry: the file's path in the library and
// where the front matter names it.
type spectrumFile struct {
	path         string
	line, column int
}

// Layer is one layer of a stack: a measured material of the library or
// spectra files of its own.
type Layer struct {
	Material *Material // the material the layer names; nil for a layer with its own spectra
	Name     string    // the material's title, or the layer's own name
	// Conductor is the layer's thickness and thermal conductivity, when
	// given: heat crosses it by conduction.
	Conductor *datasheet.Conductor

	slug         string         // as written under material:
	spectra      []spectrumFile // a layer's own spectra
	line, column int            // where the layer starts in the front matter
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
	// Reference is the material the others are compared with, one of
	// Materials; nil when the page names none.
	Reference *Material
	// Skin is the skin-like surface the materials are worn over, with a
	// reference; nil when the page names none.
	Skin *Material

	skinLine int
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

// Unchanged reports whether every file of inputs still holds what its
// SHA-256 records; when one does not (or cannot be read), it returns false
// and that file's path. A file whose stamp is still stamps[i] (when given
// and not zero, see [Library.Stamps]) is taken as unchanged without being
// read again.
func (l *Library) Unchanged(inputs []Input, stamps []Stamp) (bool, string) {
	h := sha256.New()
	for i, in := range inputs {
		if i < len(stamps) && stamps[i] != (Stamp{}) {
			if st, ok := l.stamp(in.Path); ok && st == stamps[i] {
				continue
			}
		}
		f, err := l.fsys.Open(in.Path)
		if err != nil {
			return false, in.Path
		}
		h.Reset()
		_, err = io.Copy(h, f)
		f.Close()
		if err != nil || hex.EncodeToString(h.Sum(nil)) != in.SHA256 {
			return false, in.Path
		}
	}
	return true, ""
}

// A Stamp is what the file system tells of a file without reading it: the
// device and inode, the size, and the times of the last change of its
// bytes and of its inode (the change time, which any write, rename or
// change of times moves to the present and no program can set). A file
// whose stamp is what it was when its SHA-256 was taken still holds those
// bytes, barring a clock set back.
type Stamp struct {
	Dev, Ino              uint64
	Size, ModTime, Change int64 // bytes; nanoseconds since 1970
}

// stampMargin is how long before Load began a file must have last changed
// to be stamped: a change within the file system's time resolution of
// the last one would not move the change time (common practice, no
// source: the coarsest change time of common file systems is 1 s, twice
// that kept for safety).
const stampMargin = 2 * time.Second

// Stamps returns the stamps of the files of inputs, which were read (and
// their SHA-256 taken) after Load began, for [Library.Unchanged] to trust
// later instead of reading the files again. A stamp is zero where the file
// system gives none (no change time, as on Windows) or where the file
// changed less than stampMargin before Load began, since the bytes read
// might then not be those its stamp vouches for.
func (l *Library) Stamps(inputs []Input) []Stamp {
	out := make([]Stamp, len(inputs))
	limit := l.loaded.Add(-stampMargin).UnixNano()
	for i, in := range inputs {
		if st, ok := l.stamp(in.Path); ok && !l.loaded.IsZero() && st.Change < limit {
			out[i] = st
		}
	}
	return out
}

// StampOf returns the stamp of the regular file fi as it is at time now,
// and false when there is none: where the file system gives none, or where
// the file changed less than stampMargin before now (its bytes read now
// might not be those the stamp vouches for). Take it before reading the
// file: a later change then moves the stamp.
func StampOf(fi fs.FileInfo, now time.Time) (Stamp, bool) {
	if !fi.Mode().IsRegular() {
		return Stamp{}, false
	}
	st, ok := sysStamp(fi)
	if !ok || st.Change >= now.Add(-stampMargin).UnixNano() {
		return Stamp{}, false
	}
	return st, true
}

// stamp returns the stamp of the regular file p, and false when there is
// none. For a spectrum file it is what the file was when Load checked it:
// a change since then moves its change time, so that the stamp, recorded
// or compared, vouches for no bytes the file held later.
func (l *Library) stamp(p string) (Stamp, bool) {
	var fi fs.FileInfo
	if v, ok := l.seenInfo(p); ok {
		fi = v
	} else {
		var err error
		if fi, err = fs.Stat(l.fsys, p); err != nil {
			return Stamp{}, false
		}
	}
	if !fi.Mode().IsRegular() {
		return Stamp{}, false
	}
	return sysStamp(fi)
}

// seenInfo returns what Load learnt of file p, if anything.
func (l *Library) seenInfo(p string) (fs.FileInfo, bool) {
	if l.seen == nil {
		return nil, false
	}
	v, ok := l.seen.Load(p)
	if !ok {
		return nil, false
	}
	return v.(fs.FileInfo), true
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
func Load(fsys fs.FS) (*Library, error) { return LoadWith(fsys, nil) }

// LoadWith is [Load] taking the front matter that fc holds instead of
// parsing it again, and adding to fc what it parses. A nil fc is none.
func LoadWith(fsys fs.FS, fc *FrontCache) (*Library, error) {
	fc.begin()
	lib := &Library{fsys: fsys, loaded: time.Now(), seen: new(sync.Map)}
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

	files, listed, err := contentFiles(fsys)
	add(err)
	base := doc{offset: 1, fsys: fsys, seen: lib.seen, listed: listed, loaded: lib.loaded} // each file's, but for its name
	results := make([]fileResult, len(files))
	var wg sync.WaitGroup
	next := make(chan int)
	for range min(runtime.GOMAXPROCS(0), max(len(files), 1)) {
		wg.Go(func() {
			for i := range next {
				results[i] = readFile(base, files[i], lib.Config, fc)
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
				add(errorf(r.m.Path, r.slugLine, 0, ErrDuplicateSlug, "%s is also the slug of %s", msg.Quote(r.m.Slug), prev))
				continue
			}
			slugs[r.m.Slug] = r.m.Path
			lib.Materials = append(lib.Materials, r.m)
		case r.c != nil:
			if prev, dup := cmpSlugs[r.c.Slug]; dup {
				add(errorf(r.c.Path, r.slugLine, 0, ErrDuplicateSlug, "%s is also the slug of comparison %s", msg.Quote(r.c.Slug), prev))
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
	// Stacks: each material layer must name a measured material. A stack
	// whose layer failed to load is left out; the layer's own error is
	// reported.
	lib.Materials = slices.DeleteFunc(lib.Materials, func(m *Material) bool {
		bad := false
		for i, l := range m.Stack {
			if l.slug == "" {
				continue
			}
			lm, ok := lib.Material(l.slug)
			switch {
			case l.slug == m.Slug:
				add(errorf(m.Path, l.line, l.column, ErrNotAllowed, "stack layer %d names the stack itself", i+1))
			case ok && lm.Stack != nil:
				add(errorf(m.Path, l.line, l.column, ErrNotAllowed, "stack layer %d names %s, itself a stack: name its layers instead", i+1, msg.Quote(l.slug)))
			case ok:
				l.Material, l.Name = lm, lm.Front.Title
				continue
			case !known[l.slug]:
				add(errorf(m.Path, l.line, l.column, ErrUnknownMaterial, "stack layer %d: material %s%s", i+1, msg.Quote(l.slug), nearestSlug(l.slug, slugs)))
			}
			bad = true
		}
		return bad
	})
	// A comparison missing any of its materials is left out, as a material
	// with an error is.
	resolved := lib.Comparisons[:0]
	for _, c := range lib.Comparisons {
		for _, s := range c.Front.Compare {
			m, ok := lib.Material(strings.TrimSpace(s))
			if ok {
				c.Materials = append(c.Materials, m)
			}
		}
		if len(c.Materials) == len(c.Front.Compare) {
			if r := strings.TrimSpace(c.Front.Reference); r != "" {
				c.Reference, _ = lib.Material(r)
			}
			if sk := strings.TrimSpace(c.Front.Skin); sk != "" {
				var ok bool
				if c.Skin, ok = lib.Material(sk); !ok {
					if !known[sk] {
						add(errorf(c.Path, c.skinLine, 0, ErrUnknownMaterial, "skin %s%s", msg.Quote(sk), nearestSlug(sk, slugs)))
					}
					continue
				}
			}
			resolved = append(resolved, c)
		}
	}
	lib.Comparisons = resolved
	for i, r := range results {
		if r.c == nil {
			continue
		}
		for j, s := range r.c.Front.Compare {
			if _, ok := lib.Material(strings.TrimSpace(s)); !ok && !known[strings.TrimSpace(s)] {
				line := results[i].compareLines[j]
				add(errorf(r.c.Path, line, 0, ErrUnknownMaterial, "compare entry %s%s", msg.Quote(s), nearestSlug(s, slugs)))
			}
		}
	}
	if len(errs) > 0 {
		return lib, errs
	}
	return lib, nil
}

// ReadSample reads the spectrum files of material m with
// [spectra.ReadSample] (reference standards must lie in the library too)
// and returns the joined sample and every file m rests on, each with its
// SHA-256: the Markdown file, the spectrum files and reference standards
// in the order read, then the spectral sky file of its conditions, if any.
// A problem is an [Errors] naming the front-matter entry of the file at
// fault (or the spectra: key when the files cannot be joined).
func (l *Library) ReadSample(m *Material) (*spectra.Spectrum, []Input, error) {
	s, err := l.read(m.Path, m.spectra, m.spectraLine, 0)
	if err != nil {
		return nil, nil, err
	}
	return s, m.inputs(s), nil
}

// ReadLayers reads the spectra of every layer of the stack m, top first,
// as [Library.ReadSample] reads a material's: a material layer's files as
// its own front matter names them, a layer's own files as the stack's
// names them. The inputs are the stack's Markdown file, every layer's
// files in order, then the spectral sky file of m's conditions, if any.
// A problem is an [Errors] naming the entry at fault.
func (l *Library) ReadLayers(m *Material) ([]*spectra.Spectrum, []Input, error) {
	out := make([]*spectra.Spectrum, len(m.Stack))
	all := &spectra.Spectrum{}
	for i, ly := range m.Stack {
		var err error
		if ly.Material != nil {
			out[i], err = l.read(ly.Material.Path, ly.Material.spectra, ly.Material.spectraLine, 0)
		} else {
			out[i], err = l.read(m.Path, ly.spectra, ly.line, ly.column)
		}
		if err != nil {
			return nil, nil, err
		}
		all.Inputs = append(all.Inputs, out[i].Inputs...)
	}
	return out, m.inputs(all), nil
}

// read reads the spectrum files fs named in file, whose spectra key is at
// line:col.
func (l *Library) read(file string, files []spectrumFile, line, col int) (*spectra.Spectrum, error) {
	paths := make([]string, len(files))
	for i, f := range files {
		paths[i] = f.path
	}
	s, err := spectra.ReadSample(l.fsys, paths, spectra.SampleOptions{Resolve: resolvePath})
	if err != nil {
		var errs Errors
		for _, e := range splitJoined(err) {
			at := &Error{File: file, Line: line, Column: col, Err: fmt.Errorf("%w: %w", ErrSpectrum, e)}
			var fe *spectra.FileError
			if errors.As(e, &fe) && fe.Index >= 0 && fe.Index < len(files) {
				at.Line, at.Column = files[fe.Index].line, files[fe.Index].column
			}
			errs = append(errs, at)
		}
		return nil, errs
	}
	return s, nil
}

// inputs returns m's Markdown file, the inputs of s and m's sky file.
func (m *Material) inputs(s *spectra.Spectrum) []Input {
	inputs := []Input{m.Input}
	for _, in := range s.Inputs {
		inputs = append(inputs, Input{Path: in.Name, SHA256: in.SHA256})
	}
	for _, in := range []*Input{m.files.sky, m.files.weather} {
		if in != nil {
			inputs = append(inputs, *in)
		}
	}
	return inputs
}

// nearestSlug suggests a known slug close to s, or nothing.
func nearestSlug(s string, slugs map[string]string) string {
	if best, close := msg.Nearest(s, sortedKeys(slugs)); close {
		return fmt.Sprintf(" (did you mean %q?)", best)
	}
	return ""
}

// nearbyFile suggests, for the missing file p (written ref in front
// matter), a file of the same folder with a close name, as it would be
// written in the front matter; or names the folder's files when none is
// close and they are few. It returns "" when the folder cannot be read.
func nearbyFile(fsys fs.FS, p, ref string) string {
	dir := path.Dir(p)
	entries, err := fs.ReadDir(fsys, dir)
	if err != nil {
		return ""
	}
	var names []string
	for _, e := range entries {
		if !e.IsDir() && !strings.HasPrefix(e.Name(), ".") && !strings.EqualFold(path.Ext(e.Name()), ".md") {
			names = append(names, e.Name())
		}
	}
	if best, close := msg.Nearest(path.Base(p), names); close {
		return fmt.Sprintf(" (did you mean %q?)", path.Join(path.Dir(strings.TrimSpace(ref)), best))
	}
	if len(names) > 0 && len(names) <= 10 {
		return fmt.Sprintf(" (%s/ holds %s)", dir, strings.Join(names, ", "))
	}
	return ""
}

// contentFiles lists the Markdown files under content/, sorted, and the
// other regular files met on the way, by path.
func contentFiles(fsys fs.FS) ([]string, map[string]fs.DirEntry, error) {
	var files []string
	listed := map[string]fs.DirEntry{}
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
		if d.Type().IsRegular() {
			listed[p] = d
		}
		return nil
	})
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, nil, errorf(ContentDir, 0, 0, ErrMissing, "no %s/ folder: materials go in %s/*.md", ContentDir, ContentDir)
		}
		return nil, nil, &Error{File: ContentDir, Err: err}
	}
	sort.Strings(files)
	return files, listed, nil
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

// readFile reads one content file, its front matter through fc (see
// FrontCache.parse). Base is the file's doc but for the file's name: what
// it learns of the spectrum files named goes into base.seen (see
// Library.seen).
func readFile(base doc, file string, cfg Config, fc *FrontCache) fileResult {
	var r fileResult
	// The file's stamp, taken before it is read (a later change moves it):
	// while it holds, the file is what the cache recorded.
	var st Stamp
	stamped := false
	if e, ok := base.listed[file]; ok && fc != nil {
		if fi, err := e.Info(); err == nil {
			st, stamped = StampOf(fi, base.loaded)
		}
	}
	var (
		src, body []byte
		bodyLine  int
		input     Input
		fm        FrontMatter
		fp        frontPlaces
		errs      Errors
	)
	var rec *fileRecord
	if stamped {
		fm, fp, rec, _ = fc.unchanged(file, st)
	}
	if rec != nil {
		bodyLine, input = rec.BodyLine, Input{Path: file, SHA256: rec.SHA256}
	} else {
		var err error
		if src, err = fs.ReadFile(base.fsys, file); err != nil {
			r.err = &Error{File: file, Err: err}
			return r
		}
		var yamlText []byte
		if yamlText, body, bodyLine, err = splitFront(file, src); err != nil {
			r.err = err
			return r
		}
		fm, fp, err = fc.parse(file, yamlText)
		bb := bodyBlanks(file, body, bodyLine)
		if err != nil {
			// Known by its slug all the same, so that comparisons listing it
			// do not report it missing on top of its own errors.
			if len(bb) > 0 {
				err = Join(err, Errors(bb))
			}
			r.err, r.isCompare = err, len(fm.Compare) > 0
			if r.slug = fm.Slug; r.slug == "" {
				r.slug = Slugify(strings.TrimSuffix(path.Base(file), path.Ext(file)))
			}
			return r
		}
		errs = append(errs, bb...)
		input = hashInput(file, src)
		if stamped && len(bb) == 0 && len(fm.Compare) == 0 {
			fc.keepFile(file, st, input.SHA256, yamlText, bodyLine)
		}
	}
	d := base
	d.file = file
	r.slugLine = fp.Slug.Line
	if fm.Slug == "" {
		r.slug = Slugify(strings.TrimSuffix(path.Base(file), path.Ext(file)))
		r.slugLine = 1
		if r.slug == "" {
			errs = append(errs, errorf(file, 1, 0, ErrBadSlug, "cannot make a slug from the file name: add slug: to the front matter"))
		}
	} else {
		r.slug = fm.Slug
		if Slugify(fm.Slug) != fm.Slug {
			errs = append(errs, errorf(file, fp.Slug.Line, fp.Slug.Column, ErrBadSlug, "%s: want lower-case letters, digits and single hyphens, e.g. %s", msg.Quote(fm.Slug), msg.Quote(Slugify(fm.Slug))))
		}
	}
	fm.Slug = r.slug
	if len(fm.Compare) > 0 {
		r.isCompare = true
		c := &Comparison{Path: file, Slug: r.slug, Front: fm, Body: body, BodyLine: bodyLine, Source: src,
			skinLine: fp.Skin.Line}
		for _, p := range fp.Compare {
			r.compareLines = append(r.compareLines, p.Line)
		}
		if len(errs) > 0 {
			r.err = errs
			return r
		}
		r.c = c
		return r
	}
	m := &Material{Path: file, Slug: r.slug, Front: fm, Body: body, BodyLine: bodyLine, Source: src,
		Input: input, spectraLine: fp.Spectra.Line, fsys: base.fsys}
	var err error
	m.Conditions, m.files, err = d.apply(fm.Conditions, cfg.Conditions)
	if err != nil {
		errs = append(errs, err)
	}
	if m.files.sky == nil && m.Conditions.Sky.Spectrum != nil {
		m.files.sky = cfg.files.sky // the config's sky file
	}
	if m.files.weather == nil && m.Conditions.Weather.Series != nil {
		m.files.weather = cfg.files.weather // the config's series
	}
	var es []error
	m.spectra, es = d.spectrumFiles(fm.Spectra, fp.Files)
	errs = append(errs, es...)
	for i, lr := range fm.Stack {
		lp := fp.Stack[i]
		l := &Layer{slug: strings.TrimSpace(lr.Material), Name: strings.TrimSpace(lr.Name), line: lp.Material.Line, column: lp.Material.Column}
		if lr.ThicknessMM != nil && lr.ConductivityWmK != nil {
			l.Conductor = &datasheet.Conductor{ThicknessM: *lr.ThicknessMM / 1000, ConductivityWmK: *lr.ConductivityWmK}
		}
		l.spectra, es = d.spectrumFiles(lr.Spectra, lp.Files)
		errs = append(errs, es...)
		m.Stack = append(m.Stack, l)
	}
	if len(errs) > 0 {
		r.err = errs
		return r
	}
	r.m = m
	return r
}

// spectrumFiles resolves the spectra entries refs (at places) and checks
// that their files exist.
func (d doc) spectrumFiles(refs []SpectrumRef, places []place) ([]spectrumFile, []error) {
	var out []spectrumFile
	var errs []error
	for i, ref := range refs {
		line, col := places[i].Line, places[i].Column
		p, err := resolvePath(d.file, ref.File)
		if err != nil {
			errs = append(errs, &Error{File: d.file, Line: line, Column: col, Err: fmt.Errorf("spectra file %s: %w", msg.Quote(ref.File), err)})
			continue
		}
		fi, err := d.stat(p)
		if err != nil {
			errs = append(errs, &Error{File: d.file, Line: line, Column: col, Err: fmt.Errorf("%w %s: %w%s", ErrSpectrum, p, unwrapPath(err), nearbyFile(d.fsys, p, ref.File))})
			continue
		}
		if d.seen != nil {
			d.seen.Store(p, fi)
		}
		out = append(out, spectrumFile{path: p, line: line, column: col})
	}
	return out, errs
}

// stat returns what the file system tells of file p: what listing its
// folder told, for a regular file (os.Root lists a folder with the lstat
// of each entry), else its fs.Stat.
func (d doc) stat(p string) (fs.FileInfo, error) {
	if e, ok := d.listed[p]; ok {
		if fi, err := e.Info(); err == nil && fi.Mode().IsRegular() {
			return fi, nil
		}
	}
	return fs.Stat(d.fsys, p)
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
