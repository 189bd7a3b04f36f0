package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"os/signal"
	"path/filepath"
	"runtime/debug"
	"strings"
	"sync"
	"sync/atomic"
	"syscall"
	"time"

	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/datasheet/site"
)

func init() {
	register(&command{
		name:    "render",
		args:    "[DIR]",
		summary: "render the spectra and Markdown of the library in DIR (default .) into a static site of datasheets",
		run:     runRender,
	})
}

// renderMemoryLimit is the soft memory limit of a render. A render keeps
// only a small summary per material, but the garbage collector would let
// the heap grow to twice what is live; near this limit it collects sooner
// instead. It is not a cap: a library whose summaries need more gets more,
// at some cost in time. GOMEMLIMIT, when set, replaces it.
const renderMemoryLimit = 384 << 20

// renderGCPercent lets the heap of a render grow to five times what is
// live before a collection, instead of twice: a render allocates much and
// keeps little, and with the memory limit above bounding the heap, fewer
// collections cost less time (a 1,000-material render: about 14 % less
// CPU, 170–190 MiB peak instead of 85). GOGC, when set, replaces it.
const renderGCPercent = 400

const (
	// siteDir is the folder, inside the library folder, that render writes
	// to unless --site names another.
	siteDir = "site"
	// templatesDir is the library's folder of template overrides.
	templatesDir = "templates"
)

func runRender(e *env, args []string) error {
	fl := newFlags(e, commands["render"])
	out := fl.String("site", "", "folder the site is written to (default: site/ inside the library folder); its files are replaced only when the whole render succeeds, and files skysheet did not write are kept")
	noCache := fl.Bool("no-cache", false, "neither read nor write the render cache ("+cacheDir+"/ in the library folder); every material is evaluated afresh")
	maxSize := maxFileSizeFlag(fl)
	pos, err := parseFlags(fl, args)
	if err != nil {
		return err
	}
	if len(pos) > 1 {
		return usagef("one library folder at most, got %d", len(pos))
	}
	dir := "."
	if len(pos) == 1 {
		dir = pos[0]
	}
	if *out == "" {
		*out = filepath.Join(dir, siteDir)
	}
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(renderMemoryLimit)
	}
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(renderGCPercent)
	}
	// Ctrl-C or a termination request stops the render: the unfinished site
	// is removed and the old one stays as it was.
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	res, err := renderInto(ctx, dir, *out, renderOptions{version: version(), progress: e.stderr, terminal: e.isTerminal, maxSize: *maxSize, cache: !*noCache})
	if err != nil {
		return reportRenderError(e, err)
	}
	reused := ""
	if res.reused > 0 {
		reused = fmt.Sprintf(" (%d unchanged, from the cache)", res.reused)
	}
	fmt.Fprintf(e.stdout, "rendered %s: %s%s, %s, %d files in %s\n", dir, plural(res.materials, "material"), reused, plural(res.comparisons, "comparison"), res.files, *out)
	return nil
}

// reportRenderError prints every problem of a failed render, one per line.
func reportRenderError(e *env, err error) error {
	var es library.Errors
	var ue *usageError
	switch {
	case errors.As(err, &ue):
		return err
	case errors.As(err, &es):
		fmt.Fprintf(e.stderr, "skysheet render: %s; nothing was written:\n", plural(len(es), "problem"))
		for _, x := range es {
			fmt.Fprintf(e.stderr, "  %v\n", x)
		}
		return errSilentFailure
	}
	return err
}

func plural(n int, what string) string {
	if n == 1 {
		return "1 " + what
	}
	return fmt.Sprintf("%d %ss", n, what)
}

// loadLibrary reads the library in fsys for rendering. When some files
// are bad, the materials that could be read are evaluated all the same, so
// that the problems of their spectra are reported with the rest, in file
// order.
func loadLibrary(fsys fs.FS, fc *library.FrontCache) (*library.Library, error) {
	lib, err := library.LoadWith(fsys, fc)
	if err != nil {
		_, evalErr := evaluate.Library(lib, evaluate.Options{}, nil)
		return nil, library.Join(err, evalErr)
	}
	return lib, nil
}

// renderResult counts what a render wrote.
type renderResult struct {
	materials, comparisons, files int
	reused                        int // materials taken from the cache
	fronts                        int // Markdown files whose front matter came from the cache
}

// renderOptions are the settings of one render.
type renderOptions struct {
	version  string
	progress io.Writer // progress and notes; a bar when terminal is set
	terminal bool
	maxSize  int64 // largest input file read; 0 means defaultMaxFileSize
	cache    bool  // use the render cache in the library folder
}

