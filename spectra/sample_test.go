package spectra

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"io/fs"
	"math"
	"testing"
	"testing/fstest"
)

func sha(s string) string {
	sum := sha256.Sum256([]byte(s))
	return hex.EncodeToString(sum[:])
}

func TestReadSample(t *testing.T) {
	const (
		uv   = "# reference_file: std/half.csv\nwavelength_nm,R\n300,0.8\n2500,0.6\n"
		ir   = "wavelength_um,R\n2.5,0.1\n25,0.1\n"
		half = "wavelength_nm,R\n200,0.5\n3000,0.5\n"
	)
	fsys := fstest.MapFS{
		"s/uv.csv":       {Data: []byte(uv)},
		"s/uv2.csv":      {Data: []byte("# reference_file: std/half.csv\nwavelength_nm,R\n2600,0.8\n2700,0.6\n")},
		"s/ir.csv":       {Data: []byte(ir)},
		"s/irshort.csv":  {Data: []byte("wavelength_um,R\n2.5,0.1\n2.9,0.1\n")},
		"s/std/half.csv": {Data: []byte(half)},
		"s/bad.csv":      {Data: []byte("wavelength_nm,R\n300,x\n")},
		"s/over.csv":     {Data: []byte("wavelength_nm,R\n400,0.5\n500,0.5\n")},
		"s/lone.csv":     {Data: []byte("# reference_file: std/none.csv\nwavelength_nm,R\n300,0.8\n400,0.6\n")},
	}
	s, err := ReadSample(fsys, []string{"s/uv.csv", "s/ir.csv"}, SampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// Inputs in read order: the data file, its reference, the next file.
	want := []Input{{"s/uv.csv", sha(uv)}, {"s/std/half.csv", sha(half)}, {"s/ir.csv", sha(ir)}}
	if len(s.Inputs) != len(want) {
		t.Fatalf("inputs %v, want %v", s.Inputs, want)
	}
	for i := range want {
		if s.Inputs[i] != want[i] {
			t.Errorf("input %d: %v, want %v", i, s.Inputs[i], want[i])
		}
	}
	// The reference halves R (R_abs = R_rel × 0.5, closed form).
	if v, _ := s.Series(R).At(300); math.Abs(v-0.4) > 1e-15 {
		t.Errorf("R(300 nm) = %v, want 0.4", v)
	}
	if v, _ := s.Series(R).At(2500); math.Abs(v-0.3) > 1e-15 {
		t.Errorf("R(2500 nm) = %v, want 0.3", v)
	}

	// A reference named by two files is read once.
	s, err = ReadSample(fsys, []string{"s/uv.csv", "s/uv2.csv"}, SampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Inputs) != 3 {
		t.Errorf("inputs %v: want the reference once", s.Inputs)
	}

	// A default reference applies to files that name none.
	s, err = ReadSample(fsys, []string{"s/irshort.csv"}, SampleOptions{Reference: "s/std/half.csv"})
	if err != nil {
		t.Fatal(err)
	}
	if v, _ := s.Series(R).At(2500); math.Abs(v-0.05) > 1e-15 {
		t.Errorf("R(2.5 µm) = %v, want 0.05", v)
	}

	// Every bad file is reported, in order, with its index.
	_, err = ReadSample(fsys, []string{"s/bad.csv", "s/ir.csv", "s/missing.csv", "s/lone.csv"}, SampleOptions{})
	var idx []int
	for _, e := range err.(interface{ Unwrap() []error }).Unwrap() {
		var fe *FileError
		if !errors.As(e, &fe) {
			t.Fatalf("%v is no *FileError", e)
		}
		idx = append(idx, fe.Index)
	}
	if len(idx) != 3 || idx[0] != 0 || idx[1] != 2 || idx[2] != 3 {
		t.Errorf("indices %v, want [0 2 3]: %v", idx, err)
	}
	if !errors.Is(err, errNotNumber) || !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("want the parse error and the missing files: %v", err)
	}

	// Files that cannot be joined: index −1.
	_, err = ReadSample(fsys, []string{"s/over.csv", "s/uv.csv"}, SampleOptions{Splice: SpliceOptions{Method: SpliceNone, JunctionNM: 9000}})
	var fe *FileError
	if !errors.As(err, &fe) || fe.Index != -1 {
		t.Errorf("join error %v: want a FileError with index -1", err)
	}

	// The resolver decides where a reference may be read from.
	refuse := errors.New("refused")
	_, err = ReadSample(fsys, []string{"s/uv.csv"}, SampleOptions{Resolve: func(file, ref string) (string, error) { return "", refuse }})
	if !errors.Is(err, refuse) {
		t.Errorf("resolver error lost: %v", err)
	}
	if _, err := ReadSample(fsys, nil, SampleOptions{}); !errors.Is(err, ErrNoData) {
		t.Errorf("no files: %v", err)
	}
}

// TestReadSampleSplicedInputs checks that splicing two overlapping files
// keeps both among the inputs.
func TestReadSampleSplicedInputs(t *testing.T) {
	a := "wavelength_nm,R\n300,0.5\n2600,0.5\n"
	b := "wavelength_nm,R\n2400,0.6\n25000,0.6\n"
	fsys := fstest.MapFS{"a.csv": {Data: []byte(a)}, "b.csv": {Data: []byte(b)}}
	s, err := ReadSample(fsys, []string{"a.csv", "b.csv"}, SampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Splices) == 0 {
		t.Fatal("not spliced")
	}
	if len(s.Inputs) != 2 || s.Inputs[0] != (Input{"a.csv", sha(a)}) || s.Inputs[1] != (Input{"b.csv", sha(b)}) {
		t.Errorf("inputs %v", s.Inputs)
	}
}
