package branches

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Label is the linear type of one branch on one piece of the parameter range.
type Label struct {
	// Undecided: on a box of a Map, the exact tests did not decide the
	// label on the whole box (Kind and Stability are then "undecided").
	Undecided bool
	Exists    bool
	// Kind: "node", "focus", "degenerate node", "saddle", "centre
	// candidate", "zero eigenvalue", "eigenvalue 1", "eigenvalue -1",
	// "hyperbolic" (n ≥ 4, no finer type), "non-isolated", or "" when
	// Routh's count is singular.
	Kind string
	// Stability: "stable", "unstable" or "undetermined" (non-hyperbolic).
	Stability string
	// Unstable counts the eigenvalues in the open right half-plane (outside
	// the closed unit disc for maps); −1 when not decided.
	Unstable int
}

// Segment is a point or an open interval of the parameter range with the
// label of every branch there (indexed like Analysis.Branches).
type Segment struct {
	Span   poly.Span
	Labels []Label
}

// Bifurcation is a parameter value where a branch loses hyperbolicity.
type Bifurcation struct {
	// Value is exact: Exact for a rational value, else the unique root of
	// Poly in (Lo, Hi).
	Value poly.URoot
	// Kind: "pitchfork", "transcritical", "saddle-node", "zero-eigenvalue"
	// (continuous time, det J = 0, type not told), "hopf"; for maps
	// "pitchfork", "transcritical", "saddle-node", "eigenvalue-1",
	// "period-doubling", "neimark-sacker".
	Kind     string
	Branches []int
}

// Where returns the spans of the range where branch i has a label
// satisfying keep, adjacent pieces merged.
func (an *Analysis) Where(i int, keep func(Label) bool) []poly.Span {
	return mergeSpans(an.Pieces, func(p Segment) bool { return keep(p.Labels[i]) })
}

func mergeSpans(ps []Segment, keep func(Segment) bool) []poly.Span {
	var out []poly.Span
	open := false
	for _, p := range ps {
		if !keep(p) {
			open = false
			continue
		}
		if open {
			out[len(out)-1].Hi = p.Span.Hi
			continue
		}
		out = append(out, p.Span)
		open = true
	}
	return out
}

// extra holds per-branch quantities used by the classification only.
type extra struct {
	cubicDisc *Surd
	p1, pm1   Surd // p(1), p(−1) for maps
}

func classify(ctx context.Context, m *model.Model, an *Analysis, opts Options) error {
	free := m.FreeParams()
	e := evaluator{ring: m.Ring, pi: -1}
	switch {
	case len(free) == 0:
	case opts.Param != "":
		if len(free) > 1 {
			an.Notes = append(an.Notes, fmt.Sprintf("no classification along %s: other parameters are free", opts.Param))
			return nil
		}
		if free[0].Name != opts.Param {
			return fmt.Errorf("parameter %s is not free", opts.Param)
		}
		fallthrough
	case len(free) == 1:
		e.pi, _ = m.Ring.Index(free[0].Name)
		an.Param, an.Range = free[0].Name, free[0].Range
	}
	if !an.ClosedForm {
		return nil
	}
	n := len(m.States)
	ex := make([]extra, len(an.Branches))
	var crit []*poly.Poly
	addSurd := func(x Surd) { crit = append(crit, critical(x)...) }
	for i, b := range an.Branches {
		if b.W != nil {
			addSurd(Rational(*b.W))
		}
		crit = append(crit, b.Nonzero...)
		if !b.Isolated() {
			continue
		}
		for _, c := range b.CharPoly {
			addSurd(c)
		}
		for _, h := range b.Stable {
			addSurd(h)
		}
		if b.Disc != nil {
			addSurd(*b.Disc)
		}
		c := b.CharPoly
		if n == 3 {
			d := cubicDisc(c)
			ex[i].cubicDisc = &d
			addSurd(d)
		}
		if m.Discrete {
			ex[i].p1, ex[i].pm1 = intSurd(m.Ring, 0), intSurd(m.Ring, 0)
			for k, ck := range c {
				ex[i].p1 = ex[i].p1.Add(ck)
				if k%2 == 1 {
					ex[i].pm1 = ex[i].pm1.Sub(ck)
				} else {
					ex[i].pm1 = ex[i].pm1.Add(ck)
				}
			}
			addSurd(ex[i].p1)
			addSurd(ex[i].pm1)
		}
		// Coordinates of two branches meet where a transcritical or
		// pitchfork may happen; those places are roots of the above.
	}
	if len(free) >= 2 {
		// The map labels by the quantities above; P(p)'s region is not
		// mapped (its minors are long, and the labels say where the
		// branch is stable).
		return paveMap(ctx, m, an, ex, crit, opts)
	}
	for _, b := range an.Branches {
		if q := b.Quadratic; q != nil && q.P != nil {
			addSurd(q.SystemDet)
			for _, mi := range q.Minors {
				addSurd(mi)
			}
		}
	}
	pts, err := criticalPoints(ctx, e, crit, an.Range)
	if err != nil {
		return err
	}
	an.Pieces = pieces(e, pts, an.Range)
	for pi := range an.Pieces {
		if err := ctx.Err(); err != nil {
			return err
		}
		p := &an.Pieces[pi]
		t := samplePoint(p.Span)
		p.Labels = make([]Label, len(an.Branches))
		for i, b := range an.Branches {
			l, err := label(pointSigns{e, t}, b, ex[i], m.Discrete)
			if err != nil {
				return fmt.Errorf("branch %d at %s: %w", i, endString(p.Span.Lo), err)
			}
			p.Labels[i] = l
		}
	}
	for i, b := range an.Branches {
		if q := b.Quadratic; q != nil && q.P != nil {
			q.Region = mergeSpans(an.Pieces, func(p Segment) bool {
				if !p.Labels[i].Exists {
					return false
				}
				t := samplePoint(p.Span)
				if s, err := e.sign(q.SystemDet, t); err != nil || s == 0 {
					return false
				}
				for _, mi := range q.Minors {
					if s, err := e.sign(mi, t); err != nil || s <= 0 {
						return false
					}
				}
				return true
			})
		}
	}
	return bifurcations(e, an, ex, m.Discrete)
}