// renderSite renders the library in dir into outDir (see renderInto).
func renderSite(dir, outDir, ver string, progress io.Writer, terminal bool) (renderResult, error) {
	return renderInto(context.Background(), dir, outDir, renderOptions{version: ver, progress: progress, terminal: terminal})
}

// errInterrupted is returned by a render stopped by a signal.
var errInterrupted = errors.New("interrupted")

// renderInto renders the library in dir into the site folder outDir under
// the rules of sitedir.go: it takes the folder's lock, finishes or cleans up
// what an interrupted render left, renders into a hidden sibling folder and
// swaps the new files in only when everything succeeded. When ctx is done
// before the swap, the unfinished site is removed, the old one is left as
// it was and the error wraps errInterrupted.
func renderInto(ctx context.Context, dir, outDir string, o renderOptions) (renderResult, error) {
	var res renderResult
	absDir, err := filepath.Abs(dir)
	if err != nil {
		return res, err
	}
	absOut, err := filepath.Abs(outDir)
	if err != nil {
		return res, err
	}
	if err := checkSiteFolder(absDir, absOut); err != nil {
		return res, err
	}
	root, err := os.OpenRoot(absDir)
	if err != nil {
		return res, usagef("library folder: %v", err)
	}
	defer root.Close()
	names := namesOf(absOut)
	if err := os.MkdirAll(names.parent, 0o755); err != nil {
		return res, err
	}
	unlock, err := lockSite(absOut)
	if err != nil {
		return res, err
	}
	defer unlock()
	if err := recoverSite(absOut, o.progress); err != nil {
		return res, err
	}
	prev, err := checkOutput(absOut)
	if err != nil {
		return res, err
	}

	id := newID()
	tmp := names.temp("new", id)
	if err := os.Mkdir(tmp, 0o755); err != nil {
		return res, err
	}
	w := &dirWriter{root: tmp, site: absOut, prev: prev}
	committed := false
	defer func() {
		if !committed {
			w.stop()
			os.RemoveAll(tmp)
		}
	}()
	// The library is read and rendered in a goroutine, so that a signal
	// stops the render at once, even while the library is being read; once
	// w is stopped the goroutine writes nothing more.
	type result struct {
		lib    *library.Library
		reused cacheUse
		err    error
	}
	done := make(chan result, 1)
	cached := make(chan struct{})
	go func() {
		defer close(cached)
		lib, reused, finish, err := renderLibrary(root, absDir, w, o)
		done <- result{lib, reused, err}
		finish()
	}()
	var r result
	select {
	case r = <-done:
		// The render cache is committed while the site is put in place;
		// the render returns once both are done.
		defer func() { <-cached }()
	case <-ctx.Done():
		return res, fmt.Errorf("%w: the site in %s was left as it was", errInterrupted, absOut)
	}
	if r.err != nil {
		return res, r.err
	}
	files := w.written()
	if err := checkKept(absOut, prev, files); err != nil {
		return res, err
	}
	if err := writeFileAtomic(filepath.Join(tmp, siteMarker), func(f io.Writer) error {
		_, err := f.Write(encodeMarker(o.version, files))
		return err
	}); err != nil {
		return res, err
	}
	if ctx.Err() != nil {
		return res, fmt.Errorf("%w: the site in %s was left as it was", errInterrupted, absOut)
	}
	// The commit: from here on the new site is put in place, by this run or,
	// after a crash, by the next one.
	commit := names.temp("commit", id)
	if err := os.Rename(tmp, commit); err != nil {
		return res, err
	}
	committed = true
	if err := hook("commit"); err != nil {
		return res, err
	}
	if err := install(commit, absOut); err != nil {
		return res, fmt.Errorf("putting the new site in place: %w (the next render finishes this)", err)
	}
	return renderResult{materials: len(r.lib.Materials), comparisons: len(r.lib.Comparisons), files: len(files), reused: r.reused.materials, fronts: r.reused.fronts}, nil
}

// cacheUse counts what a render took from the render cache.
type cacheUse struct {
	materials int // materials
	fronts    int // front matter of Markdown files
}

