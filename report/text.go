package report

import (
	"fmt"
	"io"
	"math/big"
	"sort"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Caution is printed under every verdict of the terminal text and under a
// sweep's summary. The reports carry a longer list (see cautions).
const Caution = `Caution: this certificate proves a property of the model above under its
stated assumptions, not of the physical system. Modelling error, unmodelled
dynamics, saturation, delay and sampling can void it. Defer to the applicable
standards and to licensed engineering judgement.`

// errWriter keeps the first write error, so that a text of many lines is
// written with plain Fprintf calls and its error is still returned.
type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return 0, e.err
	}
	n, err := e.w.Write(p)
	e.err = err
	return n, err
}

// textClaims are the claims in the terminal text's verdict line.
var textClaims = map[string]string{
	checker.KindGlobal: claimWords[checker.KindGlobal],
	checker.KindLocal:  claimWords[checker.KindLocal],
	checker.KindStable: "the equilibrium is stable (Lyapunov); V̇ ≤ 0 but not < 0",
}

func dotName(m *model.Model) string {
	if m.Discrete {
		return "ΔV"
	}
	return "V̇"
}

// CheckText writes the result of the direct method for a terminal: the
// model, V and its derivative along the flow (or difference along the
// map), the completed squares, the leading principal minors, the
// conditions on the parameters, the region where they hold, the verdict,
// the checker's re-check of the certificate and the caution. written is
// the file the certificate was written to, "" when none. It returns the
// first write error.
func CheckText(w io.Writer, res *direct.Result, written string) error {
	ew := &errWriter{w: w}
	checkText(ew, res, written)
	return ew.err
}

func checkText(w io.Writer, res *direct.Result, written string) {
	m := res.Model
	dv := dotName(m)
	modelHeader(w, m)
	fmt.Fprintf(w, "Model %s\n", m.File)
	fmt.Fprintf(w, "  states       %s\n", strings.Join(m.States, ", "))
	for _, p := range m.Params {
		t := model.RangeText(p)
		if t == "" {
			t = "(any real value)"
		}
		fmt.Fprintf(w, "  parameter    %s %s\n", p.Name, t)
	}
	equationsText(w, m)
	at := make([]string, len(m.States))
	for i, s := range m.States {
		at[i] = s + " = " + m.At[i].String()
	}
	fmt.Fprintf(w, "  equilibrium  %s\n\n", strings.Join(at, ", "))

	fmt.Fprintf(w, "Candidate\n  V = %s\n\n", res.V)
	if m.Discrete {
		fmt.Fprintf(w, "Difference along the map, ΔV = V(f(x)) − V(x)\n  ΔV = %s\n", res.Vdot)
	} else {
		fmt.Fprintf(w, "Derivative along the flow, V̇ = Σ ∂V/∂xᵢ · fᵢ\n  V̇ = %s\n", res.Vdot)
	}
	if m.AtGiven {
		fmt.Fprintf(w, "  at the equilibrium (states measured from it): V = %s, %s = %s\n", res.Shifted.V, dv, res.Shifted.Vdot)
	}
	switch {
	case len(res.Forms) == 0:
	case res.HigherD.IsZero():
		fmt.Fprintf(w, "  %s is a quadratic form in the states: every higher-order term cancels.\n", dv)
	case len(res.Forms) == 2 && res.Forms[1].Basis != nil:
		fmt.Fprintf(w, "  higher-order terms of %s: %s\n  (taken into account: the Gram matrix below is of −%s as a whole)\n", dv, res.HigherD, dv)
	default:
		fmt.Fprintf(w, "  higher-order terms of %s: %s\n  (they decide nothing near the equilibrium; the claim below is local)\n", dv, res.HigherD)
	}
	if len(res.Forms) > 0 && !res.HigherV.IsZero() {
		fmt.Fprintf(w, "  higher-order terms of V: %s\n", res.HigherV)
	}
	fmt.Fprintln(w)

	if len(res.Forms) > 0 {
		fmt.Fprintln(w, "Completing the squares (exact LDLᵀ of the Gram matrices)")
		for _, f := range res.Forms {
			if f.Basis != nil {
				zs := make([]string, len(f.Basis))
				for i, z := range f.Basis {
					zs[i] = z.String()
				}
				who := "V"
				if f.Name != "V" {
					who = "−" + dv
				}
				if f.Margin != nil {
					who += " as a whole, less the margin " + f.Margin.String() + ","
				} else {
					who += " as a whole"
				}
				fmt.Fprintf(w, "  %s is zᵀGz in the monomial basis z = (%s)\n", who, strings.Join(zs, ", "))
			}
		}
		for _, f := range res.Forms {
			lhs := "V₂"
			if f.Name != "V" {
				lhs = "−" + dv + "₂"
			}
			if f.Basis != nil {
				// the whole function, in a monomial basis
				lhs = strings.TrimSuffix(lhs, "₂")
			}
			if f.Margin != nil {
				lhs += " − (" + f.Margin.String() + ")"
			}
			fmt.Fprintf(w, "  %s = %s\n", lhs, squaresText(f))
		}
		fmt.Fprintln(w)
		fmt.Fprintln(w, "Leading principal minors (Sylvester: positive definite iff all > 0)")
		for _, f := range res.Forms {
			lhs := "V"
			if f.Name != "V" {
				lhs = "−" + dv
			}
			parts := make([]string, len(f.Minors))
			for i, mi := range f.Minors {
				parts[i] = fmt.Sprintf("Δ%d = %s", i+1, mi)
			}
			if f.LDL.Semidefinite() {
				lhs += " (on the non-zero pivots)"
			}
			fmt.Fprintf(w, "  %s: %s\n", lhs, strings.Join(parts, ", "))
		}
		fmt.Fprintln(w)
		conditionsText(w, res)
	}
	verdictText(w, res)
	if res.Refutation != nil {
		refutationText(w, res)
	}
	for _, n := range res.Notes {
		fmt.Fprintf(w, "Note: %s.\n", n)
	}
	if len(res.Methods) > 0 {
		ms := make([]string, len(res.Methods))
		for i, mt := range res.Methods {
			ms[i] = mt.String()
		}
		fmt.Fprintf(w, "Method: %s.\n", strings.Join(ms, "; "))
	}
	fmt.Fprintf(w, "\nCertificate re-checked by the exact checker: %d checks passed", len(res.Check.Records))
	if written != "" {
		fmt.Fprintf(w, "; written to %s", written)
	}
	fmt.Fprintf(w, "\n  digest %s\n\n%s\n", res.Doc.Digest, Caution)
}

