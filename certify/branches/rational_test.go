package branches

import (
	"context"
	"errors"
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// TestReparametrizeLorenz: C± of the Lorenz system (Lorenz 1963) with
// σ = 10, b = 8/3 are ±(√(b(r − 1)), √(b(r − 1)), r − 1). With u the
// branch's square root the model in u has C± rational, and the region of
// its symbolic P(u) maps back to 1 < r < r_H = σ(σ + b + 3)/(σ − b − 1) =
// 470/19, the Hopf value (Strogatz, Nonlinear Dynamics and Chaos, §9.2).
func TestReparametrizeLorenz(t *testing.T) {
	m := readModel(t, "lorenz.lya")
	m, err := model.FixParams(m, []model.Setting{{Name: "sigma", Value: big.NewRat(10, 1)}, {Name: "b", Value: big.NewRat(8, 3)}})
	if err != nil {
		t.Fatal(err)
	}
	an := analyze(t, m)
	for i, b := range an.Branches {
		rp, err := Reparametrize(context.Background(), m, an, i)
		if b.W == nil {
			if !errors.Is(err, ErrNoReparametrization) {
				t.Fatalf("branch %d without a square root: %v", i+1, err)
			}
			continue
		}
		if err != nil {
			t.Fatal(err)
		}
		if rp.Param != "r" || rp.NewParam != "u" {
			t.Fatalf("%s, %s", rp.Param, rp.NewParam)
		}
		// In u, b(r − 1) = (8/3)(u² − D)/C − 8/3 must be a square: check
		// x² = b(r − 1) exactly at u = 3 along the branch found.
		br := rp.Analysis.Branches[rp.Index]
		at := []*big.Rat{new(big.Rat), new(big.Rat), new(big.Rat), big.NewRat(3, 1)}
		x, err := br.Coords[0].A.Eval(at)
		if err != nil {
			t.Fatal(err)
		}
		z, _ := br.Coords[2].A.Eval(at)
		lhs := new(big.Rat).Mul(x, x)
		rhs := new(big.Rat).Mul(big.NewRat(8, 3), z)
		if lhs.Cmp(rhs) != 0 {
			t.Fatalf("x² = %s, b·z = %s", lhs.RatString(), rhs.RatString())
		}
		q := br.Quadratic
		if q == nil || len(q.Region) != 1 {
			t.Fatalf("region of P(u): %v", q)
		}
		s := q.Region[0]
		ui := 3
		iv := claims.Interval{Lo: "0", Hi: "?", HiClosed: s.Hi.Closed}
		if s.Lo.Rational() {
			iv.Lo = s.Lo.Value.RatString()
		}
		hp := poly.FromUnivariate(rp.Model.Ring, ui, s.Hi.P).String()
		iv.HiPoly, iv.HiIsolating = hp, &[2]string{s.Hi.A.RatString(), s.Hi.B.RatString()}
		back, ok, err := rp.MapBack(iv, m.Params[1].Range)
		if err != nil || !ok {
			t.Fatalf("map back: %v %v", ok, err)
		}
		if !back.Lo.Rational() || back.Lo.Value.Cmp(big.NewRat(1, 1)) != 0 || back.Lo.Closed ||
			!back.Hi.Rational() || back.Hi.Value.Cmp(big.NewRat(470, 19)) != 0 || back.Hi.Closed {
			t.Fatalf("branch %d: r region %s, want (1, 470/19)", i+1, spansString([]poly.Span{back}))
		}
	}
}

// TestReparametrizeDecreasing: x' = y, y' = 4 − 2a − x² − y has the
// branches x = ±√(4 − 2a) (hand computation); u = √(4 − 2a) gives
// a = 2 − u²/2, decreasing in u, so u ∈ (0, 1) is a ∈ (3/2, 2), and with a's
// range [0, 7/4] the clipped interval is (3/2, 7/4]. A square root of
// degree two in every parameter has no such parametrization.
func TestReparametrizeDecreasing(t *testing.T) {
	m := parse(t, "dec.lya", "state x, y\nparameter a in [0, 7/4]\nx' = y\ny' = 4 - 2*a - x^2 - y\n")
	an := analyze(t, m)
	var rp *Reparametrization
	for i, b := range an.Branches {
		if b.W != nil {
			var err error
			if rp, err = Reparametrize(context.Background(), m, an, i); err != nil {
				t.Fatal(err)
			}
			break
		}
	}
	if rp == nil || rp.Relation() != "a = -1/2*u^2 + 2" {
		t.Fatalf("relation %v", rp)
	}
	back, ok, err := rp.MapBack(claims.Interval{Lo: "0", Hi: "1"}, m.Params[0].Range)
	if err != nil || !ok {
		t.Fatal(ok, err)
	}
	if back.Lo.Value.Cmp(big.NewRat(3, 2)) != 0 || back.Lo.Closed || back.Hi.Value.Cmp(big.NewRat(7, 4)) != 0 || !back.Hi.Closed {
		t.Fatalf("a region %s, want (3/2, 7/4]", spansString([]poly.Span{back}))
	}

	m2 := parse(t, "sq.lya", "state x, y\nparameter a\nx' = y\ny' = a^2 + 1 - x^2 - y\n")
	an2 := analyze(t, m2)
	for i, b := range an2.Branches {
		if b.W == nil {
			continue
		}
		if _, err := Reparametrize(context.Background(), m2, an2, i); !errors.Is(err, ErrNoReparametrization) {
			t.Fatalf("sqrt(%s): %v", b.W, err)
		}
	}
}
