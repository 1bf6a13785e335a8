package report

import (
	"strconv"

	"lyacert/certificates"
	"lyacert/certify/direct"
	"lyacert/certify/equilibria"
	"lyacert/checker"
	"lyacert/sweep"
)

// The --json shapes of the command line. Their keys are a contract: a
// key is added, never renamed or dropped.

// CheckOutput is the JSON of a check (the direct method): the verdict and
// claim, V and its derivative, the forms with their LDLᵀ factors and
// minors, the conditions in the text's words, the region, witnesses,
// refutation or kernel, and the certificate's digest and re-check.
type CheckOutput struct {
	Verdict     string              `json:"verdict"`
	Claim       string              `json:"claim"`
	Reason      string              `json:"reason"`
	Time        string              `json:"time"`
	V           string              `json:"V"`
	Vdot        string              `json:"vdot"`
	Minors      []string            `json:"minors"`
	Forms       []FormOutput        `json:"forms"`
	Conditions  []string            `json:"conditions"`
	Region      *RegionOutput       `json:"region,omitempty"`
	Witnesses   []checker.Witness   `json:"witnesses,omitempty"`
	Refutation  *checker.Refutation `json:"refutation,omitempty"`
	Kernel      [][]string          `json:"kernel,omitempty"`
	Digest      string              `json:"digest"`
	Checks      int                 `json:"checks_passed"`
	Certificate string              `json:"certificate,omitempty"`
}

// FormOutput is one quadratic (or Gram) form of a CheckOutput.
type FormOutput struct {
	Name   string     `json:"name"`
	Basis  []string   `json:"basis,omitempty"`
	Gram   [][]string `json:"gram"`
	L      [][]string `json:"l"`
	D      []string   `json:"d"`
	Minors []string   `json:"minors"`
}

// RegionOutput is a region: one parameter's pieces, or a paving with its
// summary and its product form.
type RegionOutput struct {
	Param     string                `json:"param"`
	Intervals []checker.Interval    `json:"intervals"`
	Pieces    []checker.Piece       `json:"pieces"`
	Paving    *PavingOutput         `json:"paving,omitempty"`
	Product   []checker.SturmRegion `json:"product,omitempty"`
}

// PavingOutput is a paving of a RegionOutput with its counts and shares.
type PavingOutput struct {
	Params     []string           `json:"params"`
	Box        []checker.Interval `json:"box"`
	Resolution string             `json:"resolution"`
	Tree       string             `json:"tree"`
	certificates.PavingSummary
}

func regionJSON(rg *certificates.RegionView) *RegionOutput {
	if rg == nil {
		return nil
	}
	out := &RegionOutput{Param: rg.Param, Intervals: rg.Intervals, Pieces: rg.Pieces}
	if pv := rg.Paving; pv != nil {
		sum, _ := certificates.Summarize(pv) // verified: well formed
		out.Paving = &PavingOutput{Params: pv.Params, Box: pv.Box, Resolution: pv.Resolution, Tree: pv.Tree, PavingSummary: sum}
		out.Product = pv.Product
	}
	return out
}

// CheckJSON is the JSON of a check. The mathematics is read from the
// certificate (certificates.ContentsOf); the verdict, the conditions and
// the count of checks from the result. written is the file the
// certificate was written to, "" for none.
func CheckJSON(res *direct.Result, written string) CheckOutput {
	doc := res.Doc
	c := certificates.ContentsOf(doc)
	out := CheckOutput{
		Verdict: res.Verdict, Claim: res.Claim, Reason: res.Reason,
		Time: timeWord(res.Model.Discrete), V: c.V, Vdot: c.Vdot,
		Minors: []string{}, Conditions: []string{}, Forms: []FormOutput{},
		Region: regionJSON(c.Region), Witnesses: c.Witnesses, Refutation: c.Refutation, Kernel: c.Kernel,
		Digest: doc.Digest, Checks: len(res.Check.Records), Certificate: written,
	}
	for _, f := range c.Forms {
		out.Forms = append(out.Forms, FormOutput{Name: f.Name, Basis: f.Basis, Gram: f.Gram, L: f.L, D: f.D, Minors: f.Minors})
		out.Minors = append(out.Minors, f.Minors...)
	}
	for _, c := range res.Conds {
		if s := conditionText(c.Q); s != "" {
			out.Conditions = append(out.Conditions, s)
		}
	}
	return out
}

// VerifyOutput is the JSON of a re-check: every check with its result.
type VerifyOutput struct {
	Valid   bool             `json:"valid"`
	Claim   string           `json:"claim"`
	Verdict string           `json:"verdict"`
	Digest  string           `json:"digest"`
	Checks  []checker.Record `json:"checks"`
}

// VerifyJSON is the JSON of checker.Verify's outcome for doc.
func VerifyJSON(doc *checker.Document, out checker.Outcome) VerifyOutput {
	return VerifyOutput{Valid: out.Valid, Claim: out.Kind, Verdict: out.Verdict, Digest: doc.Digest, Checks: out.Records}
}

