package main

import (
	"fmt"
	"math"
	"path"
	"strings"
)

// The systems of the demo: a porous polyethylene cover over the selective
// emitter, a reflective cover film over the dark painted panel, and two
// textiles worn over a skin-like surface. The layers that are materials of
// their own (the cover, the textiles, the skin-like surface) are in
// materials(); the stacks are here.

var (
	// polyethylene: C–H stretches (2920, 2850), combinations (4330, 4250),
	// the CH₂ scissor (1470), wag (1370) and rock (720) — and almost nothing
	// else, which is why it passes the thermal infrared.
	polyethylene = bands{{4330, 60, 8}, {4250, 60, 6}, {2920, 40, 900}, {2850, 35, 700}, {1470, 20, 300}, {1370, 15, 30}, {720, 12, 350}}
	// cellulose (cotton): broad O–H (3340), C–H (2900), adsorbed water
	// (1640), CH₂ and C–H bends, the strong C–O stretches of the ring and
	// glycosidic bonds (1160–1030) and the broad O–H out-of-plane band.
	cellulose = bands{{3340, 350, 400}, {2900, 80, 60}, {1640, 60, 40}, {1430, 40, 60}, {1370, 40, 60},
		{1160, 60, 300}, {1110, 50, 350}, {1060, 60, 500}, {1030, 60, 500}, {900, 30, 60}, {670, 150, 120}}
)

// peCover is a porous polyethylene cover 3 mm thick, about 4 % polymer by
// volume: voids of a fraction of a micrometre scatter sunlight strongly, the
// scattering fades past 2 µm, and the polymer absorbs only in its few C–H
// bands, so most of the thermal infrared passes.
func peCover(nm float64) point {
	nu := wavenumber(nm)
	const x, solid = 3.0, 0.04
	s := 4*math.Pow(550/nm, 1.2)/(1+math.Pow(nm/1800, 4)) + 0.02
	k := solid * (0.04 + polyethylene.at(nu) + 0.5*nirOvertones.at(nu) + 400*fall(nm, 260, 8))
	r, t := kmSlab(k, s, x)
	return point{R: clamp01(r), T: clamp01(t)}
}

// coverFabric is a reflective car-cover-like fabric, 0.4 mm: polyester
// fibres with a white TiO₂ coating scatter strongly; 1 % open area.
func coverFabric(nm float64) point {
	nu := wavenumber(nm)
	const open = 0.01
	s := 30 * math.Pow(550/nm, 0.4) / (1 + math.Pow(nm/4000, 3))
	k := 0.5*(0.006+polyester.at(nu)+fingerprint(nu, 14)+0.8*nirOvertones.at(nu)+250*fall(nm, 318, 6)) + 0.02*titania(nm)
	rl, tl := kmSlab(k, s, 0.4)
	r, t := saunderson(rl, tl, 0.04, 0.2)
	return point{R: clamp01((1 - open) * r), T: clamp01((1-open)*t + open)}
}

// cottonWeave is an ordinary undyed woven cotton-like fabric, 0.3 mm,
// about half fibre by volume: cellulose absorbs strongly through the
// thermal infrared, natural colour absorbs a little in the blue and UV, and
// 3 % open area lets light straight through.
func cottonWeave(nm float64) point {
	nu := wavenumber(nm)
	const open = 0.03
	s := 20 * math.Pow(550/nm, 0.3) / (1 + math.Pow(nm/3000, 3))
	k := 0.5*(0.01+cellulose.at(nu)+fingerprint(nu, 20)+0.8*nirOvertones.at(nu)) + 0.25*fall(nm, 420, 40)
	rl, tl := kmSlab(k, s, 0.3)
	r, t := saunderson(rl, tl, 0.04, 0.3)
	return point{R: clamp01((1 - open) * r), T: clamp01((1-open)*t + open)}
}

// peWeave is a knitted textile of porous polyethylene fibres, 0.15 mm:
// the pores scatter sunlight, a trace of a UV absorber takes the UV, and
// the fibres pass most of the thermal infrared (a little scattering by the
// fibres themselves remains there).
func peWeave(nm float64) point {
	nu := wavenumber(nm)
	s := 60*(550/nm)/(1+math.Pow(nm/2000, 4)) + 2
	k := 0.5*(0.02+polyethylene.at(nu)+0.5*nirOvertones.at(nu)) + 7*fall(nm, 370, 10)
	r, t := kmSlab(k, s, 0.15)
	return point{R: clamp01(r), T: clamp01(t)}
}

