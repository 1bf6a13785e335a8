package checker

import (
	"fmt"
	"math/big"

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

// EquilibriumEquations returns g with g(x) = 0 exactly at the equilibria:
// g = f for continuous time, g = f − x for discrete time. Every f must be a
// polynomial (a model without free parameters has no denominators).
func EquilibriumEquations(f []poly.RatFunc, discrete bool) ([]*poly.Poly, error) {
	g := make([]*poly.Poly, len(f))
	for i, fi := range f {
		if !fi.IsPoly() {
			return nil, fmt.Errorf("equation %d has a denominator", i+1)
		}
		g[i] = fi.Num.Clone()
		if discrete {
			g[i].Sub(g[i], poly.Var(fi.Ring(), i))
		}
	}
	return g, nil
}

// KrawczykImage returns the Krawczyk operator
//
//	K(X) = m − Y·g(m) + C(X)·(X − m),   m = mid X,
//
// where C(X)ᵢⱼ is the exact rational-interval enclosure (Poly.Enclose) over
// the box X of the polynomial δᵢⱼ − Σₖ Yᵢₖ·∂gₖ/∂xⱼ. The box has one bounded
// interval per variable of g's ring (the states; the ring must have no other
// variables). If K(X) lies in the interior of X, then X contains exactly one
// zero of g: by the mean value theorem applied to each component of
// φ(x) = x − Y·g(x), φ maps X into K(X) ⊂ X, so φ has a fixed point (Brouwer);
// strict inclusion makes every matrix with rows in C(X) a contraction in the
// norm max |vᵢ|/rᵢ (rᵢ the radii of X), which makes Y nonsingular and the
// zero unique (Krawczyk 1969; Moore 1977).
func KrawczykImage(g []*poly.Poly, box []poly.Interval, y [][]*big.Rat) []poly.Interval {
	n := len(g)
	mid := make([]*big.Rat, n)
	dev := make([]poly.Interval, n)
	for i := range box {
		mid[i] = box[i].Mid()
		dev[i] = box[i].Sub(poly.Point(mid[i]))
	}
	gm := make([]*big.Rat, n)
	for i := range g {
		gm[i] = g[i].Eval(mid)
	}
	jac := poly.Jacobian(g)
	r := g[0].Ring()
	k := make([]poly.Interval, n)
	for i := 0; i < n; i++ {
		c := new(big.Rat).Set(mid[i])
		t := new(big.Rat)
		for l := 0; l < n; l++ {
			c.Sub(c, t.Mul(y[i][l], gm[l]))
		}
		sum := poly.Point(c)
		for j := 0; j < n; j++ {
			cij := poly.Zero(r)
			if i == j {
				cij = poly.ConstInt(r, 1)
			}
			for l := 0; l < n; l++ {
				cij.Sub(cij, new(poly.Poly).Scale(jac[l][j], y[i][l]))
			}
			sum = sum.Add(cij.Enclose(box).Mul(dev[j]))
		}
		k[i] = sum
	}
	return k
}

// DecayEnclosure returns the exact rational-interval enclosure over the box
// (Poly.Enclose of each entry, as a polynomial in the states) of
// M(x) = −(J(x)ᵀP + P·J(x)) for continuous time, or P − J(x)ᵀP·J(x) for
// discrete time, J the Jacobian of f and P symmetric. A box of points gives
// M exactly there. Entries (i, j) and (j, i) are the same interval.
func DecayEnclosure(f []*poly.Poly, discrete bool, p [][]*big.Rat, box []poly.Interval) [][]poly.Interval {
	n := len(f)
	jac := poly.Jacobian(f)
	r := f[0].Ring()
	out := make([][]poly.Interval, n)
	for i := range out {
		out[i] = make([]poly.Interval, n)
	}
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			m := poly.Zero(r)
			if discrete {
				m = poly.Const(r, p[i][j])
				for k := 0; k < n; k++ {
					for l := 0; l < n; l++ {
						if p[k][l].Sign() == 0 {
							continue
						}
						t := new(poly.Poly).Mul(jac[k][i], jac[l][j])
						m.Sub(m, t.Scale(t, p[k][l]))
					}
				}
			} else {
				for k := 0; k < n; k++ {
					m.Sub(m, new(poly.Poly).Scale(jac[k][i], p[k][j]))
					m.Sub(m, new(poly.Poly).Scale(jac[k][j], p[i][k]))
				}
			}
			e := m.Enclose(box)
			out[i][j], out[j][i] = e, e
		}
	}
	return out
}

// PositiveDefiniteOn reports whether every symmetric matrix whose entries
// lie in the closed intervals e (symmetric: e[i][j] = e[j][i]) is positive
// definite. With the midpoint matrix Mc and the radius matrix R, a symmetric
// E with |Eᵢⱼ| ≤ Rᵢⱼ has ‖E‖₂ ≤ ‖E‖∞ ≤ ρ = maxᵢ Σⱼ Rᵢⱼ, so
// λmin(Mc + E) ≥ λmin(Mc) − ρ > 0 when Mc − ρI is positive definite, which
// exact LDLᵀ decides (all pivots > 0).
func PositiveDefiniteOn(e [][]poly.Interval) bool {
	n := len(e)
	mc := make([][]*big.Rat, n)
	rho := new(big.Rat)
	half := big.NewRat(1, 2)
	for i := range e {
		mc[i] = make([]*big.Rat, n)
		row := new(big.Rat)
		for j := range e[i] {
			x := e[i][j]
			if x.Lo.Inf == 0 && x.Hi.Inf == 0 && (x.Lo.Value == x.Hi.Value || x.Lo.Value.Cmp(x.Hi.Value) == 0) {
				// A point: its own midpoint, radius 0.
				mc[i][j] = new(big.Rat).Set(x.Lo.Value)
				continue
			}
			w, ok := x.Width()
			if !ok {
				return false
			}
			mc[i][j] = x.Mid()
			poly.AddRat(row, row, poly.MulRat(w, w, half))
		}
		if row.Cmp(rho) > 0 {
			rho = row
		}
	}
	for i := range mc {
		poly.SubRat(mc[i][i], mc[i][i], rho)
	}
	k, _ := poly.FirstNonPositivePivot(mc)
	return k < 0
}

// IntervalText returns the closed interval [lo, hi] of a certificate.
func IntervalText(x poly.Interval) [2]string {
	return [2]string{poly.RatString(x.Lo.Value), poly.RatString(x.Hi.Value)}
}

// BoxText is how the system section restates the equilibrium of a box
// certificate: "[lo, hi]".
func BoxText(x [2]string) string { return "[" + x[0] + ", " + x[1] + "]" }

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
	g, err := EquilibriumEquations(m.F, m.Discrete)
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
	k := KrawczykImage(g, box, y)
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
	e := DecayEnclosure(f, m.Discrete, p, box)
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
	if !c.add("decay", PositiveDefiniteOn(e), "M = %s is positive definite at the equilibrium (midpoint minus row-sum radius, exact LDLᵀ)", mname) {
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
