package poly

import (
	"math/big"
	"math/bits"
)

// Exact linear algebra over the integers. A rational matrix whose entries
// share a short common denominator d is the integer matrix d·a over d; its
// products and its leading minors are then computed with integers that stay
// short (no gcd at any step), which is what makes the Lyapunov certificates of
// systems with a few hundred states cheap to prove and to re-check.

// CommonDenominator returns the integer matrix b and the denominator d > 0
// with a = b/d entrywise, d the least common multiple of the denominators of
// a's entries. ok is false, and nothing is returned, when d would have more
// than maxBits bits: a matrix of unrelated denominators has no short common
// one, and the caller then works entry by entry.
func CommonDenominator(a [][]*big.Rat, maxBits int) (b [][]*big.Int, d *big.Int, ok bool) {
	d = big.NewInt(1)
	g := new(big.Int)
	for _, row := range a {
		for _, x := range row {
			if x.IsInt() {
				continue
			}
			den := x.Denom()
			if new(big.Int).Rem(d, den).Sign() == 0 {
				continue // den divides d already
			}
			g.GCD(nil, nil, d, den)
			d.Mul(d, g.Quo(den, g))
			if d.BitLen() > maxBits {
				return nil, nil, false
			}
		}
	}
	b = make([][]*big.Int, len(a))
	for i, row := range a {
		b[i] = make([]*big.Int, len(row))
		for j, x := range row {
			v := new(big.Int).Quo(d, x.Denom())
			b[i][j] = v.Mul(v, x.Num())
		}
	}
	return b, d, true
}

// maxBitLen returns the largest bit length of an entry of a.
func maxBitLen(a [][]*big.Int) int {
	m := 0
	for _, row := range a {
		for _, x := range row {
			m = max(m, x.BitLen())
		}
	}
	return m
}

// IntProduct returns the product a·b of integer matrices (a is n×m, b is
// m×p). When every sum of products is bounded below 2⁶² by the entries' bit
// lengths (|aᵢₖ| < 2^α, |bₖⱼ| < 2^β, m < 2^μ, α + β + μ ≤ 62) the sums are
// accumulated in int64, exactly; otherwise in math/big.
func IntProduct(a, b [][]*big.Int) [][]*big.Int {
	n := len(a)
	out := make([][]*big.Int, n)
	if n == 0 {
		return out
	}
	m, p := len(b), 0
	if m > 0 {
		p = len(b[0])
	}
	if maxBitLen(a)+maxBitLen(b)+bits.Len(uint(m)) <= 62 {
		bs := make([]int64, m*p)
		for k := range m {
			for j := range p {
				bs[k*p+j] = b[k][j].Int64()
			}
		}
		acc := make([]int64, p)
		for i := range n {
			clear(acc)
			for k := range m {
				aik := a[i][k].Int64()
				if aik == 0 {
					continue
				}
				for j, bkj := range bs[k*p : (k+1)*p] {
					acc[j] += aik * bkj
				}
			}
			out[i] = make([]*big.Int, p)
			for j, v := range acc {
				out[i][j] = big.NewInt(v)
			}
		}
		return out
	}
	t := new(big.Int)
	for i := range n {
		out[i] = make([]*big.Int, p)
		for j := range p {
			s := new(big.Int)
			for k := range m {
				if a[i][k].Sign() != 0 && b[k][j].Sign() != 0 {
					s.Add(s, t.Mul(a[i][k], b[k][j]))
				}
			}
			out[i][j] = s
		}
	}
	return out
}

// IntTranspose returns aᵀ; the entries are shared.
func IntTranspose(a [][]*big.Int) [][]*big.Int {
	if len(a) == 0 {
		return nil
	}
	out := make([][]*big.Int, len(a[0]))
	for j := range out {
		out[j] = make([]*big.Int, len(a))
		for i := range a {
			out[j][i] = a[i][j]
		}
	}
	return out
}