// cubicDisc is the discriminant of λ³ + aλ² + bλ + c:
// a²b² − 4b³ − 4a³c − 27c² + 18abc; positive iff three distinct real roots.
func cubicDisc(c []Surd) Surd {
	a, b, cc := c[2], c[1], c[0]
	r := a.Ring()
	k := func(n int64) Surd { return intSurd(r, n) }
	d := a.Mul(a).Mul(b).Mul(b)
	d = d.Sub(k(4).Mul(b.Pow(3)))
	d = d.Sub(k(4).Mul(a.Pow(3)).Mul(cc))
	d = d.Sub(k(27).Mul(cc).Mul(cc))
	d = d.Add(k(18).Mul(a).Mul(b).Mul(cc))
	return d
}

// criticalPoints isolates the roots of the critical polynomials inside the
// range, ascending, without repetition.
func criticalPoints(ctx context.Context, e evaluator, crit []*poly.Poly, rng poly.Interval) ([]point, error) {
	if e.pi < 0 {
		return nil, nil
	}
	prod := poly.NewUnivariate(big.NewRat(1, 1))
	var pts []point
	for _, c := range crit {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		if c.IsConst() {
			continue
		}
		u, err := e.uni(c)
		if err != nil {
			return nil, err
		}
		u = u.SquareFree()
		// Skip a factor already met.
		if g := poly.UnivariateGCD(u, prod); g.Degree() == u.Degree() {
			continue
		}
		prod = prod.Mul(u)
		for _, r := range u.IsolateRoots() {
			if !inRange(r, rng) {
				continue
			}
			dup := false
			for _, q := range pts {
				if poly.CompareRoots(q, r) == 0 {
					dup = true
					break
				}
			}
			if !dup {
				pts = append(pts, r)
			}
		}
	}
	// Insertion sort by exact comparison.
	for i := 1; i < len(pts); i++ {
		for j := i; j > 0 && poly.CompareRoots(pts[j-1], pts[j]) > 0; j-- {
			pts[j-1], pts[j] = pts[j], pts[j-1]
		}
	}
	return pts, nil
}

func inRange(r point, rng poly.Interval) bool {
	if rng.Lo.Inf == 0 {
		c := r.CompareRat(rng.Lo.Value)
		if c < 0 || (c == 0 && rng.Lo.Open) {
			return false
		}
	}
	if rng.Hi.Inf == 0 {
		c := r.CompareRat(rng.Hi.Value)
		if c > 0 || (c == 0 && rng.Hi.Open) {
			return false
		}
	}
	return true
}

func toEnd(t point, closed bool) poly.End {
	if t.Exact != nil {
		return poly.End{Value: new(big.Rat).Set(t.Exact), Closed: closed}
	}
	return poly.End{P: t.Poly, A: new(big.Rat).Set(t.Lo), B: new(big.Rat).Set(t.Hi), Closed: closed}
}

