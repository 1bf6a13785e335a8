package poly

import (
	"cmp"
	"fmt"
	"math/big"
	"slices"
	"strings"
)

// Ring is an ordered list of variable names: the states of a model first,
// then its parameters. Every Poly belongs to one Ring; operations on
// polynomials of different rings panic (a programmer error).
type Ring struct {
	names   []string
	index   map[string]int
	nstates int
	zeroKey string // key of the constant monomial
}

// NewRing returns the ring with the given states followed by the parameters.
// Names must be distinct; a repeated name panics.
func NewRing(states, params []string) *Ring {
	r := &Ring{index: make(map[string]int), nstates: len(states)}
	for _, n := range slices.Concat(states, params) {
		if _, dup := r.index[n]; dup {
			panic("poly: repeated variable " + n)
		}
		r.index[n] = len(r.names)
		r.names = append(r.names, n)
	}
	r.zeroKey = string(make([]byte, 2*len(r.names)))
	return r
}

// NumVars returns the number of variables.
func (r *Ring) NumVars() int { return len(r.names) }

// NumStates returns the number of state variables (the first ones).
func (r *Ring) NumStates() int { return r.nstates }

// Name returns the name of variable i.
func (r *Ring) Name(i int) string { return r.names[i] }

// Names returns a copy of all variable names in order.
func (r *Ring) Names() []string { return slices.Clone(r.names) }

// Index returns the index of the named variable.
func (r *Ring) Index(name string) (int, bool) {
	i, ok := r.index[name]
	return i, ok
}

// IsState reports whether variable i is a state.
func (r *Ring) IsState(i int) bool { return i < r.nstates }

// Term is one coefficient times a monomial; Exp has one exponent per ring variable.
type Term struct {
	Exp  []int
	Coef *big.Rat
}

// Poly is a sparse multivariate polynomial with exact rational coefficients.
// Methods follow math/big: the receiver holds the result and is returned;
// operands may alias the receiver. A nil *Poly is never valid; use Zero.
type Poly struct {
	ring *Ring
	// terms maps encoded exponents to non-zero coefficients. Once the
	// operation that built it has returned, neither the map nor any
	// coefficient in it is ever modified: every operation builds a new map
	// and assigns it to its receiver. Polynomials may therefore share maps
	// and coefficients, which makes Set and Clone cheap.
	terms map[string]*big.Rat
}

// Zero returns the zero polynomial of r.
func Zero(r *Ring) *Poly { return &Poly{ring: r, terms: map[string]*big.Rat{}} }

// Const returns the constant polynomial c.
func Const(r *Ring, c *big.Rat) *Poly {
	p := Zero(r)
	if c.Sign() != 0 {
		p.terms[r.zeroKey] = new(big.Rat).Set(c)
	}
	return p
}

// ConstInt returns the constant polynomial n.
func ConstInt(r *Ring, n int64) *Poly {
	p := Zero(r)
	if n != 0 {
		p.terms[r.zeroKey] = new(big.Rat).SetInt64(n)
	}
	return p
}

// Var returns the polynomial consisting of variable i.
func Var(r *Ring, i int) *Poly {
	e := make([]int, r.NumVars())
	e[i] = 1
	p := Zero(r)
	p.terms[key(e)] = new(big.Rat).SetInt64(1)
	return p
}

// Monomial returns c times the monomial with exponents e.
func Monomial(r *Ring, e []int, c *big.Rat) *Poly {
	if len(e) != r.NumVars() {
		panic("poly: exponent vector length mismatch")
	}
	p := Zero(r)
	if c.Sign() != 0 {
		p.terms[key(e)] = new(big.Rat).Set(c)
	}
	return p
}

// Ring returns the ring of p.
func (p *Poly) Ring() *Ring { return p.ring }

