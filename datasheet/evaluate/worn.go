package evaluate

import (
	"fmt"

	"skysheet/datasheet"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// Worn is a material's figures as a textile, for a comparison page with a
// reference: the erythemally weighted UV through it and, over the page's
// skin-like surface, the two-node balance of fabric and skin by day and
// by night under the material's own conditions and sky.
type Worn struct {
	UV datasheet.UVProtection
	// Skin is the slug of the skin-like surface; "" when the page names
	// none. Fabric, Day and Night are set when the balance could be
	// computed; Problem says why not otherwise.
	Skin       string
	Setting    datasheet.SkinSetting // the day's; the night's has no sun
	Fabric     *datasheet.Fabric
	Day, Night *datasheet.SkinBalance
	Problem    string
}

// wearPlan is what the comparisons with a reference ask of each material:
// the comparisons that list it, and each named skin's optics, read once.
type wearPlan struct {
	cmps  map[string][]*library.Comparison // by material slug
	skins map[string]skinOptics            // by skin slug
}

type skinOptics struct {
	o       spectra.Optics
	problem string
}

// wearing reads the skins of lib's comparisons that name a reference.
func wearing(lib *library.Library) *wearPlan {
	p := &wearPlan{cmps: map[string][]*library.Comparison{}, skins: map[string]skinOptics{}}
	for _, c := range lib.Comparisons {
		if c.Reference == nil {
			continue
		}
		for _, m := range c.Materials {
			p.cmps[m.Slug] = append(p.cmps[m.Slug], c)
		}
		if sk := c.Skin; sk != nil {
			if _, done := p.skins[sk.Slug]; done {
				continue
			}
			o, err := opticsOf(lib, sk)
			if err != nil {
				p.skins[sk.Slug] = skinOptics{problem: fmt.Sprintf("the skin-like surface %s could not be evaluated", sk.Slug)}
				continue
			}
			p.skins[sk.Slug] = skinOptics{o: o}
		}
	}
	return p
}

// opticsOf returns the resolved optics of lm (see [Optics]).
func opticsOf(lib *library.Library, lm *library.Material) (spectra.Optics, error) {
	o, _, err := Optics(lib, lm)
	return o, err
}

// Optics reads the files of lm and returns its resolved optics, as its
// evaluation resolves them, and the files read; a measured sample's
// figures are not computed (a stack's are: its optics come from them).
func Optics(lib *library.Library, lm *library.Material) (spectra.Optics, []library.Input, error) {
	if lm.Stack != nil {
		m, err := evaluate(lib, lm)
		if err != nil {
			return spectra.Optics{}, nil, err
		}
		return m.Optics, m.Inputs, nil
	}
	s, inputs, err := lib.ReadSample(lm)
	if err != nil {
		return spectra.Optics{}, nil, err
	}
	return spectra.Resolve(s, lm.Conditions.ClosureTol), inputs, nil
}

// of returns m's figures as a textile in each comparison that asks for
// them, or nil.
func (p *wearPlan) of(m *Material) map[string]*Worn {
	cs := p.cmps[m.Slug]
	if len(cs) == 0 {
		return nil
	}
	out := map[string]*Worn{}
	uv := datasheet.ErythemalTransmittance(m.Optics.T)
	for _, c := range cs {
		w := &Worn{UV: uv}
		out[c.Slug] = w
		if c.Skin == nil {
			continue
		}
		w.Skin = c.Skin.Slug
		sk := p.skins[c.Skin.Slug]
		if sk.problem != "" {
			w.Problem = sk.problem
			continue
		}
		*w = wear(m, sk.o, *w)
	}
	return out
}

// wear computes the two-node balance of m over skin.
func wear(m *Material, skin spectra.Optics, w Worn) Worn {
	w.Setting = datasheet.SkinSettingFor(m.Conditions, m.Figures.Sky)
	f, err := datasheet.FabricOnSkin(m.Optics, skin, w.Setting)
	if err != nil {
		w.Problem = err.Error()
		return w
	}
	w.Fabric = &f
	day, err := datasheet.SkinHeat(f, w.Setting)
	if err != nil {
		w.Problem = err.Error()
		return w
	}
	night := w.Setting
	night.IrradianceWm2 = 0
	nb, err := datasheet.SkinHeat(f, night)
	if err != nil {
		w.Problem = err.Error()
		return w
	}
	w.Day, w.Night = &day, &nb
	return w
}