func boundEnd(b poly.Bound) poly.End {
	if b.Inf != 0 {
		return poly.End{Inf: b.Inf}
	}
	return poly.End{Value: new(big.Rat).Set(b.Value), Closed: !b.Open}
}

func endPoint(e poly.End) point {
	if e.Rational() {
		return ratPoint(e.Value)
	}
	return point{Poly: e.P, Lo: e.A, Hi: e.B}
}

// pieces cuts the range at the points: closed ends and roots are pieces of
// one point, the open intervals between them the others.
func pieces(e evaluator, pts []point, rng poly.Interval) []Segment {
	if e.pi < 0 {
		return []Segment{{Span: poly.Span{Lo: poly.End{Inf: -1}, Hi: poly.End{Inf: 1}}}}
	}
	var out []Segment
	lo := boundEnd(rng.Lo)
	if lo.Rational() && lo.Closed && (len(pts) == 0 || pts[0].CompareRat(lo.Value) != 0) {
		out = append(out, Segment{Span: poly.Span{Lo: lo, Hi: lo}})
	}
	cur := lo
	cur.Closed = false
	for _, t := range pts {
		hi := toEnd(t, false)
		if !(cur.Rational() && t.Exact != nil && cur.Value.Cmp(t.Exact) == 0) {
			out = append(out, Segment{Span: poly.Span{Lo: cur, Hi: hi}})
		}
		pt := toEnd(t, true)
		out = append(out, Segment{Span: poly.Span{Lo: pt, Hi: pt}})
		cur = toEnd(t, false)
	}
	hi := boundEnd(rng.Hi)
	last := hi
	last.Closed = false
	if !(cur.Rational() && hi.Rational() && cur.Value.Cmp(hi.Value) == 0) {
		out = append(out, Segment{Span: poly.Span{Lo: cur, Hi: last}})
	}
	if hi.Rational() && hi.Closed && (len(pts) == 0 || pts[len(pts)-1].CompareRat(hi.Value) != 0) {
		out = append(out, Segment{Span: poly.Span{Lo: hi, Hi: hi}})
	}
	return out
}

// samplePoint returns the point of a point piece, or a rational inside an
// open one (the isolating intervals of its ends refined apart first).
func samplePoint(s poly.Span) point {
	if s.Point() {
		return endPoint(s.Lo)
	}
	var a, b *big.Rat
	if s.Lo.Inf == 0 {
		a = s.Lo.Value
		if s.Lo.Algebraic() {
			a = s.Lo.B
		}
	}
	if s.Hi.Inf == 0 {
		b = s.Hi.Value
		if s.Hi.Algebraic() {
			b = s.Hi.A
		}
	}
	lo, hi := endPoint(s.Lo), endPoint(s.Hi)
	for a != nil && b != nil && a.Cmp(b) >= 0 {
		// Overlapping isolating intervals of distinct roots: halve both.
		if s.Lo.Algebraic() {
			w := new(big.Rat).Sub(lo.Hi, lo.Lo)
			lo = lo.Refine(w.Quo(w, big.NewRat(2, 1)))
			a = lo.Hi
			if lo.Exact != nil {
				a = lo.Exact
			}
		}
		if s.Hi.Algebraic() {
			w := new(big.Rat).Sub(hi.Hi, hi.Lo)
			hi = hi.Refine(w.Quo(w, big.NewRat(2, 1)))
			b = hi.Lo
			if hi.Exact != nil {
				b = hi.Exact
			}
		}
	}
	switch {
	case a == nil && b == nil:
		return ratPoint(new(big.Rat))
	case a == nil:
		return ratPoint(new(big.Rat).Sub(b, big.NewRat(1, 1)))
	case b == nil:
		return ratPoint(new(big.Rat).Add(a, big.NewRat(1, 1)))
	}
	mid := new(big.Rat).Add(a, b)
	return ratPoint(mid.Quo(mid, big.NewRat(2, 1)))
}

func endString(e poly.End) string {
	switch {
	case e.Inf < 0:
		return "-inf"
	case e.Inf > 0:
		return "+inf"
	case e.Rational():
		return e.Value.RatString()
	}
	return fmt.Sprintf("root of %s in (%s, %s)", e.P.String("t"), e.A.RatString(), e.B.RatString())
}

