package main

import (
	"encoding/json"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"skysheet/datasheet"
)

// reviewWriters are the output formats of "skysheet review".
var reviewWriters = map[string]func(io.Writer, *reviewReport) error{
	"text":  writeReviewText,
	"json":  writeReviewJSON,
	"junit": writeReviewJUnit,
}

// claimWords describes a claim: "solar_reflectance 0.95 ± 0.01 (source)".
func claimWords(c datasheet.Claim) string {
	s := c.Figure + " " + c.Text()
	if c.Source != "" {
		s += " (" + c.Source + ")"
	}
	return s
}

// closureWords describes the closure check in one line.
func closureWords(cl *datasheet.ClosureReport) string {
	switch {
	case !cl.OK:
		return "closure fails: " + strings.Join(cl.Problems, " ")
	case cl.Checked:
		return fmt.Sprintf("closure holds: |R+T+A−1| at most %.4f (at %s nm), tolerance %g", cl.Residual, fmtNM(cl.ResidualNM), cl.Tolerance)
	}
	return fmt.Sprintf("closure holds: R, T and A not all measured; R+T ≤ 1 and no negative values within %g", cl.Tolerance)
}

func writeReviewText(w io.Writer, r *reviewReport) error {
	ew := &errWriter{w: w}
	ew.printf("Library %s, reviewed by %s\n", r.Library, r.Software)
	for _, m := range r.Materials {
		writeMaterialText(ew, m, r.Library)
	}
	c := r.Counts
	ew.printf("\n%d files, %d invalid, %d failing closure; ", c.Files, c.InvalidFiles, c.ClosureFails)
	writeResultText(ew, r)
	return ew.err
}

// writeMaterialText writes what was found in one file, or nothing for a
// file without anything to say.
func writeMaterialText(ew *errWriter, m reviewMaterial, lib string) {
	if len(m.Errors) == 0 && m.Closure == nil && len(m.Verdicts) == 0 && len(m.Warnings) == 0 {
		return // the config or a comparison page, without problems
	}
	ew.printf("\n%s", displayPath(m.Path, lib))
	if m.Title != "" {
		ew.printf(" — %s", m.Title)
	}
	ew.printf("\n")
	for _, e := range m.Errors {
		ew.printf("  [!] invalid: %s\n", e)
	}
	for _, w := range m.Warnings {
		ew.printf("  [!] warning: %s\n", w)
	}
	if m.Closure != nil {
		mark := "[=]"
		if !m.Closure.OK {
			mark = "[≠]"
		}
		ew.printf("  %s %s\n", mark, closureWords(m.Closure))
	}
	if m.Closure != nil && len(m.Verdicts) == 0 {
		ew.printf("      no claims\n")
	}
	for _, v := range m.Verdicts {
		ew.printf("  [%s] %s: %s\n", v.Status.Mark(), v.Status, claimWords(v.Claim))
		ew.printf("      %s\n", v.Reason)
		if v.Basis != "" {
			ew.printf("      basis: %s\n", v.Basis)
		}
		if v.BasisNote != "" {
			ew.printf("      %s\n", v.BasisNote)
		}
		for _, p := range v.Pitfalls {
			ew.printf("      pitfall (%s): %s\n", p.Code, p.Text)
		}
	}
}

// writeResultText ends a report: the count of claims and the result.
func writeResultText(ew *errWriter, r *reviewReport) {
	c := r.Counts
	ew.printf("%s: %d supported, %d not supported, %d cannot be checked.\n",
		plural(c.Claims, "claim"), c.Supported, c.NotSupported, c.CannotCheck)
	switch {
	case r.OK:
		ew.printf("Result: consistent.\n")
	case r.Strict:
		ew.printf("Result: inconsistent (invalid files, closure failures, claims not supported, or, with --strict, claims that cannot be checked).\n")
	default:
		ew.printf("Result: inconsistent (invalid files, closure failures or claims not supported).\n")
	}
	ew.printf("Computed figures are not a certification; real performance depends on site, weather, soiling and ageing.\n")
}

// displayPath names a report group; the empty path is the library itself.
func displayPath(p, lib string) string {
	if p == "" {
		return lib
	}
	return p
}

func writeReviewJSON(w io.Writer, r *reviewReport) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(r)
}

