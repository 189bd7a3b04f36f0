package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
)

// This file holds the CLI's only ways to read input files and to write
// output files:
//
//   - every input is read by readInputFile (a path on the command line) or
//     through inputFS (a library folder): only regular files are opened, and
//     none larger than --max-file-size (default 64 MiB), so that a named pipe
//     cannot block a render and a huge file cannot take gigabytes;
//   - every output file is written by writeFileAtomic: a temporary file in
//     the same folder, synced, then renamed over the target, so that a full
//     disk or a crash leaves the old file or the new one, never a truncated
//     one; refuseOverwrite keeps an output from replacing one of the inputs.

// defaultMaxFileSize is the largest input file read unless --max-file-size
// says otherwise: about 40 times the size of a 1 nm, 250–2500 nm spectrum
// with uncertainties (common practice, no source).
const defaultMaxFileSize = 64 << 20

var (
	// errTooLarge is matched by the error for a file above --max-file-size.
	errTooLarge = errors.New("file larger than --max-file-size")
	// errNotRegular is matched by the error for a named pipe, device,
	// socket or folder given where a file is read.
	errNotRegular = errors.New("not a regular file")
)

// tooLargeError is a file above the size limit; size is -1 when the file
// grew while it was read.
type tooLargeError struct{ size, limit int64 }

func (e *tooLargeError) Error() string {
	if e.size < 0 {
		return fmt.Sprintf("the file grew beyond the limit of %s while it was read; raise the limit with --max-file-size", fmtSize(e.limit))
	}
	return fmt.Sprintf("the file is %s, above the limit of %s; raise the limit with --max-file-size", fmtSize(e.size), fmtSize(e.limit))
}

func (e *tooLargeError) Is(target error) bool { return target == errTooLarge }

// notRegularError is a file of mode m that is not a regular file.
type notRegularError struct{ mode fs.FileMode }

func (e *notRegularError) Error() string {
	kind := "a special file"
	switch m := e.mode; {
	case m&fs.ModeNamedPipe != 0:
		kind = "a named pipe"
	case m&fs.ModeSocket != 0:
		kind = "a socket"
	case m&fs.ModeDevice != 0:
		kind = "a device"
	case m.IsDir():
		kind = "a folder"
	}
	return kind + ", not a regular file; only regular files are read"
}

func (e *notRegularError) Is(target error) bool { return target == errNotRegular }

// sizeFlag is a flag holding a size in bytes, written as a number with an
// optional unit: B, KiB, MiB, GiB (K, M, G and KB, MB, GB mean the same
// binary units).
type sizeFlag struct{ n *int64 }

func (f sizeFlag) String() string {
	if f.n == nil {
		return ""
	}
	return fmtSize(*f.n)
}

func (f sizeFlag) Set(s string) error {
	t := strings.ToUpper(strings.TrimSpace(s))
	mult := int64(1)
	for _, u := range []struct {
		suffix string
		mult   int64
	}{{"GIB", 1 << 30}, {"MIB", 1 << 20}, {"KIB", 1 << 10}, {"GB", 1 << 30}, {"MB", 1 << 20}, {"KB", 1 << 10}, {"G", 1 << 30}, {"M", 1 << 20}, {"K", 1 << 10}, {"B", 1}} {
		if strings.HasSuffix(t, u.suffix) {
			t, mult = strings.TrimSpace(strings.TrimSuffix(t, u.suffix)), u.mult
			break
		}
	}
	x, err := strconv.ParseFloat(t, 64)
	if err != nil || !(x > 0) || x*float64(mult) > 1<<50 {
		return fmt.Errorf("%q: want a positive size such as 64MiB or 1GiB", s)
	}
	*f.n = int64(x * float64(mult))
	return nil
}

// maxFileSizeFlag adds --max-file-size to a verb that reads input files.
func maxFileSizeFlag(fl *flag.FlagSet) *int64 {
	n := int64(defaultMaxFileSize)
	fl.Var(sizeFlag{&n}, "max-file-size", "largest input file read, e.g. 64MiB or 1GiB; larger files are refused before they are read")
	return &n
}

// fmtSize writes a size in the largest binary unit that keeps it above 1,
// with at most two decimals.
func fmtSize(n int64) string {
	for _, u := range []struct {
		name string
		size int64
	}{{"GiB", 1 << 30}, {"MiB", 1 << 20}, {"KiB", 1 << 10}} {
		if n >= u.size {
			s := strconv.FormatFloat(float64(n)/float64(u.size), 'f', 2, 64)
			return strings.TrimSuffix(strings.TrimRight(s, "0"), ".") + " " + u.name
		}
	}
	return strconv.FormatInt(n, 10) + " B"
}

