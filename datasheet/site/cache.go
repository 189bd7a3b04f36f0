package site

import (
	"bufio"
	"bytes"
	"crypto/rand"
	"crypto/sha256"
	"encoding/gob"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"io/fs"
	"maps"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/templates"
)

// Cache is a folder that keeps, between renders, what a render made of
// each material: its figures, verdicts and warnings, what a comparison
// draws of it, and its files (page, downloads). A material is taken from
// the cache, not read and evaluated again, when its entry was made by the
// same build of skysheet with the same templates, config and Markdown
// file, the same comparisons listing it and stack layers under it, and
// every file it rests on (spectra, reference standards, sky and weather
// files) still has the SHA-256 recorded in the entry. A file whose
// device, inode, size, modification and change times are those recorded
// with the entry is not read again to be checked (see
// library.Library.Stamps for when they are recorded).
//
// The cache only saves time: deleting it changes nothing else. An entry
// that is stale (an input changed), truncated or corrupt (its checksum,
// or the size or time of one of its files, differs from what was
// recorded) is ignored and replaced. Materials that a comparison sets
// against a reference are always evaluated afresh: their figures as a
// textile rest on other materials' spectra.
type Cache struct {
	dir   string // entries are dir/cacheVersion/KEY/, the index dir/cacheVersion/index
	build string

	// Read once: the entries of the last render by key (index), those of
	// them in the index file itself (indexed; the others come from its
	// journal) and the SHA-256 of that file (nil when none was read).
	load    sync.Once
	index   map[string]*entry
	indexed map[string]*entry
	sum     []byte

	mu      sync.Mutex
	next    map[string]*entry // entries read or written by this render
	changed bool              // an entry of next differs from the index's
	renewed map[string]bool   // entries of the index whose stamps get renewed
	hits    int
	errors  []error // entries that could not be written
}

const (
	// cacheVersion names the folder of entries in this format; a change
	// of format changes it, and Commit removes the older folders.
	cacheVersion = "v1"
	// indexMagic starts the index, journalMagic the journal of changes
	// written on it (see writeJournal).
	indexMagic   = "skysheet render cache index 1\n"
	indexFile    = "index"
	journalMagic = "skysheet render cache journal 1\n"
	journalFile  = "journal"
)

// OpenCache opens the cache in dir, creating it when missing. Build
// identifies the build of the software (entries made by another build are
// not used); it must not be empty.
func OpenCache(dir, build string) (*Cache, error) {
	if build == "" {
		return nil, errors.New("render cache: no build identity")
	}
	// The cache prunes what it did not list: a folder of that name that
	// holds anything but a cache is not taken for one.
	tag := filepath.Join(dir, "CACHEDIR.TAG")
	if _, err := os.Stat(tag); errors.Is(err, fs.ErrNotExist) {
		if es, err := os.ReadDir(dir); err == nil && len(es) > 0 {
			return nil, fmt.Errorf("render cache: %s holds files but no CACHEDIR.TAG: not a cache skysheet made, left alone", dir)
		}
	}
	if err := os.MkdirAll(filepath.Join(dir, cacheVersion), 0o755); err != nil {
		return nil, fmt.Errorf("render cache: %w", err)
	}
	// The Cache Directory Tagging Specification's tag tells backup tools
	// to skip the folder.
	if _, err := os.Stat(tag); errors.Is(err, fs.ErrNotExist) {
		if err := os.WriteFile(tag, []byte(cacheTag), 0o644); err != nil {
			return nil, fmt.Errorf("render cache: %w", err)
		}
	}
	return &Cache{dir: dir, build: build, next: map[string]*entry{}}, nil
}

// cacheTag is the CACHEDIR.TAG that marks the folder as a cache.
const cacheTag = "Signature: 8a477f597d28d172789f06886806bc55\n# skysheet's render cache: safe to delete, the next render is then a full one.\n"

