package poly

import (
	"errors"
	"fmt"
	"math/big"
)

// CenteredForm is a polynomial on a box, written in the box's normalized
// coordinates: for a box with centre c and half-widths h (one per
// coordinate),
//
//	p(c + h∘t) = Scale · Σ_α A_α t^α   for t in [-1, 1]^n,
//
// with integer coefficients A_α and a positive rational Scale. This is the
// Taylor expansion of p at the centre of the box, exact. Its natural interval
// extension over [-1, 1]^n,
//
//	Scale · [A_0 − Σ_α m_α, A_0 + Σ_α M_α],
//
// where a term with an odd exponent ranges over [−|A_α|, |A_α|] and a term
// with only even exponents over [min(0, A_α), max(0, A_α)], is the centred
// (Taylor) form of Moore 1966 and Ratschek & Rokne 1984: it encloses the
// range of p on the box, and its overestimation shrinks with the square of
// the box's width, where the natural extension of p in its own variables
// overestimates in proportion to the width.
//
// Halving a box is exact and cheap: the form on the lower or upper half
// along coordinate j follows by the substitution t_j → (t_j ∓ 1)/2, that is,
// a Taylor shift by ∓1 of integer polynomials in t_j after scaling by powers
// of two (Half). A bisection tree of boxes can therefore be walked with
// integer additions and shifts only.
//
// Ends of the box may be open (a strict assumption such as g > 0 that meets
// the box): OpenFaces says which faces of [-1, 1]^n are not part of the set,
// and PositiveOn and Enclose take them into account exactly.
//
// The zero value is not usable; build forms with NewCenteredForm and Half.
type CenteredForm struct {
	shape *cfShape
	coef  []big.Int // dense, index Σ α_i·stride_i
	// Scale = base · 2^exp2; base is shared with the root form.
	base *big.Rat
	exp2 int
}

// cfShape is what all forms descended from one root share.
type cfShape struct {
	deg    []int   // degree in each coordinate
	stride []int   // index stride of each coordinate
	exps   [][]int // exponent vector of each dense index
	odd    []bool  // whether the exponent vector has an odd entry
}

// OpenFaces marks the faces of the box [-1, 1]^n that do not belong to the
// set: bit i of Lo for the face t_i = −1, bit i of Hi for t_i = +1.
type OpenFaces struct{ Lo, Hi uint64 }

// MaxCenteredDims is the largest number of coordinates of a CenteredForm.
const MaxCenteredDims = 64

// NewCenteredForm returns the form of p on the box whose side i is box[i]
// for variable vars[i] of p's ring. The sides must be bounded with lo < hi;
// their openness is ignored here (pass it to PositiveOn and Enclose as
// OpenFaces). It returns an error if p involves a variable outside vars, a
// side is unbounded or a single point, vars has a repeated or out-of-range
// index, or there are more than MaxCenteredDims coordinates.
func NewCenteredForm(p *Poly, vars []int, box []Interval) (*CenteredForm, error) {
	n := len(vars)
	r := p.Ring()
	if len(box) != n {
		return nil, fmt.Errorf("poly: %d sides for %d variables", len(box), n)
	}
	if n > MaxCenteredDims {
		return nil, fmt.Errorf("poly: %d coordinates, at most %d", n, MaxCenteredDims)
	}
	dim := make(map[int]int, n)
	for i, v := range vars {
		if v < 0 || v >= r.NumVars() {
			return nil, fmt.Errorf("poly: variable index %d out of range", v)
		}
		if _, dup := dim[v]; dup {
			return nil, fmt.Errorf("poly: variable %s repeated", r.Name(v))
		}
		dim[v] = i
		w, ok := box[i].Width()
		if !ok || w.Sign() <= 0 {
			return nil, fmt.Errorf("poly: side %s of %s is not a bounded interval of positive width", box[i], r.Name(v))
		}
	}
	for _, v := range p.VarsUsed() {
		if _, ok := dim[v]; !ok {
			return nil, fmt.Errorf("poly: %s involves %s, which is not a side of the box", p, r.Name(v))
		}
	}
	// p(c + h∘t), with t_i written in place of the variable vars[i].
	sub := make([]*Poly, r.NumVars())
	for i, v := range vars {
		c := box[i].Mid()
		h, _ := box[i].Width()
		h.Quo(h, big.NewRat(2, 1))
		sub[v] = new(Poly).Add(Const(r, c), Monomial(r, cfUnitExp(r, v), h))
	}
	q := new(Poly).Compose(p, sub)

	sh := &cfShape{deg: make([]int, n), stride: make([]int, n)}
	for i, v := range vars {
		sh.deg[i] = max(q.DegreeIn(cfUnitMask(r, v)), 0)
	}
	size := 1
	for i := n - 1; i >= 0; i-- {
		sh.stride[i] = size
		size *= sh.deg[i] + 1
		if size*n > 1<<22 {
			return nil, errors.New("poly: centred form too large (degree or dimension)")
		}
	}
	sh.exps = make([][]int, size)
	sh.odd = make([]bool, size)
	for k := range size {
		e := make([]int, n)
		rest := k
		for i := range n {
			e[i] = rest / sh.stride[i]
			rest %= sh.stride[i]
			if e[i]%2 == 1 {
				sh.odd[k] = true
			}
		}
		sh.exps[k] = e
	}
	// Integer coefficients: multiply by the lcm of the denominators.
	lcm := big.NewInt(1)
	g := new(big.Int)
	for _, t := range q.sortedTerms() {
		d := t.Coef.Denom()
		g.GCD(nil, nil, lcm, d)
		lcm.Mul(lcm, new(big.Int).Quo(d, g))
	}
	f := &CenteredForm{shape: sh, coef: make([]big.Int, size), base: new(big.Rat).SetFrac(big.NewInt(1), lcm)}
	for _, t := range q.sortedTerms() {
		k := 0
		for i, v := range vars {
			k += t.Exp[v] * sh.stride[i]
		}
		c := new(big.Int).Mul(t.Coef.Num(), lcm)
		f.coef[k].Quo(c, t.Coef.Denom())
	}
	f.normalize()
	return f, nil
}