// limitOrDefault returns limit, or defaultMaxFileSize when it is not
// positive.
func limitOrDefault(limit int64) int64 {
	if limit <= 0 {
		return defaultMaxFileSize
	}
	return limit
}

func tooLarge(size, limit int64) error { return &tooLargeError{size, limit} }

func notRegular(m fs.FileMode) error { return &notRegularError{m} }

// openNonBlocking is the flag set every input is opened with: on a named
// pipe, O_NONBLOCK makes the open return at once instead of waiting for a
// writer, so that the check of the file's type that follows can refuse it.
// It changes nothing for regular files.
const openNonBlocking = os.O_RDONLY | syscall.O_NONBLOCK

// readInputFile reads the file name given on the command line: a regular
// file of at most limit bytes (symbolic links are followed).
func readInputFile(name string, limit int64) ([]byte, error) {
	f, err := os.OpenFile(name, openNonBlocking, 0)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	data, err := readLimited(f, limit)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	return data, nil
}

// readLimited checks that f is a regular file of at most limit bytes (0:
// defaultMaxFileSize) and reads it, never more than limit+1 bytes whatever
// its size claims.
func readLimited(f *os.File, limit int64) ([]byte, error) {
	limit = limitOrDefault(limit)
	st, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if !st.Mode().IsRegular() {
		return nil, notRegular(st.Mode())
	}
	if st.Size() > limit {
		return nil, tooLarge(st.Size(), limit)
	}
	data := make([]byte, 0, st.Size()+1)
	for {
		n, err := f.Read(data[len(data):cap(data)])
		data = data[:len(data)+n]
		if int64(len(data)) > limit {
			return nil, tooLarge(-1, limit)
		}
		if errors.Is(err, io.EOF) {
			return data, nil
		}
		if err != nil {
			return nil, err
		}
		if len(data) == cap(data) {
			data = append(data, 0)[:len(data)] // grow: the file grew since Stat
		}
	}
}

// inputFS is a library folder as a file system that opens only regular
// files of at most limit bytes (folders are opened to be listed). It reads
// through an os.Root, which refuses any path, symbolic links included, that
// leads out of the folder.
//
// An os.Root opens every folder of a path in turn, so a path is reached
// from the folder two levels down (content/CATEGORY) through that folder's
// own os.Root, opened once (for up to maxSubRoots folders) and confined
// like the first: a file of a material folder is then one folder away, not
// three. Close closes them.
type inputFS struct {
	root  *os.Root
	fsys  fs.FS // root.FS(), for Stat and ReadDir
	limit int64

	mu     sync.Mutex
	subs   map[string]*os.Root // by slash path; nil: not a folder that could be opened
	closed bool                // Close was called: the root alone serves
}

// maxSubRoots bounds the folders inputFS keeps open.
const maxSubRoots = 64

func newInputFS(root *os.Root, limit int64) *inputFS {
	return &inputFS{root: root, fsys: root.FS(), limit: limitOrDefault(limit)}
}

// Close closes the folders the file system opened; not its root.
func (f *inputFS) Close() {
	f.mu.Lock()
	defer f.mu.Unlock()
	for _, r := range f.subs {
		if r != nil {
			r.Close()
		}
	}
	f.subs, f.closed = nil, true
}

// at returns the root to reach the valid path name through, and name
// relative to it.
func (f *inputFS) at(name string) (*os.Root, string) {
	i := strings.IndexByte(name, '/')
	if i < 0 {
		return f.root, name
	}
	j := strings.IndexByte(name[i+1:], '/')
	if j < 0 {
		return f.root, name
	}
	dir, rest := name[:i+1+j], name[i+1+j+1:]
	f.mu.Lock()
	defer f.mu.Unlock()
	r, ok := f.subs[dir]
	if !ok {
		if f.closed || len(f.subs) >= maxSubRoots {
			return f.root, name
		}
		r, _ = f.root.OpenRoot(filepath.FromSlash(dir)) // nil when it cannot be
		if f.subs == nil {
			f.subs = map[string]*os.Root{}
		}
		f.subs[dir] = r
	}
	if r == nil {
		return f.root, name
	}
	return r, rest
}

// named gives a path error the path name had in the file system.
func named(err error, name string) error {
	if pe, ok := err.(*fs.PathError); ok {
		return &fs.PathError{Op: pe.Op, Path: name, Err: pe.Err}
	}
	return err
}

