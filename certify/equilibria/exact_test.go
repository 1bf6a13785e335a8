package equilibria

import (
	"context"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/poly"
)

// TestFindExactP: with Exact, P is the exact solution of the Lyapunov
// equation at a rational equilibrium, the certificate still passes the
// checker, and an irrational equilibrium falls back to the rounded P with
// a note.
func TestFindExactP(t *testing.T) {
	lorenz := string(readModel(t, "lorenz.lya"))
	cases := []struct {
		name    string
		src     string
		set     []string
		p       [][]string // the exact P of the model's own equilibrium; nil: residual only
		verdict string
	}{
		// Ogata, Modern Control Engineering, the worked Lyapunov example:
		// A = [[0, 1], [−1, −1]], Q = I gives P = [[3/2, 1/2], [1/2, 1]]
		// (testdata/models/ogata.lya quotes it).
		{"ogata", string(readModel(t, "ogata.lya")), nil, [][]string{{"3/2", "1/2"}, {"1/2", "1"}}, checker.VerdictHolds},
		// hand computation (Stein equation): A = [[1/2, 1], [0, 1/2]] gives
		// P = [[4/3, 8/9], [8/9, 116/27]], where the rounded P is
		// [[133/100, 89/100], [89/100, 43/10]] (TestFindLinearExact).
		{"map", "state x, y\nx+ = x/2 + y\ny+ = y/2\n", nil, [][]string{{"4/3", "8/9"}, {"8/9", "116/27"}}, checker.VerdictHolds},
		// Lorenz 1963; Strogatz §9.2: the origin is stable for r < 1 and a
		// saddle for r > 1; b = 8/3, σ = 10.
		{"lorenz r=1/2", lorenz, []string{"sigma=10", "b=8/3", "r=1/2"}, nil, checker.VerdictHolds},
		{"lorenz r=20", lorenz, []string{"sigma=10", "b=8/3", "r=20"}, nil, checker.VerdictFails},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := parseModel(t, c.src, c.set...)
			res, err := Find(context.Background(), m, FindOptions{Exact: true})
			if err != nil {
				t.Fatal(err)
			}
			ct := res.Certs[res.Target]
			if ct.Verdict != c.verdict {
				t.Fatalf("verdict %s (%s), want %s", ct.Verdict, ct.Reason, c.verdict)
			}
			if ct.PSource != PExact || ct.ExactNote != "" {
				t.Fatalf("P source %q, note %q; want the exact P", ct.PSource, ct.ExactNote)
			}
			for i := range c.p {
				for j := range c.p[i] {
					if ct.P[i][j].Cmp(qrat(c.p[i][j])) != 0 {
						t.Errorf("P[%d][%d] = %s, want %s", i, j, ct.P[i][j].RatString(), c.p[i][j])
					}
				}
			}
			// AᵀP + PA = −I (AᵀPA − P = −I) with no residual: common practice,
			// the definition of the exact solution.
			d := poly.DecayAt(res.Search.Equilibria[res.Target].ExactJacobian, m.Discrete, ct.P)
			for i := range d {
				for j := range d[i] {
					want := int64(0)
					if i == j {
						want = 1
					}
					if !d[i][j].IsInt() || d[i][j].Num().Int64() != want {
						t.Errorf("residual (%d, %d): %s", i, j, d[i][j].RatString())
					}
				}
			}
			if ct.Doc == nil || !checker.Verify(ct.Doc).Valid {
				t.Fatal("no valid certificate")
			}
		})
	}
}

// TestFindExactFallback: the equilibria C± of the Lorenz equations at
// r = 20 are irrational (x = ±√(b(r − 1)) = ±√(152/3); Lorenz 1963), so
// the exact P is refused with a note and the rounded P certifies them.
func TestFindExactFallback(t *testing.T) {
	m := parseModel(t, string(readModel(t, "lorenz.lya")), "sigma=10", "b=8/3", "r=20")
	res, err := Find(context.Background(), m, FindOptions{Exact: true, All: true})
	if err != nil {
		t.Fatal(err)
	}
	enclosed := 0
	for i, ct := range res.Certs {
		if res.Search.Equilibria[i].Status != EquilibriumEnclosed {
			continue
		}
		enclosed++
		if ct.PSource != PRounded || !strings.Contains(ct.ExactNote, "rational equilibrium") {
			t.Errorf("equilibrium %d: P source %q, note %q", i+1, ct.PSource, ct.ExactNote)
		}
		if ct.Doc == nil || !checker.Verify(ct.Doc).Valid {
			t.Errorf("equilibrium %d: no valid certificate (%s)", i+1, ct.Reason)
		}
	}
	if enclosed != 2 {
		t.Fatalf("%d enclosed equilibria, want C± (2)", enclosed)
	}
}
