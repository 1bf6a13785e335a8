package boxsearch

import (
	"context"
	"fmt"
	"math/big"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

func parse(t *testing.T, src string, set ...model.Setting) *model.Model {
	t.Helper()
	m, err := model.Parse("case.lya", []byte(src), set...)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func search(t *testing.T, src string, degree int) *Result {
	t.Helper()
	res, err := Search(context.Background(), parse(t, src), Options{Degree: degree, Source: "case.lya"})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// proven says whether res carries a certificate that the kernel, run here
// once more from the document alone, accepts with "holds" over the box.
func proven(t *testing.T, res *Result) bool {
	t.Helper()
	if res.Doc == nil {
		return false
	}
	out := checker.Verify(res.Doc)
	if !out.Valid || out.Verdict != checker.VerdictHolds {
		t.Fatalf("the engine returned a certificate the kernel does not accept: valid %v, verdict %s", out.Valid, out.Verdict)
	}
	if out.Kind != res.Outcome.Kind {
		t.Fatalf("kind %s on re-checking, %s in the result", out.Kind, res.Outcome.Kind)
	}
	return true
}

// corner is a constructed model (an invented scenario, computed by hand).
// Its linearization A(p) = [[−1, p], [0, −1]] is stable for every p; at the
// box's centre p = 2 the Lyapunov equation AᵀP + PA = −I has the solution
// P = [[1/2, 1/2], [1/2, 3/2]] (what find --set p=2 computes with Q = I),
// and for that P, −(A(p)ᵀP + PA(p)) = [[1, 1 − p/2], [1 − p/2, 3 − p]],
// whose determinant 2 − p²/4 is positive exactly for p < 2√2 (Sylvester's
// criterion, common practice): the centre's V fails at the corner p = 4,
// where the (2, 2) entry is −1 and V̇ > 0 along the y-axis near the
// origin. (For Q = diag(q₁, q₃) the centre's P works at p = 4 exactly when
// q₃ > 3q₁, by hand: Q = I, find's default, is not such a Q.) A V for the
// whole box exists: x² + 5y² gives
// −V̇ = 2x² − 2p·xy + 10y² + 2x⁴ + 10y⁴, definite for p² < 20 (by hand).
const corner = `state x, y
parameter p in [0, 4]
x' = -x + p*y - x^3
y' = -y - y^3
`

func TestCornerNeedsTheBox(t *testing.T) {
	// The centre's V, checked by the direct method at the corner p = 4
	// and over the whole range.
	vc := "V = 1/2*x^2 + x*y + 3/2*y^2\n"
	atCorner, err := direct.Check(parse(t, corner+vc, model.Setting{Name: "p", Value: big.NewRat(4, 1)}), "corner.lya")
	if err != nil {
		t.Fatal(err)
	}
	if atCorner.Verdict != checker.VerdictFails || !atCorner.Check.Valid {
		t.Fatalf("the centre's V at p = 4: verdict %s (kernel valid %v), want fails", atCorner.Verdict, atCorner.Check.Valid)
	}
	whole, err := direct.Check(parse(t, corner+vc), "corner.lya")
	if err != nil {
		t.Fatal(err)
	}
	if whole.Verdict == checker.VerdictHolds {
		t.Fatalf("the centre's V holds on the whole box; the constructed case is wrong")
	}
	// The centre's P solves the Lyapunov equation at p = 2 (exactly).
	atCentre, err := direct.Check(parse(t, corner+vc, model.Setting{Name: "p", Value: big.NewRat(2, 1)}), "corner.lya")
	if err != nil {
		t.Fatal(err)
	}
	if atCentre.Verdict != checker.VerdictHolds {
		t.Fatalf("the centre's V at p = 2: %s", atCentre.Verdict)
	}
	if q := atCentre.Shifted.Vdot.Homogeneous(2, atCentre.Model.Ring.StateMask()); q.String() != "-x^2 - y^2" {
		t.Fatalf("quadratic part of V̇ at p = 2 is %s, want −x² − y² (AᵀP + PA = −I)", q)
	}

	res := search(t, corner, 2)
	if !proven(t, res) {
		t.Fatalf("no certificate for the box: %s (sizes %+v)", res.Reason, res.Sizes)
	}
	if res.Outcome.Kind != checker.KindGlobal {
		t.Errorf("kind %s, want global", res.Outcome.Kind)
	}
	// The direct method alone proves only part of the claim for this V
	// (its −V̇ has a quartic part with cross terms in the states and p):
	// the box multipliers carry it.
	if res.Method != MethodBoxSOS || res.Direct.Verdict == checker.VerdictHolds && res.Direct.Claim == checker.KindGlobal {
		t.Errorf("method %s, direct method alone: %s (%s); want the box multipliers", res.Method, res.Direct.Verdict, res.Direct.Claim)
	}
	// The V found works at the corner on its own (the direct method with
	// p = 4 fixed), where the centre's does not.
	at4, err := direct.Check(parse(t, corner+"V = "+res.V.String()+"\n", model.Setting{Name: "p", Value: big.NewRat(4, 1)}), "corner.lya")
	if err != nil {
		t.Fatal(err)
	}
	if at4.Verdict != checker.VerdictHolds {
		t.Errorf("the V found, %s, at p = 4: %s", res.V, at4.Verdict)
	}
	t.Logf("V = %s method %s; sizes %+v", res.V, res.Method, res.Sizes)
}

func TestSearch(t *testing.T) {
	cases := []struct {
		name, src string
		degree    int
		holds     bool
	}{
		// Strogatz, Nonlinear Dynamics and Chaos, §9.2: for the Lorenz
		// equations with r < 1 the origin is globally asymptotically stable,
		// V = x²/σ + y² + z². Here σ = 10, b = 8/3 and r ∈ [0, 1/2].
		{"lorenz-r", "state x, y, z\nparameter r in [0, 1/2]\nx' = 10*(y - x)\ny' = r*x - y - x*z\nz' = x*y - 8/3*z\n", 2, true},
		// The same with σ ∈ [8, 12] free too (V = x²/σ + y² + z² depends on
		// σ; a V with constant coefficients has to serve every σ).
		{"lorenz-r-sigma", "state x, y, z\nparameter r in [0, 1/2]\nparameter s in [8, 12]\nx' = s*(y - x)\ny' = r*x - y - x*z\nz' = x*y - 8/3*z\n", 2, true},
		// Strogatz §9.2: for r > 1 the origin is a saddle (pitchfork at
		// r = 1); the box [1/2, 2] holds unstable values, no certificate.
		{"lorenz-past-1", "state x, y, z\nparameter r in [1/2, 2]\nx' = 10*(y - x)\ny' = r*x - y - x*z\nz' = x*y - 8/3*z\n", 2, false},
		// The damped Duffing oscillator x'' + c·x' + k·x + x³ = 0, whose
		// energy plus a cross term is a Lyapunov function (as for the
		// pendulum with friction in Khalil, Nonlinear Systems, 3rd ed.,
		// §4.1, from memory). By hand: V = 2x² + xy + y² + x⁴/2 gives
		// −V̇ = k·x² − (4 − c − 2k)·xy + (2c − 1)·y² + x⁴, whose quadratic
		// part has determinant 4k(2c − 1) − (4 − c − 2k)² ≥ 3 on
		// k, c ∈ [1, 2] (least at k = c = 1), so degree 4 suffices. No
		// quadratic V does: −V̇'s quartic part is then x³·∂V/∂y = x³·(βx +
		// 2γy), with no y⁴ to dominate the x³y term (indefinite unless
		// γ = 0, and then V is not definite).
		{"duffing-4", "state x, y\nparameter k in [1, 2]\nparameter c in [1, 2]\nx' = y\ny' = -k*x - c*y - x^3\n", 4, true},
		{"duffing-2", "state x, y\nparameter k in [1, 2]\nparameter c in [1, 2]\nx' = y\ny' = -k*x - c*y - x^3\n", 2, false},
		// Routh–Hurwitz for s² + c·s + k (common practice): k < 0 in the
		// box makes the origin a saddle.
		{"duffing-saddle", "state x, y\nparameter k in [-1, 1]\nparameter c in [1, 2]\nx' = y\ny' = -k*x - c*y - x^3\n", 4, false},
		// A constructed centre (by hand): the linearization x' = y,
		// y' = −x is a rotation, so no V has −V̇ with a definite quadratic
		// part, but V = x² + y² gives V̇ = −2a·x⁴ − 2y⁴ < 0 for a ∈ [1, 2]:
		// the search's second attempt, with margins of degree 4.
		{"centre", "state x, y\nparameter a in [1, 2]\nx' = y - a*x^3\ny' = -x - y^3\n", 2, true},
		{"centre-4", "state x, y\nparameter a in [1, 2]\nx' = y - a*x^3\ny' = -x - y^3\n", 4, true},
		// A constructed map (by hand): with V = x² + y², ΔV =
		// (p² − 15/16)x² + (p/4)xy + (p²/4 − 15/16)y², negative definite for
		// |p| ≤ 1/2 (diagonal ≤ −11/16, off-diagonal ≤ 1/16; Gershgorin,
		// common practice).
		{"map", "state x, y\nparameter p in [-1/2, 1/2]\nx+ = p*x + 1/4*y\ny+ = -1/4*x + 1/2*y*p\n", 2, true},
		// The map x+ = p·x has |p| > 1 for p ∈ (1, 3/2]: unstable (common
		// practice), no certificate.
		{"map-unstable", "state x, y\nparameter p in [1/2, 3/2]\nx+ = p*x\ny+ = 1/2*y\n", 2, false},
		// The kernel's own example (checker/testdata, boxquartic.lya, an
		// invented scenario): V = x² + y² works on the box (by hand).
		{"boxquartic", "state x, y\nparameter p in [0, 2]\nparameter c in [1, 3]\nx' = -x - c*x^3 + p*y\ny' = -x - y\n", 2, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			res := search(t, tc.src, tc.degree)
			if got := proven(t, res); got != tc.holds {
				t.Fatalf("proven %v, want %v; reason %q, sizes %+v", got, tc.holds, res.Reason, res.Sizes)
			}
			if tc.holds {
				if res.Outcome.Kind != checker.KindGlobal {
					t.Errorf("kind %s, want global", res.Outcome.Kind)
				}
				if d := res.V.DegreeIn(res.Direct.Model.Ring.StateMask()); d > tc.degree {
					t.Errorf("V = %s has degree %d above %d", res.V, d, tc.degree)
				}
				if res.V.DegreeIn(res.Direct.Model.Ring.ParamMask()) != 0 {
					t.Errorf("V = %s depends on the parameters", res.V)
				}
				t.Logf("V = %s method %s; sizes %+v", res.V, res.Method, res.Sizes)
			}
		})
	}
}

func TestSearchErrors(t *testing.T) {
	cases := []struct{ name, src, want string }{
		{"fixed", "state x\nparameter a = 1\nx' = -a*x\n", "needs free parameters"},
		{"unbounded", "state x\nparameter a > 0\nx' = -a*x\n", "case.lya:2:11: parameter a has range \"> 0\""},
		{"moving", "state x\nparameter a in [1, 2]\nx' = -(x - a)\nat x = a\n", "depends on the parameters"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Search(context.Background(), parse(t, tc.src), Options{Degree: 2})
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want one containing %q", err, tc.want)
			}
		})
	}
	_, err := Search(context.Background(), parse(t, corner), Options{Degree: 3})
	if err == nil || !strings.Contains(err.Error(), "even") {
		t.Fatalf("odd degree: %v", err)
	}
}

