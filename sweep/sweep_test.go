package sweep

import (
	"context"
	"math/big"
	"os"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

func parseModel(t testing.TB, src string, set ...string) *model.Model {
	t.Helper()
	var settings []model.Setting
	for _, s := range set {
		st, err := model.ParseSetting(s)
		if err != nil {
			t.Fatal(err)
		}
		settings = append(settings, st)
	}
	m, err := model.Parse("test.lya", []byte(src), settings...)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func readModel(t testing.TB, name string) []byte {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "testdata", "models", name))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func qrat(s string) *big.Rat {
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		panic(s)
	}
	return q
}

// sweepLines runs a sweep and returns its lines in order.
func sweepLines(t *testing.T, opts SweepOptions) []SweepLine {
	t.Helper()
	var lines []SweepLine
	sum, err := Sweep(context.Background(), opts, func(sp SweepPoint) error {
		for i, l := range sp.Lines {
			if (l.Digest != nil) != (sp.Docs[i] != nil) {
				t.Errorf("point %d: digest without certificate or the reverse", l.Index)
			}
			if d := sp.Docs[i]; d != nil && (d.Digest != *l.Digest || !checker.Verify(d).Valid) {
				t.Errorf("point %d: the certificate behind the line does not verify", l.Index)
			}
			if l.Verdict != checker.VerdictUndecided && l.Digest == nil {
				t.Errorf("point %d: verdict %s without a certificate", l.Index, l.Verdict)
			}
		}
		lines = append(lines, sp.Lines...)
		return nil
	})
	if err != nil || sum.Remaining != 0 {
		t.Fatalf("sweep: %v, %d remaining", err, sum.Remaining)
	}
	return lines
}

