package poly

import (
	"math/big"
	"math/rand/v2"
	"testing"
)

// Test helpers in this file carry the prefix "cft".
//
// Sources named in the tables:
//   - "centred form": the Taylor form at the box centre with its natural
//     extension over [-1, 1]^n (Moore 1966; Ratschek & Rokne, Computer
//     Methods for the Range of Functions, 1984), worked by hand in the
//     comment beside each case.
//   - "IEEE 1788-2015": containment (the enclosure contains the value of
//     the polynomial at every point of the set).
//   - "open-end extension": the rules for faces that are not part of the
//     set, documented in centered.go.

func cftRing() *Ring { return NewRing([]string{"x"}, []string{"a", "b", "c"}) }

func cftBox(t *testing.T, sides ...string) []Interval {
	t.Helper()
	out := make([]Interval, len(sides))
	for i, s := range sides {
		out[i] = ivtParse(t, s)
	}
	return out
}

func TestCenteredFormEnclose(t *testing.T) {
	r := cftRing()
	a, _ := r.Index("a")
	b, _ := r.Index("b")
	cases := []struct {
		p     string
		vars  []int
		box   []string
		open  OpenFaces
		want  string
		posOn bool
	}{
		// centred form: a^2 on [1, 3] is (2 + t)^2 = 4 + 4t + t^2 → [4−4, 4+4+1].
		{"a^2", []int{a}, []string{"[1, 3]"}, OpenFaces{}, "[0, 9]", false},
		// centred form: a^2 − 1/4 on [1, 2]: (3/2 + t/2)^2 − 1/4 = 2 + 3t/2 + t²/4 → [1/2, 15/4].
		{"a^2 - 1/4", []int{a}, []string{"[1, 2]"}, OpenFaces{}, "[1/2, 15/4]", true},
		// centred form: a·b on [0, 2]×[0, 2] is (1 + t)(1 + u) → [1−1−1−1, 1+1+1+1].
		{"a*b", []int{a, b}, []string{"[0, 2]", "[0, 2]"}, OpenFaces{}, "[-2, 4]", false},
		// centred form, exact for affine p: 3a − 2b + 1 on [0, 1]×[−1, 1].
		{"3*a - 2*b + 1", []int{a, b}, []string{"[0, 1]", "[-1, 1]"}, OpenFaces{}, "[-1, 6]", false},
		// constant: a point interval, both ends attained.
		{"7/3", []int{a}, []string{"[0, 1]"}, OpenFaces{}, "[7/3, 7/3]", true},
		// open-end extension: b on (0, 1] is 1/2 + u/2; the minimum at u = −1 is not in the set.
		{"b", []int{b}, []string{"(0, 1]"}, OpenFaces{Lo: 1}, "(0, 1]", true},
		// open-end extension: the same on the closed box attains 0.
		{"b", []int{b}, []string{"[0, 1]"}, OpenFaces{}, "[0, 1]", false},
		// open-end extension: a + b on [0, 1]×(0, 1]: 1 + t/2 + u/2, the lower end needs u = −1.
		{"a + b", []int{a, b}, []string{"[0, 1]", "(0, 1]"}, OpenFaces{Lo: 2}, "(0, 2]", true},
		// open-end extension: 1 − a^2 on (−1, 1): the even term −t² reaches −1 only at open ends.
		{"1 - a^2", []int{a}, []string{"(-1, 1)"}, OpenFaces{Lo: 1, Hi: 1}, "(0, 1]", true},
		// open-end extension: 1 + a·b with a's lower face and b's upper face open:
		// t·u = −1 at t = 1, u = −1, which is in the set.
		{"1 + a*b", []int{a, b}, []string{"(-1, 1]", "[-1, 1)"}, OpenFaces{Lo: 1, Hi: 2}, "[0, 2)", false},
		// open-end extension: both lower faces open: t·u = −1 needs one of them at −1.
		{"1 + a*b", []int{a, b}, []string{"(-1, 1]", "(-1, 1]"}, OpenFaces{Lo: 3}, "(0, 2]", true},
	}
	for _, tc := range cases {
		p := MustParse(r, tc.p).Num
		f, err := NewCenteredForm(p, tc.vars, cftBox(t, tc.box...))
		if err != nil {
			t.Fatalf("%s: %v", tc.p, err)
		}
		if got := f.Enclose(tc.open).String(); got != tc.want {
			t.Errorf("%s on %v: Enclose = %s, want %s", tc.p, tc.box, got, tc.want)
		}
		if got := f.PositiveOn(tc.open); got != tc.posOn {
			t.Errorf("%s on %v: PositiveOn = %v, want %v", tc.p, tc.box, got, tc.posOn)
		}
	}
}

