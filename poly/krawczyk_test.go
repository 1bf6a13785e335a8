package poly

import "testing"

func TestPositiveDefiniteOn(t *testing.T) {
	iv := func(lo, hi string) Interval { return Closed(ratOf(lo), ratOf(hi)) }
	cases := []struct {
		e    [][]Interval
		want bool
	}{
		// hand computation: midpoint I, row sums of radii 1/2: I − 1/2·I ≻ 0.
		{[][]Interval{{iv("3/4", "5/4"), iv("0", "0")}, {iv("0", "0"), iv("3/4", "5/4")}}, true},
		// hand computation: radius 1 on the off-diagonal: I − 1·I is singular, refused
		// although each point matrix [[1, e], [e, 1]] with |e| < 1 is definite.
		{[][]Interval{{iv("1", "1"), iv("-1", "1")}, {iv("-1", "1"), iv("1", "1")}}, false},
		// hand computation: the point matrix [[1, 2], [2, 1]] is indefinite.
		{[][]Interval{{iv("1", "1"), iv("2", "2")}, {iv("2", "2"), iv("1", "1")}}, false},
	}
	for i, c := range cases {
		if got := PositiveDefiniteOn(c.e); got != c.want {
			t.Errorf("case %d: %v, want %v", i, got, c.want)
		}
	}
}

func TestKrawczykImage(t *testing.T) {
	r := NewRing([]string{"x"}, nil)
	g := []*Poly{MustParse(r, "x^2 - 2").Num}
	cases := []struct {
		lo, hi, y string
		inside    bool
	}{
		{"7/5", "3/2", "10/29", true},  // √2 ≈ 1.41421 ∈ [1.4, 1.5]; Y ≈ 1/(2·1.45) (common practice)
		{"3/2", "8/5", "10/31", false}, // no zero of x² − 2 in [1.5, 1.6] (hand computation)
		{"-3/2", "3/2", "1", false},    // two zeros: the test cannot pass (hand computation)
	}
	for _, c := range cases {
		box := []Interval{Closed(ratOf(c.lo), ratOf(c.hi))}
		k := KrawczykImage(g, box, ratMatrix([]string{c.y}))
		inside := k[0].Lo.Value.Cmp(box[0].Lo.Value) > 0 && k[0].Hi.Value.Cmp(box[0].Hi.Value) < 0
		if inside != c.inside {
			t.Errorf("[%s, %s]: K = %s, inside %v, want %v", c.lo, c.hi, k[0], inside, c.inside)
		}
	}
}
