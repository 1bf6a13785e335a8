package poly

import (
	"math/big"
	"slices"
)

// Rational roots by p-adic lifting (Loos 1983, "Computing rational zeros
// of integral polynomials by p-adic expansion"): for a primitive integer
// polynomial f with leading coefficient L and a prime q ∤ L modulo which f
// stays square-free, every rational root a/b of f (b | L, so q ∤ b) reduces
// to a simple root of f mod q, which Newton's iteration lifts uniquely
// modulo q^(2^j) (Hensel's lemma). y = L·a/b is an integer with
// |y| ≤ |L| + max|fᵢ| (Cauchy's bound on the roots, times L), so the lifted
// root r modulo M > 2(|L| + max|fᵢ|) gives y as the residue of L·r of least
// absolute value, and each candidate y/L is tested exactly. No root is
// isolated and no integer is factored.
//
// The same prime is a certificate of square-freeness: if f = g²h over Q
// then f = g²h over Z (Gauss), and g's leading coefficient divides L, so g
// mod q keeps its degree and f mod q has a repeated factor.

// rootPrimes are the moduli tried in turn; a prime is rejected when it
// divides the leading coefficient or the discriminant, which a fixed
// polynomial can do for only finitely many primes.
var rootPrimes = []uint64{
	101, 103, 107, 109, 113, 127, 131, 137, 139, 149, 151, 157, 163, 167, 173, 179,
	181, 191, 193, 197, 199, 211, 223, 227, 229, 233, 239, 241, 251, 257, 263, 269,
}

// SquareFreeRationalRoots returns the distinct rational roots of p,
// ascending, and true when a prime shows p square-free (see above); it
// returns false, and no roots, when p has a repeated factor or when none of
// the primes tried shows it has none. p must be non-zero.
func (p Univariate) SquareFreeRationalRoots() ([]*big.Rat, bool) {
	if p.IsZero() {
		panic("poly: rational roots of the zero polynomial")
	}
	if p.Degree() == 0 {
		return nil, true
	}
	f := uPrimitive(p)
	var roots []*big.Rat
	if f[0].Sign() == 0 {
		if f[1].Sign() == 0 {
			return nil, false // t² divides p
		}
		roots = append(roots, new(big.Rat))
		f = f[1:]
	}
	if len(f) == 1 {
		return roots, true
	}
	for _, q := range rootPrimes {
		fq := f.mod(q)
		if fq[len(fq)-1] == 0 || !squareFreeMod(fq, q) {
			continue
		}
		for r := range q {
			if evalMod(fq, r, q) == 0 {
				if x := f.liftRoot(r, q); x != nil {
					roots = append(roots, x)
				}
			}
		}
		slices.SortFunc(roots, func(a, b *big.Rat) int { return a.Cmp(b) })
		return roots, true
	}
	return nil, false
}

// mod returns the coefficients of a modulo q, in [0, q).
func (a uIntPoly) mod(q uint64) []uint64 {
	out := make([]uint64, len(a))
	bq := new(big.Int).SetUint64(q)
	t := new(big.Int)
	for i, v := range a {
		out[i] = t.Mod(v, bq).Uint64()
	}
	return out
}

// evalMod returns f(x) mod q by Horner's scheme (q < 2³²).
func evalMod(f []uint64, x, q uint64) uint64 {
	acc := uint64(0)
	for i := len(f) - 1; i >= 0; i-- {
		acc = (acc*x + f[i]) % q
	}
	return acc
}

// invMod returns x⁻¹ mod q for a prime q and x ≢ 0 (Fermat).
func invMod(x, q uint64) uint64 {
	r, b, e := uint64(1), x%q, q-2
	for e > 0 {
		if e&1 == 1 {
			r = r * b % q
		}
		b = b * b % q
		e >>= 1
	}
	return r
}

// trimMod drops leading zero coefficients.
func trimMod(f []uint64) []uint64 {
	n := len(f)
	for n > 0 && f[n-1] == 0 {
		n--
	}
	return f[:n]
}

// squareFreeMod reports gcd(f, f′) = 1 over the field of q elements, for f
// with a non-zero leading coefficient mod q.
func squareFreeMod(f []uint64, q uint64) bool {
	d := make([]uint64, len(f)-1)
	for i := 1; i < len(f); i++ {
		d[i-1] = uint64(i) % q * f[i] % q
	}
	a, b := slices.Clone(f), trimMod(d)
	for len(b) > 0 {
		// a ← a mod b
		inv := invMod(b[len(b)-1], q)
		for len(a) >= len(b) {
			c := a[len(a)-1] * inv % q
			off := len(a) - len(b)
			for i, v := range b {
				a[off+i] = (a[off+i] + q - c*v%q) % q
			}
			a = trimMod(a[:len(a)-1])
			if len(a) == 0 {
				break
			}
		}
		a, b = b, a
	}
	return len(a) == 1 // a non-zero constant
}

// liftRoot lifts the simple root r of a mod q to the rational root it
// stands for, or returns nil when there is none (see the comment above).
func (a uIntPoly) liftRoot(r, q uint64) *big.Rat {
	lead := a[len(a)-1]
	bound := new(big.Int).Abs(lead)
	for _, v := range a {
		if v.CmpAbs(bound) > 0 {
			bound.Abs(v)
		}
	}
	bound.Add(bound, new(big.Int).Abs(lead))
	bound.Lsh(bound, 1) // M must exceed 2(|L| + max|aᵢ|)
	der := make(uIntPoly, len(a)-1)
	for i := 1; i < len(a); i++ {
		der[i-1] = new(big.Int).Mul(a[i], big.NewInt(int64(i)))
	}
	m := new(big.Int).SetUint64(q)
	x := new(big.Int).SetUint64(r)
	fx, dx, m2 := new(big.Int), new(big.Int), new(big.Int)
	for m.Cmp(bound) <= 0 {
		m2.Mul(m, m)
		a.evalBig(fx, x, m2)
		der.evalBig(dx, x, m2)
		if dx.ModInverse(dx, m2) == nil {
			return nil // cannot happen for a simple root mod q
		}
		fx.Mul(fx, dx)
		x.Sub(x, fx)
		x.Mod(x, m2)
		m.Set(m2)
	}
	// y = L·r, the residue of least absolute value.
	y := new(big.Int).Mul(lead, x)
	y.Mod(y, m)
	if half := new(big.Int).Rsh(m, 1); y.Cmp(half) > 0 {
		y.Sub(y, m)
	}
	cand := new(big.Rat).SetFrac(y, lead)
	if a.signAt(cand) != 0 {
		return nil
	}
	return cand
}

// evalBig sets z = a(x) mod m, in [0, m).
func (a uIntPoly) evalBig(z, x, m *big.Int) {
	z.SetInt64(0)
	for i := len(a) - 1; i >= 0; i-- {
		z.Mul(z, x)
		z.Add(z, a[i])
		z.Mod(z, m)
	}
}
