package library

import (
	"bytes"
	"errors"
	"testing"
	"testing/fstest"
)

// FuzzLoad feeds arbitrary bytes as a material file and as the config.
// Load must not panic; every error must be an *Error or a spectrum's
// ParseError with a file name; an accepted material must satisfy the
// documented invariants; loading through a front matter cache that an
// earlier load filled must give the same library and errors.
func FuzzLoad(f *testing.F) {
	f.Add([]byte(goodMaterial), []byte("title: x\n"))
	f.Add([]byte("---\ntitle: c\ncompare: [flat]\n---\n"), []byte("conditions: {temperature_k: 280}\n"))
	f.Add([]byte("---\ntitle: [\n---\n"), []byte("- a\n"))
	f.Add([]byte("---\n&a x: *a\n---\n"), []byte("site_address: http://x/\n"))
	f.Fuzz(func(t *testing.T, md, config []byte) {
		fsys := baseFS()
		fsys["content/z.md"] = &fstest.MapFile{Data: md}
		fsys["skysheet.yaml"] = &fstest.MapFile{Data: config}
		lib, err := Load(fsys)
		if lib == nil {
			t.Fatal("Load returned no library")
		}
		if err != nil {
			var es Errors
			if !errors.As(err, &es) || len(es) == 0 {
				t.Fatalf("error %v is not a non-empty Errors", err)
			}
			for _, e := range es {
				var le *Error
				if !errors.As(e, &le) || le.File == "" {
					t.Fatalf("error %v names no file", e)
				}
			}
		}
		for _, m := range lib.Materials {
			if m.Front.Title == "" || m.Slug == "" || Slugify(m.Slug) != m.Slug || len(m.spectra) != len(m.Front.Spectra) {
				t.Fatalf("accepted material breaks invariants: %+v", m)
			}
			if s, _, err := lib.ReadSample(m); err != nil {
				var es Errors
				var le *Error
				if !errors.As(err, &es) || !errors.As(err, &le) || le.File != m.Path {
					t.Fatalf("sample error %v does not name %s", err, m.Path)
				}
			} else if len(s.Segments) == 0 {
				t.Fatalf("accepted an empty sample")
			}
			if m.Conditions.Validate() != nil {
				t.Fatalf("accepted invalid conditions %+v", m.Conditions)
			}
		}
		for _, c := range lib.Comparisons {
			if c.Front.Title == "" || len(c.Materials) == 0 || len(c.Materials) != len(c.Front.Compare) {
				t.Fatalf("accepted comparison breaks invariants: %+v", c)
			}
		}
		sameLoad(t, fsys, warmCache(t, fsys))
	})
}

// FuzzReadFrontCache feeds arbitrary bytes as a front matter cache: reading
// must not panic, and a load through what was read must give what a load
// without it gives (a damaged cache reads as empty; the checksum keeps a
// changed one out).
func FuzzReadFrontCache(f *testing.F) {
	fsys := baseFS()
	fsys["content/plain.md"] = &fstest.MapFile{Data: []byte("---\ntitle: p\nmaker: m\ntags: [a]\nspectra:\n  - file: flat/solar.csv\n---\n")}
	seed := filledCache(f, fsys, "b")
	f.Add(seed)
	f.Add(seed[:len(seed)/2])
	f.Add([]byte(frontMagic))
	// With the record of a file read whole (a file system of stamps would
	// make it; fstest.MapFS gives none).
	fc := NewFrontCache("b")
	LoadWith(fsys, fc)
	yamlText, _, bodyLine, _ := splitFront("content/plain.md", fsys["content/plain.md"].Data)
	fc.keepFile("content/plain.md", Stamp{Dev: 1, Ino: 2, Size: 3, ModTime: 4, Change: 5}, "00", yamlText, bodyLine)
	var withFile bytes.Buffer
	if _, err := fc.WriteTo(&withFile); err != nil {
		f.Fatal(err)
	}
	f.Add(withFile.Bytes())
	f.Fuzz(func(t *testing.T, data []byte) {
		fc := ReadFrontCache(bytes.NewReader(data))
		if len(fc.old) == 0 {
			return // read as empty: a load through it is one without (TestReadFrontCacheDamaged)
		}
		sameLoad(t, fsys, fc)
	})
}
