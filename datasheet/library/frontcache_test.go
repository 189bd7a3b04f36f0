package library

import (
	"bytes"
	"fmt"
	"io/fs"
	"os"
	"reflect"
	"strings"
	"testing"
	"testing/fstest"
	"time"
)

// warmCache loads fsys through a new front matter cache and returns the
// cache as written and read back, as the next render finds it.
func warmCache(t testing.TB, fsys fs.FS) *FrontCache {
	t.Helper()
	return ReadFrontCache(bytes.NewReader(filledCache(t, fsys, "build 1")))
}

// filledCache loads fsys through a new front matter cache of the given
// build and returns what the cache writes.
func filledCache(t testing.TB, fsys fs.FS, build string) []byte {
	t.Helper()
	fc := NewFrontCache(build)
	LoadWith(fsys, fc)
	var buf bytes.Buffer
	if _, err := fc.WriteTo(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// sameLoad checks that loading fsys through fc gives the library and the
// errors that loading it afresh gives.
func sameLoad(t testing.TB, fsys fs.FS, fc *FrontCache) {
	t.Helper()
	want, wantErr := Load(fsys)
	got, gotErr := LoadWith(fsys, fc)
	if fmt.Sprint(gotErr) != fmt.Sprint(wantErr) {
		t.Fatalf("errors through the cache:\n%v\nafresh:\n%v", gotErr, wantErr)
	}
	// A file the load did not read gives its text when asked.
	for _, m := range got.Materials {
		if m.Source == nil {
			var err error
			if m.Source, m.Body, err = m.Text(); err != nil {
				t.Fatalf("%s: %v", m.Path, err)
			}
		}
	}
	if !reflect.DeepEqual(got.Materials, want.Materials) {
		t.Fatalf("materials through the cache differ:\n%+v\nafresh:\n%+v", got.Materials, want.Materials)
	}
	if !reflect.DeepEqual(got.Comparisons, want.Comparisons) {
		t.Fatalf("comparisons through the cache differ")
	}
}

func TestFrontCache(t *testing.T) {
	fsys := baseFS()
	// goodMaterial sets conditions: kept out of the cache.
	fsys["content/plain.md"] = &fstest.MapFile{Data: []byte(strings.Replace(strings.Replace(goodMaterial, "conditions: {temperature_k: 290}\n", "", 1), "title: Flat", "slug: plain\ntitle: Flat", 1))}
	fsys["content/cmp.md"] = &fstest.MapFile{Data: []byte("---\ntitle: c\ncompare: [flat, plain]\nreference: flat\n---\n")}
	fc := warmCache(t, fsys)
	if fc.Build() != "build 1" {
		t.Errorf("build %q read back", fc.Build())
	}
	sameLoad(t, fsys, fc)
	if got := fc.Hits(); got != 2 {
		t.Errorf("%d hits, want 2 (plain.md and cmp.md; flat.md sets conditions)", got)
	}
	if fc.Changed() {
		t.Error("changed, with every kept entry used and none added")
	}

	// A load that leaves an entry unused, and one that adds one, change it.
	delete(fsys, "content/cmp.md")
	sameLoad(t, fsys, fc)
	if !fc.Changed() {
		t.Error("not changed after a file went")
	}
	fsys["content/cmp.md"] = &fstest.MapFile{Data: []byte("---\ntitle: c2\ncompare: [flat, plain]\n---\n")}
	sameLoad(t, fsys, fc)
	if !fc.Changed() || fc.Hits() != 1 {
		t.Errorf("changed %v, %d hits after a file was added; want true, 1", fc.Changed(), fc.Hits())
	}
}

// TestFrontCacheErrors: what is checked after parsing (the slug, the
// files named, the layers of a stack, the materials compared) is checked
// afresh on every load, with the lines and columns of a parse.
func TestFrontCacheErrors(t *testing.T) {
	stack := "---\ntitle: s\nmaker: m\nstack:\n  - material: flat\n  - name: back\n    spectra:\n      - file: back/x.csv\n  - material: nowhere\n---\n"
	for name, files := range map[string]map[string]string{
		"bad slug":            {"content/a.md": "---\ntitle: a\nslug: A b\nmaker: m\nspectra:\n  - file: flat/solar.csv\n---\n"},
		"file missing":        {"content/a.md": "---\ntitle: a\nmaker: m\nspectra:\n  - file: flat/solar.csv\n  - {role: thermal, file: flat/nothere.csv}\n---\n"},
		"stack":               {"content/s.md": stack},
		"unknown compared":    {"content/c.md": "---\ntitle: c\ncompare:\n  - flat\n  - nowhere\n---\n"},
		"same front matter":   {"content/a.md": "---\ntitle: a\nslug: a\nmaker: m\nspectra:\n  - file: flat/solar.csv\n---\n", "content/b.md": "---\ntitle: a\nslug: a\nmaker: m\nspectra:\n  - file: flat/solar.csv\n---\n"},
		"blank in the body":   {"content/a.md": "---\ntitle: a\nmaker: m\nspectra:\n  - file: flat/solar.csv\n---\nFILL IN: the text\n"},
		"empty tags":          {"content/a.md": "---\ntitle: a\nmaker: m\ntags: []\nspectra:\n  - file: flat/solar.csv\n---\n"},
		"a file seen earlier": {"content/a.md": "---\ntitle: a\nmaker: m\nspectra:\n  - file: flat/solar.csv\n---\n"},
	} {
		t.Run(name, func(t *testing.T) {
			fsys := baseFS()
			for f, text := range files {
				fsys[f] = &fstest.MapFile{Data: []byte(text)}
			}
			fc := warmCache(t, fsys)
			sameLoad(t, fsys, fc)
			want := len(files) // goodMaterial sets conditions: not kept
			switch name {
			case "same front matter":
				want = 1 // given out once: the other file is parsed
			case "empty tags":
				want = 0 // read back from gob, [] is nil: not kept
			}
			if fc.Hits() != want {
				t.Errorf("%d hits, want %d", fc.Hits(), want)
			}
			if name == "file missing" {
				// The file named comes back: found through the cache too.
				fsys["content/flat/nothere.csv"] = fsys["content/flat/solar.csv"]
				sameLoad(t, fsys, fc)
			}
		})
	}
}

// TestFrontCacheDemo loads the demo library through a warm cache: every
// file without conditions: is taken from it, and the library is the same.
func TestFrontCacheDemo(t *testing.T) {
	fsys := os.DirFS("../..")
	fc := warmCache(t, fsys)
	sameLoad(t, fsys, fc)
	files, _, err := contentFiles(fsys)
	if err != nil {
		t.Fatal(err)
	}
	want := 0
	for _, f := range files {
		if b, _ := fs.ReadFile(fsys, f); !bytes.Contains(b, []byte("\nconditions:")) {
			want++
		}
	}
	if fc.Hits() != want || want < 10 {
		t.Errorf("%d hits, want %d (the demo's files without conditions:)", fc.Hits(), want)
	}
}

// TestReadFrontCacheDamaged: a cache that is truncated, altered or of
// another format reads as empty, and loads as none.
func TestReadFrontCacheDamaged(t *testing.T) {
	fsys := baseFS()
	fsys["content/a.md"] = &fstest.MapFile{Data: []byte("---\ntitle: a\nmaker: m\nspectra:\n  - file: flat/solar.csv\n---\n")}
	good := filledCache(t, fsys, "b")
	if n := len(ReadFrontCache(bytes.NewReader(good)).old); n != 1 {
		t.Fatalf("the cache as written holds %d entries, want 1", n)
	}
	damaged := map[string][]byte{
		"empty":     nil,
		"truncated": good[:len(good)-1],
		"longer":    append(bytes.Clone(good), 0),
		"magic":     append([]byte("X"), good[1:]...),
	}
	for i := len(frontMagic); i < len(good); i += 7 {
		b := bytes.Clone(good)
		b[i] ^= 0x20
		damaged[fmt.Sprintf("byte %d", i)] = b
	}
	for name, b := range damaged {
		fc := ReadFrontCache(bytes.NewReader(b))
		if len(fc.old) != 0 || fc.Build() != "" {
			t.Errorf("%s: %d entries of build %q read", name, len(fc.old), fc.Build())
		}
		sameLoad(t, fsys, fc)
	}
}

// TestFrontFieldsAll: frontFields has every field of FrontMatter but
// Conditions, of the same type; a field it missed would keep the file out
// of the cache (see FrontCache.parse), not lose its value.
func TestFrontFieldsAll(t *testing.T) {
	ft, kt := reflect.TypeFor[FrontMatter](), reflect.TypeFor[frontFields]()
	for i := range ft.NumField() {
		f := ft.Field(i)
		if f.Name == "Conditions" {
			continue
		}
		k, ok := kt.FieldByName(f.Name)
		if !ok || k.Type != f.Type {
			t.Errorf("frontFields lacks %s %s", f.Name, f.Type)
		}
	}
	if kt.NumField() != ft.NumField()-1 {
		t.Errorf("frontFields has %d fields, FrontMatter %d", kt.NumField(), ft.NumField())
	}
}

// TestCopiesShareNothing fills frontFields and frontPlaces, every slice
// with elements and every pointer set, and checks that their copies equal
// them and share no slice or pointer with them (a field added to
// FrontMatter with a slice inside, and missed by copy, fails here).
func TestCopiesShareNothing(t *testing.T) {
	for _, v := range []any{&frontFields{}, &frontPlaces{}} {
		x := reflect.ValueOf(v).Elem()
		fill(x, 1)
		var c reflect.Value
		switch v := v.(type) {
		case *frontFields:
			c = reflect.ValueOf(v.copy())
		case *frontPlaces:
			c = reflect.ValueOf(v.copy())
		}
		if !reflect.DeepEqual(c.Interface(), x.Interface()) {
			t.Fatalf("the copy of a %s differs", x.Type())
		}
		mem := map[uintptr]bool{}
		n := 0
		memoryOf(x, func(p uintptr) { mem[p] = true; n++ })
		memoryOf(c, func(p uintptr) {
			if mem[p] {
				t.Errorf("the copy of a %s shares memory with it", x.Type())
			}
		})
		if n < 5 {
			t.Errorf("%s: only %d slices and pointers filled", x.Type(), n)
		}
	}
}

// fill sets every field reachable from v: two elements in each slice,
// each pointer to a value, numbers and strings from seed.
func fill(v reflect.Value, seed int) int {
	switch v.Kind() {
	case reflect.Slice:
		v.Set(reflect.MakeSlice(v.Type(), 2, 2))
		for i := range 2 {
			seed = fill(v.Index(i), seed)
		}
	case reflect.Pointer:
		v.Set(reflect.New(v.Type().Elem()))
		seed = fill(v.Elem(), seed)
	case reflect.Struct:
		for i := range v.NumField() {
			if v.Type().Field(i).IsExported() {
				seed = fill(v.Field(i), seed)
			}
		}
	case reflect.String:
		v.SetString(fmt.Sprint("s", seed))
	case reflect.Int, reflect.Int64:
		v.SetInt(int64(seed))
	case reflect.Float64:
		v.SetFloat(float64(seed) + 0.5)
	case reflect.Bool:
		v.SetBool(seed%2 == 0)
	}
	return seed + 1
}

// memoryOf calls f with the address of every slice's array and every
// pointer's target reachable from v.
func memoryOf(v reflect.Value, f func(uintptr)) {
	switch v.Kind() {
	case reflect.Slice:
		if v.Len() > 0 {
			f(v.Pointer())
		}
		for i := range v.Len() {
			memoryOf(v.Index(i), f)
		}
	case reflect.Pointer:
		if !v.IsNil() {
			f(v.Pointer())
			memoryOf(v.Elem(), f)
		}
	case reflect.Struct:
		for i := range v.NumField() {
			memoryOf(v.Field(i), f)
		}
	case reflect.Map:
		if v.Len() > 0 {
			f(v.Pointer())
		}
	}
}

// TestFrontCacheUnreadFiles checks that a material's Markdown file whose
// stamp holds is not read again (its text read only when asked for, and
// the same), that one changed since is read again, that a comparison's
// file is always read, and that Text refuses a file changed after the
// load.
func TestFrontCacheUnreadFiles(t *testing.T) {
	dir := t.TempDir()
	if err := os.CopyFS(dir+"/content", os.DirFS("../../content")); err != nil {
		t.Fatal(err)
	}
	cfg, err := os.ReadFile("../../skysheet.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(dir+"/skysheet.yaml", cfg, 0o644); err != nil {
		t.Fatal(err)
	}
	// Files are stamped only once they last changed at least 2 s before a
	// load (see StampOf).
	time.Sleep(2100 * time.Millisecond)
	fsys := os.DirFS(dir)
	fc := warmCache(t, fsys)
	unread := func() map[string]bool {
		t.Helper()
		lib, err := LoadWith(fsys, fc)
		if err != nil {
			t.Fatal(err)
		}
		out := map[string]bool{}
		for _, m := range lib.Materials {
			if m.Source == nil {
				out[m.Slug] = true
			}
		}
		for _, c := range lib.Comparisons {
			if c.Source == nil {
				t.Errorf("comparison %s: not read", c.Slug)
			}
		}
		return out
	}
	first := unread()
	lib, err := Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range lib.Materials {
		// Front matter with conditions: is not kept, so neither is its
		// file's record.
		if want := !bytes.Contains(m.Source, []byte("\nconditions:")); first[m.Slug] != want {
			t.Errorf("%s: not read %v, want %v", m.Slug, first[m.Slug], want)
		}
	}
	if len(first) < 10 {
		t.Fatalf("only %d files not read", len(first))
	}
	sameLoad(t, fsys, fc)

	// A file changed since is read again, and read as it is now: changed
	// long enough ago to stamp (another stamp than the one recorded), or
	// just now (too new to stamp).
	m, _ := lib.Material("bw-93")
	p := dir + "/" + m.Path
	src := append(bytes.Clone(m.Source), "\nOne more sentence.\n"...)
	if err := os.WriteFile(p, src, 0o644); err != nil {
		t.Fatal(err)
	}
	time.Sleep(2100 * time.Millisecond)
	if unread()["bw-93"] {
		t.Error("bw-93 changed 2 s ago, yet not read again")
	}
	sameLoad(t, fsys, fc)
	src = append(src, "And another.\n"...)
	if err := os.WriteFile(p, src, 0o644); err != nil {
		t.Fatal(err)
	}
	if unread()["bw-93"] {
		t.Error("bw-93 changed just now, yet not read again")
	}
	sameLoad(t, fsys, fc)

	// Changed after a load that did not read it: Text refuses it.
	time.Sleep(2100 * time.Millisecond)
	unread() // records bw-93 anew, now old enough to stamp
	got, err := LoadWith(fsys, fc)
	if err != nil {
		t.Fatal(err)
	}
	lm, _ := got.Material("bw-93")
	if lm.Source != nil {
		t.Fatal("bw-93 read, want it taken from the cache")
	}
	if err := os.WriteFile(p, append(src, "And a third.\n"...), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := lm.Text(); err == nil || !strings.Contains(err.Error(), "changed while") || !strings.Contains(err.Error(), m.Path) {
		t.Errorf("Text of a file changed since the load: %v", err)
	}
}

// TestFrontCacheFileRecords checks that the records of files read whole
// are written with the front matter they name, read back, and dropped
// when that front matter is not in the cache.
func TestFrontCacheFileRecords(t *testing.T) {
	fsys := baseFS()
	fsys["content/plain.md"] = &fstest.MapFile{Data: []byte("---\ntitle: p\nmaker: m\nspectra:\n  - file: flat/solar.csv\n---\nText.\n")}
	fc := NewFrontCache("b")
	LoadWith(fsys, fc)
	yamlText, _, bodyLine, _ := splitFront("content/plain.md", fsys["content/plain.md"].Data)
	st := Stamp{Dev: 1, Ino: 2, Size: 3, ModTime: 4, Change: 5}
	fc.keepFile("content/plain.md", st, "ab", yamlText, bodyLine)
	fc.keepFile("content/gone.md", st, "cd", []byte("title: not in the cache\n"), 1)
	var buf bytes.Buffer
	if _, err := fc.WriteTo(&buf); err != nil {
		t.Fatal(err)
	}
	back := ReadFrontCache(bytes.NewReader(buf.Bytes()))
	if len(back.oldFiles) != 1 {
		t.Fatalf("%d file records read back, want 1 (plain.md)", len(back.oldFiles))
	}
	r := back.oldFiles["content/plain.md"]
	if r == nil || r.Stamp != st || r.SHA256 != "ab" || r.BodyLine != bodyLine {
		t.Errorf("record read back: %+v", r)
	}
	if _, _, got, ok := back.unchanged("content/plain.md", st); !ok || got != r {
		t.Error("the record's file under its stamp not given")
	}
	back.begin()
	if _, _, _, ok := back.unchanged("content/plain.md", Stamp{Dev: 1}); ok {
		t.Error("the file under another stamp given")
	}
}
