package main

import "math"

// point is a sample's optical response at one wavelength.
type point struct{ R, T float64 }

// model gives a sample's response over the whole range 250 nm – 25 µm, so
// that its UV-Vis-NIR and FTIR files meet without a step at 2500 nm.
type model func(nm float64) point

// Absorption bands, in cm⁻¹ with peak coefficients in mm⁻¹ for the pure
// substance. Positions are the textbook group frequencies; strengths are
// invented but ordered as in typical infrared spectra of such materials.
var (
	// acrylic binder: water and O–H, C–H stretch, C=O (1730), C–H bend,
	// the strong C–O–C pair (1240, 1150) and skeletal bands.
	acrylic = bands{
		{3400, 380, 10}, {2955, 60, 45}, {2875, 45, 20},
		{1730, 40, 420}, {1450, 45, 90}, {1385, 30, 45},
		{1240, 80, 280}, {1155, 90, 380}, {1065, 40, 70}, {990, 40, 55},
		{840, 45, 45}, {755, 35, 70}, {480, 120, 60},
	}
	// overtones and combinations of the same bonds in the near-IR:
	// C–H 2nd overtone (~8400), water (6900 and 5200), C–H 1st overtone
	// (~5800) and C–H combinations (~4330, 4260).
	nirOvertones = bands{
		{8400, 250, 0.012}, {6900, 300, 0.03}, {5800, 180, 0.06},
		{5200, 200, 0.09}, {4330, 110, 0.28}, {4260, 90, 0.22},
	}
	// polyester (terephthalate): O–H end groups, aromatic and aliphatic
	// C–H, C=O (1715), ring modes, the C–O pair (1240, 1100) and the
	// out-of-plane ring band at 725.
	polyester = bands{
		{3430, 200, 6}, {3055, 40, 6}, {2965, 50, 14}, {2905, 45, 10},
		{1715, 45, 650}, {1610, 20, 40}, {1505, 20, 60}, {1410, 25, 110},
		{1340, 30, 90}, {1240, 80, 620}, {1100, 70, 560}, {1015, 25, 180},
		{970, 25, 90}, {870, 30, 80}, {725, 30, 380}, {500, 90, 70},
	}
	// fluorinated copolymer with CH₂ groups: C–H stretch, then the very
	// strong C–F stretching envelope 1400–1060 and CF₂ skeletal bands.
	fluoropolymer = bands{
		{3025, 40, 10}, {2985, 40, 8}, {1400, 50, 240}, {1280, 60, 300},
		{1180, 80, 700}, {1070, 50, 320}, {975, 30, 90}, {880, 40, 300},
		{840, 35, 210}, {760, 30, 110}, {615, 40, 70}, {530, 60, 90}, {490, 50, 90},
	}
	// barium sulfate: the S–O stretching triplet near 1180–1080 and the
	// O–S–O bends near 630.
	sulfate = bands{{1180, 50, 420}, {1120, 70, 600}, {1080, 45, 380}, {985, 15, 60}, {637, 25, 260}, {610, 25, 240}}
	// silicate glass network: O–H (3550), the Si–O–Si asymmetric stretch
	// (~1050), symmetric stretch (~780) and the Si–O–Si bend (~470).
	silicate = bands{{3550, 300, 8}, {1050, 220, 2500}, {780, 100, 600}, {470, 120, 1500}}
)

// fingerprint is the broad, weak absorption every polymer shows below about
// 1800 cm⁻¹, where overlapping skeletal bands leave no truly clear gap.
func fingerprint(nu, k float64) float64 { return k * fall(nu, 1800, 120) }

// whitePaint is a pigmented acrylic film (thickness x mm) on a grey primed
// steel panel, computed with Kubelka–Munk plus the Saunderson surface
// correction.
type whitePaint struct {
	x         float64                  // dry film thickness, mm
	s550, p   float64                  // scattering at 550 nm (mm⁻¹) and its fall with wavelength
	sCut      float64                  // wavelength (nm) past which the pigment stops scattering
	pigmentK  func(nm float64) float64 // pigment absorption (electronic edge and phonons)
	pigmentR0 func(nu float64) float64 // extra surface reflectance near pigment phonon bands
	soil      float64                  // optical depth at 550 nm of a dust and soot film (aged samples)
	binder    float64                  // binder volume fraction
}

