package site

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strconv"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
)

// claimView is one judged claim, as the datasheet and the review page show
// it.
type claimView struct {
	ID          string // anchor on the datasheet: "claim-N", N counting from 1
	Mark        string // "=", "≠" or "?"
	Status      string // the verdict in words
	Class       string // CSS class: supported, not-supported, cannot-check
	Figure      string // the figure's label, or the key as claimed when unknown
	Key         string
	Claimed     string // as written, with tolerance and unit
	Source      string
	Computed    string // "—" when not computed
	Difference  string // computed − claimed, signed
	Allowed     string // "±0.0100"
	AllowedFrom string // in short: "claimed tolerance" or "expanded uncertainty"
	Allowance   string // where the allowance comes from, in full, when not claimed
	Reason      string
	Basis       string
	BasisNote   string
	Pitfalls    []datasheet.Pitfall
}

// claimRef is a claim shown in the figures table, linking to its verdict.
// OtherBasis is set when the claim states a basis that changes the figure,
// so that the value beside it is not the one judged.
type claimRef struct {
	ID, Mark, Status, Class, Claimed string
	OtherBasis                       bool
}

// verdictClasses are the CSS classes of the statuses.
var verdictClasses = map[datasheet.Status]string{
	datasheet.Supported:    "supported",
	datasheet.NotSupported: "not-supported",
	datasheet.CannotCheck:  "cannot-check",
}

// claimViews describes the verdicts of a material's claims.
func claimViews(vs []datasheet.Verdict) []claimView {
	out := make([]claimView, len(vs))
	for i, v := range vs {
		c := v.Claim
		x := claimView{ID: "claim-" + strconv.Itoa(i+1), Mark: v.Status.Mark(), Status: v.Status.String(),
			Class: verdictClasses[v.Status], Figure: firstOf(v.Label, c.Figure), Key: c.Figure,
			Claimed: c.Text(), Source: c.Source, Computed: fmtClaimNum(v, v.Computed),
			Difference: fmtSignedNum(v, v.Difference), Reason: v.Reason, Basis: v.Basis,
			BasisNote: v.BasisNote, Pitfalls: v.Pitfalls}
		if v.Unit != "" {
			x.Claimed += " " + v.Unit
		}
		if !isNaN(v.Allowed) {
			x.Allowed = "±" + fmtClaimNum(v, v.Allowed)
			x.AllowedFrom = "claimed tolerance"
			if c.Tolerance == 0 {
				x.AllowedFrom = "expanded uncertainty"
				x.Allowance = "±" + fmtClaimNum(v, v.Allowed) + ", the " + v.AllowedFrom + "."
			}
		}
		out[i] = x
	}
	return out
}

// claimRefs maps each figure key to the claims made of it.
func claimRefs(cs []claimView) map[string][]claimRef {
	m := map[string][]claimRef{}
	for _, c := range cs {
		m[c.Key] = append(m[c.Key], claimRef{ID: c.ID, Mark: c.Mark, Status: c.Status, Class: c.Class, Claimed: c.Claimed, OtherBasis: c.BasisNote != ""})
	}
	return m
}

// fmtClaimNum formats a number of a verdict as the verdict's reason does,
// "—" when it was not computed.
func fmtClaimNum(v datasheet.Verdict, x datasheet.Num) string {
	if isNaN(x) {
		return "—"
	}
	return v.Format(float64(x))
}

// fmtSignedNum is fmtClaimNum with a sign.
func fmtSignedNum(v datasheet.Verdict, x datasheet.Num) string {
	if isNaN(x) {
		return "—"
	}
	return v.FormatSigned(float64(x))
}

