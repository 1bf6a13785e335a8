package report

import (
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// branchDigits is the number of significant digits of the decimal shown
// for an irrational end or bifurcation value, as for check's regions.
const branchDigits = 15

// BranchesOutput is the JSON of find with free parameters: the symbolic
// analysis of the equilibrium branches (certify/branches). Its keys are a
// contract like the other shapes: a key is added, never renamed or
// dropped, and an empty list is [] (an absent value null), never missing.
type BranchesOutput struct {
	Analysis    string            `json:"analysis"`    // always "symbolic"
	Certificate *string           `json:"certificate"` // null: the analysis writes no certificate
	TimeKind    string            `json:"time_kind"`
	Params      map[string]string `json:"params"` // the fixed parameters
	Free        []FreeParamOutput `json:"free"`
	ClosedForm  bool              `json:"closed_form"`
	Reason      string            `json:"reason"`
	// Param is the parameter the classification runs along: the only
	// free one; null with two or more.
	Param        *string             `json:"param"`
	Notes        []string            `json:"notes"`
	Branches     []BranchOutput      `json:"branches"`
	Bifurcations []BifurcationOutput `json:"bifurcations"`
	// LinearCertificates: with --certify-linear, the kernel's check of
	// each branch's linearisation; [] without it.
	LinearCertificates []LinearCertOutput `json:"linear_certificates"`
	// Samples: with one free parameter and no closed form, the equilibria
	// on a grid of it (SamplesJSON; not exact between grid values); null
	// otherwise.
	Samples *SamplesOutput `json:"samples"`
	// Map: with two or more free parameters, the labelled bisection of
	// their box (MapJSON); null otherwise.
	Map *MapOutput `json:"map"`
	// Degenerate: where a condition "c != 0" of the branches fails within
	// the ranges, with the equilibria found there (DegenerateJSON).
	Degenerate []DegenerateOutput `json:"degenerate"`
}

// FreeParamOutput is a free parameter and its assumed range.
type FreeParamOutput struct {
	Name  string `json:"name"`
	Range string `json:"range"`
}

// BranchOutput is one equilibrium branch: its coordinates as exact
// expressions in the free parameters (and in its free states when it is
// not isolated), where it exists, and its linearisation.
type BranchOutput struct {
	ID          int               `json:"id"` // 1, 2, …: the number in the text and in bifurcations
	Coordinates map[string]string `json:"coordinates"`
	Isolated    bool              `json:"isolated"`
	FreeStates  []string          `json:"free_states"`
	// Exists is the condition for the branch to be real ("w >= 0", [] for
	// a rational branch); Assumes lists the conditions "c != 0" the
	// elimination divided by (where one fails the formula says nothing);
	// Region is where both hold along the classified parameter (null with
	// two or more free parameters).
	Exists   []string         `json:"exists"`
	Assumes  []string         `json:"assumes"`
	Region   []IntervalOutput `json:"region"`
	Jacobian [][]string       `json:"jacobian"`
	// Charpoly is c₀ … cₙ of det(λI − J) = λⁿ + cₙ₋₁λⁿ⁻¹ + … + c₀.
	Charpoly []string `json:"charpoly"`
	// Trace, det and discriminant τ² − 4Δ: two states only, else null.
	Trace        *string `json:"trace"`
	Det          *string `json:"det"`
	Discriminant *string `json:"discriminant"`
	// Hurwitz determinants of the characteristic polynomial, or for a map
	// of its bilinear transform q(s) = (1 − s)ⁿp((1 + s)/(1 − s)), whose
	// leading coefficient is BilinearLead (null in continuous time).
	Hurwitz      []string `json:"hurwitz"`
	BilinearLead *string  `json:"bilinear_lead"`
	// Stable lists the expressions whose joint positivity is equivalent to
	// linear stability.
	Stable         []string        `json:"stable_iff_positive"`
	Classification []ClassPiece    `json:"classification"`
	Lyapunov       *LyapunovOutput `json:"lyapunov"`
}

// IntervalOutput is an interval of the classified parameter with the
// conventions of check's regions: ends "-inf", "inf", an exact rational,
// or for an irrational algebraic number its decimal with the polynomial
// (lo_poly, hi_poly) whose unique root in the isolating interval it is;
// those keys are null for other ends.
type IntervalOutput struct {
	Lo          string     `json:"lo"`
	Hi          string     `json:"hi"`
	LoClosed    bool       `json:"lo_closed"`
	HiClosed    bool       `json:"hi_closed"`
	LoPoly      *string    `json:"lo_poly"`
	HiPoly      *string    `json:"hi_poly"`
	LoIsolating *[2]string `json:"lo_isolating"`
	HiIsolating *[2]string `json:"hi_isolating"`
}

// ClassPiece is a piece of the classified parameter's range on which the
// branch exists and has one linear type: class is node, focus,
// degenerate node, saddle, centre candidate, zero eigenvalue, eigenvalue
// 1, eigenvalue -1, hyperbolic (four states or more) or singular (Routh's
// table is singular there); stability is stable, unstable or undetermined
// (not hyperbolic), stable the same as a boolean.
type ClassPiece struct {
	IntervalOutput
	Class     string `json:"class"`
	Stable    bool   `json:"stable"`
	Stability string `json:"stability"`
	// UnstableEigenvalues counts the eigenvalues with positive real part
	// (outside the unit circle for maps); -1 when not decided.
	UnstableEigenvalues int `json:"unstable_eigenvalues"`
}

// LyapunovOutput is the symbolic P(p) with AᵀP + PA = −I (AᵀPA − P = −I
// for maps) along a branch, and the pieces of the classified parameter
// where it is defined and positive definite. It is not a certificate.
type LyapunovOutput struct {
	P                [][]string       `json:"P"`
	PositiveDefinite []IntervalOutput `json:"positive_definite"`
	Note             string           `json:"note"`
}

// BifurcationOutput is a value of the classified parameter where a branch
// loses hyperbolicity. Value is exact p/q when rational; for an irrational
// value it is the decimal, and Poly with Isolating say which root it is.
type BifurcationOutput struct {
	Param     string     `json:"param"`
	Branch    int        `json:"branch"`   // the branch's id: the parent branch for a pitchfork
	Branches  []int      `json:"branches"` // every branch that meets the event
	Kind      string     `json:"kind"`
	Value     string     `json:"value"`
	Decimal   string     `json:"decimal"`
	Poly      *string    `json:"poly"`
	Isolating *[2]string `json:"isolating"`
}

// surdText writes a + b·√w with the ring's names.
func surdText(x branches.Surd) string {
	if x.IsRational() {
		return x.A.String()
	}
	s := "sqrt(" + x.W.String() + ")"
	b := x.B.String()
	switch {
	case b == "1":
	case b == "-1":
		s = "-" + s
	default:
		s = wrapTerm(b) + "*" + s
	}
	if x.A.IsZero() {
		return s
	}
	if strings.HasPrefix(s, "-") {
		return x.A.String() + " - " + s[1:]
	}
	return x.A.String() + " + " + s
}

// wrapTerm puts an expression of several terms in parentheses, so that it
// can stand as a factor.
func wrapTerm(s string) string {
	if s == "" {
		return s
	}
	if strings.Contains(strings.TrimPrefix(s, "-"), " ") || strings.Contains(s[1:], "-") {
		if !(strings.HasPrefix(s, "(") && strings.HasSuffix(s, ")") && !strings.Contains(s, ")/(") && strings.Count(s, "(") == 1) {
			return "(" + s + ")"
		}
	}
	return s
}

// charPolyText writes det(λI − J) = λⁿ + … + c₀ from c₀ … cₙ.
func charPolyText(c []branches.Surd) string {
	var parts []string
	for k := len(c) - 1; k >= 0; k-- {
		if c[k].IsZero() {
			continue
		}
		pow := ""
		switch {
		case k == 1:
			pow = "λ"
		case k > 1:
			pow = "λ^" + strconv.Itoa(k)
		}
		s := surdText(c[k])
		switch {
		case pow == "":
		case s == "1":
			s = pow
		case s == "-1":
			s = "-" + pow
		default:
			s = wrapTerm(s) + "*" + pow
		}
		parts = append(parts, s)
	}
	if len(parts) == 0 {
		return "0"
	}
	out := parts[0]
	for _, p := range parts[1:] {
		if strings.HasPrefix(p, "-") && !strings.HasPrefix(p, "(") {
			out += " - " + p[1:]
		} else {
			out += " + " + p
		}
	}
	return out
}

func matrixText(a branches.Matrix) [][]string {
	out := make([][]string, len(a))
	for i, row := range a {
		out[i] = make([]string, len(row))
		for j, v := range row {
			out[i][j] = surdText(v)
		}
	}
	return out
}

func rowsText(a [][]string) string {
	rows := make([]string, len(a))
	for i, r := range a {
		rows[i] = "[" + strings.Join(r, ", ") + "]"
	}
	return "[" + strings.Join(rows, ", ") + "]"
}

func surdsText(xs []branches.Surd) []string {
	out := make([]string, len(xs))
	for i, x := range xs {
		out[i] = surdText(x)
	}
	return out
}

func optSurd(x *branches.Surd) *string {
	if x == nil {
		return nil
	}
	s := surdText(*x)
	return &s
}

// endOutput writes one end of a span with check's conventions.
func endOutput(e poly.End, r *poly.Ring, pi int) (value string, polyText *string, iso *[2]string) {
	switch {
	case e.Inf < 0:
		return "-inf", nil, nil
	case e.Inf > 0:
		return "inf", nil, nil
	case e.Rational():
		return e.Value.RatString(), nil, nil
	}
	root := poly.URoot{Poly: e.P, Lo: e.A, Hi: e.B}
	p := poly.FromUnivariate(r, pi, e.P).String()
	return root.Decimal(branchDigits), &p, &[2]string{e.A.RatString(), e.B.RatString()}
}

func spanOutput(s poly.Span, r *poly.Ring, pi int) IntervalOutput {
	var iv IntervalOutput
	iv.Lo, iv.LoPoly, iv.LoIsolating = endOutput(s.Lo, r, pi)
	iv.Hi, iv.HiPoly, iv.HiIsolating = endOutput(s.Hi, r, pi)
	iv.LoClosed, iv.HiClosed = s.Lo.Closed && s.Lo.Inf == 0, s.Hi.Closed && s.Hi.Inf == 0
	return iv
}

func spansOutput(ss []poly.Span, r *poly.Ring, pi int) []IntervalOutput {
	out := []IntervalOutput{}
	for _, s := range ss {
		out = append(out, spanOutput(s, r, pi))
	}
	return out
}

// checkerInterval is iv in the kernel's shape, for the text helpers
// shared with check.
func (iv IntervalOutput) checkerInterval() claims.Interval {
	c := claims.Interval{Lo: iv.Lo, Hi: iv.Hi, LoClosed: iv.LoClosed, HiClosed: iv.HiClosed, LoIsolating: iv.LoIsolating, HiIsolating: iv.HiIsolating}
	if iv.LoPoly != nil {
		c.LoPoly = *iv.LoPoly
	}
	if iv.HiPoly != nil {
		c.HiPoly = *iv.HiPoly
	}
	return c
}

// className is a label's class as written: "singular" where Routh's
// table is singular and no finer type is known.
func className(l branches.Label) string {
	if l.Kind == "" {
		return "singular"
	}
	return l.Kind
}

// BranchPieces returns, for branch i, the pieces of the classified range
// on which it exists, adjacent pieces with the same label merged.
func BranchPieces(an *branches.Analysis, i int) []BranchPiece {
	var out []BranchPiece
	prev := false
	for _, p := range an.Pieces {
		l := p.Labels[i]
		if !l.Exists {
			prev = false
			continue
		}
		if prev && out[len(out)-1].Label == l {
			out[len(out)-1].Span.Hi = p.Span.Hi
			continue
		}
		out = append(out, BranchPiece{Span: p.Span, Label: l})
		prev = true
	}
	return out
}

// BranchPiece is a piece of one branch's classification.
type BranchPiece struct {
	Span  poly.Span
	Label branches.Label
}

// hasNonzero reports a branch with a condition c(p) != 0.
func hasNonzero(an *branches.Analysis) bool {
	for _, b := range an.Branches {
		if len(b.Nonzero) > 0 {
			return true
		}
	}
	return false
}

// neverReal reports a branch u ± v·√w with w a negative constant: a pair
// of complex equilibria, real for no parameter value.
func neverReal(b *branches.Branch) bool {
	return b.W != nil && b.W.IsPoly() && b.W.Num.IsConst() && b.W.Num.ConstTerm().Sign() < 0
}

// existsText is the condition for branch b to be real: w >= 0 under its
// square root.
func existsText(b *branches.Branch) []string {
	out := []string{}
	if b.W != nil {
		out = append(out, b.W.String()+" >= 0")
	}
	return out
}

// assumesText lists the conditions c(p) != 0 that the elimination divided
// by to reach branch b: the formula is derived where they hold, and says
// nothing where one fails (the branch may or may not exist there).
func assumesText(b *branches.Branch) []string {
	out := []string{}
	for _, c := range b.Nonzero {
		if s := c.String() + " != 0"; !slices.Contains(out, s) {
			out = append(out, s)
		}
	}
	return out
}

// primaryBranch is the branch a bifurcation is told by: for a pitchfork
// the one that is not of the pair born there, else the first.
func primaryBranch(an *branches.Analysis, bf branches.Bifurcation) int {
	for _, i := range bf.Branches {
		p := an.Branches[i].Pair
		if p < 0 || !slices.Contains(bf.Branches, p) {
			return i
		}
	}
	return bf.Branches[0]
}

func bifurcationOutput(an *branches.Analysis, bf branches.Bifurcation, pi int) BifurcationOutput {
	out := BifurcationOutput{Param: an.Param, Kind: bf.Kind, Branch: primaryBranch(an, bf) + 1, Branches: []int{}}
	for _, i := range bf.Branches {
		out.Branches = append(out.Branches, i+1)
	}
	v := bf.Value
	out.Decimal = trimZeros(v.Decimal(branchDigits))
	if v.Exact != nil {
		out.Value = v.Exact.RatString()
		return out
	}
	out.Value = out.Decimal
	p := poly.FromUnivariate(an.Ring, pi, v.Poly).String()
	out.Poly = &p
	out.Isolating = &[2]string{v.Lo.RatString(), v.Hi.RatString()}
	return out
}

// trimZeros drops the trailing zeros of a decimal's fraction ("1.500" is
// "1.5", "1.000" is "1"); an exponent form is left alone.
func trimZeros(s string) string {
	if !strings.Contains(s, ".") || strings.ContainsAny(s, "eE") {
		return s
	}
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}

// BranchesJSON is the JSON of the symbolic analysis an of m, with the
// kernel's checks of the linearisations when certs is not empty.
func BranchesJSON(m *model.Model, an *branches.Analysis, certs []LinearCert) BranchesOutput {
	out := BranchesOutput{
		Analysis: "symbolic", TimeKind: timeWord(m.Discrete), Params: map[string]string{},
		Free: []FreeParamOutput{}, ClosedForm: an.ClosedForm, Reason: an.Reason,
		Notes: append([]string{}, an.Notes...), Branches: []BranchOutput{}, Bifurcations: []BifurcationOutput{},
		LinearCertificates: LinearCertsJSON(certs), Map: MapJSON(an), Degenerate: DegenerateJSON(m, an),
	}
	for _, p := range m.Params {
		if p.Fixed != nil {
			out.Params[p.Name] = p.Fixed.RatString()
		} else {
			out.Free = append(out.Free, FreeParamOutput{Name: p.Name, Range: p.Range.String()})
		}
	}
	pi := -1
	if an.Param != "" {
		out.Param = &an.Param
		pi, _ = an.Ring.Index(an.Param)
	}
	for i, b := range an.Branches {
		bo := BranchOutput{
			ID: i + 1, Coordinates: map[string]string{}, Isolated: b.Isolated(), FreeStates: []string{},
			Exists: existsText(b), Assumes: assumesText(b), Jacobian: matrixText(b.Jacobian), Charpoly: surdsText(b.CharPoly),
			Trace: optSurd(b.Trace), Det: optSurd(b.Det), Discriminant: optSurd(b.Disc),
			Hurwitz: surdsText(b.Hurwitz), BilinearLead: optSurd(b.Lead), Stable: surdsText(b.Stable),
			Classification: []ClassPiece{},
		}
		for k, s := range m.States {
			bo.Coordinates[s] = surdText(b.Coords[k])
		}
		for _, f := range b.Free {
			bo.FreeStates = append(bo.FreeStates, m.States[f])
		}
		if pi >= 0 {
			bo.Region = spansOutput(an.Where(i, func(l branches.Label) bool { return l.Exists }), an.Ring, pi)
			for _, p := range BranchPieces(an, i) {
				bo.Classification = append(bo.Classification, ClassPiece{
					IntervalOutput: spanOutput(p.Span, an.Ring, pi), Class: className(p.Label),
					Stable: p.Label.Stability == "stable", Stability: p.Label.Stability, UnstableEigenvalues: p.Label.Unstable,
				})
			}
		}
		if q := b.Quadratic; q != nil {
			lo := &LyapunovOutput{P: matrixText(q.P), Note: q.Note}
			if pi >= 0 {
				lo.PositiveDefinite = spansOutput(q.Region, an.Ring, pi)
			}
			bo.Lyapunov = lo
		}
		out.Branches = append(out.Branches, bo)
	}
	for _, bf := range an.Bifurcations {
		out.Bifurcations = append(out.Bifurcations, bifurcationOutput(an, bf, pi))
	}
	return out
}

// AnalysisNote says what the symbolic analysis is and is not.
const AnalysisNote = "This is an analysis, not a certificate: every decision above is exact (rational arithmetic, Sturm sequences), but no certificate is written for it and the checker has not re-checked it. Fix every parameter with --set to certify one equilibrium."

// sampledAnalysisNote replaces AnalysisNote under a sampled analysis.
const sampledAnalysisNote = "This is a sampled analysis, not a certificate: each grid value was decided exactly (its linearization certificates re-checked by the checker, not written), but the picture between grid values is not exact. Fix the parameter with --set to certify one equilibrium."

// certifiedNote replaces AnalysisNote when the linearisations were
// certified.
const certifiedNote = "The analysis above is not a certificate: its decisions are exact, but only the certificates of the linearisation listed were re-checked by the exact checker."

// BranchesText writes the symbolic analysis an of m for a terminal: the
// branches in closed form with their existence conditions and
// linearisation, the classification of the free parameter's range per
// branch, the bifurcation values, and the kernel's checks of the
// linearisations when certs is not empty. It returns the first write
// error.
func BranchesText(w io.Writer, m *model.Model, an *branches.Analysis, certs []LinearCert) error {
	return BranchesSampledText(w, m, an, certs, nil)
}

// BranchesSampledText is BranchesText with, where the branches have no
// closed form, the sampled analysis s (nil for none) in their place.
func BranchesSampledText(w io.Writer, m *model.Model, an *branches.Analysis, certs []LinearCert, s *equilibria.Sampling) error {
	ew := &errWriter{w: w}
	branchesText(ew, m, an, certs, s)
	return ew.err
}

func branchesText(w io.Writer, m *model.Model, an *branches.Analysis, certs []LinearCert, s *equilibria.Sampling) {
	modelHeader(w, m)
	kind := "continuous time"
	if m.Discrete {
		kind = "discrete time"
	}
	fmt.Fprintf(w, "Model %s (%s)\n", m.File, kind)
	var fixed, free []string
	for _, p := range m.Params {
		if p.Fixed != nil {
			fixed = append(fixed, p.Name+" = "+p.Fixed.RatString())
		} else {
			free = append(free, p.Name+" ∈ "+p.Range.String())
		}
	}
	if len(fixed) > 0 {
		fmt.Fprintf(w, "  parameters  %s\n", strings.Join(fixed, ", "))
	}
	fmt.Fprintf(w, "  free        %s\n", strings.Join(free, ", "))
	equationsText(w, m)
	fmt.Fprintln(w)
	if !an.ClosedForm {
		fmt.Fprintf(w, "Equilibrium branches: no closed form (%s).\n", strings.TrimPrefix(an.Reason, "no closed form: "))
		if s == nil {
			fmt.Fprintln(w, "  Fix the parameters with --set to find and certify the equilibria at one parameter point, or sweep the range with lyacert sweep.")
			fmt.Fprintf(w, "\n%s\n", AnalysisNote)
			return
		}
		fmt.Fprintln(w, "  Fix the parameters with --set to find and certify the equilibria at one parameter point; below, the range is sampled instead.")
		samplesText(w, m, s)
		fmt.Fprintf(w, "\n%s\n", sampledAnalysisNote)
		return
	}
	word := "branches"
	if len(an.Branches) == 1 {
		word = "branch"
	}
	fmt.Fprintf(w, "Equilibrium %s: %d, in closed form (exact elimination)\n", word, len(an.Branches))
	if hasNonzero(an) {
		fmt.Fprintln(w, "  the list is complete at every parameter value where no condition \"derived assuming … != 0\" below fails;")
		fmt.Fprintln(w, "  where one fails the elimination divided by zero: fix the parameters there with --set to see that point")
	} else if len(an.Degenerate) > 0 {
		fmt.Fprintln(w, "  the list is complete at every parameter value except those named below")
	} else {
		fmt.Fprintln(w, "  the list is complete for every parameter value")
	}
	for _, n := range an.Notes {
		fmt.Fprintf(w, "  note: %s\n", n)
	}
	degenerateText(w, m, an)
	pi := -1
	if an.Param != "" {
		pi, _ = an.Ring.Index(an.Param)
	}
	eig := "eigenvalues in the open left half-plane"
	if m.Discrete {
		eig = "eigenvalues inside the unit circle"
	}
	for i, b := range an.Branches {
		parts := make([]string, len(m.States))
		for k, s := range m.States {
			parts[k] = s + " = " + surdText(b.Coords[k])
		}
		fmt.Fprintf(w, "\n  %d  %s\n", i+1, strings.Join(parts, ", "))
		if neverReal(b) {
			fmt.Fprintf(w, "     no real equilibrium: %s < 0 for every parameter value (complex branch; no linear analysis)\n", b.W)
			continue
		}
		conds, assumes := existsText(b), assumesText(b)
		switch {
		case len(conds) == 0 && len(assumes) == 0:
			fmt.Fprintln(w, "     exists for every parameter value")
		default:
			if len(conds) > 0 {
				fmt.Fprintf(w, "     exists where %s\n", strings.Join(conds, " and "))
			}
			if len(assumes) > 0 {
				fmt.Fprintf(w, "     derived assuming %s (the elimination divided by it)\n", strings.Join(assumes, " and "))
			}
			if pi >= 0 {
				var ivs []string
				for _, iv := range spansOutput(an.Where(i, func(l branches.Label) bool { return l.Exists }), an.Ring, pi) {
					ivs = append(ivs, intervalText(iv.checkerInterval()))
				}
				if len(ivs) == 0 {
					ivs = []string{"∅"}
				}
				fmt.Fprintf(w, "     so along %s: %s ∈ %s\n", an.Param, an.Param, strings.Join(ivs, " ∪ "))
			}
		}
		if !b.Isolated() {
			var fs []string
			for _, f := range b.Free {
				fs = append(fs, m.States[f])
			}
			fmt.Fprintf(w, "     non-isolated: a set of equilibria parametrised by %s (no linear analysis)\n", strings.Join(fs, ", "))
			continue
		}
		fmt.Fprintf(w, "     Jacobian J = %s\n", rowsText(matrixText(b.Jacobian)))
		fmt.Fprintf(w, "     det(λI − J) = %s\n", charPolyText(b.CharPoly))
		if b.Trace != nil {
			fmt.Fprintf(w, "     trace τ = %s, det Δ = %s, τ² − 4Δ = %s\n", surdText(*b.Trace), surdText(*b.Det), surdText(*b.Disc))
		}
		var hs []string
		for k, h := range b.Hurwitz {
			hs = append(hs, fmt.Sprintf("H%d = %s", k+1, surdText(h)))
		}
		if m.Discrete {
			nn := len(m.States)
			fmt.Fprintf(w, "     bilinear transform q(s) = (1 − s)^%d·p((1 + s)/(1 − s)), p(λ) = det(λI − J): leading coefficient %s\n", nn, surdText(*b.Lead))
			fmt.Fprintf(w, "     Hurwitz determinants of q:%s\n", hurwitzList(hs))
			jury := ""
			if nn == 2 {
				jury = "; equivalent to Jury's conditions 1 − τ + Δ > 0, 1 − Δ > 0, 1 + τ + Δ > 0"
			}
			fmt.Fprintf(w, "     %s iff the leading coefficient and every Hk are positive (bilinear map%s)\n", eig, jury)
		} else {
			fmt.Fprintf(w, "     Hurwitz determinants:%s\n", hurwitzList(hs))
			fmt.Fprintf(w, "     %s iff every Hk > 0 (Routh–Hurwitz)\n", eig)
		}
	}
	if pi < 0 {
		switch {
		case an.Map != nil:
			mapText(w, an)
		case len(m.FreeParams()) > 1:
			fmt.Fprintln(w, "\nNo classification: every free parameter needs a bounded range or a box (--box NAME=LO..HI), or fix all but one with --set.")
		}
		if len(certs) > 0 {
			LinearCertsText(w, "", certs)
		}
		fmt.Fprintf(w, "\n%s\n", AnalysisNote)
		return
	}
	fmt.Fprintf(w, "\nClassification along %s (exact ends)\n", an.Param)
	var roots []string
	for i, b := range an.Branches {
		fmt.Fprintf(w, "  branch %d\n", i+1)
		ps := BranchPieces(an, i)
		if len(ps) == 0 {
			fmt.Fprintln(w, "    exists nowhere in the range")
		}
		if !b.Isolated() {
			fmt.Fprintln(w, "    non-isolated equilibria: not classified")
			continue
		}
		width := 0
		for _, p := range ps {
			width = max(width, len([]rune(intervalText(spanOutput(p.Span, an.Ring, pi).checkerInterval()))))
		}
		for _, p := range ps {
			iv := spanOutput(p.Span, an.Ring, pi).checkerInterval()
			text := className(p.Label) + ", " + p.Label.Stability
			if p.Label.Stability == "unstable" && p.Label.Unstable > 0 {
				text += fmt.Sprintf(" (%d unstable eigenvalue", p.Label.Unstable)
				if p.Label.Unstable > 1 {
					text += "s"
				}
				text += ")"
			}
			it := intervalText(iv)
			fmt.Fprintf(w, "    %s ∈ %s%s  %s\n", an.Param, it, strings.Repeat(" ", width-len([]rune(it))), text)
			roots = rootLines(roots, "  ", iv)
		}
	}
	for _, s := range roots {
		fmt.Fprintln(w, s)
	}
	fmt.Fprintf(w, "\nBifurcations along %s\n", an.Param)
	if len(an.Bifurcations) == 0 {
		fmt.Fprintln(w, "  none in the range")
	}
	for _, bf := range an.Bifurcations {
		o := bifurcationOutput(an, bf, pi)
		val := o.Value
		if o.Poly != nil {
			val = fmt.Sprintf("%s (the root of %s in (%s, %s))", o.Decimal, *o.Poly, o.Isolating[0], o.Isolating[1])
		} else if strings.Contains(o.Value, "/") {
			val += " ≈ " + shortDecimal(o.Decimal)
		}
		fmt.Fprintf(w, "  %s = %s  %s (%s)\n", an.Param, val, o.Kind, bifurcationBranches(o))
	}
	if len(certs) > 0 {
		LinearCertsText(w, an.Param, certs)
		fmt.Fprintf(w, "\n%s\n\n%s\n", certifiedNote, Caution)
		return
	}
	fmt.Fprintf(w, "\n%s\n", AnalysisNote)
}

// hurwitzList writes H1 = …, H2 = … on the line, or one a line when they
// are long.
func hurwitzList(hs []string) string {
	if len(strings.Join(hs, ", ")) <= 90 {
		return " " + strings.Join(hs, ", ")
	}
	return "\n       " + strings.Join(hs, "\n       ")
}

// bifurcationBranches says which branches meet at a bifurcation.
func bifurcationBranches(o BifurcationOutput) string {
	var others []string
	for _, b := range o.Branches {
		if b != o.Branch {
			others = append(others, strconv.Itoa(b))
		}
	}
	switch {
	case len(others) == 0:
		return fmt.Sprintf("branch %d", o.Branch)
	case o.Kind == "pitchfork":
		return fmt.Sprintf("branch %d; branches %s are born", o.Branch, strings.Join(others, " and "))
	case o.Kind == "saddle-node":
		return fmt.Sprintf("branches %d and %s meet (they exist on one side only)", o.Branch, strings.Join(others, " and "))
	case o.Kind == "transcritical":
		return fmt.Sprintf("branches %d and %s cross", o.Branch, strings.Join(others, " and "))
	}
	return fmt.Sprintf("branches %d and %s", o.Branch, strings.Join(others, " and "))
}
