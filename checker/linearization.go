package checker

import (
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// rationalMatrix reads an n×n matrix of canonical rationals, symmetric
// when it is a P (claims.RatMatrix).
func (c *run) rationalMatrix(what string, rows [][]string, n int) ([][]*big.Rat, bool) {
	out, ok := claims.RatMatrix(rows, n, what == "P")
	return out, c.add("linearization", ok, "%s is a %d×%d matrix of rationals in canonical form (symmetric if P)", what, n, n)
}

// pointModel checks that the model has no free parameters and no candidate,
// and returns the polynomial equations and right-hand sides.
func (c *run) pointModel() (g, f []*poly.Poly, ok bool) {
	m := c.m
	if !c.add("linearization", len(m.FreeParams()) == 0, "the model has no free parameters (the certificate is about one parameter point)") ||
		!c.add("linearization", m.V == nil, "the model states no candidate V") {
		return nil, nil, false
	}
	g, err := model.EquilibriumEquations(m.F, m.Discrete)
	if !c.add("linearization", err == nil, "the equations are polynomials%s", errSuffix(err)) {
		return nil, nil, false
	}
	for i := range m.F {
		f = append(f, m.F[i].Num)
	}
	return g, f, true
}

// krawczyk: exactly one equilibrium in the box (Krawczyk's theorem).
func (c *run) krawczyk(cl claims.Claim) bool {
	kz := cl.(*claims.KrawczykEnclosure)
	m := c.m
	n := len(m.States)
	g, _, ok := c.pointModel()
	if !ok || !c.once("krawczyk-enclosure") ||
		!c.add("krawczyk", !m.AtGiven, "a box certificate's model names no point equilibrium") ||
		!c.add("krawczyk", len(kz.Box) == n && len(kz.Krawczyk) == n, "the box and K(X) have one interval per state") {
		return false
	}
	box, err := kz.Sides()
	if !c.add("krawczyk", err == nil, "the box has canonical rational ends, lo < hi%s", errSuffix(err)) {
		return false
	}
	y, ok := c.rationalMatrix("the preconditioner", kz.Preconditioner, n)
	if !ok {
		return false
	}
	same, inside := true, true
	for i, k := range poly.KrawczykImage(g, box, y) {
		same = same && kz.Krawczyk[i] == claims.IntervalText(k)
		inside = inside && k.Lo.Value.Cmp(box[i].Lo.Value) > 0 && k.Hi.Value.Cmp(box[i].Hi.Value) < 0
	}
	c.equilibrium = box
	return c.add("krawczyk", same, "K(X) equals the recomputed operator") &&
		c.add("krawczyk", inside, "K(X) lies in the interior of the box (Krawczyk: exactly one equilibrium in X)")
}

// linearization: Lyapunov's indirect method, with the decay matrix enclosed
// exactly over the equilibrium's box (or evaluated at its point).
func (c *run) linearization(cl claims.Claim) bool {
	lz := cl.(*claims.Linearization)
	m := c.m
	n := len(m.States)
	_, f, ok := c.pointModel()
	if !ok || !c.once("linearization") {
		return false
	}
	box := c.equilibrium
	if box == nil {
		// The equilibrium is the model's point, rational and exact.
		err := m.CheckEquilibrium()
		what := map[bool]string{false: "f(x*) = 0", true: "f(x*) = x*"}[m.Discrete]
		if !c.add("equilibrium", err == nil, "%s exactly at the stated point%s", what, errSuffix(err)) {
			return false
		}
		pt, err := m.AtPoint()
		if !c.add("equilibrium", err == nil, "the point is defined") {
			return false
		}
		box = make([]poly.Interval, n)
		for i, v := range pt {
			box[i] = poly.Point(v)
		}
	}
	p, ok := c.rationalMatrix("P", lz.P, n)
	if !ok {
		return false
	}
	e := poly.DecayEnclosure(f, m.Discrete, p, box)
	same := len(lz.Decay) == n
	for i := range n {
		same = same && len(lz.Decay[i]) == n
		for j := range n {
			same = same && lz.Decay[i][j] == claims.IntervalText(e[i][j])
		}
	}
	mname := map[bool]string{false: "−(JᵀP + PJ)", true: "P − JᵀPJ"}[m.Discrete]
	if !c.add("decay", same, "the enclosure of M = %s equals the recomputed one", mname) ||
		!c.add("decay", poly.PositiveDefiniteOn(e), "M = %s is positive definite at the equilibrium (midpoint minus row-sum radius, exact LDLᵀ)", mname) {
		return false
	}
	k, pivot := poly.FirstNonPositivePivot(p)
	switch {
	case k < 0 && slices.ContainsFunc(f, func(fi *poly.Poly) bool { return fi.Degree() > 1 }):
		c.linear = KindLocal
	case k < 0:
		c.linear = KindGlobal // f affine: V̇ = −(x − x*)ᵀM(x − x*) everywhere
	case pivot.Sign() < 0:
		c.linear = KindUnstable
	default:
		return c.add("linearization", false, "P has a zero pivot (%d): neither stability nor instability follows", k+1)
	}
	return true
}
