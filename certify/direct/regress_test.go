package direct

import (
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

// V = a·x has the linear part a·x at the equilibrium x = 0, so the
// equilibrium is not a strict minimum of V for any a (common practice: a
// minimum of a smooth function has a zero gradient). At the middle sample
// a = 0 the gradient vanishes and gives no direction; the refutation must
// come from another value of a, never from the equilibrium itself, which the
// kernel rejects.
func TestLinearPartVanishingAtSample(t *testing.T) {
	src := "state x\nparameter a in [-3, 3)\nx' = 0\nV = a*x\n"
	m, err := model.Parse("linear.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	res, err := Check(m, "linear.lya")
	if err != nil {
		t.Fatalf("Check: %v", err)
	}
	if res.Verdict != checker.VerdictFails || res.Refutation == nil {
		t.Fatalf("verdict %s, refutation %v; want fails with a refutation", res.Verdict, res.Refutation)
	}
	x, ok := new(big.Rat).SetString(res.Refutation.Point["x"])
	if !ok || x.Sign() == 0 {
		t.Errorf("refutation at x = %q, want a point other than the equilibrium", res.Refutation.Point["x"])
	}
	if !res.Check.Valid || !res.Check.Refuted {
		t.Errorf("kernel outcome %+v, want a valid refutation", res.Check)
	}
}