// modelHeader writes the model file's leading comment, a line per line.
func modelHeader(w io.Writer, m *model.Model) {
	for _, d := range m.Description {
		if d != "" {
			fmt.Fprintf(w, "# %s\n", d)
		}
	}
	if len(m.Description) > 0 {
		fmt.Fprintln(w)
	}
}

// equationsText writes x' = f(x), or next x = f(x) for a map.
func equationsText(w io.Writer, m *model.Model) {
	for i, s := range m.States {
		if m.Discrete {
			fmt.Fprintf(w, "  %s+ = %s\n", s, m.F[i])
		} else {
			fmt.Fprintf(w, "  %s' = %s\n", s, m.F[i])
		}
	}
}

// squaresText writes Σ dₖ·(xₖ + Σᵢ>ₖ Lᵢₖ xᵢ)² as a person would.
func squaresText(f direct.Form) string {
	var parts []string
	for k, d := range f.LDL.D {
		if f.LDL.Zero[k] {
			continue
		}
		lin := f.SquareBase(k)
		sq := lin.String()
		if lin.Num.NumTerms() > 1 || strings.ContainsAny(sq, "*^/") {
			sq = "(" + sq + ")"
		}
		sq += "^2"
		ds := d.String()
		switch {
		case ds == "1":
		case d.IsPoly() && d.Num.NumTerms() == 1:
			sq = ds + "*" + sq
		default:
			sq = "(" + ds + ")*" + sq
		}
		parts = append(parts, sq)
	}
	if len(parts) == 0 {
		return "0"
	}
	return strings.Join(parts, " + ")
}