// Hits returns the number of materials taken from the cache so far.
func (c *Cache) Hits() int {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.hits
}

// WriteErrors returns the errors met while writing entries (the render
// went on without them).
func (c *Cache) WriteErrors() []error {
	c.mu.Lock()
	defer c.mu.Unlock()
	return append([]error(nil), c.errors...)
}

// Commit writes the index of the entries this render used or wrote, then
// removes every other entry (of materials gone or changed), what
// interrupted renders left and the folders of older formats. Call it
// after a render that succeeded; until then the last index stays.
func (c *Cache) Commit() error {
	c.loadIndex()
	c.mu.Lock()
	defer c.mu.Unlock()
	base := filepath.Join(c.dir, cacheVersion)
	// Entries come into next from the index (get) or new (put): an index
	// that put did not add to, whose stamps get did not renew and whose
	// every entry this render used is the one on disk.
	if c.changed || len(c.next) != len(c.index) {
		if err := c.writeIndex(base); err != nil {
			return err
		}
	}
	var errs []error
	top, err := os.ReadDir(c.dir)
	if err != nil {
		return err
	}
	for _, e := range top {
		if e.IsDir() && e.Name() != cacheVersion && isFormatFolder(e.Name()) {
			errs = append(errs, os.RemoveAll(filepath.Join(c.dir, e.Name())))
		}
	}
	entries, err := os.ReadDir(base)
	if err != nil {
		return err
	}
	for _, e := range entries {
		if _, ok := c.next[e.Name()]; !ok && e.IsDir() {
			errs = append(errs, os.RemoveAll(filepath.Join(base, e.Name())))
		}
	}
	return errors.Join(errs...)
}

// writeIndex records the entries of this render in folder base: as a
// journal on the index file read, while the changes from it are few (see
// journalLimit), else as a new index file.
func (c *Cache) writeIndex(base string) error {
	if c.sum != nil {
		var puts []*entry
		for _, k := range slices.Sorted(maps.Keys(c.next)) {
			if e := c.next[k]; c.indexed[k] != e || c.renewed[k] {
				puts = append(puts, e)
			}
		}
		var drops []string
		for _, k := range slices.Sorted(maps.Keys(c.indexed)) {
			if _, ok := c.next[k]; !ok {
				drops = append(drops, k)
			}
		}
		if len(puts)+len(drops) <= journalLimit(len(c.next)) {
			return writeJournal(base, journalHead{Build: c.build, Index: c.sum}, puts, drops)
		}
	}
	_, err := writeIndex(base, c.build, c.next)
	return err
}

// journalLimit is the most changes a journal holds on an index of about n
// entries: an eighth of them, at least 64. A render that would go beyond
// writes a new index instead. (Common practice, no source: a journal
// kept small against the file it changes.)
func journalLimit(n int) int { return max(64, n/8) }

// isFormatFolder reports whether name is that of a folder of entries of
// some format: "v" and a number.
func isFormatFolder(name string) bool {
	n, ok := strings.CutPrefix(name, "v")
	_, err := strconv.Atoi(n)
	return ok && err == nil
}

// entry is what the cache keeps of a material, in its meta file.
type entry struct {
	Key  string
	Kept kept
	// Stamps vouch for Kept.Inputs unchanged without reading them again
	// (see library.Library.Stamps); a zero stamp, or none, means read.
	Stamps []library.Stamp
	Files  []cachedFile // stored as files named 0, 1, … in the entry's folder
	// Empty lists the slices and maps of Kept that are empty but not nil
	// (by their number in the order of walkSlices): gob writes nothing
	// of them and reads them back as nil, which JSON writes as null, not
	// [].
	Empty []int
}

// kept is the summary of a material. What a comparison draws of it is not
// kept: a comparison page made afresh reads its materials' files again
// (see builder.overlayOf).
type kept struct {
	Inputs   []library.Input
	Figures  *datasheet.Figures
	Verdicts []datasheet.Verdict
	Warnings []string
	Search   [4]string // its entry in the search index
}

