package main

import (
	"math"
	"math/rand/v2"
)

// model gives a material's reflectance and transmittance (fractions) at a
// wavelength in nm, for 250 nm to 25 µm. Each family draws its parameters at
// random within ranges typical of its kind of surface; the shapes follow the
// usual physics (see the package comment), the numbers are invented.
type model func(nm float64) (r, t float64)

// variant is one drawn material: its model, whether it transmits (else T is
// written as 0), what kind of product it is and its tags.
type variant struct {
	at           model
	transmissive bool
	kind         string
	tags         []string
}

// sig is a logistic step from 0 to 1 centred on x0 with width w.
func sig(x, x0, w float64) float64 { return 1 / (1 + math.Exp(-(x-x0)/w)) }

// bump is a Gaussian band of height 1 centred on x0 with standard width w;
// zero beyond six widths, which keeps the generator fast.
func bump(x, x0, w float64) float64 {
	d := (x - x0) / w
	if d > 6 || d < -6 {
		return 0
	}
	return math.Exp(-0.5 * d * d)
}

// band is an absorption band: centre and width in nm, strength in the
// units of the model that uses it.
type band struct{ nm, w, k float64 }

func bands(nm float64, bs []band) float64 {
	var s float64
	for _, b := range bs {
		s += b.k * bump(nm, b.nm, b.w)
	}
	return s
}

func uniform(r *rand.Rand, lo, hi float64) float64 { return lo + (hi-lo)*r.Float64() }

// Near-infrared overtones of C–H and water seen in polymer binders (nm).
var overtones = []band{{1195, 25, 0.4}, {1450, 45, 0.6}, {1725, 30, 1}, {1940, 55, 0.9}, {2310, 35, 1.2}}

// Thermal-infrared bands of an acrylic binder: O–H stretch (2.9 µm), C–H
// stretch (3.4 µm), C=O (5.8 µm), C–H bend (6.8 µm), C–O (8–9 µm) and a
// continuum of skeletal modes past 7 µm.
var acrylicIR = []band{{2900, 150, 1}, {3420, 60, 3}, {5790, 90, 6}, {6850, 120, 2}, {7950, 250, 4}, {8650, 300, 5}, {13000, 700, 1.5}}

// kubelkaMunk returns the reflectance of an optically thick scattering layer
// with absorption-to-scattering ratio q (Kubelka and Munk 1931), corrected
// for its front surface after Saunderson (1942): re is the external and ri
// the internal surface reflectance.
func kubelkaMunk(q, re, ri float64) float64 {
	rInf := 1 + q - math.Sqrt(q*q+2*q)
	return re + (1-re)*(1-ri)*rInf/(1-ri*rInf)
}

// pigmented is a pigment in a polymer binder, optically thick: K/S from a
// binder baseline, a pigment absorption edge, near-IR overtones and the
// binder's thermal-IR bands; scattering falling as λ^-p past 500 nm.
type pigmented struct {
	kBinder       float64 // baseline absorption
	edgeNM, edgeW float64 // pigment absorption edge (below it the pigment absorbs)
	kEdge         float64
	kVis          float64 // absorption of a dark pigment below nirEdge (0: none)
	nirEdge       float64
	kDark         float64 // absorption of a black pigment everywhere, falling slowly with λ
	kOver         float64 // scale of the overtones
	kIR           float64 // binder continuum past ~2.7 µm
	irEdge        float64
	irBands       []band
	p             float64 // scattering falls as (500/λ)^p
	re, ri        float64 // Saunderson surface reflectances
	filler        band    // surface reflectance peak of a mineral filler (reststrahlen); k in reflectance
}

func (m pigmented) at(nm float64) (float64, float64) {
	k := m.kBinder + m.kEdge*(1-sig(nm, m.edgeNM, m.edgeW)) + m.kOver*bands(nm, overtones)*1e-3
	if m.kVis > 0 {
		k += m.kVis * (1 - sig(nm, m.nirEdge, 25))
	}
	if m.kDark > 0 {
		k += m.kDark * math.Sqrt(500/nm)
	}
	k += m.kIR*sig(nm, m.irEdge, 600) + bands(nm, m.irBands)
	s := 1.0
	if nm > 500 {
		s = math.Pow(500/nm, m.p)
	}
	re := m.re + m.filler.k*bump(nm, m.filler.nm, m.filler.w)
	return kubelkaMunk(k/s, re, m.ri), 0
}

// whitePaint is a rutile titania white in an acrylic binder.
func whitePaint(r *rand.Rand) variant {
	m := pigmented{
		kBinder: uniform(r, 2e-4, 1.2e-3),
		edgeNM:  uniform(r, 398, 415), edgeW: uniform(r, 5, 9), kEdge: uniform(r, 3, 10),
		kOver: uniform(r, 0.3, 2),
		kIR:   uniform(r, 0.3, 1.5), irEdge: uniform(r, 4500, 6000), irBands: scaled(acrylicIR, uniform(r, 0.6, 1.5)),
		p:  uniform(r, 0.5, 1.1),
		re: uniform(r, 0.03, 0.05), ri: uniform(r, 0.4, 0.6),
		filler: band{uniform(r, 9000, 9600), uniform(r, 300, 600), uniform(r, 0, 0.12)},
	}
	kinds := []string{"acrylic roof white", "elastomeric roof white", "titania wall white", "silicone-acrylic roof white"}
	k := r.IntN(len(kinds))
	tags := []string{"white", "titania", "acrylic"}
	if k == 2 {
		tags = append(tags, "wall")
	} else {
		tags = append(tags, "roof")
	}
	return variant{at: m.at, kind: kinds[k], tags: tags}
}

