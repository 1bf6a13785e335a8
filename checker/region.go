package checker

import (
	"fmt"
	"math/big"
	"strconv"
	"strings"

	"lyacert/poly"
)

// SturmRegion is the exact set of values of one parameter where every
// condition holds: Pieces partition the parameter's allowed range (or a side
// of a paving's box) into intervals on which every condition holds (Holds)
// or some condition fails throughout; Intervals lists the holding pieces.
type SturmRegion struct {
	Param     string     `json:"param"`
	Intervals []Interval `json:"intervals"`
	Pieces    []Piece    `json:"pieces"`
}

func (*SturmRegion) Rule() string { return "sturm-region" }

// Interval has ends that are "-inf", "inf", an exact rational, or an
// irrational algebraic number: the unique root of LoPoly (HiPoly) in the
// open isolating interval LoIsolating (HiIsolating), with Lo (Hi) its
// decimal value to 15 significant digits, correctly rounded.
type Interval struct {
	Lo          string     `json:"lo"`
	Hi          string     `json:"hi"`
	LoClosed    bool       `json:"lo_closed"`
	HiClosed    bool       `json:"hi_closed"`
	LoPoly      string     `json:"lo_poly,omitempty"`
	HiPoly      string     `json:"hi_poly,omitempty"`
	LoIsolating *[2]string `json:"lo_isolating,omitempty"`
	HiIsolating *[2]string `json:"hi_isolating,omitempty"`
}

// Piece is one interval of the partition of a parameter's range.
type Piece struct {
	Interval
	Holds bool `json:"holds"`
}

// end is one end of a piece: -inf, +inf, a rational, or the unique root of
// poly in the open interval (a, b).
type end struct {
	inf    int
	value  *big.Rat // rational end
	poly   poly.Univariate
	a, b   *big.Rat // isolating interval of an algebraic end
	closed bool
	text   string
}

func (e end) rational() bool { return e.inf == 0 && e.value != nil }

func (e end) algebraic() bool { return e.inf == 0 && e.value == nil }

// same reports that two ends denote the same number in the same way.
func (e end) same(f end) bool {
	switch {
	case e.inf != 0 || f.inf != 0:
		return e.inf == f.inf
	case e.rational() && f.rational():
		return e.value.Cmp(f.value) == 0
	case e.algebraic() && f.algebraic():
		return e.poly.Equal(f.poly) && e.a.Cmp(f.a) == 0 && e.b.Cmp(f.b) == 0
	}
	return false
}

// inner returns the rational bounds just inside an end: the value itself, the
// far side of an isolating interval, or an infinity.
func (e end) inner(upper bool) poly.UBound {
	switch {
	case e.inf < 0:
		return poly.UBoundNegInf()
	case e.inf > 0:
		return poly.UBoundPosInf()
	case e.rational():
		return poly.UBound{Value: e.value, Open: !e.closed}
	case upper:
		return poly.UBound{Value: e.a} // closed: a lies inside the piece
	}
	return poly.UBound{Value: e.b}
}