func key(e []int) string {
	b := make([]byte, 2*len(e))
	for i, x := range e {
		if x < 0 || x > 0xffff {
			panic("poly: exponent out of range")
		}
		b[2*i] = byte(x >> 8)
		b[2*i+1] = byte(x)
	}
	return string(b)
}

func unkey(k string) []int {
	e := make([]int, len(k)/2)
	for i := range e {
		e[i] = int(k[2*i])<<8 | int(k[2*i+1])
	}
	return e
}

func (p *Poly) check(q *Poly) {
	if p.ring != q.ring {
		panic("poly: polynomials of different rings")
	}
}

// Set sets z to a copy of x and returns z. The copy shares x's terms, which
// no operation modifies (see Poly), so it costs no allocation of
// coefficients.
func (z *Poly) Set(x *Poly) *Poly {
	z.ring, z.terms = x.ring, x.terms
	return z
}

// Clone returns a copy of p.
func (p *Poly) Clone() *Poly { return new(Poly).Set(p) }

// Add sets z = x + y and returns z.
func (z *Poly) Add(x, y *Poly) *Poly { return z.combine(x, y, 1) }

// Sub sets z = x - y and returns z.
func (z *Poly) Sub(x, y *Poly) *Poly { return z.combine(x, y, -1) }

func (z *Poly) combine(x, y *Poly, sign int) *Poly {
	x.check(y)
	t := make(map[string]*big.Rat, len(x.terms)+len(y.terms))
	// Coefficients are shared where they are not changed (see Poly).
	for k, c := range x.terms {
		t[k] = c
	}
	for k, c := range y.terms {
		s, ok := t[k]
		switch {
		case !ok && sign > 0:
			t[k] = c
		case !ok:
			t[k] = new(big.Rat).Neg(c)
		default:
			var v *big.Rat
			if sign > 0 {
				v = AddRat(new(big.Rat), s, c)
			} else {
				v = SubRat(new(big.Rat), s, c)
			}
			if v.Sign() == 0 {
				delete(t, k)
			} else {
				t[k] = v
			}
		}
	}
	z.ring, z.terms = x.ring, t
	return z
}

// Neg sets z = -x and returns z.
func (z *Poly) Neg(x *Poly) *Poly {
	t := make(map[string]*big.Rat, len(x.terms))
	for k, a := range x.terms {
		t[k] = new(big.Rat).Neg(a)
	}
	z.ring, z.terms = x.ring, t
	return z
}

// Scale sets z = c·x and returns z.
func (z *Poly) Scale(x *Poly, c *big.Rat) *Poly {
	if c.IsInt() && c.Num().IsInt64() {
		switch c.Num().Int64() {
		case 1:
			return z.Set(x)
		case -1:
			return z.Neg(x)
		}
	}
	t := make(map[string]*big.Rat, len(x.terms))
	if c.Sign() != 0 {
		for k, a := range x.terms {
			t[k] = MulRat(new(big.Rat), a, c)
		}
	}
	z.ring, z.terms = x.ring, t
	return z
}

// Mul sets z = x·y and returns z.
func (z *Poly) Mul(x, y *Poly) *Poly {
	x.check(y)
	t := make(map[string]*big.Rat, len(x.terms)*len(y.terms))
	n := x.ring.NumVars()
	buf := make([]byte, 2*n)
	prod := new(big.Rat)
	for kx, cx := range x.terms {
		for ky, cy := range y.terms {
			for i := 0; i < n; i++ {
				e := (int(kx[2*i])<<8 | int(kx[2*i+1])) + (int(ky[2*i])<<8 | int(ky[2*i+1]))
				if e > 0xffff {
					panic("poly: exponent out of range")
				}
				buf[2*i], buf[2*i+1] = byte(e>>8), byte(e)
			}
			MulRat(prod, cx, cy)
			// The lookup with string(buf) does not allocate; only a new
			// key is stored as a string.
			if s, ok := t[string(buf)]; ok {
				// s was made by this product, so it may be updated.
				AddRat(s, s, prod)
				if s.Sign() == 0 {
					delete(t, string(buf))
				}
			} else {
				t[string(buf)] = prod
				prod = new(big.Rat)
			}
		}
	}
	z.ring, z.terms = x.ring, t
	return z
}