func conditionsText(w io.Writer, res *direct.Result) {
	dv := dotName(res.Model)
	fmt.Fprintln(w, "Conditions")
	some := false
	for _, c := range res.Conds {
		form := "V"
		if c.Form != "V" {
			form = "−" + dv
		}
		var discharged []string
		for _, f := range c.Factors {
			switch f.Status {
			case claims.StatusPositive:
				discharged = append(discharged, factorText(f)+" > 0 by assumption")
			case claims.StatusNegative:
				discharged = append(discharged, factorText(f)+" < 0 by assumption")
			}
		}
		cond := conditionText(c.Q)
		if cond == "" {
			if len(discharged) > 0 {
				fmt.Fprintf(w, "  %s Δ%d > 0: holds (%s)\n", form, c.Index, strings.Join(discharged, "; "))
			}
			continue
		}
		some = true
		note := ""
		if len(discharged) > 0 {
			note = " (" + strings.Join(discharged, "; ") + ")"
		}
		fmt.Fprintf(w, "  %s Δ%d > 0 requires %s%s\n", form, c.Index, cond, note)
	}
	if !some {
		fmt.Fprintln(w, "  every condition holds for every allowed parameter value")
	}
	fmt.Fprintln(w)
}

func factorText(f direct.SignedFactor) string {
	s := f.P.String()
	if f.Power > 1 {
		if f.P.NumTerms() > 1 {
			s = "(" + s + ")"
		}
		s = fmt.Sprintf("%s^%d", s, f.Power)
	}
	return s
}

// conditionText writes q > 0 readably (see readCondition): "r < 1" for a
// linear condition in one parameter; "" when q is a positive constant.
func conditionText(q *poly.Poly) string {
	c := readCondition(q)
	switch {
	case c.always:
		return ""
	case c.never:
		return "false (" + q.String() + " > 0 never holds)"
	case c.param != "":
		op := ">"
		if c.below {
			op = "<"
		}
		return fmt.Sprintf("%s %s %s", c.param, op, c.bound.RatString())
	}
	return q.String() + " > 0"
}

// intervalText writes an interval of a parameter as [a, b), {a} for a point.
func intervalText(iv claims.Interval) string {
	if iv.Lo == iv.Hi && iv.LoPoly == iv.HiPoly && iv.LoClosed && iv.HiClosed {
		return "{" + iv.Lo + "}"
	}
	lb, rb := "(", ")"
	if iv.LoClosed {
		lb = "["
	}
	if iv.HiClosed {
		rb = "]"
	}
	return lb + iv.Lo + ", " + iv.Hi + rb
}

// rootLines adds to lines, once each, "a is the root of p in (l, u)" for
// the irrational ends of iv, after indent.
func rootLines(lines []string, indent string, iv claims.Interval) []string {
	for _, e := range [][3]string{{iv.Lo, iv.LoPoly, isoText(iv.LoIsolating)}, {iv.Hi, iv.HiPoly, isoText(iv.HiIsolating)}} {
		if e[1] == "" {
			continue
		}
		if s := fmt.Sprintf("%s%s is the root of %s in %s", indent, e[0], e[1], e[2]); !containsStr(lines, s) {
			lines = append(lines, s)
		}
	}
	return lines
}

// mergeAdjacent joins holding intervals that meet ([0, 1) and {1} make
// [0, 1]), for statements of where a claim holds; the certificate keeps the
// pieces apart, since each rests on its own argument.
func mergeAdjacent(ivs []claims.Interval) []claims.Interval {
	var out []claims.Interval
	for _, iv := range ivs {
		if k := len(out) - 1; k >= 0 && out[k].Hi == iv.Lo && out[k].HiPoly == iv.LoPoly && out[k].HiClosed != iv.LoClosed {
			out[k].Hi, out[k].HiPoly, out[k].HiIsolating, out[k].HiClosed = iv.Hi, iv.HiPoly, iv.HiIsolating, iv.HiClosed
			continue
		}
		out = append(out, iv)
	}
	return out
}

