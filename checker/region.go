package checker

import (
	"fmt"
	"reflect"
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// readEnd reads one end of a piece (claims.ReadEnd): ±inf, a rational, or
// an algebraic number, the only root of its polynomial in the isolating
// interval that the stated decimal rounds (Sturm).
func (c *run) readEnd(value, polyText string, iso *[2]string, closed bool, param int, what string) (poly.End, bool) {
	e, err := claims.ReadEnd(c.r, param, value, polyText, iso, closed, c.sturm)
	return e, c.add("region", err == nil, "%s end %s is ±inf (open), a rational, or the only root of its polynomial in its isolating interval, which rounds to it (Sturm)%s", what, value, errSuffix(err))
}

// sturmRegion: the exact set of values of one parameter where every
// condition holds. The pieces tile the parameter's allowed range; on each,
// every condition is > 0 throughout, or some condition is ≤ 0 throughout.
// Sturm's theorem locates each irrational end (the unique root of its
// polynomial in an isolating interval) and shows every real root of every
// condition to be an end, so that one rational sample decides each piece
// (poly.Tiling.Signs).
func (c *run) sturmRegion(cl claims.Claim) bool {
	rg := cl.(*claims.SturmRegion)
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
	holds, fails, refuted, ok := c.regionPieces(rg, pi, conds, c.box[pi])
	c.region = &regionFacts{used, holds, fails, !fails, refuted}
	c.refuted = c.refuted || refuted
	c.seen["sturm-region"] = true
	return ok
}

// regionPieces checks that the pieces of rg partition dom (the range of the
// parameter with index pi), that every condition is > 0 throughout each
// holding piece and some condition is ≤ 0 throughout each other piece
// (Sturm), and that Intervals lists the holding pieces. It reports whether
// some piece holds, whether some piece does not, and whether every piece
// is refuted.
//
// A piece is refuted when the quadratic part of V or −V̇ has a negative
// direction at every parameter value in it: the first of its leading
// principal minors that is not > 0 throughout is < 0 throughout (Jacobi:
// with Δ₁ … Δₖ₋₁ > 0 and Δₖ < 0 the leading k×k block has a negative
// eigenvalue). Along that direction v, V(t·v) < 0 or V̇(t·v) > 0 for every
// small t ≠ 0, whatever the higher-order terms: the candidate fails
// arbitrarily close to the equilibrium. A Gram matrix in a monomial basis
// is not unique, so only quadratic parts count.
func (c *run) regionPieces(rg *claims.SturmRegion, pi int, conds []poly.Univariate, dom poly.Interval) (anyHolds, anyFails, allRefuted, ok bool) {
	var pieces []poly.Span
	for i, p := range rg.Pieces {
		what := fmt.Sprintf("piece %d", i+1)
		lo, ok1 := c.readEnd(p.Lo, p.LoPoly, p.LoIsolating, p.LoClosed, pi, what+" lower")
		hi, ok2 := c.readEnd(p.Hi, p.HiPoly, p.HiIsolating, p.HiClosed, pi, what+" upper")
		if !ok1 || !ok2 {
			return false, false, false, false
		}
		pieces = append(pieces, poly.Span{Lo: lo, Hi: hi})
	}
	err := poly.Tiles(pieces, dom)
	if !c.add("region", err == nil, "the pieces partition the range %s of %s%s", dom, rg.Param, errSuffix(err)) {
		return false, false, false, false
	}
	// Each piece: all conditions > 0 on it, or one condition ≤ 0 on all of it.
	signs, known := poly.Tiling(pieces).Signs(conds)
	if !c.add("region", !slices.Contains(known, false), "every real root of every condition in the range is an end of a piece (Sturm)") {
		return false, false, false, false
	}
	refuted := make([]bool, len(pieces))
	claimed := make([]bool, len(pieces))
	for i, p := range rg.Pieces {
		claimed[i] = p.Status == claims.PieceFails
	}
	for _, of := range []string{"V", "-Vdot"} {
		if f := c.forms[of]; f != nil && !f.basis && slices.Contains(claimed, true) {
			for i, neg := range poly.Tiling(pieces).Indefinite(f.minors, pi, claimed) {
				refuted[i] = refuted[i] || neg
			}
		}
	}
	var holdsText []claims.Interval
	allRefuted = true
	for i, p := range rg.Pieces {
		pos := slices.IndexFunc(signs, func(s poly.Signs) bool { return !s.Positive[i] })
		allRefuted = allRefuted && p.Status == claims.PieceFails
		if !c.add("region", p.Holds == (p.Status == claims.PieceHolds) && (p.Status != claims.PieceFails || refuted[i]) && slices.Contains([]string{claims.PieceHolds, claims.PieceFails, claims.PieceUndecided}, p.Status),
			"piece %d: status %q agrees with holds = %v (fails only where a leading minor is negative: %v)", i+1, p.Status, p.Holds, refuted[i]) {
			return false, false, false, false
		}
		if p.Holds {
			anyHolds = true
			holdsText = append(holdsText, p.Interval)
			// A rational point piece may hold by a point-check instead.
			at := c.points[claims.EndKey(rg.Param, p.Lo, p.LoPoly, p.LoIsolating)]
			if at != nil && pieces[i].Point() {
				if c.atPoint == "" || kindRank(at[1]) < kindRank(c.atPoint) {
					c.atPoint = at[1]
				}
			} else if c.byConds = true; !c.add("region", pos < 0, "piece %d: every condition is > 0 throughout", i+1) {
				return false, false, false, false
			}
		} else if anyFails = true; !c.add("region", slices.ContainsFunc(signs, func(s poly.Signs) bool { return s.NonPositive[i] }), "piece %d: some condition is ≤ 0 throughout", i+1) {
			return false, false, false, false
		}
	}
	if !c.add("region", slices.EqualFunc(holdsText, rg.Intervals, func(x, y claims.Interval) bool { return reflect.DeepEqual(x, y) }), "the listed intervals are the holding pieces") {
		return false, false, false, false
	}
	return anyHolds, anyFails, allRefuted, true
}
