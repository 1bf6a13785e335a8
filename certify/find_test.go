package certify

import (
	"context"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"testing"

	"lyacert/checker"
	"lyacert/model"
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

func TestFindLinearExact(t *testing.T) {
	cases := []struct {
		name    string
		src     string
		p       [][]string
		claim   string
		verdict string
	}{
		// Ogata, Modern Control Engineering: A = [[0, 1], [−1, −1]], Q = I
		// gives P = [[3/2, 1/2], [1/2, 1]].
		{"ogata", "state x, y\nx' = y\ny' = -x - y\n", [][]string{{"3/2", "1/2"}, {"1/2", "1"}}, checker.KindGlobal, checker.VerdictHolds},
		// hand computation: A = diag(−1, −2), AᵀP + PA = −I gives P = diag(1/2, 1/4).
		{"diagonal", "state x, y\nx' = -x\ny' = -2*y\n", [][]string{{"1/2", "0"}, {"0", "1/4"}}, checker.KindGlobal, checker.VerdictHolds},
		// hand computation: A = diag(1, −1) is a saddle. λ₁ + λ₂ = 0 makes the
		// Lyapunov equation singular, so P comes from the shifted equation
		// (A + sI)ᵀP + P(A + sI) = −I: P ≈ diag(−1/2, 1/2), a negative pivot,
		// and −(AᵀP + PA) ≈ I ≻ 0: unstable. P is not compared.
		{"saddle", "state x, y\nx' = x\ny' = -y\n", nil, checker.KindUnstable, checker.VerdictFails},
		// hand computation: A = [[0, 1], [−1, 0]] is a centre; no P passes
		// the exact tests (the linearization decides nothing).
		{"centre", "state x, y\nx' = y\ny' = -x\n", nil, checker.KindNone, checker.VerdictUndecided},
		// hand computation (Stein equation): A = [[1/2, 1], [0, 1/2]],
		// AᵀPA − P = −I gives P = [[4/3, 8/9], [8/9, 116/27]]; the shortest
		// rounding that passes the exact tests has 43/10 for 116/27.
		{"map", "state x, y\nnext x = x/2 + y\nnext y = y/2\n", [][]string{{"4/3", "8/9"}, {"8/9", "43/10"}}, checker.KindGlobal, checker.VerdictHolds},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := parseModel(t, c.src)
			res, err := Find(m, FindOptions{})
			if err != nil {
				t.Fatal(err)
			}
			ct := res.Certs[res.Target]
			if ct.Claim != c.claim || ct.Verdict != c.verdict {
				t.Fatalf("claim %s verdict %s (%s), want %s %s", ct.Claim, ct.Verdict, ct.Reason, c.claim, c.verdict)
			}
			for i := range c.p {
				for j := range c.p[i] {
					if ct.P[i][j].Cmp(qrat(c.p[i][j])) != 0 {
						t.Errorf("P[%d][%d] = %s, want %s", i, j, ct.P[i][j].RatString(), c.p[i][j])
					}
				}
			}
			if c.verdict == checker.VerdictUndecided {
				if ct.Doc != nil {
					t.Fatalf("a certificate for an undecided verdict")
				}
				return
			}
			if ct.Doc == nil || !checker.Verify(ct.Doc).Valid {
				t.Fatalf("no valid certificate")
			}
		})
	}
}

func TestFindEquilibria(t *testing.T) {
	cases := []struct {
		name     string
		src      string
		set      []string
		exact    int // rational equilibria
		enclosed int // irrational ones in Krawczyk boxes
		complete bool
	}{
		// Lorenz 1963; Strogatz §9.2: the origin, and C± for r > 1.
		{"lorenz r=1/2", "", []string{"r=1/2"}, 1, 0, true},
		{"lorenz r=20", "", []string{"r=20"}, 1, 2, true},
		// b(r − 1) = 8/3·(5/2 − 1) = 4 is a square: C± = (±2, ±2, 3/2) are rational.
		{"lorenz r=5/2", "", []string{"r=5/2"}, 3, 0, true},
		// hand computation: x = 3 − y² and y³ − 3y + 1 = 0, three real roots.
		{"cubic", "state x, y\nx' = x*y - 1\ny' = x + y^2 - 3\n", nil, 0, 3, true},
		// hand computation: x² + y² = 4 and xy = 1 give x⁴ − 4x² + 1 = 0, four
		// real roots; no state occurs linearly, so Newton's method finds them.
		{"circle and hyperbola", "state x, y\nx' = x^2 + y^2 - 4\ny' = x*y - 1\n", nil, 0, 4, false},
		// hand computation: x² = 1 and y = x: (±1, ±1).
		{"two rational", "state x, y\nx' = x^2 - 1\ny' = y - x\n", nil, 2, 0, true},
		// hand computation: x' = x² + 1 has no real zero.
		{"none", "state x\nx' = x^2 + 1\n", nil, 0, 0, true},
		// (1 ± √3)/2 are the fixed points of x ↦ x² − 1/2 (hand computation).
		{"quadratic map", "state x\nnext x = x^2 - 1/2\n", nil, 0, 2, true},
	}
	lorenz := string(readModel(t, "lorenz-classic.lya"))
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			src := c.src
			if src == "" {
				src = lorenz
			}
			m := parseModel(t, src, c.set...)
			s, err := FindEquilibria(m)
			if err != nil {
				t.Fatal(err)
			}
			var exact, enclosed int
			for _, e := range s.Equilibria {
				switch e.Status {
				case EquilibriumExact:
					exact++
					g, _ := model.EquilibriumEquations(m.F, m.Discrete)
					for _, gi := range g {
						if gi.Eval(e.Point).Sign() != 0 {
							t.Errorf("exact point %v is not an equilibrium", e.Approx)
						}
					}
				case EquilibriumEnclosed:
					enclosed++
				}
			}
			if exact != c.exact || enclosed != c.enclosed || s.Complete != c.complete {
				t.Errorf("found %d exact, %d enclosed (complete %v), want %d, %d (%v)", exact, enclosed, s.Complete, c.exact, c.enclosed, c.complete)
			}
		})
	}
}

