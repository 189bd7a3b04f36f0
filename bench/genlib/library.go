package main

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"
)

// The two instruments' grids: UV-Vis-NIR 250–2500 nm every 1 nm, FTIR
// 4000–400 cm⁻¹ every 2 cm⁻¹. They meet at 2500 nm = 4000 cm⁻¹.
const (
	uvFirstNM, uvLastNM, uvStepNM = 250, 2500, 1
	irFirstCM, irLastCM, irStepCM = 4000, 400, 2
)

// uvRows and irRows are the number of data rows of each file.
const (
	uvRows = (uvLastNM-uvFirstNM)/uvStepNM + 1
	irRows = (irFirstCM-irLastCM)/irStepCM + 1
)

// family is a kind of surface: its category (one listing page), slug
// prefix, share of the library, model, a sentence about it and its
// (invented) makers.
type family struct {
	category, prefix string
	weight           int
	draw             func(*rand.Rand) variant
	about            string
	makers           []string
}

var families = []family{
	{"paint", "wp", 30, whitePaint, "A white paint: rutile titania scatters strongly in the visible and absorbs below its band gap near 400 nm; the acrylic binder absorbs in the thermal infrared, so the film emits there.", []string{"Corvellan Paints", "Orchardine Paints", "Ivyrest Finishes"}},
	{"coating", "wc", 15, whiteCoating, "A white coating without a pigment edge in the near UV: its reflectance stays high down to about 300 nm, and its polymer bands make it emit in the thermal infrared.", []string{"Ashbrindle Coatings", "Tamberlith Coatings", "Mossglen Chemicals"}},
	{"dark", "dk", 15, darkSurface, "A dark roof paint: its pigment absorbs most of the visible; some dark pigments reflect the near infrared, which carries about half of the solar energy.", []string{"Elsweather Roofing", "Corvellan Paints", "Ivyrest Finishes"}},
	{"film", "sf", 12, silveredFilm, "A polyester film over a silver mirror: the silver reflects the solar range, the polyester's bands make the film emit in the thermal infrared.", []string{"Dunmorrow Films", "Wrenmarsh Films", "Hollinvane Polymers"}},
	{"metal", "mt", 8, metal, "Sheet metal: high reflectance in the infrared and therefore a low thermal emittance.", []string{"Jasperlode Metals", "Pellwick Sheetworks"}},
	{"cover", "cv", 10, cover, "A transparent sheet: it transmits most of the solar range; a polymer film also transmits much of the thermal infrared, glass absorbs it.", []string{"Kestrelvane Glass", "Hollinvane Polymers", "Glimmerwold Surfaces"}},
	{"fabric", "fb", 10, fabric, "A white fabric: fibres scatter the solar range, and the open area between yarns transmits at every wavelength.", []string{"Fernhallow Textiles", "Larkspindle Materials"}},
}

// lab is the invented laboratory that measured the library.
const lab = "Quillmere Cool Surfaces Laboratory (invented)"

// material is one drawn material: everything but its spectra.
type material struct {
	index                          int
	fam                            *family
	v                              variant
	slug, title, maker, code, date string
	panel                          int
	uvNoise, irNoise, step, tail   float64
	claimR, claimE                 bool    // states a claim of solar reflectance / thermal emittance
	biasR, biasE                   float64 // optimism of those claims
	noiseSeed                      [2]uint64
}

// slugWidth is the number of digits in slugs: at least 5, more for larger
// libraries, so that slugs sort in index order.
func slugWidth(n int) int { return max(5, len(strconv.Itoa(n))) }

// describe draws material i of a library of n from the seed. It is cheap
// and depends only on (seed, n, i), so materials can be made in any order.
func describe(seed uint64, n, i int) *material {
	r := rand.New(rand.NewPCG(seed, uint64(i)))
	total := 0
	for _, f := range families {
		total += f.weight
	}
	pick := r.IntN(total)
	var fam *family
	for k := range families {
		if pick < families[k].weight {
			fam = &families[k]
			break
		}
		pick -= families[k].weight
	}
	m := &material{index: i, fam: fam}
	m.v = fam.draw(r)
	maker := fam.makers[r.IntN(len(fam.makers))]
	m.maker = maker + " (invented)"
	m.slug = fmt.Sprintf("%s-%0*d", fam.prefix, slugWidth(n), i+1)
	m.code = fmt.Sprintf("%c%c-%d", maker[0], strings.ToUpper(fam.prefix)[0], 100+i)
	m.title = fmt.Sprintf("%s %s %s (invented)", strings.Fields(maker)[0], m.code, m.v.kind)
	m.date = time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC).AddDate(0, 0, r.IntN(365)).Format("2006-01-02")
	m.panel = 1 + r.IntN(5)
	m.uvNoise = uniform(r, 0.0005, 0.002)
	m.irNoise = uniform(r, 0.001, 0.004)
	m.step = uniform(r, -0.003, 0.003) // detector change-over at 860 nm
	m.tail = uniform(r, 1.5, 3)        // noise grows at the ends of each range
	m.claimR = i%3 == 0
	m.claimE = i%3 == 0 && !m.v.transmissive
	if r.IntN(4) == 0 {
		m.biasR = uniform(r, 0.02, 0.06)
	}
	if r.IntN(4) == 0 {
		m.biasE = uniform(r, 0.02, 0.05)
	}
	m.noiseSeed = [2]uint64{seed ^ 0x9e3779b97f4a7c15, uint64(i)}
	return m
}

