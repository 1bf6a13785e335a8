package branches

import (
	"errors"
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/model"
)

// TestLinearModel builds the kernel's linear model along each branch of
// the logistic map x⁺ = r x (1 − x) (May 1976; f'(0) = r, f'(1 − 1/r) =
// 2 − r) and of Lorenz (whose C± involve √(b(r − 1)) and have none). The
// linear model must parse, its right-hand side must be J(p)ξ, and its V at
// a parameter value inside the stable range must be positive (Lyapunov's
// theorem: P ≻ 0 there).
func TestLinearModel(t *testing.T) {
	tests := []struct {
		file   string
		branch int
		f      string // the linear model's right-hand side
		at     string // r inside the stable range
		none   bool
	}{
		{file: "logistic.lya", branch: 0, f: "r*x", at: "1/2"},
		{file: "logistic.lya", branch: 1, f: "-(r - 2)*x", at: "2"},
		{file: "lorenz-classic.lya", branch: 1, none: true},
	}
	for _, tc := range tests {
		m := readModel(t, tc.file)
		an := analyze(t, m)
		text, err := LinearModel(m, an, tc.branch)
		if tc.none {
			if !errors.Is(err, ErrNoLinearModel) {
				t.Errorf("%s branch %d: %v, want ErrNoLinearModel", tc.file, tc.branch+1, err)
			}
			continue
		}
		if err != nil {
			t.Fatalf("%s branch %d: %v", tc.file, tc.branch+1, err)
		}
		lm, err := model.Parse("linear.lya", []byte(text))
		if err != nil {
			t.Fatalf("%s branch %d: %v\n%s", tc.file, tc.branch+1, err, text)
		}
		if got := lm.F[0].String(); got != tc.f {
			t.Errorf("%s branch %d: f = %s, want %s\n%s", tc.file, tc.branch+1, got, tc.f, text)
		}
		r, _ := lm.Ring.Index("r")
		x, _ := lm.Ring.Index("x")
		at := make([]*big.Rat, len(lm.Ring.Names()))
		for i := range at {
			at[i] = new(big.Rat)
		}
		at[r] = rat(tc.at)
		at[x] = big.NewRat(1, 1)
		v, err := lm.V.Eval(at)
		if err != nil || v.Sign() <= 0 {
			t.Errorf("%s branch %d: V(x = 1, r = %s) = %v (%v), want > 0", tc.file, tc.branch+1, tc.at, v, err)
		}
	}
	if _, err := LinearModel(readModel(t, "logistic.lya"), analyze(t, readModel(t, "logistic.lya")), 7); !errors.Is(err, ErrNoLinearModel) {
		t.Errorf("branch 8 of 2: %v", err)
	}
}
