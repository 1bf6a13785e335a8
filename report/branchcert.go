package report

import (
	"fmt"
	"io"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/poly"
)

// LinearCert is the kernel's check of one branch's linearisation with the
// symbolic quadratic V (branches.LinearModel and direct.Check): Result is
// nil when the branch has none, and Skipped says why.
type LinearCert struct {
	Branch  int // index into Analysis.Branches
	Model   string
	Result  *direct.Result
	Skipped string
	Written string // the file the certificate was written to, "" for none
	// Reparam is set when the certificate is about the rational
	// parametrization of a branch with a square root.
	Reparam *Reparam
}

// Reparam says that a linear certificate is about the model in a new
// parameter u = √w > 0 that makes a branch with a square root rational
// (branches.Reparametrization), and maps its region back.
type Reparam struct {
	Param, NewParam string
	Radicand        string // w
	Relation        string // p = (u² − d)/c
	Model           string // the reparametrized model's text
	Coordinates     string // the branch in u
	// Region is the certified region of u mapped back to Param (exact
	// ends, clipped to its range), written with Ring and Index; Note says
	// why it is not mapped back.
	Region []poly.Span
	Ring   *poly.Ring
	Index  int
	Note   string
}

// ReparamOutput is the JSON of a Reparam.
type ReparamOutput struct {
	Param       string           `json:"param"`
	NewParam    string           `json:"new_param"`
	Radicand    string           `json:"radicand"`
	Relation    string           `json:"relation"`
	Model       string           `json:"model"`
	Coordinates string           `json:"coordinates"`
	Region      []IntervalOutput `json:"region"` // in param; null when not mapped back
	Note        string           `json:"note"`
}

// LinearCertOutput is the JSON of a LinearCert.
type LinearCertOutput struct {
	Branch      int           `json:"branch"` // the branch's id
	Model       *string       `json:"model"`  // the linear model's text; null when skipped
	Skipped     *string       `json:"skipped"`
	Verdict     *string       `json:"verdict"`
	Claim       *string       `json:"claim"`
	Region      *RegionOutput `json:"region"` // where the kernel accepts V; null when skipped
	Digest      *string       `json:"digest"`
	Checks      int           `json:"checks_passed"`
	Certificate *string       `json:"certificate"`
	// Reparametrized: the certificate is about the model in new_param
	// (its region is in new_param), mapped back to param; null otherwise.
	Reparametrized *ReparamOutput `json:"reparametrized"`
}

func strPtr(s string) *string { return &s }

// LinearCertsJSON is the JSON of the linear certificates.
func LinearCertsJSON(cs []LinearCert) []LinearCertOutput {
	out := []LinearCertOutput{}
	for _, c := range cs {
		o := LinearCertOutput{Branch: c.Branch + 1}
		if c.Result == nil {
			o.Skipped = strPtr(c.Skipped)
			out = append(out, o)
			continue
		}
		res := c.Result
		o.Model = strPtr(c.Model)
		o.Verdict, o.Claim = strPtr(res.Verdict), strPtr(res.Claim)
		o.Digest = strPtr(res.Doc.Digest)
		o.Checks = len(res.Check.Records)
		o.Region = regionJSON(certificates.ContentsOf(res.Doc).Region)
		if c.Written != "" {
			o.Certificate = strPtr(c.Written)
		}
		if rp := c.Reparam; rp != nil {
			ro := &ReparamOutput{Param: rp.Param, NewParam: rp.NewParam, Radicand: rp.Radicand, Relation: rp.Relation,
				Model: rp.Model, Coordinates: rp.Coordinates, Note: rp.Note}
			if rp.Note == "" {
				ro.Region = spansOutput(rp.Region, rp.Ring, rp.Index)
			}
			o.Reparametrized = ro
		}
		out = append(out, o)
	}
	return out
}

// LinearCertsText writes the kernel's checks of the branches'
// linearisations: where V = D²ξᵀPξ is accepted, and the certificates.
func LinearCertsText(w io.Writer, param string, cs []LinearCert) error {
	ew := &errWriter{w: w}
	fmt.Fprintln(ew, "\nCertificates of the linearisation (V = D(p)²·ξᵀP(p)ξ, ξ the deviation from the branch, re-checked by the exact checker)")
	for _, c := range cs {
		if c.Result == nil {
			fmt.Fprintf(ew, "  branch %d: none (%s)\n", c.Branch+1, c.Skipped)
			continue
		}
		res := c.Result
		where := "for every parameter value"
		param := param
		if rp := c.Reparam; rp != nil {
			fmt.Fprintf(ew, "  branch %d: through u = sqrt(%s) > 0 in place of %s, %s, the branch is %s — rational in %s.\n", c.Branch+1, rp.Radicand, rp.Param, rp.Relation, rp.Coordinates, rp.NewParam)
			fmt.Fprintf(ew, "    The certificate below is about that reparametrized model (in %s), not the model in %s:\n", rp.NewParam, rp.Param)
			param = rp.NewParam
		}
		var roots []string
		if rg := res.Region; rg != nil && rg.Paving == nil {
			var hold []string
			for _, p := range rg.Pieces {
				if p.Holds {
					hold = append(hold, intervalText(p.Interval))
					roots = rootLines(roots, "    ", p.Interval)
				}
			}
			where = param + " ∈ " + strings.Join(hold, " ∪ ")
			if len(hold) == 0 {
				where = "nowhere in the range"
			}
		}
		if res.Verdict != checker.VerdictHolds && res.Region == nil {
			where = "nowhere (" + res.Reason + ")"
		}
		if c.Reparam != nil {
			fmt.Fprintf(ew, "    its linearisation is asymptotically stable for %s\n", where)
		} else {
			fmt.Fprintf(ew, "  branch %d: the linearisation is asymptotically stable for %s\n", c.Branch+1, where)
		}
		for _, s := range roots {
			fmt.Fprintln(ew, s)
		}
		fmt.Fprintf(ew, "    so there the branch is locally exponentially stable (Lyapunov's indirect method; that J(p) is the\n")
		fmt.Fprintf(ew, "    Jacobian along the branch is exact algebra of the analysis, not part of the certificate)\n")
		fmt.Fprintf(ew, "    %d checks passed", len(res.Check.Records))
		if c.Written != "" {
			fmt.Fprintf(ew, "; written to %s", c.Written)
		}
		fmt.Fprintf(ew, "\n    digest %s\n", res.Doc.Digest)
		if rp := c.Reparam; rp != nil {
			if rp.Note != "" {
				fmt.Fprintf(ew, "    not mapped back to %s: %s\n", rp.Param, rp.Note)
				continue
			}
			var ivs []string
			var back []string
			for _, iv := range spansOutput(rp.Region, rp.Ring, rp.Index) {
				ivs = append(ivs, intervalText(iv.checkerInterval()))
				back = rootLines(back, "    ", iv.checkerInterval())
			}
			if len(ivs) == 0 {
				ivs = []string{"∅"}
			}
			fmt.Fprintf(ew, "    mapped back through %s (monotone for %s > 0): %s ∈ %s\n", rp.Relation, rp.NewParam, rp.Param, strings.Join(ivs, " ∪ "))
			for _, s := range back {
				fmt.Fprintln(ew, s)
			}
		}
	}
	return ew.err
}