func (c *run) readEnd(value, polyText string, iso *[2]string, closed bool, param int, what string) (end, bool) {
	e := end{closed: closed, text: value}
	switch {
	case polyText == "" && iso == nil && value == "-inf":
		e.inf = -1
	case polyText == "" && iso == nil && value == "inf":
		e.inf = 1
	case polyText == "" && iso == nil:
		q, ok := parseRat(value)
		if !c.add("region", ok, "%s end %q is a rational", what, value) {
			return e, false
		}
		e.value = q
	default:
		f, ok := c.parse("region", polyText)
		if !ok {
			return e, false
		}
		u, uni := f.Num.Univariate(param)
		if !c.add("region", f.IsPoly() && uni && u.Degree() >= 2 && iso != nil, "%s end: %s is a polynomial of degree ≥ 2 in the region's parameter with an isolating interval", what, polyText) {
			return e, false
		}
		a, ok1 := parseRat(iso[0])
		b, ok2 := parseRat(iso[1])
		if !c.add("region", ok1 && ok2 && a.Cmp(b) < 0, "%s end: isolating interval (%s, %s)", what, iso[0], iso[1]) {
			return e, false
		}
		if !c.add("region", u.CountRoots(poly.UBound{Value: a}, poly.UBound{Value: b}) == 1, "%s end: %s has exactly one root in [%s, %s] (Sturm)", what, polyText, iso[0], iso[1]) {
			return e, false
		}
		dv, half, ok := parseDecimal(value)
		if !c.add("region", ok, "%s end %q is a decimal", what, value) {
			return e, false
		}
		lo := new(big.Rat).Sub(dv, half)
		hi := new(big.Rat).Add(dv, half)
		if lo.Cmp(a) < 0 {
			lo = a
		}
		if hi.Cmp(b) > 0 {
			hi = b
		}
		if !c.add("region", lo.Cmp(hi) < 0 && u.CountRoots(poly.UBound{Value: lo, Open: true}, poly.UBound{Value: hi, Open: true}) == 1,
			"%s end: the root of %s rounds to %s", what, polyText, value) {
			return e, false
		}
		e.poly, e.a, e.b = u, a, b
	}
	if e.inf != 0 && !c.add("region", !closed, "%s end %s is open", what, value) {
		return e, false
	}
	return e, true
}

type piece struct {
	lo, hi end
	holds  bool
}

// less reports lo < hi for two ends, decided exactly from rational values and
// disjoint isolating intervals.
func less(lo, hi end) bool {
	switch {
	case lo.inf < 0 || hi.inf > 0:
		return !(lo.inf < 0 && hi.inf < 0) && !(lo.inf > 0 && hi.inf > 0)
	case lo.inf > 0 || hi.inf < 0:
		return false
	}
	l := lo.value
	if lo.algebraic() {
		l = lo.b
	}
	h := hi.value
	if hi.algebraic() {
		h = hi.a
	}
	return l.Cmp(h) < 0
}

// sturmRegion: the exact set of values of one parameter where every
// condition holds. The pieces tile the parameter's allowed range; on each,
// every condition is > 0 throughout, or some condition is ≤ 0 throughout.
// Sturm's theorem counts the distinct real roots of a condition in a piece
// (none inside means a constant sign, read at one rational sample), and
// locates each irrational end: the unique root of its polynomial in an
// isolating interval, whose decimal is checked the same way.
func (c *run) sturmRegion(cl Claim) bool {
	rg := cl.(*SturmRegion)
	used, ok := c.conditionsUsed("region")
	if !ok {
		return false
	}
	pi, ok := c.r.Index(rg.Param)
	if !c.add("region", ok && !c.r.IsState(pi), "the region's parameter %q is a free parameter", rg.Param) {
		return false
	}
	for v := range used {
		if !c.add("region", v == pi, "the conditions involve %s only", rg.Param) {
			return false
		}
	}
	var conds []poly.Univariate
	for _, q := range c.conds {
		u, _ := q.Num.Univariate(pi)
		conds = append(conds, u)
	}
	holds, fails, ok := c.regionPieces(rg, pi, conds, c.box[pi])
	c.sturm = &[2]bool{holds, fails}
	c.seen["sturm-region"] = true
	return ok
}

