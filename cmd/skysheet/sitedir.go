package main

import (
	"bufio"
	"bytes"
	"crypto/rand"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"
)

// The site folder that render writes is handled by the rules below; they are
// stated for users in docs/library.md ("The site folder").
//
// Marker. A folder rendered by skysheet holds siteMarker, which lists every
// file the render wrote. A render writes only into a folder that is absent,
// empty or marked; anything else is refused (a folder without a marker may
// be a checkout, notes, another program's output).
//
// What is kept. A render replaces the files listed in the marker and
// deletes those of them it no longer writes. Every other file is kept: the
// names in keptNames always (a gh-pages checkout's .git/, CNAME,
// .nojekyll), and every file the marker does not list. A render that would
// write over a file it did not write stops before changing anything.
//
// Swap. The new site is rendered into a hidden sibling folder
// ".SITE.new-ID". When it is complete, with its marker, it is renamed
// ".SITE.commit-ID": that rename is the commit. Then the old site's files
// that the new one no longer has are deleted, the new files are moved in
// one by one (each a rename, which replaces a file atomically), the new
// marker last, and the emptied commit folder is removed. A crash before the
// commit leaves the old site untouched; a crash after it leaves a commit
// folder, and the next render finishes the move before it starts (roll
// forward: the moves only ever bring in new files, so doing them again is
// harmless). At no moment is there no site at the path.
//
// Why not a single rename of the whole folder: the folder may be a git
// checkout holding files of its own, which must stay where they are; and a
// symbolic link swapped into place would turn such a folder into a link.
//
// Lock. ".SITE.lock", created with O_EXCL beside the site folder and holding
// the process id, keeps two renders into one folder from interleaving. A
// lock whose process is gone is stale and is broken by the next render.

// siteMarker is the file, at the top of a rendered site, that marks it and
// lists the files the render wrote.
const siteMarker = ".skysheet-site"

// keptNames are top-level names of a site folder that a render never
// deletes or writes, whatever the marker says.
var keptNames = map[string]bool{".git": true, "CNAME": true, ".nojekyll": true}

// errSiteLocked is wrapped by the error for a site folder another render is
// writing.
var errSiteLocked = errors.New("another render is writing this site folder")

// errNotSite is wrapped by the error for a non-empty folder without a marker.
var errNotSite = errors.New("is not empty and was not rendered by skysheet")

// errKeptFile is wrapped by the error for a render that would write over a
// file it did not write.
var errKeptFile = errors.New("was not written by skysheet")

// markerHeader is the first line of a marker.
const markerHeader = "# skysheet site: the files listed below were written by skysheet and are replaced or deleted by its next render; every other file in this folder is kept."

// encodeMarker returns a marker listing files, sorted.
func encodeMarker(ver string, files []string) []byte {
	sorted := append([]string(nil), files...)
	sort.Strings(sorted)
	var b bytes.Buffer
	fmt.Fprintf(&b, "%s\n# written by skysheet %s\n", markerHeader, ver)
	for _, f := range sorted {
		b.WriteString(f)
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// readMarker reads the marker of the site folder out. It returns nil and no
// error when there is none.
func readMarker(out string) (map[string]bool, error) {
	data, err := os.ReadFile(filepath.Join(out, siteMarker))
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	files := map[string]bool{}
	sc := bufio.NewScanner(bytes.NewReader(data))
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSuffix(sc.Text(), "\r")
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		if !fs.ValidPath(line) || line == "." || line == siteMarker {
			return nil, fmt.Errorf("%s:%d: %q is not a file path inside the site folder; delete the line or the marker", filepath.Join(out, siteMarker), n, line)
		}
		files[line] = true
	}
	return files, sc.Err()
}

// checkOutput returns the files an earlier render wrote into the site folder
// out, which may be absent or empty. A folder that holds files but no marker
// is refused.
func checkOutput(out string) (map[string]bool, error) {
	st, err := os.Stat(out)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return map[string]bool{}, nil
	case err != nil:
		return nil, err
	case !st.IsDir():
		return nil, usagef("site folder %s exists and is not a folder", out)
	}
	prev, err := readMarker(out)
	if err != nil || prev != nil {
		return prev, err
	}
	entries, err := os.ReadDir(out)
	if err != nil {
		return nil, err
	}
	if len(entries) > 0 {
		return nil, fmt.Errorf("site folder %s %w (it holds no %s): refusing to write into it. Choose a new or empty folder with --site; or, to render into this folder and keep every file it holds now (a gh-pages checkout, say), create an empty file %s first", out, errNotSite, siteMarker, filepath.Join(out, siteMarker))
	}
	return map[string]bool{}, nil
}

// topName returns the first element of a slash path.
func topName(p string) string {
	top, _, _ := strings.Cut(p, "/")
	return top
}

