package checker

import (
	"math/big"

	"lyacert/model"
	"lyacert/poly"
)

// KrawczykEnclosure proves that a box holds exactly one equilibrium of a
// model without free parameters and without an "at" point (Krawczyk 1969;
// Moore 1977): with g = f (continuous time) or g = f − x (discrete time), J
// its Jacobian, Y a rational preconditioner and m the box's midpoint,
// K(X) = m − Y·g(m) + (I − Y·J(X))·(X − m) lies in the interior of X. The
// system's equilibrium restates the box. Every number must be in math/big's
// canonical form (RatString), and Krawczyk must equal the recomputed K(X).
type KrawczykEnclosure struct {
	// Box is one closed interval [lo, hi] per state, lo < hi.
	Box [][2]string `json:"box"`
	// Preconditioner is the rational matrix Y.
	Preconditioner [][]string `json:"preconditioner"`
	// Krawczyk is K(Box).
	Krawczyk [][2]string `json:"krawczyk"`
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
// close to it: Lyapunov's instability theorem).
type Linearization struct {
	// P is the symmetric matrix of the quadratic form.
	P [][]string `json:"p"`
	// Decay is the entrywise enclosure [lo, hi] of M over the box (at a
	// rational point lo = hi).
	Decay [][][2]string `json:"decay"`
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
	if !c.add("linearization", len(rows) == n, "%s has %d rows", what, n) {
		return nil, false
	}
	out := make([][]*big.Rat, n)
	for i, row := range rows {
		if !c.add("linearization", len(row) == n, "%s row %d has %d entries", what, i+1, n) {
			return nil, false
		}
		out[i] = make([]*big.Rat, n)
		for j, s := range row {
			q, ok := canonicalRat(s)
			if !c.add("linearization", ok, "%s entry (%d,%d) = %q is a rational in canonical form", what, i+1, j+1, s) {
				return nil, false
			}
			out[i][j] = q
		}
	}
	return out, true
}

// sameInterval reports that a stated interval is the closed interval x.
func sameText(a [2]string, b poly.Interval) bool {
	return !b.Lo.Open && !b.Hi.Open && a == IntervalText(b)
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
		if !c.add("krawczyk", ok1 && ok2 && lo.Cmp(hi) < 0, "box interval %d = [%s, %s] has canonical rational ends, lo < hi", i+1, iv[0], iv[1]) {
			return false
		}
		box[i] = poly.Closed(lo, hi)
	}
	y, ok := c.rationalMatrix("the preconditioner", kz.Preconditioner, n)
	if !ok {
		return false
	}
	k := poly.KrawczykImage(g, box, y)
	for i := range k {
		if !c.add("krawczyk", sameText(kz.Krawczyk[i], k[i]), "K(X) component %d equals the recomputed %s", i+1, k[i]) {
			return false
		}
		inside := k[i].Lo.Value.Cmp(box[i].Lo.Value) > 0 && k[i].Hi.Value.Cmp(box[i].Hi.Value) < 0
		if !c.add("krawczyk", inside, "K(X) component %d lies in the interior of the box (Krawczyk: exactly one equilibrium in X)", i+1) {
			return false
		}
	}
	c.equilibrium = box
	return true
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
		what := "f(x*) = 0"
		if m.Discrete {
			what = "f(x*) = x*"
		}
		if !c.add("equilibrium", err == nil, "%s exactly at the stated point%s", what, errSuffix(err)) {
			return false
		}
		zero := make([]*big.Rat, m.Ring.NumVars())
		for i := range zero {
			zero[i] = new(big.Rat)
		}
		box = make([]poly.Interval, n)
		for i := range box {
			v, err := m.At[i].Eval(zero)
			if !c.add("equilibrium", err == nil, "the point is defined") {
				return false
			}
			box[i] = poly.Point(v)
		}
	}
	p, ok := c.rationalMatrix("P", lz.P, n)
	if !ok {
		return false
	}
	for i := range p {
		for j := range i {
			if !c.add("linearization", p[i][j].Cmp(p[j][i]) == 0, "P is symmetric (entry %d,%d)", i+1, j+1) {
				return false
			}
		}
	}
	if !c.add("decay", len(lz.Decay) == n, "the enclosure of M has %d rows", n) {
		return false
	}
	e := poly.DecayEnclosure(f, m.Discrete, p, box)
	mname := "−(JᵀP + PJ)"
	if m.Discrete {
		mname = "P − JᵀPJ"
	}
	for i := range e {
		if !c.add("decay", len(lz.Decay[i]) == n, "row %d of the enclosure of M has %d entries", i+1, n) {
			return false
		}
		for j := range e[i] {
			if !c.add("decay", sameText(lz.Decay[i][j], e[i][j]), "M = %s entry (%d,%d) equals the recomputed %s", mname, i+1, j+1, e[i][j]) {
				return false
			}
		}
	}
	if !c.add("decay", poly.PositiveDefiniteOn(e), "M = %s is positive definite at the equilibrium (midpoint minus row-sum radius, exact LDLᵀ)", mname) {
		return false
	}
	k, pivot := poly.FirstNonPositivePivot(p)
	switch {
	case k < 0:
		c.linear = KindLocal
	case pivot.Sign() < 0:
		c.linear = KindUnstable
	default:
		return c.add("linearization", false, "P has a zero pivot (%d): neither stability nor instability follows", k+1)
	}
	return true
}