// FindOutput is the JSON of a search for equilibria. Verdict and Claim
// are FindVerdict's; V, Reason, Digest and Certificate are the model's own
// equilibrium's when it is the only one certified.
type FindOutput struct {
	Time        string              `json:"time"`
	Params      map[string]string   `json:"params"`
	Complete    bool                `json:"complete"`
	NonIsolated bool                `json:"non_isolated"`
	Equilibria  []EquilibriumOutput `json:"equilibria"`
	Target      *int                `json:"target"` // 1-based; null when the origin is not an equilibrium
	V           string              `json:"V,omitempty"`
	Verdict     string              `json:"verdict"`
	Claim       string              `json:"claim"`
	Reason      string              `json:"reason,omitempty"`
	Digest      string              `json:"digest,omitempty"`
	Certificate string              `json:"certificate,omitempty"`
}

// EquilibriumOutput is one equilibrium of a FindOutput: its point in
// decimals (and exactly when rational), its Krawczyk box when enclosed, its
// class and eigenvalues, and its certification when there is one.
type EquilibriumOutput struct {
	Index         int                   `json:"index"`
	Point         sweep.OrderedStrings  `json:"point"` // decimals
	Exact         *sweep.OrderedStrings `json:"exact,omitempty"`
	Box           [][2]string           `json:"box,omitempty"`
	Status        string                `json:"status"`
	Class         string                `json:"class"`
	Eigenvalues   []string              `json:"eigenvalues"`
	MaxRealEig    float64               `json:"max_real_eig"`
	Certification *CertOutput           `json:"certification,omitempty"`
}

// CertOutput is the certification of one equilibrium.
type CertOutput struct {
	Method      string     `json:"method"`
	V           string     `json:"V,omitempty"`
	P           [][]string `json:"P,omitempty"`
	Verdict     string     `json:"verdict"`
	Claim       string     `json:"claim"`
	Reason      string     `json:"reason"`
	Digest      string     `json:"digest,omitempty"`
	Checks      int        `json:"checks_passed,omitempty"`
	Certificate string     `json:"certificate,omitempty"`
}

// FindJSON is the JSON of a search for equilibria; written[i] is the file
// equilibrium i's certificate was written to, "" for none.
func FindJSON(res *equilibria.FindResult, written []string) FindOutput {
	m := res.Model
	verdict, claim := FindVerdict(res)
	out := FindOutput{Time: timeWord(m.Discrete), Params: map[string]string{}, Complete: res.Search.Complete,
		NonIsolated: res.Search.NonIsolated, Equilibria: []EquilibriumOutput{}, Verdict: verdict, Claim: claim}
	for _, p := range m.Params {
		out.Params[p.Name] = p.Fixed.RatString()
	}
	for i := range res.Search.Equilibria {
		e := &res.Search.Equilibria[i]
		eo := EquilibriumOutput{Index: i + 1, Status: e.Status, Class: e.Class, Eigenvalues: eigenText(e.Eigenvalues),
			MaxRealEig: roundSig(equilibria.MaxRealPart(e.Eigenvalues))}
		eo.Point.Keys = m.States
		for j := range m.States {
			switch e.Status {
			case equilibria.EquilibriumExact:
				eo.Point.Values = append(eo.Point.Values, sweep.RatDecimal(e.Point[j], sweep.EquilibriumDigits))
			case equilibria.EquilibriumEnclosed:
				eo.Point.Values = append(eo.Point.Values, sweep.RatDecimal(e.Box[j].Mid(), 9))
			default:
				eo.Point.Values = append(eo.Point.Values, strconv.FormatFloat(e.Approx[j], 'g', 9, 64))
			}
		}
		if e.Status == equilibria.EquilibriumExact {
			ex := &sweep.OrderedStrings{Keys: m.States}
			for _, v := range e.Point {
				ex.Values = append(ex.Values, v.RatString())
			}
			eo.Exact = ex
		}
		for _, iv := range e.Box {
			eo.Box = append(eo.Box, checker.IntervalText(iv))
		}
		if ct := res.Certs[i]; ct != nil {
			co := &CertOutput{Method: ct.Method, Verdict: ct.Verdict, Claim: ct.Claim, Reason: ct.Reason, Certificate: fileAt(written, i)}
			if ct.V != nil {
				co.V = ct.V.String()
			}
			for _, row := range ct.P {
				var r []string
				for _, v := range row {
					r = append(r, v.RatString())
				}
				co.P = append(co.P, r)
			}
			if ct.Doc != nil {
				co.Digest = ct.Doc.Digest
				co.Checks = len(ct.Verified.Records)
			}
			eo.Certification = co
		}
		out.Equilibria = append(out.Equilibria, eo)
	}
	if res.Target >= 0 {
		t := res.Target + 1
		out.Target = &t
		if ct := res.Certs[res.Target]; ct != nil && countCerts(res) == 1 {
			if ct.V != nil {
				out.V = ct.V.String()
			}
			out.Reason = ct.Reason
			if ct.Doc != nil {
				out.Digest = ct.Doc.Digest
			}
			out.Certificate = fileAt(written, res.Target)
		}
	}
	return out
}

// timeWord names the model's time: "continuous" or "discrete".
func timeWord(discrete bool) string {
	if discrete {
		return "discrete"
	}
	return "continuous"
}
