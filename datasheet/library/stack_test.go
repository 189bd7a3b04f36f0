package library

import (
	"strings"
	"testing"
	"testing/fstest"
)

// stackFS is the base library with a cover of its own spectra over the
// flat material.
func stackFS(stack string) fstest.MapFS {
	fsys := baseFS()
	fsys["content/cover.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Covered panel\nmaker: Test maker (invented)\nstack:\n" + stack + "---\nBody\n")}
	fsys["content/cover/film.csv"] = &fstest.MapFile{Data: []byte("wavelength_nm,R,T\n280,0.1,0.8\n25000,0.1,0.8\n")}
	return fsys
}

func TestStack(t *testing.T) {
	lib, err := loadRead(stackFS("  - name: Film\n    spectra: [{file: cover/film.csv}]\n    thickness_mm: 2\n    conductivity_w_mk: 0.04\n  - material: flat\n"))
	if err != nil {
		t.Fatal(err)
	}
	m, ok := lib.Material("cover")
	if !ok || len(m.Stack) != 2 {
		t.Fatalf("stack material %+v", m)
	}
	top, bottom := m.Stack[0], m.Stack[1]
	if top.Material != nil || top.Name != "Film" || top.Conductor == nil || top.Conductor.ThicknessM != 0.002 || top.Conductor.ConductivityWmK != 0.04 {
		t.Errorf("top layer %+v", top)
	}
	if bottom.Material == nil || bottom.Material.Slug != "flat" || bottom.Name != "Flat white test panel" || bottom.Conductor != nil {
		t.Errorf("bottom layer %+v", bottom)
	}
	layers, inputs, err := lib.ReadLayers(m)
	if err != nil || len(layers) != 2 {
		t.Fatalf("ReadLayers: %d layers, %v", len(layers), err)
	}
	var paths []string
	for _, in := range inputs {
		paths = append(paths, in.Path)
	}
	if want := "content/cover.md content/cover/film.csv content/flat/solar.csv content/flat/thermal.csv"; strings.Join(paths, " ") != want {
		t.Errorf("inputs %v, want %s", paths, want)
	}
}

func TestStackErrors(t *testing.T) {
	for _, tt := range []struct {
		name, stack string
		want        []errAt
	}{
		{"one layer", "  - material: flat\n", []errAt{{ErrMissing, "content/cover.md", 5, "at least two layers"}}},
		{"unknown slug", "  - material: flatt\n  - material: flat\n", []errAt{{ErrUnknownMaterial, "content/cover.md", 5, `did you mean "flat"?`}}},
		{"itself", "  - material: cover\n  - material: flat\n", []errAt{{ErrNotAllowed, "content/cover.md", 5, "the stack itself"}}},
		{"unknown key", "  - material: flat\n    thickness: 2\n  - material: flat\n", []errAt{{ErrUnknownKey, "content/cover.md", 6, `did you mean "thickness_mm"?`}}},
		{"both", "  - material: flat\n    spectra: [{file: cover/film.csv}]\n  - material: flat\n", []errAt{{ErrNotAllowed, "content/cover.md", 6, "both material: and spectra:"}}},
		{"neither", "  - thickness_mm: 1\n    conductivity_w_mk: 0.1\n  - material: flat\n", []errAt{{ErrMissing, "content/cover.md", 5, "layer 1: material:"}}},
		{"no name", "  - spectra: [{file: cover/film.csv}]\n  - material: flat\n", []errAt{{ErrMissing, "content/cover.md", 5, "name:"}}},
		{"name of a material", "  - material: flat\n    name: x\n  - material: flat\n", []errAt{{ErrNotAllowed, "content/cover.md", 6, "name: is for"}}},
		{"thickness alone", "  - material: flat\n    thickness_mm: 1\n  - material: flat\n", []errAt{{ErrMissing, "content/cover.md", 5, "go together"}}},
		{"negative thickness", "  - material: flat\n    thickness_mm: -1\n    conductivity_w_mk: 0.1\n  - material: flat\n", []errAt{{ErrConditions, "content/cover.md", 6, "thickness_mm -1"}}},
		{"zero conductivity", "  - material: flat\n    thickness_mm: 1\n    conductivity_w_mk: 0\n  - material: flat\n", []errAt{{ErrConditions, "content/cover.md", 7, "conductivity_w_mk 0"}}},
		{"missing file", "  - name: Film\n    spectra: [{file: cover/flim.csv}]\n  - material: flat\n", []errAt{{ErrSpectrum, "content/cover.md", 6, `did you mean "cover/film.csv"?`}}},
		{"not a list", "  material: flat\n", []errAt{{ErrType, "content/cover.md", 5, ""}}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			_, err := loadRead(stackFS(tt.stack))
			checkErrors(t, err, tt.want)
		})
	}
	t.Run("stack with spectra", func(t *testing.T) {
		fsys := stackFS("  - material: flat\n  - material: flat\n")
		fsys["content/cover.md"] = &fstest.MapFile{Data: []byte("---\ntitle: c\nmaker: m\nspectra: [{file: cover/film.csv}]\nstack: [{material: flat}, {material: flat}]\n---\n")}
		_, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrNotAllowed, "content/cover.md", 5, "stack together with spectra"}})
	})
	t.Run("layer is a stack", func(t *testing.T) {
		fsys := stackFS("  - material: flat\n  - material: flat\n")
		fsys["content/outer.md"] = &fstest.MapFile{Data: []byte("---\ntitle: o\nmaker: m\nstack: [{material: flat}, {material: cover}]\n---\n")}
		lib, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrNotAllowed, "content/outer.md", 4, "itself a stack"}})
		if _, ok := lib.Material("outer"); ok {
			t.Error("a stack with a bad layer was kept")
		}
	})
}

func TestComparisonReference(t *testing.T) {
	fsys := baseFS()
	fsys["content/other.md"] = &fstest.MapFile{Data: fsys["content/flat.md"].Data}
	fsys["content/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\ncompare: [other, flat]\nreference: flat\n---\n")}
	lib, err := loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	if c := lib.Comparisons[0]; c.Reference == nil || c.Reference.Slug != "flat" {
		t.Errorf("reference %+v", c.Reference)
	}
	fsys["content/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\ncompare: [other, flat]\nreference: flta\n---\n")}
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrUnknownMaterial, "content/whites.md", 4, `did you mean "flat"?`}})
}

func TestComparisonSkin(t *testing.T) {
	fsys := baseFS()
	fsys["content/other.md"] = &fstest.MapFile{Data: fsys["content/flat.md"].Data}
	fsys["content/skin.md"] = &fstest.MapFile{Data: fsys["content/flat.md"].Data}
	fsys["content/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\ncompare: [other, flat]\nreference: flat\nskin: skin\n---\n")}
	lib, err := loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	if c := lib.Comparisons[0]; c.Skin == nil || c.Skin.Slug != "skin" {
		t.Errorf("skin %+v", c.Skin)
	}
	fsys["content/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\ncompare: [other, flat]\nreference: flat\nskin: skni\n---\n")}
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrUnknownMaterial, "content/whites.md", 5, `did you mean "skin"?`}})
	fsys["content/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\ncompare: [other, flat]\nskin: skin\n---\n")}
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrMissing, "content/whites.md", 4, "name the reference"}})
}
