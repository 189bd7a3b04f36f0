// Command generate writes skysheet's demo library: skysheet.yaml at the
// repository root and, under content/, seventeen invented materials (Markdown
// with front matter, plus their spectrum files), two systems computed as
// stacks of layers, and the comparison pages. Everything
// it writes is an invented scenario — an invented laboratory, invented
// makers and products — and every spectrum is synthetic data, not a
// measurement.
//
// Run it from the repository root:
//
//	go run ./content/generate
//
// It is deterministic: the same source writes the same bytes. After writing,
// it recomputes every material's figures with the datasheet package and checks
// that each claim in the front matter shows what the demo means it to show
// (supported, too high, percent written for a fraction, partial coverage,
// cannot be checked); it exits with status 1 if one does not.
//
// # How the spectra are made
//
// Each material is a small physical model evaluated from 250 nm to 25 µm, so
// that its UV-Vis-NIR file (250–2500 nm) and its FTIR file (2.5–25 µm) meet at
// 2500 nm without a step. Absorption bands sit at the usual group frequencies
// (O–H ~3400–3550 cm⁻¹ ≈ 2.8–2.9 µm, C–H ~2950 cm⁻¹ ≈ 3.4 µm, C=O ~1730 cm⁻¹ ≈
// 5.8 µm, C–O and Si–O ~1050–1250 cm⁻¹ ≈ 8–10 µm, S–O of sulfate ~1120 cm⁻¹,
// C–F ~1180 cm⁻¹) with invented strengths; near-IR overtones of C–H and water
// (1200, 1450, 1720, 1940, 2300 nm) give the small dips seen in real paints.
//
//   - Pigmented paints (rutile TiO₂ white, its soiled aged version, barium
//     sulfate white): Kubelka–Munk two-flux theory for a film of finite
//     thickness over a grey primer, R = R_layer + T_layer² R_g / (1 − R_layer
//     R_g), with the Saunderson correction for the front surface. Scattering
//     falls with wavelength and vanishes beyond the pigment size, so the near
//     infrared reflectance drops and the film becomes absorbing (emissive) in
//     the thermal infrared. TiO₂ absorbs below its band gap (edge near
//     400 nm); barium sulfate has no edge above 250 nm, so its UV reflectance
//     stays high until the acrylic binder absorbs below ~300 nm. The aged
//     paint adds a thin soil film crossed twice, whose absorption falls with
//     wavelength like soot and mineral dust.
//   - The dark roof coating: carbon black absorbing through the whole solar
//     range, weak scattering, in the same acrylic binder.
//   - The porous polymer coating: a fluorinated polymer with ~50 % air voids
//     of 0.1–5 µm; strong, nearly wavelength-flat scattering and no pigment
//     edge, so high UV and near-IR reflectance; strong C–F bands give a high
//     thermal emittance.
//   - The silvered polyester film: a 50 µm polyester layer crossed twice over
//     a silver mirror (silver's reflectance minimum near 320 nm, ~0.97–0.99
//     above 450 nm), plus the front-surface Fresnel reflectance; the
//     polyester's C=O, C–O and ring bands make it emit in the infrared.
//   - The canopy fabric: Kubelka–Munk for a fibre layer, free-standing, with
//     5 % open area between yarns that transmits at every wavelength — so R,
//     T and A are all substantial.
//   - The selective emitter: spectral emittance built directly — silver's
//     small absorptance everywhere, a high plateau from 8 to 13 µm (the
//     atmospheric window) with a dip from the partly uncompensated Si–O
//     reststrahlen band near 9.3 µm, and a Si–O bending band near 21.5 µm.
//   - The float glass: an incoherent slab with Fresnel surfaces (Cauchy
//     index) and bulk absorption from the UV edge, Fe³⁺ (380 nm), the broad
//     Fe²⁺ band (~1050 nm), O–H (2.8 µm) and multiphonon absorption past
//     4.5 µm; in the thermal infrared the surface reflectance follows the
//     silicate Christiansen minimum (~7.5 µm) and reststrahlen peaks (~9.4 and
//     ~21 µm). Its absorptance is also "measured" with a small offset and
//     ripple so that closure R + T + A = 1 holds only within a tolerance.
//   - The porous polyethylene cover and the infrared-clear knit:
//     Kubelka–Munk for a mostly-void polymer whose pores scatter sunlight
//     and whose few C–H bands (3.4, 6.8, 13.9 µm) are all it absorbs in the
//     thermal infrared. The cotton-like weave: cellulose, absorbing strongly
//     across the thermal infrared. The skin-like surface: an invented
//     reflectance shaped after published ranges (melanin, haemoglobin dips,
//     water bands; from memory), not a measurement of anyone.
//   - The glazed tile: a zircon-opacified silicate glaze (Kubelka–Munk) over
//     a buff clay body; opaque in the thermal infrared, with silicate
//     reststrahlen bands lowering its window emittance.
//
// The files come in the shapes instruments export: CSV, tab- and
// semicolon-separated with decimal commas, space-separated; fractions or
// percent; wavelength in nm (ascending or descending), in µm, or wavenumber
// in cm⁻¹ descending; with a constant u_R in the metadata or a per-point
// u_R column.
package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// output is one file of the demo library, its path relative to the root.
type output struct {
	path string
	data []byte
}

// library returns every file of the demo library, in a fixed order.
func library() []output {
	out := []output{{"skysheet.yaml", []byte(siteConfig)}}
	for _, m := range materials() {
		out = append(out, output{filepath.ToSlash(filepath.Join("content", m.path)), m.markdown()})
		for _, f := range m.files {
			out = append(out, output{filepath.ToSlash(filepath.Join("content", m.folder(), f.name)), f.render(m.model)})
		}
	}
	for _, st := range stacks() {
		out = append(out, output{filepath.ToSlash(filepath.Join("content", st.path)), st.markdown()})
		for _, l := range st.layers {
			for _, f := range l.files {
				out = append(out, output{filepath.ToSlash(filepath.Join("content", st.folder(), f.name)), f.render(l.model)})
			}
		}
	}
	for _, c := range comparisons() {
		out = append(out, output{filepath.ToSlash(filepath.Join("content", c.path)), c.markdown()})
	}
	return out
}

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("generate", flag.ContinueOnError)
	fs.SetOutput(stderr)
	root := fs.String("root", ".", "repository root to write into (must hold go.mod)")
	check := fs.Bool("check", false, "write nothing; exit 1 if any file differs from what would be written")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	if _, err := os.Stat(filepath.Join(*root, "go.mod")); err != nil {
		fmt.Fprintf(stderr, "generate: %s is not the repository root (no go.mod); run from the root or pass -root\n", *root)
		return 2
	}
	files := library()
	if *check {
		stale := 0
		for _, f := range files {
			old, err := os.ReadFile(filepath.Join(*root, f.path))
			if err != nil || !bytes.Equal(old, f.data) {
				fmt.Fprintf(stderr, "generate: %s is out of date\n", f.path)
				stale++
			}
		}
		if stale > 0 {
			return 1
		}
	} else {
		for _, f := range files {
			p := filepath.Join(*root, f.path)
			if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
				fmt.Fprintln(stderr, "generate:", err)
				return 1
			}
			if err := os.WriteFile(p, f.data, 0o644); err != nil {
				fmt.Fprintln(stderr, "generate:", err)
				return 1
			}
		}
		fmt.Fprintf(stdout, "wrote %d files under %s\n", len(files), *root)
	}
	if err := verify(files, stdout); err != nil {
		fmt.Fprintln(stderr, "generate:", err)
		return 1
	}
	return 0
}
