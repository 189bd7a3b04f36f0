package main

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"time"

	"skysheet/datasheet/library"
	"skysheet/datasheet/site"
)

// cacheDir is the folder, inside the library folder, of the render cache
// (see [site.Cache]). Deleting it only makes the next render a full one.
const cacheDir = ".skysheet-cache"

// openRenderCache opens the render cache of the library in absDir and takes
// its lock; the function returned releases it. The cache only saves time,
// so a cache that cannot be used (a read-only library, another render
// holding it) is named in a note on log and the render goes without it:
// the cache is then nil.
func openRenderCache(absDir string, log io.Writer) (*site.Cache, func()) {
	none := func() {}
	dir := filepath.Join(absDir, cacheDir)
	build, err := buildID(absDir)
	if err != nil {
		fmt.Fprintf(log, "skysheet render: note: rendering without the cache: %v\n", err)
		return nil, none
	}
	c, err := site.OpenCache(dir, build)
	if err != nil {
		fmt.Fprintf(log, "skysheet render: note: rendering without the cache: %v\n", err)
		return nil, none
	}
	unlock, err := lockFile(filepath.Join(dir, "lock"))
	if err != nil {
		if errors.Is(err, errSiteLocked) {
			err = fmt.Errorf("another render is using it (%w)", err)
		}
		fmt.Fprintf(log, "skysheet render: note: rendering without the cache in %s: %v\n", dir, err)
		return nil, none
	}
	return c, unlock
}

// closeRenderCache commits the cache after a render that succeeded, writes
// the front matter cache fc (if any) when the render changed it, and
// names, in a note, entries that could not be written.
func closeRenderCache(c *site.Cache, fc *library.FrontCache, absDir string, log io.Writer) {
	if errs := c.WriteErrors(); len(errs) > 0 {
		fmt.Fprintf(log, "skysheet render: note: %s not written to the render cache (the site is complete): %v\n", plural(len(errs), "entry"), errs[0])
	}
	if err := c.Commit(); err != nil {
		fmt.Fprintf(log, "skysheet render: note: writing the render cache: %v\n", err)
	}
	if fc != nil && fc.Changed() {
		if err := writeFrontCache(filepath.Join(absDir, cacheDir, frontCacheFile), fc); err != nil {
			fmt.Fprintf(log, "skysheet render: note: writing the render cache: %v\n", err)
		}
	}
}

// frontCacheFile is the file, in the cache folder, of the front matter
// cache (see [library.FrontCache]).
const frontCacheFile = "front"

// frontCacheOf returns the front matter cache of the library in absDir
// for this build: one that is missing, damaged or of another build gives
// an empty cache, as does a build that cannot be identified (the render
// cache is then not used, nor the front matter cache written). The file
// is read while the build is identified.
func frontCacheOf(absDir string) *library.FrontCache {
	read := make(chan *library.FrontCache, 1)
	go func() {
		f, err := os.Open(filepath.Join(absDir, cacheDir, frontCacheFile))
		if err != nil {
			read <- nil
			return
		}
		defer f.Close()
		read <- library.ReadFrontCache(f)
	}()
	build, _ := buildID(absDir)
	if fc := <-read; fc != nil && build != "" && fc.Build() == build {
		return fc
	}
	return library.NewFrontCache(build)
}

// writeFrontCache writes fc at name, through a temporary file, not synced
// (see writeThrough).
func writeFrontCache(name string, fc *library.FrontCache) error {
	return writeThrough(name, func(w io.Writer) error {
		_, err := fc.WriteTo(w)
		return err
	}, false)
}

var (
	buildOnce sync.Once
	buildSum  string
	buildErr  error
)

// buildID identifies this build of skysheet for the render cache: its
// version and the SHA-256 of its executable, so that a rebuilt binary of
// the same version (a development build) does not use the entries of
// another. The SHA-256 is remembered in the cache folder of the library in
// absDir (see executableSum).
func buildID(absDir string) (string, error) {
	buildOnce.Do(func() {
		exe, err := os.Executable()
		if err != nil {
			buildErr = fmt.Errorf("cannot find the running program: %w", err)
			return
		}
		sum, err := executableSum(exe, filepath.Join(absDir, cacheDir, buildFile), time.Now())
		if err != nil {
			buildErr = fmt.Errorf("cannot read the running program: %w", err)
			return
		}
		buildSum = version() + " " + sum
	})
	return buildSum, buildErr
}

// buildFile is the file, in the cache folder, that remembers the SHA-256
// of the executable.
const buildFile = "build"

// executableSum returns the SHA-256, in hex, of the file exe. The file memo
// remembers it with exe's path and stamp (device, inode, size, times of
// change of bytes and inode; see library.StampOf): while exe has that
// stamp, the sum is taken from memo instead of reading exe, whose bytes a
// change would have moved the stamp of. A sum read is remembered when exe
// has a stamp and memo's folder exists.
func executableSum(exe, memo string, now time.Time) (string, error) {
	f, err := os.Open(exe)
	if err != nil {
		return "", err
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil {
		return "", err
	}
	st, stamped := library.StampOf(fi, now)
	head := fmt.Sprintf("skysheet executable 1 %q %d %d %d %d %d\n", exe, st.Dev, st.Ino, st.Size, st.ModTime, st.Change)
	if stamped {
		if b, err := os.ReadFile(memo); err == nil {
			if sum, ok := strings.CutPrefix(string(b), head); ok && len(sum) == 2*sha256.Size+1 && sum[len(sum)-1] == '\n' {
				if _, err := hex.DecodeString(sum[:len(sum)-1]); err == nil {
					return sum[:len(sum)-1], nil
				}
			}
		}
	}
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	sum := hex.EncodeToString(h.Sum(nil))
	if stamped {
		// A memo not written: the executable is read again next time.
		writeThrough(memo, func(w io.Writer) error {
			_, err := io.WriteString(w, head+sum+"\n")
			return err
		}, false)
	}
	return sum, nil
}
