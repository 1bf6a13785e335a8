package direct

import (
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// Digits is the number of significant digits of the decimal shown for an
// irrational region endpoint.
const Digits = 15

// breakpoint is a real root of a condition inside the parameter's range:
// rational (exact) or isolated, with the coprime factor it is a root of.
type breakpoint struct {
	root poly.URoot
}

func (b breakpoint) rational() bool { return b.root.Exact != nil }

// lowerRat and upperRat bound the breakpoint by rationals (equal for a rational one).
func (b breakpoint) lowerRat() *big.Rat {
	if b.rational() {
		return b.root.Exact
	}
	return b.root.Lo
}

func (b breakpoint) upperRat() *big.Rat {
	if b.rational() {
		return b.root.Exact
	}
	return b.root.Hi
}

// OneParamRegion computes the exact set of values of one parameter, within
// its range dom, where every condition q > 0 holds, as a partition of dom
// into pieces on which all conditions hold or some condition is ≤ 0
// throughout. The breakpoints are the real roots of the conditions, found
// factor by factor: the conditions are split once into square-free,
// pairwise coprime factors (poly.CoprimeBasis), the roots of each factor
// isolated with its own Sturm sequence, rational ones exact, and each
// irrational breakpoint names the factor it is a root of, which divides
// every condition that vanishes there. Isolating intervals are refined only
// until neighbours separate; between and at the breakpoints the signs are
// decided exactly.
func OneParamRegion(r *poly.Ring, param int, conds []poly.Univariate, dom poly.Interval) []claims.Piece {
	var bps []breakpoint
	for _, f := range poly.CoprimeBasis(conds) {
		for _, root := range f.IsolateRoots() {
			if bp, ok := insideRange(root, dom); ok {
				bps = append(bps, bp)
			}
		}
	}
	separate(bps)
	var pieces []claims.Piece
	lo := rangeEnd(dom.Lo)
	for _, bp := range bps {
		atLo := dom.Lo.Inf == 0 && bp.rational() && bp.root.Exact.Cmp(dom.Lo.Value) == 0
		open := endOf(r, param, bp)
		closed := open
		closed.closed = true
		if !atLo {
			iv := claims.Interval{}
			setLo(&iv, lo)
			setHi(&iv, open)
			pieces = append(pieces, claims.Piece{Interval: iv})
		}
		pt := claims.Interval{}
		setLo(&pt, closed)
		setHi(&pt, closed)
		pieces = append(pieces, claims.Piece{Interval: pt})
		lo = open
	}
	last := bps == nil || !(dom.Hi.Inf == 0 && bps[len(bps)-1].rational() && bps[len(bps)-1].root.Exact.Cmp(dom.Hi.Value) == 0)
	if last {
		iv := claims.Interval{}
		setLo(&iv, lo)
		setHi(&iv, rangeEnd(dom.Hi))
		pieces = append(pieces, claims.Piece{Interval: iv})
	}
	// Decide each piece: interval pieces at an interior rational sample,
	// point pieces at the point (an irrational breakpoint is a root of some
	// condition, so it fails).
	for i := range pieces {
		pieces[i].Holds = holdsOn(conds, pieces[i].Interval)
		pieces[i].Status = claims.PieceUndecided
		if pieces[i].Holds {
			pieces[i].Status = claims.PieceHolds
		}
	}
	return pieces
}

// refuteOn marks as failing the pieces that do not hold and on which the
// quadratic part of V or −V̇ has a negative direction throughout, as the
// kernel's sturm-region rule decides it: the first leading minor that is
// not > 0 is < 0 (Jacobi). Between breakpoints a minor keeps its sign (its
// roots in the range are roots of the conditions), so an interior sample
// decides an open piece; a closed rational end is checked too; a piece with
// a closed irrational end, or an irrational point, stays undecided.
func refuteOn(pieces []claims.Piece, forms []Form, param int) {
	var minors [][]poly.Univariate
	for _, f := range forms {
		if f.Basis != nil {
			continue
		}
		var us []poly.Univariate // the leading minors that involve the parameter only
		for _, mi := range f.Minors {
			u, ok := new(poly.Poly).Mul(mi.Num, mi.DenPoly()).Univariate(param)
			if !ok {
				break
			}
			us = append(us, u)
		}
		minors = append(minors, us)
	}
	negativeAt := func(x *big.Rat) bool {
		return slices.ContainsFunc(minors, func(us []poly.Univariate) bool {
			k := slices.IndexFunc(us, func(u poly.Univariate) bool { return u.IsZero() || u.Sign(x) <= 0 })
			return k >= 0 && !us[k].IsZero() && us[k].Sign(x) < 0
		})
	}
	for i, pc := range pieces {
		if pc.Holds {
			continue
		}
		var at []*big.Rat
		point := pc.Lo == pc.Hi && pc.LoPoly == pc.HiPoly && pc.LoClosed && pc.HiClosed
		if !point {
			at = append(at, samplePoint(pc.Interval))
		}
		ok := true
		for _, e := range []struct {
			v, poly string
			closed  bool
		}{{pc.Lo, pc.LoPoly, pc.LoClosed}, {pc.Hi, pc.HiPoly, pc.HiClosed}} {
			if e.closed {
				x, isRat := new(big.Rat).SetString(e.v)
				ok = ok && e.poly == "" && isRat
				at = append(at, x)
			}
		}
		if ok && !slices.ContainsFunc(at, func(x *big.Rat) bool { return !negativeAt(x) }) {
			pieces[i].Status = claims.PieceFails
		}
	}
}

type pend struct {
	iv     claims.Interval // only the Lo-side fields are used
	closed bool
}

func rangeEnd(b poly.Bound) pend {
	var e pend
	switch {
	case b.Inf < 0:
		e.iv.Lo = "-inf"
	case b.Inf > 0:
		e.iv.Lo = "inf"
	default:
		e.iv.Lo = b.Value.RatString()
		e.closed = !b.Open
	}
	return e
}

// endOf returns the breakpoint as an open end.
func endOf(r *poly.Ring, param int, bp breakpoint) pend {
	var e pend
	if bp.rational() {
		e.iv.Lo = bp.root.Exact.RatString()
		return e
	}
	e.iv.Lo = bp.root.Decimal(Digits)
	e.iv.LoPoly = poly.FromUnivariate(r, param, bp.root.Poly).String()
	e.iv.LoIsolating = &[2]string{bp.root.Lo.RatString(), bp.root.Hi.RatString()}
	return e
}

func setLo(iv *claims.Interval, e pend) {
	iv.Lo, iv.LoPoly, iv.LoIsolating, iv.LoClosed = e.iv.Lo, e.iv.LoPoly, e.iv.LoIsolating, e.closed
}

func setHi(iv *claims.Interval, e pend) {
	iv.Hi, iv.HiPoly, iv.HiIsolating, iv.HiClosed = e.iv.Lo, e.iv.LoPoly, e.iv.LoIsolating, e.closed
}

// insideRange keeps a root that lies in the interior of dom or at a closed
// finite end, refining an irrational root's interval until it lies strictly
// inside dom.
func insideRange(root poly.URoot, dom poly.Interval) (breakpoint, bool) {
	if root.Exact != nil {
		x := root.Exact
		if !dom.Contains(x) {
			return breakpoint{}, false
		}
		return breakpoint{root}, true
	}
	if dom.Lo.Inf == 0 && root.CompareRat(dom.Lo.Value) <= 0 {
		return breakpoint{}, false
	}
	if dom.Hi.Inf == 0 && root.CompareRat(dom.Hi.Value) >= 0 {
		return breakpoint{}, false
	}
	half := big.NewRat(1, 2)
	for {
		okLo := dom.Lo.Inf != 0 || root.Lo.Cmp(dom.Lo.Value) > 0
		okHi := dom.Hi.Inf != 0 || root.Hi.Cmp(dom.Hi.Value) < 0
		if okLo && okHi {
			return breakpoint{root}, true
		}
		w := new(big.Rat).Sub(root.Hi, root.Lo)
		root = root.Refine(w.Mul(w, half))
	}
}

// separate orders the breakpoints and refines isolating intervals until
// neighbours are strictly apart: each one's upper rational bound below the
// next one's lower. The breakpoints are distinct roots (of coprime factors),
// so halving the intervals of overlapping neighbours ends.
func separate(bps []breakpoint) {
	half := big.NewRat(1, 2)
	halve := func(b *breakpoint) {
		if !b.rational() {
			w := new(big.Rat).Sub(b.root.Hi, b.root.Lo)
			b.root = b.root.Refine(w.Mul(w, half))
		}
	}
	for apart := false; !apart; {
		slices.SortFunc(bps, func(a, b breakpoint) int { return a.lowerRat().Cmp(b.lowerRat()) })
		apart = true
		for i := 0; i+1 < len(bps); i++ {
			if bps[i].upperRat().Cmp(bps[i+1].lowerRat()) >= 0 {
				halve(&bps[i])
				halve(&bps[i+1])
				apart = false
			}
		}
	}
}

// holdsOn decides whether every condition is > 0 on a piece.
func holdsOn(conds []poly.Univariate, iv claims.Interval) bool {
	point := iv.Lo == iv.Hi && iv.LoPoly == iv.HiPoly && iv.LoClosed && iv.HiClosed
	if point {
		if iv.LoPoly != "" {
			return false
		}
		x, _ := new(big.Rat).SetString(iv.Lo)
		for _, q := range conds {
			if q.IsZero() || q.Sign(x) <= 0 {
				return false
			}
		}
		return true
	}
	x := samplePoint(iv)
	for _, q := range conds {
		if q.IsZero() || q.Sign(x) <= 0 {
			return false
		}
	}
	return true
}

// samplePoint returns a rational strictly inside an interval piece.
func samplePoint(iv claims.Interval) *big.Rat {
	lo := innerRat(iv.Lo, iv.LoIsolating, true)
	hi := innerRat(iv.Hi, iv.HiIsolating, false)
	switch {
	case lo == nil && hi == nil:
		return new(big.Rat)
	case lo == nil:
		return new(big.Rat).Sub(hi, big.NewRat(1, 1))
	case hi == nil:
		return new(big.Rat).Add(lo, big.NewRat(1, 1))
	}
	m := new(big.Rat).Add(lo, hi)
	return m.Quo(m, big.NewRat(2, 1))
}

// innerRat is the rational just inside an end (nil for an infinite end).
func innerRat(v string, iso *[2]string, lower bool) *big.Rat {
	if v == "-inf" || v == "inf" {
		return nil
	}
	if iso != nil {
		s := iso[0]
		if lower {
			s = iso[1]
		}
		x, _ := new(big.Rat).SetString(s)
		return x
	}
	x, _ := new(big.Rat).SetString(v)
	return x
}

// Intervals returns the holding pieces.
func Intervals(pieces []claims.Piece) []claims.Interval {
	out := []claims.Interval{}
	for _, p := range pieces {
		if p.Holds {
			out = append(out, p.Interval)
		}
	}
	return out
}
