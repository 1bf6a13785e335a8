package report

import (
	"fmt"
	"io"
	"strings"

	"github.com/lyacert/lyacert/certify/boxsearch"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

// boxOf writes the box of m's free parameters, "p in [0, 4], c in [1, 2]".
func boxOf(m *model.Model) string {
	var box []string
	for _, p := range m.FreeParams() {
		box = append(box, p.Name+" in "+p.Range.String())
	}
	return strings.Join(box, ", ")
}

// BoxSearchVerdict is the verdict and kind of find --degree --box-sos:
// the kernel's for the certificate, undecided without one.
func BoxSearchVerdict(res *boxsearch.Result) (verdict, kind string) {
	if res.Doc == nil {
		return checker.VerdictUndecided, checker.KindNone
	}
	return res.Outcome.Verdict, res.Outcome.Kind
}

// BoxSearchText writes what find --degree 2D --box-sos did: the sizes of
// its semidefinite program, the rounded V, which method proved it and the
// kernel's verdict; or why no V was proven. written is the certificate's
// path, or "".
func BoxSearchText(w io.Writer, m *model.Model, degree int, res *boxsearch.Result, written string) error {
	ew := &errWriter{w: w}
	s := res.Sizes
	fmt.Fprintf(ew, "%s: one V of degree %d for the whole parameter box, by a semidefinite program (sums of squares with box multipliers)\n", m.File, degree)
	fmt.Fprintf(ew, "box: %s\n", boxOf(m))
	var orders []string
	for i, n := range s.Multipliers {
		name := "σ₀"
		if i < len(s.Factors) && s.Factors[i] != "" {
			name = "σ_" + s.Factors[i]
		}
		orders = append(orders, fmt.Sprintf("%s %d", name, n))
	}
	fmt.Fprintf(ew, "  V = z₁ᵀG₁z₁, basis %d; Gram orders of the multipliers %s; %d equations; SDP blocks %v, %d iterations, margin %.3g (−V̇ ≥ margin·Σxᵢ^%d); %v solving, %v rounding and exact checks\n",
		s.BasisV, strings.Join(orders, ", "), s.Constraints, s.Blocks, s.Iterations, s.Margin, 2*max(s.Low, 1), s.Solve.Round(1e3), s.Round.Round(1e3))
	verdict, kind := BoxSearchVerdict(res)
	if res.Doc == nil {
		fmt.Fprintf(ew, "no certificate: %s\n", res.Reason)
		fmt.Fprintf(ew, "verdict: %s\n", verdict)
		return ew.err
	}
	fmt.Fprintf(ew, "V = %s\n", res.V)
	fmt.Fprintf(ew, "  coefficients rounded to multiples of 2^-%d of the largest (%d rounding(s) tried)\n", s.Bits, s.Roundings)
	switch res.Method {
	case boxsearch.MethodDirect:
		fmt.Fprintln(ew, "proven by: the direct method (V's form and −V̇'s, exactly, for every parameter value in the box)")
	default:
		fmt.Fprintln(ew, "proven by: sums of squares with box multipliers (the direct method proves V's form; −V̇ − margin = σ₀ + Σ σᵢ·(pᵢ − loᵢ)(hiᵢ − pᵢ) with every σ a sum of squares, rule box-multiplier-sos)")
	}
	fmt.Fprintf(ew, "verdict: %s (%s): %s for every parameter value in the box\n", verdict, kind, textClaims[kind])
	fmt.Fprintf(ew, "checked by the kernel: %d checks passed\n", len(res.Outcome.Records))
	if written != "" {
		fmt.Fprintf(ew, "certificate: %s\n", written)
	}
	fmt.Fprintf(ew, "digest %s\n", res.Doc.Digest)
	return ew.err
}

// BoxSearchResultJSON is the --json shape of find --degree --box-sos.
type BoxSearchResultJSON struct {
	Model       string         `json:"model"`
	Degree      int            `json:"degree"`
	Box         string         `json:"box"`
	Verdict     string         `json:"verdict"`
	Claim       string         `json:"claim"`
	V           string         `json:"v,omitempty"`
	Method      string         `json:"method,omitempty"` // "direct" or "box-multiplier-sos"
	Checks      int            `json:"checks_passed"`
	Digest      string         `json:"digest,omitempty"`
	Certificate string         `json:"certificate,omitempty"`
	Reason      string         `json:"reason,omitempty"`
	Sizes       BoxSearchSizes `json:"sizes"`
}

// BoxSearchSizes are the sizes of the search in --json.
type BoxSearchSizes struct {
	BasisV      int      `json:"basis_v"`
	Multipliers []int    `json:"multipliers"` // Gram orders of σ₀, σᵢ
	Factors     []string `json:"factors"`     // the parameter of each σ ("" for σ₀)
	Equations   int      `json:"equations"`
	Blocks      []int    `json:"blocks"`
	Iterations  int      `json:"iterations"`
	Margin      float64  `json:"margin"`
	MarginPower int      `json:"margin_power"` // 2 or 4: −V̇ ≥ margin·Σxᵢ^power on the box (search only)
	Bits        int      `json:"bits"`
	Roundings   int      `json:"roundings"`
}

// BoxSearchJSON returns the --json shape of res.
func BoxSearchJSON(m *model.Model, degree int, res *boxsearch.Result, written string) BoxSearchResultJSON {
	s := res.Sizes
	verdict, kind := BoxSearchVerdict(res)
	out := BoxSearchResultJSON{Model: m.File, Degree: degree, Box: boxOf(m), Verdict: verdict, Claim: kind, Reason: res.Reason, Certificate: written,
		Sizes: BoxSearchSizes{BasisV: s.BasisV, Multipliers: s.Multipliers, Factors: s.Factors, Equations: s.Constraints, Blocks: s.Blocks,
			Iterations: s.Iterations, Margin: finite(s.Margin), MarginPower: 2 * max(s.Low, 1), Bits: s.Bits, Roundings: s.Roundings}}
	if res.Doc != nil {
		out.V, out.Method, out.Checks, out.Digest = res.V.String(), res.Method, len(res.Outcome.Records), res.Doc.Digest
	}
	return out
}
