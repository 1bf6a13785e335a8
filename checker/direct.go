package checker

import (
	"fmt"
	"maps"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// derivative: V is the model's candidate, and the stated derivative equals
// the one recomputed by the chain rule (ΔV by composition for a map). The
// model's equilibrium must make f vanish identically.
func (c *run) derivative(cl claims.Claim) bool {
	od := cl.(*claims.OrbitalDerivative)
	m := c.m
	if !c.once("orbital-derivative") {
		return false
	}
	err := m.CheckEquilibrium()
	if !c.add("equilibrium", err == nil, "f vanishes at the stated equilibrium for every parameter value%s", errSuffix(err)) ||
		!c.add("V", m.V != nil, "the model states the candidate V") {
		return false
	}
	v, ok := c.parse("V", od.V)
	if !ok || !c.add("V", v.Equal(*m.V), "V equals the model's candidate") {
		return false
	}
	vdot := m.Derivative(v)
	claimed, ok := c.parse("vdot", od.Vdot)
	what := "V̇ = Σ ∂V/∂xᵢ·fᵢ"
	if m.Discrete {
		what = "ΔV = V(f(x)) − V(x)"
	}
	if !ok || !c.add("vdot", claimed.Equal(vdot), "the claimed %s equals the recomputed one", what) {
		return false
	}
	c.derived, c.v, c.vdot = true, v, vdot
	return true
}

// shifted returns V or −V̇ in coordinates centred at the equilibrium, after
// checking that neither V nor V̇ has a constant or linear part there.
func (c *run) shifted(of string) (poly.RatFunc, bool) {
	if !c.add("form "+of, c.derived && (of == "V" || of == "-Vdot") && c.forms[of] == nil,
		"a form of V or −V̇, once each, after the derivative") {
		return poly.RatFunc{}, false
	}
	states := c.r.StateMask()
	vs, ds := c.m.Shift(c.v), c.m.Shift(c.vdot)
	low := func(f poly.RatFunc) bool {
		return f.Homogeneous(0, states).IsZero() && f.Homogeneous(1, states).IsZero()
	}
	if !c.add("vanishing", low(vs) && low(ds), "V and its derivative have no constant or linear part at the equilibrium") {
		return poly.RatFunc{}, false
	}
	c.higherV = !vs.Sub(vs.Homogeneous(2, states)).IsZero()
	c.higherD = !ds.Sub(ds.Homogeneous(2, states)).IsZero()
	if of == "V" {
		return vs, true
	}
	return ds.Neg(), true
}

// quadraticPart: Sylvester's criterion. G is the Gram matrix of the
// quadratic part, recomputed; G = L·D·Lᵀ is checked as an identity of
// rational functions, so the leading principal minors are the products of the
// first pivots (L unit lower triangular), and G ≻ 0 iff every minor is > 0.
// With zero pivots whose columns of L vanish, G = L·D·Lᵀ with D ≥ 0 is
// positive semidefinite.
func (c *run) quadraticPart(cl claims.Claim) bool {
	f := &cl.(*claims.QuadraticPart).LDLForm
	whole, ok := c.shifted(f.Of)
	if !ok {
		return false
	}
	g := poly.GramMatrix(whole.Homogeneous(2, c.r.StateMask()), len(c.m.States))
	cf, ok := c.form(f, g)
	for _, x := range poly.StateBasis(c.r, len(c.m.States)) {
		cf.z = append(cf.z, c.m.Unshift(x))
	}
	c.forms[f.Of] = cf
	return ok
}

// monomialGram: a Gram matrix in a monomial basis z. Every basis element is
// a monomial in the states with coefficient 1, they are distinct, a pure
// power of every state is among them, and zᵀGz equals the whole function
// exactly. Then G ≻ 0 gives zᵀGz > 0 unless z = 0, and z = 0 only at the
// origin (the pure powers vanish only there): the function is positive
// definite, and at least λ_min(G)·Σ xᵢ^(2kᵢ), so radially unbounded. For
// −V̇ a semidefinite G (zero pivots with zero columns of L), or a basis
// without a pure power of some state, still gives −V̇ = Σ dₖ·qₖ² ≥ 0
// everywhere: V̇ ≤ 0, a semidefinite form.
func (c *run) monomialGram(cl claims.Claim) bool {
	mg := cl.(*claims.MonomialGram)
	whole, ok := c.shifted(mg.Of)
	if !ok {
		return false
	}
	name := "basis " + mg.Of
	z, ok := c.monomials(name, mg.Basis, false)
	if !ok {
		return false
	}
	n := len(z)
	pure := make([]bool, len(c.m.States))
	for _, b := range z {
		if vars := b.VarsUsed(); len(vars) == 1 {
			pure[vars[0]] = true
		}
	}
	g, ok := c.matrix(name, mg.Gram, n, "the Gram matrix")
	free := ok
	for i := 0; ok && i < n; i++ {
		for j := range n {
			free = free && g[i][j].DegreeIn(c.r.StateMask()) <= 0
		}
	}
	allPure := !slices.Contains(pure, false)
	if !ok || !c.add(name, free, "the Gram entries are free of states") ||
		!c.add(name, poly.QuadraticFormIn(g, z).Equal(whole), "zᵀGz equals the whole function exactly (all degrees)") {
		return false
	}
	cf, ok := c.form(&mg.LDLForm, g)
	cf.basis, cf.semidef = true, cf.semidef || !allPure
	cf.z = make([]poly.RatFunc, n)
	for i, b := range z {
		cf.z[i] = c.m.Unshift(poly.FromPoly(b))
	}
	c.forms[mg.Of] = cf // semidefinite without a pure power of every state: ≥ 0 only
	return ok
}

// matrix reads an n×n matrix of rational functions.
func (c *run) matrix(name string, rows [][]string, n int, what string) (poly.Matrix, bool) {
	if !c.add(name, len(rows) == n, "%s has %d rows, want %d", what, len(rows), n) {
		return nil, false
	}
	out := make(poly.Matrix, n)
	for i := range rows {
		var ok bool
		if out[i], ok = c.list(name, rows[i], n, what+" entries in a row"); !ok {
			return nil, false
		}
	}
	return out, true
}

// ldl checks a stated G against the recomputed g and G = L·D·Lᵀ exactly, L
// unit lower triangular with a zero column below every zero pivot.
func (c *run) ldl(f *claims.LDLForm, g poly.Matrix) (*checkedForm, bool) {
	name, n := f.Of, len(g)
	cf := &checkedForm{g: g, zero: make([]bool, n)}
	claimedG, ok1 := c.matrix("form "+name, f.Gram, n, "the Gram matrix")
	l, ok2 := c.matrix("form "+name, f.L, n, "L")
	d, ok3 := c.list("ldl "+name, f.D, n, "pivots")
	if !ok1 || !ok2 || !ok3 || !c.add("gram "+name, claimedG.Equal(g), "the Gram matrix equals the one recomputed from the model") {
		return cf, false
	}
	cf.d, cf.l = d, l
	for i := range n {
		cf.zero[i] = d[i].IsZero()
		cf.semidef = cf.semidef || cf.zero[i]
	}
	return cf, c.add("ldl "+name, l.UnitLower(cf.zero), "L is unit lower triangular, with a zero column below every zero pivot") &&
		c.add("ldl "+name, g.EqualLDL(l, d), "L·D·Lᵀ reproduces the Gram matrix exactly")
}

// form checks G = L·D·Lᵀ and the minors of one form against the recomputed G.
func (c *run) form(f *claims.LDLForm, g poly.Matrix) (*checkedForm, bool) {
	name, n := f.Of, len(g)
	cf, ok := c.ldl(f, g)
	d, l := cf.d, cf.l
	if !ok {
		return cf, false
	}
	// Minors: of G itself (no zero pivot), or of its principal submatrix on
	// the positive pivots (semidefinite).
	p := poly.RatConst(c.r, big.NewRat(1, 1))
	var want []poly.RatFunc
	for i := range n {
		if !cf.zero[i] {
			p = p.Mul(d[i])
			want = append(want, p)
		}
	}
	minors, ok := c.list("minors "+name, f.Minors, len(want), "minors, one per non-zero pivot,")
	if !ok {
		return cf, false
	}
	for i, mi := range minors {
		if !c.add("minors "+name, mi.Equal(want[i]), "minor %d equals the product of the first pivots", i+1) ||
			!c.add("minors "+name, mi.DenNonzeroOn(c.box), "the denominator of minor %d is non-zero on the parameter box", i+1) {
			return cf, false
		}
	}
	cf.minors = minors
	for k, mi := range minors {
		c.minors = append(c.minors, slot{name, k + 1, mi})
	}
	defined := true
	for i := 0; cf.semidef && i < n; i++ {
		defined = defined && d[i].DenNonzeroOn(c.box)
		for j := range n {
			defined = defined && l[j][i].DenNonzeroOn(c.box)
		}
	}
	return cf, c.add("ldl "+name, defined, "the factors are defined on the whole parameter box (needed when semidefinite)")
}

// list reads n rational functions.
func (c *run) list(name string, ss []string, n int, what string) ([]poly.RatFunc, bool) {
	if !c.add(name, len(ss) == n, "%d %s, want %d", len(ss), what, n) {
		return nil, false
	}
	out := make([]poly.RatFunc, n)
	for i, s := range ss {
		var ok bool
		if out[i], ok = c.parse(name, s); !ok {
			return nil, false
		}
	}
	return out, true
}

// minorCondition: the factorization of a minor is an identity, and each
// factor's sign status follows from its exact interval enclosure over the
// parameter box (Moore 1966): minor > 0 iff the condition > 0 there. The
// conditions come in the order of the minors, V's first.
func (c *run) minorCondition(cl claims.Claim) bool {
	cd := cl.(*claims.MinorCondition)
	what := fmt.Sprintf("condition %d", len(c.conds)+1)
	if !c.add(what, len(c.forms) == 2 && len(c.conds) < len(c.minors), "there is a minor of the two forms left for it") {
		return false
	}
	w := c.minors[len(c.conds)]
	mi, ok := c.parse(what, cd.Minor)
	k, ok2 := poly.ParseRat(cd.Constant)
	if !ok || !c.add(what, cd.Form == w.form && cd.Index == w.index && mi.Equal(w.minor), "it is minor %d of %s, stated", w.index, w.form) ||
		!c.add(what, ok2 && k.Sign() != 0, "it has a non-zero rational constant") {
		return false
	}
	target := new(poly.Poly).Mul(mi.Num, mi.DenPoly())
	prod := poly.Const(c.r, k)
	sign := k.Sign()
	q := poly.ConstInt(c.r, 1)
	// Degrees add up in a product of non-zero polynomials, so the factors'
	// degrees (times their powers) must sum to the target's degree; checked
	// before each product, so that many factors cannot make it huge.
	degree, targetDegree := 0, target.Degree()
	for _, fd := range cd.Factors {
		f, ok := c.parse(what, fd.Poly)
		maxDeg := poly.DefaultLimits().Degree
		if !ok || !c.add(what, f.IsPoly() && !f.Num.IsConst() && f.Num.DegreeIn(c.r.StateMask()) == 0 && fd.Power >= 1 && fd.Power <= maxDeg &&
			f.Num.Degree()*fd.Power <= maxDeg, "factor %s is a non-constant polynomial in the parameters of degree at most %d with a positive power", fd.Poly, maxDeg) {
			return false
		}
		degree += f.Num.Degree() * fd.Power
		if !c.add(what, degree <= targetDegree, "the factors' degrees do not exceed the degree %d of numerator × denominator of the minor", targetDegree) {
			return false
		}
		pw := new(poly.Poly).Pow(f.Num, fd.Power)
		prod.Mul(prod, pw)
		status := FactorStatus(f.Num, fd.Power, c.box)
		if !c.add(what, status == fd.Status, "factor %s^%d is %s (claimed %s)", fd.Poly, fd.Power, status, fd.Status) {
			return false
		}
		switch status {
		case claims.StatusNegative:
			sign = -sign
		case claims.StatusCondition:
			q.Mul(q, pw)
		}
	}
	if !c.add(what, prod.Equal(target), "constant × factors = numerator × denominator of the minor") {
		return false
	}
	if sign < 0 {
		q.Neg(q)
	}
	claimed, ok := c.parse(what, cd.Condition)
	if !ok || !c.add(what, claimed.IsPoly() && claimed.Num.Equal(q), "%s > 0 is what remains", cd.Condition) {
		return false
	}
	c.conds = append(c.conds, poly.FromPoly(q))
	return true
}

// FactorStatus classifies f^power over the parameter box by its exact
// interval enclosure (poly.PowerSign).
func FactorStatus(f *poly.Poly, power int, box []poly.Interval) string {
	return map[int]string{1: claims.StatusPositive, -1: claims.StatusNegative, 0: claims.StatusCondition}[f.PowerSign(power, box)]
}

// nullSpace: for G = L·D·Lᵀ ⪰ 0 the set where zᵀGz = 0 is the kernel of G;
// the stated vectors are independent (1 at their own zero pivot, 0 at the
// others) and G·k = 0 for each, one per zero pivot, so they span it.
func (c *run) nullSpace(cl claims.Claim) bool {
	ns := cl.(*claims.NullSpace)
	f := c.forms[ns.Of]
	if !c.once("semidefinite-kernel") || !c.add("kernel", ns.Of == "-Vdot" && f != nil && !f.basis, "the kernel of the quadratic part of −V̇") {
		return false
	}
	var zeros []int
	for i, z := range f.zero {
		if z {
			zeros = append(zeros, i)
		}
	}
	if !c.add("kernel", len(ns.Vectors) == len(zeros), "one kernel vector per zero pivot") {
		return false
	}
	for k, vs := range ns.Vectors {
		v, ok := c.list("kernel", vs, len(f.g), "entries of a kernel vector")
		if !ok {
			return false
		}
		vec := make(poly.Matrix, len(v))
		independent, null := true, true
		for i := range v {
			vec[i] = v[i : i+1]
		}
		for j, z := range zeros {
			independent = independent && (j == k && v[z].IsOne() || j != k && v[z].IsZero())
		}
		for _, e := range f.g.Mul(vec) {
			null = null && e[0].IsZero()
		}
		if !c.add("kernel", independent, "kernel vector %d is 1 at its zero pivot and 0 at the others", k+1) ||
			!c.add("kernel", null, "G·k = 0 for kernel vector %d", k+1) {
			return false
		}
	}
	c.hasKernel = true
	return true
}

// conditionsUsed returns the parameters the conditions involve, after
// checking that every minor has its condition.
func (c *run) conditionsUsed(what string) (map[int]bool, bool) {
	n := 0
	for _, f := range c.forms {
		n += len(f.minors)
	}
	used := map[int]bool{}
	for _, q := range c.conds {
		for _, v := range q.Num.VarsUsed() {
			used[v] = true
		}
	}
	return used, c.once("region") && c.add(what, len(c.forms) == 2 && len(c.conds) == n, "follows the conditions of every minor")
}

// witnessPoints: the conditions evaluated exactly at each point.
func (c *run) witnessPoints(cl claims.Claim) bool {
	wp := cl.(*claims.WitnessPoints)
	var used map[int]bool
	if c.seen["paving"] { // beside a paving, after its region
		used = c.region.used
	} else {
		var ok bool
		if used, ok = c.conditionsUsed("witnesses"); !ok {
			return false
		}
	}
	if !c.add("witnesses", len(wp.Points) > 0 && !c.seen["sturm-region"], "witness points, not beside a one-parameter region") || !c.once("witness-points") {
		return false
	}
	var holds, fails bool
	for i, w := range wp.Points {
		what := fmt.Sprintf("witness %d", i+1)
		vals, ok := c.paramValues(w.Params, what)
		if !ok {
			return false
		}
		same := len(vals) == len(used)
		for v := range vals {
			same = same && used[v]
		}
		if !c.add(what, same, "gives exactly the parameters the conditions involve") ||
			!c.add(what, len(w.Values) == len(c.conds), "states the value of every condition") {
			return false
		}
		all, exact := true, true
		for j, q := range c.conds {
			x := new(poly.Poly).EvalVars(q.Num, vals).ConstTerm()
			claimed, ok := poly.ParseRat(w.Values[j])
			exact = exact && ok && claimed.Cmp(x) == 0
			all = all && x.Sign() > 0
		}
		if !c.add(what, exact, "the conditions' values there are as stated") || !c.add(what, all == w.Holds, "the conditions hold there: %v", all) {
			return false
		}
		holds, fails = holds || all, fails || !all
	}
	c.witness = &[2]bool{holds, fails}
	return true
}

// paramValues reads values of some free parameters, each inside its range.
func (c *run) paramValues(vals map[string]string, what string) (map[int]*big.Rat, bool) {
	out, err := c.m.ParamValues(vals)
	return out, c.add(what, err == nil, "the parameter values are exact and inside their ranges%s", errSuffix(err))
}

// refutation: a point where V ≤ 0 or V̇ ≥ 0 refutes the candidate. The values
// are recomputed as functions of the parameters left free, and their sign
// must hold on the whole box by exact interval enclosure. Every fixed
// parameter must matter.
func (c *run) refutation(cl claims.Claim) bool {
	rf := cl.(*claims.Refutation)
	if !c.once("refutation") || !c.add("refutation", c.derived, "follows the derivative") {
		return false
	}
	vals, ok := c.paramValues(rf.Params, "refutation")
	if !ok {
		return false
	}
	point, all := map[int]*big.Rat{}, len(rf.Point) == len(c.m.States)
	for i, s := range c.m.States {
		point[i], ok = poly.ParseRat(rf.Point[s])
		all = all && ok
	}
	if !c.add("refutation", all, "the point gives every state, and nothing else, as a rational") {
		return false
	}
	at := func(f poly.RatFunc, params map[int]*big.Rat) (poly.RatFunc, bool) {
		all := map[int]*big.Rat{}
		maps.Copy(all, point)
		maps.Copy(all, params)
		g, err := f.EvalVars(all)
		return g, err == nil
	}
	vv, ok1 := at(c.v, vals)
	dv, ok2 := at(c.vdot, vals)
	cv, ok3 := c.parse("refutation", rf.V)
	cd, ok4 := c.parse("refutation", rf.Vdot)
	if !c.add("refutation", ok1 && ok2 && ok3 && ok4 && vv.Equal(cv) && dv.Equal(cd), "V = %s and V̇ = %s there, exactly", rf.V, rf.Vdot) {
		return false
	}
	// The point differs from the equilibrium, fixed once the stated
	// parameters are: dir, the direction from it to the point, is not zero.
	differs, dir := false, maps.Clone(vals)
	for i := range c.m.States {
		e, ok := at(c.m.At[i], vals)
		if !c.add("refutation", ok && e.IsPoly() && e.Num.IsConst(), "the equilibrium's %s is a constant there", c.m.States[i]) {
			return false
		}
		dir[i] = new(big.Rat).Sub(point[i], e.Num.ConstTerm())
		differs = differs || dir[i].Sign() != 0
	}
	if !c.add("refutation", differs, "the point is not the equilibrium") {
		return false
	}
	for _, i := range slices.Sorted(maps.Keys(vals)) { // sorted: the same record every time
		rest := maps.Clone(vals)
		delete(rest, i)
		a, _ := at(c.v, rest)
		b, _ := at(c.vdot, rest)
		if !c.add("refutation", a.UsesVar(i) || b.UsesVar(i), "V or V̇ there depends on %s, which the refutation fixes", c.r.Name(i)) {
			return false
		}
	}
	// The failure reaches the equilibrium: along the ray from it through
	// the point, the lowest-order part of V that does not vanish is < 0 (or
	// none does: V ≡ 0 on the ray), or that of V̇ is > 0; then V ≤ 0 or V̇ > 0
	// at points arbitrarily close to the equilibrium, so V proves nothing
	// there. A failure far from it alone would deny a global claim only, and
	// V̇ = 0 refutes nothing (a semidefinite V̇ may still prove stability).
	lv, dv0, ok1 := c.m.Shift(c.v).LowestAlong(c.r.StateMask(), dir)
	ld, _, ok2 := c.m.Shift(c.vdot).LowestAlong(c.r.StateMask(), dir)
	nearV := ok1 && (dv0 < 0 || lv.SignOn(c.box).Negative())
	nearD := ok2 && ld.SignOn(c.box).Positive()
	c.refuted = c.add("refutation", vv.SignOn(c.box).NonPositive() && nearV || dv.SignOn(c.box).Positive() && nearD,
		"V ≤ 0 or V̇ > 0 there, and along the ray from the equilibrium the lowest-order part of V (V̇) that does not vanish is < 0 (> 0), for every value of the parameters left free")
	return c.refuted
}