// planted returns a random robustly stable model with n states and np
// parameters on small boxes inside [−1, 1] (an invented family): A(p) =
// −2I + S + R + Σ p_k·E_k, S skew-symmetric with integer entries, R and E_k
// with entries of size ≤ 1/4, so the symmetric part of A(p) is
// ≤ −2I + (n/4)(1 + np)·I ≺ 0 for n ≤ 3, np ≤ 2 (Gershgorin, common
// practice); cubic damping −xᵢ³ and couplings c·xᵢ²xᵢ₊₁ in xᵢ',
// −c·xᵢ³ in xᵢ₊₁' that cancel in the derivative of Σxᵢ². V = Σxᵢ² is
// planted: −V̇ ≥ (4 − n(1 + np)/2)·Σxᵢ² + 2Σxᵢ⁴ on the box.
func planted(r *rand.Rand, n, np int) string {
	small := func() string { return fmt.Sprintf("%d/8", r.IntN(5)-2) }
	var b strings.Builder
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("x%d", i+1)
	}
	params := make([]string, np)
	fmt.Fprintf(&b, "state %s\n", strings.Join(names, ", "))
	for k := range params {
		params[k] = fmt.Sprintf("p%d", k+1)
		lo := []string{"-1", "-1/2", "0", "1/4", "1/2"}[r.IntN(5)]
		w := []string{"1/4", "1/2"}[r.IntN(2)]
		fmt.Fprintf(&b, "parameter %s in [%s, %s + %s]\n", params[k], lo, lo, w)
	}
	skew := make([][]int, n)
	for i := range skew {
		skew[i] = make([]int, n)
	}
	for i := range n {
		for j := i + 1; j < n; j++ {
			skew[i][j] = r.IntN(7) - 3
			skew[j][i] = -skew[i][j]
		}
	}
	couple := make([]string, n) // c of the pair (xᵢ, xᵢ₊₁), the same in both rows
	for i := range couple {
		couple[i] = params[r.IntN(np)]
	}
	for i := range n {
		terms := []string{fmt.Sprintf("-2*%s", names[i]), fmt.Sprintf("-%s^3", names[i])}
		for j := range n {
			terms = append(terms, fmt.Sprintf("(%d + %s)*%s", skew[i][j], small(), names[j]))
			for _, p := range params {
				terms = append(terms, fmt.Sprintf("%s*%s*%s", small(), p, names[j]))
			}
		}
		if i+1 < n {
			terms = append(terms, fmt.Sprintf("%s*%s^2*%s", couple[i], names[i], names[i+1]))
		}
		if i > 0 {
			terms = append(terms, fmt.Sprintf("-%s*%s^3", couple[i-1], names[i-1]))
		}
		fmt.Fprintf(&b, "%s' = %s\n", names[i], strings.Join(terms, " + "))
	}
	return b.String()
}