// cachedFile is a site file of an entry: its size and modification time
// when it was stored, which must still hold when it is used, and its
// device and inode (zero where the file system gives none).
type cachedFile struct {
	Name     string
	Size     int64
	ModTime  int64 // nanoseconds since 1970
	Dev, Ino uint64
}

// keyOf returns the cache key of material m, listed by comparisons cmps,
// and false when m is not to be cached.
func (b *builder) keyOf(m *library.Material, cmps []*library.Comparison) (string, bool) {
	for _, c := range cmps {
		if c.Reference != nil || c.Skin != nil {
			return "", false
		}
	}
	h := sha256.New()
	field := func(s string) { fmt.Fprintf(h, "%d:%s\n", len(s), s) }
	field(b.cacheBase)
	field(m.Path)
	field(m.Slug)
	field(m.Input.SHA256)
	for _, l := range m.Stack {
		if l.Material != nil {
			field(l.Material.Path)
			field(l.Material.Input.SHA256)
		}
	}
	for _, c := range cmps {
		sum := sha256.Sum256(c.Source)
		field(c.Path)
		field(hex.EncodeToString(sum[:]))
	}
	return hex.EncodeToString(h.Sum(nil)), true
}

// pageKey returns the cache key of site files that rest only on the rows
// of materials ms (each a function of the material's summary, which
// setKey identifies) and on what parts name: "" when there is no cache
// or a material of ms is not cached.
func (b *builder) pageKey(ms []*evaluate.Summary, parts ...string) string {
	if b.opt.Cache == nil {
		return ""
	}
	h := sha256.New()
	field := func(s string) { fmt.Fprintf(h, "%d:%s\n", len(s), s) }
	field("pages") // never the first field of a material's key
	field(b.cacheBase)
	for _, p := range parts {
		field(p)
	}
	for _, m := range ms {
		k, ok := b.keys[m.Slug]
		if !ok {
			return ""
		}
		field(k)
	}
	return hex.EncodeToString(h.Sum(nil))
}

// memo makes files with build into out, or, when the cache holds the
// files made under key (not ""), takes them from the cache instead; files
// made under a key are stored in the cache and taken from there.
func (b *builder) memo(key string, out files, build func(files) error) error {
	c := b.opt.Cache
	if c == nil || key == "" {
		return build(out)
	}
	if e, paths, infos := c.get(key, b.lib, b.kept); e != nil && e.Kept.Figures == nil && len(e.Kept.Inputs) == 0 {
		b.take(e.Files, paths, infos)
		return nil
	}
	own := files{}
	if err := build(own); err != nil {
		return err
	}
	e := &entry{}
	if paths, ok := c.put(key, e, b.lib, own); ok {
		b.take(e.Files, paths, nil)
		return nil
	}
	maps.Copy(out, own)
	return nil
}

// appendMemo appends to dst what build returns, or, when the cache holds
// what it returned under key (not ""), that instead, read from the cache
// straight into dst; what build returns under a key is stored in the
// cache. For parts of files that rest on many materials, such as
// catalog.json.
func (b *builder) appendMemo(dst []byte, key string, build func() ([]byte, error)) ([]byte, error) {
	c := b.opt.Cache
	if c == nil || key == "" {
		data, err := build()
		return append(dst, data...), err
	}
	if e, paths, _ := c.get(key, b.lib, nil); e != nil && len(paths) == 1 && e.Files[0].Name == memoPart {
		if out, ok := appendFile(dst, paths[0], e.Files[0].Size); ok {
			return out, nil
		}
	}
	data, err := build()
	if err != nil {
		return dst, err
	}
	c.put(key, &entry{}, b.lib, files{memoPart: data})
	return append(dst, data...), nil
}