// FirstNonPositiveMinor runs fraction-free Gaussian elimination without
// pivoting (Bareiss 1968) on the square integer matrix b and returns the
// index k of the first leading principal minor Δₖ₊₁ (the determinant of the
// leading (k+1)×(k+1) block) that is ≤ 0, with that minor and the one before
// it (Δ₀ = 1); k is −1 and the minors nil when every leading minor is
// positive. For a symmetric b that is Sylvester's criterion: b ≻ 0 exactly
// when k = −1.
//
// Bareiss' step bᵢⱼ ← (bₖₖ·bᵢⱼ − bᵢₖ·bₖⱼ)/bₖ₋₁,ₖ₋₁ divides exactly (Sylvester's
// identity) and leaves Δₖ₊₁ at bₖₖ, so every number is a minor of b: its
// length grows linearly with k, never by the squaring of a rational
// elimination, and no gcd is taken. A symmetric b keeps symmetric
// intermediate blocks, so only the lower triangle is updated. b is not
// modified.
func FirstNonPositiveMinor(b [][]*big.Int) (k int, minor, prev *big.Int) {
	n := len(b)
	sym := true
	for i := 0; sym && i < n; i++ {
		for j := 0; j < i; j++ {
			if b[i][j].Cmp(b[j][i]) != 0 {
				sym = false
				break
			}
		}
	}
	w := make([][]*big.Int, n)
	for i := range b {
		w[i] = make([]*big.Int, n)
		for j := range b[i] {
			if !sym || j <= i {
				w[i][j] = new(big.Int).Set(b[i][j])
			}
		}
	}
	prev = big.NewInt(1)
	t, r := new(big.Int), new(big.Int)
	for k := range n {
		pivot := w[k][k]
		if pivot.Sign() <= 0 {
			return k, new(big.Int).Set(pivot), prev
		}
		for i := k + 1; i < n; i++ {
			last := n - 1
			if sym {
				last = i
			}
			for j := k + 1; j <= last; j++ {
				bkj := w[k][j]
				if sym {
					bkj = w[j][k] // the upper triangle is the lower one
				}
				x := w[i][j]
				x.Mul(x, pivot)
				if w[i][k].Sign() != 0 && bkj.Sign() != 0 {
					x.Sub(x, t.Mul(w[i][k], bkj))
				}
				x.QuoRem(x, prev, r) // exact: r is zero
			}
		}
		prev = pivot
	}
	return -1, nil, nil
}

// SolveRat solves a·x = b exactly for a square rational matrix a, by
// fraction-free Gaussian elimination with row exchanges (Bareiss 1968): row
// i of [a | b] is scaled by the lcm of its denominators (which leaves the
// solution alone), Bareiss' steps make it upper triangular with integers
// that are minors of the scaled matrix, and the back substitution computes
// the integers yᵢ = d·xᵢ (Cramer's rule: d, the last pivot, is ± the
// determinant, so every yᵢ is an integer and every division is exact). ok is
// false when a is singular.
func SolveRat(a [][]*big.Rat, b []*big.Rat) (x []*big.Rat, ok bool) {
	n := len(a)
	w := make([][]*big.Int, n)
	g := new(big.Int)
	for i := range n {
		row := append(append([]*big.Rat(nil), a[i]...), b[i])
		s := big.NewInt(1)
		for _, v := range row {
			if !v.IsInt() {
				g.GCD(nil, nil, s, v.Denom())
				s.Mul(s, g.Quo(v.Denom(), g))
			}
		}
		w[i] = make([]*big.Int, n+1)
		for j, v := range row {
			e := new(big.Int).Quo(s, v.Denom())
			w[i][j] = e.Mul(e, v.Num())
		}
	}
	prev := big.NewInt(1)
	t, r := new(big.Int), new(big.Int)
	for k := range n {
		p := k
		for p < n && w[p][k].Sign() == 0 {
			p++
		}
		if p == n {
			return nil, false
		}
		w[k], w[p] = w[p], w[k]
		pivot := w[k][k]
		for i := k + 1; i < n; i++ {
			for j := k + 1; j <= n; j++ {
				v := w[i][j]
				v.Mul(v, pivot)
				if w[i][k].Sign() != 0 && w[k][j].Sign() != 0 {
					v.Sub(v, t.Mul(w[i][k], w[k][j]))
				}
				v.QuoRem(v, prev, r) // exact (Sylvester's identity)
			}
			w[i][k].SetInt64(0)
		}
		prev = pivot
	}
	d := prev
	y := make([]*big.Int, n)
	for i := n - 1; i >= 0; i-- {
		v := new(big.Int).Mul(d, w[i][n])
		for j := i + 1; j < n; j++ {
			if w[i][j].Sign() != 0 && y[j].Sign() != 0 {
				v.Sub(v, t.Mul(w[i][j], y[j]))
			}
		}
		y[i], _ = v.QuoRem(v, w[i][i], r) // exact: yᵢ = d·xᵢ is an integer
	}
	x = make([]*big.Rat, n)
	for i := range y {
		x[i] = new(big.Rat).SetFrac(y[i], d)
	}
	return x, true
}

// mersenne61 is the prime 2⁶¹ − 1.
const mersenne61 = 1<<61 - 1

// mulMod61 returns a·b mod 2⁶¹ − 1 for a, b < 2⁶¹ − 1.
func mulMod61(a, b uint64) uint64 {
	hi, lo := bits.Mul64(a, b)
	// a·b = hi·2⁶⁴ + lo = (hi·2³ + lo>>61)·2⁶¹ + (lo mod 2⁶¹), and 2⁶¹ ≡ 1.
	s := (hi<<3 | lo>>61) + lo&mersenne61
	for s >= mersenne61 {
		s -= mersenne61
	}
	return s
}