// renderLibrary reads the library below root, whose path is absDir, and
// renders it through w. It returns the library, what it took from the
// render cache, and a function to call next: it commits the render cache
// after a render that succeeded (the cache does not rest on the site:
// committing it before the site is in place loses nothing if that fails)
// and releases the cache.
func renderLibrary(root *os.Root, absDir string, w *dirWriter, o renderOptions) (*library.Library, cacheUse, func(), error) {
	fsys := newInputFS(root, o.maxSize)
	defer fsys.Close()
	opt := site.Options{Version: o.version}
	release := func() {}
	finish := func() { release() }
	var opening sync.WaitGroup
	opened := false
	if st, err := os.Stat(filepath.Join(absDir, cacheDir)); o.cache && err == nil && st.IsDir() {
		// An existing cache is opened (the build identified, the lock
		// taken) and its index read while the library is.
		opened = true
		opening.Go(func() {
			opt.Cache, release = openRenderCache(absDir, o.progress)
			if opt.Cache != nil {
				opt.Cache.Prefetch()
			}
		})
	}
	var fc *library.FrontCache // the front matter the last render kept
	if o.cache {
		fc = frontCacheOf(absDir)
	}
	lib, err := loadLibrary(fsys, fc)
	opening.Wait()
	if err != nil {
		return nil, cacheUse{}, finish, err
	}
	if o.cache && !opened {
		// Made once the library is read: a library that cannot be read
		// gets no cache folder.
		opt.Cache, release = openRenderCache(absDir, o.progress)
	}
	if st, err := fs.Stat(fsys, templatesDir); err == nil && st.IsDir() {
		opt.Templates, _ = fs.Sub(fsys, templatesDir)
	}
	if o.terminal && len(lib.Materials) > 0 {
		opt.Progress = func(done, total int) { drawProgress(o.progress, done, total) }
	}
	err = site.Render(lib, opt, w)
	if opt.Progress != nil {
		fmt.Fprintln(o.progress)
	}
	if err != nil || opt.Cache == nil {
		return lib, cacheUse{}, finish, err
	}
	use := cacheUse{materials: opt.Cache.Hits()}
	if fc != nil {
		use.fronts = fc.Hits()
	}
	// The index of the cache names the entries of renders that succeeded
	// only.
	return lib, use, func() {
		closeRenderCache(opt.Cache, fc, absDir, o.progress)
		release()
	}, nil
}

// checkSiteFolder refuses site folders whose replacement would lose data or
// whose pages would be read back: the library itself or a folder holding
// it, a folder inside content/ or templates/. checkOutput refuses existing
// folders that are not sites rendered before.
func checkSiteFolder(absDir, absOut string) error {
	within := func(p, dir string) bool {
		rel, err := filepath.Rel(dir, p)
		return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
	}
	if within(absDir, absOut) {
		return usagef("site folder %s holds the library: choose another --site", absOut)
	}
	if within(absOut, filepath.Join(absDir, library.ContentDir)) {
		return usagef("site folder %s is inside %s/: its pages would be read as content next time", absOut, library.ContentDir)
	}
	if within(absOut, filepath.Join(absDir, templatesDir)) {
		return usagef("site folder %s is inside %s/: its pages would be read as templates next time", absOut, templatesDir)
	}
	if within(absOut, filepath.Join(absDir, cacheDir)) {
		return usagef("site folder %s is inside %s/, the render cache, which renders prune: choose another --site", absOut, cacheDir)
	}
	return nil
}

// dirWriter writes site files below a folder, one at a time, and records
// their names. Once stopped, it writes nothing more.
type dirWriter struct {
	root string
	site string          // the site folder the files will replace, which may not exist
	prev map[string]bool // the files of the site the last render wrote (its marker)

	mu      sync.Mutex
	files   []string
	stopped bool
	made    map[string]bool // folders known to exist below root
}

// failAfter, when positive, makes the n-th write fail (tests of atomicity).
// Atomic, as writeHook: an interrupted render's goroutine may still write
// (and fail) after the command returned and a test reset it.
var failAfter atomic.Int64

// writeHook, when set, is called before each write with the writer and the
// number of the write (tests of interruption).
var writeHook atomic.Pointer[func(w *dirWriter, n int)]

var errInjected = errors.New("injected write failure")

// WriteFile puts data in place as name. When the last render wrote that
// file with the same bytes, nothing is written: the file stays where it
// is, and the swap keeps it since it is among the files written. A
// re-render thus writes only what changed.
func (w *dirWriter) WriteFile(name string, data []byte) error {
	if w.prev[name] && holds(filepath.Join(w.site, filepath.FromSlash(name)), data) {
		return w.put(name, nil)
	}
	return w.put(name, func(p string) error { return os.WriteFile(p, data, 0o644) })
}