// appendFile appends to dst the file p, which must be size bytes long.
func appendFile(dst []byte, p string, size int64) ([]byte, bool) {
	f, err := os.Open(p)
	if err != nil {
		return dst, false
	}
	defer f.Close()
	n := len(dst)
	dst = slices.Grow(dst, int(size)+1)[:n+int(size)]
	if _, err := io.ReadFull(f, dst[n:]); err != nil {
		return dst[:n], false
	}
	// Nothing more: the file is the size recorded.
	if m, _ := f.Read(dst[len(dst):cap(dst)][:1]); m != 0 {
		return dst[:n], false
	}
	return dst, true
}

// appendParts appends to dst what elements makes of ms, pageRows
// materials at a time, the parts separated by sep; each part is kept in
// the cache under the key of its materials, what, and where in ms it
// starts (see appendMemo).
func (b *builder) appendParts(dst []byte, ms []*evaluate.Summary, what, sep string, elements func([]*evaluate.Summary) ([]byte, error)) ([]byte, error) {
	for lo := 0; lo < len(ms); lo += pageRows {
		part := ms[lo:min(len(ms), lo+pageRows)]
		if lo > 0 {
			dst = append(dst, sep...)
		}
		var err error
		dst, err = b.appendMemo(dst, b.pageKey(part, what, strconv.Itoa(lo)), func() ([]byte, error) { return elements(part) })
		if err != nil {
			return nil, err
		}
	}
	return dst, nil
}

// memoPart names the one file of an entry of appendMemo.
const memoPart = "part"

// take records files of the cache for Render to write.
func (b *builder) take(list []cachedFile, paths []string, infos []fs.FileInfo) {
	b.mu.Lock()
	defer b.mu.Unlock()
	b.taken = append(b.taken, takenFiles{list, paths, infos})
}

// takenFiles are site files that the cache holds (see serialWriter.takeAll).
type takenFiles struct {
	list  []cachedFile
	paths []string
	infos []fs.FileInfo
}

