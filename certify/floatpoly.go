package certify

import (
	"math"

	"github.com/lyacert/lyacert/poly"
)

// FloatPoly is a polynomial with float64 coefficients, for proposals
// (Newton steps, search directions) and pictures only: nothing it computes
// decides anything.
type FloatPoly struct {
	coef []float64
	exp  [][]int
}

// NewFloatPoly rounds p's coefficients to float64, keeping the exponents of
// its first n variables (all of them when n ≤ 0); the others must not occur.
func NewFloatPoly(p *poly.Poly, n int) FloatPoly {
	var f FloatPoly
	for _, t := range p.Terms() {
		c, _ := t.Coef.Float64()
		e := t.Exp
		if n > 0 {
			e = e[:n]
		}
		f.coef = append(f.coef, c)
		f.exp = append(f.exp, e)
	}
	return f
}

// Eval returns f at x.
func (f FloatPoly) Eval(x []float64) float64 {
	s := 0.0
	for k, c := range f.coef {
		v := c
		for i, e := range f.exp[k] {
			for ; e > 0; e-- {
				v *= x[i]
			}
		}
		s += v
	}
	return s
}

// Magnitude returns Σ |terms| at x, the scale against which a residual is
// small.
func (f FloatPoly) Magnitude(x []float64) float64 {
	s := 0.0
	for k, c := range f.coef {
		v := math.Abs(c)
		for i, e := range f.exp[k] {
			v *= math.Pow(math.Abs(x[i]), float64(e))
		}
		s += v
	}
	return s
}
