package checker

import (
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// pointCheck: the model with the stated parameters fixed (model.FixParams,
// each value inside its range) is a model in its own right; the nested
// certificate is verified against it by the same rules, from scratch (its
// digest included, no deeper nesting), and the verdict and kind derived
// there hold at that point (Lyapunov's theorems apply to each parameter
// value separately).
func (c *run) pointCheck(cl claims.Claim) bool {
	pc := cl.(*claims.PointCheck)
	key := pc.Key()
	vals, ok := c.paramValues(pc.Params, "point "+key)
	if !ok || !c.add("point "+key, len(vals) > 0 && c.points[key] == nil && !c.nested, "a new point, not inside another") {
		return false
	}
	var sets []model.Setting
	for name := range pc.Params {
		i, _ := c.r.Index(name)
		sets = append(sets, model.Setting{Name: name, Value: vals[i]})
	}
	fixed, err := model.FixParams(c.m, sets)
	if !c.add("point "+key, err == nil, "the model with %s fixed%s", key, errSuffix(err)) {
		return false
	}
	doc := pc.Certificate
	if !c.add("point "+key, doc != nil && doc.Model == fixed.Canonical() && doc.Signature == nil, "a certificate of the model with %s fixed, unsigned", key) {
		return false
	}
	sub := &run{ctx: c.ctx, doc: doc, nested: true, forms: map[string]*checkedForm{}, seen: map[string]bool{}, sturm: map[string]*poly.Sturm{}, points: map[string]*[2]string{}}
	verdict, kind := sub.verify()
	for _, r := range sub.records {
		c.add("at "+key+": "+r.Name, r.OK, "%s", r.Reason)
	}
	c.points[key] = &[2]string{verdict, kind}
	return !sub.failed && c.add("point "+key, verdict == VerdictHolds, "the certificate proves %s at %s", kind, key)
}

// kindRank orders the kinds of claim from the weakest.
func kindRank(k string) int {
	return slices.Index([]string{KindStable, KindLocal, KindGlobal}, k)
}

// algebraicPoint: Lyapunov's direct method at one irrational value α of a
// parameter, the unique root of a polynomial in an isolating interval
// (Sturm). Each form's identities, zᵀGz = p − m and G = L·D·Lᵀ, hold in
// Q(parameter), so at α too when every denominator is non-zero there; then
// D(α) ≥ 0 gives G(α) ⪰ 0 and p ≥ m > 0 away from the equilibrium, with m
// radially unbounded. The signs at α are exact: gcd and Sturm sequences
// (poly.Tiling.Signs). V and −V̇ so bounded give global asymptotic
// stability at α, where the region's quadratic test is only semidefinite.
func (c *run) algebraicPoint(cl claims.Claim) bool {
	ap := cl.(*claims.AlgebraicPoint)
	pi, ok := c.r.Index(ap.Param)
	key := claims.EndKey(ap.Param, ap.Value, ap.Poly, &ap.Isolating)
	what := "point " + key
	if !c.add(what, ok && !c.r.IsState(pi) && c.derived && c.points[key] == nil && len(ap.Forms) == 2 && ap.Forms[0].Of == "V" && ap.Forms[1].Of == "-Vdot",
		"a new irrational value of a free parameter, after the derivative, with margin forms of V and −V̇") {
		return false
	}
	end, ok := c.readEnd(ap.Value, ap.Poly, &ap.Isolating, true, pi, what)
	for k, whole := range []poly.RatFunc{c.m.Shift(c.v), c.m.Shift(c.vdot).Neg()} {
		mg := &ap.Forms[k]
		g, ok1 := c.marginIdentity(mg, whole)
		cf, ok2 := c.ldl(&mg.LDLForm, g)
		if !ok || !ok1 || !ok2 || !c.add(what, len(mg.Minors) == 0, "%s: no minors, the signs are decided at the point", mg.Of) ||
			!c.add(what, poly.NonNegativeAt(end, pi, slices.Concat(slices.Concat(g...), slices.Concat(cf.l...)), cf.d),
				"the entries of %s's G, L and D are functions of %s alone, defined at %s, and D ≥ 0 there (Sturm)", mg.Of, ap.Param, key) {
			return false
		}
	}
	c.points[key] = &[2]string{VerdictHolds, KindGlobal}
	return true
}