// elsewhere says what the pieces of a one-parameter region that do not hold
// are: refuted (the candidate fails there), undecided, or some of each.
func elsewhere(pieces []claims.Piece) string {
	fails, undecided := false, false
	for _, p := range pieces {
		fails = fails || pieceWord(p) == claims.PieceFails
		undecided = undecided || pieceWord(p) == claims.PieceUndecided
	}
	switch {
	case fails && undecided:
		return "elsewhere the candidate is refuted or the test is undecided (see the pieces of the region)"
	case fails:
		return "the candidate is refuted everywhere else"
	}
	return "the test is undecided elsewhere"
}

// maxOrder is the highest order of derivative the invariance identities use.
func maxOrder(iv *claims.Invariance) int {
	k := 0
	for _, t := range iv.Lie {
		k = max(k, t.Order)
	}
	return k
}

// pieceWord is a piece's status: holds, fails (refuted) or undecided.
func pieceWord(p claims.Piece) string {
	if p.Status == "" { // a region written before pieces had a status
		return map[bool]string{true: claims.PieceHolds, false: claims.PieceUndecided}[p.Holds]
	}
	return p.Status
}

func verdictText(w io.Writer, res *direct.Result) {
	claim := textClaims[res.Claim]
	if res.Region != nil && res.Region.Paving != nil {
		pavingText(w, res)
	} else if res.Region != nil {
		fmt.Fprintf(w, "Region of %s (exact)\n", res.Region.Param)
		var isol []string
		for _, p := range res.Region.Pieces {
			fmt.Fprintf(w, "  %-9s %s %s\n", pieceWord(p), res.Region.Param+" ∈", intervalText(p.Interval))
			isol = rootLines(isol, "  ", p.Interval)
		}
		for _, s := range isol {
			fmt.Fprintln(w, s)
		}
		fmt.Fprintln(w)
	}
	switch res.Verdict {
	case checker.VerdictHolds:
		fmt.Fprintf(w, "Verdict: holds. %s", upper(claim))
		if len(res.Model.FreeParams()) > 0 {
			fmt.Fprint(w, " for every allowed parameter value")
		}
		fmt.Fprintln(w, ".")
	case checker.VerdictOnRegion:
		where := "where the conditions hold"
		if res.Region != nil && res.Region.Paving != nil {
			where = pavingWhere(res)
		} else if res.Region != nil {
			var ivs []string
			for _, iv := range mergeAdjacent(res.Region.Intervals) {
				ivs = append(ivs, intervalText(iv))
			}
			where = fmt.Sprintf("for %s in %s", res.Region.Param, strings.Join(ivs, " ∪ "))
		}
		rest := "the argument fails elsewhere"
		if res.Region != nil && res.Region.Paving == nil {
			rest = elsewhere(res.Region.Pieces)
		}
		fmt.Fprintf(w, "Verdict: holds on part of the range: %s %s, and %s.\n", claim, where, rest)
		if res.Region == nil {
			for _, wt := range res.Witnesses {
				fmt.Fprintf(w, "  conditions %s at %s\n", map[bool]string{true: "hold", false: "fail"}[wt.Holds], paramsText(wt.Params))
			}
		}
	case checker.VerdictFails:
		fmt.Fprintf(w, "Verdict: fails. %s.\n", upper(res.Reason))
	case checker.VerdictUndecided:
		fmt.Fprintf(w, "Verdict: undecided. %s.\n", upper(res.Reason))
	}
	if len(res.Kernel) > 0 || res.Invariance != nil {
		var eqs []string
		f := res.Forms[1]
		for k := range f.LDL.D {
			if f.LDL.Zero[k] {
				continue
			}
			eqs = append(eqs, f.SquareBase(k).String()+" = 0")
		}
		fmt.Fprintf(w, "  %s = 0 exactly where %s (states measured from the equilibrium).\n", dotName(res.Model), strings.Join(eqs, ", "))
		if iv := res.Invariance; iv != nil {
			var gs []string
			for _, v := range iv.States {
				gs = append(gs, v.Poly)
			}
			fmt.Fprintf(w, "  Invariance principle (LaSalle): on a solution that stays there, these and their derivatives\n")
			fmt.Fprintf(w, "  along the flow up to order %d vanish, hence so do %s (exact combinations of them),\n", maxOrder(iv), strings.Join(gs, ", "))
			fmt.Fprintln(w, "  whose only real roots are the equilibrium: no other solution stays where V̇ = 0.")
		} else {
			fmt.Fprintln(w, "  Asymptotic stability would need more (for example the invariance principle).")
		}
	}
}

