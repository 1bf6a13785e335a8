package poly

import (
	"math/big"
	"testing"
)

func box2(lo, hi int64) []Interval {
	return []Interval{Closed(big.NewRat(lo, 1), big.NewRat(hi, 1)), Closed(big.NewRat(lo, 1), big.NewRat(hi, 1))}
}

func halfBox(lo, hi int64) []Interval {
	return []Interval{Closed(big.NewRat(lo, 2), big.NewRat(hi, 2)), Closed(big.NewRat(lo, 2), big.NewRat(hi, 2))}
}

// QuadraticCofactors is an identity: yᵀ(G + M(y))y gives p back (checked
// by expanding it), with G and M symmetric.
func TestQuadraticCofactorsIdentity(t *testing.T) {
	r := NewRing([]string{"x", "y", "z"}, nil)
	for _, s := range []string{"x^2 + y^2 + z^2", "x^2 - 3*x*y + 2*y^2 + x^3", "x*y*z + 5*x^4 - y^2*z^2 + x*z", "-2*x^2 - 4*y^2 - 2*z^2 + 6*x*y*z + 2*x^4 + z^4"} {
		p := MustParse(r, s).Num
		g, m, ok := QuadraticCofactors(p)
		if !ok {
			t.Fatalf("%s: not accepted", s)
		}
		sum := Zero(r)
		for i := range 3 {
			for j := range 3 {
				if g[i][j].Cmp(g[j][i]) != 0 || !m[i][j].Equal(m[j][i]) {
					t.Fatalf("%s: not symmetric at (%d, %d)", s, i, j)
				}
				e := new(Poly).Mul(Var(r, i), Var(r, j))
				c := new(Poly).Add(Const(r, g[i][j]), m[i][j])
				sum.Add(sum, new(Poly).Mul(e, c))
			}
		}
		if !sum.Equal(p) {
			t.Errorf("%s: yᵀ(G + M)y = %s", s, sum)
		}
	}
	for _, s := range []string{"x^2 + 1", "x^2 + y", "x"} {
		if _, _, ok := QuadraticCofactors(MustParse(r, s).Num); ok {
			t.Errorf("%s: accepted with a constant or linear term", s)
		}
	}
}

// x² + y² + x³ = x²(1 + x) + y² is > 0 but at 0 exactly where x > −1
// (common practice: factor by hand); −x² − y² is negative definite; a form
// with an indefinite quadratic part is never proven.
func TestPositiveNearZero(t *testing.T) {
	r := NewRing([]string{"x", "y"}, nil)
	cases := []struct {
		p    string
		box  []Interval
		want bool
	}{
		{"x^2 + y^2 + x^3", halfBox(-1, 1), true},
		{"x^2 + y^2 + x^3", box2(-2, 2), false}, // negative at (−3/2, 0)
		{"x^2 + y^2 + x^3", halfBox(1, 3), true},
		{"-x^2 - y^2", halfBox(-1, 1), false},
		{"x^2 - y^2", halfBox(-1, 1), false},
		{"x^2 + x*y + y^2 - x^2*y^2", halfBox(-1, 1), true},
	}
	for _, c := range cases {
		if got := MustParse(r, c.p).Num.PositiveNearZero(c.box); got != c.want {
			t.Errorf("%s on %v: %v, want %v", c.p, c.box, got, c.want)
		}
	}
}