// spectra are a material's two measured files as numbers.
type spectra struct {
	uvNM, uvR, uvT []float64 // ascending, 1 nm
	irCM, irR, irT []float64 // wavenumbers descending, as an FTIR writes them
}

// measure evaluates the model on both grids and adds instrument noise:
// Gaussian, larger at the ends of each range, and a small step where the
// UV-Vis-NIR instrument changes detector (860 nm). Values are kept within
// 0..1 with R + T ≤ 1, as a careful operator's export would be.
func (m *material) measure() *spectra {
	r := rand.New(rand.NewPCG(m.noiseSeed[0], m.noiseSeed[1]))
	s := &spectra{
		uvNM: make([]float64, uvRows), uvR: make([]float64, uvRows), uvT: make([]float64, uvRows),
		irCM: make([]float64, irRows), irR: make([]float64, irRows), irT: make([]float64, irRows),
	}
	for k := range uvRows {
		nm := float64(uvFirstNM + k*uvStepNM)
		sd := m.uvNoise
		if nm < 300 || nm > 2200 {
			sd *= m.tail
		}
		off := 0.0
		if nm >= 860 {
			off = m.step
		}
		s.uvNM[k] = nm
		s.uvR[k], s.uvT[k] = m.noisy(r, nm, sd, off)
	}
	for k := range irRows {
		cm := float64(irFirstCM - k*irStepCM)
		sd := m.irNoise
		if cm < 600 || cm > 3800 {
			sd *= m.tail
		}
		s.irCM[k] = cm
		s.irR[k], s.irT[k] = m.noisy(r, 1e7/cm, sd, 0)
	}
	return s
}

func (m *material) noisy(r *rand.Rand, nm, sd, off float64) (float64, float64) {
	rr, t := m.v.at(nm)
	rr = clamp(rr + off + sd*r.NormFloat64())
	if !m.v.transmissive {
		return rr, 0
	}
	t = clamp(t + sd*r.NormFloat64())
	if rr+t > 1 {
		t = 1 - rr
	}
	return rr, t
}

func clamp(x float64) float64 { return math.Min(1, math.Max(0, x)) }

// Generate writes a library of n invented materials into dir, which must
// not exist or be empty. The same (n, seed) always gives the same bytes.
func Generate(dir string, n int, seed uint64) error {
	if n < 1 {
		return fmt.Errorf("want at least 1 material, got %d", n)
	}
	if ents, err := os.ReadDir(dir); err == nil && len(ents) > 0 {
		return fmt.Errorf("%s is not empty: give a new or empty folder", dir)
	} else if err != nil && !errors.Is(err, os.ErrNotExist) {
		return err
	}
	if err := os.MkdirAll(filepath.Join(dir, "content"), 0o755); err != nil {
		return err
	}
	if err := os.WriteFile(filepath.Join(dir, "skysheet.yaml"), []byte(config(n, seed)), 0o644); err != nil {
		return err
	}
	for _, f := range append(families, family{category: "compare"}) {
		if err := os.MkdirAll(filepath.Join(dir, "content", f.category), 0o755); err != nil {
			return err
		}
	}
	var (
		next     = make(chan int)
		wg       sync.WaitGroup
		mu       sync.Mutex
		firstErr error
	)
	for range runtime.GOMAXPROCS(0) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var buf []byte
			for i := range next {
				var err error
				buf, err = writeMaterial(dir, describe(seed, n, i), buf)
				if err != nil {
					mu.Lock()
					if firstErr == nil {
						firstErr = err
					}
					mu.Unlock()
				}
			}
		}()
	}
	for i := range n {
		next <- i
	}
	close(next)
	wg.Wait()
	if firstErr != nil {
		return firstErr
	}
	// One comparison page per hundred materials: the first three of each hundred.
	for k := range n / 100 {
		if err := writeComparison(dir, seed, n, k); err != nil {
			return err
		}
	}
	return nil
}