func isoText(iso *[2]string) string {
	if iso == nil {
		return ""
	}
	return "(" + iso[0] + ", " + iso[1] + ")"
}

func containsStr(xs []string, s string) bool {
	for _, x := range xs {
		if x == s {
			return true
		}
	}
	return false
}

func upper(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

func paramsText(p map[string]string) string {
	keys := make([]string, 0, len(p))
	for k := range p {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	parts := make([]string, len(keys))
	for i, k := range keys {
		parts[i] = k + " = " + p[k]
	}
	return strings.Join(parts, ", ")
}

func refutationText(w io.Writer, res *direct.Result) {
	rf := res.Refutation
	m := res.Model
	pt := make([]string, len(m.States))
	for i, s := range m.States {
		pt[i] = s + " = " + rf.Point[s]
	}
	where := ""
	if len(rf.Params) > 0 {
		where = " with " + paramsText(rf.Params)
	}
	fmt.Fprintf(w, "Refutation (exact)%s: at %s, V = %s and %s = %s.\n", where, strings.Join(pt, ", "), rf.V, dotName(m), rf.Vdot)
}

// pavingText writes the paving for people: box, resolution, the three
// classes with their exact shares, and the product form when there is one.
func pavingText(w io.Writer, res *direct.Result) {
	pv := res.Region.Paving
	s, _ := certificates.Summarize(pv) // verified: well formed
	fmt.Fprintf(w, "Region of (%s) by set inversion (every inside box re-checked exactly)\n", strings.Join(pv.Params, ", "))
	var sides []string
	for i, side := range pv.Box {
		sides = append(sides, pv.Params[i]+" ∈ "+intervalText(side))
	}
	fmt.Fprintf(w, "  box          %s (volume %s)\n", strings.Join(sides, ", "), s.Volume)
	fmt.Fprintf(w, "  resolution   %s of each side\n", pv.Resolution)
	for _, c := range []struct {
		class string
		n     int
		share string
		note  string
	}{
		{"inside", s.Inside, s.InsideFraction, ", merged into " + boxes(len(s.InsideBoxes))},
		{"outside", s.Outside, s.OutsideFraction, ""},
		{"undecided", s.Undecided, s.UndecidedFraction, ""},
	} {
		fmt.Fprintf(w, "  %-12s %s, %s of the box (%s)%s\n", c.class, boxes(c.n), percent(c.share), c.share, c.note)
	}
	if res.Paving != nil && res.Paving.Rejected > 0 {
		fmt.Fprintf(w, "  (%d float proposals were not confirmed by the exact test and were refined)\n", res.Paving.Rejected)
	}
	if len(pv.Product) > 0 {
		fmt.Fprintln(w, "  closed form (each condition involves one parameter):")
		fmt.Fprintf(w, "    %s\n", productText(pv.Product))
		var isol []string
		for _, f := range pv.Product {
			for _, iv := range f.Intervals {
				isol = rootLines(isol, "    ", iv)
			}
		}
		for _, s := range isol {
			fmt.Fprintln(w, s)
		}
	}
	fmt.Fprintln(w)
}

func boxes(n int) string {
	if n == 1 {
		return "1 box"
	}
	return fmt.Sprintf("%d boxes", n)
}

// productText writes a product region as "r ∈ [0, 1) × b ∈ (0, 4]".
func productText(fs []claims.SturmRegion) string {
	var parts []string
	for _, f := range fs {
		var ivs []string
		for _, iv := range f.Intervals {
			ivs = append(ivs, intervalText(iv))
		}
		if len(ivs) == 0 {
			ivs = []string{"∅"}
		}
		parts = append(parts, f.Param+" ∈ "+strings.Join(ivs, " ∪ "))
	}
	return strings.Join(parts, " × ")
}

// pavingWhere says where a paved region holds, for the verdict line.
func pavingWhere(res *direct.Result) string {
	pv := res.Region.Paving
	if len(pv.Product) > 0 {
		return "for " + productText(pv.Product)
	}
	s, _ := certificates.Summarize(pv) // verified: well formed
	return fmt.Sprintf("on the inside boxes of the paving (%s of the box)", percent(s.InsideFraction))
}

// percent writes an exact share as a percentage for people.
func percent(share string) string {
	q, ok := new(big.Rat).SetString(share)
	if !ok {
		return share
	}
	pc := new(big.Rat).Mul(q, big.NewRat(100, 1))
	s := pc.FloatString(2)
	// Never round a share that is not exactly 0 or 100% to look like one.
	switch {
	case s == "100.00" && pc.Cmp(big.NewRat(100, 1)) < 0:
		return ">99.99%"
	case s == "0.00" && pc.Sign() > 0:
		return "<0.01%"
	}
	return s + "%"
}

// VerifyText writes a re-check for a terminal. An invalid certificate is
// named altered when its content no longer matches its digest (it was
// changed after it was written), and every check that disagrees with the
// recomputation is listed; a valid one gets its claim, verdict and digest,
// and, with --trust, who signed it. file is how the certificate is named.
// It returns the first write error.
func VerifyText(w io.Writer, file string, doc *claims.Document, out checker.Outcome, trust Trust) error {
	ew := &errWriter{w: w}
	var failed []checker.Record
	for _, c := range out.Records {
		if !c.OK {
			failed = append(failed, c)
		}
	}
	if !out.Valid {
		if altered, recomputed := Altered(doc); altered {
			fmt.Fprintf(ew, "%s: ALTERED. The file was changed after it was written: its content hashes to %s, not to the digest it states (%s).\n", file, recomputed, doc.Digest)
		} else {
			fmt.Fprintf(ew, "%s: INVALID. The file is as it was written (its digest matches), but its mathematics does not hold.\n", file)
		}
		if len(failed) > 0 {
			fmt.Fprintln(ew, "  Disagrees with the recomputation:")
			for _, c := range failed {
				fmt.Fprintf(ew, "    %s: %s\n", c.Name, c.Reason)
			}
		}
		fmt.Fprintf(ew, "  %d of %d checks failed; the certificate proves nothing.\n", len(failed), len(out.Records))
		return ew.err
	}
	if trust.Required && !trust.Trusted {
		fmt.Fprintf(ew, "%s: the mathematics passed (%d checks, exact arithmetic), but the signer is unknown: %s.\n", file, len(out.Records), trust.Reason)
		fmt.Fprintf(ew, "  claim %s, verdict %s\n  digest %s\n", out.Kind, out.Verdict, doc.Digest)
		fmt.Fprintln(ew, "  Not accepted: --trust requires a signature by one of the given keys.")
		return ew.err
	}
	fmt.Fprintf(ew, "%s: valid. %d checks passed (exact arithmetic).\n", file, len(out.Records))
	fmt.Fprintf(ew, "  claim %s, verdict %s\n  digest %s\n", out.Kind, out.Verdict, doc.Digest)
	if out.Basin != "" {
		if len(certificates.ClaimsOf[*claims.SublevelSProcedure](doc)) > 0 {
			fmt.Fprintf(ew, "  region of attraction: all of {V ≤ %s} (S-procedure)\n", out.Basin)
		} else {
			fmt.Fprintf(ew, "  region of attraction: the component of {V ≤ %s} around the equilibrium\n", out.Basin)
		}
		if box := freeRanges(doc); box != "" {
			fmt.Fprintf(ew, "    for %s: %s\n", forEvery, box)
		}
	}
	for _, ns := range certificates.ContentsOf(doc).NotSOS { // each verified: out.Valid
		who := "V"
		if ns.Of != "V" {
			who = "−V̇"
		}
		fmt.Fprintf(ew, "  also proven: %s is no sum of squares in the basis (%s): a moment functional with L(%s) = %s < 0 (this changes no verdict)\n",
			who, strings.Join(ns.Basis, ", "), who, ns.Value)
	}
	switch {
	case trust.Required:
		fmt.Fprintf(ew, "  signed by the trusted key %s\n", trust.Signer)
	case trust.Signer != "":
		fmt.Fprintf(ew, "  signed by key %s (signature valid; use --trust KEY.pub.pem to require a trusted signer)\n", trust.Signer)
	default:
		fmt.Fprintln(ew, "  not signed")
	}
	return ew.err
}

// Trust is what verify --trust found besides the mathematics: whether
// trusted keys were required and one of them signed, the fingerprint of
// the signing key ("" when unsigned) and why the signer is not trusted.
type Trust struct {
	Required bool
	Trusted  bool
	Signer   string
	Reason   string
}

// Altered reports whether doc's content no longer hashes to the digest it
// states, with the digest it does hash to. A certificate that cannot be
// serialized counts as altered.
func Altered(doc *claims.Document) (bool, string) {
	d, err := doc.ComputeDigest()
	if err != nil {
		return true, "nothing (it cannot be serialized: " + err.Error() + ")"
	}
	return d != doc.Digest, d
}

// ErrorText writes err for people on standard error: one line per error of
// a poly.ErrorList, each with its file:line:col; any other error once,
// after "lyacert: " unless it begins with its position.
func ErrorText(w io.Writer, err error) error {
	ew := &errWriter{w: w}
	for i, it := range errorItems(err) {
		switch {
		case it.Position != nil:
			fmt.Fprintf(ew, "%s: %s\n", *it.Position, it.Message)
		case i > 0: // the count that closes a list ("and K more errors")
			fmt.Fprintf(ew, "%s\n", it.Message)
		default:
			fmt.Fprintf(ew, "lyacert: %s\n", it.Message)
		}
	}
	return ew.err
}

// MergeText writes what lyacert merge did for a terminal.
func MergeText(w io.Writer, s MergeSummary) error {
	ew := &errWriter{w: w}
	out := "standard output"
	if s.Output != nil {
		out = *s.Output
	}
	fmt.Fprintf(ew, "Merged %d grid points from %d files into %s\n", s.GridPoints, len(s.Files), out)
	if s.Plot != nil {
		fmt.Fprintf(ew, "  plot in %s\n", *s.Plot)
	}
	return ew.err
}

// KeyText writes what lyacert key new wrote for a terminal.
func KeyText(w io.Writer, k KeyOutput) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "wrote the private key %s (keep it secret) and the public key %s\n  fingerprint %s\n", k.PrivateKey, k.PublicKey, k.Fingerprint)
	return ew.err
}