// The forms a FormWalk hands out equal the forms made afresh on each box of
// the tree (their enclosures agree exactly).
func TestFormWalkMatchesFreshForms(t *testing.T) {
	r := NewRing([]string{"x", "y"}, nil)
	ps := []*Poly{MustParse(r, "x^3 - 2*x*y + y^2 - 1/3").Num, MustParse(r, "x^2*y^2 + x").Num}
	box := []Interval{Closed(big.NewRat(-1, 1), big.NewRat(2, 1)), Closed(big.NewRat(-3, 2), big.NewRat(1, 2))}
	w, err := NewFormWalk(ps, []int{0, 1}, box)
	if err != nil {
		t.Fatal(err)
	}
	var split func(g DyadicBox, depth int) int
	var rec func(g DyadicBox, depth int)
	rec = func(g DyadicBox, depth int) {
		fs := w.At(g)
		for j, p := range ps {
			f, err := NewCenteredForm(p, []int{0, 1}, g.Sides(box))
			if err != nil {
				t.Fatal(err)
			}
			a, b := fs[j].Enclose(OpenFaces{}), f.Enclose(OpenFaces{})
			if a.String() != b.String() {
				t.Fatalf("box %v: walk %s, fresh %s", g, a, b)
			}
		}
		if depth == 4 {
			return
		}
		lo, hi := g.Halves(split(g, depth))
		rec(lo, depth+1)
		rec(hi, depth+1)
	}
	// In turn, then in an order that depends on the box (a bisection
	// directed by the forms may halve one coordinate several times running).
	for _, split = range []func(DyadicBox, int) int{
		func(g DyadicBox, _ int) int { return SplitDim(g.K) },
		func(g DyadicBox, depth int) int { return int(g.A[0]+int64(depth)) % 3 / 2 },
	} {
		rec(DyadicBox{A: []int64{0, 0}, K: []int{0, 0}}, 0)
	}
	if g := (DyadicBox{A: []int64{1, 0}, K: []int{1, 1}}); !g.OnEdge() {
		t.Error("a box on the lower face is not on the edge")
	}
	if g := (DyadicBox{A: []int64{1, 2}, K: []int{2, 2}}); g.OnEdge() {
		t.Error("an inner box is on the edge")
	}
	// Only the first k coordinates count: a box inside across x but on the
	// lower face across the third coordinate (common practice).
	g := DyadicBox{A: []int64{1, 2, 0}, K: []int{2, 2, 2}}
	if !g.OnEdge() || g.OnEdgeFirst(2) || !g.OnEdgeFirst(3) {
		t.Errorf("%v: on the edge %v, across the first two %v, across all three %v", g, g.OnEdge(), g.OnEdgeFirst(2), g.OnEdgeFirst(3))
	}
}

// With a parameter a in the coefficients: a·x² + a·y² + x³ = x²(a + x) + a·y²
// is > 0 but at y = 0 exactly where a > 0 and a + x > 0 (common practice:
// factor by hand), so it is proven for a ∈ [1, 2] on [−1/2, 1/2]², and not
// for a ∈ [1/4, 2], where a = 1/4, x = −1/2 gives −1/16.
func TestPositiveNearZeroParameters(t *testing.T) {
	r := NewRing([]string{"x", "y"}, []string{"a"})
	p := MustParse(r, "a*x^2 + a*y^2 + x^3").Num
	cases := []struct {
		a    Interval
		want bool
	}{
		{Closed(big.NewRat(1, 1), big.NewRat(2, 1)), true},
		{Closed(big.NewRat(1, 4), big.NewRat(2, 1)), false},
		{Closed(big.NewRat(-1, 1), big.NewRat(2, 1)), false},
	}
	for _, c := range cases {
		if got := p.PositiveNearZero(append(halfBox(-1, 1), c.a)); got != c.want {
			t.Errorf("a ∈ %v: %v, want %v", c.a, got, c.want)
		}
	}
	if _, _, ok := QuadraticCofactors(p); ok {
		t.Error("QuadraticCofactors accepts a polynomial with a parameter")
	}
	g, m, ok := QuadraticParts(p)
	if !ok {
		t.Fatal("QuadraticParts refuses a·x² + a·y² + x³")
	}
	sum := Zero(r)
	for i := range 2 {
		for j := range 2 {
			e := new(Poly).Mul(Var(r, i), Var(r, j))
			sum.Add(sum, new(Poly).Mul(e, new(Poly).Add(g[i][j], m[i][j])))
		}
	}
	if !sum.Equal(p) {
		t.Errorf("yᵀ(G + M)y = %s, want %s", sum, p)
	}
	if _, _, ok := QuadraticParts(MustParse(r, "x^2 + a*y").Num); ok {
		t.Error("QuadraticParts accepts a term linear in the states")
	}
}