// Pow sets z = x^n for n >= 0 (x^0 = 1, also for x = 0) and returns z.
func (z *Poly) Pow(x *Poly, n int) *Poly {
	if n < 0 {
		panic("poly: negative exponent")
	}
	result := ConstInt(x.ring, 1)
	base := x.Clone()
	for n > 0 {
		if n&1 == 1 {
			result.Mul(result, base)
		}
		n >>= 1
		if n > 0 {
			base.Mul(base, base)
		}
	}
	return z.Set(result)
}

// Derivative sets z = ∂x/∂v_i and returns z.
func (z *Poly) Derivative(x *Poly, i int) *Poly {
	t := make(map[string]*big.Rat)
	for k, c := range x.terms {
		// The exponent of v_i is read from the key itself (see key), so a
		// term without v_i costs nothing however many variables the ring has.
		ei := int(k[2*i])<<8 | int(k[2*i+1])
		if ei == 0 {
			continue
		}
		d := new(big.Rat).SetInt64(int64(ei))
		MulRat(d, d, c)
		b := []byte(k)
		b[2*i], b[2*i+1] = byte((ei-1)>>8), byte(ei-1)
		t[string(b)] = d
	}
	z.ring, z.terms = x.ring, t
	return z
}

// Substitute sets z to x with variable i replaced by the polynomial q and returns z.
func (z *Poly) Substitute(x *Poly, i int, q *Poly) *Poly {
	x.check(q)
	sub := make([]*Poly, x.ring.NumVars())
	sub[i] = q
	return z.Compose(x, sub)
}

// Compose sets z to x with every variable i for which sub[i] != nil replaced
// by sub[i], simultaneously, and returns z.
func (z *Poly) Compose(x *Poly, sub []*Poly) *Poly {
	r := x.ring
	result := Zero(r)
	powers := make([][]*Poly, len(sub)) // cache of sub[i]^k
	pow := func(i, k int) *Poly {
		for len(powers[i]) <= k {
			if len(powers[i]) == 0 {
				powers[i] = append(powers[i], ConstInt(r, 1))
				continue
			}
			last := powers[i][len(powers[i])-1]
			powers[i] = append(powers[i], new(Poly).Mul(last, sub[i]))
		}
		return powers[i][k]
	}
	// The terms of the image of each term of x are summed into one map;
	// a coefficient met twice is replaced by a new sum (see Poly).
	for k, c := range x.terms {
		exp := unkey(k)
		rest := slices.Clone(exp)
		for i := range rest {
			if sub[i] != nil {
				rest[i] = 0
			}
		}
		term := &Poly{ring: r, terms: map[string]*big.Rat{key(rest): c}}
		for i, e := range exp {
			if sub[i] != nil && e > 0 {
				term.Mul(term, pow(i, e))
			}
		}
		for tk, tc := range term.terms {
			s, ok := result.terms[tk]
			if !ok {
				result.terms[tk] = tc
				continue
			}
			if v := AddRat(new(big.Rat), s, tc); v.Sign() != 0 {
				result.terms[tk] = v
			} else {
				delete(result.terms, tk)
			}
		}
	}
	return z.Set(result)
}

// EvalVars sets z to x with the variables in vals (index → value) replaced by
// rational values and returns z.
func (z *Poly) EvalVars(x *Poly, vals map[int]*big.Rat) *Poly {
	t := make(map[string]*big.Rat, len(x.terms))
	for k, c := range x.terms {
		e := unkey(k)
		v := c // shared until it changes (see Poly)
		for i, val := range vals {
			if e[i] > 0 {
				v = MulRat(new(big.Rat), v, ratPow(val, e[i]))
				e[i] = 0
			}
		}
		if v.Sign() == 0 {
			continue
		}
		nk := key(e)
		if s, ok := t[nk]; ok {
			s = AddRat(new(big.Rat), s, v)
			t[nk] = s
			if s.Sign() == 0 {
				delete(t, nk)
			}
		} else {
			t[nk] = v
		}
	}
	z.ring, z.terms = x.ring, t
	return z
}

