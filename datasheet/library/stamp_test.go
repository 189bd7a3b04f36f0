package library

import (
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"testing"
	"time"
)

// countingFS counts the files opened through it.
type countingFS struct {
	fs.FS
	opens int
}

func (c *countingFS) Open(name string) (fs.File, error) {
	c.opens++
	return c.FS.Open(name)
}

func (c *countingFS) Stat(name string) (fs.FileInfo, error) { return fs.Stat(c.FS, name) }

func TestUnchangedStamps(t *testing.T) {
	if runtime.GOOS != "linux" && runtime.GOOS != "darwin" {
		t.Skip("no change times read on", runtime.GOOS)
	}
	const old, changed = "300,0.91\n", "300,0.19\n" // the same size
	for _, tc := range []struct {
		name   string
		change func(t *testing.T, p string) // after the stamp was taken
		want   bool
		opens  int // files read by Unchanged
	}{
		{"untouched", func(*testing.T, string) {}, true, 0},
		{"bytes changed, size and modification time kept", func(t *testing.T, p string) {
			st, err := os.Stat(p)
			if err != nil {
				t.Fatal(err)
			}
			write(t, p, changed)
			if err := os.Chtimes(p, st.ModTime(), st.ModTime()); err != nil {
				t.Fatal(err)
			}
		}, false, 1},
		{"replaced by a copy of the same bytes", func(t *testing.T, p string) {
			tmp := p + ".new"
			write(t, tmp, old)
			if err := os.Rename(tmp, p); err != nil {
				t.Fatal(err)
			}
		}, true, 1},
		{"removed", func(t *testing.T, p string) { os.Remove(p) }, false, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			p := filepath.Join(dir, "a.csv")
			write(t, p, old)
			fsys := &countingFS{FS: os.DirFS(dir)}
			// As if Load began a minute after the file was written.
			lib := &Library{fsys: fsys, loaded: time.Now().Add(time.Minute)}
			inputs := []Input{hashInput("a.csv", []byte(old))}
			stamps := lib.Stamps(inputs)
			if stamps[0] == (Stamp{}) {
				t.Fatal("no stamp for a file written well before the load")
			}
			// Later than the file system's tick (a jiffy, at most 10 ms,
			// on Linux; from memory): in a render, changes that matter
			// come after Load began, seconds after what stamps allow.
			time.Sleep(20 * time.Millisecond)
			tc.change(t, p)
			got, _ := lib.Unchanged(inputs, stamps)
			if got != tc.want || fsys.opens != tc.opens {
				t.Errorf("Unchanged = %v reading %d files, want %v reading %d", got, fsys.opens, tc.want, tc.opens)
			}
		})
	}
}

// TestStampsRecent checks that a file changed just before the load, or a
// library not read by Load, gets no stamp: it is read again next time.
func TestStampsRecent(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "a.csv"), "300,0.91\n")
	inputs := []Input{hashInput("a.csv", []byte("300,0.91\n"))}
	for _, loaded := range []time.Time{time.Now(), {}} {
		lib := &Library{fsys: os.DirFS(dir), loaded: loaded}
		if st := lib.Stamps(inputs); st[0] != (Stamp{}) {
			t.Errorf("load at %v: stamp %+v for a file changed less than %v before", loaded, st[0], stampMargin)
		}
		if ok, _ := lib.Unchanged(inputs, nil); !ok {
			t.Error("an unchanged file without stamp found changed")
		}
	}
}

func write(t *testing.T, p, data string) {
	t.Helper()
	if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
}