// SignText writes what lyacert sign did for a terminal.
func SignText(w io.Writer, s SignOutput) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "signed %s with key %s\n  digest %s\n", s.Output, s.Fingerprint, s.Digest)
	return ew.err
}

// freeRanges writes the certificate's free parameters with their ranges
// ("a in [1, 2], b in [0, 1]"), "" when every parameter is fixed.
func freeRanges(doc *claims.Document) string {
	var parts []string
	for _, p := range doc.Parameters {
		if !strings.HasPrefix(p.Range, "=") {
			parts = append(parts, p.Name+" "+p.Range)
		}
	}
	return strings.Join(parts, ", ")
}

// BoxSOSText prints what check --box-sos found.
func BoxSOSText(w io.Writer, b *BoxSOSOutput, written string) error {
	ew := &errWriter{w: w}
	fmt.Fprintln(ew, "\nOne certificate for the whole parameter box (sums of squares with multipliers)")
	if !b.Holds {
		fmt.Fprintf(ew, "  none found: %s\n", b.Reason)
		return ew.err
	}
	fmt.Fprintf(ew, "  −V̇ − margin = σ₀ + Σ σᵢ·(pᵢ − loᵢ)(hiᵢ − pᵢ) with every σ a sum of squares: V̇ < 0 away from\n")
	fmt.Fprintf(ew, "  the equilibrium for every parameter value in the box, so %s there.\n", textClaims[b.Claim])
	fmt.Fprintf(ew, "  Re-checked by the exact checker: %d checks passed", b.Checks)
	if written != "" {
		fmt.Fprintf(ew, "; this certificate (not the one above) written to %s", written)
	}
	fmt.Fprintf(ew, "\n  digest %s\n", b.Digest)
	return ew.err
}