// Eval returns p at the point x (one value per ring variable), exactly.
func (p *Poly) Eval(x []*big.Rat) *big.Rat {
	if len(x) != p.ring.NumVars() {
		panic("poly: point dimension mismatch")
	}
	sum := new(big.Rat)
	prod := new(big.Rat)
	for k, c := range p.terms {
		v := c // shared until the first factor (see Poly)
		for i := 0; i < len(k)/2; i++ {
			if e := int(k[2*i])<<8 | int(k[2*i+1]); e > 0 {
				v = MulRat(prod, v, ratPow(x[i], e))
			}
		}
		AddRat(sum, sum, v)
	}
	return sum
}

// ratPow returns x^n for n ≥ 1; the result may be x itself and must not be
// modified.
func ratPow(x *big.Rat, n int) *big.Rat {
	if n == 1 {
		return x
	}
	if n <= 4 {
		z := MulRat(new(big.Rat), x, x)
		for ; n > 2; n-- {
			MulRat(z, z, x)
		}
		return z
	}
	num := new(big.Int).Exp(x.Num(), big.NewInt(int64(n)), nil)
	den := new(big.Int).Exp(x.Denom(), big.NewInt(int64(n)), nil)
	return new(big.Rat).SetFrac(num, den)
}

// IsZero reports whether p is the zero polynomial.
func (p *Poly) IsZero() bool { return len(p.terms) == 0 }

// NumTerms returns the number of non-zero terms.
func (p *Poly) NumTerms() int { return len(p.terms) }

// IsConst reports whether p is a constant (including zero).
func (p *Poly) IsConst() bool {
	switch len(p.terms) {
	case 0:
		return true
	case 1:
		for k := range p.terms {
			for i := 0; i < len(k); i++ {
				if k[i] != 0 {
					return false
				}
			}
		}
		return true
	}
	return false
}

// constCoef returns the constant coefficient of p, shared with p (see
// Poly): it must not be modified.
func (p *Poly) constCoef() *big.Rat {
	if c, ok := p.terms[p.ring.zeroKey]; ok {
		return c
	}
	return new(big.Rat)
}

// ConstTerm returns the constant coefficient of p.
func (p *Poly) ConstTerm() *big.Rat {
	c, ok := p.terms[p.ring.zeroKey]
	if !ok {
		return new(big.Rat)
	}
	return new(big.Rat).Set(c)
}

// Equal reports whether p and q are the same polynomial.
func (p *Poly) Equal(q *Poly) bool {
	p.check(q)
	if len(p.terms) != len(q.terms) {
		return false
	}
	for k, c := range p.terms {
		d, ok := q.terms[k]
		if !ok || c.Cmp(d) != 0 {
			return false
		}
	}
	return true
}

// Degree returns the total degree of p; the zero polynomial has degree -1.
func (p *Poly) Degree() int {
	return p.DegreeIn(nil)
}

// DegreeIn returns the total degree of p in the variables i with in[i] true
// (all variables when in is nil); -1 for the zero polynomial.
func (p *Poly) DegreeIn(in []bool) int {
	d := -1
	if in == nil {
		for k := range p.terms {
			s := 0
			for i := 1; i < len(k); i += 2 {
				s += int(k[i-1])<<8 | int(k[i])
			}
			d = max(d, s)
		}
		return d
	}
	for k := range p.terms {
		s := 0
		for i := 0; i < len(k)/2; i++ {
			if in == nil || in[i] {
				s += int(k[2*i])<<8 | int(k[2*i+1])
			}
		}
		d = max(d, s)
	}
	return d
}

