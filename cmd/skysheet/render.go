package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

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

const (
	// siteDir is the folder, inside the library folder, that render writes
	// to unless --site names another.
	siteDir = "site"
	// templatesDir is the library's folder of template overrides.
	templatesDir = "templates"
)

func runRender(e *env, args []string) error {
	fl := newFlags(e, commands["render"])
	out := fl.String("site", "", "folder the site is written to (default: site/ inside the library folder); replaced only when the whole render succeeds")
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
	res, err := renderSite(dir, *out, version(), e.stderr, e.isTerminal)
	if err != nil {
		return reportRenderError(e, err)
	}
	fmt.Fprintf(e.stdout, "rendered %s: %s, %s, %d files in %s\n", dir, plural(res.materials, "material"), plural(res.comparisons, "comparison"), res.files, *out)
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
func loadLibrary(fsys fs.FS) (*library.Library, error) {
	lib, err := library.Load(fsys)
	if err != nil {
		_, evalErr := evaluate.Library(lib, evaluate.Options{}, nil)
		return nil, library.Join(err, evalErr)
	}
	return lib, nil
}

// renderResult counts what a render wrote.
type renderResult struct {
	materials, comparisons, files int
}

// renderSite renders the library in dir into outDir through a temporary
// folder beside outDir, which replaces outDir only when everything
// succeeded. Progress goes to progress: a bar when it is a terminal.
func renderSite(dir, outDir, ver string, progress io.Writer, terminal bool) (renderResult, error) {
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
	// os.Root refuses any path, symbolic links included, that leads out of
	// the library folder.
	fsys := root.FS()
	lib, err := loadLibrary(fsys)
	if err != nil {
		return res, err
	}
	opt := site.Options{Version: ver}
	if st, err := fs.Stat(fsys, templatesDir); err == nil && st.IsDir() {
		opt.Templates, _ = fs.Sub(fsys, templatesDir)
	}
	if terminal && len(lib.Materials) > 0 {
		opt.Progress = func(done, total int) { drawProgress(progress, done, total) }
	}

	parent := filepath.Dir(absOut)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return res, err
	}
	tmp, err := os.MkdirTemp(parent, "."+filepath.Base(absOut)+".rendering-")
	if err != nil {
		return res, err
	}
	committed := false
	defer func() {
		if !committed {
			os.RemoveAll(tmp)
		}
	}()
	if err := os.Chmod(tmp, 0o755); err != nil {
		return res, err
	}
	w := &dirWriter{root: tmp}
	err = site.Render(lib, opt, w)
	if opt.Progress != nil {
		fmt.Fprintln(progress)
	}
	if err != nil {
		return res, err
	}
	if err := replaceDir(tmp, absOut); err != nil {
		return res, err
	}
	committed = true
	return renderResult{materials: len(lib.Materials), comparisons: len(lib.Comparisons), files: w.n}, nil
}

// checkSiteFolder refuses site folders whose replacement would lose data or
// whose pages would be read back: the library itself or a folder holding
// it, a folder inside content/ or templates/, or an existing folder that is
// not a site rendered before.
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
	st, err := os.Stat(absOut)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return err
	case !st.IsDir():
		return usagef("site folder %s exists and is not a folder", absOut)
	}
	entries, err := os.ReadDir(absOut)
	if err != nil {
		return err
	}
	if len(entries) == 0 {
		return nil
	}
	if _, err := os.Stat(filepath.Join(absOut, "catalog.json")); err != nil {
		return usagef("site folder %s is not empty and holds no catalog.json: refusing to replace a folder that is not a rendered site", absOut)
	}
	return nil
}

// replaceDir puts the folder tmp in place of out: out is moved aside, tmp
// renamed to out, and the old folder removed. If the second rename fails,
// the old folder is put back.
func replaceDir(tmp, out string) error {
	old := ""
	if _, err := os.Lstat(out); err == nil {
		o, err := os.MkdirTemp(filepath.Dir(out), "."+filepath.Base(out)+".old-")
		if err != nil {
			return err
		}
		if err := os.Remove(o); err != nil {
			return err
		}
		if err := os.Rename(out, o); err != nil {
			return err
		}
		old = o
	}
	if err := os.Rename(tmp, out); err != nil {
		if old != "" {
			os.Rename(old, out)
		}
		return err
	}
	if old != "" {
		return os.RemoveAll(old)
	}
	return nil
}

// dirWriter writes site files below a folder.
type dirWriter struct {
	root string
	n    int
}

// failAfter, when positive, makes the n-th write fail (tests of atomicity).
var failAfter int

var errInjected = errors.New("injected write failure")

func (w *dirWriter) WriteFile(name string, data []byte) error {
	if !fs.ValidPath(name) {
		return fmt.Errorf("site file %q: invalid path", name)
	}
	w.n++
	if failAfter > 0 && w.n >= failAfter {
		return errInjected
	}
	p := filepath.Join(w.root, filepath.FromSlash(name))
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		return err
	}
	return os.WriteFile(p, data, 0o644)
}

// drawProgress draws a one-line progress bar.
func drawProgress(w io.Writer, done, total int) {
	const width = 30
	n := width * done / total
	fmt.Fprintf(w, "\r[%s%s] %d/%d materials", strings.Repeat("#", n), strings.Repeat(" ", width-n), done, total)
}