func TestCenteredFormErrors(t *testing.T) {
	r := cftRing()
	a, _ := r.Index("a")
	b, _ := r.Index("b")
	x, _ := r.Index("x")
	cases := []struct {
		p    string
		vars []int
		box  []string
	}{
		{"a + b", []int{a}, []string{"[0, 1]"}},                  // b is not a side
		{"a", []int{a}, []string{"[0, +inf)"}},                   // unbounded
		{"a", []int{a}, []string{"[1, 1]"}},                      // a point
		{"a", []int{a, a}, []string{"[0, 1]", "[0, 1]"}},         // repeated
		{"a*x", []int{a}, []string{"[0, 1]"}},                    // a state
		{"a", []int{a, b}, []string{"[0, 1]"}},                   // sides mismatch
		{"a", []int{99}, []string{"[0, 1]"}},                     // bad index
		{"a", []int{-1}, []string{"[0, 1]"}},                     // bad index
		{"a", []int{a, x}, []string{"[0, 1]", "(-inf, +inf)"}},   // unbounded
		{"a", []int{a, b}, []string{"[0, 1]", "[2, 2]"}},         // a point
		{"b^2*a", []int{b, a}, []string{"[0, 1]", "(-inf, 0]"}},  // unbounded
		{"c", []int{a, b}, []string{"[0, 1]", "[0, 1]"}},         // c is not a side
		{"a*b*c", []int{a, b}, []string{"[0, 1]", "[0, 1]"}},     // c is not a side
		{"x", []int{a}, []string{"[0, 1]"}},                      // a state
		{"a^2 + x^2", []int{a, x}, []string{"[0, 1]", "[0, 1)"}}, // fine
	}
	for i, tc := range cases {
		_, err := NewCenteredForm(MustParse(r, tc.p).Num, tc.vars, cftBox(t, tc.box...))
		if (err == nil) != (i == len(cases)-1) {
			t.Errorf("case %d %s on %v: err = %v", i, tc.p, tc.box, err)
		}
	}
}

// Halving a form agrees exactly with the form built on the half box.
func TestCenteredFormHalf(t *testing.T) {
	r := cftRing()
	a, _ := r.Index("a")
	b, _ := r.Index("b")
	c, _ := r.Index("c")
	vars := []int{a, b, c}
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 40; trial++ {
		p := cftRandomPoly(r, rng, vars, 4)
		box := []Interval{
			Closed(big.NewRat(-1, 3), big.NewRat(2, 1)),
			Closed(big.NewRat(0, 1), big.NewRat(5, 7)),
			Closed(big.NewRat(-3, 1), big.NewRat(-1, 2)),
		}
		f, err := NewCenteredForm(p, vars, box)
		if err != nil {
			t.Fatal(err)
		}
		for step := 0; step < 6; step++ {
			dim := rng.IntN(3)
			upper := rng.IntN(2) == 1
			lo, hi := box[dim].Split()
			if upper {
				box[dim] = Closed(hi.Lo.Value, hi.Hi.Value)
			} else {
				box[dim] = lo
			}
			var g CenteredForm
			g.Half(f, dim, upper)
			direct, err := NewCenteredForm(p, vars, box)
			if err != nil {
				t.Fatal(err)
			}
			if gs, ds := g.Enclose(OpenFaces{}).String(), direct.Enclose(OpenFaces{}).String(); gs != ds {
				t.Fatalf("%s: halved form encloses %s, direct form %s", p, gs, ds)
			}
			f.Half(f, dim, upper) // in place
			if fs, ds := f.Enclose(OpenFaces{}).String(), direct.Enclose(OpenFaces{}).String(); fs != ds {
				t.Fatalf("%s: halved in place %s, direct %s", p, fs, ds)
			}
		}
	}
}

// IEEE 1788-2015 containment: the enclosure contains p at random rational
// points of the set, and an open end is never reached.
func TestCenteredFormContainment(t *testing.T) {
	r := cftRing()
	a, _ := r.Index("a")
	b, _ := r.Index("b")
	vars := []int{a, b}
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 60; trial++ {
		p := cftRandomPoly(r, rng, vars, 4)
		lo := []*big.Rat{big.NewRat(int64(rng.IntN(9))-4, int64(rng.IntN(3))+1), big.NewRat(int64(rng.IntN(9))-4, 2)}
		box := make([]Interval, 2)
		for i := range box {
			box[i] = Closed(lo[i], new(big.Rat).Add(lo[i], big.NewRat(int64(rng.IntN(4))+1, int64(rng.IntN(4))+1)))
		}
		open := OpenFaces{Lo: uint64(rng.IntN(4)), Hi: uint64(rng.IntN(4))}
		f, err := NewCenteredForm(p, vars, box)
		if err != nil {
			t.Fatal(err)
		}
		enc := f.Enclose(open)
		for k := 0; k < 50; k++ {
			x := make([]*big.Rat, r.NumVars())
			for i := range x {
				x[i] = new(big.Rat)
			}
			skip := false
			for i, v := range vars {
				// Points on a 4×4 grid including the faces.
				s := big.NewRat(int64(rng.IntN(5)), 4)
				if (s.Sign() == 0 && open.Lo&(1<<i) != 0) || (s.Cmp(big.NewRat(1, 1)) == 0 && open.Hi&(1<<i) != 0) {
					skip = true
				}
				w, _ := box[i].Width()
				x[v] = s.Mul(s, w).Add(s, box[i].Lo.Value)
			}
			if skip {
				continue
			}
			if y := p.Eval(x); !enc.Contains(y) {
				t.Fatalf("%s on %v with %+v: value %s at %v outside %s", p, box, open, y.RatString(), x, enc)
			}
		}
	}
}

func cftRandomPoly(r *Ring, rng *rand.Rand, vars []int, deg int) *Poly {
	p := Zero(r)
	for k := 0; k < 8; k++ {
		e := make([]int, r.NumVars())
		left := deg
		for _, v := range vars {
			e[v] = rng.IntN(left + 1)
			left -= e[v]
		}
		c := big.NewRat(int64(rng.IntN(21))-10, int64(rng.IntN(5))+1)
		p.Add(p, Monomial(r, e, c))
	}
	return p
}