// unstable returns a random model with an unstable parameter value inside
// its box (an invented family): A(p) upper triangular with A₁₁ = p₁ − m,
// m the midpoint of p₁'s range, other diagonal entries −1, random entries
// above the diagonal, random quadratic and cubic terms. The eigenvalues of
// a triangular matrix are its diagonal (common practice), so for p₁ > m
// the origin is unstable (Lyapunov's indirect method; Khalil, Nonlinear
// Systems, 3rd ed., Theorem 4.7, from memory): no certificate may exist.
func unstable(r *rand.Rand, n, np int) string {
	coef := func() string { return fmt.Sprintf("%d/4", r.IntN(9)-4) }
	var b strings.Builder
	names := make([]string, n)
	for i := range names {
		names[i] = fmt.Sprintf("x%d", i+1)
	}
	fmt.Fprintf(&b, "state %s\n", strings.Join(names, ", "))
	params := make([]string, np)
	mid := ""
	for k := range params {
		params[k] = fmt.Sprintf("p%d", k+1)
		lo := []string{"-1", "-1/2", "0", "1/2"}[r.IntN(4)]
		fmt.Fprintf(&b, "parameter %s in [%s, %s + 1/2]\n", params[k], lo, lo)
		if k == 0 {
			mid = lo + " + 1/4"
		}
	}
	for i := range n {
		terms := []string{fmt.Sprintf("-%s^3", names[i])}
		if i == 0 {
			terms = append(terms, fmt.Sprintf("(p1 - (%s))*%s", mid, names[0]))
		} else {
			terms = append(terms, "-"+names[i])
		}
		for j := i + 1; j < n; j++ {
			terms = append(terms, fmt.Sprintf("(%s + %s*%s)*%s", coef(), coef(), params[r.IntN(np)], names[j]))
		}
		terms = append(terms, fmt.Sprintf("%s*%s*%s", coef(), names[r.IntN(n)], names[r.IntN(n)]))
		fmt.Fprintf(&b, "%s' = %s\n", names[i], strings.Join(terms, " + "))
	}
	return b.String()
}