func TestRouthHurwitzSweep(t *testing.T) {
	// Routh–Hurwitz criterion (any control handbook): s³ + a₂s² + a₁s + a₀ is
	// Hurwitz iff a₂ > 0, a₀ > 0 and a₂a₁ > a₀. Swept: a₂ and a₀; a₁ fixed.
	src := readModel(t, "companion3.lya")
	for _, a1 := range []string{"1", "5/2"} {
		ax2, _ := ParseGridAxis("a2=-1..3", 17)
		ax0, _ := ParseGridAxis("a0=-1..4", 21)
		set := []model.Setting{{Name: "a1", Value: qrat(a1)}}
		if err := CheckSweep("companion3.lya", src, set, Grid{ax2, ax0}); err != nil {
			t.Fatal(err)
		}
		lines := sweepLines(t, SweepOptions{File: "companion3.lya", Src: src, Settings: set, Grid: Grid{ax2, ax0}, Jobs: 2})
		if len(lines) != 17*21 {
			t.Fatalf("%d lines", len(lines))
		}
		for i, l := range lines {
			a2v, _ := l.Params.Get("a2")
			a0v, _ := l.Params.Get("a0")
			a2, a0 := qrat(a2v), qrat(a0v)
			prod := new(big.Rat).Mul(a2, qrat(a1))
			boundary := a2.Sign() == 0 || a0.Sign() == 0 || prod.Cmp(a0) == 0
			hurwitz := a2.Sign() > 0 && a0.Sign() > 0 && prod.Cmp(a0) > 0
			holds := l.Verdict == checker.VerdictHolds
			switch {
			case boundary && holds:
				t.Errorf("a1=%s a2=%s a0=%s: on the boundary, yet certified stable", a1, a2v, a0v)
			case !boundary && holds != hurwitz:
				t.Errorf("a1=%s a2=%s a0=%s: certified stable %v, Hurwitz %v (%s)", a1, a2v, a0v, holds, hurwitz, l.Reason)
			case !boundary && !hurwitz && l.Claim != checker.KindUnstable:
				t.Errorf("a1=%s a2=%s a0=%s: not Hurwitz but not certified unstable (%s)", a1, a2v, a0v, l.Reason)
			}
			if i%5 != 0 || a0.Sign() == 0 {
				continue
			}
			// find (with the full check at the origin) agrees with the sweep.
			m := parseModel(t, string(src), "a1="+a1, "a2="+a2v, "a0="+a0v)
			res, err := equilibria.Find(context.Background(), m, equilibria.FindOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if got := res.Certs[res.Target].Verdict == checker.VerdictHolds; got != holds {
				t.Errorf("a1=%s a2=%s a0=%s: find certifies %v, the sweep %v", a1, a2v, a0v, got, holds)
			}
		}
	}
}

func TestLorenzSweep(t *testing.T) {
	// Lorenz equations, σ = 10, b = 8/3 (Strogatz §9.2; Lorenz 1963): the
	// origin is stable for r < 1; C± exist for r > 1 and are linearly stable
	// for 1 < r < σ(σ + b + 3)/(σ − b − 1) = 470/19 ≈ 24.74.
	src := readModel(t, "lorenz-classic.lya")
	ax, _ := ParseGridAxis("r=1/4..30", 40)
	lines := sweepLines(t, SweepOptions{File: "lorenz-classic.lya", Src: src, Grid: Grid{ax}, Jobs: 2})
	hopf := big.NewRat(470, 19)
	one := big.NewRat(1, 1)
	seenAbove := false
	for _, l := range lines {
		rv, _ := l.Params.Get("r")
		r := qrat(rv)
		holds := l.Verdict == checker.VerdictHolds
		if r.Cmp(one) == 0 {
			if holds {
				t.Errorf("r = 1 (pitchfork): certified stable")
			}
			continue
		}
		origin := l.Status == equilibria.EquilibriumExact
		wantEqs := 3
		if r.Cmp(one) < 0 {
			wantEqs = 1
		}
		if l.Eqs != wantEqs {
			t.Errorf("r = %s: %d equilibria, want %d", rv, l.Eqs, wantEqs)
		}
		switch {
		case origin && holds != (r.Cmp(one) < 0):
			t.Errorf("r = %s: origin certified stable %v", rv, holds)
		case !origin && holds != (r.Cmp(hopf) < 0):
			t.Errorf("r = %s: C± certified stable %v (%s)", rv, holds, l.Reason)
		case !origin && r.Cmp(hopf) > 0:
			seenAbove = true
			if l.Claim != checker.KindUnstable {
				t.Errorf("r = %s: C± not certified unstable above 470/19 (%s)", rv, l.Reason)
			}
		}
	}
	if !seenAbove {
		t.Fatal("the grid has no point above 470/19")
	}
}

func TestFixParams(t *testing.T) {
	// fixParams must give what model.Parse gives with the same settings.
	cases := []struct {
		src  string
		vals map[string]string
	}{
		{string(readModel(t, "lorenz-classic.lya")), map[string]string{"r": "47/2"}},
		{string(readModel(t, "companion3.lya")), map[string]string{"a0": "-1/3", "a1": "2", "a2": "7/5"}},
		{"state u, v\nparameter g > 0\nparameter h in [0, 4]\nu' = g*(v - u)/(g + 1)\nv' = h*u - v\nV = u^2/g + v^2\nat u = 0, v = 0\n", map[string]string{"g": "3/2", "h": "1"}},
	}
	for _, c := range cases {
		base, err := model.Parse("m.lya", []byte(c.src))
		if err != nil {
			t.Fatal(err)
		}
		var settings []model.Setting
		for k, v := range c.vals {
			settings = append(settings, model.Setting{Name: k, Value: qrat(v)})
		}
		want, err := model.Parse("m.lya", []byte(c.src), settings...)
		if err != nil {
			t.Fatal(err)
		}
		got, err := model.FixParams(base, settings)
		if err != nil {
			t.Fatal(err)
		}
		if got.Canonical() != want.Canonical() {
			t.Errorf("fixParams:\n%s\nmodel.Parse:\n%s", got.Canonical(), want.Canonical())
		}
	}
}
