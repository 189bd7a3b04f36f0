package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"skysheet/datasheet/library"
	"skysheet/datasheet/site"
)

func init() {
	register(&command{
		name:    "build",
		args:    "[DIR]",
		summary: "build the library in DIR (default .) into a static website",
		run:     runBuild,
	})
}

func runBuild(e *env, args []string) error {
	fl := newFlags(e, commands["build"])
	out := fl.String("o", "public", "output folder; replaced only when the whole build succeeds")
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
	res, err := buildSite(dir, *out, version(), e.stderr, e.isTerminal)
	if err != nil {
		return reportBuildError(e, err)
	}
	fmt.Fprintf(e.stdout, "built %s: %s, %s, %d files in %s\n", dir, plural(res.materials, "material"), plural(res.comparisons, "comparison"), res.files, *out)
	return nil
}

// reportBuildError prints every problem of a failed build, one per line.
func reportBuildError(e *env, err error) error {
	var es library.Errors
	var ue *usageError
	switch {
	case errors.As(err, &ue):
		return err
	case errors.As(err, &es):
		fmt.Fprintf(e.stderr, "skysheet build: %s; nothing was written:\n", plural(len(es), "problem"))
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

// buildResult counts what a build wrote.
type buildResult struct {
	materials, comparisons, files int
}

// buildSite builds the library in dir into outDir through a temporary
// folder beside outDir, which replaces outDir only when everything
// succeeded. Progress goes to progress: a bar when it is a terminal.
func buildSite(dir, outDir, ver string, progress io.Writer, terminal bool) (buildResult, error) {
	var res buildResult
	absDir, err := filepath.Abs(dir)
	if err != nil {
		return res, err
	}
	absOut, err := filepath.Abs(outDir)
	if err != nil {
		return res, err
	}
	if err := checkOutput(absDir, absOut); err != nil {
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
	lib, err := library.Load(fsys)
	if err != nil {
		return res, err
	}
	opt := site.Options{Version: ver}
	if st, err := fs.Stat(fsys, "templates"); err == nil && st.IsDir() {
		opt.Templates, _ = fs.Sub(fsys, "templates")
	}
	if terminal && len(lib.Materials) > 0 {
		opt.Progress = func(done, total int) { drawProgress(progress, done, total) }
	}

	parent := filepath.Dir(absOut)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return res, err
	}
	tmp, err := os.MkdirTemp(parent, "."+filepath.Base(absOut)+".building-")
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
	err = site.Build(lib, opt, w)
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
	return buildResult{materials: len(lib.Materials), comparisons: len(lib.Comparisons), files: w.n}, nil
}

// checkOutput refuses output folders whose replacement would lose data:
// the library itself or a folder holding it, a folder inside content/, or
// an existing folder that is not a site built before.
func checkOutput(absDir, absOut string) error {
	within := func(p, dir string) bool {
		rel, err := filepath.Rel(dir, p)
		return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
	}
	if within(absDir, absOut) {
		return usagef("output folder %s holds the library: choose another -o", absOut)
	}
	if within(absOut, filepath.Join(absDir, library.ContentDir)) {
		return usagef("output folder %s is inside %s/: its pages would be read as content next time", absOut, library.ContentDir)
	}
	st, err := os.Stat(absOut)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return err
	case !st.IsDir():
		return usagef("output %s exists and is not a folder", absOut)
	}
	entries, err := os.ReadDir(absOut)
	if err != nil {
		return err
	}
	if len(entries) == 0 {
		return nil
	}
	if _, err := os.Stat(filepath.Join(absOut, "catalog.json")); err != nil {
		return usagef("output folder %s is not empty and holds no catalog.json: refusing to replace a folder that is not a built site", absOut)
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
