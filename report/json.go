package report

import (
	"errors"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
	"github.com/lyacert/lyacert/sweep"
)

// The --json shapes of the command line. Their keys are a contract: a
// key is added, never renamed or dropped.

// CheckOutput is the JSON of a check (the direct method): the verdict and
// claim, V and its derivative, the forms with their LDLᵀ factors and
// minors, the conditions in the text's words, the region, witnesses,
// refutation or kernel, and the certificate's digest and re-check.
type CheckOutput struct {
	Verdict     string             `json:"verdict"`
	Claim       string             `json:"claim"`
	Reason      string             `json:"reason"`
	TimeKind    string             `json:"time_kind"` // "continuous" or "discrete"
	V           string             `json:"V"`
	Vdot        string             `json:"vdot"`
	Minors      []string           `json:"minors"`
	Forms       []FormOutput       `json:"forms"`
	Conditions  []string           `json:"conditions"`
	Region      *RegionOutput      `json:"region"`
	Witnesses   []claims.Witness   `json:"witnesses"`
	Refutation  *claims.Refutation `json:"refutation"`
	Kernel      [][]string         `json:"kernel"`
	Digest      string             `json:"digest"`
	Checks      int                `json:"checks_passed"`
	Certificate string             `json:"certificate"`

	// NotSOS: exact proofs that V or −V̇ is no sum of squares in a
	// monomial basis (absent when there are none).
	NotSOS []claims.NotSOS `json:"not_sos,omitempty"`

	// Invariance: the invariance principle's identities (null when the
	// claim does not rest on it).
	Invariance *claims.Invariance `json:"invariance"`
	// Points: rational point pieces of the region settled by a nested
	// certificate of the model with the parameter fixed there ([] when none).
	Points []PointOutput `json:"points"`
	// AlgebraicPoints: irrational point pieces of the region (a root of a
	// polynomial in an isolating interval) settled by Gram matrices of the
	// whole functions less margins, with pivots ≥ 0 there ([] when none).
	AlgebraicPoints []*claims.AlgebraicPoint `json:"algebraic_points"`
	// BoxSOS is the result of check --box-sos (null without the flag).
	BoxSOS *BoxSOSOutput `json:"box_sos"`
}

// BoxSOSOutput is what check --box-sos found: one certificate for every
// parameter value in the box (holds), or why not.
type BoxSOSOutput struct {
	Holds  bool   `json:"holds"`
	Claim  string `json:"claim"`
	Digest string `json:"digest"`
	Checks int    `json:"checks_passed"`
	Reason string `json:"reason"`
}

// PointOutput is one point piece settled by a nested certificate.
type PointOutput struct {
	Params map[string]string `json:"params"`
	Claim  string            `json:"claim"`
	Digest string            `json:"digest"`
}

// FormOutput is one quadratic (or Gram) form of a CheckOutput.
type FormOutput struct {
	Name   string     `json:"name"`
	Basis  []string   `json:"basis"`
	Gram   [][]string `json:"gram"`
	L      [][]string `json:"l"`
	D      []string   `json:"d"`
	Minors []string   `json:"minors"`
	// Margin: the Gram matrix is of the function less this (absent when
	// it is of the function itself).
	Margin string `json:"margin,omitempty"`
}

// RegionOutput is a region: one parameter's pieces, or a paving with its
// summary and its product form.
type RegionOutput struct {
	Param     string               `json:"param"`
	Intervals []claims.Interval    `json:"intervals"`
	Pieces    []claims.Piece       `json:"pieces"`
	Paving    *PavingOutput        `json:"paving"`
	Product   []claims.SturmRegion `json:"product"`
}

// PavingOutput is a paving of a RegionOutput with its counts and shares.
type PavingOutput struct {
	Params     []string          `json:"params"`
	Box        []claims.Interval `json:"box"`
	Resolution string            `json:"resolution"`
	Tree       string            `json:"tree"`
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
		TimeKind: timeWord(res.Model.Discrete), V: c.V, Vdot: c.Vdot,
		Minors: []string{}, Conditions: []string{}, Forms: []FormOutput{},
		Region: regionJSON(c.Region), Witnesses: c.Witnesses, Refutation: c.Refutation, Kernel: c.Kernel, NotSOS: c.NotSOS,
		Digest: doc.Digest, Checks: len(res.Check.Records), Certificate: written,
	}
	out.Invariance, out.Points, out.AlgebraicPoints = res.Invariance, []PointOutput{}, c.Algebraic
	if out.AlgebraicPoints == nil {
		out.AlgebraicPoints = []*claims.AlgebraicPoint{}
	}
	for _, pc := range res.Points {
		kind := checker.Verify(pc.Certificate).Kind
		out.Points = append(out.Points, PointOutput{Params: pc.Params, Claim: kind, Digest: pc.Certificate.Digest})
	}
	for _, f := range c.Forms {
		out.Forms = append(out.Forms, FormOutput{Name: f.Name, Basis: f.Basis, Gram: f.Gram, L: f.L, D: f.D, Minors: f.Minors, Margin: f.Margin})
		out.Minors = append(out.Minors, f.Minors...)
	}
	for _, c := range res.Conds {
		if s := conditionText(c.Q); s != "" {
			out.Conditions = append(out.Conditions, s)
		}
	}
	return out
}

