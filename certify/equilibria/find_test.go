package equilibria

import (
	"context"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
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
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "models", name))
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
		// AᵀPA − P = −I gives P = [[4/3, 8/9], [8/9, 116/27]]; the first
		// rounding tried (to hundredths, the common denominator 100) passes
		// the exact tests: 133/100, 89/100 and 430/100 = 43/10.
		{"map", "state x, y\nx+ = x/2 + y\ny+ = y/2\n", [][]string{{"133/100", "89/100"}, {"89/100", "43/10"}}, checker.KindGlobal, checker.VerdictHolds},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := parseModel(t, c.src)
			res, err := Find(context.Background(), m, FindOptions{})
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
		{"quadratic map", "state x\nx+ = x^2 - 1/2\n", nil, 0, 2, true},
		// hand computation: x = z, 2x + y = 1 and x + y = 3 give (−2, 5, −2),
		// solved at once as an affine system.
		{"affine", "state x, y, z\nx' = 2*x + y - 1\ny' = x - z\nz' = y + z - 3\n", nil, 1, 0, true},
		// hand computation: the last equation gives x₄(1 + x₄²) = 0, then each
		// xᵢ(1 + xᵢ²) = xᵢ₊₁/2 = 0: the origin only. Elimination would reach
		// degree 3⁴, so Newton's method finds it (the search is not complete).
		{"coupled cubic chain", cubicChain(4, true), nil, 1, 0, false},
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

// TestFindLinearCommonDenominator: a random stable 30-state linear model
// gets the global claim (the linearization is the model), with P over one
// decimal denominator; P ≻ 0 agrees with gonum's Cholesky factorization of
// the float solution, and the certificate's M equals −(AᵀP + PA) computed
// from the model's A (the Lyapunov equation's residual, common practice).
func TestFindLinearCommonDenominator(t *testing.T) {
	m := parseModel(t, randomLinear(30, 2))
	res, err := Find(context.Background(), m, FindOptions{})
	if err != nil {
		t.Fatal(err)
	}
	c := res.Certs[res.Target]
	if c.Verdict != checker.VerdictHolds || c.Claim != checker.KindGlobal || c.Method != MethodLinearization {
		t.Fatalf("%s %s %s: %s", c.Method, c.Verdict, c.Claim, c.Reason)
	}
	_, d, ok := poly.CommonDenominator(c.P, 64)
	if !ok || new(big.Int).Rem(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(len(d.String()))), nil), d).Sign() != 0 {
		t.Errorf("P's common denominator %v does not divide a power of ten", d)
	}
	n := len(c.P)
	pf := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			v, _ := c.P[i][j].Float64()
			pf.SetSym(i, j, v)
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(pf) {
		t.Error("gonum's Cholesky factorization refuses P")
	}
	a := res.Search.Equilibria[res.Target].ExactJacobian
	for i := range n {
		for j := range n {
			s := new(big.Rat)
			for k := range n {
				s.Add(s, new(big.Rat).Mul(a[k][i], c.P[k][j]))
				s.Add(s, new(big.Rat).Mul(c.P[i][k], a[k][j]))
			}
			if s.Neg(s).Cmp(c.Decay[i][j].Lo.Value) != 0 || !c.Verified.Valid {
				t.Fatalf("M[%d][%d] = %v, want %v", i, j, c.Decay[i][j].Lo.Value, s)
			}
		}
	}
}
