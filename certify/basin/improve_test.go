package basin

import (
	"context"
	"math"
	"math/big"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// lambdaMax2 is the larger eigenvalue of the symmetric 2×2 matrix p:
// (a+d)/2 + sqrt(((a−d)/2)² + b²) (common practice).
func lambdaMax2(p [][]*big.Rat) float64 {
	a, b, d := float(p[0][0]), float(p[0][1]), float(p[1][1])
	return (a+d)/2 + math.Hypot((a-d)/2, b)
}

// ballInside reports exactly whether the ball |y|² ≤ r2 lies in
// {yᵀPy ≤ c} for a 2×2 P: iff c·I − r2·P is positive semidefinite, iff its
// diagonal and determinant are ≥ 0 (Rayleigh's quotient; Sylvester's
// criterion for semidefinite 2×2 matrices, common practice).
func ballInside(p [][]*big.Rat, c, r2 *big.Rat) bool {
	m := func(i, j int) *big.Rat {
		x := new(big.Rat).Mul(r2, p[i][j])
		x.Neg(x)
		if i == j {
			x.Add(x, c)
		}
		return x
	}
	det := new(big.Rat).Sub(new(big.Rat).Mul(m(0, 0), m(1, 1)), new(big.Rat).Mul(m(0, 1), m(1, 0)))
	return m(0, 0).Sign() >= 0 && m(1, 1).Sign() >= 0 && det.Sign() >= 0
}

// Van der Pol's equation in reverse time (Khalil, Nonlinear Systems, §8.2):
// the linearization A = [[0, −1], [1, −1]] is Hurwitz and Khalil's
// P = [[3/2, −1/2], [−1/2, 1]] solves AᵀP + PA = −I. The search over Q must
// certify a ball about the origin at least as large as the one inside the
// certified set of V = xᵀPx, both computed here, and its certificate must
// pass the kernel.
func TestImproveVanDerPol(t *testing.T) {
	m := load(t, "vanderpol.lya")
	// Khalil's P from Q = I, checked exactly: AᵀP + PA = −I.
	a := [][]*big.Rat{{big.NewRat(0, 1), big.NewRat(-1, 1)}, {big.NewRat(1, 1), big.NewRat(-1, 1)}}
	p0 := [][]*big.Rat{{big.NewRat(3, 2), big.NewRat(-1, 2)}, {big.NewRat(-1, 2), big.NewRat(1, 1)}}
	for i := range 2 {
		for j := range 2 {
			s := new(big.Rat)
			for k := range 2 {
				s.Add(s, new(big.Rat).Mul(a[k][i], p0[k][j]))
				s.Add(s, new(big.Rat).Mul(p0[i][k], a[k][j]))
			}
			if want := big.NewRat(int64(-b2i(i == j)), 1); s.Cmp(want) != 0 {
				t.Fatalf("(AᵀP + PA)[%d][%d] = %s, want %s (Khalil)", i, j, s, want)
			}
		}
	}
	if g := quadraticGram(m, []*big.Rat{new(big.Rat), new(big.Rat)}); g == nil || g[0][1].Cmp(p0[0][1]) != 0 || g[0][0].Cmp(p0[0][0]) != 0 || g[1][1].Cmp(p0[1][1]) != 0 {
		t.Fatalf("the model's V is not Khalil's xᵀPx: Gram %v", g)
	}
	base := find(t, "vanderpol.lya", Options{Gap: 0.01})
	r0 := math.Sqrt(float(base.Level) / lambdaMax2(p0))

	imp, err := Improve(context.Background(), m, "vanderpol.lya", Options{Gap: 0.01}, ImproveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	res := imp.Result
	out := checker.Verify(res.Doc)
	if !out.Valid || out.Basin != res.Level.RatString() {
		t.Fatalf("the improved certificate does not verify: valid %v, basin %q, level %s", out.Valid, out.Basin, res.Level.RatString())
	}
	// The certificate's V is yᵀPy with the reported P.
	v, err := poly.Parse(m.Ring, res.Doc.Claims[0].(*claims.OrbitalDerivative).V)
	if err != nil {
		t.Fatal(err)
	}
	g := poly.GramMatrix(v, 2)
	for i := range 2 {
		for j := range 2 {
			if g[i][j].Num.ConstTerm().Cmp(imp.P[i][j]) != 0 {
				t.Fatalf("the certificate's V has Gram entry %d,%d = %s, the search reports %s", i, j, g[i][j], imp.P[i][j])
			}
		}
	}
	r1 := math.Sqrt(float(res.Level) / lambdaMax2(imp.P))
	t.Logf("ball radius with Q = I: %.5g (c = %s); improved: %.5g (c = %s, P = %v, Q = %v, %d candidates)", r0, base.Level.RatString(), r1, res.Level.RatString(), imp.P, imp.Q, imp.Tried)
	if r1 < r0*(1-1e-9) {
		t.Errorf("improved radius %.6g < %.6g with Khalil's P from Q = I", r1, r0)
	}
	if math.Abs(imp.BaseRadius-r0) > 1e-6*r0 || math.Abs(imp.Radius-r1) > 1e-6*r1 {
		t.Errorf("reported radii %.8g, %.8g; recomputed %.8g, %.8g", imp.BaseRadius, imp.Radius, r0, r1)
	}
	// The reported radius, rounded to a rational, is exactly inside.
	r2 := new(big.Rat).SetFloat64(imp.Radius * imp.Radius)
	if !ballInside(imp.P, res.Level, r2) {
		t.Errorf("the ball of radius %.8g is not inside {V ≤ %s}", imp.Radius, res.Level.RatString())
	}
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// A linearization that is not Hurwitz has no P from AᵀP + PA = −Q with
// P ≻ 0 (Lyapunov's theorem for linear systems; Khalil, Nonlinear Systems,
// Theorem 4.6): the search refuses it with an error that names the cause.
func TestImproveNeedsHurwitz(t *testing.T) {
	m, err := model.Parse("unstable.lya", []byte("state x, y\nx' = x - x^3\ny' = -y\nV = x^2 + y^2\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = Improve(context.Background(), m, "unstable.lya", Options{}, ImproveOptions{})
	if err == nil || !strings.Contains(err.Error(), "not Hurwitz") {
		t.Fatalf("err = %v, want one saying the linearization is not Hurwitz", err)
	}
}