// VerifyOutput is the JSON of a re-check: every check with its result,
// whether the file was altered after it was written (its content no longer
// hashes to its digest) and the checks that disagree with the
// recomputation, and the signature. Valid is the whole answer: the
// mathematics holds and, with --trust, a trusted key signed.
type VerifyOutput struct {
	Valid            bool             `json:"valid"`
	MathematicsValid bool             `json:"mathematics_valid"`
	Claim            string           `json:"claim"`
	Verdict          string           `json:"verdict"`
	Digest           string           `json:"digest"`
	Altered          bool             `json:"altered"`
	RecomputedDigest string           `json:"recomputed_digest"`
	Disagreements    []checker.Record `json:"disagreements"`
	Checks           []checker.Record `json:"checks"`
	Signer           *string          `json:"signer"` // fingerprint; null when unsigned
	TrustRequired    bool             `json:"trust_required"`
	Trusted          bool             `json:"trusted"`
	UntrustedBecause *string          `json:"untrusted_because"`
	// Basin is the level c of a verified sublevel-basin or
	// sublevel-sprocedure claim (absent without one).
	Basin string `json:"basin,omitempty"`
	// NotSOS names the functions ("V", "-Vdot") the checker proved no sum
	// of squares in a stated basis (absent when none).
	NotSOS []string `json:"not_sos,omitempty"`
}

// VerifyJSON is the JSON of checker.Verify's outcome for doc and of the
// trust check.
func VerifyJSON(doc *claims.Document, out checker.Outcome, trust Trust) VerifyOutput {
	altered, recomputed := Altered(doc)
	v := VerifyOutput{Valid: out.Valid && (!trust.Required || trust.Trusted), MathematicsValid: out.Valid,
		Claim: out.Kind, Verdict: out.Verdict, Digest: doc.Digest, Altered: altered, RecomputedDigest: recomputed,
		Disagreements: []checker.Record{}, Checks: out.Records, TrustRequired: trust.Required, Trusted: trust.Trusted, Basin: out.Basin, NotSOS: out.NotSOS}
	if v.Checks == nil {
		v.Checks = []checker.Record{}
	}
	for _, r := range out.Records {
		if !r.OK {
			v.Disagreements = append(v.Disagreements, r)
		}
	}
	if trust.Signer != "" {
		v.Signer = &trust.Signer
	}
	if trust.Required && !trust.Trusted {
		v.UntrustedBecause = &trust.Reason
	}
	return v
}

// FindOutput is the JSON of a search for equilibria. Verdict and Claim
// are FindVerdict's; V, Reason, Digest and Certificate are the model's own
// equilibrium's when it is the only one certified.
type FindOutput struct {
	TimeKind    string              `json:"time_kind"` // "continuous" or "discrete"
	Params      map[string]string   `json:"params"`
	Complete    bool                `json:"complete"`
	NonIsolated bool                `json:"non_isolated"`
	Equilibria  []EquilibriumOutput `json:"equilibria"`
	Target      *int                `json:"target"` // 1-based; null when the origin is not an equilibrium
	V           string              `json:"V"`
	Verdict     string              `json:"verdict"`
	Claim       string              `json:"claim"`
	Reason      string              `json:"reason"`
	Digest      string              `json:"digest"`
	Certificate string              `json:"certificate"`
}

// EquilibriumOutput is one equilibrium of a FindOutput: its point in
// decimals (and exactly when rational), its Krawczyk box when enclosed, its
// class and eigenvalues, and its certification when there is one.
type EquilibriumOutput struct {
	Index         int                   `json:"index"`
	Point         sweep.OrderedStrings  `json:"point"` // decimals
	Exact         *sweep.OrderedStrings `json:"exact"`
	Box           [][2]string           `json:"box"`
	Status        string                `json:"status"`
	Class         string                `json:"class"`
	Eigenvalues   []string              `json:"eigenvalues"`
	MaxRealEig    float64               `json:"max_real_eig"`
	Certification *CertOutput           `json:"certification"`
}

// CertOutput is the certification of one equilibrium.
type CertOutput struct {
	Method      string     `json:"method"`
	V           string     `json:"V"`
	P           [][]string `json:"P"`
	PSource     string     `json:"P_source"`   // PSourceLabel: "rounded P, short numbers" or "exact solution of the Lyapunov equation"
	ExactNote   string     `json:"exact_note"` // why the exact P was asked for and not used; "" otherwise
	Verdict     string     `json:"verdict"`
	Claim       string     `json:"claim"`
	Reason      string     `json:"reason"`
	Digest      string     `json:"digest"`
	Checks      int        `json:"checks_passed"`
	Certificate string     `json:"certificate"`
}