// countWords says what the counts hold: "3 claims: 1 supported, 1 not
// supported, 1 cannot be checked".
func countWords(c datasheet.VerdictCounts) string {
	if c.Claims == 0 {
		return "no claims"
	}
	s := plural(c.Claims, "claim", "claims") + ": "
	sep := ""
	for _, p := range []struct {
		n    int
		what string
	}{{c.Supported, "supported"}, {c.NotSupported, "not supported"}, {c.CannotCheck, "cannot be checked"}} {
		if p.n > 0 {
			s += sep + strconv.Itoa(p.n) + " " + p.what
			sep = ", "
		}
	}
	return s
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// claimsFile is the JSON of m/SLUG/claims.json: the verdict on every
// claim of a material, as "skysheet review --format json" gives them, with
// the files they rest on.
type claimsFile struct {
	Schema    int                     `json:"schema"`
	Slug      string                  `json:"slug"`
	Title     string                  `json:"title"`
	Page      string                  `json:"page"`
	Generator string                  `json:"generator"`
	Inputs    []library.Input         `json:"inputs"`
	Counts    datasheet.VerdictCounts `json:"counts"`
	Verdicts  []datasheet.Verdict     `json:"verdicts"`
}

// ClaimsSchema is the version of claims.json. Keys are only added.
const ClaimsSchema = 1

func (b *builder) claimsJSON(m *evaluate.Summary) ([]byte, error) {
	vs := m.Verdicts
	f := claimsFile{Schema: ClaimsSchema, Slug: m.Slug, Title: m.Front.Title, Page: materialDir(m.Slug) + "index.html",
		Generator: "skysheet " + b.site.Version, Inputs: m.Inputs, Verdicts: vs}
	if f.Inputs == nil {
		f.Inputs = []library.Input{}
	}
	f.Counts.Add(vs...)
	data, err := marshalIndent(f)
	if err != nil {
		return nil, err
	}
	return append(data, '\n'), nil
}

// catalogClaim is a claim in catalog.json: the keys of the claim as in the
// front matter, and "verdict" with its verdict (the verdict's keys without
// the claim, which would repeat).
type catalogClaim struct {
	claim   datasheet.Claim
	verdict datasheet.Verdict
}

// verdictOnly writes a verdict without its "claim" key: the nil field of
// that name, being less nested, hides the verdict's own.
type verdictOnly struct {
	datasheet.Verdict
	Claim *struct{} `json:"claim,omitempty"`
}

// MarshalJSON writes the claim's object with "verdict" added.
func (c catalogClaim) MarshalJSON() ([]byte, error) {
	claim, err := json.Marshal(c.claim)
	if err != nil {
		return nil, err
	}
	verdict, err := json.Marshal(verdictOnly{Verdict: c.verdict})
	if err != nil {
		return nil, err
	}
	claim = bytes.TrimSpace(claim)
	if len(claim) < 2 || claim[len(claim)-1] != '}' {
		return nil, fmt.Errorf("claim %q: not a JSON object", claim)
	}
	out := append([]byte(nil), claim[:len(claim)-1]...)
	if len(claim) > 2 {
		out = append(out, ',')
	}
	out = append(out, `"verdict":`...)
	out = append(out, verdict...)
	return append(out, '}'), nil
}

// catalogClaims pairs claims with their verdicts; never nil.
func catalogClaims(vs []datasheet.Verdict) []catalogClaim {
	out := make([]catalogClaim, len(vs))
	for i, v := range vs {
		out[i] = catalogClaim{claim: v.Claim, verdict: v}
	}
	return out
}

// reviewRow is a claim listed on the review page.
type reviewRow struct {
	Material link // the material's title, linking to the claim on its datasheet
	Claim    claimView
}

// reviewRules are the thresholds the review page states, from the
// rules of [datasheet.Rules].
type reviewRules struct {
	Uncertainty, IndexUncertainty, RelUncertainty, PowerFloor, DeltaFloor, K, Coverage, Angle, MaxFraction, SolarStart string
	CoolingBand, HeldShare                                                                                             string
}

type reviewView struct {
	Counts       datasheet.VerdictCounts
	CountWords   string
	Materials    int // materials that state claims
	NotSupported []reviewRow
	CannotCheck  []reviewRow
	Rules        reviewRules
	Cautions     []string
}

// reviewPage is the path of the review page.
const reviewPage = "review/index.html"

// reviewFiles renders the review page from the verdicts of every material.
func (b *builder) reviewFiles(out files) error {
	p := b.newPage("review", "Review of claims", reviewPage)
	v := &reviewView{Cautions: Cautions, Rules: reviewRules{
		Uncertainty:      fmtG(datasheet.Rules.DefaultUncertainty),
		IndexUncertainty: fmtG(datasheet.Rules.DefaultIndexUncertainty),
		RelUncertainty:   fmtG(100*datasheet.Rules.DefaultRelUncertainty) + " %",
		PowerFloor:       fmtG(datasheet.Rules.DefaultPowerFloorWm2) + " W/m²",
		DeltaFloor:       fmtG(datasheet.Rules.DefaultDeltaFloorK) + " K",
		K:                fmtG(datasheet.Rules.CoverageFactor),
		Coverage:         fmtG(100*datasheet.Rules.MinCoverage) + " %",
		Angle:            fmtG(datasheet.Rules.MaxAngleDiffDeg) + "°",
		MaxFraction:      fmtG(datasheet.Rules.MaxFraction),
		SolarStart:       fmtG(datasheet.Rules.SolarStartNM) + " nm",
		CoolingBand:      fmtG(datasheet.Rules.CoolingCheckLoUM) + "–" + fmtG(datasheet.Rules.CoolingCheckHiUM) + " µm",
		HeldShare:        fmtG(100*datasheet.Rules.MaxHeldShare) + " %",
	}}
	ms, _ := b.ordered()
	for _, m := range ms {
		vs := m.Verdicts
		if len(vs) > 0 {
			v.Materials++
		}
		v.Counts.Add(vs...)
		for i, c := range claimViews(vs) {
			r := reviewRow{Material: link{Name: m.Front.Title, Href: p.Root + materialDir(m.Slug) + "index.html#" + c.ID,
				Note: firstOf(m.Front.Maker, m.Front.Lab)}, Claim: c}
			switch vs[i].Status {
			case datasheet.NotSupported:
				v.NotSupported = append(v.NotSupported, r)
			case datasheet.CannotCheck:
				v.CannotCheck = append(v.CannotCheck, r)
			}
		}
	}
	v.CountWords = countWords(v.Counts)
	p.R = v
	html, err := b.execute("review", p)
	if err != nil {
		return &library.Error{File: reviewPage, Err: err}
	}
	out[reviewPage] = html
	return nil
}
