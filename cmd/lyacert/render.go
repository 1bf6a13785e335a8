package main

import (
	"fmt"
	"io"
	"math/big"
	"sort"
	"strings"

	"lyacert/certify/direct"
	"lyacert/checker"
	"lyacert/model"
	"lyacert/poly"
)

// caution is printed under every verdict.
const caution = `Caution: this certificate proves a property of the model above under its
stated assumptions, not of the physical system. Modelling error, unmodelled
dynamics, saturation, delay and sampling can void it. Defer to the applicable
standards and to licensed engineering judgement.`

func dotName(m *model.Model) string {
	if m.Discrete {
		return "ΔV"
	}
	return "V̇"
}

func renderCheck(w io.Writer, res *direct.Result, written string) {
	m := res.Model
	dv := dotName(m)
	for _, d := range m.Description {
		if d != "" {
			fmt.Fprintf(w, "# %s\n", d)
		}
	}
	if len(m.Description) > 0 {
		fmt.Fprintln(w)
	}
	fmt.Fprintf(w, "Model %s\n", m.File)
	fmt.Fprintf(w, "  states       %s\n", strings.Join(m.States, ", "))
	for _, p := range m.Params {
		t := model.RangeText(p)
		if t == "" {
			t = "(any real value)"
		}
		fmt.Fprintf(w, "  parameter    %s %s\n", p.Name, t)
	}
	for i, s := range m.States {
		if m.Discrete {
			fmt.Fprintf(w, "  %s+ = %s\n", s, m.F[i])
		} else {
			fmt.Fprintf(w, "  %s' = %s\n", s, m.F[i])
		}
	}
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
				fmt.Fprintf(w, "  %s as a whole is zᵀGz in the monomial basis z = (%s)\n", who, strings.Join(zs, ", "))
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
			fmt.Fprintf(w, "  %s = %s\n", lhs, squares(f))
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
		renderConditions(w, res)
	}
	renderVerdict(w, res)
	if res.Refutation != nil {
		renderRefutation(w, res)
	}
	for _, n := range res.Notes {
		fmt.Fprintf(w, "Note: %s.\n", n)
	}
	fmt.Fprintf(w, "\nCertificate re-checked by the exact checker: %d checks passed", len(res.Check.Records))
	if written != "" {
		fmt.Fprintf(w, "; written to %s", written)
	}
	fmt.Fprintf(w, "\n  digest %s\n\n%s\n", res.Doc.Digest, caution)
}

// squares writes Σ dₖ·(xₖ + Σᵢ>ₖ Lᵢₖ xᵢ)² as a person would.
func squares(f direct.Form) string {
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

func renderConditions(w io.Writer, res *direct.Result) {
	dv := dotName(res.Model)
	fmt.Fprintln(w, "Conditions")
	any := false
	for _, c := range res.Conds {
		form := "V"
		if c.Form != "V" {
			form = "−" + dv
		}
		var discharged []string
		for _, f := range c.Factors {
			switch f.Status {
			case checker.StatusPositive:
				discharged = append(discharged, factorText(f)+" > 0 by assumption")
			case checker.StatusNegative:
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
		any = true
		note := ""
		if len(discharged) > 0 {
			note = " (" + strings.Join(discharged, "; ") + ")"
		}
		fmt.Fprintf(w, "  %s Δ%d > 0 requires %s%s\n", form, c.Index, cond, note)
	}
	if !any {
		fmt.Fprintln(w, "  every condition holds for every allowed parameter value")
	}
	fmt.Fprintln(w)
}

func factorText(f direct.FactorStatus) string {
	s := f.P.String()
	if f.Power > 1 {
		if f.P.NumTerms() > 1 {
			s = "(" + s + ")"
		}
		s = fmt.Sprintf("%s^%d", s, f.Power)
	}
	return s
}

// conditionText renders q > 0 readably: "r < 1" for a linear condition in
// one parameter; "" when q is a positive constant.
func conditionText(q *poly.Poly) string {
	if q.IsConst() {
		if q.ConstTerm().Sign() > 0 {
			return ""
		}
		return "false (" + q.String() + " > 0 never holds)"
	}
	vars := q.VarsUsed()
	if len(vars) == 1 && q.Degree() == 1 {
		u, _ := q.Univariate(vars[0])
		a, b := u.Coeffs()[1], u.Coeffs()[0]
		x := new(big.Rat).Neg(b)
		x.Quo(x, a)
		op := ">"
		if a.Sign() < 0 {
			op = "<"
		}
		return fmt.Sprintf("%s %s %s", q.Ring().Name(vars[0]), op, x.RatString())
	}
	return q.String() + " > 0"
}

func intervalText(iv checker.Interval) string {
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

func renderVerdict(w io.Writer, res *direct.Result) {
	claim := map[string]string{
		checker.KindGlobal: "the equilibrium is globally asymptotically stable",
		checker.KindLocal:  "the equilibrium is locally asymptotically stable",
		checker.KindStable: "the equilibrium is stable (Lyapunov); V̇ ≤ 0 but not < 0",
	}[res.Claim]
	if res.Region != nil && res.Region.Paving != nil {
		renderPaving(w, res)
	} else if res.Region != nil {
		fmt.Fprintf(w, "Region of %s (exact)\n", res.Region.Param)
		var isol []string
		for _, p := range res.Region.Pieces {
			state := "fails"
			if p.Holds {
				state = "holds"
			}
			fmt.Fprintf(w, "  %-8s %s %s\n", state, res.Region.Param+" ∈", intervalText(p.Interval))
			for _, e := range [][3]string{{p.Lo, p.LoPoly, isoText(p.LoIsolating)}, {p.Hi, p.HiPoly, isoText(p.HiIsolating)}} {
				if e[1] != "" {
					s := fmt.Sprintf("  %s is the root of %s in %s", e[0], e[1], e[2])
					if !containsStr(isol, s) {
						isol = append(isol, s)
					}
				}
			}
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
			for _, iv := range res.Region.Intervals {
				ivs = append(ivs, intervalText(iv))
			}
			where = fmt.Sprintf("for %s in %s", res.Region.Param, strings.Join(ivs, " ∪ "))
		}
		fmt.Fprintf(w, "Verdict: holds on part of the range: %s %s, and the argument fails elsewhere.\n", claim, where)
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
	if len(res.Kernel) > 0 {
		var eqs []string
		f := res.Forms[1]
		for k := range f.LDL.D {
			if f.LDL.Zero[k] {
				continue
			}
			eqs = append(eqs, f.SquareBase(k).String()+" = 0")
		}
		fmt.Fprintf(w, "  %s = 0 exactly where %s (states measured from the equilibrium).\n", dotName(res.Model), strings.Join(eqs, ", "))
		fmt.Fprintln(w, "  Asymptotic stability would need more (for example the invariance principle).")
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

func renderRefutation(w io.Writer, res *direct.Result) {
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

func renderVerify(w io.Writer, name string, doc *checker.Document, res checker.Outcome) {
	failed := 0
	for _, c := range res.Records {
		if !c.OK {
			failed++
			fmt.Fprintf(w, "FAIL  %-12s %s\n", c.Name, c.Reason)
		}
	}
	if res.Valid {
		fmt.Fprintf(w, "%s: valid. %d checks passed (exact arithmetic).\n", name, len(res.Records))
		fmt.Fprintf(w, "  claim %s, verdict %s\n  digest %s\n", res.Kind, res.Verdict, doc.Digest)
		return
	}
	fmt.Fprintf(w, "%s: INVALID. %d of %d checks failed; the certificate proves nothing.\n", name, failed, len(res.Records))
}