// NonsingularModPrime reports that the square rational matrix a is
// nonsingular by computing its determinant modulo the prime p = 2⁶¹ − 1
// (Gaussian elimination over the field of p elements): every entry's
// denominator invertible mod p and det a ≢ 0 (mod p) imply det a ≠ 0,
// since det a = N/D with D a product of those denominators and N ≡ 0
// whenever N = 0. False proves nothing (the determinant may be a multiple
// of p); the caller then decides by exact elimination. It costs n³ word
// operations, where exact elimination handles numbers with thousands of
// digits.
func NonsingularModPrime(a [][]*big.Rat) bool {
	n := len(a)
	p := big.NewInt(mersenne61)
	w := make([][]uint64, n)
	t := new(big.Int)
	for i := range a {
		w[i] = make([]uint64, n)
		for j, x := range a[i] {
			if t.Mod(x.Denom(), p).Sign() == 0 {
				return false
			}
			inv := new(big.Int).ModInverse(t, p)
			t.Mod(x.Num(), p)
			w[i][j] = t.Mul(t, inv).Mod(t, p).Uint64()
		}
	}
	for k := range n {
		piv := k
		for piv < n && w[piv][k] == 0 {
			piv++
		}
		if piv == n {
			return false
		}
		w[k], w[piv] = w[piv], w[k]
		inv := new(big.Int).ModInverse(new(big.Int).SetUint64(w[k][k]), p).Uint64()
		for i := k + 1; i < n; i++ {
			if w[i][k] == 0 {
				continue
			}
			f := mulMod61(w[i][k], inv)
			for j := k; j < n; j++ {
				// w[i][j] −= f·w[k][j]
				w[i][j] += mersenne61 - mulMod61(f, w[k][j])
				if w[i][j] >= mersenne61 {
					w[i][j] -= mersenne61
				}
			}
		}
	}
	return true
}

// bareissLower runs Bareiss' elimination on the lower triangle of the
// symmetric integer matrix w, in place, and stops at the first pivot that
// is zero, or ≤ 0 when positive is set, returning its index (−1 when there
// is none). After step k, wₖₖ is the leading minor Δₖ₊₁ and wᵢₖ (i > k) the
// minor on the rows 1…k, i and the columns 1…k+1; these are not changed by
// later steps.
func bareissLower(w [][]*big.Int, positive bool) int {
	n := len(w)
	prev := big.NewInt(1)
	t, r := new(big.Int), new(big.Int)
	for k := range n {
		pivot := w[k][k]
		if s := pivot.Sign(); s == 0 || positive && s < 0 {
			return k
		}
		for i := k + 1; i < n; i++ {
			wik := w[i][k]
			for j := k + 1; j <= i; j++ {
				x := w[i][j]
				x.Mul(x, pivot)
				if wik.Sign() != 0 && w[j][k].Sign() != 0 {
					x.Sub(x, t.Mul(wik, w[j][k]))
				}
				x.QuoRem(x, prev, r) // exact (Sylvester's identity)
			}
		}
		prev = pivot
	}
	return -1
}

// PositiveLDL factors the symmetric rational matrix a = L·diag(d)·Lᵀ, L unit
// lower triangular, and returns k = −1 when every pivot is positive;
// otherwise k is the first pivot ≤ 0, d holds the pivots up to it and the
// columns of L before it are filled. The values are those of rational
// elimination (RatLDL), but they are computed by Bareiss' elimination of
// the integer matrix b = c·a over a common denominator c: with Δₖ the
// leading minors of b, dₖ = Δₖ₊₁/(Δₖ·c) and Lᵢₖ = bᵢₖ⁽ᵏ⁾/Δₖ₊₁, so the only
// gcds are those that put each result in lowest terms. ok is false, and
// nothing is computed, when the entries have no common denominator of at
// most maxBits bits. Only the lower triangle of a is read.
func PositiveLDL(a [][]*big.Rat, maxBits int) (l [][]*big.Rat, d []*big.Rat, k int, ok bool) {
	n := len(a)
	lower := make([][]*big.Rat, n)
	for i := range a {
		lower[i] = a[i][:i+1]
	}
	b, c, ok := CommonDenominator(lower, maxBits)
	if !ok {
		return nil, nil, 0, false
	}
	k = bareissLower(b, true)
	last := n
	if k >= 0 {
		last = k + 1
	}
	l = make([][]*big.Rat, n)
	for i := range l {
		l[i] = make([]*big.Rat, n)
		for j := range l[i] {
			l[i][j] = new(big.Rat)
		}
		l[i][i].SetInt64(1)
	}
	prev := big.NewInt(1)
	for j := range last {
		piv := b[j][j]
		d = append(d, new(big.Rat).SetFrac(piv, new(big.Int).Mul(prev, c)))
		if j == k {
			break
		}
		for i := j + 1; i < n; i++ {
			if b[i][j].Sign() != 0 {
				l[i][j].SetFrac(b[i][j], piv)
			}
		}
		prev = piv
	}
	return l, d, k, true
}
