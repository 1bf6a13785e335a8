package poly

import (
	"math/big"
	"testing"
)

// TestCoprimeBasis checks the defining properties of a gcd-free (coprime)
// basis (common practice): square-free elements, pairwise coprime, and for
// every input p the elements dividing p have exactly p's roots (the monic
// square-free part of p equals their product).
func TestCoprimeBasis(t *testing.T) {
	s2 := utP("-2", "0", "1") // t² − 2
	cases := [][]Univariate{
		{s2.Mul(utP("-1", "1")), s2.Mul(s2).Mul(utP("3", "1")), utP("0", "-1", "0", "1")},
		{utP("-1", "0", "1"), utP("1", "1"), utP("-1", "1").Mul(utP("-1", "1")), utP("5")},
		{utP("1", "0", "1"), utP("0", "1")},
	}
	for k, ps := range cases {
		basis := CoprimeBasis(ps)
		for i, b := range basis {
			if b.Degree() < 1 || !b.SquareFree().Equal(b.Monic()) {
				t.Errorf("case %d: element %s is not square-free of degree ≥ 1", k, b.String("t"))
			}
			for _, c := range basis[i+1:] {
				if UnivariateGCD(b, c).Degree() >= 1 {
					t.Errorf("case %d: %s and %s share a factor", k, b.String("t"), c.String("t"))
				}
			}
		}
		for _, p := range ps {
			if p.Degree() < 1 {
				continue
			}
			prod := UnivariateFromInts(1)
			for _, b := range basis {
				if _, r := p.DivMod(b); r.IsZero() {
					prod = prod.Mul(b)
				}
			}
			if !prod.Monic().Equal(p.SquareFree()) {
				t.Errorf("case %d: the elements dividing %s multiply to %s", k, p.String("t"), prod.String("t"))
			}
		}
	}
}

// TestSturmRoundsTo: √2 = 1.41421356237309504… (decimal expansion from
// memory), so to 15 significant digits it is 1.41421356237310.
func TestSturmRoundsTo(t *testing.T) {
	st := NewSturm(utP("-2", "0", "1"))
	a, b := utR("1"), utR("2")
	if n := st.Count(UBound{Value: a}, UBound{Value: b}); n != 1 {
		t.Fatalf("%d roots of t² − 2 in [1, 2], want 1", n)
	}
	for _, c := range []struct {
		dec  string
		want bool
	}{{"1.41421356237310", true}, {"1.41421356237309", false}, {"1.4142135623731", true}, {"1.41", true}, {"1.42", false}, {"1.4142x", false}} {
		if got := st.RoundsTo(a, b, c.dec); got != c.want {
			t.Errorf("RoundsTo(%s) = %v, want %v", c.dec, got, c.want)
		}
	}
}

// TestTilingSigns: signs of polynomials on the tiling of the line by the
// roots ±√2 of t² − 2 (hand computation): 2 − t² is > 0 only on the middle
// piece; (t² − 2)(t + 5) changes sign at −5, which is no end, so it cannot be
// told; t³ − 2t = t(t² − 2) vanishes at 0, inside a piece, likewise.
func TestTilingSigns(t *testing.T) {
	s2 := utP("-2", "0", "1")
	root := func(lo, hi string, p Univariate) End { return End{P: p, A: utR(lo), B: utR(hi)} }
	tiling := func(p Univariate) Tiling {
		m, q := root("-2", "-1", p), root("1", "2", p)
		mc, qc := m, q
		mc.Closed, qc.Closed = true, true
		return Tiling{
			{End{Inf: -1}, m}, {mc, mc}, {m, q}, {qc, qc}, {q, End{Inf: 1}},
		}
	}
	qs := []Univariate{
		utP("2", "0", "-1"),                // 2 − t²
		s2.Mul(utP("5", "1")),              // (t² − 2)(t + 5)
		utP("0", "-2", "0", "1"),           // t³ − 2t
		s2.Mul(s2).Mul(utP("1", "0", "1")), // (t² − 2)²(t² + 1) ≥ 0
		utP("-1"),                          // −1
		{},                                 // 0
	}
	wantOK := []bool{true, false, false, true, true, true}
	wantPos := [][]bool{
		{false, false, true, false, false},
		nil, nil,
		{true, false, true, false, true},
		{false, false, false, false, false},
		{false, false, false, false, false},
	}
	wantNonPos := [][]bool{
		{true, true, false, true, true},
		nil, nil,
		{false, true, false, true, false},
		{true, true, true, true, true},
		{true, true, true, true, true},
	}
	// The same answers whether the ends name t² − 2 itself or a multiple of
	// it that does not divide the conditions (the gcd decides then).
	for _, p := range []Univariate{s2, s2.Mul(utP("-7", "1"))} {
		signs, ok := tiling(p).Signs(qs)
		for j := range qs {
			if ok[j] != wantOK[j] {
				t.Errorf("ends of %s, %s: ok %v, want %v", p.String("t"), qs[j].String("t"), ok[j], wantOK[j])
				continue
			}
			if !ok[j] {
				continue
			}
			for i := range wantPos[j] {
				if signs[j].Positive[i] != wantPos[j][i] || signs[j].NonPositive[i] != wantNonPos[j][i] {
					t.Errorf("ends of %s, %s on piece %d: > 0 %v, ≤ 0 %v; want %v, %v", p.String("t"), qs[j].String("t"), i+1,
						signs[j].Positive[i], signs[j].NonPositive[i], wantPos[j][i], wantNonPos[j][i])
				}
			}
		}
	}
}