// TestRandomized: planted robustly stable systems always get a certificate
// that the kernel accepts; systems with a planted unstable parameter value
// in the box never do. LYACERT_BOXSEARCH_FULL=1 runs ten times as many.
func TestRandomized(t *testing.T) {
	count := 6
	if os.Getenv("LYACERT_BOXSEARCH_FULL") != "" {
		count = 60
	}
	r := rand.New(rand.NewPCG(20261202, 7))
	for i := range count {
		n, np := 2+i%2, 1+(i/2)%2
		src := planted(r, n, np)
		res := search(t, src, 2)
		if !proven(t, res) {
			t.Errorf("planted stable case %d not proven: %s (sizes %+v)\n%s", i, res.Reason, res.Sizes, src)
		}
		src = unstable(r, n, np)
		res = search(t, src, 2+2*(i%2))
		if res.Doc != nil {
			t.Errorf("a certificate for a model with an unstable parameter value in the box (V = %s, %s):\n%s", res.V, res.Method, src)
		}
	}
}

// TestVIsConstant: the V of a certificate is a polynomial of the states
// alone, and the certificate's model is the one searched, with every
// parameter free (the kernel proves the claim for the whole box).
func TestVIsConstant(t *testing.T) {
	res := search(t, corner, 2)
	if !proven(t, res) {
		t.Fatal(res.Reason)
	}
	m := parse(t, res.Doc.Model)
	if len(m.FreeParams()) != 1 || m.V == nil {
		t.Fatalf("certificate's model: %d free parameters, V %v", len(m.FreeParams()), m.V)
	}
	if m.V.DegreeIn(m.Ring.ParamMask()) != 0 || m.V.String() != res.V.String() {
		t.Fatalf("certificate's V %s, searched %s", m.V, res.V)
	}
}