// Homogeneous returns the part of p of total degree d in the variables i with
// in[i] true (all variables when in is nil).
func (p *Poly) Homogeneous(d int, in []bool) *Poly {
	z := Zero(p.ring)
	for k, c := range p.terms {
		s := 0
		for i, e := range unkey(k) {
			if in == nil || in[i] {
				s += e
			}
		}
		if s == d {
			z.terms[k] = c // shared (see Poly)
		}
	}
	return z
}

// StateMask returns the mask selecting the states of r.
func (r *Ring) StateMask() []bool {
	m := make([]bool, r.NumVars())
	for i := 0; i < r.nstates; i++ {
		m[i] = true
	}
	return m
}

// ParamMask returns the mask selecting the parameters of r.
func (r *Ring) ParamMask() []bool {
	m := r.StateMask()
	for i := range m {
		m[i] = !m[i]
	}
	return m
}

// Coefficient returns the coefficient of the monomial in the variables
// selected by in with exponents e (entries outside in are ignored), as a
// polynomial in the remaining variables.
func (p *Poly) Coefficient(e []int, in []bool) *Poly {
	z := Zero(p.ring)
	for k, c := range p.terms {
		te := unkey(k)
		match := true
		for i := range te {
			if in[i] {
				if te[i] != e[i] {
					match = false
					break
				}
				te[i] = 0
			}
		}
		if match {
			z.terms[key(te)] = c // shared (see Poly)
		}
	}
	return z
}

// UsesVar reports whether variable i occurs in p.
func (p *Poly) UsesVar(i int) bool {
	for k := range p.terms {
		if k[2*i] != 0 || k[2*i+1] != 0 {
			return true
		}
	}
	return false
}

// VarsUsed returns the indices of the variables that occur in p, ascending.
func (p *Poly) VarsUsed() []int {
	var out []int
	for i := 0; i < p.ring.NumVars(); i++ {
		if p.UsesVar(i) {
			out = append(out, i)
		}
	}
	return out
}

// GradedCompare orders exponent vectors by total degree, then
// lexicographically (x₁ > x₂ > ...): the graded lexicographic order, the one
// monomial order of lyacert (terms, bases, printing). It returns −1, 0 or +1
// as cmp.Compare does.
func GradedCompare(a, b []int) int {
	da, db := 0, 0
	for i := range a {
		da += a[i]
		db += b[i]
	}
	if da != db {
		return cmp.Compare(da, db)
	}
	return slices.Compare(a, b)
}

func gradedLess(a, b []int) bool { return GradedCompare(a, b) < 0 }

// Terms returns the terms of p in descending graded lexicographic order.
func (p *Poly) Terms() []Term {
	ts := p.sortedTerms()
	for i := range ts {
		ts[i].Coef = new(big.Rat).Set(ts[i].Coef)
	}
	return ts
}

// sortedTerms is Terms with the coefficients shared with p (see Poly): they
// must not be modified.
func (p *Poly) sortedTerms() []Term {
	// Sorted by total degree, then by the keys themselves: a key holds the
	// exponents big-endian in variable order, so comparing keys as strings
	// is comparing exponent vectors lexicographically (GradedCompare), with
	// each degree computed once rather than at every comparison.
	type entry struct {
		deg int
		k   string
		c   *big.Rat
	}
	es := make([]entry, 0, len(p.terms))
	for k, c := range p.terms {
		d := 0
		for i := 1; i < len(k); i += 2 {
			d += int(k[i-1])<<8 | int(k[i])
		}
		es = append(es, entry{d, k, c})
	}
	slices.SortFunc(es, func(a, b entry) int {
		if a.deg != b.deg {
			return cmp.Compare(b.deg, a.deg)
		}
		return strings.Compare(b.k, a.k)
	})
	ts := make([]Term, len(es))
	for i, e := range es {
		ts[i] = Term{Exp: unkey(e.k), Coef: e.c}
	}
	return ts
}