// skinLike is an invented skin-like surface, shaped after the ranges of
// skin reflectance found in the literature (from memory, not a data set):
// low in the UV, rising through the visible as melanin absorbs less, small
// haemoglobin dips near 420, 542 and 577 nm, a near-infrared plateau, then
// the water bands (970, 1200, 1450, 1940 nm) and black beyond 2.5 µm
// except a surface reflectance of 0.02 (emittance 0.98).
func skinLike(nm float64) point {
	base := 0.05 + 0.55*rise(nm, 620, 55) - 0.08*gauss(nm, 420, 35) - 0.05*gauss(nm, 542, 22) - 0.05*gauss(nm, 577, 22)
	water := 0.002 + 0.05*gauss(nm, 970, 80) + 0.12*gauss(nm, 1200, 110) + 3*gauss(nm, 1450, 120) +
		0.6*gauss(nm, 1780, 160) + 12*gauss(nm, 1940, 150) + 2*gauss(nm, 2300, 400) + 1000*rise(nm, 2650, 60)
	return point{R: clamp01(0.02 + math.Max(0, base)*math.Exp(-0.5*water))}
}

func pc3() material {
	return material{
		path:  "films/pc-3.md",
		title: "Harlowe PC-3 porous polyethylene cover", maker: "Harlowe Membranes (invented)",
		productCode: "PC-3", category: "cover", tags: []string{"cover", "polyethylene", "porous", "ir-transparent"},
		summary: "3 mm porous polyethylene cover that scatters sunlight and passes most of the thermal infrared (invented product, synthetic spectra).",
		license: "MIT",
		files: []fileSpec{
			uvFile("Harlowe PC-3 sheet 1", "2026-09-02", "R", "T"),
			irMicrons("Harlowe PC-3 sheet 1", "2026-09-02", "R", "T"),
		},
		measured: measured{date: "2026-09-02", instrument: bothInstr, angle: "8°", reference: bothRefs, operator: operator,
			notes: "Free-standing sheet, reflectance and transmittance both measured. " + "Synthetic data, not a measurement."},
		model: peCover,
		body: body(`## What it is

PC-3 is an invented cover for cooling panels: a 3 mm sheet of porous polyethylene, mostly air. The
pores scatter sunlight back, the polymer absorbs only in its few C–H bands, and so the thermal
radiation of a panel beneath passes through it while the wind does not.

## What to look for

- High solar reflectance with a little transmittance: the pores are smaller than the near-infrared
  wavelengths, so reflectance falls and transmittance rises towards 2.5 µm.
- Transmittance above 0.8 through most of the 8–13 µm window; the C–H bands near 3.4, 6.8 and
  13.9 µm absorb.
- It is used as the top layer of [QL-SE3 under the PC-3 cover](../ql-se3-covered/index.html).`),
	}
}

func co1() material {
	return material{
		path:  "fabrics/co-1.md",
		title: "Plain woven cotton-like shirting CO-1", maker: "Ellery Mills (invented)",
		productCode: "CO-1", category: "fabric", tags: []string{"textile", "cotton-like", "woven", "reference"},
		summary: "Ordinary undyed plain-weave cotton-like fabric, 0.3 mm, kept as the reference textile (invented product, synthetic spectra).",
		license: "MIT",
		files: []fileSpec{
			uvFile("Ellery CO-1 swatch", "2026-09-08", "R", "T"),
			irMicrons("Ellery CO-1 swatch", "2026-09-08", "R", "T"),
		},
		measured: measured{date: "2026-09-08", instrument: bothInstr, angle: "8°", reference: bothRefs, operator: operator,
			notes: "Single layer, conditioned at 20 °C and 65 % RH. " + "Synthetic data, not a measurement."},
		model: cottonWeave,
		body: body(`## What it is

CO-1 is an invented ordinary shirting: undyed cotton-like fibres in a plain weave, 0.3 mm thick. It
is the reference textile of the [textile comparison](../../compare/textiles-over-skin/index.html).

## What to look for

- Moderate solar reflectance, a little lower in the blue and UV where the natural colour of the
  fibre absorbs; some transmittance through the open area between yarns.
- Cellulose absorbs strongly across the thermal infrared: the fabric is nearly opaque there and
  emits like a dark body, whatever its colour.`),
	}
}

