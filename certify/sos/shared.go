package sos

import (
	"fmt"
	"math"
	"math/big"

	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/poly"
)

// AddExp returns the exponent of the product of the monomials a and b.
func AddExp(a, b []int) []int {
	e := make([]int, len(a))
	for i := range e {
		e[i] = a[i] + b[i]
	}
	return e
}

// Rows numbers the equations of an SDP by the monomial each equates:
// Row adds an equation (an empty row of A, b = 0) the first time it meets
// a monomial, and returns its index.
type Rows struct {
	Prob  *sdp.Problem
	Index map[string]int // by Key of the exponent
}

// NewRows numbers the equations of prob, which has none yet.
func NewRows(prob *sdp.Problem) *Rows { return &Rows{Prob: prob, Index: map[string]int{}} }

// Row returns the index of the equation of the monomial with exponent e.
func (r *Rows) Row(e []int) int {
	k := Key(e)
	if i, ok := r.Index[k]; ok {
		return i
	}
	r.Index[k] = len(r.Prob.A)
	r.Prob.A = append(r.Prob.A, nil)
	r.Prob.B = append(r.Prob.B, 0)
	return r.Index[k]
}

// RoundBlock rounds the symmetric part of an SDP block to multiples of
// 2^−bits, exactly (a float64 times a power of two is a dyadic rational).
func RoundBlock(x sdp.Block, bits int) [][]*big.Rat {
	n := x.N
	g := make([][]*big.Rat, n)
	for i := range g {
		g[i] = make([]*big.Rat, n)
	}
	for i := range n {
		for j := i; j < n; j++ {
			v := math.Round(math.Ldexp((x.At(i, j)+x.At(j, i))/2, bits))
			q := new(big.Rat).SetFloat64(math.Ldexp(v, -bits))
			g[i][j], g[j][i] = q, q
		}
	}
	return g
}

// ProjectOnto moves g onto the affine family of Gram matrices of r in the
// monomial basis z (Peyrl & Parrilo 2008, through Gram.Project): zᵀgz = r
// exactly afterwards. It is false, and g unchanged, when a term of r is no
// product of two basis elements.
func ProjectOnto(g [][]*big.Rat, z [][]int, r *poly.Poly) bool {
	fam := &Gram{Basis: z}
	at := map[string]int{}
	for a := range z {
		for b := a; b < len(z); b++ {
			e := AddExp(z[a], z[b])
			k := fmt.Sprint(e)
			i, ok := at[k]
			if !ok {
				i, at[k] = len(fam.Classes), len(fam.Classes)
				fam.Classes = append(fam.Classes, Class{Exp: e})
			}
			fam.Classes[i].Pairs = append(fam.Classes[i].Pairs, [2]int{a, b})
			fam.Classes[i].Count += map[bool]int{true: 1, false: 2}[a == b]
		}
	}
	coef := make([]*big.Rat, len(fam.Classes))
	for i := range coef {
		coef[i] = new(big.Rat)
	}
	for _, t := range r.Terms() {
		i, ok := at[fmt.Sprint(t.Exp)]
		if !ok {
			return false
		}
		coef[i] = t.Coef
	}
	fam.Project(g, coef)
	return true
}

// Degree is the total degree of the monomial with exponent e.
func Degree(e []int) int {
	s := 0
	for _, k := range e {
		s += k
	}
	return s
}

// Monomials lists the exponents of the monomials in n variables of total
// degree lo to hi, by degree, and within a degree with the first exponent
// falling (then the second, and so on).
func Monomials(n, lo, hi int) [][]int {
	var out [][]int
	e := make([]int, n)
	var walk func(i, left int)
	walk = func(i, left int) {
		if i == n-1 {
			e[i] = left
			out = append(out, append([]int(nil), e...))
			return
		}
		for k := left; k >= 0; k-- {
			e[i] = k
			walk(i+1, left-k)
		}
	}
	for d := lo; d <= hi; d++ {
		walk(0, d)
	}
	return out
}
