package equilibria

import (
	"context"
	"errors"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/checker"
)

// x' = x + y, y' = x + y has the singular matrix [[1, 1], [1, 1]]: every
// point of the line x + y = 0 is an equilibrium (its kernel), so the origin
// is an equilibrium but not an isolated one, and not asymptotically stable
// (common practice: nearby equilibria do not move towards it).
func TestFindNonIsolatedOrigin(t *testing.T) {
	for _, src := range []string{
		"state x, y\nx' = x + y\ny' = x + y\nV = x^2 + y^2\n",
		"state x, y\nx' = 0\ny' = -y\nV = x^2 + y^2\n",
		"state x, y\nx+ = x\ny+ = y/2\nV = x^2 + y^2\n",
	} {
		m := parseModel(t, src)
		_, err := Find(context.Background(), m, FindOptions{})
		if !errors.Is(err, ErrNonIsolated) {
			t.Errorf("%q: Find error %v, want ErrNonIsolated", src, err)
		}
	}
	// A model whose origin is not an equilibrium at all keeps its message.
	m := parseModel(t, "state x\nx' = 1 - x\nV = x^2\n")
	if _, err := Find(context.Background(), m, FindOptions{}); err == nil || errors.Is(err, ErrNonIsolated) || !strings.Contains(err.Error(), ErrNoTarget.Error()) {
		t.Errorf("x' = 1 - x: Find error %v, want ErrNoTarget", err)
	}
}

// Parameters fixed at values beyond float64 (1e400) or whose products are
// (1e300) give an exact Jacobian that the floating-point solvers cannot take:
// find answers undecided with the reason, never a panic.
func TestFindBeyondFloatRange(t *testing.T) {
	src := "state x, y, z\nparameter sigma > 0\nparameter r >= 0\nparameter b > 0\n" +
		"x' = sigma*(y - x)\ny' = r*x - y - x*z\nz' = x*y - b*z\nV = x^2/sigma + y^2 + z^2\n"
	for _, r := range []string{"1e300", "1e400", "-1e400"} {
		m := parseModel(t, strings.Replace(src, "r >= 0", "r", 1), "sigma=10", "b=8/3", "r="+r)
		res, err := Find(context.Background(), m, FindOptions{})
		if err != nil {
			t.Fatalf("r = %s: %v", r, err)
		}
		c := res.Certs[res.Target]
		if c.Verdict != checker.VerdictUndecided || !strings.Contains(c.Reason, "beyond floating-point range") {
			t.Errorf("r = %s: %s (%s), want undecided beyond floating-point range", r, c.Verdict, c.Reason)
		}
		if cl := res.Search.Equilibria[res.Target].Class; cl != ClassOutOfRange {
			t.Errorf("r = %s: class %q, want %q", r, cl, ClassOutOfRange)
		}
	}
}
