package library

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/gob"
	"hash"
	"io"
	"reflect"
	"slices"
	"strings"
	"sync"

	"skysheet/datasheet"
)

// FrontCache keeps, from one load of a library to the next, what parsing
// and checking found in the front matter of its content files, by the
// SHA-256 of the YAML text: a file whose front matter is unchanged is not
// parsed again (everything the front matter names is still checked
// afresh). It keeps only front matter that parsed with no error and sets
// no conditions:, and only values that read back equal to what parsing
// gave (see WriteTo).
//
// It also keeps, for each material's Markdown file read whole with no
// error, the file's stamp (see [StampOf]), SHA-256 and where its body
// starts: a file whose stamp still holds is not read again at all, its
// text read only when asked for (see [Material.Text]). Comparisons'
// files are always read.
//
// A FrontCache serves one load at a time; what a load leaves unused is
// dropped when the next one starts.
type FrontCache struct {
	build string // the software build that wrote or is to write it

	mu        sync.Mutex
	old       map[[sha256.Size]byte]*frontEntry // read, not yet taken
	read      int                               // entries read
	next      map[[sha256.Size]byte]*frontEntry // taken or added by the last load
	oldFiles  map[string]*fileRecord            // read, by path
	readFiles int                               // file records read
	nextFiles map[string]*fileRecord            // taken or added by the last load
	added     bool
	hits      int
}

// fileRecord is what the cache keeps of a Markdown file read whole.
type fileRecord struct {
	Path     string
	Stamp    Stamp
	SHA256   string            // of the whole file (see Input)
	Key      [sha256.Size]byte // of its YAML text: its frontEntry
	BodyLine int
}

// frontEntry is what the cache keeps of one front matter.
type frontEntry struct {
	Key    [sha256.Size]byte
	Front  frontFields
	Places frontPlaces
	fresh  bool // parsed by this build in this process: not yet read back
}

// frontFields are the fields of FrontMatter but Conditions (kept only when
// there are none).
type frontFields struct {
	Title, Slug, Maker, Lab, ProductCode, Category string
	Tags                                           []string
	Summary, License                               string
	Spectra                                        []SpectrumRef
	Measured                                       Measured
	Claims                                         []datasheet.Claim
	Compare                                        []string
	Stack                                          []LayerRef
	Reference, Skin                                string
}

func keptFields(fm FrontMatter) frontFields {
	return frontFields{fm.Title, fm.Slug, fm.Maker, fm.Lab, fm.ProductCode, fm.Category, fm.Tags, fm.Summary, fm.License,
		fm.Spectra, fm.Measured, fm.Claims, fm.Compare, fm.Stack, fm.Reference, fm.Skin}
}

func (f frontFields) front() FrontMatter {
	return FrontMatter{Title: f.Title, Slug: f.Slug, Maker: f.Maker, Lab: f.Lab, ProductCode: f.ProductCode,
		Category: f.Category, Tags: f.Tags, Summary: f.Summary, License: f.License, Spectra: f.Spectra,
		Measured: f.Measured, Claims: f.Claims, Compare: f.Compare, Stack: f.Stack, Reference: f.Reference, Skin: f.Skin}
}

// NewFrontCache returns an empty cache for the given build of the
// software.
func NewFrontCache(build string) *FrontCache {
	return &FrontCache{build: build}
}

// frontMagic starts a front matter cache.
const frontMagic = "skysheet front matter cache 2\n"

// frontHead starts the gob stream of a front matter cache.
type frontHead struct {
	Build          string
	Entries, Files int
}

// ReadFrontCache reads a cache that WriteTo wrote. A stream that is
// truncated, corrupt or of another format gives an empty cache of no
// build. The cache records the build that wrote it (see Build); using it
// is for that build alone.
func ReadFrontCache(r io.Reader) *FrontCache {
	c := &FrontCache{}
	br := bufio.NewReader(r)
	magic := make([]byte, len(frontMagic))
	if _, err := io.ReadFull(br, magic); err != nil || string(magic) != frontMagic {
		return c
	}
	h := sha256.New()
	dec := gob.NewDecoder(&hashingReader{r: br, h: h})
	var head frontHead
	if err := dec.Decode(&head); err != nil || head.Entries < 0 {
		return c
	}
	var es []*frontEntry
	if err := dec.Decode(&es); err != nil || len(es) != head.Entries {
		return c
	}
	var files []*fileRecord
	if err := dec.Decode(&files); err != nil || len(files) != head.Files {
		return c
	}
	want := h.Sum(nil)
	got := make([]byte, len(want))
	if _, err := io.ReadFull(br, got); err != nil || !bytes.Equal(got, want) {
		return c
	}
	if _, err := br.ReadByte(); err != io.EOF {
		return c
	}
	c.build = head.Build
	c.old = make(map[[sha256.Size]byte]*frontEntry, len(es))
	for _, e := range es {
		if e != nil {
			c.old[e.Key] = e
		}
	}
	c.read = len(c.old)
	c.oldFiles = make(map[string]*fileRecord, len(files))
	for _, f := range files {
		if f != nil && c.old[f.Key] != nil {
			c.oldFiles[f.Path] = f
		}
	}
	c.readFiles = len(c.oldFiles)
	return c
}