// exists decides whether the branch is defined at t: w(t) ≥ 0 and no
// condition polynomial vanishes.
func exists(e signs, b *Branch) (bool, error) {
	for _, c := range b.Nonzero {
		s, err := e.polySign(c)
		if err != nil {
			return false, err
		}
		if s == 0 {
			return false, nil
		}
	}
	if b.W != nil {
		s, err := e.ratSign(*b.W)
		if errors.Is(err, errDivZero) {
			return false, nil
		}
		if err != nil || s < 0 {
			return false, err
		}
	}
	return true, nil
}

// routhCount returns the number of sign changes of sign(lead), H₁, H₂/H₁,
// …, Hₙ/Hₙ₋₁ (Routh's first column), the number of roots in the open right
// half-plane; −1 when some H_k vanishes (the singular case).
func routhCount(lead int, h []int) int {
	prev := lead
	u := 0
	for k, s := range h {
		if s == 0 {
			return -1
		}
		col := s
		if k > 0 {
			col *= h[k-1]
		}
		if col != prev {
			u++
		}
		prev = col
	}
	return u
}

func label(e signs, b *Branch, ex extra, discrete bool) (Label, error) {
	ok, err := exists(e, b)
	if err != nil || !ok {
		return Label{}, err
	}
	if !b.Isolated() {
		return Label{Exists: true, Kind: "non-isolated", Stability: "undetermined", Unstable: -1}, nil
	}
	n := len(b.Coords)
	signs := func(xs []Surd) ([]int, error) {
		out := make([]int, len(xs))
		for i, x := range xs {
			s, err := e.sign(x)
			if err != nil {
				return nil, err
			}
			out[i] = s
		}
		return out, nil
	}
	h, herr := signs(b.Hurwitz)
	if herr != nil && !errors.Is(herr, errUndecided) {
		return Label{}, herr
	}
	l := Label{Exists: true, Stability: "undetermined", Unstable: -1}
	lead := 1
	if discrete {
		s, err := signs([]Surd{ex.p1, ex.pm1, *b.Lead})
		if err != nil {
			return Label{}, err
		}
		switch {
		case s[0] == 0:
			l.Kind = "eigenvalue 1"
			return l, nil
		case s[1] == 0:
			l.Kind = "eigenvalue -1"
			return l, nil
		}
		lead = s[2]
	} else {
		s, err := e.sign(b.CharPoly[0])
		if err != nil {
			return Label{}, err
		}
		if s == 0 {
			l.Kind = "zero eigenvalue"
			return l, nil
		}
	}
	if herr != nil {
		// On a box: the Hurwitz determinants' signs are not all decided.
		// Where no eigenvalue meets the imaginary axis (the unit circle),
		// their count on each side is constant on the connected box: that
		// holds when c₀ ≠ 0 (p(±1) ≠ 0 for maps, checked above) and
		// Hₙ₋₁ ≠ 0, which by Orlando's formula is ± the product of the
		// pairwise sums of the roots (of q for maps), so no imaginary
		// pair. Then the count is the one at the box's centre.
		c, ok := e.(centred)
		if !ok {
			return Label{}, herr
		}
		// The roots move continuously on the box: no coefficient has a
		// pole there.
		for _, ck := range b.CharPoly {
			for _, d := range append(slices.Clone(ck.A.Den), ck.B.Den...) {
				if _, err := e.polySign(d.P); err != nil {
					return Label{}, errUndecided
				}
			}
		}
		n := len(b.Hurwitz)
		if n >= 2 {
			if s, err := e.sign(b.Hurwitz[n-2]); err != nil || s == 0 {
				return Label{}, errUndecided
			}
		}
		at := c.centre()
		if h, herr = signsAt(at, b.Hurwitz); herr != nil {
			return Label{}, errUndecided
		}
		if discrete {
			s, err := at.sign(*b.Lead)
			if err != nil || s == 0 {
				return Label{}, errUndecided
			}
			lead = s
		}
		if routhCount(lead, h) < 0 {
			return Label{}, errUndecided
		}
	}
	u := routhCount(lead, h)
	if u < 0 && !discrete && (n == 2 || n == 3) && h[n-2] == 0 {
		// Hₙ₋₁ = 0 factors the polynomial: λ² + c₀ for n = 2, and
		// (λ + c₂)(λ² + c₁) for n = 3. A real pair ±√(−c) is hyperbolic.
		c := b.CharPoly[n-3+1]
		if n == 2 {
			c = b.CharPoly[0]
		}
		sc, err := e.sign(c)
		if err != nil {
			return Label{}, err
		}
		if sc < 0 {
			u = 1
			if n == 3 {
				sa, err := e.sign(b.CharPoly[2])
				if err != nil {
					return Label{}, err
				}
				if sa < 0 {
					u = 2
				}
			}
		}
	}
	if u < 0 {
		// Hopf / Neimark–Sacker candidate: Hₙ₋₁ = 0, the others and the
		// end coefficients positive (Liu 1994's criterion).
		if n >= 2 && h[n-2] == 0 && lead > 0 && h[n-1] == 0 {
			c0 := b.CharPoly[0]
			if discrete {
				c0 = ex.p1
			}
			sc, err := e.sign(c0)
			if err != nil {
				return Label{}, err
			}
			pos := sc > 0
			for _, s := range h[:n-2] {
				pos = pos && s > 0
			}
			if pos {
				l.Kind = "centre candidate"
			}
		}
		if !discrete {
			// Stodola's necessary condition: a Hurwitz polynomial has
			// all coefficients positive.
			for _, c := range b.CharPoly {
				if s, err := e.sign(c); err == nil && s < 0 {
					l.Stability = "unstable"
				}
			}
		}
		return l, nil
	}
	l.Unstable = u
	l.Stability = "unstable"
	if u == 0 {
		l.Stability = "stable"
	}
	if u > 0 && u < n {
		l.Kind = "saddle"
		return l, nil
	}
	var d *Surd
	switch n {
	case 1:
		l.Kind = "node"
		return l, nil
	case 2:
		d = b.Disc
	case 3:
		d = ex.cubicDisc
	default:
		l.Kind = "hyperbolic"
		return l, nil
	}
	s, err := e.sign(*d)
	if err != nil {
		return Label{}, err
	}
	switch {
	case s > 0:
		l.Kind = "node"
	case s < 0:
		l.Kind = "focus"
	default:
		l.Kind = "degenerate node"
	}
	return l, nil
}

