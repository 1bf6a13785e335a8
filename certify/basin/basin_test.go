package basin

import (
	"context"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/certify/ode"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
)

func load(t testing.TB, name string) *model.Model {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "basin", name))
	if err != nil {
		t.Fatal(err)
	}
	m, err := model.Parse(name, src)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func find(t testing.TB, name string, o Options) *Result {
	t.Helper()
	r, err := Find(context.Background(), load(t, name), name, o)
	if err != nil {
		t.Fatal(err)
	}
	if !r.Check.Valid || r.Check.Basin != r.Level.RatString() {
		t.Fatalf("the kernel does not accept the level: %+v", r.Check)
	}
	return r
}

func float(q *big.Rat) float64 { f, _ := q.Float64(); return f }

// Slotine & Li, Applied Nonlinear Control, ch. 3 (the local invariant set
// example): for x1' = x1(x1² + x2² − 2) − 4x1x2², x2' = 4x1²x2 + x2(x1² + x2² − 2)
// and V = x1² + x2², V̇ = 2V(V − 2), so every set V < 2 is attracted and the
// circle V = 2 is invariant: the best level is exactly 2.
func TestRingLevelIsTwo(t *testing.T) {
	r := find(t, "ring.lya", Options{Gap: 0.005})
	lo, hi := float(r.Level), float(r.Upper)
	if lo < 1.98 {
		t.Errorf("c_lo = %g, want ≥ 1.98 (Slotine & Li: the best level is 2)", lo)
	}
	if math.Abs(hi-2)/2 > 0.01 {
		t.Errorf("c_hi = %g, want 2 within 1 %% (Slotine & Li)", hi)
	}
	if r.CounterVdot.Sign() < 0 || r.Level.Cmp(r.Upper) > 0 {
		t.Errorf("counterexample V̇ = %s, c_lo %s > c_hi %s", r.CounterVdot, r.Level, r.Upper)
	}
}

// Slotine & Li, Applied Nonlinear Control, ch. 3: V̇ = 2V(V − 2), best
// level exactly 2, now by the S-procedure (kernel rule sublevel-sprocedure).
// With s = 2V the identity leaves σ = (4 − ε − 2c)·V (hand computation), a
// sum of squares for every c < 2, so the bisection must come within the gap.
func TestRingSProcedure(t *testing.T) {
	r := find(t, "ring.lya", Options{Gap: 0.01, Method: MethodSOS})
	if lo := float(r.Level); lo < 1.98 || lo >= 2 {
		t.Errorf("c_lo = %g, want in [1.98, 2) (Slotine & Li: the best level is 2)", lo)
	}
	if r.Rule != "sublevel-sprocedure" || r.SProcedure == nil || r.Claim != nil {
		t.Errorf("rule %q, want sublevel-sprocedure alone", r.Rule)
	}
	if !strings.HasPrefix(r.Method, "S-procedure") {
		t.Errorf("method %q", r.Method)
	}
}

// Khalil, Nonlinear Systems, §8.2 (Van der Pol in reverse time): the
// S-procedure's level against the dense polar scan of
// TestVanDerPolAgainstPolarScan (2.30448, recomputed there), never above it.
func TestVanDerPolSProcedure(t *testing.T) {
	const scan = 2.304478
	r := find(t, "vanderpol.lya", Options{Gap: 0.005, Method: MethodSOS})
	if lo := float(r.Level); lo > scan || (scan-lo)/scan > 0.01 {
		t.Errorf("c_lo = %g, want within 1 %% below the polar scan's %g", lo, scan)
	}
}

// Automatic choice: the S-procedure applies to the ring (V quadratic, no
// free parameter) and closes the gap, so its rule proves the level; with a
// free parameter only the branch and bound applies; --method sos then fails
// with a reason.
func TestMethodChoice(t *testing.T) {
	if r := find(t, "ring.lya", Options{Gap: 0.01}); r.Rule != "sublevel-sprocedure" {
		t.Errorf("ring, auto: rule %q, want sublevel-sprocedure", r.Rule)
	}
	if r := find(t, "ringbox.lya", Options{Gap: 0.05}); r.Rule != "sublevel-basin" {
		t.Errorf("ringbox, auto: rule %q, want sublevel-basin", r.Rule)
	}
	if r := find(t, "ring.lya", Options{Gap: 0.05, Method: MethodBranch}); r.Rule != "sublevel-basin" || r.Claim == nil {
		t.Errorf("ring, bb: rule %q, want sublevel-basin", r.Rule)
	}
	_, err := Find(context.Background(), load(t, "ringbox.lya"), "ringbox.lya", Options{Method: MethodSOS})
	if err == nil || !strings.Contains(err.Error(), "every parameter fixed") {
		t.Errorf("ringbox, sos: %v, want an error about fixed parameters", err)
	}
}

