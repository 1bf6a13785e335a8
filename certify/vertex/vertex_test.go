package vertex

import (
	"context"
	"errors"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

func parse(t *testing.T, src string) *model.Model {
	t.Helper()
	m, err := model.Parse("test.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestFind: boxes of second-order systems x' = y, y' = −k·x − c·y. Such a
// system is stable exactly when k > 0 and c > 0 (Routh–Hurwitz for a
// second-order characteristic polynomial s² + c·s + k; common practice), so
// a box with a vertex c < 0 never gets a certificate.
//
// Whether a box inside that quadrant gets one is decided by hand (the
// derivation is the check, written out here): with P = [[a, b], [b, 1]]
// (P₂₂ > 0 may be scaled to 1),
//
//	−(AᵀP + PA) = [[2bk, bc + k − a], [bc + k − a, 2(c − b)]],
//
// positive definite exactly when 0 < b < c and (a − bc − k)² < 4bk(c − b)
// (Sylvester's criterion). At c = 1 the vertices k = 1 and k = K ask for
// a < b + 1 + 2s and a > b + K − 2√K·s with s = √(b(1 − b)) ≤ 1/2, which
// is possible only when √K − 1 < 2s ≤ 1, that is K < 4. So k ∈ [1, 2],
// c ∈ [1, 2] has a common P (a = 2, b = 1/2 satisfies all four vertices),
// while k ∈ [1, 4], c ∈ [1, 2] has none though all its vertices are stable.
func TestFind(t *testing.T) {
	tests := []struct {
		name, src string
		verdict   string
		kind      string
	}{
		{"gain and damping boxed", `state x, y
parameter k in [1, 2]
parameter c in [1, 2]
x' = y
y' = -k*x - c*y
`, checker.VerdictHolds, checker.KindGlobal},
		{"nonlinear term, local only", `state x, y
parameter k in [1, 2]
parameter c in [1, 2]
x' = y
y' = -k*x - c*y - x^2*y
`, checker.VerdictHolds, checker.KindLocal},
		{"stable vertices, no common P", `state x, y
parameter k in [1, 4]
parameter c in [1, 2]
x' = y
y' = -k*x - c*y
`, checker.VerdictUndecided, checker.KindNone},
		{"a vertex with negative damping", `state x, y
parameter k in [1, 4]
parameter c in [-1, 2]
x' = y
y' = -k*x - c*y
`, checker.VerdictUndecided, checker.KindNone},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			res, err := Find(context.Background(), parse(t, tt.src), Options{})
			if err != nil {
				t.Fatal(err)
			}
			v, k := res.Verdict()
			if v != tt.verdict || k != tt.kind {
				t.Fatalf("verdict %s (%s), want %s (%s); reason %q", v, k, tt.verdict, tt.kind, res.Reason)
			}
			if res.P != nil && (!res.Outcome.Valid || res.Outcome.Verdict != v || res.Outcome.Kind != k) {
				t.Fatalf("the kernel derives %+v", res.Outcome)
			}
			if len(res.Vertices) != 4 {
				t.Fatalf("%d vertices, want 4", len(res.Vertices))
			}
			hurwitz := true
			for _, vx := range res.Vertices {
				hurwitz = hurwitz && vx.MaxRe < 0
			}
			if hurwitz != !strings.Contains(tt.name, "negative damping") {
				t.Fatalf("every vertex Hurwitz: %v; reason %q", hurwitz, res.Reason)
			}
			t.Logf("P = %v, T = %.3g, reason %q", res.P, res.T, res.Reason)
		})
	}
}

// TestFindRefuses: the test applies only to continuous time, closed bounded
// ranges, parameter-free equilibria and affine linearizations.
func TestFindRefuses(t *testing.T) {
	tests := []struct{ name, src, want string }{
		{"unbounded range", "state x\nparameter k > 0\nx' = -k*x\n", "test.lya:2:"},
		{"open range", "state x\nparameter k in (0, 1]\nx' = -k*x\n", "closed bounded"},
		{"square of a parameter", "state x, y\nparameter k in [1, 2]\nx' = y\ny' = -k^2*x - y\n", "not affine"},
		{"product of parameters", "state x, y\nparameter k in [1, 2]\nparameter c in [1, 2]\nx' = y\ny' = -k*c*x - y\n", "not affine"},
		{"map", "state x\nparameter k in [0, 1/2]\nx+ = k*x\n", "continuous time"},
		{"no free parameter", "state x\nx' = -x\n", "free parameters"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Find(context.Background(), parse(t, tt.src), Options{})
			if !errors.Is(err, ErrInput) || !strings.Contains(err.Error(), tt.want) {
				t.Fatalf("error %v, want ErrInput containing %q", err, tt.want)
			}
		})
	}
}
