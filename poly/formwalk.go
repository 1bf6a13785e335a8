package poly

// FormWalk keeps the centred forms of a list of polynomials on the boxes of
// a bisection tree walked depth first (lower half first, each box halved
// along any coordinate): the forms of a box follow from its parent's by
// CenteredForm.Half, so the walk costs integer shifts and additions only.
type FormWalk struct {
	root  []*CenteredForm
	forms [][]*CenteredForm // forms[d]: the box at depth d of the current path
	halvs [][]int           // halvs[d]: the halvings K of that box
}

// NewFormWalk returns the walk of the polynomials ps over the box whose side
// i is box[i] for variable vars[i] (see NewCenteredForm).
func NewFormWalk(ps []*Poly, vars []int, box []Interval) (*FormWalk, error) {
	w := &FormWalk{root: make([]*CenteredForm, len(ps))}
	for j, p := range ps {
		f, err := NewCenteredForm(p, vars, box)
		if err != nil {
			return nil, err
		}
		w.root[j] = f
	}
	w.forms = [][]*CenteredForm{w.root}
	w.halvs = [][]int{make([]int, len(box))}
	return w, nil
}

// At returns the forms on g. The boxes must come in depth-first order: g is
// the root or a half of the box last passed at depth one less (its parent).
// The forms returned are overwritten by later calls at the same depth.
func (w *FormWalk) At(g DyadicBox) []*CenteredForm {
	d := g.Depth()
	if d == 0 {
		return w.root
	}
	for len(w.forms) <= d {
		fs := make([]*CenteredForm, len(w.root))
		for j := range fs {
			fs[j] = new(CenteredForm)
		}
		w.forms = append(w.forms, fs)
		w.halvs = append(w.halvs, make([]int, len(g.K)))
	}
	// g is the lower or upper half of its parent, the box last passed at
	// depth d − 1, along the one coordinate halved once more.
	dim := 0
	for dim < len(g.K)-1 && g.K[dim] == w.halvs[d-1][dim] {
		dim++
	}
	copy(w.halvs[d], g.K)
	for j := range w.root {
		w.forms[d][j].Half(w.forms[d-1][j], dim, g.A[dim]%2 == 1)
	}
	return w.forms[d]
}

// OnEdge reports whether g touches the boundary of the bisected box.
func (g DyadicBox) OnEdge() bool { return g.OnEdgeFirst(len(g.A)) }

// OnEdgeFirst reports whether g touches a face of the bisected box across
// one of the first k coordinates (the states, when the box also spans
// parameters that follow them).
func (g DyadicBox) OnEdgeFirst(k int) bool {
	for i, a := range g.A[:k] {
		if a == 0 || a == int64(1)<<g.K[i]-1 {
			return true
		}
	}
	return false
}

// Sides returns g's sides within the bisected box whose sides are box.
func (g DyadicBox) Sides(box []Interval) []Interval {
	out := make([]Interval, len(box))
	for i := range box {
		out[i] = Closed(Corner(box[i], g.A[i], g.K[i]), Corner(box[i], g.A[i]+1, g.K[i]))
	}
	return out
}

// Depth returns the number of halvings that made g.
func (g DyadicBox) Depth() int {
	d := 0
	for _, k := range g.K {
		d += k
	}
	return d
}
