package main

import (
	"strings"
	"testing"
)

func TestExitCodes(t *testing.T) {
	for _, tt := range []struct {
		name string
		args []string
		code int
		out  string // substring of stdout+stderr
	}{
		{"help", []string{"help"}, 0, "Verbs:"},
		{"no verb", nil, 2, "Usage"},
		{"unknown verb", []string{"frobnicate"}, 2, "unknown verb"},
		{"figures -h", []string{"figures", "-h"}, 0, "-solar-band"},
		{"figures no files", []string{"figures"}, 2, "no spectrum files"},
		{"figures bad flag", []string{"figures", "--nope", "x.csv"}, 2, "flag provided but not defined"},
		{"figures bad band", []string{"figures", "--solar-band", "2500,280", "x.csv"}, 2, "LO < HI"},
		{"figures band outside G173", []string{"figures", "--solar-band", "200,2500", "../../testdata/white-uvvis.csv"}, 2, "G173"},
		{"figures missing file", []string{"figures", "no-such-file.csv"}, 1, "no-such-file.csv"},
		{"figures ok", []string{"figures", "../../testdata/white-uvvis.csv", "../../testdata/white-ftir.tsv"}, 0, "Solar reflectance"},
		{"figures flags after files", []string{"figures", "../../testdata/white-uvvis.csv", "--json"}, 0, `"solar_reflectance"`},
	} {
		t.Run(tt.name, func(t *testing.T) {
			code, out, errs := runCLI(tt.args...)
			if code != tt.code {
				t.Errorf("exit %d, want %d\nstdout: %s\nstderr: %s", code, tt.code, out, errs)
			}
			if !strings.Contains(out+errs, tt.out) {
				t.Errorf("output lacks %q\nstdout: %s\nstderr: %s", tt.out, out, errs)
			}
		})
	}
}

func TestBadDataMessage(t *testing.T) {
	name := writeFile(t, "white.csv", "wavelength_nm;R\n400;0,5\n500;0,9x\n")
	code, _, errs := runCLI("figures", name)
	if code != 1 {
		t.Errorf("exit %d, want 1", code)
	}
	if want := name + `:3: column 2 (R): "0,9x" is not a number`; !strings.Contains(errs, want) {
		t.Errorf("stderr %q lacks %q", errs, want)
	}
}

// TestHelpListsVerbs checks that "skysheet help" lists exactly the verbs,
// and that the verbs they replaced are unknown.
func TestHelpListsVerbs(t *testing.T) {
	code, out, _ := runCLI("help")
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	_, list, ok := strings.Cut(out, "Verbs:\n")
	if !ok {
		t.Fatalf("no verb list in\n%s", out)
	}
	list, _, _ = strings.Cut(list, "\n\n")
	var got []string
	for line := range strings.Lines(list) {
		got = append(got, strings.Fields(line)[0])
	}
	want := []string{"figures", "import", "init", "preview", "render", "review", "splice", "version"}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("help lists %v, want %v", got, want)
	}
	for _, old := range []string{"build", "serve", "check", "new"} {
		if code, _, errs := runCLI(old); code != 2 || !strings.Contains(errs, "unknown verb") {
			t.Errorf("%s: exit %d, %q; want an unknown verb", old, code, errs)
		}
	}
}

// TestVerbHelpOnce checks that "VERB -h" and "help VERB" print the verb's
// usage once, to stdout, and that no flag states its default twice.
func TestVerbHelpOnce(t *testing.T) {
	for name := range commands {
		for _, args := range [][]string{{name, "-h"}, {name, "--help"}, {"help", name}} {
			code, out, errs := runCLI(args...)
			if code != 0 || errs != "" {
				t.Errorf("%v: exit %d, stderr %q", args, code, errs)
			}
			if n := strings.Count(out, "usage: skysheet "+name+" "); n != 1 {
				t.Errorf("%v: usage printed %d times:\n%s", args, n, out)
			}
			for line := range strings.Lines(out) {
				// A flag's default once: in its words or as flag adds it.
				if strings.Count(strings.ToLower(line), "default") > 1 {
					t.Errorf("%v: default stated twice: %q", args, line)
				}
			}
		}
	}
}

// TestBadFlagOneLine checks that a bad flag gives exit status 2 and one
// line on stderr naming the flag and the verb's -h, not the flag list.
func TestBadFlagOneLine(t *testing.T) {
	type tc struct {
		args []string
		flag string // named in the message
	}
	var cases []tc
	for name := range commands {
		cases = append(cases, tc{[]string{name, "--no-such-flag"}, "-no-such-flag"})
	}
	cases = append(cases,
		tc{append([]string{"figures", "--temperature", "warm"}, white...), "-temperature"},
		tc{[]string{"preview", "--port"}, "-port"},
		tc{[]string{"render", "--site"}, "-site"},
		tc{[]string{"review", "--strict=maybe"}, "-strict"},
	)
	for _, c := range cases {
		code, out, errs := runCLI(c.args...)
		verb := c.args[0]
		if code != 2 {
			t.Errorf("%v: exit %d, want 2", c.args, code)
		}
		if out != "" {
			t.Errorf("%v: stdout %q, want nothing", c.args, out)
		}
		if strings.Count(errs, "\n") != 1 || !strings.HasSuffix(errs, "\n") {
			t.Errorf("%v: want one line on stderr, got %q", c.args, errs)
		}
		if !strings.Contains(errs, c.flag) || !strings.Contains(errs, "skysheet "+verb+" -h") {
			t.Errorf("%v: %q does not name %s and skysheet %s -h", c.args, errs, c.flag, verb)
		}
	}
}