// The JUnit XML shape read by CI systems: testsuites / testsuite /
// testcase with failure, error or skipped.
type (
	junitSuites struct {
		XMLName  xml.Name     `xml:"testsuites"`
		Name     string       `xml:"name,attr"`
		Tests    int          `xml:"tests,attr"`
		Failures int          `xml:"failures,attr"`
		Errors   int          `xml:"errors,attr"`
		Skipped  int          `xml:"skipped,attr"`
		Suites   []junitSuite `xml:"testsuite"`
	}
	junitSuite struct {
		Name     string      `xml:"name,attr"`
		Tests    int         `xml:"tests,attr"`
		Failures int         `xml:"failures,attr"`
		Errors   int         `xml:"errors,attr"`
		Skipped  int         `xml:"skipped,attr"`
		Cases    []junitCase `xml:"testcase"`
	}
	junitCase struct {
		Name      string       `xml:"name,attr"`
		Classname string       `xml:"classname,attr"`
		Failure   *junitResult `xml:"failure,omitempty"`
		Error     *junitResult `xml:"error,omitempty"`
		Skipped   *junitResult `xml:"skipped,omitempty"`
		SystemOut *junitText   `xml:"system-out,omitempty"`
	}
	junitResult struct {
		Message string `xml:"message,attr"`
		Type    string `xml:"type,attr,omitempty"`
		Text    string `xml:",cdata"`
	}
	junitText struct {
		Text string `xml:",cdata"`
	}
)

// junitOf turns a report into JUnit suites: one suite per file, with a
// case for reading it, one for closure and one per claim. Invalid files are
// errors, failed closure and unsupported claims failures, and claims that
// cannot be checked are skipped (failures under --strict).
func junitOf(r *reviewReport) junitSuites {
	out := junitSuites{Name: "skysheet review " + r.Library}
	for _, m := range r.Materials {
		name := displayPath(m.Path, r.Library)
		class := strings.TrimSuffix(strings.ReplaceAll(name, "/", "."), ".md")
		s := junitSuite{Name: name}
		read := junitCase{Name: "files read and parsed", Classname: class}
		if len(m.Errors) > 0 {
			read.Error = &junitResult{Message: fmt.Sprintf("%d problem(s) in %s", len(m.Errors), name), Type: "invalid", Text: strings.Join(m.Errors, "\n")}
		}
		s.Cases = append(s.Cases, read)
		if m.Closure != nil {
			c := junitCase{Name: "closure", Classname: class, SystemOut: &junitText{closureWords(m.Closure)}}
			if !m.Closure.OK {
				c.Failure = &junitResult{Message: closureWords(m.Closure), Type: "closure"}
			}
			s.Cases = append(s.Cases, c)
		}
		for i, v := range m.Verdicts {
			c := junitCase{Name: fmt.Sprintf("claim %d: %s", i+1, claimWords(v.Claim)), Classname: class}
			detail := verdictDetail(v)
			switch {
			case v.Status == datasheet.NotSupported, v.Status == datasheet.CannotCheck && r.Strict:
				c.Failure = &junitResult{Message: v.Status.String() + ": " + v.Reason, Type: v.Status.String(), Text: detail}
			case v.Status == datasheet.CannotCheck:
				c.Skipped = &junitResult{Message: v.Status.String() + ": " + v.Reason, Text: detail}
			default:
				c.SystemOut = &junitText{v.Status.String() + ": " + v.Reason + "\n" + detail}
			}
			s.Cases = append(s.Cases, c)
		}
		for _, c := range s.Cases {
			s.Tests++
			switch {
			case c.Error != nil:
				s.Errors++
			case c.Failure != nil:
				s.Failures++
			case c.Skipped != nil:
				s.Skipped++
			}
		}
		out.Tests += s.Tests
		out.Failures += s.Failures
		out.Errors += s.Errors
		out.Skipped += s.Skipped
		out.Suites = append(out.Suites, s)
	}
	return out
}

// verdictDetail is the basis, default-basis note and pitfalls of a verdict.
func verdictDetail(v datasheet.Verdict) string {
	var b strings.Builder
	fmt.Fprintf(&b, "computed %s, difference %s, allowed ±%s (%s)\n", num(v.Computed), num(v.Difference), num(v.Allowed), v.AllowedFrom)
	if v.Basis != "" {
		fmt.Fprintf(&b, "basis: %s\n", v.Basis)
	}
	if v.BasisNote != "" {
		fmt.Fprintln(&b, v.BasisNote)
	}
	for _, p := range v.Pitfalls {
		fmt.Fprintf(&b, "pitfall (%s): %s\n", p.Code, p.Text)
	}
	return b.String()
}

func num(n datasheet.Num) string {
	if math.IsNaN(float64(n)) {
		return "n/a"
	}
	return strconv.FormatFloat(float64(n), 'g', 6, 64)
}

func writeReviewJUnit(w io.Writer, r *reviewReport) error {
	ew := &errWriter{w: w}
	ew.printf("%s", xml.Header)
	enc := xml.NewEncoder(ew)
	enc.Indent("", "  ")
	if err := enc.Encode(junitOf(r)); err != nil {
		return err
	}
	ew.printf("\n")
	return ew.err
}

// errWriter keeps the first write error.
type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return 0, e.err
	}
	n, err := e.w.Write(p)
	e.err = err
	return n, err
}

func (e *errWriter) printf(format string, a ...any) { fmt.Fprintf(e, format, a...) }