// writeMaterial writes the material's Markdown file and its two spectra,
// reusing buf as scratch space; it returns the buffer for the next call.
func writeMaterial(dir string, m *material, buf []byte) ([]byte, error) {
	s := m.measure()
	folder := filepath.Join(dir, "content", m.fam.category, m.slug)
	if err := os.MkdirAll(folder, 0o755); err != nil {
		return buf, err
	}
	buf = m.fileHeader(buf[:0], "UV-Vis-NIR spectrophotometer with 150 mm integrating sphere (invented)",
		"diffuse white reflectance standard (invented)", "wavelength_nm")
	buf = appendRows(buf, s.uvNM, s.uvR, s.uvT)
	if err := os.WriteFile(filepath.Join(folder, "uvvis.csv"), buf, 0o644); err != nil {
		return buf, err
	}
	buf = m.fileHeader(buf[:0], "FTIR spectrometer with gold-coated integrating sphere (invented)",
		"diffuse gold standard (invented)", "wavenumber_cm-1")
	buf = appendRows(buf, s.irCM, s.irR, s.irT)
	if err := os.WriteFile(filepath.Join(folder, "ftir.csv"), buf, 0o644); err != nil {
		return buf, err
	}
	buf = m.markdown(buf[:0], s)
	return buf, os.WriteFile(filepath.Join(dir, "content", m.fam.category, m.slug+".md"), buf, 0o644)
}

// fileHeader appends the metadata comments and the header line of a spectrum file.
func (m *material) fileHeader(b []byte, instrument, reference, axis string) []byte {
	b = fmt.Appendf(b, "# sample: %s, panel %d (synthetic data, not a measurement)\n", m.title, m.panel)
	b = fmt.Appendf(b, "# instrument: %s\n# angle of incidence: 8°\n# reference standard: %s\n", instrument, reference)
	b = fmt.Appendf(b, "# date: %s\n# generated by: go run ./bench/genlib\n# u_R: 0.005\n", m.date)
	if m.v.transmissive {
		b = append(b, "# u_T: 0.005\n"...)
	}
	return fmt.Appendf(b, "%s,R,T\n", axis)
}

// appendRows appends one row per point: the axis as an integer, R and T
// with four decimals.
func appendRows(b []byte, x, r, t []float64) []byte {
	for k := range x {
		b = strconv.AppendInt(b, int64(x[k]), 10)
		b = append(b, ',')
		b = appendFrac(b, r[k])
		b = append(b, ',')
		b = appendFrac(b, t[k])
		b = append(b, '\n')
	}
	return b
}

// appendFrac appends x in [0, 1] with four decimals.
func appendFrac(b []byte, x float64) []byte {
	return strconv.AppendFloat(b, math.Round(x*1e4)/1e4+0, 'f', 4, 64)
}

func config(n int, seed uint64) string {
	return fmt.Sprintf(`# Benchmark library of skysheet: an invented laboratory, invented makers and invented products.
# Every spectrum in content/ is synthetic data, not a measurement.
# Generated by: go run ./bench/genlib -n %d -seed %d
title: Benchmark library of %d invented materials
description: >-
  A library generated for skysheet's benchmarks: white paints, coatings, dark paints, silvered
  films, sheet metal, transparent covers and fabrics. All makers, products and spectra are
  invented; the spectra are synthetic data, not measurements.
lab: %s
conditions:
  solar_band_nm: [280, 2500]
  solar_spectrum: global
  thermal_band_um: [2.5, 25]
  window_band_um: [8, 13]
  temperature_k: 300
  closure_tolerance: 0.02
`, n, seed, n, lab)
}