// Build returns the build of the software that wrote the cache, or is to
// write it.
func (c *FrontCache) Build() string { return c.build }

// Hits returns the number of files whose front matter the last load took
// from the cache.
func (c *FrontCache) Hits() int {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.hits
}

// Changed reports whether the last load added an entry or left one
// unused: whether the cache should be written again.
func (c *FrontCache) Changed() bool {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.added || len(c.next) != c.read || len(c.nextFiles) != c.readFiles
}

// begin starts a load: what the last one took or added can be taken again.
func (c *FrontCache) begin() {
	if c == nil {
		return
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.next != nil || c.nextFiles != nil || c.hits > 0 || c.added {
		// A load before this one: what it used.
		c.old, c.oldFiles = c.next, c.nextFiles
	}
	c.next, c.read, c.hits, c.added = nil, len(c.old), 0, false
	c.nextFiles, c.readFiles = nil, len(c.oldFiles)
}

// unchanged returns the front matter of the Markdown file file and the
// record of it, when the cache holds a record of the file under stamp st
// and its front matter, which names no comparison: the file as it was
// when last read whole. A nil cache holds none.
func (c *FrontCache) unchanged(file string, st Stamp) (FrontMatter, frontPlaces, *fileRecord, bool) {
	if c == nil {
		return FrontMatter{}, frontPlaces{}, nil, false
	}
	c.mu.Lock()
	r := c.oldFiles[file]
	var e *frontEntry
	if r != nil && r.Stamp == st {
		e = c.old[r.Key]
	}
	if e == nil || len(e.Front.Compare) > 0 {
		c.mu.Unlock()
		return FrontMatter{}, frontPlaces{}, nil, false
	}
	delete(c.old, r.Key)
	c.next = mapSet(c.next, r.Key, e)
	c.nextFiles = mapSet(c.nextFiles, file, r)
	c.hits++
	c.mu.Unlock()
	return e.Front.copy().front(), e.Places.copy(), r, true
}

// keepFile records that the Markdown file file, under stamp st, was read
// whole with no error: its SHA-256, that of its YAML text, and the line
// its body starts on. WriteTo writes the record only with the front
// matter it names.
func (c *FrontCache) keepFile(file string, st Stamp, sum string, yamlText []byte, bodyLine int) {
	if c == nil {
		return
	}
	r := &fileRecord{Path: file, Stamp: st, SHA256: sum, Key: sha256.Sum256(yamlText), BodyLine: bodyLine}
	c.mu.Lock()
	defer c.mu.Unlock()
	if old := c.oldFiles[file]; old == nil || *old != *r {
		c.added = true
	}
	c.nextFiles = mapSet(c.nextFiles, file, r)
}

// parse returns the front matter of file and where its values are, from
// the cache when it holds yamlText's, else parsed (and kept when it may
// be). A nil cache parses.
func (c *FrontCache) parse(file string, yamlText []byte) (FrontMatter, frontPlaces, error) {
	if c == nil {
		return parseFront(file, yamlText)
	}
	key := sha256.Sum256(yamlText)
	c.mu.Lock()
	e := c.old[key]
	if e != nil {
		// Given out once: two files of the same front matter do not share
		// its slices.
		delete(c.old, key)
		c.next = mapSet(c.next, key, e)
		c.hits++
	}
	c.mu.Unlock()
	if e != nil {
		return e.Front.copy().front(), e.Places.copy(), nil
	}
	fm, fp, err := parseFront(file, yamlText)
	if err != nil || fm.Conditions.node != nil || !reflect.DeepEqual(keptFields(fm).front(), fm) {
		// Not kept: front matter with errors, with conditions: (whose
		// YAML node apply needs), or with a field frontFields misses.
		return fm, fp, err
	}
	c.mu.Lock()
	if _, ok := c.next[key]; !ok {
		c.next = mapSet(c.next, key, &frontEntry{Key: key, Front: keptFields(fm).copy(), Places: fp.copy(), fresh: true})
		c.added = true
	}
	c.mu.Unlock()
	return fm, fp, nil
}

func mapSet[K comparable, V any](m map[K]V, k K, v V) map[K]V {
	if m == nil {
		m = map[K]V{}
	}
	m[k] = v
	return m
}

// WriteTo writes the entries the last load took or added, in the format
// ReadFrontCache reads: a magic line, a gob stream of the build and the
// entries, and the SHA-256 of the stream. An entry parsed by this process
// is written only if it reads back from gob equal to what parsing gave
// (gob, for one, reads an empty slice back as nil).
func (c *FrontCache) WriteTo(w io.Writer) (int64, error) {
	c.mu.Lock()
	defer c.mu.Unlock()
	es := make([]*frontEntry, 0, len(c.next))
	var fresh []*frontEntry
	for _, e := range c.next {
		if e.fresh {
			fresh = append(fresh, e)
		} else {
			es = append(es, e)
		}
	}
	es = append(es, readBack(fresh)...)
	slices.SortFunc(es, func(a, b *frontEntry) int { return bytes.Compare(a.Key[:], b.Key[:]) })
	written := make(map[[sha256.Size]byte]bool, len(es))
	for _, e := range es {
		written[e.Key] = true
	}
	files := make([]*fileRecord, 0, len(c.nextFiles))
	for _, f := range c.nextFiles {
		if written[f.Key] {
			files = append(files, f)
		}
	}
	slices.SortFunc(files, func(a, b *fileRecord) int { return strings.Compare(a.Path, b.Path) })
	cw := &countingWriter{w: w}
	bw := bufio.NewWriter(cw)
	bw.WriteString(frontMagic)
	h := sha256.New()
	enc := gob.NewEncoder(io.MultiWriter(bw, h))
	err := enc.Encode(frontHead{Build: c.build, Entries: len(es), Files: len(files)})
	if err == nil {
		err = enc.Encode(es)
	}
	if err == nil {
		err = enc.Encode(files)
	}
	if err == nil {
		_, err = bw.Write(h.Sum(nil))
	}
	if err == nil {
		err = bw.Flush()
	}
	return cw.n, err
}

// readBack returns the entries of es that read back from gob equal to
// themselves.
func readBack(es []*frontEntry) []*frontEntry {
	if len(es) == 0 {
		return nil
	}
	var buf bytes.Buffer
	if err := gob.NewEncoder(&buf).Encode(es); err != nil {
		return nil
	}
	var back []*frontEntry
	if err := gob.NewDecoder(&buf).Decode(&back); err != nil || len(back) != len(es) {
		return nil
	}
	var ok []*frontEntry
	for i, e := range es {
		if b := back[i]; b != nil {
			b.fresh = e.fresh
			if reflect.DeepEqual(b, e) {
				ok = append(ok, e)
			}
		}
	}
	return ok
}

// hashingReader hashes what is read through it. It is an io.ByteReader,
// so that gob reads no further than each message.
type hashingReader struct {
	r *bufio.Reader
	h hash.Hash
}

func (r *hashingReader) Read(p []byte) (int, error) {
	n, err := r.r.Read(p)
	r.h.Write(p[:n])
	return n, err
}

func (r *hashingReader) ReadByte() (byte, error) {
	b, err := r.r.ReadByte()
	if err == nil {
		r.h.Write([]byte{b})
	}
	return b, err
}

type countingWriter struct {
	w io.Writer
	n int64
}

func (w *countingWriter) Write(p []byte) (int, error) {
	n, err := w.w.Write(p)
	w.n += int64(n)
	return n, err
}

// copy returns a copy of f that shares no memory with it (strings aside,
// which cannot change). TestCopiesShareNothing checks every field.
func (f frontFields) copy() frontFields {
	c := f
	c.Tags = slices.Clone(f.Tags)
	c.Spectra = slices.Clone(f.Spectra)
	c.Claims = slices.Clone(f.Claims)
	for i, cl := range c.Claims {
		c.Claims[i].Values = slices.Clone(cl.Values)
		b := &c.Claims[i].Basis
		b.SolarBandNM, b.ThermalBandUM, b.WindowBandUM = slices.Clone(b.SolarBandNM), slices.Clone(b.ThermalBandUM), slices.Clone(b.WindowBandUM)
	}
	c.Compare = slices.Clone(f.Compare)
	c.Stack = slices.Clone(f.Stack)
	for i, l := range c.Stack {
		c.Stack[i].Spectra = slices.Clone(l.Spectra)
		c.Stack[i].ThicknessMM, c.Stack[i].ConductivityWmK = clonePtr(l.ThicknessMM), clonePtr(l.ConductivityWmK)
	}
	return c
}

// copy returns a copy of p that shares no memory with it.
func (p frontPlaces) copy() frontPlaces {
	c := p
	c.Compare, c.Files, c.Stack = slices.Clone(p.Compare), slices.Clone(p.Files), slices.Clone(p.Stack)
	for i, l := range c.Stack {
		c.Stack[i].Files = slices.Clone(l.Files)
	}
	return c
}

func clonePtr[T any](p *T) *T {
	if p == nil {
		return nil
	}
	v := *p
	return &v
}
