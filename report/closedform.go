package report

import (
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

// radical is √w for a positive integer w.
type radical struct{ w *big.Int }

func (r radical) tex() string  { return `\sqrt{` + r.w.String() + `}` }
func (r radical) html() string { return "<msqrt>" + mn(r.w.String()) + "</msqrt>" }

// quadraticRoot returns the root of the quadratic q that lies in the open
// interval (a, b) in closed form u ± v·√w (u, v rational, v > 0, w > 1 an
// integer with its square factors below 10⁶ taken out), and whether q is a
// quadratic with two irrational real roots exactly one of which lies in
// (a, b). Which root it is, is decided exactly: x < u + s·v·√w is compared
// through squares of rationals.
func quadraticRoot(q poly.Univariate, a, b *big.Rat) (node, bool) {
	if q.Degree() != 2 {
		return nil, false
	}
	c := q.Coeffs()
	c0, c1, c2 := c[0], c[1], c[2]
	// D = c1² − 4·c2·c0, roots (−c1 ± √D) / (2·c2).
	disc := new(big.Rat).Mul(c1, c1)
	disc.Sub(disc, new(big.Rat).Mul(big.NewRat(4, 1), new(big.Rat).Mul(c2, c0)))
	if disc.Sign() <= 0 {
		return nil, false
	}
	twoA := new(big.Rat).Mul(big.NewRat(2, 1), c2)
	u := new(big.Rat).Neg(c1)
	u.Quo(u, twoA)
	// √(n/d) = √(n·d)/d = k·√w/d.
	nd := new(big.Int).Mul(disc.Num(), disc.Denom())
	k, w := squareFactor(nd)
	if w.Cmp(big.NewInt(1)) == 0 {
		return nil, false // rational roots
	}
	v := new(big.Rat).SetFrac(k, disc.Denom())
	v.Quo(v, new(big.Rat).Abs(twoA))
	v2w := new(big.Rat).Mul(v, v)
	v2w.Mul(v2w, new(big.Rat).SetInt(w))
	// below(x, s): x < u + s·v·√w.
	below := func(x *big.Rat, s int) bool {
		t := new(big.Rat).Sub(x, u)
		t2 := new(big.Rat).Mul(t, t)
		if s > 0 {
			return t.Sign() < 0 || t2.Cmp(v2w) < 0
		}
		return t.Sign() < 0 && t2.Cmp(v2w) > 0
	}
	// above(x, s): x > u + s·v·√w.
	above := func(x *big.Rat, s int) bool {
		t := new(big.Rat).Sub(x, u)
		t2 := new(big.Rat).Mul(t, t)
		if s > 0 {
			return t.Sign() > 0 && t2.Cmp(v2w) > 0
		}
		return t.Sign() > 0 || t2.Cmp(v2w) < 0
	}
	plus := below(a, 1) && above(b, 1)
	minus := below(a, -1) && above(b, -1)
	if plus == minus {
		return nil, false
	}
	var rad node = radical{w}
	if v.Num().Cmp(big.NewInt(1)) != 0 {
		rad = product{number{new(big.Rat).SetInt(v.Num())}, rad}
	}
	if !v.IsInt() {
		rad = fraction{rad, number{new(big.Rat).SetInt(v.Denom())}}
	}
	switch {
	case u.Sign() == 0:
		return sum{{minus, rad}}, true
	case u.Sign() < 0:
		return sum{{true, number{new(big.Rat).Abs(u)}}, {minus, rad}}, true
	}
	return sum{{false, number{u}}, {minus, rad}}, true
}

// squareFactor writes n > 0 as k²·w, taking out the square factors of the
// primes below 10⁶ and a remaining cofactor that is itself a square. w may
// keep the square of a larger prime; k·√w is then still exact, only not in
// lowest terms.
func squareFactor(n *big.Int) (k, w *big.Int) {
	k, w = big.NewInt(1), new(big.Int).Set(n)
	var q, r big.Int
	for p := int64(2); p < 1_000_000; p++ {
		bp := big.NewInt(p)
		pp := new(big.Int).Mul(bp, bp)
		if pp.Cmp(w) > 0 {
			break
		}
		for {
			q.QuoRem(w, pp, &r)
			if r.Sign() != 0 {
				break
			}
			w.Set(&q)
			k.Mul(k, bp)
		}
	}
	if s := new(big.Int).Sqrt(w); new(big.Int).Mul(s, s).Cmp(w) == 0 {
		k.Mul(k, s)
		w.SetInt64(1)
	}
	return k, w
}