// regionPieces checks that the pieces of rg partition dom (the range of the
// parameter with index pi), that every condition is > 0 throughout each
// holding piece and some condition is ≤ 0 throughout each other piece
// (Sturm), and that Intervals lists the holding pieces. It reports whether
// some piece holds and whether some piece fails.
func (c *run) regionPieces(rg *SturmRegion, pi int, conds []poly.Univariate, dom poly.Interval) (anyHolds, anyFails, ok bool) {
	if !c.add("region", len(rg.Pieces) > 0, "the pieces partition the range %s of %s", dom, rg.Param) {
		return false, false, false
	}
	var pieces []piece
	for i, p := range rg.Pieces {
		what := fmt.Sprintf("piece %d", i+1)
		lo, ok1 := c.readEnd(p.Lo, p.LoPoly, p.LoIsolating, p.LoClosed, pi, what+" lower")
		if !ok1 {
			return false, false, false
		}
		hi, ok2 := c.readEnd(p.Hi, p.HiPoly, p.HiIsolating, p.HiClosed, pi, what+" upper")
		if !ok2 {
			return false, false, false
		}
		point := lo.same(hi) && lo.closed && hi.closed
		if !c.add("region", point || less(lo, hi), "%s is a non-empty interval", what) {
			return false, false, false
		}
		pieces = append(pieces, piece{lo, hi, p.Holds})
	}
	// Tiling: the first starts where the range starts, each next one starts
	// where the previous ends, with the shared end in exactly one of them,
	// and the last ends where the range ends.
	first, last := pieces[0].lo, pieces[len(pieces)-1].hi
	if !c.add("region", boundMatches(first, dom.Lo), "the first piece starts at the lower end of the range %s", dom) ||
		!c.add("region", boundMatches(last, dom.Hi), "the last piece ends at the upper end of the range %s", dom) {
		return false, false, false
	}
	for i := 1; i < len(pieces); i++ {
		a, b := pieces[i-1].hi, pieces[i].lo
		if !c.add("region", a.same(b) && a.closed != b.closed, "pieces %d and %d meet, their common end in exactly one", i, i+1) {
			return false, false, false
		}
	}
	// Each piece: all conditions > 0 on it, or one condition ≤ 0 on all of it.
	var holdsText []Interval
	for i, p := range pieces {
		if p.holds {
			anyHolds = true
			holdsText = append(holdsText, rg.Pieces[i].Interval)
			for j, q := range conds {
				if !c.add("region", positiveOn(q, p), "piece %d: condition %d is > 0 throughout", i+1, j+1) {
					return false, false, false
				}
			}
			continue
		}
		anyFails = true
		found := false
		for _, q := range conds {
			if nonPositiveOn(q, p) {
				found = true
				break
			}
		}
		if !c.add("region", found, "piece %d: some condition is ≤ 0 throughout", i+1) {
			return false, false, false
		}
	}
	if !c.add("region", intervalsEqual(holdsText, rg.Intervals), "the listed intervals are the holding pieces") {
		return false, false, false
	}
	return anyHolds, anyFails, true
}

func intervalsEqual(a, b []Interval) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		x, y := a[i], b[i]
		if x.Lo != y.Lo || x.Hi != y.Hi || x.LoClosed != y.LoClosed || x.HiClosed != y.HiClosed || x.LoPoly != y.LoPoly || x.HiPoly != y.HiPoly ||
			!isoEqual(x.LoIsolating, y.LoIsolating) || !isoEqual(x.HiIsolating, y.HiIsolating) {
			return false
		}
	}
	return true
}

func isoEqual(a, b *[2]string) bool {
	if a == nil || b == nil {
		return a == b
	}
	return *a == *b
}

// boundMatches compares a piece end with an end of the parameter's range.
func boundMatches(e end, b poly.Bound) bool {
	if b.Inf != 0 || e.inf != 0 {
		return b.Inf == e.inf
	}
	return e.rational() && e.value.Cmp(b.Value) == 0 && e.closed == !b.Open
}