// cacheBaseOf hashes what every page rests on: the build and version of
// the software, the config file and the templates (defaults and
// overrides).
func cacheBaseOf(c *Cache, opt Options, cfg library.Config) (string, error) {
	h := sha256.New()
	fmt.Fprintf(h, "%d:%s\n%d:%s\n%s\n", len(c.build), c.build, len(opt.Version), opt.Version, cfg.Input.SHA256)
	for _, t := range []fs.FS{templates.FS, opt.Templates} {
		if t == nil {
			continue
		}
		err := fs.WalkDir(t, ".", func(p string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return err
			}
			data, err := fs.ReadFile(t, p)
			if err != nil {
				return err
			}
			fmt.Fprintf(h, "%d:%s\n%d:", len(p), p, len(data))
			h.Write(data)
			return nil
		})
		if err != nil {
			return "", fmt.Errorf("templates: %w", err)
		}
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// Prefetch starts reading the index of the last render in the
// background, to have it at hand when the first material is looked up.
func (c *Cache) Prefetch() { go c.loadIndex() }

func (c *Cache) loadIndex() {
	c.load.Do(func() { c.index, c.indexed, c.sum = readIndex(filepath.Join(c.dir, cacheVersion), c.build) })
}

// get returns the entry under key, checked: nil when there is none or it
// is stale or one of its files was changed. The paths of its files, and
// what Stat told of each, are those of e.Files.
func (c *Cache) get(key string, lib *library.Library, kept func(name string) fs.FileInfo) (*entry, []string, []fs.FileInfo) {
	c.loadIndex()
	e := c.index[key]
	if e == nil {
		return nil, nil, nil
	}
	if ok, _ := lib.Unchanged(e.Kept.Inputs, e.Stamps); !ok {
		return nil, nil, nil
	}
	renewed := false
	if len(e.Stamps) != len(e.Kept.Inputs) || slices.Contains(e.Stamps, library.Stamp{}) {
		// Read again and found unchanged: a file may be old enough now.
		stamps := lib.Stamps(e.Kept.Inputs)
		renewed = !slices.Equal(stamps, e.Stamps)
		e.Stamps = stamps
	}
	dir := filepath.Join(c.dir, cacheVersion, key)
	paths := make([]string, len(e.Files))
	infos := make([]fs.FileInfo, len(e.Files))
	for i, f := range e.Files {
		paths[i] = filepath.Join(dir, strconv.Itoa(i))
		if st := keptCopy(kept, f); st != nil {
			infos[i] = st
			continue
		}
		st, err := os.Stat(paths[i])
		if err != nil || !st.Mode().IsRegular() || st.Size() != f.Size || st.ModTime().UnixNano() != f.ModTime {
			return nil, nil, nil
		}
		infos[i] = st
	}
	c.mu.Lock()
	c.next[key] = e
	if renewed {
		c.changed = true
		if c.renewed == nil {
			c.renewed = map[string]bool{}
		}
		c.renewed[key] = true
	}
	c.mu.Unlock()
	return e, paths, infos
}

// keptCopy returns what kept tells of the site file f, when that is the
// cache's very copy of it as stored: the same device and inode, size and
// modification time. Else nil.
func keptCopy(kept func(name string) fs.FileInfo, f cachedFile) fs.FileInfo {
	if kept == nil || f.Ino == 0 {
		return nil
	}
	st := kept(f.Name)
	if st == nil || !st.Mode().IsRegular() || st.Size() != f.Size || st.ModTime().UnixNano() != f.ModTime {
		return nil
	}
	if dev, ino, ok := library.FileID(st); !ok || dev != f.Dev || ino != f.Ino {
		return nil
	}
	return st
}

// hit counts a material taken from the cache.
func (c *Cache) hit() {
	c.mu.Lock()
	c.hits++
	c.mu.Unlock()
}

// put stores e and the files under key and returns the paths of the
// stored files, in e.Files order; it records the stamps of e's inputs in
// lib and the empty slices of e.Kept. A failure is recorded, not returned
// as the material's: the render goes on without the entry.
func (c *Cache) put(key string, e *entry, lib *library.Library, fs files) ([]string, bool) {
	e.Stamps, e.Empty = lib.Stamps(e.Kept.Inputs), emptyOf(e)
	paths, err := c.write(key, e, fs)
	c.mu.Lock()
	defer c.mu.Unlock()
	if err != nil {
		c.errors = append(c.errors, err)
		return nil, false
	}
	c.next[key], c.changed = e, true
	return paths, true
}

func (c *Cache) write(key string, e *entry, fs files) ([]string, error) {
	base := filepath.Join(c.dir, cacheVersion)
	tmp, err := os.MkdirTemp(base, ".new-")
	if err != nil {
		return nil, err
	}
	defer os.RemoveAll(tmp) // a no-op once renamed
	if err := os.Chmod(tmp, 0o755); err != nil {
		return nil, err
	}
	names := make([]string, 0, len(fs))
	for n := range fs {
		names = append(names, n)
	}
	sort.Strings(names)
	e.Files = make([]cachedFile, len(names))
	for i, n := range names {
		p := filepath.Join(tmp, strconv.Itoa(i))
		if err := os.WriteFile(p, fs[n], 0o644); err != nil {
			return nil, err
		}
		st, err := os.Stat(p)
		if err != nil {
			return nil, err
		}
		e.Files[i] = cachedFile{Name: n, Size: st.Size(), ModTime: st.ModTime().UnixNano()}
		e.Files[i].Dev, e.Files[i].Ino, _ = library.FileID(st)
	}
	e.Key = key
	dst := filepath.Join(base, key)
	if err := os.Rename(tmp, dst); err != nil {
		// An older entry under the key: set it aside, then remove it.
		aside := filepath.Join(base, ".old-"+randomID())
		if err := os.Rename(dst, aside); err != nil {
			return nil, err
		}
		defer os.RemoveAll(aside)
		if err := os.Rename(tmp, dst); err != nil {
			return nil, err
		}
	}
	paths := make([]string, len(names))
	for i := range names {
		paths[i] = filepath.Join(dst, strconv.Itoa(i))
	}
	return paths, nil
}

// writeIndex writes the index of entries es into folder base, through a
// temporary file: the magic line, then a gob stream of the build, the
// number of entries and each entry in key order, then the SHA-256 of the
// stream, which it returns. The journal written on an earlier index is
// removed.
func writeIndex(base, build string, es map[string]*entry) ([]byte, error) {
	sum, err := writeStream(base, indexFile, indexMagic, func(enc *gob.Encoder) error {
		keys := slices.Sorted(maps.Keys(es))
		if err := enc.Encode(indexHead{Build: build, Entries: len(keys)}); err != nil {
			return err
		}
		for _, k := range keys {
			if err := enc.Encode(es[k]); err != nil {
				return err
			}
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	if err := os.Remove(filepath.Join(base, journalFile)); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return nil, err
	}
	return sum, nil
}

// writeJournal writes into folder base the journal of the changes from
// the index whose SHA-256 is indexSum to entries es: the entries of es
// that are not the index's (puts), and the keys of the index's entries
// not in es (drops). The journal is written whole each time, through a
// temporary file, as the index is: the magic line, then a gob stream of
// its head, each entry put in key order and the keys dropped, then the
// SHA-256 of the stream.
func writeJournal(base string, head journalHead, puts []*entry, drops []string) error {
	head.Puts, head.Drops = len(puts), len(drops)
	_, err := writeStream(base, journalFile, journalMagic, func(enc *gob.Encoder) error {
		if err := enc.Encode(head); err != nil {
			return err
		}
		for _, e := range puts {
			if err := enc.Encode(e); err != nil {
				return err
			}
		}
		return enc.Encode(drops)
	})
	return err
}

// journalHead starts the journal.
type journalHead struct {
	Build       string
	Index       []byte // the SHA-256 of the index the journal changes
	Puts, Drops int
}

// writeStream writes the file name into folder base through a temporary
// file: magic, then what write encodes, then the SHA-256 of the encoded
// stream, which it returns.
func writeStream(base, name, magic string, write func(*gob.Encoder) error) ([]byte, error) {
	f, err := os.CreateTemp(base, "."+name+"-")
	if err != nil {
		return nil, err
	}
	defer os.Remove(f.Name()) // a no-op once renamed
	if err := f.Chmod(0o644); err != nil {
		f.Close()
		return nil, err
	}
	w := bufio.NewWriter(f)
	w.WriteString(magic)
	h := sha256.New()
	err = write(gob.NewEncoder(io.MultiWriter(w, h)))
	sum := h.Sum(nil)
	if err == nil {
		_, err = w.Write(sum)
	}
	if err == nil {
		err = w.Flush()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return nil, err
	}
	return sum, os.Rename(f.Name(), filepath.Join(base, name))
}

// indexHead starts the index.
type indexHead struct {
	Build   string
	Entries int
}

// readIndex reads the index that writeIndex wrote in folder base, with
// the changes of the journal written on it (see writeJournal). It
// returns the entries, those of the index alone, and the index's
// SHA-256. An index that is missing, of another build, truncated or
// corrupt gives none, as does a journal on it that is of another build,
// truncated or corrupt; a journal on another index (an earlier one, left
// by a render stopped as it replaced the index) is not read.
func readIndex(base, build string) (es, indexed map[string]*entry, sum []byte) {
	var head indexHead
	sum, err := readStream(base, indexFile, indexMagic, func(dec *gob.Decoder) error {
		if err := dec.Decode(&head); err != nil {
			return err
		}
		if head.Build != build || head.Entries < 0 {
			return errors.New("another build's index")
		}
		indexed = make(map[string]*entry, min(head.Entries, 1<<16))
		for range head.Entries {
			e := new(entry)
			if err := dec.Decode(e); err != nil {
				return err
			}
			restoreEmpty(e)
			indexed[e.Key] = e
		}
		return nil
	})
	if err != nil {
		return nil, nil, nil
	}
	es = maps.Clone(indexed)
	var jh journalHead
	_, err = readStream(base, journalFile, journalMagic, func(dec *gob.Decoder) error {
		if err := dec.Decode(&jh); err != nil {
			return err
		}
		if !bytes.Equal(jh.Index, sum) {
			return errOtherIndex
		}
		if jh.Build != build || jh.Puts < 0 || jh.Drops < 0 {
			return errors.New("not a journal of this build")
		}
		for range jh.Puts {
			e := new(entry)
			if err := dec.Decode(e); err != nil {
				return err
			}
			restoreEmpty(e)
			es[e.Key] = e
		}
		var drops []string
		if err := dec.Decode(&drops); err != nil {
			return err
		}
		if len(drops) != jh.Drops {
			return errors.New("drops miscounted")
		}
		for _, k := range drops {
			delete(es, k)
		}
		return nil
	})
	switch {
	case err == nil:
	case errors.Is(err, fs.ErrNotExist), errors.Is(err, errOtherIndex):
		es = indexed // no journal, or one on an earlier index
	default:
		return nil, nil, nil
	}
	return es, indexed, sum
}

// errOtherIndex marks a journal written on another index than the one read.
var errOtherIndex = errors.New("a journal on another index")

// readStream reads the file name that writeStream wrote in folder base:
// it checks magic, lets read decode the stream, then checks the SHA-256
// that follows it and that nothing follows that. It returns the SHA-256,
// or an error (wrapping fs.ErrNotExist for a missing file).
func readStream(base, name, magic string, read func(*gob.Decoder) error) ([]byte, error) {
	f, err := os.Open(filepath.Join(base, name))
	if err != nil {
		return nil, err
	}
	defer f.Close()
	r := bufio.NewReader(f)
	head := make([]byte, len(magic))
	if _, err := io.ReadFull(r, head); err != nil || string(head) != magic {
		return nil, fmt.Errorf("%s: not a %q file", name, strings.TrimSpace(magic))
	}
	h := sha256.New()
	if err := read(gob.NewDecoder(&hashReader{r: r, h: h})); err != nil {
		return nil, err
	}
	// The checksum follows the stream; gob reads no further than it needs.
	want := h.Sum(nil)
	got := make([]byte, len(want))
	if _, err := io.ReadFull(r, got); err != nil || !bytes.Equal(got, want) {
		return nil, fmt.Errorf("%s: checksum", name)
	}
	if _, err := r.ReadByte(); err != io.EOF {
		return nil, fmt.Errorf("%s: bytes after the checksum", name)
	}
	return want, nil
}

// hashReader hashes what is read through it. It is an io.ByteReader, so
// that gob reads no further than each message.
type hashReader struct {
	r *bufio.Reader
	h hash.Hash
}

func (r *hashReader) Read(p []byte) (int, error) {
	n, err := r.r.Read(p)
	r.h.Write(p[:n])
	return n, err
}

func (r *hashReader) ReadByte() (byte, error) {
	b, err := r.r.ReadByte()
	if err == nil {
		r.h.Write([]byte{b})
	}
	return b, err
}

// emptyOf returns the numbers of the slices and maps of e.Kept that are
// empty but not nil, in the order of walkSlices (see entry.Empty).
func emptyOf(e *entry) []int {
	var empty []int
	n := 0
	walkSlices(reflect.ValueOf(&e.Kept), func(v reflect.Value) {
		if v.Len() == 0 && !v.IsNil() {
			empty = append(empty, n)
		}
		n++
	})
	return empty
}

// restoreEmpty makes the slices and maps of e.Kept that were empty when
// written (e.Empty) empty again rather than nil.
func restoreEmpty(e *entry) {
	if len(e.Empty) == 0 {
		return
	}
	n, k := 0, 0
	walkSlices(reflect.ValueOf(&e.Kept), func(v reflect.Value) {
		if k < len(e.Empty) && e.Empty[k] == n {
			k++
			if v.IsNil() && v.CanSet() {
				if v.Kind() == reflect.Map {
					v.Set(reflect.MakeMap(v.Type()))
				} else {
					v.Set(reflect.MakeSlice(v.Type(), 0, 0))
				}
			}
		}
		n++
	})
}

// walkSlices calls visit with every slice and map reachable from v
// through exported fields, pointers and elements, depth first: the same
// order for a value and its copy through gob. Map values are not entered
// (their order is not fixed), nor values of a type that can hold no slice
// or map (see holdsSlices).
func walkSlices(v reflect.Value, visit func(reflect.Value)) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			walkSlices(v.Elem(), visit)
		}
	case reflect.Struct:
		for _, i := range slicedFields(v.Type()) {
			walkSlices(v.Field(i), visit)
		}
	case reflect.Slice:
		visit(v)
		if holdsSlices(v.Type().Elem()) {
			for i := range v.Len() {
				walkSlices(v.Index(i), visit)
			}
		}
	case reflect.Array:
		if holdsSlices(v.Type().Elem()) {
			for i := range v.Len() {
				walkSlices(v.Index(i), visit)
			}
		}
	case reflect.Map:
		visit(v)
	}
}

