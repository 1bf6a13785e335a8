package direct

import (
	"context"
	"fmt"
	"maps"
	"math/big"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/pave"
	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Version is the tool version written into checker.

// Form is one quadratic form of the argument with its factorization.
type Form struct {
	Name string // "V" or "-Vdot"
	// Basis is nil for the quadratic part (z = the states), else the
	// monomials z of a Gram matrix of the whole function: V or −V̇ = zᵀGz.
	Basis  []*poly.Poly
	Gram   poly.Matrix
	LDL    LDL
	Minors []poly.RatFunc
	// Margin, when not nil, is Σ εᵢ·xᵢ^(2kᵢ): the Gram matrix is that of
	// the whole function less the margin, and only ⪰ 0 (margin-gram-ldl).
	Margin *poly.Poly
	// Triangular, when not nil, orders the states so that the square bases
	// of a semidefinite Gram form in a monomial basis solve for them in
	// turn (triangular-squares): the form is definite after all.
	Triangular []string
}

// SquareBase returns the k-th base of the completed squares of the form
// (poly.SquareBase), z its basis or the states.
func (f Form) SquareBase(k int) poly.RatFunc {
	var z []poly.RatFunc
	for _, b := range f.Basis {
		z = append(z, poly.FromPoly(b))
	}
	if z == nil {
		z = poly.StateBasis(f.Gram[0][0].Ring(), len(f.LDL.D))
	}
	return poly.SquareBase(f.LDL.L, z, k)
}

// Condition is what one minor requires, after the assumptions have
// discharged the factors whose sign they fix.
type Condition struct {
	Form     string
	Index    int
	Minor    poly.RatFunc
	Constant *big.Rat
	Factors  []SignedFactor
	Q        *poly.Poly // Q > 0 is what remains
}

// SignedFactor is a factor with what the assumptions say of its sign.
type SignedFactor struct {
	PowerFactor
	Status string
}

// Region is where the conditions hold: the exact pieces of one parameter's
// range, or a paving of several parameters' box (with its product form).
type Region struct {
	Param     string
	Intervals []claims.Interval
	Pieces    []claims.Piece
	Paving    *claims.Paving
}

// Result is the outcome of Check: the derivation, the verdict, and the
// certificate document that backs it (already re-checked by
// checker.Verify).
type Result struct {
	Model   *model.Model
	V       poly.RatFunc
	Vdot    poly.RatFunc
	Shifted struct{ V, Vdot poly.RatFunc } // in coordinates centred at the equilibrium
	HigherV poly.RatFunc                   // the terms of V of degree > 2 at the equilibrium
	HigherD poly.RatFunc                   // the same for V̇
	Forms   []Form
	Conds   []Condition
	Claim   string
	Verdict string
	// Reason explains the verdict in one sentence for people.
	Reason string
	// Notes are further remarks for people (no claims).
	Notes      []string
	Region     *Region
	Witnesses  []claims.Witness
	Refutation *claims.Refutation
	Kernel     [][]poly.RatFunc
	Invariance *claims.Invariance   // the invariance principle's identities, when found
	Points     []*claims.PointCheck // rational point pieces proven by the model with the parameter fixed there
	// AlgebraicPoints are irrational point pieces proven by margin Gram
	// forms whose pivots are ≥ 0 at the root.
	AlgebraicPoints []*claims.AlgebraicPoint
	Doc             *claims.Document
	Check           checker.Outcome
	// Paving is the engine's paving of a region in several parameters
	// (Region.Paving is its exact record in the certificate); nil when
	// none was made.
	Paving *pave.Result
	// PavingNote says why no paving was made where one was wanted.
	PavingNote string
	// Methods say how each form was proven, with the sizes of the work.
	Methods []Method
	// SDP is the last semidefinite program solved in a sum-of-squares
	// search, nil when none was.
	SDP *sdp.Problem
	// NotSOS are exact proofs that V or −V̇ is no sum of squares in the
	// monomial basis of the search (moment-separation claims): reported,
	// they change no verdict.
	NotSOS []claims.NotSOS
}

// Check analyses the model's candidate V: it computes V̇ exactly, completes
// the squares of the quadratic parts of V and −V̇ at the equilibrium by exact
// LDLᵀ, reduces Sylvester's conditions by the assumptions, decides where in
// parameter space they hold (exactly for one parameter; by a paving of the
// parameters' box for several, see CheckPaving, with the default
// PaveOptions), looks for an exact refutation where they fail,
// and writes a certificate that checker.Verify re-checks before Check
// returns. An error is returned for input the argument cannot apply to.
func Check(m *model.Model, source string) (*Result, error) {
	return CheckPaving(context.Background(), m, source, PaveOptions{})
}

func runCheck(ctx context.Context, m *model.Model, source string, opts PaveOptions) (*Result, error) {
	if m.V == nil {
		return nil, &poly.Error{Pos: poly.Pos{File: m.File, Line: 1, Col: 1}, Msg: "the model has no candidate V (add a line \"V = ...\")"}
	}
	if err := m.CheckEquilibrium(); err != nil {
		return nil, err
	}
	res := &Result{Model: m, V: *m.V}
	r := m.Ring
	states := r.StateMask()
	res.Vdot = m.Derivative(res.V)
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	vs, ds := m.Shift(res.V), m.Shift(res.Vdot)
	res.Shifted.V, res.Shifted.Vdot = vs, ds
	if c := vs.Homogeneous(0, states); !c.IsZero() {
		return nil, &poly.Error{Pos: m.VPos, Msg: fmt.Sprintf("V does not vanish at the equilibrium: V there is %s; a Lyapunov function is 0 at the equilibrium (subtract the constant)", c)}
	}
	vq, dq := vs.Homogeneous(2, states), ds.Homogeneous(2, states)
	res.HigherV = vs.Sub(vq).Sub(vs.Homogeneous(1, states))
	res.HigherD = ds.Sub(dq).Sub(ds.Homogeneous(1, states))

	if lin := vs.Homogeneous(1, states); !lin.IsZero() {
		res.Claim, res.Verdict = checker.KindNone, checker.VerdictFails
		res.Reason = "V has a linear part at the equilibrium, so the equilibrium is not a minimum of V"
		res.Refutation = refuteLinear(m, vs, lin)
		if res.Refutation == nil {
			res.Verdict = checker.VerdictUndecided
		}
		return finish(ctx, res, source)
	}
	n := len(m.States)
	for _, f := range []struct {
		name string
		q    poly.RatFunc
	}{{"V", vq}, {"-Vdot", dq.Neg()}} {
		g := poly.GramMatrix(f.q, n)
		var l LDL
		if ok, col := l.Factorize(g); !ok {
			// A zero pivot with a non-zero column: indefinite wherever
			// that entry is non-zero.
			res.Forms = nil
			res.Claim, res.Verdict = checker.KindNone, checker.VerdictFails
			res.Reason = fmt.Sprintf("the quadratic part of %s has a zero diagonal entry with a non-zero coupling (state %s), so it is indefinite", formWord(f.name), m.States[col])
			res.Refutation = refuteAnywhere(m, res)
			if res.Refutation == nil {
				res.Verdict = checker.VerdictUndecided
			}
			return finish(ctx, res, source)
		}
		res.Forms = append(res.Forms, Form{Name: f.name, Gram: g, LDL: l, Minors: l.Minors()})
	}
	fv, fd := res.Forms[0], res.Forms[1]
	switch {
	case fv.LDL.Semidefinite():
		res.Claim = checker.KindNone
		res.Verdict = checker.VerdictUndecided
		res.Reason = "the quadratic part of V is singular, so the quadratic test cannot show V positive definite"
	case fd.LDL.Semidefinite() && !res.HigherD.IsZero():
		res.Claim = checker.KindNone
		res.Verdict = checker.VerdictUndecided
		res.Reason = "the quadratic part of V̇ is singular and V̇ has higher-order terms, so the quadratic test is inconclusive"
	case fd.LDL.Semidefinite() && !semidefDefined(m, fd.LDL):
		res.Claim = checker.KindNone
		res.Verdict = checker.VerdictUndecided
		res.Reason = "the semidefinite factorization of −V̇ is not defined for every allowed parameter value"
	case fd.LDL.Semidefinite():
		res.Claim = checker.KindStable
	case res.HigherV.IsZero() && res.HigherD.IsZero():
		res.Claim = checker.KindGlobal
	default:
		res.Claim = checker.KindLocal
	}
	if res.Verdict == "" {
		res.conditions()
		if err := res.decide(ctx, opts); err != nil {
			return nil, err
		}
	} else {
		res.conditions()
	}
	if res.Claim == checker.KindStable && (res.Verdict == checker.VerdictHolds || res.Verdict == checker.VerdictOnRegion) {
		res.Kernel = fd.LDL.Kernel()
		// The invariance principle: V̇ ≤ 0 everywhere (exactly quadratic),
		// and no solution but the equilibrium stays where V̇ = 0.
		if res.Invariance = res.invariance(); res.Invariance != nil {
			res.Claim = checker.KindLocal
			if res.HigherV.IsZero() {
				res.Claim = checker.KindGlobal
			}
		}
	}
	// A region refuted piece by piece needs no point besides.
	if (res.Verdict == checker.VerdictFails || res.Verdict == checker.VerdictOnRegion) && !res.Region.refuted() {
		res.Refutation = refuteAnywhere(m, res)
		if res.Verdict == checker.VerdictFails && res.Refutation == nil && !res.Region.refuted() {
			res.Verdict = checker.VerdictUndecided
			res.Reason += "; no exact refutation point was found"
			res.Region = nil
		}
	}
	if res.Verdict == checker.VerdictFails || res.Verdict == checker.VerdictUndecided {
		res.Claim = checker.KindNone
	}
	if up := res.tryBasis(ctx, opts); up != nil {
		quad := "local asymptotic stability"
		if res.Verdict != checker.VerdictHolds {
			quad = "nothing"
		}
		how := "the Gram matrices of the whole functions in monomial bases give the global claim"
		switch {
		case up.Invariance != nil && up.Forms[1].Basis == nil:
			how = "the Gram matrix of V as a whole makes it radially unbounded, and the invariance principle gives global asymptotic stability"
		case up.Invariance != nil:
			how = "the Gram matrix of −V̇ as a whole shows V̇ ≤ 0 everywhere, and the invariance principle gives the asymptotic claim"
		case up.Claim == checker.KindStable:
			how = "the Gram matrix of −V̇ as a whole shows V̇ ≤ 0 everywhere: stability"
		}
		up.Notes = append(up.Notes, "the quadratic parts alone give "+quad+"; "+how)
		res = up
	}
	return finish(ctx, res, source)
}

// checkPoints settles the undecided rational point pieces of a region (a
// form only semidefinite there) by checking the model with the parameter
// fixed at that value: the whole functions' Gram matrices, the invariance
// principle. A piece holds when that check proves at least the claim of
// the rest of the region; its certificate's claims go into this one.
func (res *Result) checkPoints(name string, pieces []claims.Piece) {
	if res.Claim != checker.KindGlobal && res.Claim != checker.KindLocal && res.Claim != checker.KindStable {
		return
	}
	rank := func(k string) int {
		return slices.Index([]string{checker.KindStable, checker.KindLocal, checker.KindGlobal}, k)
	}
	weakest, byConds := "", slices.ContainsFunc(pieces, func(pc claims.Piece) bool { return pc.Holds })
	defer func() {
		if weakest != "" && (!byConds || rank(weakest) < rank(res.Claim)) {
			res.Claim = weakest
		}
	}()
	for i, pc := range pieces {
		v, isRat := new(big.Rat).SetString(pc.Lo)
		if pc.Status != claims.PieceUndecided || pc.Lo != pc.Hi || !pc.LoClosed || !pc.HiClosed {
			continue
		}
		if pc.LoPoly != "" {
			k, _ := res.Model.Ring.Index(name)
			if ap := res.algebraicPoint(k, pc); ap != nil {
				if weakest == "" {
					weakest = checker.KindGlobal
				}
				pieces[i].Holds, pieces[i].Status = true, claims.PieceHolds
				res.AlgebraicPoints = append(res.AlgebraicPoints, ap)
				res.Notes = append(res.Notes, fmt.Sprintf("at %s = %s (the root of %s in (%s, %s)), where a quadratic part is only semidefinite, Gram matrices of the whole functions less margins, with pivots ≥ 0 there (exact signs at the root, Sturm), prove global asymptotic stability; the region is closed there", name, pc.Lo, pc.LoPoly, pc.LoIsolating[0], pc.LoIsolating[1]))
			}
			continue
		}
		if !isRat {
			continue
		}
		fixed, err := model.FixParams(res.Model, []model.Setting{{Name: name, Value: v}})
		if err != nil {
			continue
		}
		sub, err := Check(fixed, name+"="+pc.Lo)
		if err != nil || sub.Verdict != checker.VerdictHolds || rank(sub.Claim) < rank(res.Claim) {
			continue
		}
		if weakest == "" || rank(sub.Claim) < rank(weakest) {
			weakest = sub.Claim
		}
		pieces[i].Holds, pieces[i].Status = true, claims.PieceHolds
		// The enclosing certificate says when it was issued.
		doc := sub.Doc
		doc.Issued = ""
		if certificates.Seal(doc) != nil {
			continue
		}
		res.Points = append(res.Points, &claims.PointCheck{Params: map[string]string{name: pc.Lo}, Certificate: doc})
		res.Notes = append(res.Notes, fmt.Sprintf("at %s = %s, where the quadratic test is inconclusive, the model with %s fixed proves the claim (%s); its certificate is part of this one", name, pc.Lo, name, pointHow(sub)))
	}
}

// pointHow says in words how a point's check proved its claim.
func pointHow(sub *Result) string {
	how := sub.Claim
	switch {
	case sub.Invariance != nil:
		how += ", by the invariance principle"
	case slices.ContainsFunc(sub.Forms, func(f Form) bool { return f.Basis != nil }):
		how += ", by Gram matrices of the whole functions"
	}
	return how
}

// refuted reports a one-parameter region every piece of which is refuted.
func (rg *Region) refuted() bool {
	if rg == nil || rg.Paving != nil || len(rg.Pieces) == 0 {
		return false
	}
	for _, pc := range rg.Pieces {
		if pc.Status != claims.PieceFails {
			return false
		}
	}
	return true
}

func formWord(name string) string {
	if name == "V" {
		return "V"
	}
	return "−V̇"
}

// semidefDefined reports that every entry of the semidefinite factors has a
// denominator the assumptions keep away from zero.
func semidefDefined(m *model.Model, l LDL) bool {
	box := m.Box()
	ok := func(f poly.RatFunc) bool {
		for _, d := range f.Den {
			if d.P.Enclose(box).ContainsZero() {
				return false
			}
		}
		return true
	}
	for i := range l.D {
		if !ok(l.D[i]) {
			return false
		}
		for j := range l.L {
			if !ok(l.L[j][i]) {
				return false
			}
		}
	}
	return true
}

// conditions factors every minor and discharges the factors whose sign the
// assumptions fix.
func (res *Result) conditions() {
	box := res.Model.Box()
	r := res.Model.Ring
	for _, f := range res.Forms {
		for k, mi := range f.Minors {
			target := new(poly.Poly).Mul(mi.Num, mi.DenPoly())
			c, factors := Factorize(target)
			cond := Condition{Form: f.Name, Index: k + 1, Minor: mi, Constant: c}
			q := poly.ConstInt(r, 1)
			sign := c.Sign()
			for _, fa := range factors {
				st := checker.FactorStatus(fa.P, fa.Power, box)
				cond.Factors = append(cond.Factors, SignedFactor{fa, st})
				switch st {
				case claims.StatusNegative:
					sign = -sign
				case claims.StatusCondition:
					q.Mul(q, new(poly.Poly).Pow(fa.P, fa.Power))
				}
			}
			if sign < 0 {
				q.Neg(q)
			}
			if c.Sign() == 0 {
				q = poly.Zero(r)
			}
			cond.Q = q
			res.Conds = append(res.Conds, cond)
		}
	}
}

// decide sets the verdict from the conditions: discharged, a region in one
// parameter, or witnesses in several.
func (res *Result) decide(ctx context.Context, opts PaveOptions) error {
	m := res.Model
	r := m.Ring
	used := map[int]bool{}
	allPos, someNonPos := true, false
	for _, c := range res.Conds {
		for _, v := range c.Q.VarsUsed() {
			used[v] = true
		}
		if c.Q.IsConst() {
			if c.Q.ConstTerm().Sign() <= 0 {
				someNonPos = true
			}
		} else {
			allPos = false
		}
	}
	vars := slices.Sorted(maps.Keys(used))
	free := m.FreeParams()
	switch {
	case someNonPos:
		res.Verdict = checker.VerdictFails
		res.Reason = "a condition fails for every allowed parameter value"
		if len(free) == 1 {
			res.regionFor(free[0].Name)
		}
	case allPos && len(free) == 1:
		res.regionFor(free[0].Name)
	case allPos:
		res.Verdict = checker.VerdictHolds
		if len(free) > 0 {
			res.Reason = "every condition is discharged by the assumptions"
		}
	case res.wantsPaving(vars, opts):
		return res.paveRegion(ctx, vars, opts)
	case len(vars) == 1:
		res.regionFor(r.Name(vars[0]))
	default:
		res.witnesses(vars)
	}
	return nil
}

func (res *Result) regionFor(name string) {
	m := res.Model
	i, _ := m.Ring.Index(name)
	p, _ := m.Param(name)
	var conds []poly.Univariate
	for _, c := range res.Conds {
		u, _ := c.Q.Univariate(i)
		conds = append(conds, u)
	}
	pieces := OneParamRegion(m.Ring, i, conds, p.Range)
	refuteOn(pieces, res.Forms, i)
	res.checkPoints(name, pieces)
	res.Region = &Region{Param: name, Intervals: Intervals(pieces), Pieces: pieces}
	holds, fails, refuted := false, false, true
	for _, pc := range pieces {
		holds = holds || pc.Holds
		fails = fails || !pc.Holds
		refuted = refuted && pc.Status == claims.PieceFails
	}
	for _, pc := range pieces {
		if pc.Status == claims.PieceUndecided && pc.Lo == pc.Hi && pc.LoPoly == "" && pc.LoClosed && pc.HiClosed {
			res.Notes = append(res.Notes, fmt.Sprintf("at %s = %s a condition is exactly zero: a form is only semidefinite there and the quadratic test is inconclusive; run with --set %s=%s for the tests of the whole functions", name, pc.Lo, name, pc.Lo))
		}
	}
	switch {
	case !fails:
		res.Verdict = checker.VerdictHolds
		res.Reason = fmt.Sprintf("the conditions hold for every allowed %s", name)
	case refuted:
		res.Verdict = checker.VerdictFails
		res.Reason = fmt.Sprintf("a quadratic part has a negative direction for every allowed %s", name)
	case !holds:
		res.Verdict = checker.VerdictUndecided
		res.Reason = fmt.Sprintf("the conditions fail for every allowed %s, but not every piece is refuted", name)
	default:
		res.Verdict = checker.VerdictOnRegion
		res.Reason = fmt.Sprintf("the conditions hold only on part of the range of %s", name)
	}
}

// samples returns a few rational values in a parameter's range.
func samples(iv poly.Interval) []*big.Rat {
	var cand []*big.Rat
	switch {
	case iv.Lo.Inf == 0 && iv.Hi.Inf == 0:
		w := new(big.Rat).Sub(iv.Hi.Value, iv.Lo.Value)
		for k := int64(0); k <= 8; k++ {
			x := new(big.Rat).Mul(w, big.NewRat(k, 8))
			cand = append(cand, x.Add(x, iv.Lo.Value))
		}
	default:
		base := new(big.Rat)
		if iv.Lo.Inf == 0 {
			base = iv.Lo.Value
		} else if iv.Hi.Inf == 0 {
			base = iv.Hi.Value
		}
		for _, d := range []int64{0, 1, 2, 4, 8, 16, 64} {
			for _, frac := range []*big.Rat{big.NewRat(d, 1), big.NewRat(1, 4)} {
				x := new(big.Rat).Set(base)
				if iv.Lo.Inf == 0 {
					x.Add(x, frac)
				} else if iv.Hi.Inf == 0 {
					x.Sub(x, frac)
				} else {
					cand = append(cand, new(big.Rat).Neg(frac))
					x.Add(x, frac)
				}
				cand = append(cand, x)
			}
		}
	}
	var out []*big.Rat
	for _, x := range cand {
		if iv.Contains(x) && !slices.ContainsFunc(out, func(y *big.Rat) bool { return y.Cmp(x) == 0 }) {
			out = append(out, x)
		}
	}
	return out
}

// witnesses looks for parameter points where the conditions hold and fail
// (several parameters; the exact region is left as the conditions).
func (res *Result) witnesses(vars []int) {
	m := res.Model
	r := m.Ring
	free := m.FreeParams()
	base := map[string]*big.Rat{}
	grids := make([][]*big.Rat, len(free))
	for i, p := range free {
		grids[i] = samples(p.Range)
		base[p.Name] = grids[i][len(grids[i])/2]
	}
	var hold, fail *claims.Witness
	failStrict := false
	idx := make([]int, len(free))
	for count := 0; count < 4096; count++ {
		point := make([]*big.Rat, r.NumVars())
		for i := range point {
			point[i] = new(big.Rat)
		}
		vals := map[string]string{}
		for i, p := range free {
			j, _ := r.Index(p.Name)
			point[j] = grids[i][idx[i]]
			if slices.Contains(vars, j) {
				vals[p.Name] = point[j].RatString()
			}
		}
		all, strict := true, false
		values := []string{}
		for _, c := range res.Conds {
			x := c.Q.Eval(point)
			values = append(values, x.RatString())
			if x.Sign() <= 0 {
				all = false
			}
			strict = strict || x.Sign() < 0
		}
		w := &claims.Witness{Params: vals, Values: values, Holds: all}
		if all && hold == nil {
			hold = w
		}
		// Prefer a point where a condition is strictly negative: the
		// refutation found there is strict too.
		if !all && (fail == nil || (!failStrict && strict)) {
			fail, failStrict = w, strict
		}
		if hold != nil && fail != nil && failStrict {
			break
		}
		// next grid point (odometer)
		k := 0
		for k < len(idx) {
			idx[k]++
			if idx[k] < len(grids[k]) {
				break
			}
			idx[k] = 0
			k++
		}
		if k == len(idx) {
			break
		}
	}
	for _, w := range []*claims.Witness{hold, fail} {
		if w != nil {
			res.Witnesses = append(res.Witnesses, *w)
		}
	}
	names := make([]string, len(vars))
	for i, v := range vars {
		names[i] = r.Name(v)
	}
	if hold != nil && fail != nil {
		res.Verdict = checker.VerdictOnRegion
		res.Reason = fmt.Sprintf("the conditions in %s hold at some parameter values and fail at others", strings.Join(names, ", "))
		return
	}
	res.Verdict = checker.VerdictUndecided
	res.Reason = fmt.Sprintf("the conditions involve several parameters (%s); they are exact, but no region is computed here", strings.Join(names, ", "))
}

// failingParams returns a parameter point where some condition fails.
func failingParams(res *Result) (map[string]string, []*big.Rat, bool) {
	m := res.Model
	r := m.Ring
	point := make([]*big.Rat, r.NumVars())
	for i := range point {
		point[i] = new(big.Rat)
	}
	vals := map[string]string{}
	free := m.FreeParams()
	for _, p := range free {
		s := samples(p.Range)
		x := s[len(s)/2]
		j, _ := r.Index(p.Name)
		point[j] = x
		vals[p.Name] = x.RatString()
	}
	switch {
	case res.Region != nil && res.Region.Paving == nil:
		// Prefer the inside of a failing interval (where the failure is
		// strict) to a failing boundary point.
		j, _ := r.Index(res.Region.Param)
		var x *big.Rat
		for _, pc := range res.Region.Pieces {
			isPoint := pc.Lo == pc.Hi && pc.LoPoly == pc.HiPoly && pc.LoClosed && pc.HiClosed
			switch {
			case pc.Holds:
			case !isPoint:
				x = samplePoint(pc.Interval)
			case x == nil && pc.LoPoly == "":
				x, _ = new(big.Rat).SetString(pc.Lo)
				continue
			default:
				continue
			}
			if x != nil && !isPoint && !pc.Holds {
				break
			}
		}
		if x == nil {
			return nil, nil, false
		}
		point[j] = x
		vals[res.Region.Param] = x.RatString()
		return vals, point, true
	case len(res.Witnesses) > 0:
		for _, w := range res.Witnesses {
			if w.Holds {
				continue
			}
			for name, s := range w.Params {
				j, _ := r.Index(name)
				point[j], _ = new(big.Rat).SetString(s)
				vals[name] = s
			}
			return vals, point, true
		}
		return nil, nil, false
	}
	return vals, point, true
}

// refuteAnywhere looks for a state point where V ≤ 0 or V̇ ≥ 0 (other than
// the equilibrium) at parameter values where the conditions fail.
func refuteAnywhere(m *model.Model, res *Result) *claims.Refutation {
	vals, point, ok := failingParams(res)
	if !ok {
		return nil
	}
	r := m.Ring
	n := len(m.States)
	pv := map[int]*big.Rat{}
	for i := n; i < r.NumVars(); i++ {
		pv[i] = point[i]
	}
	fs := []struct {
		f    poly.RatFunc
		sign int // the quadratic form is sign·f
	}{{res.Shifted.V, 1}, {res.Shifted.Vdot, -1}}
	states := r.StateMask()
	for _, f := range fs {
		q := f.f.Homogeneous(2, states)
		if f.sign < 0 {
			q = q.Neg()
		}
		gsym := poly.GramMatrix(q, n)
		g := make([][]*big.Rat, n)
		bad := false
		for i := range gsym {
			g[i] = make([]*big.Rat, n)
			for j := range gsym[i] {
				e, err := gsym[i][j].EvalVars(pv)
				if err != nil {
					bad = true
					break
				}
				g[i][j] = e.Num.ConstTerm()
			}
		}
		if bad {
			continue
		}
		k, y, d := ratLDL(g)
		if k < 0 {
			continue
		}
		if rf := alongRay(m, res, vals, point, y, d.Sign() < 0); rf != nil {
			return rf
		}
	}
	return nil
}

// alongRay evaluates V and V̇ at equilibrium + t·y for t = 1, 1/2, 1/4, ...
// (and −t) and returns the first point that refutes the candidate.
func alongRay(m *model.Model, res *Result, vals map[string]string, params []*big.Rat, y []*big.Rat, strict bool) *claims.Refutation {
	n := len(m.States)
	x := slices.Clone(params)
	at := make([]*big.Rat, n)
	for i := range at {
		v, err := m.At[i].Eval(params)
		if err != nil {
			return nil
		}
		at[i] = v
	}
	if !slices.ContainsFunc(y, func(v *big.Rat) bool { return v.Sign() != 0 }) {
		// Every point of a zero ray is the equilibrium itself, where V and
		// V̇ vanish: no refutation (the kernel rightly rejects one there).
		return nil
	}
	t := big.NewRat(1, 1)
	tries := 40
	if !strict {
		tries = 12
	}
	for k := 0; k < tries; k++ {
		for _, s := range []int64{1, -1} {
			for i := 0; i < n; i++ {
				xi := new(big.Rat).Mul(y[i], t)
				if s < 0 {
					xi.Neg(xi)
				}
				x[i] = xi.Add(xi, at[i])
			}
			vv, err1 := res.V.Eval(x)
			dv, err2 := res.Vdot.Eval(x)
			if err1 != nil || err2 != nil {
				return nil
			}
			// V ≤ 0, or V̇ > 0 strictly: V̇ = 0 at a point refutes nothing
			// (a semidefinite V̇ may still prove stability).
			if (vv.Sign() <= 0 || dv.Sign() > 0) && failsNear(m, res, x, vv.Sign() <= 0, dv.Sign() > 0) {
				return minimalRefutation(m, res, vals, x)
			}
		}
		t.Quo(t, big.NewRat(2, 1))
	}
	return nil
}

// failsNear reports that the failure at the point x (all variables given)
// reaches the equilibrium, as the kernel's refutation rule requires: along
// the ray from the equilibrium through x, the lowest-order part of V that
// does not vanish is negative (or none does), when badV, or that of V̇ is
// positive, when badD. A point where V or V̇ has the wrong sign only far
// from the equilibrium does not refute a local claim.
func failsNear(m *model.Model, res *Result, x []*big.Rat, badV, badD bool) bool {
	n := len(m.States)
	dir := map[int]*big.Rat{}
	for i := n; i < len(x); i++ {
		dir[i] = x[i]
	}
	for i := range n {
		e, err := m.At[i].Eval(x)
		if err != nil {
			return false
		}
		dir[i] = new(big.Rat).Sub(x[i], e)
	}
	states := m.Ring.StateMask()
	if badV {
		h, d, ok := m.Shift(res.V).LowestAlong(states, dir)
		if ok && (d < 0 || h.Num.ConstTerm().Sign()*denSign(h) < 0) {
			return true
		}
	}
	if badD {
		h, d, ok := m.Shift(res.Vdot).LowestAlong(states, dir)
		if ok && d >= 0 && h.Num.ConstTerm().Sign()*denSign(h) > 0 {
			return true
		}
	}
	return false
}

// denSign is the sign of a constant rational function's denominator.
func denSign(h poly.RatFunc) int {
	if h.IsPoly() {
		return 1
	}
	return h.DenPoly().ConstTerm().Sign()
}

// refuteLinear finds a point near the equilibrium where V < 0, moving
// against the gradient of V's linear part.
//
// The linear part may vanish at some parameter values (V = a·x at a = 0);
// there the gradient gives no direction, so the parameter samples are tried
// in turn until one gives a non-zero gradient.
func refuteLinear(m *model.Model, vs, lin poly.RatFunc) *claims.Refutation {
	res := &Result{Model: m}
	res.V = *m.V
	res.Vdot = m.Derivative(res.V)
	vals, point, _ := failingParams(res)
	n := len(m.States)
	r := m.Ring
	free := m.FreeParams()
	grids := make([][]*big.Rat, len(free))
	tries := 1
	for k, p := range free {
		grids[k] = samples(p.Range)
		tries = max(tries, len(grids[k]))
	}
	for t := 0; t < tries; t++ {
		if t > 0 {
			// The t-th sample of every parameter (its last one when it has
			// fewer), after the middle ones of failingParams.
			for k, p := range free {
				g := grids[k]
				x := g[min(t-1, len(g)-1)]
				j, _ := r.Index(p.Name)
				point[j] = x
				vals[p.Name] = x.RatString()
			}
		}
		y := make([]*big.Rat, n)
		for i := 0; i < n; i++ {
			e := make([]int, r.NumVars())
			e[i] = 1
			c := lin.Coefficient(e, r.StateMask())
			v, err := c.Eval(point)
			if err != nil {
				y = nil
				break
			}
			y[i] = v.Neg(v)
		}
		if y == nil {
			continue
		}
		if rf := alongRay(m, res, vals, point, y, true); rf != nil {
			return rf
		}
	}
	return nil
}

// finish builds the certificate and re-checks it; a claim that the checker
// does not accept, or a verdict it does not derive, is an internal error,
// never printed.
func finish(ctx context.Context, res *Result, source string) (*Result, error) {
	res.methods()
	doc := res.document(source)
	if err := certificates.Seal(doc); err != nil {
		return nil, err
	}
	res.Doc = doc
	res.Check = checker.VerifyContext(ctx, doc)
	if err := ctx.Err(); err != nil {
		return nil, err // stopped: no verdict
	}
	if err := certify.Agrees(res.Check, res.Verdict, res.Claim); err != nil {
		return nil, err
	}
	return res, nil
}

func (res *Result) document(source string) *claims.Document {
	d := certify.NewDocument(res.Model, source)
	add := func(c claims.Claim) { d.Claims = append(d.Claims, c) }
	add(&claims.OrbitalDerivative{V: res.V.String(), Vdot: res.Vdot.String()})
	for _, f := range res.Forms {
		lf := claims.LDLForm{Of: f.Name, Gram: f.Gram.Strings(), L: f.LDL.L.Strings(), D: []string{}, Minors: []string{}}
		for _, p := range f.LDL.D {
			lf.D = append(lf.D, p.String())
		}
		for _, mi := range f.Minors {
			lf.Minors = append(lf.Minors, mi.String())
		}
		if f.Basis == nil {
			add(&claims.QuadraticPart{LDLForm: lf})
			continue
		}
		if f.Margin != nil {
			mg := &claims.MarginGram{LDLForm: lf, Margin: f.Margin.String()}
			for _, z := range f.Basis {
				mg.Basis = append(mg.Basis, z.String())
			}
			add(mg)
			continue
		}
		mg := &claims.MonomialGram{LDLForm: lf}
		for _, z := range f.Basis {
			mg.Basis = append(mg.Basis, z.String())
		}
		add(mg)
	}
	for _, f := range res.Forms {
		if f.Triangular != nil {
			add(&claims.TriangularSquares{Of: f.Name, Order: f.Triangular})
		}
	}
	for _, c := range res.Conds {
		cd := &claims.MinorCondition{Form: c.Form, Index: c.Index, Minor: c.Minor.String(), Constant: c.Constant.RatString(), Condition: c.Q.String(), Factors: []claims.Factor{}}
		for _, f := range c.Factors {
			cd.Factors = append(cd.Factors, claims.Factor{Poly: f.P.String(), Power: f.Power, Status: f.Status})
		}
		add(cd)
	}
	if len(res.Kernel) > 0 {
		ns := &claims.NullSpace{Of: "-Vdot"}
		for _, k := range res.Kernel {
			var row []string
			for _, e := range k {
				row = append(row, e.String())
			}
			ns.Vectors = append(ns.Vectors, row)
		}
		add(ns)
	}
	if res.Invariance != nil {
		add(res.Invariance)
	}
	for _, pc := range res.Points {
		add(pc)
	}
	for _, ap := range res.AlgebraicPoints {
		add(ap)
	}
	switch rg := res.Region; {
	case rg != nil && rg.Paving != nil:
		add(rg.Paving)
	case rg != nil:
		add(&claims.SturmRegion{Param: rg.Param, Intervals: rg.Intervals, Pieces: rg.Pieces})
	}
	if len(res.Witnesses) > 0 {
		add(&claims.WitnessPoints{Points: res.Witnesses})
	}
	if res.Refutation != nil {
		add(res.Refutation)
	}
	for i := range res.NotSOS {
		add(&res.NotSOS[i])
	}
	return d
}

// minimalRefutation states a refuting point with only the parameters that V
// or V̇ there depends on; the values are functions of the others, which do
// not occur in them.
func minimalRefutation(m *model.Model, res *Result, vals map[string]string, x []*big.Rat) *claims.Refutation {
	r := m.Ring
	n := len(m.States)
	keep := map[int]*big.Rat{}
	for i := n; i < r.NumVars(); i++ {
		if _, ok := vals[r.Name(i)]; ok {
			keep[i] = x[i]
		}
	}
	at := func(f poly.RatFunc, params map[int]*big.Rat) poly.RatFunc {
		all := maps.Clone(params)
		for i := 0; i < n; i++ {
			all[i] = x[i]
		}
		g, err := f.EvalVars(all)
		if err != nil {
			panic(err) // the point was evaluated before
		}
		return g
	}
	// The lowest-order parts along the ray from the equilibrium, which the
	// kernel's refutation rule reads, must not depend on a dropped
	// parameter either.
	dir := map[int]*big.Rat{}
	for i := range n {
		e, err := m.At[i].Eval(x)
		if err != nil {
			panic(err) // the point was evaluated before
		}
		dir[i] = new(big.Rat).Sub(x[i], e)
	}
	vx, _ := res.V.Eval(x)
	dx, _ := res.Vdot.Eval(x)
	badV, badD := vx.Sign() <= 0, dx.Sign() > 0
	lowest := func(f poly.RatFunc, params map[int]*big.Rat) poly.RatFunc {
		all := maps.Clone(params)
		maps.Copy(all, dir)
		h, _, _ := m.Shift(f).LowestAlong(r.StateMask(), all)
		return h
	}
	for _, i := range slices.Sorted(maps.Keys(keep)) {
		rest := maps.Clone(keep)
		delete(rest, i)
		// The equilibrium must stay fixed too.
		eqUses := false
		for _, a := range m.At {
			if a.UsesVar(i) {
				eqUses = true
			}
		}
		if !eqUses && !at(res.V, rest).UsesVar(i) && !at(res.Vdot, rest).UsesVar(i) && (!badV || !lowest(res.V, rest).UsesVar(i)) && (!badD || !lowest(res.Vdot, rest).UsesVar(i)) {
			keep = rest
		}
	}
	params := map[string]string{}
	for i, v := range keep {
		params[r.Name(i)] = v.RatString()
	}
	pt := map[string]string{}
	for i, name := range m.States {
		pt[name] = x[i].RatString()
	}
	return &claims.Refutation{Params: params, Point: pt, V: at(res.V, keep).String(), Vdot: at(res.Vdot, keep).String()}
}

// systemDoc restates the model in a certificate: time, states, assumptions,
// the equations' and the equilibrium's texts.
