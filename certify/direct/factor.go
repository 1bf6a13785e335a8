package direct

import (
	"math/big"
	"sort"

	"github.com/lyacert/lyacert/poly"
)

// PowerFactor is one factor of a factorization, raised to Power >= 1.
type PowerFactor struct {
	P     *poly.Poly
	Power int
}

// Factorize writes a polynomial in the parameters as c·Π fᵢ^mᵢ with a
// rational constant c and primitive, non-constant fᵢ with positive leading
// coefficients. It finds every factor that is a single variable, every
// rational linear factor t − ρ of a polynomial in one variable t (rational
// root theorem) together with the square-free decomposition of what remains
// (Yun's algorithm), and, in several variables, the linear factors t − ρ in
// any one variable t whose roots ρ are rational constants. What is left is
// returned as one factor; the factorization is exact but need not be into
// irreducibles. The zero polynomial gives c = 0 and no factors.
func Factorize(p *poly.Poly) (*big.Rat, []PowerFactor) {
	if p.IsZero() {
		return new(big.Rat), nil
	}
	if p.IsConst() {
		return p.ConstTerm(), nil
	}
	c, q := p.PrimitivePart()
	r := p.Ring()
	var out []PowerFactor
	// Monomial content: each variable separately.
	minExp := make([]int, r.NumVars())
	for i, t := range q.Terms() {
		for j, e := range t.Exp {
			if i == 0 || e < minExp[j] {
				minExp[j] = e
			}
		}
	}
	for j, m := range minExp {
		if m > 0 {
			out = append(out, PowerFactor{poly.Var(r, j), m})
			e := make([]int, r.NumVars())
			e[j] = m
			q.DivExact(q, poly.Monomial(r, e, big.NewRat(1, 1)))
		}
	}
	if !q.IsConst() {
		out = append(out, splitFactors(q)...)
	}
	// Normalize every factor to primitive with positive leading coefficient
	// and merge equal factors; the constant is then p's leading coefficient
	// over the product's, and the product is checked to be exact.
	var merged []PowerFactor
	for _, f := range out {
		_, g := f.P.PrimitivePart()
		found := false
		for i := range merged {
			if merged[i].P.Equal(g) {
				merged[i].Power += f.Power
				found = true
			}
		}
		if !found {
			merged = append(merged, PowerFactor{g, f.Power})
		}
	}
	prod := poly.ConstInt(r, 1)
	for _, f := range merged {
		prod.Mul(prod, new(poly.Poly).Pow(f.P, f.Power))
	}
	c = new(big.Rat).Quo(p.Lead().Coef, prod.Lead().Coef)
	if !new(poly.Poly).Scale(prod, c).Equal(p) {
		panic("certify: inexact factorization of " + p.String())
	}
	sort.SliceStable(merged, func(i, j int) bool {
		di, dj := merged[i].P.Degree(), merged[j].P.Degree()
		if di != dj {
			return di < dj
		}
		return merged[i].P.String() < merged[j].P.String()
	})
	return c, merged
}

// splitFactors factors a primitive polynomial without monomial content.
func splitFactors(q *poly.Poly) []PowerFactor {
	r := q.Ring()
	vars := q.VarsUsed()
	if len(vars) == 1 {
		u, _ := q.Univariate(vars[0])
		return univariateFactors(r, vars[0], u)
	}
	var out []PowerFactor
	rest := q.Clone()
	for _, v := range vars {
		for _, root := range candidateRoots(rest, v) {
			lin := linear(r, v, root)
			for {
				var quo poly.Poly
				if !quo.DivExact(rest, lin) {
					break
				}
				rest = quo.Clone()
				if n := len(out); n > 0 && out[n-1].P.Equal(lin) {
					out[n-1].Power++
				} else {
					out = append(out, PowerFactor{lin, 1})
				}
			}
		}
	}
	if !rest.IsConst() {
		out = append(out, PowerFactor{rest, 1})
	}
	return out
}

// linear returns den·t − num for the rational ρ = num/den.
func linear(r *poly.Ring, v int, rho *big.Rat) *poly.Poly {
	t := new(poly.Poly).Scale(poly.Var(r, v), new(big.Rat).SetInt(rho.Denom()))
	return t.Sub(t, poly.Const(r, new(big.Rat).SetInt(rho.Num())))
}

// candidateRoots returns rational ρ for which t − ρ may divide q: the
// rational roots of q with the other variables set to small primes.
func candidateRoots(q *poly.Poly, v int) []*big.Rat {
	vals := map[int]*big.Rat{}
	primes := []int64{3, 7, 11, 13, 17, 19, 23, 29, 31, 37}
	k := 0
	for _, w := range q.VarsUsed() {
		if w != v {
			vals[w] = big.NewRat(primes[k%len(primes)], 1)
			k++
		}
	}
	s := new(poly.Poly).EvalVars(q, vals)
	u, ok := s.Univariate(v)
	if !ok || u.Degree() < 1 {
		return nil
	}
	return u.RationalRoots()
}

// univariateFactors splits u (in variable v) into rational linear factors
// with multiplicity and the square-free parts of the rest (Yun 1976).
func univariateFactors(r *poly.Ring, v int, u poly.Univariate) []PowerFactor {
	var out []PowerFactor
	if roots, ok := u.SquareFreeRationalRoots(); ok {
		// Square-free (shown modulo a prime): every root is simple, and
		// what remains after the linear factors is its own square-free
		// decomposition, so Yun's gcds over Q are not needed.
		for _, rho := range roots {
			u, _ = u.DivMod(poly.NewUnivariate(new(big.Rat).Neg(rho), big.NewRat(1, 1)))
			out = append(out, PowerFactor{linear(r, v, rho), 1})
		}
		if u.Degree() >= 1 {
			out = append(out, PowerFactor{poly.FromUnivariate(r, v, u.Monic()), 1})
		}
		return out
	}
	for _, rho := range u.RationalRoots() {
		lin := poly.NewUnivariate(new(big.Rat).Neg(rho), big.NewRat(1, 1))
		m := 0
		for {
			quo, rem := u.DivMod(lin)
			if !rem.IsZero() {
				break
			}
			u = quo
			m++
		}
		out = append(out, PowerFactor{linear(r, v, rho), m})
	}
	if u.Degree() < 1 {
		return out
	}
	// Yun's square-free decomposition of the rest: u = lead·Π aᵢ^i.
	u = u.Monic()
	d := u.Derivative()
	a := poly.UnivariateGCD(u, d)
	b, _ := u.DivMod(a)
	cc, _ := d.DivMod(a)
	dd := cc.Sub(b.Derivative())
	for i := 1; b.Degree() >= 1; i++ {
		g := poly.UnivariateGCD(b, dd)
		if g.Degree() >= 1 {
			out = append(out, PowerFactor{poly.FromUnivariate(r, v, g), i})
		}
		b, _ = b.DivMod(g)
		cc, _ = dd.DivMod(g)
		dd = cc.Sub(b.Derivative())
	}
	return out
}