// coincide reports that branches i and j have the same coordinates at t.
func coincide(e evaluator, a, b *Branch, t point) bool {
	for k := range a.Coords {
		d := a.Coords[k].Sub(b.Coords[k])
		if d.W == nil {
			d.W = b.W
		}
		s, err := e.sign(d, t)
		if err != nil || s != 0 {
			return false
		}
	}
	return true
}

func bifurcations(e evaluator, an *Analysis, ex []extra, discrete bool) error {
	if e.pi < 0 {
		return nil
	}
	for _, p := range an.Pieces {
		if !p.Span.Point() {
			continue
		}
		t := endPoint(p.Span.Lo)
		var zero []int
		events := map[string][]int{}
		var order []string
		add := func(kind string, i int) {
			if _, ok := events[kind]; !ok {
				order = append(order, kind)
			}
			events[kind] = append(events[kind], i)
		}
		for i, b := range an.Branches {
			l := p.Labels[i]
			if !l.Exists || !b.Isolated() {
				continue
			}
			switch l.Kind {
			case "zero eigenvalue", "eigenvalue 1":
				zero = append(zero, i)
			case "eigenvalue -1":
				add("period-doubling", i)
			case "centre candidate":
				if discrete {
					add("neimark-sacker", i)
				} else {
					add("hopf", i)
				}
			}
		}
		// Tell the zero-eigenvalue events apart by the branches meeting.
		used := map[int]bool{}
		for _, i := range zero {
			if used[i] {
				continue
			}
			b := an.Branches[i]
			kind := "zero-eigenvalue"
			if discrete {
				kind = "eigenvalue-1"
			}
			group := []int{i}
			for _, j := range zero {
				if j != i && !used[j] && coincide(e, b, an.Branches[j], t) {
					group = append(group, j)
				}
			}
			var pair, other []int
			for _, j := range group {
				if an.Branches[j].Pair >= 0 && an.Branches[j].W != nil {
					if s, err := e.ratSign(*an.Branches[j].W, t); err == nil && s == 0 {
						pair = append(pair, j)
						continue
					}
				}
				other = append(other, j)
			}
			switch {
			case len(pair) == 2 && len(other) >= 1:
				kind = "pitchfork"
			case len(pair) == 2:
				kind = "saddle-node"
			case len(other) >= 2:
				kind = "transcritical"
			}
			for _, j := range group {
				used[j] = true
			}
			if _, ok := events[kind]; !ok {
				order = append(order, kind)
			}
			events[kind] = append(events[kind], group...)
		}
		for _, k := range order {
			an.Bifurcations = append(an.Bifurcations, Bifurcation{Value: t, Kind: k, Branches: events[k]})
		}
	}
	return nil
}