func (f *inputFS) Open(name string) (fs.File, error) {
	if !fs.ValidPath(name) {
		return nil, &fs.PathError{Op: "open", Path: name, Err: fs.ErrInvalid}
	}
	r, rel := f.at(name)
	file, err := r.OpenFile(filepath.FromSlash(rel), openNonBlocking, 0)
	if err != nil {
		return nil, named(err, name)
	}
	st, err := file.Stat()
	if err != nil {
		file.Close()
		return nil, named(err, name)
	}
	switch {
	case st.IsDir():
		return file, nil
	case !st.Mode().IsRegular():
		file.Close()
		return nil, &fs.PathError{Op: "open", Path: name, Err: notRegular(st.Mode())}
	case st.Size() > f.limit:
		file.Close()
		return nil, &fs.PathError{Op: "open", Path: name, Err: tooLarge(st.Size(), f.limit)}
	}
	return &limitedFile{File: file, left: f.limit, limit: f.limit}, nil
}

// Stat returns the file information of name without opening it.
func (f *inputFS) Stat(name string) (fs.FileInfo, error) {
	if !fs.ValidPath(name) {
		return nil, &fs.PathError{Op: "stat", Path: name, Err: fs.ErrInvalid}
	}
	r, rel := f.at(name)
	if r == f.root {
		return fs.Stat(f.fsys, name)
	}
	st, err := r.Stat(filepath.FromSlash(rel))
	return st, named(err, name)
}

// ReadDir lists the folder name.
func (f *inputFS) ReadDir(name string) ([]fs.DirEntry, error) {
	if !fs.ValidPath(name) {
		return nil, &fs.PathError{Op: "readdir", Path: name, Err: fs.ErrInvalid}
	}
	r, rel := f.at(name)
	if r == f.root {
		return fs.ReadDir(f.fsys, name)
	}
	es, err := fs.ReadDir(r.FS(), rel)
	return es, named(err, name)
}

// limitedFile fails a read that goes past its limit, in case a file grows
// after it was opened.
type limitedFile struct {
	*os.File
	left, limit int64
}

func (f *limitedFile) Read(p []byte) (int, error) {
	if int64(len(p)) > f.left+1 {
		p = p[:f.left+1]
	}
	n, err := f.File.Read(p)
	f.left -= int64(n)
	if f.left < 0 {
		return 0, tooLarge(-1, f.limit)
	}
	return n, err
}

// writeFileAtomic writes the file name through a temporary file in the same
// folder: write fills it, it is synced and renamed over name, and the folder
// is synced. On any failure (a full disk, a failed write) the temporary file
// is removed and name keeps its old content or stays absent. A symbolic link
// at name is replaced, not written through.
func writeFileAtomic(name string, write func(w io.Writer) error) error {
	return writeThrough(name, write, true)
}

// writeThrough is writeFileAtomic, syncing the file and folder only when
// sync is set (a cache file damaged by a crash is detected and ignored,
// so it need not pay for a sync).
func writeThrough(name string, write func(w io.Writer) error, sync bool) (err error) {
	dir := filepath.Dir(name)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(name)+".tmp-*")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if err := write(tmp); err != nil {
		return fmt.Errorf("writing %s: %w", name, err)
	}
	if err := tmp.Chmod(0o644); err != nil {
		return err
	}
	if sync {
		if err := tmp.Sync(); err != nil {
			return fmt.Errorf("writing %s: %w", name, err)
		}
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("writing %s: %w", name, err)
	}
	if err := os.Rename(tmp.Name(), name); err != nil {
		return err
	}
	if sync {
		syncDir(dir)
	}
	return nil
}

// syncDir makes a rename in dir durable where the system allows it.
func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}

// refuseOverwrite returns a usage error when out is the same file as one of
// inputs (compared by identity, so another name or a link is caught too).
func refuseOverwrite(out string, inputs []string) error {
	ost, err := os.Stat(out)
	if err != nil {
		return nil // absent, or it will fail when written
	}
	for _, in := range inputs {
		if ist, err := os.Stat(in); err == nil && os.SameFile(ost, ist) {
			if filepath.Clean(in) == filepath.Clean(out) {
				return usagef("%s is one of the input files: writing it would destroy it; choose another output", out)
			}
			return usagef("%s is the input file %s under another name: writing it would destroy it; choose another output", out, in)
		}
	}
	return nil
}
