package branches

import (
	"context"
	"errors"
	"fmt"
	"math/big"
	"slices"

	"github.com/lyacert/lyacert/certify/pave"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// DefaultResolution is the default resolution of the map over several free
// parameters: boxes are halved until every side is at most 1/64 of the
// box's side.
var DefaultResolution = big.NewRat(1, 64)

// DefaultMapBoxes bounds the boxes a map examines by default.
const DefaultMapBoxes = 1 << 17

// Map is the classification of the equilibrium branches over a box of two or
// more free parameters: a bisection of the box (set inversion, Moore 1966;
// Jaulin & Walter 1993) whose leaves carry one label per branch, decided on
// the whole leaf by exact centred forms, or undecided.
type Map struct {
	// Params are the paved parameters (every free one, in the model's
	// order), Vars their ring indices and Box their sides (bounded; an
	// open end stays open).
	Params []string
	Vars   []int
	Box    []poly.Interval
	// Level: boxes are halved until each side is at most 2^-Level of the
	// box's side (or until a label is decided for every branch).
	Level int
	// Leaves in depth-first order; two halves with equal labels are merged
	// back into their parent.
	Leaves []Leaf
	// Boxes is the number of boxes examined.
	Boxes int
	// Truncated is set when MaxBoxes stopped the bisection: some undecided
	// leaves are larger than the resolution.
	Truncated bool
}

// Leaf is one box of a Map with the label of every branch there (indexed
// like Analysis.Branches): Label.Undecided where the exact tests do not
// decide it on the whole box.
type Leaf struct {
	Box    poly.DyadicBox
	Labels []Label
}

// Corners returns the exact lower and upper corners of a leaf.
func (mp *Map) Corners(l Leaf) (lo, hi []*big.Rat) {
	for i, side := range mp.Box {
		lo = append(lo, poly.Corner(side, l.Box.A[i], l.Box.K[i]))
		hi = append(hi, poly.Corner(side, l.Box.A[i]+1, l.Box.K[i]))
	}
	return lo, hi
}

// Share returns the leaf's exact share of the box's volume, 2^-(ΣK).
func (l Leaf) Share() *big.Rat {
	d := 0
	for _, k := range l.Box.K {
		d += k
	}
	return new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Lsh(big.NewInt(1), uint(d)))
}

// Shares returns, for branch i, the exact share of the box's volume of each
// label written by key (for example "node, stable"; "undecided"; "absent"
// where the branch does not exist), in the order first met.
func (mp *Map) Shares(i int, key func(Label) string) (keys []string, shares []*big.Rat) {
	at := map[string]int{}
	for _, l := range mp.Leaves {
		k := key(l.Labels[i])
		j, ok := at[k]
		if !ok {
			j = len(keys)
			at[k] = j
			keys = append(keys, k)
			shares = append(shares, new(big.Rat))
		}
		shares[j].Add(shares[j], l.Share())
	}
	return keys, shares
}

// mapSides returns the sides of the map: each free parameter's range,
// clipped to its box in opts.Box; an error names a parameter whose side is
// unbounded.
func mapSides(m *model.Model, opts Options) ([]string, []int, []poly.Interval, error) {
	var names []string
	var vars []int
	var sides []poly.Interval
	for name := range opts.Box {
		p, ok := m.Param(name)
		if !ok {
			return nil, nil, nil, fmt.Errorf("--box %s: the model has no parameter %s", name, name)
		}
		if p.Fixed != nil {
			return nil, nil, nil, fmt.Errorf("--box %s: %s is fixed to %s", name, name, p.Fixed.RatString())
		}
	}
	for _, p := range m.FreeParams() {
		side := p.Range
		if b, ok := opts.Box[p.Name]; ok {
			lo, hi := b[0], b[1]
			if lo.Cmp(hi) >= 0 {
				return nil, nil, nil, fmt.Errorf("--box %s=%s..%s is empty or a point; give lo < hi", p.Name, lo.RatString(), hi.RatString())
			}
			side = poly.Interval{Lo: poly.Bound{Value: lo}, Hi: poly.Bound{Value: hi}}
			r := p.Range
			if r.Lo.Inf == 0 && lo.Cmp(r.Lo.Value) <= 0 {
				side.Lo = poly.Bound{Value: r.Lo.Value, Open: r.Lo.Open}
			}
			if r.Hi.Inf == 0 && hi.Cmp(r.Hi.Value) >= 0 {
				side.Hi = poly.Bound{Value: r.Hi.Value, Open: r.Hi.Open}
			}
			if side.Lo.Value.Cmp(side.Hi.Value) >= 0 {
				return nil, nil, nil, fmt.Errorf("--box %s=%s..%s does not meet the allowed range %s", p.Name, lo.RatString(), hi.RatString(), r)
			}
		}
		if side.Lo.Inf != 0 || side.Hi.Inf != 0 {
			return nil, nil, nil, fmt.Errorf("%w: %s ranges over %s; give it a box (--box %s=LO..HI)", errUnbounded, p.Name, p.Range, p.Name)
		}
		v, _ := m.Ring.Index(p.Name)
		names, vars, sides = append(names, p.Name), append(vars, v), append(sides, side)
	}
	return names, vars, sides, nil
}