// checkKept returns an error when the new site's files would replace a file
// of out that the last render did not write (prev) or a kept name.
func checkKept(out string, prev map[string]bool, files []string) error {
	_, err := os.Lstat(out)
	fresh := errors.Is(err, fs.ErrNotExist) // no folder, no file to look for
	for _, f := range files {
		if keptNames[topName(f)] {
			return fmt.Errorf("the site would hold %s, a name skysheet keeps untouched in the site folder", f)
		}
		if prev[f] || fresh {
			continue
		}
		if _, err := os.Lstat(filepath.Join(out, filepath.FromSlash(f))); err == nil {
			return fmt.Errorf("%s %w and is not listed in %s: refusing to replace it; move it away, or list it in the marker to let skysheet replace it", filepath.Join(out, filepath.FromSlash(f)), errKeptFile, siteMarker)
		}
	}
	return nil
}

// siteNames are the hidden names used beside the site folder out.
type siteNames struct {
	parent, base string
}

func namesOf(out string) siteNames {
	return siteNames{parent: filepath.Dir(out), base: filepath.Base(out)}
}

func (n siteNames) lock() string { return filepath.Join(n.parent, "."+n.base+".lock") }

// temp returns the path of the hidden sibling folder of a render in the
// given state ("new" or "commit") and id.
func (n siteNames) temp(state, id string) string {
	return filepath.Join(n.parent, "."+n.base+"."+state+"-"+id)
}

// newID returns a random id for temporary names.
func newID() string {
	var b [6]byte
	rand.Read(b[:])
	return hex.EncodeToString(b[:])
}

// swapHook, when set, is called before each step of installing a committed
// site ("commit", then "delete" and "move" once per file, then "marker");
// an error it returns stops the install there, as a crash would (tests of
// recovery).
var swapHook func(step string) error

func hook(step string) error {
	if swapHook == nil {
		return nil
	}
	return swapHook(step)
}

// install puts the committed site folder commit in place of the site folder
// out. It may be called again on the same folders after a crash and then
// finishes the work.
func install(commit, out string) error {
	if _, err := os.Lstat(out); errors.Is(err, fs.ErrNotExist) {
		// A render leaves in place the files of the site that it would
		// write again unchanged (see dirWriter.LinkFile): without the site,
		// the commit folder alone is not the whole site.
		if err := checkWhole(commit); err != nil {
			return err
		}
		if err := os.Rename(commit, out); err != nil {
			return err
		}
		syncDir(filepath.Dir(out))
		return nil
	}
	prev, err := readMarker(out)
	if err != nil {
		return err
	}
	next, err := readMarker(commit)
	if err != nil {
		return err
	}
	if next == nil {
		return fmt.Errorf("%s holds no %s: cannot finish the render it belongs to; delete it", commit, siteMarker)
	}
	root, err := os.OpenRoot(out)
	if err != nil {
		return err
	}
	defer root.Close()
	// Delete what the last render wrote and this one does not, with the
	// folders that become empty.
	old := make([]string, 0, len(prev))
	for f := range prev {
		if !next[f] && !keptNames[topName(f)] {
			old = append(old, f)
		}
	}
	sort.Strings(old)
	for _, f := range old {
		if err := hook("delete"); err != nil {
			return err
		}
		if err := root.Remove(filepath.FromSlash(f)); err != nil && !errors.Is(err, fs.ErrNotExist) {
			return err
		}
		for d := path.Dir(f); d != "."; d = path.Dir(d) {
			if root.Remove(filepath.FromSlash(d)) != nil {
				break // not empty, or gone
			}
		}
	}
	// Move the new files in, those still in the commit folder.
	var moving []string
	err = filepath.WalkDir(commit, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, err := filepath.Rel(commit, p)
		if err == nil && rel != siteMarker {
			moving = append(moving, rel)
		}
		return err
	})
	if err != nil {
		return err
	}
	// The moves go through a root at the common parent, so that a symbolic
	// link inside the site folder cannot lead them elsewhere.
	parent, err := os.OpenRoot(filepath.Dir(out))
	if err != nil {
		return err
	}
	defer parent.Close()
	from, to := filepath.Base(commit), filepath.Base(out)
	for _, rel := range moving {
		if err := hook("move"); err != nil {
			return err
		}
		if d := filepath.Dir(rel); d != "." {
			if err := root.MkdirAll(d, 0o755); err != nil {
				return err
			}
		}
		if err := parent.Rename(filepath.Join(from, rel), filepath.Join(to, rel)); err != nil {
			return err
		}
	}
	if err := hook("marker"); err != nil {
		return err
	}
	if err := parent.Rename(filepath.Join(from, siteMarker), filepath.Join(to, siteMarker)); err != nil {
		return err
	}
	syncDir(out)
	return os.RemoveAll(commit)
}

