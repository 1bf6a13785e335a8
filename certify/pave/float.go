package pave

import (
	"math"

	"github.com/lyacert/lyacert/certify/interval"
	"github.com/lyacert/lyacert/poly"
)

// floatPoly is a condition in float64 intervals over the paved coordinates:
// its terms, and the terms of each partial derivative, for the natural
// extension and the mean-value form.
type floatPoly struct {
	terms []floatTerm
	grad  [][]floatTerm
}

type floatTerm struct {
	c interval.F // encloses the exact coefficient
	e []int      // exponent of each paved coordinate
}

func newFloatPoly(p *poly.Poly, vars []int) floatPoly {
	fp := floatPoly{terms: floatTerms(p, vars)}
	for _, v := range vars {
		fp.grad = append(fp.grad, floatTerms(new(poly.Poly).Derivative(p, v), vars))
	}
	return fp
}

func floatTerms(p *poly.Poly, vars []int) []floatTerm {
	var out []floatTerm
	for _, t := range p.Terms() {
		e := make([]int, len(vars))
		for i, v := range vars {
			e[i] = t.Exp[v]
		}
		out = append(out, floatTerm{interval.FromRat(t.Coef), e})
	}
	return out
}

// powers[i][e] encloses x_i^e.
type powers [][]interval.F

func powersOf(x []interval.F, deg int) powers {
	ps := make(powers, len(x))
	for i, xi := range x {
		ps[i] = make([]interval.F, deg+1)
		ps[i][0] = interval.F{Lo: 1, Hi: 1}
		for e := 1; e <= deg; e++ {
			ps[i][e] = xi.Pow(e)
		}
	}
	return ps
}

// natural is the natural interval extension of the terms (Moore 1966): every
// operation rounded outward, so it contains the exact range.
func natural(ts []floatTerm, ps powers) interval.F {
	sum := interval.F{}
	for _, t := range ts {
		v := t.c
		for i, e := range t.e {
			if e > 0 {
				v = v.Mul(ps[i][e])
			}
		}
		sum = sum.Add(v)
	}
	return sum
}

// enclose returns an enclosure of p on the box x: the natural extension
// intersected with the mean-value form p(m) + Σ ∂p/∂xᵢ(x)·(xᵢ − mᵢ) at a
// point m of x (mean value theorem: x and m lie in the convex box, so the
// segment between them does). Both contain the range, so their
// intersection does; it is never empty for a valid input.
func (fp floatPoly) enclose(x []interval.F, ps, pm powers) interval.F {
	nat := natural(fp.terms, ps)
	mv := natural(fp.terms, pm)
	for i, g := range fp.grad {
		if len(g) == 0 {
			continue
		}
		m := pm[i][1]
		mv = mv.Add(natural(g, ps).Mul(x[i].Sub(m)))
	}
	lo, hi := math.Max(nat.Lo, mv.Lo), math.Min(nat.Hi, mv.Hi)
	if lo > hi { // cannot happen for sound enclosures; keep the natural one
		return nat
	}
	return interval.F{Lo: lo, Hi: hi}
}

// maxDegree returns the largest exponent of any coordinate in the terms.
func maxDegree(fps []floatPoly) int {
	d := 1
	for _, fp := range fps {
		for _, t := range fp.terms {
			for _, e := range t.e {
				d = max(d, e)
			}
		}
	}
	return d
}