func (w whitePaint) at(nm float64) point {
	nu := wavenumber(nm)
	s := w.s550 * math.Pow(550/nm, w.p) / (1 + math.Pow(nm/w.sCut, 3))
	k := w.binder*(0.004+acrylic.at(nu)+nirOvertones.at(nu)+fingerprint(nu, 18)) + w.pigmentK(nm)
	// binder UV absorption below ~300 nm
	k += w.binder * 40 * fall(nm, 292, 7)
	rl, tl := kmSlab(k, s, w.x)
	rb := onBacking(rl, tl, 0.32) // grey primer
	r0 := 0.04 + w.pigmentR0(nu) + 0.05*lorentz(nu, 1155, 120) + 0.03*lorentz(nu, 1730, 60)
	r, _ := saunderson(rb, 0, r0, 0.55)
	if w.soil > 0 {
		// a thin absorbing soil film crossed twice; its absorption falls
		// with wavelength like that of fine soot and mineral dust
		t := math.Exp(-w.soil * math.Pow(550/nm, 1.1))
		r = r0 + (r-r0)*t*t
	}
	return point{R: clamp01(r)}
}

// titania is rutile TiO₂ pigment: the band-gap absorption edge near 410 nm
// and lattice absorption below ~800 cm⁻¹.
func titania(nm float64) float64 {
	return 2000*fall(nm, 399, 5) + 300*fall(wavenumber(nm), 760, 45)
}

// titaniaR0 is the reststrahlen-like surface reflectance of TiO₂ particles.
func titaniaR0(nu float64) float64 { return 0.07 * gauss(nu, 620, 260) }

// bariteK is barium sulfate pigment: no band-gap edge above 250 nm, only its
// sulfate vibrations.
func bariteK(nm float64) float64 { return 0.45 * sulfate.at(wavenumber(nm)) }

// bariteR0 is the surface reflectance raised by the strong sulfate stretch.
func bariteR0(nu float64) float64 { return 0.10*gauss(nu, 1130, 130) + 0.03*gauss(nu, 620, 50) }

// darkRoof is a conventional dark grey acrylic roof coating: carbon black
// absorbs across the whole solar range, a little TiO₂ and chalk filler
// scatter weakly.
func darkRoof(nm float64) point {
	nu := wavenumber(nm)
	s := 18 * math.Pow(550/nm, 0.7) / (1 + math.Pow(nm/3000, 3))
	k := 0.65*(acrylic.at(nu)+nirOvertones.at(nu)+fingerprint(nu, 18)) + 320*math.Pow(550/nm, 0.75) + 0.1*titania(nm)
	rl, _ := kmSlab(k, s, 0.35)
	r0 := 0.048 + 0.045*lorentz(nu, 1155, 120) + 0.03*lorentz(nu, 1730, 60) + 0.03*gauss(nu, 1420, 90)
	r, _ := saunderson(rl, 0, r0, 0.6)
	return point{R: clamp01(r)}
}

// porousPolymer is a fluorinated copolymer coating whose air voids (0.1–5 µm,
// porosity ~50 %) scatter sunlight strongly; the polymer itself hardly
// absorbs in the solar range.
func porousPolymer(nm float64) point {
	nu := wavenumber(nm)
	s := 150 * math.Pow(550/nm, 0.3) / (1 + math.Pow(nm/2600, 3))
	k := 0.5 * (0.004 + fluoropolymer.at(nu) + fingerprint(nu, 45) + 0.4*nirOvertones.at(nu) + 25*fall(nm, 262, 6))
	rl, tl := kmSlab(k, s, 0.3)
	rb := onBacking(rl, tl, 0.32)
	r0 := 0.03 + 0.05*gauss(nu, 1200, 160)
	r, _ := saunderson(rb, 0, r0, 0.45)
	return point{R: clamp01(r)}
}

