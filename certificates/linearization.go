package certificates

import (
	"fmt"
	"math/big"

	"lyacert/poly"
)

// ClaimUnstable is the claim of a linearization certificate that proves an
// equilibrium unstable (its verdict is VerdictFails: stability fails).
const ClaimUnstable = "unstable"

// Linearization certifies the stability or the instability of one
// equilibrium of a model without free parameters through its linearization
// (Lyapunov's indirect method). The equilibrium x* is either the model's
// "at" point, which must be a rational zero of the equations (Box empty), or
// the unique equilibrium in Box, proven by the Krawczyk test (Krawczyk 1969;
// Moore 1977); the model then has no "at" line and the system's equilibrium
// restates the box.
//
// With J(x) the Jacobian of the right-hand side f, Decay encloses over the
// box (or gives at the point) the symmetric matrix
//
//	M(x) = −(J(x)ᵀP + P·J(x))   (continuous time)
//	M(x) = P − J(x)ᵀP·J(x)      (discrete time)
//
// Verify requires M(x*) ≻ 0 and then derives the claim from P: P ≻ 0 gives
// local asymptotic stability (V = (x − x*)ᵀP(x − x*) decreases near x*);
// a negative LDLᵀ pivot of P gives instability (W = −V increases near x* and
// is positive arbitrarily close to it: Lyapunov's instability theorem).
//
// Every number must be in math/big's canonical form (RatString), so that a
// number has exactly one text. Box, Krawczyk and Decay must equal Verify's
// own recomputation, so that no stated number can change unnoticed.
type Linearization struct {
	// Box is one closed interval [lo, hi] per state, lo < hi.
	Box [][2]string `json:"box,omitempty"`
	// Preconditioner is the rational matrix Y of the Krawczyk operator.
	Preconditioner [][]string `json:"preconditioner,omitempty"`
	// Krawczyk is K(Box), which must lie in the interior of Box.
	Krawczyk [][2]string `json:"krawczyk,omitempty"`
	// P is the symmetric matrix of the quadratic form.
	P [][]string `json:"p"`
	// Decay is the entrywise enclosure [lo, hi] of M over the box (at a
	// rational point lo = hi).
	Decay [][][2]string `json:"decay"`
}

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

