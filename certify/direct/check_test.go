package direct

import (
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

func check(t testing.TB, file string, set ...string) *Result {
	t.Helper()
	res, err := Check(loadCase(t, file, set), file)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func parseIn(t testing.TB, m *model.Model, s string) poly.RatFunc {
	t.Helper()
	f, err := poly.Parse(m.Ring, s)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// Strogatz, Nonlinear Dynamics and Chaos, §9.2 (and Lorenz 1963): with
// V = x²/σ + y² + z², σ > 0, b > 0, r ≥ 0, the origin of the Lorenz equations
// is globally asymptotically stable for r < 1; the region is exactly [0, 1),
// and at r = 1 the result is semidefinite.
func TestLorenzRegion(t *testing.T) {
	res := check(t, "lorenz.lya")
	if res.Claim != checker.KindGlobal || res.Verdict != checker.VerdictOnRegion {
		t.Fatalf("claim %s verdict %s", res.Claim, res.Verdict)
	}
	want := parseIn(t, res.Model, "-2*x^2 + 2*(r + 1)*x*y - 2*y^2 - 2*b*z^2")
	if !res.Vdot.Equal(want) {
		t.Errorf("V̇ = %s, want %s", res.Vdot, want)
	}
	if res.Region == nil || res.Region.Param != "r" {
		t.Fatalf("region %+v: σ and b must drop out, leaving r", res.Region)
	}
	// [0, 1) by the quadratic test, and {1}, where V̇ is only semidefinite,
	// by the invariance principle at r = 1: the region is [0, 1] (§9.2).
	iv := res.Region.Intervals
	if len(iv) != 2 || iv[0].Lo != "0" || !iv[0].LoClosed || iv[0].Hi != "1" || iv[0].HiClosed ||
		iv[1].Lo != "1" || iv[1].Hi != "1" || !iv[1].LoClosed || !iv[1].HiClosed || len(res.Points) != 1 {
		t.Errorf("region %+v, want [0, 1) and {1}", iv)
	}
	var named []string
	for _, c := range res.Conds {
		for _, f := range c.Factors {
			if f.Status == claims.StatusPositive {
				named = append(named, f.P.String())
			}
		}
	}
	if s := strings.Join(named, " "); !strings.Contains(s, "sigma") || !strings.Contains(s, "b") || !strings.Contains(s, "r + 3") {
		t.Errorf("factors positive by assumption: %s", s)
	}
	if res.Refutation == nil {
		t.Errorf("no refutation for r ≥ 1")
	}

	// At r = 1 exactly: semidefinite, V̇ = 0 on x = y, z = 0, and by the
	// invariance principle globally asymptotically stable (§9.2).
	res = check(t, "lorenz.lya", "r=1")
	if res.Claim != checker.KindGlobal || res.Verdict != checker.VerdictHolds || res.Invariance == nil {
		t.Fatalf("r = 1: claim %s verdict %s", res.Claim, res.Verdict)
	}
	if len(res.Kernel) != 1 || res.Kernel[0][0].String() != "1" || res.Kernel[0][1].String() != "1" || res.Kernel[0][2].String() != "0" {
		t.Errorf("kernel %v, want span{(1, 1, 0)}", res.Kernel)
	}

	// Inside the region: holds.
	if res := check(t, "lorenz.lya", "r=1/2"); res.Verdict != checker.VerdictHolds || res.Claim != checker.KindGlobal {
		t.Errorf("r = 1/2: %s %s", res.Claim, res.Verdict)
	}
}

// Ogata, Modern Control Engineering: A = [[0, 1], [−1, −1]] and
// P = [[3/2, 1/2], [1/2, 1]] give V̇ = −(x₁² + x₂²).
func TestOgata(t *testing.T) {
	res := check(t, "ogata.lya")
	if want := parseIn(t, res.Model, "-x1^2 - x2^2"); !res.Vdot.Equal(want) {
		t.Errorf("V̇ = %s, want %s", res.Vdot, want)
	}
	if res.Verdict != checker.VerdictHolds || res.Claim != checker.KindGlobal {
		t.Errorf("%s %s", res.Claim, res.Verdict)
	}
}

// Strogatz, Nonlinear Dynamics and Chaos, §7.2: x' = −x + 4y, y' = −x − y³
// with V = x² + a·y² has V̇ = −2x² + (8 − 2a)xy − 2ay⁴.
func TestStrogatzSection72(t *testing.T) {
	res := check(t, "strogatz72.lya")
	if want := parseIn(t, res.Model, "-2*x^2 + (8 - 2*a)*x*y - 2*a*y^4"); !res.Vdot.Equal(want) {
		t.Errorf("V̇ = %s, want %s", res.Vdot, want)
	}
	// With a = 4 the cross term vanishes: V̇ = −2x² − 8y⁴. The quadratic
	// part is only semidefinite, but −V̇ as a whole is a definite Gram form
	// in the basis (x, y²): the origin is globally asymptotically stable
	// (Strogatz §7.2 reaches the same conclusion by hand).
	res = check(t, "strogatz72.lya", "a=4")
	if res.Verdict != checker.VerdictHolds || res.Claim != checker.KindGlobal {
		t.Errorf("a = 4: %s %s", res.Claim, res.Verdict)
	}
	if b := res.Forms[1].Basis; len(b) != 2 || b[0].String() != "x" || b[1].String() != "y^2" {
		t.Errorf("basis %v, want (x, y^2)", b)
	}
}

// Khalil, Nonlinear Systems, ch. 4: the energy of a damped oscillator gives
// V̇ = −c·y², negative semidefinite: stable by Lyapunov's theorem, and
// asymptotically stable by the invariance principle (on y ≡ 0, y' = −k·x
// forces x = 0).
func TestDampedOscillator(t *testing.T) {
	res := check(t, "oscillator.lya")
	if want := parseIn(t, res.Model, "-c*y^2"); !res.Vdot.Equal(want) {
		t.Errorf("V̇ = %s, want %s", res.Vdot, want)
	}
	if res.Claim != checker.KindGlobal || res.Verdict != checker.VerdictHolds || res.Invariance == nil {
		t.Errorf("%s %s", res.Claim, res.Verdict)
	}
	if len(res.Kernel) != 1 || res.Kernel[0][0].String() != "1" || res.Kernel[0][1].String() != "0" {
		t.Errorf("V̇ = 0 on %v, want the x axis", res.Kernel)
	}
}

func TestOtherVerdicts(t *testing.T) {
	for _, c := range []struct {
		file, claim, verdict string
		refuted              bool
	}{
		{"local.lya", checker.KindLocal, checker.VerdictHolds, false},
		{"cubic.lya", checker.KindGlobal, checker.VerdictHolds, false},
		{"quartic.lya", checker.KindGlobal, checker.VerdictHolds, false},
		{"unstable.lya", checker.KindNone, checker.VerdictFails, true},
		{"twogains.lya", checker.KindGlobal, checker.VerdictOnRegion, false}, // fails only at the corners |a − b| = 2, where V̇ = −2(x ∓ y)² ≤ 0: no point has V̇ > 0 (hand computation)
		{"shifted.lya", checker.KindLocal, checker.VerdictHolds, false},
		{"linearpart.lya", checker.KindNone, checker.VerdictFails, true},
		{"discrete.lya", checker.KindGlobal, checker.VerdictHolds, false},
	} {
		res := check(t, c.file)
		if res.Claim != c.claim || res.Verdict != c.verdict || res.Check.Refuted != c.refuted {
			t.Errorf("%s: %s %s refuted=%v, want %s %s %v", c.file, res.Claim, res.Verdict, res.Check.Refuted, c.claim, c.verdict, c.refuted)
		}
	}
}

// A refutation is exact: for x' = a·x and V = x², the stated values are
// V = x² and V̇ = 2a·x² at the point, computed here by hand (common
// practice). With a free, the region refutes every a > 0 by the negative
// minor −2a of −V̇'s quadratic part, and no point is needed; with a fixed,
// the point is the refutation.
func TestRefutationIsExact(t *testing.T) {
	if res := check(t, "unstable.lya"); res.Refutation != nil || res.Region == nil || !res.Region.refuted() || !res.Check.Refuted {
		t.Errorf("a free: refutation %+v, region %+v", res.Refutation, res.Region)
	}
	res := check(t, "unstable.lya", "a=3")
	rf := res.Refutation
	if rf == nil {
		t.Fatal("a = 3: no refutation point")
	}
	a := big.NewRat(3, 1)
	x, ok1 := new(big.Rat).SetString(rf.Point["x"])
	if !ok1 || x.Sign() == 0 || len(rf.Params) != 0 {
		t.Fatalf("refutation %+v", rf)
	}
	x2 := new(big.Rat).Mul(x, x)
	vdot := new(big.Rat).Mul(big.NewRat(2, 1), new(big.Rat).Mul(a, x2))
	if rf.V != x2.RatString() || rf.Vdot != vdot.RatString() {
		t.Errorf("V = %s, V̇ = %s at x = %s, a = %s; want %s and %s", rf.V, rf.Vdot, x, a, x2.RatString(), vdot.RatString())
	}
}

// gonum as a reference: on random well-conditioned symmetric matrices,
// mat.Cholesky and the exact LDLᵀ agree on positive definiteness.
func TestLDLAgreesWithCholesky(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	r := poly.NewRing(nil, nil)
	agreed := 0
	for trial := 0; trial < 300; trial++ {
		n := 2 + rng.IntN(5)
		g := poly.NewMatrix(r, n)
		f := mat.NewSymDense(n, nil)
		for i := 0; i < n; i++ {
			for j := i; j < n; j++ {
				v := int64(rng.IntN(13) - 6)
				if i == j {
					v += int64(rng.IntN(8))
				}
				g[i][j] = poly.RatConst(r, big.NewRat(v, 1))
				g[j][i] = g[i][j]
				f.SetSym(i, j, float64(v))
			}
		}
		var eig mat.EigenSym
		if !eig.Factorize(f, false) {
			t.Fatal("eigen decomposition failed")
		}
		minAbs := math.Inf(1)
		for _, l := range eig.Values(nil) {
			minAbs = math.Min(minAbs, math.Abs(l))
		}
		if minAbs < 1e-6 {
			continue // too close to singular for a float reference
		}
		var chol mat.Cholesky
		floatPD := chol.Factorize(f)
		var l LDL
		ok, _ := l.Factorize(g)
		exactPD := ok && !l.Semidefinite()
		for i := 0; exactPD && i < n; i++ {
			if l.D[i].Num.ConstTerm().Sign() <= 0 {
				exactPD = false
			}
		}
		if floatPD != exactPD {
			t.Errorf("matrix %v: Cholesky says %v, exact LDLᵀ says %v", g.Strings(), floatPD, exactPD)
		}
		// The factors reproduce the matrix exactly.
		if ok {
			dm := poly.NewMatrix(r, n)
			for i := range l.D {
				dm[i][i] = l.D[i]
			}
			if !l.L.Mul(dm).Mul(l.L.Transpose()).Equal(g) {
				t.Errorf("L·D·Lᵀ ≠ G for %v", g.Strings())
			}
		}
		agreed++
	}
	if agreed < 200 {
		t.Errorf("only %d matrices compared", agreed)
	}
}

// Renaming every state and parameter changes nothing but the names.
func TestRenamingChangesOnlyNames(t *testing.T) {
	orig := "state x, y, z\nparameter sigma > 0\nparameter r >= 0\nparameter b > 0\nx' = sigma*(y - x)\ny' = r*x - y - x*z\nz' = x*y - b*z\nV = x^2/sigma + y^2 + z^2\n"
	renamed := "state p1, p2, p3\nparameter s > 0\nparameter rho >= 0\nparameter beta > 0\np1' = s*(p2 - p1)\np2' = rho*p1 - p2 - p1*p3\np3' = p1*p2 - beta*p3\nV = p1^2/s + p2^2 + p3^2\n"
	a := mustCheck(t, orig)
	b := mustCheck(t, renamed)
	if a.Verdict != b.Verdict || a.Claim != b.Claim {
		t.Fatalf("%s %s vs %s %s", a.Verdict, a.Claim, b.Verdict, b.Claim)
	}
	names := a.Model.Ring.Names()
	if got, want := b.Vdot.Format(names), a.Vdot.String(); got != want {
		t.Errorf("V̇ differs: %s vs %s", got, want)
	}
	for i := range a.Conds {
		if got, want := b.Conds[i].Q.Format(names), a.Conds[i].Q.String(); got != want {
			t.Errorf("condition %d differs: %s vs %s", i, got, want)
		}
	}
	ai, bi := a.Region.Intervals, b.Region.Intervals
	if len(ai) != len(bi) || ai[0] != bi[0] || b.Region.Param != "rho" {
		t.Errorf("regions differ: %+v vs %+v", ai, bi)
	}
}

func mustCheck(t *testing.T, src string) *Result {
	t.Helper()
	m, err := model.Parse("m.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	res, err := Check(m, "m.lya")
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// The demo's irrational endpoint 1 + 2√2 (the root of k² − 2k − 7) is
// isolated by rationals and shown to 15 digits (from memory: 2√2 ≈
// 2.8284271247461900976).
func TestIrrationalEndpoint(t *testing.T) {
	res := check(t, "")
	iv := res.Region.Intervals
	if len(iv) != 1 || iv[0].Hi != "3.82842712474619" || iv[0].HiPoly != "k^2 - 2*k - 7" || iv[0].HiIsolating == nil {
		t.Fatalf("region %+v", iv)
	}
	lo, _ := new(big.Rat).SetString(iv[0].HiIsolating[0])
	hi, _ := new(big.Rat).SetString(iv[0].HiIsolating[1])
	root := 1 + 2*math.Sqrt2
	if l, _ := lo.Float64(); l > root {
		t.Errorf("isolating interval [%s, %s] misses %v", lo, hi, root)
	}
	if h, _ := hi.Float64(); h < root {
		t.Errorf("isolating interval [%s, %s] misses %v", lo, hi, root)
	}
}

func TestFactorize(t *testing.T) {
	r := poly.NewRing([]string{"x"}, []string{"r", "b", "s"})
	for _, c := range []string{
		"-2*r^2*b - 4*r*b + 6*b",
		"(r - 1)^2*(r + 3)*b^3",
		"(2*r - 1)*(r^2 - 2)",
		"(r - b)*(r + 2)*s",
		"3/4*(r^2 + 1)^2*(r - 1/3)",
		"7",
	} {
		p := poly.MustParse(r, c).Num
		k, fs := Factorize(p)
		prod := poly.Const(r, k)
		for _, f := range fs {
			prod.Mul(prod, new(poly.Poly).Pow(f.P, f.Power))
		}
		if !prod.Equal(p) {
			t.Errorf("%s: factorization %v·%v is not exact", c, k, fs)
		}
	}
	// The Lorenz minor factors into its rational linear factors.
	_, fs := Factorize(poly.MustParse(r, "-r^2 - 2*r + 3").Num)
	var got []string
	for _, f := range fs {
		got = append(got, f.P.String())
	}
	slices.Sort(got)
	if strings.Join(got, ",") != "r + 3,r - 1" {
		t.Errorf("factors %v", got)
	}
}

func BenchmarkCheckDemo(b *testing.B) {
	m := loadCase(b, "", nil)
	for b.Loop() {
		if _, err := Check(m, "demo"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkVerify(b *testing.B) {
	res := check(b, "")
	for b.Loop() {
		if !checker.Verify(res.Doc).Valid {
			b.Fatal("invalid")
		}
	}
}

func TestDiscreteTimeCheck(t *testing.T) {
	cases := []struct {
		name, src, verdict, claim string
	}{
		// hand computation (Stein equation AᵀPA − P = −I for A = [[1/2, 1],
		// [0, 1/2]]): P = [[4/3, 8/9], [8/9, 116/27]], so ΔV = −x² − y².
		{"stein", "state x, y\nx+ = x/2 + y\ny+ = y/2\nV = 4/3*x^2 + 16/9*x*y + 116/27*y^2\n",
			checker.VerdictHolds, checker.KindGlobal},
		// the same map with V = x² + y²: AᵀA − I = [[−3/4, 1/2], [1/2, 1/4]]
		// is indefinite, so ΔV takes both signs (hand computation).
		{"indefinite", "state x, y\nx+ = x/2 + y\ny+ = y/2\nV = x^2 + y^2\n",
			checker.VerdictFails, checker.KindNone},
		// hand computation: a nonlinear term of degree 2 in the map leaves
		// the quadratic part of ΔV = −3/4·x² + ..., a local claim.
		{"nonlinear", "state x, y\nx+ = x/2 + y^2\ny+ = y/2\nV = x^2 + y^2\n",
			checker.VerdictHolds, checker.KindLocal},
		// the logistic map x ↦ 5/2·x(1 − x) at its fixed point 3/5, where
		// f' = 2 − r = −1/2 (May 1976): V = (x − 3/5)², ΔV's quadratic part −3/4·(x − 3/5)².
		{"logistic", "state x\nx+ = 5/2*x*(1 - x)\nV = (x - 3/5)^2\nat x = 3/5\n",
			checker.VerdictHolds, checker.KindLocal},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := parseModelText(t, c.src)
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

func parseModelText(t testing.TB, src string) *model.Model {
	t.Helper()
	m, err := model.Parse("test.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestAlgebraicClosedEnd: a constructed model (testdata/models/algebraic.lya)
// whose region closes at an irrational end. At a = √2 the quadratic part of
// −V̇, 2x² − 2a·xy + y² = (√2x − y)², is only semidefinite, and the quartic
// part 2x⁴ + 2y⁴ is definite with no cubic terms, so −V̇ is definite there
// (common practice: a semidefinite quadratic part whose kernel the next even
// part makes definite); for a > √2 the quadratic part is indefinite
// (Sylvester's criterion, det = 2 − a² < 0), a refutation.
func TestAlgebraicClosedEnd(t *testing.T) {
	m := loadCase(t, "algebraic.lya", nil)
	res, err := Check(m, "algebraic.lya")
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, pc := range res.Region.Pieces {
		got = append(got, fmt.Sprintf("%s %v %s %s %v %s", pc.Status, pc.LoClosed, pc.Lo, pc.Hi, pc.HiClosed, pc.HiPoly))
	}
	want := []string{
		"holds true 0 1.41421356237310 false a^2 - 2",
		"holds true 1.41421356237310 1.41421356237310 true a^2 - 2",
		"fails false 1.41421356237310 inf false ",
	}
	if !slices.Equal(got, want) {
		t.Errorf("pieces\n got %q\nwant %q", got, want)
	}
	if len(res.AlgebraicPoints) != 1 || res.Verdict != checker.VerdictOnRegion || !res.Check.Valid {
		t.Errorf("algebraic points %d, verdict %s, valid %v", len(res.AlgebraicPoints), res.Verdict, res.Check.Valid)
	}
}

// TestTriangularSquares: V = x² + (y − x²)² (testdata/models/triangular.lya,
// constructed) has only singular Gram matrices in its Newton basis (x, y,
// x²): no x³ or xy term lets the coupling of y and x² move elsewhere. Its
// squares x and y − x² vanish together only at the origin (common
// practice: a triangular system), so V is positive definite; with x' = −x,
// y' = −y − x², V̇ = −2x² − 2(y − x²)² likewise, and the equilibrium is
// globally asymptotically stable (Lyapunov's direct method).
func TestTriangularSquares(t *testing.T) {
	m := loadCase(t, "triangular.lya", nil)
	res, err := Check(m, "triangular.lya")
	if err != nil {
		t.Fatal(err)
	}
	if res.Verdict != checker.VerdictHolds || res.Claim != checker.KindGlobal || !res.Check.Valid {
		t.Fatalf("%s %s (valid %v), want holds global-asymptotic", res.Verdict, res.Claim, res.Check.Valid)
	}
	for _, f := range res.Forms {
		if !slices.Equal(f.Triangular, []string{"x", "y"}) {
			t.Errorf("%s: triangular order %v, want [x y]", f.Name, f.Triangular)
		}
	}
}

// gonum as a reference for the fraction-free elimination with parameters:
// on random symmetric matrices of rational functions of a and b (sparse,
// with denominators, sometimes with a zero row), the leading minors that
// LDL reports equal mat.Det of the leading blocks at rational points, and
// L·D·Lᵀ reproduces the matrix exactly; a zero pivot with a non-zero
// column is refused at the right index (its 2×2 principal minor with that
// entry is −c² < 0, common practice).
func TestLDLWithParametersAgreesWithDet(t *testing.T) {
	rng := rand.New(rand.NewPCG(1968, 3))
	r := poly.NewRing([]string{"x1", "x2", "x3", "x4", "x5"}, []string{"a", "b"})
	entries := []string{"0", "0", "0", "1", "-2", "3", "a", "a^2 - 1", "b", "a*b + 2", "1/(a^2 + 1)", "b/(b^2 + 2)", "(a - b)/(a^2 + 1)", "2*a/3"}
	ai, _ := r.Index("a")
	bi, _ := r.Index("b")
	checked := 0
	for trial := 0; trial < 200; trial++ {
		n := 2 + rng.IntN(4)
		g := poly.NewMatrix(r, n)
		for i := 0; i < n; i++ {
			for j := i; j < n; j++ {
				e := poly.MustParse(r, entries[rng.IntN(len(entries))])
				g[i][j], g[j][i] = e, e
			}
			if i > 0 && rng.IntN(4) == 0 {
				g[i][i] = poly.MustParse(r, "4 + a^2 + b^2")
			}
		}
		zeroRow := -1
		if rng.IntN(5) == 0 {
			zeroRow = rng.IntN(n)
			for j := range n {
				g[zeroRow][j], g[j][zeroRow] = poly.FromPoly(poly.Zero(r)), poly.FromPoly(poly.Zero(r))
			}
		}
		var l LDL
		ok, col := l.Factorize(g)
		pt := make([]*big.Rat, r.NumVars())
		for i := range pt {
			pt[i] = new(big.Rat)
		}
		pt[ai], pt[bi] = big.NewRat(int64(rng.IntN(9)-4), int64(1+rng.IntN(3))), big.NewRat(int64(rng.IntN(9)-4), 1)
		val := func(f poly.RatFunc) float64 {
			v, err := f.Eval(pt)
			if err != nil {
				t.Fatal(err)
			}
			x, _ := v.Float64()
			return x
		}
		if !ok {
			// The pivot at col vanishes identically and its column does not.
			if !l.D[col].IsZero() {
				t.Fatalf("trial %d: refused at %d with a non-zero pivot", trial, col)
			}
			continue
		}
		dm := poly.NewMatrix(r, n)
		for i := range l.D {
			dm[i][i] = l.D[i]
		}
		if !l.L.Mul(dm).Mul(l.L.Transpose()).Equal(g) {
			t.Fatalf("trial %d: L·D·Lᵀ ≠ G for %v", trial, g.Strings())
		}
		if zeroRow >= 0 && !l.Zero[zeroRow] {
			t.Fatalf("trial %d: zero row %d not a zero pivot", trial, zeroRow)
		}
		// Minors of the principal submatrix on the non-zero pivots.
		var keep []int
		for i := range n {
			if !l.Zero[i] {
				keep = append(keep, i)
			}
		}
		minors := l.Minors()
		if len(minors) != len(keep) {
			t.Fatalf("trial %d: %d minors for %d non-zero pivots", trial, len(minors), len(keep))
		}
		for k := range keep {
			m := mat.NewDense(k+1, k+1, nil)
			for i := 0; i <= k; i++ {
				for j := 0; j <= k; j++ {
					m.Set(i, j, val(g[keep[i]][keep[j]]))
				}
			}
			want, got := mat.Det(m), val(minors[k])
			if math.Abs(got-want) > 1e-9*math.Max(1, math.Abs(want)) {
				t.Fatalf("trial %d: minor %d is %s = %g at a=%s, b=%s; mat.Det gives %g", trial, k+1, minors[k], got, pt[ai], pt[bi], want)
			}
			checked++
		}
	}
	if checked < 300 {
		t.Errorf("only %d minors checked", checked)
	}
}