func TestClassify(t *testing.T) {
	// The trace–determinant classification of planar linear systems
	// (common practice; e.g. Strogatz, Nonlinear Dynamics and Chaos, §5.2).
	cases := []struct {
		src, class string
	}{
		{"x' = -x\ny' = -2*y", "stable node"},
		{"x' = x\ny' = 2*y", "unstable node"},
		{"x' = -x\ny' = -y", "stable degenerate node"},
		{"x' = -x + y\ny' = -x - y", "stable focus"},
		{"x' = x + y\ny' = -x + y", "unstable focus"},
		{"x' = x\ny' = -y", "saddle"},
		{"x' = y\ny' = -x", "centre of the linearization (nonlinear terms decide)"},
		{"x' = y\ny' = -y", "degenerate (a zero eigenvalue)"},
	}
	for _, c := range cases {
		m := parseModel(t, "state x, y\n"+c.src+"\n")
		s, err := FindEquilibria(m)
		if err != nil {
			t.Fatal(err)
		}
		if len(s.Equilibria) == 0 {
			if c.class != "degenerate (a zero eigenvalue)" || !s.NonIsolated {
				t.Errorf("%q: no equilibria", c.src)
			}
			continue
		}
		if got := s.Equilibria[0].Class; got != c.class {
			t.Errorf("%q: class %q, want %q", c.src, got, c.class)
		}
	}
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
		ax2, _ := ParseGridAxis("a2=-1:3:17")
		ax0, _ := ParseGridAxis("a0=-1:4:21")
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
			res, err := Find(m, FindOptions{})
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
	ax, _ := ParseGridAxis("r=1/4:30:40")
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
		origin := l.Status == EquilibriumExact
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

func TestDiscreteTimeCheck(t *testing.T) {
	cases := []struct {
		name, src, verdict, claim string
	}{
		// hand computation (Stein equation AᵀPA − P = −I for A = [[1/2, 1],
		// [0, 1/2]]): P = [[4/3, 8/9], [8/9, 116/27]], so ΔV = −x² − y².
		{"stein", "state x, y\nnext x = x/2 + y\nnext y = y/2\nV = 4/3*x^2 + 16/9*x*y + 116/27*y^2\n",
			checker.VerdictHolds, checker.KindGlobal},
		// the same map with V = x² + y²: AᵀA − I = [[−3/4, 1/2], [1/2, 1/4]]
		// is indefinite, so ΔV takes both signs (hand computation).
		{"indefinite", "state x, y\nnext x = x/2 + y\nnext y = y/2\nV = x^2 + y^2\n",
			checker.VerdictFails, checker.KindNone},
		// hand computation: a nonlinear term of degree 2 in the map leaves
		// the quadratic part of ΔV = −3/4·x² + ..., a local claim.
		{"nonlinear", "state x, y\nnext x = x/2 + y^2\nnext y = y/2\nV = x^2 + y^2\n",
			checker.VerdictHolds, checker.KindLocal},
		// the logistic map x ↦ 5/2·x(1 − x) at its fixed point 3/5, where
		// f' = 2 − r = −1/2 (May 1976): V = (x − 3/5)², ΔV's quadratic part −3/4·(x − 3/5)².
		{"logistic", "state x\nnext x = 5/2*x*(1 - x)\nV = (x - 3/5)^2\nat x = 3/5\n",
			checker.VerdictHolds, checker.KindLocal},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := parseModel(t, c.src)
			res, err := Check(m, "test.lya")
			if err != nil {
				t.Fatal(err)
			}
			if res.Verdict != c.verdict || res.Claim != c.claim {
				t.Errorf("verdict %s claim %s (%s), want %s %s", res.Verdict, res.Claim, res.Reason, c.verdict, c.claim)
			}
		})
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
		{"state u, v\nparam g > 0\nparam h in [0, 4]\nu' = g*(v - u)/(g + 1)\nv' = h*u - v\nV = u^2/g + v^2\nat u = 0, v = 0\n", map[string]string{"g": "3/2", "h": "1"}},
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
		got, err := fixParams(base, settings)
		if err != nil {
			t.Fatal(err)
		}
		if got.Canonical() != want.Canonical() {
			t.Errorf("fixParams:\n%s\nmodel.Parse:\n%s", got.Canonical(), want.Canonical())
		}
	}
}

func TestRationalize(t *testing.T) {
	cases := []struct {
		x, tol float64
		want   string
	}{
		{1.5000000000000004, 1e-3, "3/2"},              // common practice, no source
		{math.Pi, 1e-3, "333/106"},                     // π's convergents 3, 22/7 (1.26e-3 off), 333/106 (common practice)
		{0.1, 0, "3602879701896397/36028797018963968"}, // the float itself
		{-2.0 / 3.0, 1e-9, "-2/3"},                     // common practice, no source
	}
	for _, c := range cases {
		if got := rationalize(c.x, c.tol).RatString(); got != c.want {
			t.Errorf("rationalize(%v, %v) = %s, want %s", c.x, c.tol, got, c.want)
		}
	}
}