// silveredFilm is a 50 µm polyester film with vapour-deposited silver on its
// back. Light crosses the polymer twice; the silver reflects what is left.
// R = r0 + (1−r0)² Rm τ² / (1 − r0 Rm τ²) with τ = exp(−k d).
func silveredFilm(nm float64) point {
	nu := wavenumber(nm)
	const d = 0.05
	k := 0.003 + polyester.at(nu) + fingerprint(nu, 14) + 0.7*nirOvertones.at(nu) + 400*fall(nm, 318, 6) // terephthalate UV edge
	tau2 := math.Exp(-2 * k * d)
	rm := 0.98 * silver(nm) // silver under a polymer reflects less than in air
	r0 := fresnel(1.64) + 0.06*gauss(nu, 1240, 90) + 0.05*gauss(nu, 1715, 50) + 0.03*gauss(nu, 725, 40)
	r := r0 + (1-r0)*(1-r0)*rm*tau2/(1-r0*rm*tau2)
	return point{R: clamp01(r), T: 0}
}

// canopyFabric is a woven white polyester fabric 0.35 mm thick: fibres
// scatter (Kubelka–Munk), and 5 % open area between the yarns lets light
// straight through at every wavelength.
func canopyFabric(nm float64) point {
	nu := wavenumber(nm)
	const open = 0.05
	s := 16 * math.Pow(550/nm, 0.35) / (1 + math.Pow(nm/4000, 3))
	k := 0.5 * (0.006 + polyester.at(nu) + fingerprint(nu, 14) + 0.8*nirOvertones.at(nu) + 250*fall(nm, 318, 6))
	// a trace of TiO₂ delustrant
	k += 0.004 * titania(nm)
	rl, tl := kmSlab(k, s, 0.35)
	r, t := saunderson(rl, tl, 0.04, 0.2)
	return point{R: clamp01((1 - open) * r), T: clamp01((1-open)*t + open)}
}

// windowEmitter is a laboratory selective emitter: silicon-oxide-like and
// nitride-like layers a few µm thick on silver. Built directly as spectral
// emittance ε; being opaque, R = 1 − ε.
func windowEmitter(nm float64) point {
	nu := wavenumber(nm)
	um := nm / 1000
	eps := 1 - silver(nm)
	eps += 0.25 * fall(nm, 335, 10)                                     // nitride-like layer absorbs in the UV
	eps += 0.004 + 0.06*gauss(nu, 3350, 250) + 0.04*gauss(nu, 2170, 80) // N–H and Si–H traces
	win := 0.90 * rise(um, 7.9, 0.18) * fall(um, 13.1, 0.28)
	win *= 1 - 0.12*gauss(um, 9.3, 0.8) // Si–O reststrahlen left partly uncompensated
	eps += win
	eps += 0.45*gauss(nu, 465, 90) + 0.08*rise(um, 15, 1.5) // Si–O bend and long-wave tail
	eps = clamp01(eps)
	return point{R: 1 - eps}
}

// floatGlass is a 4 mm clear soda-lime float pane, treated as an
// incoherent slab: T = (1−r)² τ / (1 − r² τ²), R = r + (1−r)² r τ² / (1 − r² τ²),
// τ = exp(−α d). α (cm⁻¹) has the UV edge, Fe³⁺ (380 nm) and the broad Fe²⁺
// band (~1050 nm), O–H (2.8 µm) and multiphonon absorption past 4.5 µm; r
// follows the Cauchy index in the transparent range and the silicate
// reststrahlen bands in the infrared.
func floatGlass(nm float64) point {
	nu := wavenumber(nm)
	const d = 0.4 // cm
	alpha := 0.02 + 60*math.Exp(-(nm-300)/13) + 0.12*gauss(nm, 380, 25) + 0.45*gauss(nm, 1050, 650)
	alpha += 3*gauss(nu, 3550, 280) + 1.2*gauss(nu, 2800, 250) + 2*math.Exp((nm-4500)/260)
	tau := math.Exp(-alpha * d)
	n := 1.505 + 4300/(nm*nm)
	r := fresnel(n)
	// infrared: Christiansen minimum near 1300 cm⁻¹, Si–O reststrahlen peaks
	r *= 1 - 0.8*gauss(nu, 1330, 260)
	r += 0.42*gauss(nu, 1060, 150) + 0.08*gauss(nu, 780, 60) + 0.22*gauss(nu, 470, 110)
	rs, ts := incoherentSlab(r, tau)
	return point{R: clamp01(rs), T: clamp01(ts)}
}