// Lead returns the leading term of p in graded lexicographic order; p must be non-zero.
func (p *Poly) Lead() Term {
	t := p.lead()
	t.Coef = new(big.Rat).Set(t.Coef)
	return t
}

// lead is Lead with the coefficient shared with p (see Poly): it must not
// be modified.
func (p *Poly) lead() Term {
	var best []int
	var bc *big.Rat
	for k, c := range p.terms {
		e := unkey(k)
		if best == nil || gradedLess(best, e) {
			best, bc = e, c
		}
	}
	if best == nil {
		panic("poly: leading term of zero")
	}
	return Term{Exp: best, Coef: bc}
}

// DivExact sets z = x / y when y divides x exactly and reports whether it does.
// On false z is unchanged. y must be non-zero.
//
// Multivariate division by a graded order: when y | x, the leading monomial of
// y divides the leading monomial of every intermediate remainder, so greedy
// division succeeds exactly when the division is exact.
func (z *Poly) DivExact(x, y *Poly) bool {
	x.check(y)
	if y.IsZero() {
		panic("poly: division by zero polynomial")
	}
	// The remainder is one map updated in place (its coefficients are
	// replaced, never modified, since they may be shared with x); the
	// leading term is found by comparing keys, which hold the exponents
	// big-endian (see sortedTerms), so no exponent vector is decoded.
	rem := make(map[string]*big.Rat, len(x.terms))
	for k, c := range x.terms {
		rem[k] = c
	}
	quo := make(map[string]*big.Rat)
	var ly string
	ldy := -1
	for k := range y.terms {
		if d := keyDegree(k); d > ldy || d == ldy && k > ly {
			ly, ldy = k, d
		}
	}
	cy := y.terms[ly]
	nk := len(ly)
	e := make([]byte, nk)
	buf := make([]byte, nk)
	for len(rem) > 0 {
		var lr string
		ldr := -1
		for k := range rem {
			if d := keyDegree(k); d > ldr || d == ldr && k > lr {
				lr, ldr = k, d
			}
		}
		for i := 0; i < nk; i += 2 {
			d := (int(lr[i])<<8 | int(lr[i+1])) - (int(ly[i])<<8 | int(ly[i+1]))
			if d < 0 {
				return false
			}
			e[i], e[i+1] = byte(d>>8), byte(d)
		}
		c := QuoRat(new(big.Rat), rem[lr], cy)
		quo[string(e)] = c
		// rem −= c·x^e·y; the leading terms cancel exactly.
		delete(rem, lr)
		for k, b := range y.terms {
			if k == ly {
				continue
			}
			for i := 0; i < nk; i += 2 {
				s := (int(e[i])<<8 | int(e[i+1])) + (int(k[i])<<8 | int(k[i+1]))
				if s > 0xffff {
					panic("poly: exponent out of range")
				}
				buf[i], buf[i+1] = byte(s>>8), byte(s)
			}
			prod := MulRat(new(big.Rat), c, b)
			if s, ok := rem[string(buf)]; ok {
				if v := SubRat(prod, s, prod); v.Sign() == 0 {
					delete(rem, string(buf))
				} else {
					rem[string(buf)] = v
				}
			} else {
				rem[string(buf)] = prod.Neg(prod)
			}
		}
	}
	z.ring, z.terms = x.ring, quo
	return true
}

// keyDegree returns the total degree of an encoded exponent vector.
func keyDegree(k string) int {
	d := 0
	for i := 1; i < len(k); i += 2 {
		d += int(k[i-1])<<8 | int(k[i])
	}
	return d
}