// markdown appends the material's Markdown file: front matter and body.
func (m *material) markdown(b []byte, s *spectra) []byte {
	b = append(b, "---\n"...)
	b = fmt.Appendf(b, "title: %s\nslug: %s\nmaker: %s\nlab: %s\nproduct_code: %s\ncategory: %s\n",
		m.title, m.slug, m.maker, lab, m.code, m.fam.category)
	b = fmt.Appendf(b, "tags: [%s]\n", strings.Join(m.v.tags, ", "))
	b = fmt.Appendf(b, "summary: %q\nlicense: CC-BY-4.0\n", fmt.Sprintf("Invented %s, panel %d; synthetic spectra, not a measurement.", m.v.kind, m.panel))
	b = fmt.Appendf(b, "spectra:\n  - file: %s/uvvis.csv\n    role: solar\n    instrument: UV-Vis-NIR spectrophotometer with 150 mm integrating sphere (invented)\n", m.slug)
	b = fmt.Appendf(b, "  - file: %s/ftir.csv\n    role: thermal\n    instrument: FTIR spectrometer with gold-coated integrating sphere (invented)\n", m.slug)
	b = fmt.Appendf(b, "measured:\n  date: %s\n  instrument: UV-Vis-NIR spectrophotometer and FTIR spectrometer, both with integrating spheres (invented)\n", m.date)
	b = append(b, "  angle: \"8°\"\n  reference: diffuse white standard (UV-Vis-NIR) and diffuse gold standard (FTIR), both invented\n"...)
	b = append(b, "  operator: optics bench technician (invented)\n  notes: \"Synthetic data, not a measurement.\"\n"...)
	if m.claimR || m.claimE {
		b = append(b, "claims:\n"...)
		if m.claimR {
			b = fmt.Appendf(b, "  - figure: solar_reflectance\n    value: %.2f\n    tolerance: 0.02\n    source: %s product sheet (invented)\n",
				math.Min(0.99, estimateSolar(s)+m.biasR), m.code)
		}
		if m.claimE {
			b = fmt.Appendf(b, "  - figure: thermal_emittance\n    value: %.2f\n    tolerance: 0.02\n    source: %s product sheet (invented)\n",
				math.Min(0.99, estimateThermal(s)+m.biasE), m.code)
		}
	}
	b = append(b, "---\n\n## What it is\n\n"...)
	b = fmt.Appendf(b, "%s This is panel %d of an invented %s.\n\n", m.fam.about, m.panel, m.v.kind)
	b = append(b, "## How it was measured\n\n"...)
	b = append(b, "UV-Vis-NIR reflectance and transmittance from 250 to 2500 nm every 1 nm with an integrating sphere, and "+
		"FTIR from 4000 to 400 cm⁻¹ every 2 cm⁻¹ with a gold-coated sphere, both at 8° incidence. The two ranges meet at 2500 nm.\n\n"...)
	b = append(b, "**Invented example.** Generated by `go run ./bench/genlib` for skysheet's benchmarks: the maker, the "+
		"product and the spectra are invented; the spectra are synthetic data, not a measurement. Computed figures are "+
		"not a certification: real performance depends on site, weather, soiling and ageing, and roofing, building and "+
		"energy decisions defer to local codes and licensed professionals.\n"...)
	return b
}

// writeComparison writes comparison page k: materials 100k+1 to 100k+3.
func writeComparison(dir string, seed uint64, n, k int) error {
	var slugs []string
	for i := k * 100; i < k*100+3; i++ {
		slugs = append(slugs, describe(seed, n, i).slug)
	}
	text := fmt.Sprintf("---\ntitle: Comparison set %d (invented)\nslug: set-%0*d\ncompare: [%s]\nsummary: \"Three invented materials side by side; synthetic spectra.\"\n---\n"+
		"Three materials of the invented benchmark library, side by side. Synthetic data, not measurements.\n",
		k+1, slugWidth(n), k+1, strings.Join(slugs, ", "))
	return os.WriteFile(filepath.Join(dir, "content", "compare", fmt.Sprintf("set-%0*d.md", slugWidth(n), k+1)), []byte(text), 0o644)
}

// estimateSolar is the invented maker's own estimate of solar reflectance:
// R weighted by a 5778 K blackbody seen through 1.5 air masses of Rayleigh
// and aerosol extinction, with ozone's UV cut-off and the deepest water
// bands cut out, 280–2500 nm. It is a rough stand-in for ASTM G173 (within
// about 0.01–0.03), good enough for an invented claim.
func estimateSolar(s *spectra) float64 {
	var num, den float64
	for k, nm := range s.uvNM {
		if nm < 280 {
			continue
		}
		um := nm / 1000
		tau := 0.0088*math.Pow(um, -4.05) + 0.1*math.Pow(um, -1.3)
		w := planck(nm, 5778) * math.Exp(-1.5*tau) * sig(nm, 300, 8) *
			(1 - 0.9*bump(nm, 1380, 40) - 0.95*bump(nm, 1870, 60) - 0.5*bump(nm, 1130, 30) - 0.4*bump(nm, 940, 25))
		num += w * s.uvR[k]
		den += w
	}
	return num / den
}

// estimateThermal is the maker's estimate of thermal emittance: 1 − R − T
// weighted by a 300 K blackbody over 2.5–25 µm, on the FTIR points.
func estimateThermal(s *spectra) float64 {
	var num, den float64
	for k, cm := range s.irCM {
		nm := 1e7 / cm
		w := planck(nm, 300) * nm * nm // per unit wavenumber: B_λ dλ = B_λ λ²/1e7 dν
		num += w * (1 - s.irR[k] - s.irT[k])
		den += w
	}
	return num / den
}

// planck is the blackbody spectral radiance up to a constant factor.
func planck(nm, kelvin float64) float64 {
	const c2 = 1.438776877e7 // second radiation constant, nm K (CODATA 2018)
	return 1 / (nm * nm * nm * nm * nm * math.Expm1(c2/(nm*kelvin)))
}