var errUnbounded = errors.New("no map over the free parameters")

// paveMap bisects the box of the free parameters and labels each leaf per
// branch with the same rules as the one-parameter classification (label),
// every sign decided on the whole leaf by boxSigns.
func paveMap(ctx context.Context, m *model.Model, an *Analysis, ex []extra, crit []*poly.Poly, opts Options) error {
	names, vars, sides, err := mapSides(m, opts)
	if errors.Is(err, errUnbounded) {
		an.Notes = append(an.Notes, err.Error())
		return nil
	}
	if err != nil {
		return err
	}
	res := opts.Resolution
	if res == nil {
		res = DefaultResolution
	}
	level, err := pave.Level(res)
	if err != nil {
		return err
	}
	maxBoxes := opts.MaxBoxes
	if maxBoxes <= 0 {
		maxBoxes = DefaultMapBoxes
	}
	pv := &paver{ctx: ctx, m: m, an: an, ex: ex, vars: vars, sides: sides, level: level, max: maxBoxes,
		index: map[*poly.Poly]int{}, byText: map[string]int{}, norms: map[[2]*poly.Poly]poly.RatFunc{}}
	for i, s := range sides {
		if s.Lo.Open {
			pv.open.Lo |= 1 << i
		}
		if s.Hi.Open {
			pv.open.Hi |= 1 << i
		}
	}
	var root []*poly.CenteredForm
	for _, c := range crit {
		if c.IsConst() {
			continue
		}
		key := c.String()
		if _, ok := pv.byText[key]; ok {
			continue
		}
		f, err := poly.NewCenteredForm(c, vars, sides)
		if err != nil {
			continue // left out: its signs stay undecided
		}
		pv.byText[key] = len(root)
		root = append(root, f)
	}
	pv.mp = &Map{Params: names, Vars: vars, Box: sides, Level: level}
	n := len(vars)
	if err := pv.walk(poly.DyadicBox{A: make([]int64, n), K: make([]int, n)}, root); err != nil {
		return err
	}
	an.Map = pv.mp
	return nil
}

type paver struct {
	ctx   context.Context
	m     *model.Model
	an    *Analysis
	ex    []extra
	vars  []int
	sides []poly.Interval
	open  poly.OpenFaces
	level int
	max   int
	mp    *Map
	// index finds a polynomial's form: by pointer, else by its text.
	index  map[*poly.Poly]int
	byText map[string]int
	norms  map[[2]*poly.Poly]poly.RatFunc
}

func (pv *paver) formIndex(p *poly.Poly) (int, bool) {
	if i, ok := pv.index[p]; ok {
		return i, i >= 0
	}
	i, ok := pv.byText[p.String()]
	if !ok {
		i = -1
	}
	pv.index[p] = i
	return i, ok
}

func (pv *paver) norm(x Surd) poly.RatFunc {
	k := [2]*poly.Poly{x.A.Num, x.B.Num}
	if nm, ok := pv.norms[k]; ok {
		return nm
	}
	nm := x.Norm()
	pv.norms[k] = nm
	return nm
}

// walk labels the box g (forms: the registered polynomials' centred forms
// on it) and halves it while a label is undecided, the box is wider than
// the resolution and the box count allows.
func (pv *paver) walk(g poly.DyadicBox, forms []*poly.CenteredForm) error {
	if pv.mp.Boxes%256 == 0 {
		if err := pv.ctx.Err(); err != nil {
			return fmt.Errorf("map over the free parameters interrupted: %w", err)
		}
	}
	pv.mp.Boxes++
	bs := &boxSigns{pv: pv, g: g, forms: forms, faces: g.OpenFacesOn(pv.open)}
	labels := make([]Label, len(pv.an.Branches))
	undecided := false
	for i, b := range pv.an.Branches {
		l, err := label(bs, b, pv.ex[i], pv.m.Discrete)
		if err != nil {
			l = Label{Undecided: true, Kind: "undecided", Stability: "undecided", Unstable: -1}
			undecided = true
		}
		labels[i] = l
	}
	if !undecided || g.MinLevel() >= pv.level || pv.mp.Boxes >= pv.max {
		if undecided && g.MinLevel() < pv.level {
			pv.mp.Truncated = true
		}
		pv.mp.Leaves = append(pv.mp.Leaves, Leaf{Box: g, Labels: labels})
		return nil
	}
	dim := poly.SplitDim(g.K)
	lo, hi := g.Halves(dim)
	first := len(pv.mp.Leaves)
	for k, half := range []poly.DyadicBox{lo, hi} {
		child := make([]*poly.CenteredForm, len(forms))
		for j, f := range forms {
			child[j] = new(poly.CenteredForm).Half(f, dim, k == 1)
		}
		if err := pv.walk(half, child); err != nil {
			return err
		}
	}
	// Two leaves with the same labels make their parent one leaf: each label
	// holds on both halves, so on their union.
	if len(pv.mp.Leaves) == first+2 && slices.Equal(pv.mp.Leaves[first].Labels, pv.mp.Leaves[first+1].Labels) {
		pv.mp.Leaves = append(pv.mp.Leaves[:first], Leaf{Box: g, Labels: pv.mp.Leaves[first].Labels})
	}
	return nil
}