// Content returns the positive rational c and the primitive polynomial q with
// p = c·q, where q has integer coefficients with greatest common divisor 1;
// for p = 0 it returns 0 and 0.
func (p *Poly) Content() (*big.Rat, *Poly) {
	if p.IsZero() {
		return new(big.Rat), Zero(p.ring)
	}
	lcm := big.NewInt(1)
	g := new(big.Int)
	for _, c := range p.terms {
		d := c.Denom()
		g.GCD(nil, nil, lcm, d)
		lcm.Mul(lcm, new(big.Int).Quo(d, g))
	}
	gnum := new(big.Int)
	for _, c := range p.terms {
		n := new(big.Int).Mul(c.Num(), new(big.Int).Quo(lcm, c.Denom()))
		gnum.GCD(nil, nil, gnum, n.Abs(n))
	}
	c := new(big.Rat).SetFrac(gnum, lcm)
	return c, new(Poly).Scale(p, new(big.Rat).Inv(c))
}

// PrimitivePart returns the signed rational c and the primitive polynomial q
// with p = c·q and q having a positive leading coefficient.
func (p *Poly) PrimitivePart() (*big.Rat, *Poly) {
	c, q := p.Content()
	if !q.IsZero() && q.lead().Coef.Sign() < 0 {
		c.Neg(c)
		q.Neg(q)
	}
	return c, q
}

// String returns the canonical text of p with the ring's variable names:
// terms in descending graded lexicographic order, coefficients as integers or
// p/q, "*" between factors, "^" for powers, e.g. "2*u*v - u^2 + 3/2".
// The text re-parses to the same polynomial.
func (p *Poly) String() string {
	return p.Format(p.ring.names)
}

// Format is String with other variable names.
func (p *Poly) Format(names []string) string {
	return FromPoly(p).Format(names)
}

// formatTerms prints p term by term, parameters and states alike.
func (p *Poly) formatTerms(names []string) string {
	ts := p.sortedTerms()
	if len(ts) == 0 {
		return "0"
	}
	var b strings.Builder
	for i, t := range ts {
		c := t.Coef
		neg := c.Sign() < 0
		abs := c // shared, only read
		if neg {
			abs = new(big.Rat).Neg(c)
		}
		switch {
		case i == 0 && neg:
			b.WriteString("-")
		case i > 0 && neg:
			b.WriteString(" - ")
		case i > 0:
			b.WriteString(" + ")
		}
		mono := formatMonomial(t.Exp, names)
		one := isOne(abs)
		switch {
		case mono == "":
			b.WriteString(RatString(abs))
		case one:
			b.WriteString(mono)
		default:
			b.WriteString(RatString(abs))
			b.WriteString("*")
			b.WriteString(mono)
		}
	}
	return b.String()
}

func formatMonomial(e []int, names []string) string {
	var parts []string
	for i, x := range e {
		switch {
		case x == 1:
			parts = append(parts, names[i])
		case x > 1:
			parts = append(parts, fmt.Sprintf("%s^%d", names[i], x))
		}
	}
	return strings.Join(parts, "*")
}

// IsMonomial reports whether p has exactly one term.
func (p *Poly) IsMonomial() bool { return len(p.terms) == 1 }

// Relabel returns p moved into ring r, variable i of p's ring becoming
// variable m[i] of r. Variables that occur in p must be mapped (m[i] >= 0).
func (p *Poly) Relabel(r *Ring, m []int) *Poly {
	z := Zero(r)
	for k, c := range p.terms {
		e := unkey(k)
		ne := make([]int, r.NumVars())
		for i, x := range e {
			if x == 0 {
				continue
			}
			if m[i] < 0 {
				panic("poly: relabel drops a used variable")
			}
			ne[m[i]] += x
		}
		nk := key(ne)
		if s, ok := z.terms[nk]; ok {
			s = AddRat(new(big.Rat), s, c)
			z.terms[nk] = s
			if s.Sign() == 0 {
				delete(z.terms, nk)
			}
		} else {
			z.terms[nk] = c // shared (see Poly)
		}
	}
	return z
}
