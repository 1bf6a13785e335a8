package main

import (
	"lyacert/certificates"
	"lyacert/certify"
)

// checkOutput is the --json output of check and demo. The keys are a
// contract: verdict, claim, vdot, minors, conditions, region, certificate.
type checkOutput struct {
	Verdict     string                   `json:"verdict"`
	Claim       string                   `json:"claim"`
	Reason      string                   `json:"reason"`
	Time        string                   `json:"time"`
	V           string                   `json:"V"`
	Vdot        string                   `json:"vdot"`
	Minors      []string                 `json:"minors"`
	Forms       []formOutput             `json:"forms"`
	Conditions  []string                 `json:"conditions"`
	Region      *certificates.Region     `json:"region,omitempty"`
	Witnesses   []certificates.Witness   `json:"witnesses,omitempty"`
	Refutation  *certificates.Refutation `json:"refutation,omitempty"`
	Kernel      [][]string               `json:"kernel,omitempty"`
	Digest      string                   `json:"digest"`
	Checks      int                      `json:"checks_passed"`
	Certificate string                   `json:"certificate,omitempty"`
}

type formOutput struct {
	Name   string     `json:"name"`
	Basis  []string   `json:"basis,omitempty"`
	Gram   [][]string `json:"gram"`
	L      [][]string `json:"l"`
	D      []string   `json:"d"`
	Minors []string   `json:"minors"`
}

func checkJSON(res *certify.Result, written string) checkOutput {
	doc := res.Doc
	out := checkOutput{
		Verdict: res.Verdict, Claim: res.Claim, Reason: res.Reason,
		Time: doc.System.Time, V: doc.V, Vdot: doc.Vdot,
		Minors: []string{}, Conditions: []string{}, Forms: []formOutput{},
		Region: doc.Region, Witnesses: doc.Witnesses, Refutation: doc.Refutation, Kernel: doc.Kernel,
		Digest: doc.Digest, Checks: len(res.Check.Checks), Certificate: written,
	}
	for _, f := range doc.Forms {
		out.Forms = append(out.Forms, formOutput(f))
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
	Valid   bool                 `json:"valid"`
	Claim   string               `json:"claim"`
	Verdict string               `json:"verdict"`
	Digest  string               `json:"digest"`
	Checks  []certificates.Check `json:"checks"`
}

func verifyJSON(doc *certificates.Document, res certificates.Result) verifyOutput {
	return verifyOutput{Valid: res.Valid, Claim: doc.Claim, Verdict: doc.Verdict, Digest: doc.Digest, Checks: res.Checks}
}