// FindJSON is the JSON of a search for equilibria; written[i] is the file
// equilibrium i's certificate was written to, "" for none.
func FindJSON(res *equilibria.FindResult, written []string) FindOutput {
	m := res.Model
	verdict, claim := FindVerdict(res)
	out := FindOutput{TimeKind: timeWord(m.Discrete), Params: map[string]string{}, Complete: res.Search.Complete,
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
			eo.Box = append(eo.Box, claims.IntervalText(iv))
		}
		if ct := res.Certs[i]; ct != nil {
			co := &CertOutput{Method: ct.Method, PSource: PSourceLabel(ct.PSource), ExactNote: ct.ExactNote, Verdict: ct.Verdict, Claim: ct.Claim, Reason: ct.Reason, Certificate: fileAt(written, i)}
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

// ErrorOutput is the JSON of a failed command (--json): the first error's
// message and position ("file:line:col", null when it is not about input
// text), the exit code, and every error when the input had several.
type ErrorOutput struct {
	Error ErrorBody `json:"error"`
}

// ErrorBody is the "error" object of an ErrorOutput.
type ErrorBody struct {
	Message  string      `json:"message"`
	Position *string     `json:"position"`
	Code     int         `json:"code"`
	Errors   []ErrorItem `json:"errors"`
}

// ErrorItem is one error of an ErrorBody.
type ErrorItem struct {
	Message  string  `json:"message"`
	Position *string `json:"position"`
}

// ErrorJSON is the JSON of err, which ended a command with exit code code.
func ErrorJSON(err error, code int) ErrorOutput {
	items := errorItems(err)
	return ErrorOutput{Error: ErrorBody{Message: items[0].Message, Position: items[0].Position, Code: code, Errors: items}}
}

// errorItems splits err into its errors: the items of a poly.ErrorList,
// or err alone, with the position of a poly.Error it wraps taken out of
// the message.
func errorItems(err error) []ErrorItem {
	var list poly.ErrorList
	if errors.As(err, &list) && len(list) > 0 {
		var out []ErrorItem
		for _, e := range list {
			out = append(out, errorItem(e))
		}
		return out
	}
	return []ErrorItem{errorItem(err)}
}

func errorItem(err error) ErrorItem {
	msg := strings.TrimPrefix(err.Error(), "lyacert: ")
	var pe *poly.Error
	if errors.As(err, &pe) && pe.Pos != (poly.Pos{}) {
		pos := pe.Pos.String()
		return ErrorItem{Message: strings.Replace(msg, pos+": ", "", 1), Position: &pos}
	}
	return ErrorItem{Message: msg}
}

// MergeSummary is what lyacert merge did: the shard files read, the grid
// points of the sweep, the merged lines by verdict, where the lines and
// the plot went (null for standard output and no plot), and whether the
// merged sweep holds (the exit status 0).
type MergeSummary struct {
	Files      []string       `json:"files"`
	GridPoints int            `json:"grid_points"`
	Verdicts   map[string]int `json:"verdicts"`
	Output     *string        `json:"output"`
	Plot       *string        `json:"plot"`
	Holds      bool           `json:"holds"`
}

// MergeJSON is the JSON of a merge; every verdict has a count, zero too.
func MergeJSON(s MergeSummary) MergeSummary {
	v := map[string]int{checker.VerdictHolds: 0, checker.VerdictFails: 0, checker.VerdictUndecided: 0}
	for k, n := range s.Verdicts {
		v[k] += n
	}
	s.Verdicts = v
	if s.Files == nil {
		s.Files = []string{}
	}
	return s
}

// KeyOutput is what lyacert key new wrote: the two key files and the
// public key's fingerprint (the full SHA-256 of its SubjectPublicKeyInfo).
type KeyOutput struct {
	PrivateKey  string `json:"private_key"`
	PublicKey   string `json:"public_key"`
	Fingerprint string `json:"fingerprint"`
}

// SignOutput is what lyacert sign did: the certificate read, the file the
// signed certificate went to, its digest, the signing key's fingerprint,
// and the signature replaced (its key's fingerprint, or "a malformed
// signature"; null when there was none).
type SignOutput struct {
	Certificate string  `json:"certificate"`
	Output      string  `json:"output"`
	Digest      string  `json:"digest"`
	Fingerprint string  `json:"fingerprint"`
	Replaced    *string `json:"replaced"`
}

// ReportOutput is what lyacert report --json did: the format, the file
// the report went to (null when it is in Content instead), the plots
// written beside it, and the certificate's digest, verdict and claim.
type ReportOutput struct {
	Format  string   `json:"format"`
	Output  *string  `json:"output"`
	Content *string  `json:"content"`
	Figures []string `json:"figures"`
	Digest  string   `json:"digest"`
	Verdict string   `json:"verdict"`
	Claim   string   `json:"claim"`
}