// holds reports whether p is a regular file (not a link) holding data.
func holds(p string, data []byte) bool {
	st, err := os.Lstat(p)
	if err != nil || !st.Mode().IsRegular() || st.Size() != int64(len(data)) {
		return false
	}
	f, err := os.Open(p)
	if err != nil {
		return false
	}
	defer f.Close()
	if fst, err := f.Stat(); err != nil || !os.SameFile(st, fst) {
		return false
	}
	var buf [32 << 10]byte
	for len(data) > 0 {
		n, err := io.ReadFull(f, buf[:min(len(buf), len(data))])
		if err != nil || !bytes.Equal(buf[:n], data[:n]) {
			return false
		}
		data = data[n:]
	}
	n, _ := f.Read(buf[:1])
	return n == 0
}

// LinkFile puts the file at src (in the render cache) in place as name:
// a hard link when the site and the cache share a file system, else a
// copy, given the modification time of src. When the file the last render
// wrote as name is that very file (a link to src), or a copy of it (a
// regular file of the size and modification time of src: a change to
// either file moves its time), nothing is written: the file stays where it
// is, and the swap keeps it since it is among the files written.
func (w *dirWriter) LinkFile(name, src string, srcInfo fs.FileInfo) error {
	if k, ok := srcInfo.(keptInfo); ok && k.name == name {
		// KeptFile's, which the cache found to be its very copy.
		return w.put(name, nil)
	}
	if srcInfo == nil {
		srcInfo, _ = os.Stat(src) // nil on error
	}
	if w.prev[name] && srcInfo != nil { // else there is no such file to keep (see checkKept)
		st, err := os.Lstat(filepath.Join(w.site, filepath.FromSlash(name)))
		if err == nil && (os.SameFile(st, srcInfo) || (st.Mode().IsRegular() && st.Size() == srcInfo.Size() && st.ModTime().Equal(srcInfo.ModTime()))) {
			return w.put(name, nil)
		}
	}
	return w.put(name, func(p string) error {
		if linkFile(src, p) == nil {
			return nil
		}
		data, err := os.ReadFile(src)
		if err != nil {
			return err
		}
		if err := os.WriteFile(p, data, 0o644); err != nil {
			return err
		}
		if srcInfo != nil && int64(len(data)) == srcInfo.Size() {
			return os.Chtimes(p, time.Time{}, srcInfo.ModTime())
		}
		return nil
	})
}

// KeptFile returns what is at name in the site now (not following a
// link), when the last render wrote that file; else nil. Given back to
// LinkFile as the source's information, it keeps the file where it is.
func (w *dirWriter) KeptFile(name string) fs.FileInfo {
	if !w.prev[name] {
		return nil
	}
	st, err := os.Lstat(filepath.Join(w.site, filepath.FromSlash(name)))
	if err != nil {
		return nil
	}
	return keptInfo{st, name}
}

// keptInfo is what KeptFile found at name.
type keptInfo struct {
	fs.FileInfo
	name string
}

// linkFile makes a hard link (a variable for the tests of copies).
var linkFile = os.Link

// put records the site file name and, unless write is nil, makes its
// folder and calls write with its path.
func (w *dirWriter) put(name string, write func(path string) error) error {
	if !fs.ValidPath(name) || name == siteMarker {
		return fmt.Errorf("site file %q: invalid path", name)
	}
	if hook := writeHook.Load(); hook != nil {
		(*hook)(w, len(w.written())+1)
	}
	w.mu.Lock()
	defer w.mu.Unlock()
	if w.stopped {
		return errInterrupted
	}
	w.files = append(w.files, name)
	if n := failAfter.Load(); n > 0 && int64(len(w.files)) >= n {
		return errInjected
	}
	if write == nil {
		return nil
	}
	p := filepath.Join(w.root, filepath.FromSlash(name))
	if dir := filepath.Dir(p); !w.made[dir] {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return err
		}
		if w.made == nil {
			w.made = map[string]bool{}
		}
		w.made[dir] = true
	}
	return write(p)
}

// stop makes every later write fail and waits for a write under way.
func (w *dirWriter) stop() {
	w.mu.Lock()
	w.stopped = true
	w.mu.Unlock()
}

// isStopped reports whether stop was called.
func (w *dirWriter) isStopped() bool {
	w.mu.Lock()
	defer w.mu.Unlock()
	return w.stopped
}

// written returns the names written so far.
func (w *dirWriter) written() []string {
	w.mu.Lock()
	defer w.mu.Unlock()
	return append([]string(nil), w.files...)
}

// drawProgress draws a one-line progress bar.
func drawProgress(w io.Writer, done, total int) {
	w = rawWriter(w) // its carriage return is meant
	const width = 30
	n := width * done / total
	fmt.Fprintf(w, "\r[%s%s] %d/%d materials", strings.Repeat("#", n), strings.Repeat(" ", width-n), done, total)
}