// whiteCoating is a barium sulfate or porous polymer white: no pigment edge
// above 300 nm and scattering that falls slowly with wavelength.
func whiteCoating(r *rand.Rand) variant {
	m := pigmented{
		kBinder: uniform(r, 3e-5, 3e-4),
		edgeNM:  uniform(r, 255, 300), edgeW: uniform(r, 8, 15), kEdge: uniform(r, 0.05, 1),
		kOver: uniform(r, 0.1, 1.5),
		kIR:   uniform(r, 0.5, 2), irEdge: uniform(r, 4500, 6000), irBands: scaled(acrylicIR, uniform(r, 0.8, 2)),
		p:  uniform(r, 0.3, 0.8),
		re: uniform(r, 0.025, 0.04), ri: uniform(r, 0.3, 0.5),
		filler: band{uniform(r, 8500, 9000), uniform(r, 250, 450), uniform(r, 0, 0.15)},
	}
	if r.IntN(2) == 0 {
		return variant{at: m.at, kind: "barium sulfate white coating", tags: []string{"white", "barium-sulfate", "roof"}}
	}
	return variant{at: m.at, kind: "porous polymer coating", tags: []string{"white", "porous", "polymer"}}
}

// darkSurface is a black, grey or near-infrared-reflective dark paint.
func darkSurface(r *rand.Rand) variant {
	m := pigmented{
		kBinder: uniform(r, 5e-4, 2e-3),
		edgeNM:  uniform(r, 380, 420), edgeW: 8, kEdge: uniform(r, 1, 5),
		kOver: uniform(r, 0.5, 3),
		kIR:   uniform(r, 0.3, 1.5), irEdge: uniform(r, 4500, 6000), irBands: scaled(acrylicIR, uniform(r, 0.6, 1.5)),
		p:  uniform(r, 0.8, 1.6),
		re: uniform(r, 0.03, 0.05), ri: uniform(r, 0.4, 0.6),
	}
	switch r.IntN(3) {
	case 0: // black: absorbs everywhere
		m.kDark = uniform(r, 0.5, 4)
		return variant{at: m.at, kind: "black roof paint", tags: []string{"dark", "black", "roof"}}
	case 1: // grey
		m.kDark = uniform(r, 0.25, 0.8)
		return variant{at: m.at, kind: "grey roof paint", tags: []string{"dark", "grey", "roof"}}
	}
	// dark in the visible, reflective in the near infrared
	m.kVis = uniform(r, 0.3, 3)
	m.nirEdge = uniform(r, 690, 790)
	m.kDark = uniform(r, 0.002, 0.02)
	return variant{at: m.at, kind: "near-infrared-reflective dark paint", tags: []string{"dark", "nir-reflective", "roof"}}
}

func scaled(bs []band, f float64) []band {
	out := make([]band, len(bs))
	for i, b := range bs {
		out[i] = band{b.nm, b.w, b.k * f}
	}
	return out
}

// Thermal-infrared bands of polyester (absorbance per 50 µm, invented
// strengths at the usual group frequencies).
var polyesterIR = []band{{2900, 100, 0.1}, {3420, 50, 0.3}, {5800, 60, 3}, {7900, 120, 3}, {8950, 200, 2.5}, {9800, 150, 2}, {13700, 180, 2.5}, {11500, 600, 0.4}}

// silveredFilm is a polyester film over a silver mirror: R is the mirror
// seen twice through the film, plus the film's front surface.
func silveredFilm(r *rand.Rand) variant {
	rAg := uniform(r, 0.955, 0.985)
	edge := uniform(r, 370, 395)
	thick := uniform(r, 0.5, 2) // film thickness / 50 µm
	cont := uniform(r, 0.3, 0.8)
	over := uniform(r, 0.002, 0.01)
	v := variant{kind: "silvered polyester film", tags: []string{"film", "silvered", "polyester", "mirror"}}
	v.at = func(nm float64) (float64, float64) {
		mirror := rAg - 0.6*bump(nm, 320, 25) - silverFalloff(0.03, nm)
		a := thick * (4*(1-sig(nm, edge, 6)) + over*bands(nm, overtones) + cont*sig(nm, 7000, 500) + bands(nm, polyesterIR))
		return 0.04 + 0.92*mirror*math.Exp(-2*a), 0
	}
	return v
}

// silverFalloff is the fall of silver's reflectance below 450 nm: amount
// at 250 nm, none above 450 nm.
func silverFalloff(amount, nm float64) float64 {
	if nm >= 450 {
		return 0
	}
	return amount * (450 - nm) / 200
}