// boxSigns decides signs on a whole box of the map: a polynomial's sign is
// decided when the exact enclosure of its centred form (poly.CenteredForm,
// open faces excluded) lies on one side of 0.
type boxSigns struct {
	pv      *paver
	g       poly.DyadicBox
	forms   []*poly.CenteredForm
	faces   poly.OpenFaces
	centre0 []*big.Rat
}

func (s *boxSigns) polySign(p *poly.Poly) (int, error) {
	if p.IsZero() {
		return 0, nil
	}
	if p.IsConst() {
		return p.ConstTerm().Sign(), nil
	}
	i, ok := s.pv.formIndex(p)
	if !ok {
		return 0, errUndecided
	}
	iv := s.forms[i].Enclose(s.faces)
	lo, hi := iv.Lo, iv.Hi
	switch {
	case lo.Inf == 0 && (lo.Value.Sign() > 0 || lo.Value.Sign() == 0 && lo.Open):
		return 1, nil
	case hi.Inf == 0 && (hi.Value.Sign() < 0 || hi.Value.Sign() == 0 && hi.Open):
		return -1, nil
	}
	return 0, errUndecided
}

// ratSign is the sign of num/den: every factor of the denominator must
// have a decided sign (it does not vanish on the box).
func (s *boxSigns) ratSign(f poly.RatFunc) (int, error) {
	sn, err := s.polySign(f.Num)
	if err != nil || sn == 0 {
		return sn, err
	}
	for _, d := range f.Den {
		ds, err := s.polySign(d.P)
		if err != nil {
			return 0, err
		}
		if d.Mult%2 == 1 {
			sn *= ds
		}
	}
	return sn, nil
}

// sign decides a + b·√w on the box, where w ≥ 0 (the branch exists
// there). When the norm a² − b²w has a sign on the box, a + b·√w does not
// vanish there (a² > b²w makes a ≠ 0 and |a| > |b|√w; a² < b²w makes
// b ≠ 0 and |b|√w > |a|), so its sign is that of a, or of b, which are
// continuous and non-zero on the connected box: their sign at its centre.
// Otherwise a and b must have one sign on the box.
func (s *boxSigns) sign(x Surd) (int, error) {
	if x.B.IsZero() {
		return s.ratSign(x.A)
	}
	if x.A.IsZero() {
		if sw, err := s.ratSign(*x.W); err != nil || sw <= 0 {
			return 0, errUndecided
		}
		return s.ratSign(x.B)
	}
	sn, err := s.ratSign(s.pv.norm(x))
	switch {
	case err == nil && sn > 0:
		return s.centreSign(x.A)
	case err == nil && sn < 0:
		return s.centreSign(x.B)
	}
	sa, errA := s.ratSign(x.A)
	sb, errB := s.ratSign(x.B)
	if errA == nil && errB == nil && sa != 0 && sa == sb {
		return sa, nil
	}
	return 0, errUndecided
}

// centre returns exact signs at the box's centre.
func (s *boxSigns) centre() signs {
	s.centrePoint()
	return ratSigns{s.centre0}
}

func (s *boxSigns) centrePoint() {
	if s.centre0 == nil {
		s.centre0 = make([]*big.Rat, s.pv.m.Ring.NumVars())
		for i := range s.centre0 {
			s.centre0[i] = new(big.Rat)
		}
		for i, v := range s.pv.vars {
			s.centre0[v] = poly.Corner(s.pv.sides[i], 2*s.g.A[i]+1, s.g.K[i]+1)
		}
	}
}

// centreSign returns the sign of f on the box given that f does not vanish
// there: its sign at the centre, once its denominator is shown non-zero on
// the box.
func (s *boxSigns) centreSign(f poly.RatFunc) (int, error) {
	for _, d := range f.Den {
		if _, err := s.polySign(d.P); err != nil {
			return 0, err
		}
	}
	s.centrePoint()
	v, err := f.Eval(s.centre0)
	if err != nil || v.Sign() == 0 {
		return 0, errUndecided
	}
	return v.Sign(), nil
}
