package sossearch

import (
	"context"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

// centre is a constructed system (hand-checked) whose linearization
// x' = y, y' = −x is a centre. Any quadratic V with V̇'s quadratic part
// ≤ 0 is c·(x² + y²) (AᵀP + PA has trace 0 for a rotation A, so it is
// indefinite unless zero), and then V̇ = −c·(y⁴ + 3x²y²) vanishes on the
// x-axis: no quadratic V has −V̇ positive definite. The quartic
// V = x² + y² + x³y + (x² + y²)²/2 (positive definite: |x³y| ≤ 0.33·r⁴) has
// −V̇ = x⁴ + y⁴ + y²·(3x⁴ + 5x³y + 4x²y² + y⁴), positive definite: the
// origin is globally asymptotically stable and degree 4 suffices.
const centre = `state x, y
x' = y - 3/2*x*y^2
y' = -x - 1/2*y^3
`

func search(t *testing.T, src string, degree int) *Result {
	t.Helper()
	m, err := model.Parse("case.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	res, err := Search(context.Background(), m, Options{Degree: degree, Source: "case.lya"})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func TestSearch(t *testing.T) {
	cases := []struct {
		name, src string
		degree    int
		holds     bool
	}{
		{"centre-quartic", centre, 4, true},
		// As argued above, no quadratic V has −V̇ positive definite; but
		// V = x² + y² gives V̇ = −3x²y² − y⁴ ≤ 0, zero only on y = 0, where
		// y' = −x forces x = 0: the invariance principle proves global
		// asymptotic stability with a quadratic V (hand computation).
		{"centre-quadratic", centre, 2, true},
		// Strogatz, Nonlinear Dynamics and Chaos, §7.2: V = x² + 4y²
		// works for x' = −x + 4y, y' = −x − y³, so degree 2 suffices.
		{"strogatz-7.2", "state x, y\nx' = -x + 4*y\ny' = -x - y^3\n", 2, true},
		// Common practice: a stable linear system, shifted to (1, −2).
		{"shifted-linear", "state x, y\nx' = -(x-1) + (y+2)\ny' = -(x-1) - (y+2)\nat x = 1, y = -2\n", 2, true},
		// Common practice: x' = x is unstable; no V exists.
		{"unstable", "state x, y\nx' = x\ny' = -y\n", 4, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			res := search(t, tc.src, tc.degree)
			proved := res.Check != nil && res.Check.Verdict == checker.VerdictHolds && res.Check.Claim == checker.KindGlobal
			if proved != tc.holds {
				t.Fatalf("proved %v, want %v; reason %q, sizes %+v", proved, tc.holds, res.Reason, res.Sizes)
			}
			if proved && (!res.Check.Check.Valid || res.Check.Check.Verdict != checker.VerdictHolds) {
				t.Fatalf("kernel: %+v", res.Check.Check)
			}
			if proved && res.V.DegreeIn(res.Check.Model.Ring.StateMask()) > tc.degree {
				t.Errorf("V = %s has degree above %d", res.V, tc.degree)
			}
			if proved {
				t.Logf("V = %s; sizes %+v", res.V, res.Sizes)
			}
		})
	}
}
