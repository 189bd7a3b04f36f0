package datasheet

import (
	"encoding/json"
	"runtime/debug"
	"strings"
	"testing"

	"skysheet/spectra"
	"skysheet/spectra/colorimetry"
)

func TestProvenance(t *testing.T) {
	a, err := spectra.Decode([]byte("wavelength_nm,R\n280,0.9\n2500,0.9\n"), "uvvis.csv")
	if err != nil {
		t.Fatal(err)
	}
	b, err := spectra.Decode([]byte("wavelength_um,R\n2.5,0.05\n25,0.05\n"), "ftir.csv")
	if err != nil {
		t.Fatal(err)
	}
	s, err := spectra.Join([]*spectra.Spectrum{a, b}, spectra.SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	f, err := compute(s, DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	p := f.Provenance
	want := []spectra.Input{
		// sha256sum (GNU coreutils 9.1) of the same bytes.
		{Name: "uvvis.csv", SHA256: "424924c38c9540d6e74903fac757801131e6ee80315b1c29b39f29c211d20320"},
		{Name: "ftir.csv", SHA256: "585ece4073c24a65fec01467ea0c71d3658123a4ba06ab65f9b8aff1ff162c1b"},
	}
	if len(p.Inputs) != 2 || p.Inputs[0] != want[0] || p.Inputs[1] != want[1] {
		t.Fatalf("inputs = %+v, want %+v", p.Inputs, want)
	}
	if !strings.HasPrefix(p.Software, "skysheet ") {
		t.Errorf("software = %q, want \"skysheet VERSION\"", p.Software)
	}
	if len(p.Weightings) != 4 {
		t.Fatalf("weightings = %+v, want the G173 spectrum, the Planck blackbody, the sky and the CIE tables", p.Weightings)
	}
	if w := p.Weightings[3]; w.Name != "CIE 1931 2° observer, illuminant D65" || !strings.Contains(w.Version, "ASTM E308") || w.SHA256 != colorimetry.TableSHA256() {
		t.Errorf("colour weighting = %+v", w)
	}
	if w := p.Weightings[0]; w.Name != "ASTM G173-03 global tilt" || !strings.Contains(w.Version, "ASTM G173-03") || w.SHA256 != spectra.SolarTableSHA256() {
		t.Errorf("solar weighting = %+v", w)
	}
	if w := p.Weightings[1]; w.Name != "Planck blackbody at 300 K" || !strings.Contains(w.Version, "CODATA 2018") {
		t.Errorf("thermal weighting = %+v", w)
	}
	if st := p.Settings; st.ClosureTolerance != 0.02 || st.PlanckStepNM != spectra.PlanckStepNM || st.Schema != SchemaVersion {
		t.Errorf("settings = %+v", st)
	}
	var m map[string]json.RawMessage
	data, _ := json.Marshal(f)
	if err := json.Unmarshal(data, &m); err != nil {
		t.Fatal(err)
	}
	var back Provenance
	if err := json.Unmarshal(m["provenance"], &back); err != nil || back.Inputs[1] != p.Inputs[1] || back.Settings != p.Settings {
		t.Errorf("provenance JSON %s does not read back: %v", m["provenance"], err)
	}
}

func TestVersionOf(t *testing.T) {
	for _, tt := range []struct {
		name string
		bi   debug.BuildInfo
		want string
	}{
		{"module version", debug.BuildInfo{Main: debug.Module{Version: "v1.2.3"}}, "v1.2.3"},
		{"no information", debug.BuildInfo{Main: debug.Module{Version: "(devel)"}}, "devel"},
		{"clean checkout", debug.BuildInfo{Main: debug.Module{Version: "(devel)"}, Settings: []debug.BuildSetting{
			{Key: "vcs.revision", Value: "0123456789abcdef0123"}, {Key: "vcs.modified", Value: "false"}}}, "devel-0123456789ab"},
		{"modified checkout", debug.BuildInfo{Settings: []debug.BuildSetting{
			{Key: "vcs.revision", Value: "0123456789abcdef0123"}, {Key: "vcs.modified", Value: "true"}}}, "devel-0123456789ab+dirty"},
	} {
		if got := versionOf(&tt.bi); got != tt.want {
			t.Errorf("%s: versionOf = %q, want %q", tt.name, got, tt.want)
		}
	}
}
