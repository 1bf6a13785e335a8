package basin

import (
	"container/heap"
	"context"
	"math/big"
	"strings"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// node is a box of the bisection tree.
type node struct {
	g      poly.DyadicBox
	lo, hi *node                // the halves, nil for a leaf
	dim    int                  // the coordinate along which it was halved
	forms  []*poly.CenteredForm // V and −V̇ on the box, kept while it may be split
	dec    bool                 // V̇ < 0 proven on it but at the equilibrium (not along the edge)
	vlo    *big.Rat             // the lower end of V's enclosure
	key    float64              // vlo in float64, for the queue
	index  int
}

// queue orders the boxes that bound the level by the lower end of V.
type queue []*node

func (q queue) Len() int           { return len(q) }
func (q queue) Less(i, j int) bool { return q[i].key < q[j].key }
func (q queue) Swap(i, j int)      { q[i], q[j] = q[j], q[i]; q[i].index = i; q[j].index = j }
func (q *queue) Push(x any)        { n := x.(*node); n.index = len(*q); *q = append(*q, n) }
func (q *queue) Pop() any {
	old := *q
	n := old[len(old)-1]
	*q = old[:len(old)-1]
	return n
}

// paver is one branch and bound over the box sides.
type paver struct {
	n       int // the states; the sides after them are parameters
	sides   []poly.Interval
	at      []*big.Rat
	atf     []float64
	near    *poly.Poly // −V̇ at x* + y
	boxes   int        // leaves made
	nearTry int
	// directed: halve where the centred forms spread most (free
	// parameters), not every coordinate in turn.
	directed bool
}

// splitDim chooses the coordinate along which n is halved: in turn
// (poly.SplitDim), or, directed, the one below maxLevel halvings whose
// terms make the largest share of the enclosures' widths of V and −V̇
// (CenteredForm.Spread), so that a coordinate neither depends on is never
// halved; -1 when no coordinate may be halved.
func (p *paver) splitDim(n *node, maxLevel int) int {
	if !p.directed {
		if d := poly.SplitDim(n.g.K); n.g.K[d] < maxLevel {
			return d
		}
		return -1
	}
	score := make([]float64, len(n.g.K))
	for _, f := range n.forms {
		sp := f.Spread()
		total := 0.0
		fs := make([]float64, len(sp))
		for i, x := range sp {
			fs[i], _ = new(big.Float).SetInt(x).Float64()
			total += fs[i]
		}
		for i := range fs {
			if total > 0 {
				score[i] += fs[i] / total
			}
		}
	}
	best := -1
	for i, k := range n.g.K {
		if k < maxLevel && (best < 0 || score[i] > score[best]) {
			best = i
		}
	}
	return best
}

// classify settles what the leaf n shows.
func (p *paver) classify(n *node) {
	closed := poly.OpenFaces{}
	e := n.forms[0].Enclose(closed)
	n.vlo = e.Lo.Value
	n.key, _ = n.vlo.Float64()
	if n.g.OnEdgeFirst(p.n) {
		return
	}
	if n.forms[1].PositiveOn(closed) {
		n.dec = true
		return
	}
	s := n.g.Sides(p.sides)
	// Try the quadratic bound only on boxes that hold the equilibrium or
	// touch a box that does (a float test that only chooses what to try).
	for i := range p.n {
		lo, _ := s[i].Lo.Value.Float64()
		hi, _ := s[i].Hi.Value.Float64()
		w := hi - lo
		if p.atf[i] < lo-w || p.atf[i] > hi+w {
			return
		}
	}
	for i := range p.n {
		s[i] = s[i].Sub(poly.Point(p.at[i]))
	}
	p.nearTry++
	n.dec = p.near.PositiveNearZero(s)
}

// run halves the box with the least lower end of V until that end reaches
// goal, the finest halving reaches maxLevel, maxBoxes leaves are made or ctx
// ends; it returns the root and the least lower end of V over the boxes
// that bound the level.
func (p *paver) run(ctx context.Context, v, negVdot *poly.Poly, goal float64, maxLevel, maxBoxes int) (*node, *big.Rat, error) {
	n := len(p.sides)
	vars := make([]int, n)
	for i := range vars {
		vars[i] = i
	}
	root := &node{g: poly.DyadicBox{A: make([]int64, n), K: make([]int, n)}}
	for _, f := range []*poly.Poly{v, negVdot} {
		cf, err := poly.NewCenteredForm(f, vars, p.sides)
		if err != nil {
			return nil, nil, err
		}
		root.forms = append(root.forms, cf)
	}
	p.classify(root)
	p.boxes = 1
	q := &queue{}
	if !root.dec || root.g.OnEdgeFirst(p.n) {
		heap.Push(q, root)
	}
	for q.Len() > 0 {
		top := (*q)[0]
		dim := p.splitDim(top, maxLevel)
		if top.key >= goal || dim < 0 || p.boxes >= maxBoxes {
			break
		}
		if p.boxes%1024 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, nil, err
			}
		}
		heap.Pop(q)
		top.dim = dim
		gl, gh := top.g.Halves(dim)
		top.lo, top.hi = &node{g: gl}, &node{g: gh}
		for k, ch := range []*node{top.lo, top.hi} {
			ch.forms = make([]*poly.CenteredForm, len(top.forms))
			for j, f := range top.forms {
				ch.forms[j] = new(poly.CenteredForm).Half(f, dim, k == 1)
			}
			p.classify(ch)
			if ch.dec && !ch.g.OnEdgeFirst(p.n) {
				ch.forms = nil
			} else {
				heap.Push(q, ch)
			}
		}
		top.forms = nil
		p.boxes++
	}
	var least *big.Rat
	for _, m := range *q {
		if least == nil || m.vlo.Cmp(least) < 0 {
			least = m.vlo
		}
	}
	return root, least, nil
}

// tree writes the bisection tree against the level: S for a box split
// along poly.SplitDim, claims.PaveSplitAlong + k for one split along
// another coordinate k, I
// for a box where V̇ < 0 was proven (off the faces of the first states
// coordinates, the state box), O for every other
// box (V > level, since level < the lower end of V on it). It returns the
// tree, the resolution level and the counts of I and O boxes.
func tree(root *node, states int) (string, int, int, int) {
	var b strings.Builder
	level, in, out := 0, 0, 0
	var rec func(n *node)
	rec = func(n *node) {
		if n.lo != nil {
			if n.dim == poly.SplitDim(n.g.K) {
				b.WriteByte(claims.PaveSplit)
			} else {
				b.WriteByte(byte(claims.PaveSplitAlong + n.dim))
			}
			level = max(level, n.g.K[n.dim]+1)
			rec(n.lo)
			rec(n.hi)
			return
		}
		if n.dec && !n.g.OnEdgeFirst(states) {
			b.WriteByte(claims.PaveInside)
			in++
		} else {
			b.WriteByte(claims.PaveOutside)
			out++
		}
	}
	rec(root)
	return b.String(), level, in, out
}
