package main

import (
	"lyacert/certificates"
	"lyacert/certify/direct"
	"lyacert/checker"
)

// checkOutput is the --json output of check and demo. The keys are a
// contract: verdict, claim, vdot, minors, conditions, region, certificate.
type checkOutput struct {
	Verdict     string              `json:"verdict"`
	Claim       string              `json:"claim"`
	Reason      string              `json:"reason"`
	Time        string              `json:"time"`
	V           string              `json:"V"`
	Vdot        string              `json:"vdot"`
	Minors      []string            `json:"minors"`
	Forms       []formOutput        `json:"forms"`
	Conditions  []string            `json:"conditions"`
	Region      *regionOutput       `json:"region,omitempty"`
	Witnesses   []checker.Witness   `json:"witnesses,omitempty"`
	Refutation  *checker.Refutation `json:"refutation,omitempty"`
	Kernel      [][]string          `json:"kernel,omitempty"`
	Digest      string              `json:"digest"`
	Checks      int                 `json:"checks_passed"`
	Certificate string              `json:"certificate,omitempty"`
}

type formOutput struct {
	Name   string     `json:"name"`
	Basis  []string   `json:"basis,omitempty"`
	Gram   [][]string `json:"gram"`
	L      [][]string `json:"l"`
	D      []string   `json:"d"`
	Minors []string   `json:"minors"`
}

// regionOutput is a region in --json: one parameter's pieces, or a paving
// with its summary and its product form.
type regionOutput struct {
	Param     string                `json:"param"`
	Intervals []checker.Interval    `json:"intervals"`
	Pieces    []checker.Piece       `json:"pieces"`
	Paving    *pavingOutput         `json:"paving,omitempty"`
	Product   []checker.SturmRegion `json:"product,omitempty"`
}

type pavingOutput struct {
	Params     []string           `json:"params"`
	Box        []checker.Interval `json:"box"`
	Resolution string             `json:"resolution"`
	Tree       string             `json:"tree"`
	certificates.PavingSummary
}

func regionJSON(rg *certificates.RegionView) *regionOutput {
	if rg == nil {
		return nil
	}
	out := &regionOutput{Param: rg.Param, Intervals: rg.Intervals, Pieces: rg.Pieces}
	if pv := rg.Paving; pv != nil {
		sum, _ := certificates.Summarize(pv) // verified: well formed
		out.Paving = &pavingOutput{Params: pv.Params, Box: pv.Box, Resolution: pv.Resolution, Tree: pv.Tree, PavingSummary: sum}
		out.Product = pv.Product
	}
	return out
}

func checkJSON(res *direct.Result, written string) checkOutput {
	doc := res.Doc
	c := certificates.ContentsOf(doc)
	out := checkOutput{
		Verdict: res.Verdict, Claim: res.Claim, Reason: res.Reason,
		Time: timeWord(res.Model.Discrete), V: c.V, Vdot: c.Vdot,
		Minors: []string{}, Conditions: []string{}, Forms: []formOutput{},
		Region: regionJSON(c.Region), Witnesses: c.Witnesses, Refutation: c.Refutation, Kernel: c.Kernel,
		Digest: doc.Digest, Checks: len(res.Check.Records), Certificate: written,
	}
	for _, f := range c.Forms {
		out.Forms = append(out.Forms, formOutput{Name: f.Name, Basis: f.Basis, Gram: f.Gram, L: f.L, D: f.D, Minors: f.Minors})
		out.Minors = append(out.Minors, f.Minors...)
	}
	for _, c := range res.Conds {
		if s := conditionText(c.Q); s != "" {
			out.Conditions = append(out.Conditions, s)
		}
	}
	return out
}

type verifyOutput struct {
	Valid   bool             `json:"valid"`
	Claim   string           `json:"claim"`
	Verdict string           `json:"verdict"`
	Digest  string           `json:"digest"`
	Checks  []checker.Record `json:"checks"`
}

func verifyJSON(doc *checker.Document, res checker.Outcome) verifyOutput {
	return verifyOutput{Valid: res.Valid, Claim: res.Kind, Verdict: res.Verdict, Digest: doc.Digest, Checks: res.Records}
}

func timeWord(discrete bool) string {
	if discrete {
		return "discrete"
	}
	return "continuous"
}
