package spectra

import "testing"

func TestDecodeRecordsInput(t *testing.T) {
	data := []byte("wavelength_nm,R\n400,0.5\n500,0.7\n")
	s, err := Decode(data, "a.csv")
	if err != nil {
		t.Fatal(err)
	}
	// sha256sum (GNU coreutils 9.1) of the same 33 bytes.
	want := Input{Name: "a.csv", SHA256: "0f8a7ed37055d78ab4a057001595065695a96d83d8e5eee9f224e23bfc6764d5"}
	if len(s.Inputs) != 1 || s.Inputs[0] != want {
		t.Fatalf("Inputs = %+v, want [%+v]", s.Inputs, want)
	}
	b, err := Decode([]byte("wavelength_nm,R\n500,0.7\n600,0.8\n"), "b.csv")
	if err != nil {
		t.Fatal(err)
	}
	m, err := merge(s, b)
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Inputs) != 2 || m.Inputs[0] != want || m.Inputs[1].Name != "b.csv" || m.Inputs[1] == want {
		t.Errorf("merged Inputs = %+v, want a.csv then b.csv", m.Inputs)
	}
}

func TestSolarTableSHA256(t *testing.T) {
	// sha256sum (GNU coreutils 9.1) of spectra/astm-g173-03.csv as committed.
	const want = "91964ac23c0ec82dbbda4a7f160a5f5faf551dfe18ffae7e2446d74b57ee7859"
	if got := SolarTableSHA256(); got != want {
		t.Errorf("SolarTableSHA256() = %s, want %s", got, want)
	}
}