// metal is bare or weathered sheet metal: high infrared reflectance.
func metal(r *rand.Rand) variant {
	var rVis, rIR, dip float64
	v := variant{kind: "bright aluminium sheet", tags: []string{"metal", "aluminium", "low-emittance"}}
	if r.IntN(2) == 0 {
		rVis, rIR, dip = uniform(r, 0.8, 0.9), uniform(r, 0.92, 0.97), uniform(r, 0.04, 0.1)
	} else {
		rVis, rIR, dip = uniform(r, 0.5, 0.7), uniform(r, 0.75, 0.9), uniform(r, 0, 0.03)
		v = variant{kind: "weathered galvanised steel sheet", tags: []string{"metal", "steel", "weathered"}}
	}
	oxide := uniform(r, 0, 0.06) // oxide or soil film absorbing in the thermal infrared
	v.at = func(nm float64) (float64, float64) {
		x := math.Log(nm/250) / math.Log(100) // 0 at 250 nm, 1 at 25 µm
		base := rVis + (rIR-rVis)*math.Sqrt(x)
		rr := base - dip*bump(nm, 830, 90) - 0.05*(1-sig(nm, 330, 20)) - oxide*bump(nm, 9500, 1200)
		return rr, 0
	}
	return v
}

// Bands of polyethylene (absorbance per 20 µm): C–H stretch 3.43 µm, bend
// 6.83 µm, rock 13.7–13.9 µm, and weak overtones.
var polyethyleneIR = []band{{3430, 40, 2.5}, {3510, 30, 1.5}, {6830, 40, 1}, {7270, 30, 0.1}, {13700, 80, 0.8}, {13900, 60, 0.6}}

// cover is a transparent polymer film (polyethylene) or a glass sheet:
// R from two surfaces, T through the bulk.
func cover(r *rand.Rand) variant {
	if r.IntN(2) == 0 {
		rf := uniform(r, 0.07, 0.09)
		haze := uniform(r, 0.9, 0.98)
		cut := uniform(r, 290, 360)
		thick := uniform(r, 0.5, 3)
		at := func(nm float64) (float64, float64) {
			a := thick * (0.01*bands(nm, overtones) + bands(nm, polyethyleneIR))
			t := (1 - rf) * haze * sig(nm, cut, 10) * math.Exp(-a)
			return rf + (1-haze)*0.5*(1-sig(nm, 3000, 500)), t
		}
		return variant{at: at, transmissive: true, kind: "polyethylene cover film", tags: []string{"transparent", "polyethylene", "film"}}
	}
	// glass: Fe²⁺ band near 1050 nm, opaque past ~4.5 µm, silicate
	// reststrahlen peaks near 9.3 and 21 µm in R.
	rf := uniform(r, 0.075, 0.085)
	fe := uniform(r, 0.05, 0.35)
	cut := uniform(r, 305, 330)
	ir := uniform(r, 4200, 4800)
	rest := uniform(r, 0.25, 0.5)
	at := func(nm float64) (float64, float64) {
		t := (1 - rf) * sig(nm, cut, 8) * (1 - fe*bump(nm, 1050, 300)) * (1 - 0.3*bump(nm, 2800, 80)) * (1 - sig(nm, ir, 200))
		rr := rf*(1-sig(nm, 5000, 800)) + 0.04*sig(nm, 5000, 800) + rest*bump(nm, 9300, 450) + 0.5*rest*bump(nm, 21000, 1500) - 0.03*bump(nm, 7500, 300)
		return rr, t
	}
	return variant{at: at, transmissive: true, kind: "clear float glass", tags: []string{"transparent", "glass"}}
}

// fabric is a white textile: a fibre layer that scatters, with open area
// transmitting at every wavelength.
func fabric(r *rand.Rand) variant {
	rVis := uniform(r, 0.6, 0.8)
	open := uniform(r, 0.02, 0.05)
	tVis := uniform(r, 0.06, math.Min(0.25, 0.92-rVis))
	p := uniform(r, 0.2, 0.6)
	poly := r.IntN(2) == 0 // polyester (emissive) or polyethylene (transparent in the IR)
	thick := uniform(r, 0.5, 2)
	v := variant{transmissive: true, kind: "white polyester fabric", tags: []string{"white", "fabric", "polyester"}}
	if !poly {
		v.kind, v.tags = "white polyethylene fabric", []string{"white", "fabric", "polyethylene"}
	}
	v.at = func(nm float64) (float64, float64) {
		s := 1.0
		if nm > 500 {
			s = math.Pow(500/nm, p)
		}
		rr := rVis * s * sig(nm, 370, 12)
		t := open + (tVis-open)*s
		var a float64
		if poly {
			a = thick * (bands(nm, polyesterIR) + 0.6*sig(nm, 7000, 500) + 0.01*bands(nm, overtones))
		} else {
			a = thick * (bands(nm, polyethyleneIR) + 0.01*bands(nm, overtones))
		}
		e := math.Exp(-a)
		return 0.04 + rr*e, open + (t-open)*e
	}
	return v
}