// interiorRootFree reports that q has no root in the piece, with the piece's
// closed ends included when withEnds.
func interiorRootFree(q poly.Univariate, p piece, withEnds bool) bool {
	lo, hi := p.lo.inner(false), p.hi.inner(true)
	if !withEnds {
		if p.lo.rational() {
			lo.Open = true
		}
		if p.hi.rational() {
			hi.Open = true
		}
	}
	if q.CountRoots(lo, hi) != 0 {
		return false
	}
	// Between an algebraic end α and the inner side of its isolating
	// interval: the only root q may have there is α itself, which holds when
	// q has one root in the interval and shares a root there with α's
	// polynomial.
	for _, e := range []end{p.lo, p.hi} {
		if !e.algebraic() {
			continue
		}
		switch q.CountRoots(poly.UBound{Value: e.a, Open: true}, poly.UBound{Value: e.b, Open: true}) {
		case 0:
		case 1:
			g := poly.UnivariateGCD(q, e.poly)
			if g.Degree() < 1 || g.CountRoots(poly.UBound{Value: e.a, Open: true}, poly.UBound{Value: e.b, Open: true}) != 1 {
				return false
			}
			if withEnds && e.closed {
				return false // q(α) = 0 on a closed algebraic end
			}
		default:
			return false
		}
	}
	return true
}

// sample returns a rational point inside a piece of positive length.
func sample(p piece) *big.Rat {
	lo, hi := p.lo.inner(false), p.hi.inner(true)
	switch {
	case lo.Inf < 0 && hi.Inf > 0:
		return new(big.Rat)
	case lo.Inf < 0:
		return new(big.Rat).Sub(hi.Value, big.NewRat(1, 1))
	case hi.Inf > 0:
		return new(big.Rat).Add(lo.Value, big.NewRat(1, 1))
	}
	m := new(big.Rat).Add(lo.Value, hi.Value)
	return m.Quo(m, big.NewRat(2, 1))
}

// positiveOn reports q > 0 at every point of the piece.
func positiveOn(q poly.Univariate, p piece) bool {
	if q.IsZero() {
		return false
	}
	if p.lo.same(p.hi) {
		return pointSign(q, p.lo) > 0
	}
	return interiorRootFree(q, p, true) && q.Sign(sample(p)) > 0
}

// nonPositiveOn reports q ≤ 0 at every point of the piece (by continuity at
// the ends when q < 0 inside).
func nonPositiveOn(q poly.Univariate, p piece) bool {
	if q.IsZero() {
		return true
	}
	if p.lo.same(p.hi) {
		return pointSign(q, p.lo) <= 0
	}
	return interiorRootFree(q, p, false) && q.Sign(sample(p)) < 0
}

// pointSign returns the sign of q at a finite end; 2 when it cannot be decided.
func pointSign(q poly.Univariate, e end) int {
	if e.rational() {
		return q.Sign(e.value)
	}
	if e.inf != 0 {
		return 2
	}
	open := func(v *big.Rat) poly.UBound { return poly.UBound{Value: v, Open: true} }
	switch q.CountRoots(poly.UBound{Value: e.a}, poly.UBound{Value: e.b}) {
	case 0:
		return q.Sign(e.a)
	case 1:
		g := poly.UnivariateGCD(q, e.poly)
		if g.Degree() >= 1 && g.CountRoots(open(e.a), open(e.b)) == 1 {
			return 0
		}
	}
	return 2
}

// parseDecimal reads a decimal (digits, an optional point, an optional
// exponent) and returns it with half a unit of its last digit.
func parseDecimal(s string) (*big.Rat, *big.Rat, bool) {
	mant, exp, _ := strings.Cut(strings.ToLower(s), "e")
	e := 0
	if exp != "" {
		var err error
		if e, err = strconv.Atoi(exp); err != nil || e < -1000 || e > 1000 {
			return nil, nil, false
		}
	}
	if _, frac, ok := strings.Cut(mant, "."); ok {
		e -= len(frac)
	}
	v, ok := parseRat(s)
	if !ok || len(mant) > 1000 || strings.ContainsAny(s, "/") {
		return nil, nil, false
	}
	// half = 5·10^(e−1)
	half := big.NewRat(5, 1)
	p := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(abs(e-1))), nil))
	if e-1 >= 0 {
		half.Mul(half, p)
	} else {
		half.Quo(half, p)
	}
	return v, half, true
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}