// holdsSlices reports whether a value of type t can hold a slice or map
// that walkSlices visits (an interface might); known once per type.
func holdsSlices(t reflect.Type) bool {
	if v, ok := slicesByType.Load(t); ok {
		return v.(bool)
	}
	has := typeHoldsSlices(t, map[reflect.Type]bool{})
	slicesByType.Store(t, has)
	return has
}

var slicesByType sync.Map // reflect.Type → bool, see holdsSlices

// slicedFields returns the numbers of the exported fields of the struct
// type t that can hold a slice or map (see holdsSlices); known once per
// type.
func slicedFields(t reflect.Type) []int {
	if v, ok := fieldsByType.Load(t); ok {
		return v.([]int)
	}
	var fields []int
	for i := range t.NumField() {
		if f := t.Field(i); f.IsExported() && holdsSlices(f.Type) {
			fields = append(fields, i)
		}
	}
	fieldsByType.Store(t, fields)
	return fields
}

var fieldsByType sync.Map // reflect.Type → []int, see slicedFields

// typeHoldsSlices is holdsSlices without the memo; seen are the types
// being looked at, whose every other path is looked at where they were
// first met.
func typeHoldsSlices(t reflect.Type, seen map[reflect.Type]bool) bool {
	if seen[t] {
		return false
	}
	seen[t] = true
	switch t.Kind() {
	case reflect.Slice, reflect.Map, reflect.Interface:
		return true
	case reflect.Pointer, reflect.Array:
		return typeHoldsSlices(t.Elem(), seen)
	case reflect.Struct:
		for i := range t.NumField() {
			if f := t.Field(i); f.IsExported() && typeHoldsSlices(f.Type, seen) {
				return true
			}
		}
	}
	return false
}

func randomID() string {
	var b [6]byte
	rand.Read(b[:])
	return hex.EncodeToString(b[:])
}

// cachedSummary returns the summary of m kept in e.
func cachedSummary(m *library.Material, e *entry) *evaluate.Summary {
	k := e.Kept
	s := &evaluate.Summary{Material: m, Figures: k.Figures, Verdicts: k.Verdicts, Inputs: k.Inputs, Warnings: k.Warnings}
	if s.Verdicts == nil {
		s.Verdicts = []datasheet.Verdict{}
	}
	return s
}