func pw2() material {
	return material{
		path:  "fabrics/pw-2.md",
		title: "Sorrel PW-2 infrared-clear knit", maker: "Sorrel Textiles (invented)",
		productCode: "PW-2", category: "fabric", tags: []string{"textile", "polyethylene", "porous", "ir-transparent"},
		summary: "Knit of porous polyethylene fibres, 0.15 mm, with a trace of UV absorber (invented product, synthetic spectra).",
		license: "MIT",
		files: []fileSpec{
			uvFile("Sorrel PW-2 swatch", "2026-09-08", "R", "T"),
			irMicrons("Sorrel PW-2 swatch", "2026-09-09", "R", "T"),
		},
		measured: measured{date: "2026-09-08", instrument: bothInstr, angle: "8°", reference: bothRefs, operator: operator,
			notes: "Single layer, free-standing. " + "Synthetic data, not a measurement."},
		model: peWeave,
		body: body(`## What it is

PW-2 is an invented knit of porous polyethylene fibres. The pores scatter sunlight; the polymer
hardly absorbs in the thermal infrared, so the heat the skin radiates largely passes through.

## What to look for

- High solar reflectance; UV transmittance kept low by a trace of UV absorber.
- Transmittance around 0.7 through much of the thermal infrared, against the cotton-like
  reference's few per cent: compare them in the
  [textile comparison](../../compare/textiles-over-skin/index.html).`),
	}
}

func sk1() material {
	return material{
		path:  "reference/sk-1.md",
		title: "Skin-like reference surface SK-1 (invented spectrum)", lab: labName,
		productCode: "SK-1", category: "reference surface", tags: []string{"skin-like", "reference", "invented-spectrum"},
		summary: "An invented reflectance spectrum shaped like published ranges of skin reflectance, for wearing textiles over (invented, synthetic).",
		license: "MIT",
		files: []fileSpec{
			uvFile("SK-1 skin-like spectrum", "2026-09-10", "R"),
			irMicrons("SK-1 skin-like spectrum", "2026-09-10", "R"),
		},
		measured: measured{date: "2026-09-10", instrument: "none: computed from a model", angle: "8°", reference: "none",
			operator: operator, notes: "Invented spectrum shaped like published ranges of skin reflectance (from memory), not a measurement of anyone."},
		model: skinLike,
		body: body(`## What it is

SK-1 is **not a measurement of skin**. It is an invented reflectance spectrum shaped like the
ranges of skin reflectance found in the literature (from memory): low in the UV, rising through the
visible as melanin absorbs less, small haemoglobin dips near 420, 542 and 577 nm, a near-infrared
plateau, the water bands near 970, 1200, 1450 and 1940 nm, and nearly black in the thermal infrared
(emittance 0.98). Real skin varies widely from person to person and place to place.

It is the surface the textiles are worn over in the
[textile comparison](../../compare/textiles-over-skin/index.html).`),
	}
}

// stack is a demo material declared as a stack of layers.
type stack struct {
	path, title, productCode, category, summary string
	tags                                        []string
	layers                                      []stackLayer
	body                                        string
}

// stackLayer is a layer of a demo stack: a library material, or its own
// files (name set) computed from model.
type stackLayer struct {
	slug, name     string
	files          []fileSpec
	model          model
	thicknessMM, k float64 // 0: not given
}

func (s *stack) folder() string { return strings.TrimSuffix(s.path, ".md") }