// Jacobian returns ∂gᵢ/∂xⱼ for the first len(g) variables (the states).
func Jacobian(g []*poly.Poly) [][]*poly.Poly {
	n := len(g)
	j := make([][]*poly.Poly, n)
	for i := range g {
		j[i] = make([]*poly.Poly, n)
		for k := 0; k < n; k++ {
			j[i][k] = new(poly.Poly).Derivative(g[i], k)
		}
	}
	return j
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
	jac := Jacobian(g)
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
	jac := Jacobian(f)
	if pt, ok := boxPoint(box); ok {
		// At a point the enclosure is the exact value; evaluate J first.
		j := make([][]*big.Rat, n)
		for i := range jac {
			j[i] = make([]*big.Rat, n)
			for k := range jac[i] {
				j[i][k] = jac[i][k].Eval(pt)
			}
		}
		m := DecayAt(j, discrete, p)
		out := make([][]poly.Interval, n)
		for i := range m {
			out[i] = make([]poly.Interval, n)
			for k := range m[i] {
				out[i][k] = poly.Point(m[i][k])
			}
		}
		return out
	}
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

// boxPoint returns the point of a box of single points.
func boxPoint(box []poly.Interval) ([]*big.Rat, bool) {
	pt := make([]*big.Rat, len(box))
	for i, iv := range box {
		if iv.Lo.Inf != 0 || iv.Hi.Inf != 0 || iv.Lo.Value.Cmp(iv.Hi.Value) != 0 {
			return nil, false
		}
		pt[i] = iv.Lo.Value
	}
	return pt, true
}

// DecayAt returns M = −(JᵀP + PJ) (continuous time) or P − JᵀPJ (discrete
// time) for rational matrices J and P, exactly.
func DecayAt(j [][]*big.Rat, discrete bool, p [][]*big.Rat) [][]*big.Rat {
	n := len(j)
	pj := make([][]*big.Rat, n) // P·J
	for i := 0; i < n; i++ {
		pj[i] = make([]*big.Rat, n)
		for k := 0; k < n; k++ {
			s := new(big.Rat)
			t := new(big.Rat)
			for l := 0; l < n; l++ {
				if p[i][l].Sign() != 0 && j[l][k].Sign() != 0 {
					poly.AddRat(s, s, poly.MulRat(t, p[i][l], j[l][k]))
				}
			}
			pj[i][k] = s
		}
	}
	m := make([][]*big.Rat, n)
	for i := range m {
		m[i] = make([]*big.Rat, n)
	}
	t := new(big.Rat)
	for i := 0; i < n; i++ {
		for k := i; k < n; k++ {
			v := new(big.Rat)
			if discrete {
				// (JᵀPJ)ᵢₖ = Σₗ Jₗᵢ (PJ)ₗₖ
				for l := 0; l < n; l++ {
					if j[l][i].Sign() != 0 {
						poly.SubRat(v, v, poly.MulRat(t, j[l][i], pj[l][k]))
					}
				}
				poly.AddRat(v, v, p[i][k])
			} else {
				// (JᵀP)ᵢₖ = (PJ)ₖᵢ
				v.Neg(poly.AddRat(v, pj[k][i], pj[i][k]))
			}
			m[i][k], m[k][i] = v, v
		}
	}
	return m
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
	k, _ := nonPositivePivot(mc) // mc is this function's own copy
	return k < 0
}

// FirstNonPositivePivot runs exact LDLᵀ without pivoting on the symmetric
// rational matrix a and returns the index of the first pivot that is ≤ 0 with
// that pivot, or −1 and nil when every pivot is positive (a ≻ 0, Sylvester's
// criterion: the pivots are the ratios of consecutive leading minors). A
// negative first non-positive pivot dₖ means yᵀay = dₖ < 0 for some y, so a
// is not positive semidefinite. a is not modified.
func FirstNonPositivePivot(a [][]*big.Rat) (int, *big.Rat) {
	n := len(a)
	w := make([][]*big.Rat, n)
	for i := range a {
		w[i] = make([]*big.Rat, n)
		for j := range a[i] {
			w[i][j] = new(big.Rat).Set(a[i][j])
		}
	}
	return nonPositivePivot(w)
}

// nonPositivePivot is FirstNonPositivePivot overwriting w with the Schur
// complements.
func nonPositivePivot(w [][]*big.Rat) (int, *big.Rat) {
	n := len(w)
	t := new(big.Rat)
	for k := 0; k < n; k++ {
		d := w[k][k]
		if d.Sign() <= 0 {
			return k, new(big.Rat).Set(d)
		}
		// Schur complement: w[i][j] −= w[i][k]·w[k][j]/d for i, j > k.
		for i := k + 1; i < n; i++ {
			if w[i][k].Sign() == 0 {
				continue
			}
			l := poly.QuoRat(new(big.Rat), w[i][k], d)
			for j := k + 1; j < n; j++ {
				poly.SubRat(w[i][j], w[i][j], poly.MulRat(t, l, w[k][j]))
			}
		}
	}
	return -1, nil
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

// linearization checks a Linearization certificate; run calls it after the
// system section has been compared with the model.
func (c *checker) linearization() {
	d, lz, m := c.doc, c.doc.Linearization, c.m
	n := len(m.States)
	if !c.add("linearization", len(m.FreeParams()) == 0, "the model has no free parameters (the certificate is about one parameter point)") {
		return
	}
	bare := d.V == "" && d.Vdot == "" && len(d.Forms) == 0 && len(d.Conditions) == 0 && d.Region == nil &&
		len(d.Witnesses) == 0 && d.Refutation == nil && len(d.Kernel) == 0
	if !c.add("linearization", bare, "no candidate V, forms, conditions, region, witnesses, refutation or kernel beside the linearization") {
		return
	}
	if !c.add("linearization", m.V == nil, "the model states no candidate V") {
		return
	}
	g, err := EquilibriumEquations(m.F, m.Discrete)
	if !c.add("linearization", err == nil, "the equations are polynomials%s", errSuffix(err)) {
		return
	}
	f := make([]*poly.Poly, n)
	for i := range m.F {
		f[i] = m.F[i].Num
	}
	readMatrix := func(what string, rows [][]string) ([][]*big.Rat, bool) {
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
	readIntervals := func(what string, ivs [][2]string) ([]poly.Interval, bool) {
		out := make([]poly.Interval, len(ivs))
		for i, iv := range ivs {
			lo, ok1 := canonicalRat(iv[0])
			hi, ok2 := canonicalRat(iv[1])
			if !c.add("linearization", ok1 && ok2 && lo.Cmp(hi) <= 0, "%s %d = [%s, %s] is an interval with canonical rational ends", what, i+1, iv[0], iv[1]) {
				return nil, false
			}
			out[i] = poly.Closed(lo, hi)
		}
		return out, true
	}
	sameIntervals := func(a [2]string, b poly.Interval) bool {
		t := IntervalText(b)
		return !b.Lo.Open && !b.Hi.Open && a == t
	}

	var box []poly.Interval
	if len(lz.Box) == 0 {
		// The equilibrium is the model's point, rational and exact.
		if !c.add("linearization", len(lz.Preconditioner) == 0 && len(lz.Krawczyk) == 0, "no Krawczyk data without a box") {
			return
		}
		err := m.CheckEquilibrium()
		what := "f(x*) = 0"
		if m.Discrete {
			what = "f(x*) = x*"
		}
		if !c.add("equilibrium", err == nil, "%s exactly at the stated point%s", what, errSuffix(err)) {
			return
		}
		zero := make([]*big.Rat, m.Ring.NumVars())
		for i := range zero {
			zero[i] = new(big.Rat)
		}
		box = make([]poly.Interval, n)
		for i := range box {
			v, err := m.At[i].Eval(zero)
			if !c.add("equilibrium", err == nil, "the point is defined") {
				return
			}
			box[i] = poly.Point(v)
		}
	} else {
		if !c.add("linearization", !m.AtGiven, "a box certificate's model names no point equilibrium") ||
			!c.add("linearization", len(lz.Box) == n, "the box has one interval per state") {
			return
		}
		var ok bool
		if box, ok = readIntervals("box interval", lz.Box); !ok {
			return
		}
		for i, iv := range box {
			w, _ := iv.Width()
			if !c.add("linearization", w.Sign() > 0, "box interval %d has positive width", i+1) {
				return
			}
			if !c.add("system", d.System.Equilibrium[i] == BoxText(lz.Box[i]), "the system's equilibrium coordinate %s restates the box", m.States[i]) {
				return
			}
		}
		y, ok := readMatrix("the preconditioner", lz.Preconditioner)
		if !ok || !c.add("krawczyk", len(lz.Krawczyk) == n, "K(X) has one interval per state") {
			return
		}
		k := KrawczykImage(g, box, y)
		for i := range k {
			if !c.add("krawczyk", sameIntervals(lz.Krawczyk[i], k[i]), "K(X) component %d equals the recomputed %s", i+1, k[i]) {
				return
			}
			inside := k[i].Lo.Value.Cmp(box[i].Lo.Value) > 0 && k[i].Hi.Value.Cmp(box[i].Hi.Value) < 0
			if !c.add("krawczyk", inside, "K(X) component %d lies in the interior of the box (Krawczyk: exactly one equilibrium in X)", i+1) {
				return
			}
		}
	}

	p, ok := readMatrix("P", lz.P)
	if !ok {
		return
	}
	for i := range p {
		for j := range i {
			if !c.add("linearization", p[i][j].Cmp(p[j][i]) == 0, "P is symmetric (entry %d,%d)", i+1, j+1) {
				return
			}
		}
	}
	if !c.add("decay", len(lz.Decay) == n, "the enclosure of M has %d rows", n) {
		return
	}
	e := DecayEnclosure(f, m.Discrete, p, box)
	mname := "−(JᵀP + PJ)"
	if m.Discrete {
		mname = "P − JᵀPJ"
	}
	for i := range e {
		if !c.add("decay", len(lz.Decay[i]) == n, "row %d of the enclosure of M has %d entries", i+1, n) {
			return
		}
		for j := range e[i] {
			if !c.add("decay", sameIntervals(lz.Decay[i][j], e[i][j]), "M = %s entry (%d,%d) equals the recomputed %s", mname, i+1, j+1, e[i][j]) {
				return
			}
		}
	}
	if !c.add("decay", PositiveDefiniteOn(e), "M = %s is positive definite at the equilibrium (midpoint minus row-sum radius, exact LDLᵀ)", mname) {
		return
	}
	k, pivot := FirstNonPositivePivot(p)
	claim, verdict := ClaimLocal, VerdictHolds
	switch {
	case k < 0:
	case pivot.Sign() < 0:
		claim, verdict = ClaimUnstable, VerdictFails
	default:
		c.add("claim", false, "P has a zero pivot (%d): neither stability nor instability follows", k+1)
		return
	}
	if !c.add("claim", d.Claim == claim && d.Verdict == verdict,
		"P ≻ 0 gives local asymptotic stability, a negative pivot of P instability: claim %q with verdict %q (stated %q, %q)", claim, verdict, d.Claim, d.Verdict) {
		return
	}
	digest, err := d.ComputeDigest()
	c.add("digest", err == nil && digest == d.Digest, "the SHA-256 digest of the canonical serialization matches")
}
