package checker

import (
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// KrawczykEnclosure proves that a box holds exactly one equilibrium of a
// model without free parameters and without an "at" point (Krawczyk 1969;
// Moore 1977): with g = f (continuous time) or g = f − x (discrete time), J
// its Jacobian, Y a rational preconditioner and m the box's midpoint,
// K(X) = m − Y·g(m) + (I − Y·J(X))·(X − m) lies in the interior of X. Box
// has one closed [lo, hi] per state; every number is in canonical form.
type KrawczykEnclosure struct {
	Box            [][2]string `json:"box"`
	Preconditioner [][]string  `json:"preconditioner"` // Y
	Krawczyk       [][2]string `json:"krawczyk"`       // K(Box), recomputed
}

// Linearization certifies the stability or the instability of one
// equilibrium x* of a model without free parameters through its
// linearization (Lyapunov's indirect method). x* is the model's "at" point,
// a rational zero of the equations, or the box of a preceding
// KrawczykEnclosure. With J(x) the Jacobian of f, Decay encloses over the box
// (or gives at the point) the symmetric matrix
//
//	M(x) = −(J(x)ᵀP + P·J(x))   (continuous time)
//	M(x) = P − J(x)ᵀP·J(x)      (discrete time)
//
// The rule requires M(x*) ≻ 0; then P ≻ 0 gives local asymptotic stability
// (V = (x − x*)ᵀP(x − x*) decreases near x*) and a negative LDLᵀ pivot of P
// gives instability (W = −V increases near x* and is positive arbitrarily
// close to it: Lyapunov's instability theorem). When every fᵢ has degree ≤ 1
// the linearization is exact, f(x) = J·(x − x*), so V̇ (ΔV) equals
// −(x − x*)ᵀM(x − x*) everywhere and P ≻ 0 gives global asymptotic stability
// (Lyapunov's direct method, V radially unbounded).
type Linearization struct {
	P     [][]string    `json:"p"`     // symmetric
	Decay [][][2]string `json:"decay"` // M entrywise over the box, recomputed
}

func (*KrawczykEnclosure) Rule() string { return "krawczyk-enclosure" }
func (*Linearization) Rule() string     { return "linearization" }

// IntervalText returns the closed interval [lo, hi] of a certificate.
func IntervalText(x poly.Interval) [2]string {
	return [2]string{poly.RatString(x.Lo.Value), poly.RatString(x.Hi.Value)}
}

// canonicalRat reads a number that must be in RatString form.
func canonicalRat(s string) (*big.Rat, bool) {
	q, ok := parseRat(s)
	if !ok || poly.RatString(q) != s {
		return nil, false
	}
	return q, true
}

// rationalMatrix reads an n×n matrix of canonical rationals.
func (c *run) rationalMatrix(what string, rows [][]string, n int) ([][]*big.Rat, bool) {
	out := make([][]*big.Rat, n)
	ok := len(rows) == n
	for i := 0; ok && i < n; i++ {
		out[i] = make([]*big.Rat, n)
		ok = len(rows[i]) == n
		for j := 0; ok && j < n; j++ {
			out[i][j], ok = canonicalRat(rows[i][j])
		}
	}
	return out, c.add("linearization", ok, "%s is a %d×%d matrix of rationals in canonical form", what, n, n)
}

// sameText reports that a stated interval is the closed interval x.
func sameText(a [2]string, x poly.Interval) bool {
	return !x.Lo.Open && !x.Hi.Open && a == IntervalText(x)
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
func (c *run) krawczyk(cl Claim) bool {
	kz := cl.(*KrawczykEnclosure)
	m := c.m
	n := len(m.States)
	g, _, ok := c.pointModel()
	if !ok || !c.once("krawczyk-enclosure") ||
		!c.add("krawczyk", !m.AtGiven, "a box certificate's model names no point equilibrium") ||
		!c.add("krawczyk", len(kz.Box) == n && len(kz.Krawczyk) == n, "the box and K(X) have one interval per state") {
		return false
	}
	box := make([]poly.Interval, n)
	for i, iv := range kz.Box {
		lo, ok1 := canonicalRat(iv[0])
		hi, ok2 := canonicalRat(iv[1])
		if !c.add("krawczyk", ok1 && ok2 && lo.Cmp(hi) < 0, "box side %d has canonical rational ends, lo < hi", i+1) {
			return false
		}
		box[i] = poly.Closed(lo, hi)
	}
	y, ok := c.rationalMatrix("the preconditioner", kz.Preconditioner, n)
	if !ok {
		return false
	}
	same, inside := true, true
	for i, k := range poly.KrawczykImage(g, box, y) {
		same = same && sameText(kz.Krawczyk[i], k)
		inside = inside && k.Lo.Value.Cmp(box[i].Lo.Value) > 0 && k.Hi.Value.Cmp(box[i].Hi.Value) < 0
	}
	c.equilibrium = box
	return c.add("krawczyk", same, "K(X) equals the recomputed operator") &&
		c.add("krawczyk", inside, "K(X) lies in the interior of the box (Krawczyk: exactly one equilibrium in X)")
}

// linearization: Lyapunov's indirect method, with the decay matrix enclosed
// exactly over the equilibrium's box (or evaluated at its point).
func (c *run) linearization(cl Claim) bool {
	lz := cl.(*Linearization)
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
	symmetric, same := true, len(lz.Decay) == n
	for i := range n {
		same = same && len(lz.Decay[i]) == n
		for j := range n {
			symmetric = symmetric && p[i][j].Cmp(p[j][i]) == 0
			same = same && sameText(lz.Decay[i][j], e[i][j])
		}
	}
	mname := map[bool]string{false: "−(JᵀP + PJ)", true: "P − JᵀPJ"}[m.Discrete]
	if !c.add("linearization", symmetric, "P is symmetric") ||
		!c.add("decay", same, "the enclosure of M = %s equals the recomputed one", mname) ||
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