// recoverSite finishes or cleans up what an interrupted render left beside
// the site folder out: a committed site is installed, an uncommitted one
// deleted. It reports what it did to log. The caller holds the lock.
func recoverSite(out string, log io.Writer) error {
	n := namesOf(out)
	entries, err := os.ReadDir(n.parent)
	if err != nil {
		return err
	}
	prefix := "." + n.base + "."
	for _, e := range entries {
		name, ok := strings.CutPrefix(e.Name(), prefix)
		if !ok || !e.IsDir() {
			continue
		}
		p := filepath.Join(n.parent, e.Name())
		state, _, _ := strings.Cut(name, "-")
		switch state {
		case "commit":
			fmt.Fprintf(log, "skysheet render: finishing an interrupted render of %s\n", out)
			if err := install(p, out); err != nil {
				return fmt.Errorf("finishing the interrupted render in %s: %w", p, err)
			}
		case "new", "rendering": // an unfinished render ("rendering": older versions)
			if err := os.RemoveAll(p); err != nil {
				return err
			}
		case "old": // older versions moved the old site aside before the swap
			if _, err := os.Lstat(out); errors.Is(err, fs.ErrNotExist) {
				fmt.Fprintf(log, "skysheet render: putting back the site of an interrupted render at %s\n", out)
				if err := os.Rename(p, out); err != nil {
					return err
				}
			} else if err := os.RemoveAll(p); err != nil {
				return err
			}
		}
	}
	return nil
}

// checkWhole returns an error unless the folder dir holds every file its
// marker lists.
func checkWhole(dir string) error {
	files, err := readMarker(dir)
	if err != nil {
		return err
	}
	for f := range files {
		if _, err := os.Lstat(filepath.Join(dir, filepath.FromSlash(f))); err != nil {
			return fmt.Errorf("%s lacks %s, which the site it was to update held: the site is gone, render again", dir, f)
		}
	}
	return nil
}

// lockSite takes the lock of the site folder out and returns the function
// that releases it. A lock held by a running process is an error wrapping
// errSiteLocked that says how to proceed; a lock left by a process that is
// gone is broken.
func lockSite(out string) (func(), error) {
	return lockFile(namesOf(out).lock())
}

// lockFile takes the lock file lock as lockSite does.
func lockFile(lock string) (func(), error) {
	mine := strconv.Itoa(os.Getpid()) + "\n" + newID() + "\n"
	for try := 0; ; try++ {
		if try == 3 {
			return nil, fmt.Errorf("%w: cannot take %s", errSiteLocked, lock)
		}
		f, err := os.OpenFile(lock, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err == nil {
			_, werr := f.WriteString(mine)
			if cerr := f.Close(); werr == nil {
				werr = cerr
			}
			if werr != nil {
				os.Remove(lock)
				return nil, werr
			}
			return func() {
				if data, err := os.ReadFile(lock); err == nil && string(data) == mine {
					os.Remove(lock)
				}
			}, nil
		}
		if !errors.Is(err, fs.ErrExist) {
			return nil, err
		}
		held, pid := lockHeld(lock)
		if held {
			who := "another render"
			if pid > 0 {
				who = fmt.Sprintf("another render (process %d)", pid)
			}
			return nil, fmt.Errorf("%w: %s holds %s; wait for it to finish, or delete that file if no render is running", errSiteLocked, who, lock)
		}
		if err := breakLock(lock); err != nil {
			return nil, err
		}
	}
}

// lockHeld reports whether the lock file is held by a live process, and
// that process's id when known. A lock file being written (no id yet) counts
// as held for a few seconds.
func lockHeld(lock string) (bool, int) {
	data, err := os.ReadFile(lock)
	if errors.Is(err, fs.ErrNotExist) {
		return false, 0
	}
	first, _, _ := strings.Cut(string(data), "\n")
	pid, perr := strconv.Atoi(strings.TrimSpace(first))
	if err != nil || perr != nil || pid <= 0 {
		st, serr := os.Stat(lock)
		return serr == nil && time.Since(st.ModTime()) < 10*time.Second, 0
	}
	return processAlive(pid), pid
}

// breakLock removes a stale lock file. It first renames it to a name of its
// own, so that of two renders breaking the same lock only one removes it;
// and if what it took turns out to be a live lock taken in the meantime, it
// puts it back.
func breakLock(lock string) error {
	aside := lock + ".stale-" + newID()
	if err := os.Rename(lock, aside); err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil // someone else broke it
		}
		return err
	}
	held, _ := lockHeld(aside)
	if held {
		os.Link(aside, lock) // put a live lock back unless a new one is there
	}
	return os.Remove(aside)
}