// TestSignAt: signs of polynomials at √2 and at the golden ratio φ, each
// the only root of its polynomial in (1, 2) (values from memory: √2 ≈
// 1.41421356, φ = (1 + √5)/2 ≈ 1.61803399).
func TestSignAt(t *testing.T) {
	sqrt2 := End{P: UnivariateFromInts(-2, 0, 1), A: big.NewRat(1, 1), B: big.NewRat(2, 1), Closed: true}
	phi := End{P: UnivariateFromInts(-1, -1, 1), A: big.NewRat(1, 1), B: big.NewRat(2, 1), Closed: true}
	for _, c := range []struct {
		name string
		q    Univariate
		at   End
		want int
	}{
		{"a^2 - 2 at √2", UnivariateFromInts(-2, 0, 1), sqrt2, 0},
		{"(a^2 - 2)(a + 7) at √2", UnivariateFromInts(-14, -2, 7, 1), sqrt2, 0},
		{"1000000a - 1414213 at √2", UnivariateFromInts(-1414213, 1000000), sqrt2, 1},
		{"1000000a - 1414214 at √2", UnivariateFromInts(-1414214, 1000000), sqrt2, -1},
		{"3 at √2", UnivariateFromInts(3), sqrt2, 1},
		{"a^2 - a - 1 at φ", UnivariateFromInts(-1, -1, 1), phi, 0},
		{"a - 8/5 at φ", NewUnivariate(big.NewRat(-8, 5), big.NewRat(1, 1)), phi, 1},
		{"a^2 - 2 at φ", UnivariateFromInts(-2, 0, 1), phi, 1},
		{"a - 5/3 at φ", NewUnivariate(big.NewRat(-5, 3), big.NewRat(1, 1)), phi, -1},
	} {
		got, ok := SignAt(c.q, c.at)
		if !ok || got != c.want {
			t.Errorf("%s: sign %d (%v), want %d", c.name, got, ok, c.want)
		}
	}
}

// TestTiles: pieces that tile [0, ∞) and pieces that leave a gap or
// overlap (common practice: a partition of an interval).
func TestTiles(t *testing.T) {
	r := func(n int64) End { return End{Value: big.NewRat(n, 1), Closed: true} }
	open := func(e End) End { e.Closed = false; return e }
	inf := End{Inf: 1}
	dom := Interval{Lo: Bound{Value: new(big.Rat)}, Hi: Bound{Inf: 1, Open: true}}
	good := []Span{{r(0), open(r(1))}, {r(1), r(1)}, {open(r(1)), inf}}
	if err := Tiles(good, dom); err != nil {
		t.Errorf("a partition is refused: %v", err)
	}
	for name, bad := range map[string][]Span{
		"gap":     {{r(0), open(r(1))}, {open(r(1)), inf}},
		"overlap": {{r(0), r(1)}, {r(1), inf}},
		"late":    {{r(1), inf}},
		"empty":   {{r(0), open(r(0))}, {r(0), inf}},
		"none":    nil,
	} {
		if Tiles(bad, dom) == nil {
			t.Errorf("%s: accepted", name)
		}
	}
}