func (s *stack) markdown() []byte {
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	w("---\n")
	w("title: %s\n", yamlString(s.title))
	w("lab: %s\n", yamlString(labName))
	w("product_code: %s\n", yamlString(s.productCode))
	w("category: %s\n", yamlString(s.category))
	tags := make([]string, len(s.tags))
	for i, t := range s.tags {
		tags[i] = yamlString(t)
	}
	w("tags: [%s]\n", strings.Join(tags, ", "))
	w("summary: %s\n", yamlString(s.summary))
	w("license: MIT\n")
	w("stack:\n")
	for _, l := range s.layers {
		if l.slug != "" {
			w("  - material: %s\n", l.slug)
		} else {
			w("  - name: %s\n", yamlString(l.name))
			w("    spectra:\n")
			for _, f := range l.files {
				w("      - file: %s\n", yamlString(path.Join(path.Base(s.folder()), f.name)))
				w("        role: %s\n", yamlString(f.role))
				w("        instrument: %s\n", yamlString(f.instrument))
			}
		}
		if l.thicknessMM > 0 {
			w("    thickness_mm: %s\n", yamlNumber(l.thicknessMM))
			w("    conductivity_w_mk: %s\n", yamlNumber(l.k))
		}
	}
	w("---\n\n")
	b.WriteString(strings.TrimSpace(s.body))
	b.WriteString("\n")
	return []byte(b.String())
}

// systemCaution closes every system page.
const systemCaution = `**Invented example, computed system.** This page is computed from the spectra of its layers
(synthetic data, not a measurement) under a stated model; nothing here was measured as a whole.
The figures are not a certification: real performance depends on site, weather, soiling and ageing,
and roofing, building and energy decisions defer to local codes and licensed professionals.`

// stacks returns the demo stacks in a fixed order.
func stacks() []stack {
	film := func(name string, lo, hi float64) fileSpec {
		f := uvFile("RF-1 reflective cover film", "2026-09-04", "R", "T")
		if name == "film-ftir.csv" {
			f = irMicrons("RF-1 reflective cover film", "2026-09-04", "R", "T")
		}
		f.name = name
		return f
	}
	return []stack{
		{
			path: "systems/ql-se3-covered.md", title: "QL-SE3 under the PC-3 cover (system)", productCode: "QL-SE3 + PC-3",
			category: "system", tags: []string{"system", "covered", "selective", "prototype"},
			summary: "The selective emitter QL-SE3 under a 3 mm porous polyethylene cover, computed from both layers' spectra (invented, synthetic).",
			layers:  []stackLayer{{slug: "pc-3", thicknessMM: 3, k: 0.04}, {slug: "ql-se3"}},
			body: `## What it is

The selective emitter [QL-SE3](../../m/ql-se3/index.html) under the porous polyethylene cover
[PC-3](../../m/pc-3/index.html), computed from the two layers' spectra. The cover holds off the
wind; its 3 mm of foam (0.04 W m⁻¹ K⁻¹, typical of polymer foams, from memory) lies in series with
the outside air.

## What to look for

The cover passes most of the window radiation, so the night cooling power drops only a little, and
with the wind held off the emitter settles further below the air at night. By day the sunlight the
cover absorbs counts as heat on the emitter (the simple model errs on the warm side). See also the
[comparison](../../compare/covered-emitter/index.html).

` + systemCaution,
		},
		{
			path: "systems/dg-40-under-film.md", title: "DG-40 panel under a reflective cover film (system)", productCode: "DG-40 + RF-1",
			category: "system", tags: []string{"system", "covered", "dark", "car-cover-like"},
			summary: "The dark grey DG-40 panel under a reflective car-cover-like fabric RF-1, computed from both layers' spectra (invented, synthetic).",
			layers: []stackLayer{
				{name: "RF-1 reflective cover fabric (invented)", files: []fileSpec{film("film-uvvis.csv", 250, 2500), film("film-ftir.csv", 2.5, 25)},
					model: coverFabric, thicknessMM: 0.4, k: 0.05},
				{slug: "dg-40"},
			},
			body: `## What it is

The dark reference panel [DG-40](../../m/dg-40/index.html) under RF-1, an invented reflective fabric
of the kind thrown over a car or a roof in summer. RF-1 has no page of its own: its spectra are
listed with this stack. Its 0.4 mm (conductivity 0.05 W m⁻¹ K⁻¹, from memory, for a coated woven
fabric holding air) lies between the panel and the outside air.

## What to look for

- The stack reflects most of the sunlight the bare panel absorbs, and the cover itself absorbs
  part of the rest: see the share absorbed in each layer.
- By day the covered panel stays far cooler than the bare one; at night the fabric, which emits
  well, keeps most of the panel's cooling. Compare them in the
  [comparison](../../compare/car-cover/index.html).

` + systemCaution,
		},
	}
}