func cfUnitExp(r *Ring, v int) []int {
	e := make([]int, r.NumVars())
	e[v] = 1
	return e
}

func cfUnitMask(r *Ring, v int) []bool {
	m := make([]bool, r.NumVars())
	m[v] = true
	return m
}

// NumDims returns the number of coordinates of the box.
func (f *CenteredForm) NumDims() int { return len(f.shape.deg) }

// Scale returns the positive rational Scale of the form.
func (f *CenteredForm) Scale() *big.Rat {
	s := new(big.Rat).Set(f.base)
	p := new(big.Int).Lsh(big.NewInt(1), uint(cfAbs(f.exp2)))
	if f.exp2 >= 0 {
		return s.Mul(s, new(big.Rat).SetInt(p))
	}
	return s.Quo(s, new(big.Rat).SetInt(p))
}

func cfAbs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// Coefficient returns A_α for the exponent vector e (one entry per
// coordinate); zero beyond the degrees.
func (f *CenteredForm) Coefficient(e []int) *big.Int {
	k := 0
	for i, x := range e {
		if x > f.shape.deg[i] {
			return new(big.Int)
		}
		k += x * f.shape.stride[i]
	}
	return new(big.Int).Set(&f.coef[k])
}

// Half sets z to the form of the same polynomial on the lower half
// (upper false) or the upper half (upper true) of x's box along coordinate
// dim, and returns z. z may be x; otherwise z's storage is reused when it
// has the right size.
//
// With t_dim = (u ∓ 1)/2 for u in [-1, 1], each polynomial in t_dim (the
// other exponents fixed), Σ_k a_k t^k, becomes 2^−d · Σ_k (a_k·2^(d−k))·(u ∓ 1)^k
// with d the degree in t_dim: the coefficients are scaled by powers of two
// and Taylor-shifted by ∓1 (Horner's scheme, d(d+1)/2 additions), all in
// integers. A common power of two is then divided out.
func (z *CenteredForm) Half(x *CenteredForm, dim int, upper bool) *CenteredForm {
	sh := x.shape
	if z != x {
		if len(z.coef) != len(x.coef) {
			z.coef = make([]big.Int, len(x.coef))
		}
		for k := range x.coef {
			z.coef[k].Set(&x.coef[k])
		}
		z.shape, z.base, z.exp2 = sh, x.base, x.exp2
	}
	d := sh.deg[dim]
	if d == 0 {
		return z
	}
	st := sh.stride[dim]
	for k := range z.coef {
		if sh.exps[k][dim] != 0 {
			continue // k is the start of a fibre along dim
		}
		for j := 0; j <= d; j++ {
			c := &z.coef[k+j*st]
			c.Lsh(c, uint(d-j))
		}
		for i := 0; i < d; i++ {
			for j := d - 1; j >= i; j-- {
				c, next := &z.coef[k+j*st], &z.coef[k+(j+1)*st]
				if upper {
					c.Add(c, next)
				} else {
					c.Sub(c, next)
				}
			}
		}
	}
	z.exp2 -= d
	z.normalize()
	return z
}