// glazedTile is a white roof tile: a zircon-opacified glaze 0.3 mm thick over
// a buff clay body. The glaze is a silicate glass full of scatterers, so it
// is opaque in the thermal infrared with silicate reststrahlen bands.
func glazedTile(nm float64) point {
	nu := wavenumber(nm)
	s := 40 * math.Pow(550/nm, 0.9) / (1 + math.Pow(nm/3500, 3))
	k := 0.004 + 60*fall(nm, 335, 12) + 0.12*gauss(nm, 1000, 700) + 0.06*gauss(nm, 440, 80) // UV edge, iron traces
	k += 0.2*silicate.at(nu) + 1500*fall(nu, 2050, 90)                                      // O–H, multiphonon and Si–O
	rl, tl := kmSlab(k, s, 0.3)
	body := 0.42 + 0.18*rise(nm, 560, 70) - 0.1*fall(nm, 420, 30)
	rb := onBacking(rl, tl, body)
	r0 := fresnel(1.55)*(1-0.8*gauss(nu, 1330, 240)) + 0.24*gauss(nu, 1060, 170) + 0.05*gauss(nu, 780, 60) + 0.12*gauss(nu, 470, 100)
	r, _ := saunderson(rb, 0, r0, 0.6)
	return point{R: clamp01(r)}
}

// colouredPaint is a pigmented acrylic topcoat x mm thick over a primer of
// reflectance primer(nm), by Kubelka–Munk with the Saunderson correction.
// Its colour comes from pigments that absorb in the visible (pigmentK); a
// conventional tint darkens it with carbon black (blackK at 550 nm), which
// absorbs on into the near infrared, while a cool tint uses a black that
// absorbs only in the visible and lets the near infrared through to a
// white primer, which sends it back.
type colouredPaint struct {
	x        float64                  // dry film thickness, mm
	s550, p  float64                  // scattering at 550 nm (mm⁻¹) and its fall with wavelength
	pigmentK func(nm float64) float64 // colour pigments' absorption, mm⁻¹
	blackK   float64                  // carbon black at 550 nm, mm⁻¹, falling as (550/λ)^0.75
	primer   func(nm float64) float64 // reflectance of the primer under the film
}

func (c colouredPaint) at(nm float64) point {
	nu := wavenumber(nm)
	s := c.s550 * math.Pow(550/nm, c.p) / (1 + math.Pow(nm/3000, 3))
	k := 0.7*(0.004+acrylic.at(nu)+nirOvertones.at(nu)+fingerprint(nu, 18)) + c.pigmentK(nm) + c.blackK*math.Pow(550/nm, 0.75)
	k += 0.7 * 40 * fall(nm, 292, 7) // binder UV absorption
	rl, tl := kmSlab(k, s, c.x)
	rb := onBacking(rl, tl, c.primer(nm))
	r0 := 0.045 + 0.05*lorentz(nu, 1155, 120) + 0.03*lorentz(nu, 1730, 60)
	r, _ := saunderson(rb, 0, r0, 0.55)
	return point{R: clamp01(r)}
}

// ironOxideRed is a red iron oxide pigment: strong absorption below its
// edge near 580 nm, a weak Fe³⁺ band near 870 nm, and next to nothing in
// the near infrared (mm⁻¹).
func ironOxideRed(nm float64) float64 {
	return 90*fall(nm, 575, 16) + 6*gauss(nm, 870, 140) + 3*fall(nm, 680, 40)
}

// ironOxideYellow is a yellow iron oxide pigment: its edge lies near 490
// nm, so it takes the blue out of a red and warms it towards terracotta.
func ironOxideYellow(nm float64) float64 { return 80*fall(nm, 490, 18) + 4*gauss(nm, 920, 160) }

// visibleBlack is a black that absorbs across the visible and stops near
// 750 nm (as perylene-type "infrared-transparent" blacks do), mm⁻¹ per unit
// loading.
func visibleBlack(nm float64) float64 { return fall(nm, 745, 22) }

// whitePrimer is a TiO₂ primer under a cool coating: white from the visible
// to the near infrared, darker in the UV below rutile's edge.
func whitePrimer(nm float64) float64 { return 0.08 + 0.8*rise(nm, 405, 8) - 0.1*rise(nm, 1900, 300) }

// greyPrimer is the grey primer of a conventional coating.
func greyPrimer(float64) float64 { return 0.32 }
