package pave

import (
	"context"
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/interval"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// Sources named in the tables:
//   - "IEEE 1788-2015": containment (an enclosure contains the value at
//     every point of the box), set-based even powers straddling zero.
//   - "mean-value form": p(m) + ∇p(X)·(X − m), worked by hand in the
//     comment (Moore 1966).
//   - "common practice, no source": the resolution rule and bookkeeping.

func TestLevel(t *testing.T) {
	cases := []struct {
		res  string
		want int // -1: error
	}{
		{"1", 0},       // common practice, no source: no halving
		{"2", 0},       // common practice, no source: coarser than the box
		{"1/2", 1},     // common practice, no source
		{"1/3", 2},     // common practice, no source: 1/4 ≤ 1/3
		{"1/256", 8},   // common practice, no source: the default
		{"1/1000", 10}, // common practice, no source: 1/1024 ≤ 1/1000
		{"3/1024", 9},  // common practice, no source: 1/512 ≤ 3/1024
		{"0", -1},
		{"-1/2", -1},
		{"1/1125899906842624", 50}, // common practice, no source: 2^-50, the finest
		{"1/2251799813685248", -1}, // 2^-51: finer than allowed
	}
	for _, tc := range cases {
		q, _ := new(big.Rat).SetString(tc.res)
		got, err := Level(q)
		if tc.want < 0 {
			if err == nil {
				t.Errorf("Level(%s) = %d, want an error", tc.res, got)
			}
			continue
		}
		if err != nil || got != tc.want {
			t.Errorf("Level(%s) = %d, %v; want %d", tc.res, got, err, tc.want)
		}
	}
}

func ratRing() *poly.Ring { return poly.NewRing([]string{"x"}, []string{"a", "b"}) }

// The float enclosure: the natural extension intersected with the
// mean-value form.
func TestFloatEnclose(t *testing.T) {
	r := ratRing()
	cases := []struct {
		p      string
		box    [2]interval.F
		lo, hi float64
	}{
		// IEEE 1788-2015: an even power straddling zero starts at an exact 0:
		// natural [0, 4]; mean-value at m = 1/2: 1/4 + [−2, 4]·[−3/2, 3/2].
		{"a^2", [2]interval.F{{Lo: -1, Hi: 2}, {Lo: 0, Hi: 0}}, 0, 4},
		// mean-value form: 3a − 2 is affine, both forms give [−2, 1].
		{"3*a - 2", [2]interval.F{{Lo: 0, Hi: 1}, {Lo: 0, Hi: 0}}, -2, 1},
		// mean-value form tighter than natural: a − a^2 on [0, 1]:
		// natural [−1, 1]; mean-value 1/4 + [−1, 1]·[−1/2, 1/2] = [−1/4, 3/4].
		{"a - a^2", [2]interval.F{{Lo: 0, Hi: 1}, {Lo: 0, Hi: 0}}, -0.25, 0.75},
		// IEEE 1788-2015: zero-width box, the value itself.
		{"a*b + 1", [2]interval.F{{Lo: 2, Hi: 2}, {Lo: 3, Hi: 3}}, 7, 7},
		// natural: a·b on [−1, 1]² is [−1, 1]; mean value is wider.
		{"a*b", [2]interval.F{{Lo: -1, Hi: 1}, {Lo: -1, Hi: 1}}, -1, 1},
	}
	for _, tc := range cases {
		fp := newFloatPoly(poly.MustParse(r, tc.p).Num, []int{1, 2})
		x := tc.box[:]
		m := []interval.F{interval.Pt(x[0].Mid()), interval.Pt(x[1].Mid())}
		got := fp.enclose(x, powersOf(x, 2), powersOf(m, 2))
		if got.Lo != tc.lo || got.Hi != tc.hi {
			t.Errorf("%s on %v: %v, want [%g, %g]", tc.p, tc.box, got, tc.lo, tc.hi)
		}
	}
}

// IEEE 1788-2015 containment of the float enclosure, at random rational
// points of random boxes (with coefficients that are not floats).
func TestFloatEncloseContainment(t *testing.T) {
	r := ratRing()
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 200; trial++ {
		p := poly.Zero(r)
		for k := 0; k < 6; k++ {
			e := []int{0, rng.IntN(4), rng.IntN(4)}
			p.Add(p, poly.Monomial(r, e, big.NewRat(int64(rng.IntN(41))-20, int64(rng.IntN(6))+1)))
		}
		lo := []*big.Rat{big.NewRat(int64(rng.IntN(21))-10, 3), big.NewRat(int64(rng.IntN(21))-10, 7)}
		wd := []*big.Rat{big.NewRat(int64(rng.IntN(5)), 9), big.NewRat(int64(rng.IntN(5)), 5)}
		x := make([]interval.F, 2)
		for i := range x {
			hi := new(big.Rat).Add(lo[i], wd[i])
			x[i] = interval.F{Lo: interval.FromRat(lo[i]).Lo, Hi: interval.FromRat(hi).Hi}
		}
		m := []interval.F{interval.Pt(x[0].Mid()), interval.Pt(x[1].Mid())}
		fp := newFloatPoly(p, []int{1, 2})
		enc := fp.enclose(x, powersOf(x, 3), powersOf(m, 3))
		for k := 0; k < 20; k++ {
			pt := []*big.Rat{new(big.Rat), new(big.Rat), new(big.Rat)}
			for i := range 2 {
				s := big.NewRat(int64(rng.IntN(11)), 10)
				pt[i+1] = s.Mul(s, wd[i]).Add(s, lo[i])
			}
			v := p.Eval(pt)
			if new(big.Rat).SetFloat64(enc.Lo).Cmp(v) > 0 || new(big.Rat).SetFloat64(enc.Hi).Cmp(v) < 0 {
				t.Fatalf("%s at %v = %s outside %v", p, pt, v.RatString(), enc)
			}
		}
	}
}

func discBox() ([]*poly.Poly, []Side) {
	r := ratRing()
	q := poly.MustParse(r, "1 - a^2 - b^2").Num
	return []*poly.Poly{q}, []Side{
		{1, poly.Closed(big.NewRat(-2, 1), big.NewRat(2, 1))},
		{2, poly.Interval{Lo: poly.Bound{Value: big.NewRat(-2, 1)}, Hi: poly.Bound{Value: big.NewRat(3, 2), Open: true}}},
	}
}

// Every leaf is what the checker's exact test says, the tree has the shape
// claims.Paving documents, and points of inside (outside) leaves
// satisfy (violate) the condition.
func TestPaveRegionLeaves(t *testing.T) {
	conds, box := discBox()
	pv, err := PaveRegion(context.Background(), conds, box, 5, Options{})
	if err != nil {
		t.Fatal(err)
	}
	doc := claims.Paving{Params: []string{"a", "b"}, Resolution: "1/32", Tree: pv.Tree}
	for _, s := range box {
		doc.Box = append(doc.Box, claims.Interval{Lo: s.Range.Lo.Value.RatString(), Hi: s.Range.Hi.Value.RatString(), LoClosed: !s.Range.Lo.Open, HiClosed: !s.Range.Hi.Open})
	}
	sum, err := certificates.Summarize(&doc)
	if err != nil {
		t.Fatal(err)
	}
	if sum.Inside != pv.Inside || sum.Outside != pv.Outside || sum.Undecided != pv.Undecided || pv.Inside == 0 || pv.Outside == 0 || pv.Undecided == 0 {
		t.Fatalf("counts %d/%d/%d, derived %d/%d/%d", pv.Inside, pv.Outside, pv.Undecided, sum.Inside, sum.Outside, sum.Undecided)
	}
	leaves, err := certificates.Leaves(&doc)
	if err != nil {
		t.Fatal(err)
	}
	for _, lf := range leaves {
		for _, s := range []int64{0, 1, 2, 3, 4} {
			pt := []*big.Rat{new(big.Rat), new(big.Rat), new(big.Rat)}
			for i := range 2 {
				w := new(big.Rat).Sub(lf.Hi[i], lf.Lo[i])
				pt[i+1] = w.Mul(w, big.NewRat(s, 4)).Add(w, lf.Lo[i])
			}
			v := conds[0].Eval(pt)
			switch {
			case lf.Class == claims.PaveInside && v.Sign() <= 0:
				t.Errorf("inside leaf %v has %s at %v", lf, v.RatString(), pt)
			case lf.Class == claims.PaveOutside && v.Sign() > 0:
				t.Errorf("outside leaf %v has %s at %v", lf, v.RatString(), pt)
			}
		}
	}
	// Outward rounding and the exact test agree on this box: the exact
	// area share π·1²/(4·3.5) lies between inside and inside + undecided.
	in, _ := new(big.Rat).SetString(sum.InsideFraction)
	und, _ := new(big.Rat).SetString(sum.UndecidedFraction)
	fi, _ := in.Float64()
	fu, _ := und.Float64()
	if exact := math.Pi / 14; fi > exact || fi+fu < exact {
		t.Errorf("inside %g, undecided %g do not bracket %g", fi, fu, exact)
	}
}

func TestPaveRegionWorkersAndErrors(t *testing.T) {
	conds, box := discBox()
	want, err := PaveRegion(context.Background(), conds, box, 7, Options{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range []int{2, 3, 16} {
		got, err := PaveRegion(context.Background(), conds, box, 7, Options{Workers: w})
		if err != nil || got.Tree != want.Tree {
			t.Errorf("%d workers: a different tree (%v)", w, err)
		}
	}
	if _, err := PaveRegion(context.Background(), conds, box, 7, Options{MaxBoxes: 100}); !errors.Is(err, ErrTooManyBoxes) {
		t.Errorf("MaxBoxes 100: %v", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := PaveRegion(ctx, conds, box, 7, Options{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
	unbounded := []Side{box[0], {2, poly.Entire()}}
	if _, err := PaveRegion(context.Background(), conds, unbounded, 3, Options{}); err == nil {
		t.Error("an unbounded side is accepted")
	}
	if _, err := PaveRegion(context.Background(), conds, box[:1], 3, Options{}); err == nil {
		t.Error("a condition in a parameter that is not paved is accepted")
	}
}

type recorder struct{ shares []float64 }

func (r *recorder) Paved(s float64) { r.shares = append(r.shares, s) }

func TestPaveRegionProgress(t *testing.T) {
	conds, box := discBox()
	var rec recorder
	if _, err := PaveRegion(context.Background(), conds, box, 8, Options{Progress: &rec}); err != nil {
		t.Fatal(err)
	}
	for i := 1; i < len(rec.shares); i++ {
		if rec.shares[i] < rec.shares[i-1] {
			t.Fatalf("progress goes back: %v", rec.shares)
		}
	}
	if n := len(rec.shares); n < 2 || math.Abs(rec.shares[n-1]-1) > 1e-12 {
		t.Errorf("progress ends at %v", rec.shares)
	}
}