// normalize divides out the largest power of two common to all coefficients.
func (f *CenteredForm) normalize() {
	tz := -1
	for k := range f.coef {
		if f.coef[k].Sign() == 0 {
			continue
		}
		b := int(f.coef[k].TrailingZeroBits())
		if tz < 0 || b < tz {
			tz = b
		}
		if tz == 0 {
			return
		}
	}
	if tz <= 0 {
		return
	}
	for k := range f.coef {
		f.coef[k].Rsh(&f.coef[k], uint(tz))
	}
	f.exp2 += tz
}

// bounds returns the integer ends A_0 − Σ m_α and A_0 + Σ M_α of the natural
// extension over the closed box [-1, 1]^n (before Scale).
func (f *CenteredForm) bounds() (lo, hi *big.Int) {
	lo, hi = new(big.Int).Set(&f.coef[0]), new(big.Int).Set(&f.coef[0])
	for k := 1; k < len(f.coef); k++ {
		c := &f.coef[k]
		switch s := c.Sign(); {
		case s == 0:
		case f.shape.odd[k]:
			if s > 0 {
				lo.Sub(lo, c)
				hi.Add(hi, c)
			} else {
				lo.Add(lo, c)
				hi.Sub(hi, c)
			}
		case s > 0:
			hi.Add(hi, c)
		default:
			lo.Add(lo, c)
		}
	}
	return lo, hi
}

// attained reports whether t^α takes the value v (−1 or +1) on the box
// [-1, 1]^n without the open faces: every coordinate in α's support must sit
// at an end that belongs to the set, and the ends' signs must multiply to v
// over the coordinates with odd exponents.
func (sh *cfShape) attained(k int, v int, open OpenFaces) bool {
	sign := 1
	free := false // some odd coordinate can take either sign
	for i, e := range sh.exps[k] {
		if e == 0 {
			continue
		}
		loOK := open.Lo&(1<<i) == 0
		hiOK := open.Hi&(1<<i) == 0
		switch {
		case !loOK && !hiOK:
			return false
		case e%2 == 0:
		case loOK && hiOK:
			free = true
		case loOK:
			sign = -sign
		}
	}
	return free || sign == v
}

// PositiveOn reports whether the enclosure proves p > 0 at every point of
// the box without the open faces: the lower end of the natural extension
// is > 0, or it is 0 and some term does not attain its minimum on the set
// (then no point attains the sum of the minima).
func (f *CenteredForm) PositiveOn(open OpenFaces) bool {
	lo, _ := f.bounds()
	switch lo.Sign() {
	case 1:
		return true
	case -1:
		return false
	}
	return !f.lowAttained(open)
}

// lowAttained is false when some term provably does not attain its minimum
// on the set (so the lower end is not attained); true otherwise.
func (f *CenteredForm) lowAttained(open OpenFaces) bool {
	for k := 1; k < len(f.coef); k++ {
		s := f.coef[k].Sign()
		switch {
		case s == 0:
		case f.shape.odd[k] && !f.shape.attained(k, -s, open):
			return false
		case !f.shape.odd[k] && s < 0 && !f.shape.attained(k, 1, open):
			return false
		}
	}
	return true
}

func (f *CenteredForm) highAttained(open OpenFaces) bool {
	for k := 1; k < len(f.coef); k++ {
		s := f.coef[k].Sign()
		switch {
		case s == 0:
		case f.shape.odd[k] && !f.shape.attained(k, s, open):
			return false
		case !f.shape.odd[k] && s > 0 && !f.shape.attained(k, 1, open):
			return false
		}
	}
	return true
}

// NonPositive reports whether the enclosure proves p ≤ 0 at every point of
// the closed box (hence of any part of it): the upper end of the natural
// extension is ≤ 0.
func (f *CenteredForm) NonPositive() bool {
	_, hi := f.bounds()
	return hi.Sign() <= 0
}

// Enclose returns the natural extension of the form over the box without
// the open faces, in p's own units: Scale·[A_0 − Σ m_α, A_0 + Σ M_α]. An
// end is open when some term provably does not attain its extreme on the
// set; otherwise it is closed (which may include a value that p does not
// take: the result is an enclosure, IEEE 1788-2015 containment).
func (f *CenteredForm) Enclose(open OpenFaces) Interval {
	lo, hi := f.bounds()
	s := f.Scale()
	l := new(big.Rat).Mul(new(big.Rat).SetInt(lo), s)
	h := new(big.Rat).Mul(new(big.Rat).SetInt(hi), s)
	return Interval{ivFin(l, !f.lowAttained(open)), ivFin(h, !f.highAttained(open))}
}