// An invented model whose V = x² − x⁴/10 is positive only near 0: its
// sublevel sets are unbounded, so the S-procedure must not apply, and the
// branch and bound certifies the component around 0. V̇ = −2x² + 12/5·x⁴ −
// 2/5·x⁶ first vanishes at x² = 1 (hand computation), where V = 9/10.
func TestLocalVKeepsBranchAndBound(t *testing.T) {
	m, err := model.Parse("local.lya", []byte("state x\nx' = -x + x^3\nV = x^2 - 1/10*x^4\n"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Find(context.Background(), m, "local.lya", Options{Method: MethodSOS}); err == nil || !strings.Contains(err.Error(), "radially unbounded") {
		t.Errorf("sos: %v, want an error about V not radially unbounded", err)
	}
	r, err := Find(context.Background(), m, "local.lya", Options{Gap: 0.02})
	if err != nil {
		t.Fatal(err)
	}
	if lo := float(r.Level); r.Rule != "sublevel-basin" || lo > 0.9 || lo < 0.9*0.98 {
		t.Errorf("auto: rule %q, c_lo = %g; want sublevel-basin and c_lo in [0.882, 0.9]", r.Rule, lo)
	}
}

// The ring example of Slotine & Li (Applied Nonlinear Control, ch. 3) with
// its 2 made a parameter a ∈ [1, 2]: V̇ = 2V(V − a), so for each a the best
// level is a (hand computation, generalizing the book's), and one level for
// every a in the box is at best the smallest a, exactly 1. The counterexample
// must sit at a parameter value in the box where V̇ ≥ 0 holds exactly, which
// for V ≈ 1 means a ≤ V.
func TestRingBoxLevelIsOne(t *testing.T) {
	r := find(t, "ringbox.lya", Options{Gap: 0.01})
	lo := float(r.Level)
	if lo < 0.98 || lo > 1 {
		t.Errorf("c_lo = %g, want in [0.98, 1] (Slotine & Li, generalized: the best level is 1)", lo)
	}
	if r.Upper == nil || math.Abs(float(r.Upper)-1) > 0.01 {
		t.Fatalf("c_hi = %v, want 1 within 1 %%", r.Upper)
	}
	if len(r.CounterParams) != 1 || r.CounterParams[0].Cmp(big.NewRat(1, 1)) < 0 || r.CounterParams[0].Cmp(r.Upper) > 0 {
		t.Errorf("counterexample at a = %v, want 1 ≤ a ≤ V = %s", r.CounterParams, r.Upper)
	}
	// V̇ = 2V(V − a) at the point, recomputed by hand.
	x1, x2 := r.Counterexample[0], r.Counterexample[1]
	v := new(big.Rat).Add(new(big.Rat).Mul(x1, x1), new(big.Rat).Mul(x2, x2))
	want := new(big.Rat).Sub(v, r.CounterParams[0])
	want.Mul(want, v).Mul(want, big.NewRat(2, 1))
	if want.Cmp(r.CounterVdot) != 0 || want.Sign() < 0 {
		t.Errorf("V̇ at the counterexample = %s, 2V(V − a) = %s", r.CounterVdot, want)
	}
}

// Two parameters: the ring with radius a ∈ [1, 2] and a rotation b ∈ [0, 1]
// that leaves V̇ = 2V(V − a) unchanged (hand computation; Slotine & Li,
// Applied Nonlinear Control, ch. 3, generalized), so the best level for
// every (a, b) is 1. V̇ does not involve b, so the directed bisection never
// halves b; it closes a 1 % gap with few boxes.
func TestTwoParametersLevelIsOne(t *testing.T) {
	r := find(t, "ringspin.lya", Options{Gap: 0.01})
	if lo := float(r.Level); lo < 0.98 || lo > 1 {
		t.Errorf("c_lo = %g, want in [0.98, 1]", lo)
	}
	if strings.ContainsRune(r.Claim.Tree, 'd') {
		t.Errorf("the tree halves b, on which V and V̇ do not depend")
	}
	if r.Inside+r.Outside > 20000 {
		t.Errorf("%d boxes, want far fewer than the 300,000 of halving every side in turn", r.Inside+r.Outside)
	}
}

// A parameter range that is not closed and bounded has no box to bisect.
func TestParameterRangeMustBeCompact(t *testing.T) {
	for _, rng := range []string{"in (1, 2]", "> 1", ""} {
		src := "state x1, x2\nparameter a " + rng + "\nx1' = x1*(x1^2 + x2^2 - a) - 4*x1*x2^2\nx2' = 4*x1^2*x2 + x2*(x1^2 + x2^2 - a)\nV = x1^2 + x2^2\n"
		m, err := model.Parse("open.lya", []byte(src))
		if err != nil {
			t.Fatal(err)
		}
		if _, err := Find(context.Background(), m, "open.lya", Options{}); err == nil || !strings.Contains(err.Error(), "closed and bounded") {
			t.Errorf("range %q: %v, want an error about a closed and bounded range", rng, err)
		}
	}
}

// lyapunov2 solves AᵀP + PA = −I exactly for a 2×2 A: the three unknowns
// p11, p12, p22 of the symmetric P satisfy a linear system (common
// practice), solved here by Gaussian elimination over the rationals.
func lyapunov2(a [2][2]int64) [2][2]*big.Rat {
	q := func(x int64) *big.Rat { return big.NewRat(x, 1) }
	// Entries (1,1), (1,2), (2,2) of AᵀP + PA in p11, p12, p22.
	m := [3][4]*big.Rat{
		{q(2 * a[0][0]), q(2 * a[1][0]), q(0), q(-1)},
		{q(a[0][1]), q(a[0][0] + a[1][1]), q(a[1][0]), q(0)},
		{q(0), q(2 * a[0][1]), q(2 * a[1][1]), q(-1)},
	}
	for c := range 3 {
		p := c
		for m[p][c].Sign() == 0 {
			p++
		}
		m[c], m[p] = m[p], m[c]
		for r := range 3 {
			if r == c || m[r][c].Sign() == 0 {
				continue
			}
			f := new(big.Rat).Quo(m[r][c], m[c][c])
			for k := c; k < 4; k++ {
				m[r][k] = new(big.Rat).Sub(m[r][k], new(big.Rat).Mul(f, m[c][k]))
			}
		}
	}
	x := func(i int) *big.Rat { return new(big.Rat).Quo(m[i][3], m[i][i]) }
	return [2][2]*big.Rat{{x(0), x(1)}, {x(1), x(2)}}
}

// Khalil, Nonlinear Systems, §8.2: Van der Pol's equation in reverse time,
// x1' = −x2, x2' = x1 + (x1² − 1)x2, with V = xᵀPx and AᵀP + PA = −I for the
// linearization A = [[0, −1], [1, −1]]; P = [[3/2, −1/2], [−1/2, 1]] (from
// memory), checked here by solving the equation exactly. The optimal level
// of V is computed independently by a dense polar scan.
func TestVanDerPolAgainstPolarScan(t *testing.T) {
	p := lyapunov2([2][2]int64{{0, -1}, {1, -1}})
	want := [2][2]*big.Rat{{big.NewRat(3, 2), big.NewRat(-1, 2)}, {big.NewRat(-1, 2), big.NewRat(1, 1)}}
	for i := range 2 {
		for j := range 2 {
			if p[i][j].Cmp(want[i][j]) != 0 {
				t.Fatalf("P[%d][%d] = %s, want %s (Khalil §8.2, from memory)", i, j, p[i][j], want[i][j])
			}
		}
	}
	// The model file states V = xᵀPx with this P.
	m := load(t, "vanderpol.lya")
	for _, x := range [][2]int64{{1, 0}, {0, 1}, {1, 1}, {2, -3}} {
		pt := []*big.Rat{big.NewRat(x[0], 1), big.NewRat(x[1], 1)}
		got, _ := m.V.Eval(pt)
		w := new(big.Rat)
		for i := range 2 {
			for j := range 2 {
				w.Add(w, new(big.Rat).Mul(p[i][j], new(big.Rat).Mul(pt[i], pt[j])))
			}
		}
		if got.Cmp(w) != 0 {
			t.Fatalf("V%v = %s, xᵀPx = %s", x, got, w)
		}
	}
	// Dense polar scan (an independent float computation, not a proof):
	// along x = ρu, V̇ = a(u)ρ² + b(u)ρ⁴, so V̇ first vanishes at ρ² = −a/b
	// where b > 0, with V = ρ²·uᵀPu there; the optimal level is the least
	// such V over the directions.
	pf := [2][2]float64{{1.5, -0.5}, {-0.5, 1}}
	vdot := func(x1, x2 float64) float64 {
		f1, f2 := -x2, x1+(x1*x1-1)*x2
		return 2 * ((pf[0][0]*x1+pf[0][1]*x2)*f1 + (pf[1][0]*x1+pf[1][1]*x2)*f2)
	}
	best := math.Inf(1)
	const steps = 400000
	for k := range steps {
		th := 2 * math.Pi * float64(k) / steps
		u1, u2 := math.Cos(th), math.Sin(th)
		d1, d2 := vdot(u1, u2), vdot(2*u1, 2*u2)
		b := (d2 - 4*d1) / 12
		a := d1 - b
		if b <= 0 {
			continue
		}
		rho2 := -a / b
		best = math.Min(best, rho2*(pf[0][0]*u1*u1+2*pf[0][1]*u1*u2+pf[1][1]*u2*u2))
	}
	r := find(t, "vanderpol.lya", Options{Gap: 0.005})
	lo, hi := float(r.Level), float(r.Upper)
	t.Logf("polar scan %.6f; c_lo %.6f, c_hi %.6f", best, lo, hi)
	if math.Abs(lo-best)/best > 0.02 || lo > best {
		t.Errorf("c_lo = %g, want within 2 %% below the polar scan's %g", lo, best)
	}
	if hi < best*(1-1e-9) {
		t.Errorf("c_hi = %g below the polar scan's optimum %g", hi, best)
	}
}

// A consistency check, not a proof: points drawn inside the certified set
// and integrated with the Dormand–Prince integrator all approach the
// equilibrium.
func TestCertifiedSetsConverge(t *testing.T) {
	for _, name := range []string{"ring.lya", "vanderpol.lya"} {
		t.Run(name, func(t *testing.T) {
			r := find(t, name, Options{Gap: 0.02})
			n := len(r.Equilibrium)
			rs := &rays{v: certify.NewFloatPoly(r.Direct.V.Num, n)}
			fs := make([]certify.FloatPoly, n)
			for i, f := range r.Direct.Model.F {
				fs[i] = certify.NewFloatPoly(f.Num, n)
			}
			rhs := func(x, dx []float64) {
				for i := range fs {
					dx[i] = fs[i].Eval(x)
				}
			}
			c := float(r.Level)
			rng := rand.New(rand.NewPCG(1, 2))
			for k := 0; k < 1000; {
				x := make([]float64, n)
				for i := range x {
					a, _ := new(big.Rat).SetString(r.Box[i].Lo.Value.RatString())
					b, _ := new(big.Rat).SetString(r.Box[i].Hi.Value.RatString())
					x[i] = float(a) + rng.Float64()*(float(b)-float(a))
				}
				if rs.v.Eval(x) > c {
					continue
				}
				k++
				res, err := ode.Integrate(rhs, 0, 200, x, ode.Options{Stop: func(_ float64, y []float64) bool { return math.Hypot(y[0], y[1]) < 1e-6 }})
				if err != nil || !res.Stopped {
					t.Fatalf("the solution from %v does not approach the equilibrium (%v)", x, err)
				}
			}
		})
	}
}

func TestErrors(t *testing.T) {
	for _, c := range []struct{ name, src string }{
		{"map", "state x\nx+ = x/2\nV = x^2\n"},
		{"free parameter", "state x\nparameter a > 0\nx' = -a*x\nV = x^2\n"},
		{"no V", "state x\nx' = -x\n"},
		{"unstable", "state x\nx' = x\nV = x^2\n"},
	} {
		m, err := model.Parse(c.name, []byte(c.src))
		if err != nil {
			t.Fatal(err)
		}
		if _, err := Find(context.Background(), m, c.name, Options{MaxBoxes: 2000}); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
}

// BenchmarkRingSProcedure: two states to a 1 % gap by the S-procedure.
func BenchmarkRingSProcedure(b *testing.B) {
	m := load(b, "ring.lya")
	for b.Loop() {
		r, err := Find(context.Background(), m, "ring.lya", Options{Gap: 0.01, Method: MethodSOS})
		if err != nil || r.Gap() > 0.01 {
			b.Fatal(err, r.Gap())
		}
	}
}

// BenchmarkVanDerPolSProcedure: two states to a 1 % gap by the S-procedure.
func BenchmarkVanDerPolSProcedure(b *testing.B) {
	m := load(b, "vanderpol.lya")
	for b.Loop() {
		r, err := Find(context.Background(), m, "vanderpol.lya", Options{Gap: 0.01, Method: MethodSOS})
		if err != nil || r.Gap() > 0.01 {
			b.Fatal(err, r.Gap())
		}
	}
}

// BenchmarkTrioSProcedure: three states (an invented model) to a 1 % gap
// by the S-procedure.
func BenchmarkTrioSProcedure(b *testing.B) {
	m := load(b, "trio.lya")
	for b.Loop() {
		r, err := Find(context.Background(), m, "trio.lya", Options{Gap: 0.01, Method: MethodSOS})
		if err != nil || r.Gap() > 0.01 {
			b.Fatal(err, r.Gap())
		}
	}
}

// BenchmarkTwoParametersOnePercent: two states and two parameters (the
// ring with an uncertain radius and rotation) to a 1 % gap.
func BenchmarkTwoParametersOnePercent(b *testing.B) {
	m := load(b, "ringspin.lya")
	for b.Loop() {
		r, err := Find(context.Background(), m, "ringspin.lya", Options{Gap: 0.01})
		if err != nil || r.Gap() > 0.01 {
			b.Fatal(err, r.Gap())
		}
	}
}

// BenchmarkRingOnePercent: two states to a 1 % gap.
func BenchmarkRingOnePercent(b *testing.B) {
	m := load(b, "ring.lya")
	for b.Loop() {
		r, err := Find(context.Background(), m, "ring.lya", Options{Gap: 0.01, Method: MethodBranch})
		if err != nil || r.Gap() > 0.01 {
			b.Fatal(err, r.Gap())
		}
	}
}

// BenchmarkVanDerPolOnePercent: two states to a 1 % gap.
func BenchmarkVanDerPolOnePercent(b *testing.B) {
	m := load(b, "vanderpol.lya")
	for b.Loop() {
		r, err := Find(context.Background(), m, "vanderpol.lya", Options{Gap: 0.01, Method: MethodBranch})
		if err != nil || r.Gap() > 0.01 {
			b.Fatal(err, r.Gap())
		}
	}
}

// BenchmarkTrioFivePercent: three states (an invented model) to a 5 % gap.
func BenchmarkTrioFivePercent(b *testing.B) {
	m := load(b, "trio.lya")
	for b.Loop() {
		r, err := Find(context.Background(), m, "trio.lya", Options{Gap: 0.05, Method: MethodBranch})
		if err != nil || r.Gap() > 0.05 {
			b.Fatal(err, r.Gap())
		}
	}
}

// Multipliers of one degree more (s of degree 4, σ of degree 6) on Van
// der Pol in reverse time (Khalil, Nonlinear Systems, §8.2): the level
// against the polar scan of TestVanDerPolAgainstPolarScan, and the
// certificate accepted by the kernel with that level.
func TestSProcedureHigherDegree(t *testing.T) {
	const scan = 2.304478
	ctx := context.Background()
	d, err := direct.CheckPaving(ctx, load(t, "vanderpol.lya"), "vanderpol.lya", direct.PaveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	sp, err := newSProc(d, 1)
	if err != nil {
		t.Fatal(err)
	}
	if sp.degS != 4 || sp.degR != 6 {
		t.Fatalf("degrees %d and %d, want 4 and 6", sp.degS, sp.degR)
	}
	cl, level, err := sp.search(ctx, 0, scan, 0.0025)
	if err != nil {
		t.Fatal(err)
	}
	if lo := float(level); lo > scan || (scan-lo)/scan > 0.01 {
		t.Errorf("c_lo = %g, want within 1 %% below the polar scan's %g", lo, scan)
	}
	doc := *d.Doc
	doc.Claims = append(append([]claims.Claim(nil), d.Doc.Claims...), cl)
	if err := certificates.Seal(&doc); err != nil {
		t.Fatal(err)
	}
	if out := checker.Verify(&doc); !out.Valid || out.Basin != level.RatString() {
		t.Errorf("the kernel: valid %v, level %q; want %s", out.Valid, out.Basin, level.RatString())
	}
}
