package sdp_test

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/poly"
)

// randomFeasible returns a random SDP whose primal and dual are both
// strictly feasible by construction (b = A(X₀), C = Σ y₀ᵢAᵢ − Z₀ with
// X₀, Z₀ ≻ 0), so an optimum is attained (common practice for test sets).
func randomFeasible(rng *rand.Rand, blocks []int, m int, density float64) *sdp.Problem {
	p := &sdp.Problem{Blocks: blocks}
	x0 := make([][]float64, len(blocks))
	z0 := make([][]float64, len(blocks))
	pd := func(n int, diag bool) []float64 {
		if diag {
			d := make([]float64, n)
			for i := range d {
				d[i] = 0.5 + rng.Float64()
			}
			return d
		}
		g := mat.NewDense(n, n, nil)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				g.Set(i, j, rng.NormFloat64())
			}
		}
		var a mat.Dense
		a.Mul(g, g.T())
		d := make([]float64, n*n)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				d[i*n+j] = a.At(i, j) / float64(n)
			}
			d[i*n+i] += 0.5
		}
		return d
	}
	for k, nb := range blocks {
		n := nb
		if n < 0 {
			n = -n
		}
		x0[k], z0[k] = pd(n, nb < 0), pd(n, nb < 0)
	}
	at := func(k, i, j int, v []float64) float64 {
		if blocks[k] < 0 {
			if i != j {
				return 0
			}
			return v[i]
		}
		return v[i*blocks[k]+j]
	}
	y0 := make([]float64, m)
	for i := range y0 {
		y0[i] = rng.NormFloat64()
	}
	cm := map[[3]int]float64{}
	for i := 0; i < m; i++ {
		var a sdp.Matrix
		var b float64
		for k, nb := range blocks {
			n := nb
			if n < 0 {
				n = -n
			}
			for r := 0; r < n; r++ {
				for c := r; c < n; c++ {
					if nb < 0 && r != c {
						continue
					}
					if rng.Float64() > density && !(r == c && r == i%n) {
						continue
					}
					v := math.Round(rng.NormFloat64()*1000) / 1000
					if v == 0 {
						continue
					}
					a = append(a, sdp.Entry{Block: k, I: r, J: c, V: v})
					w := v * at(k, r, c, x0[k])
					if r != c {
						w *= 2
					}
					b += w
					cm[[3]int{k, r, c}] += y0[i] * v
				}
			}
		}
		p.A = append(p.A, a)
		p.B = append(p.B, b)
	}
	for k, nb := range blocks {
		n := nb
		if n < 0 {
			n = -n
		}
		for r := 0; r < n; r++ {
			for c := r; c < n; c++ {
				if nb < 0 && r != c {
					continue
				}
				v := cm[[3]int{k, r, c}] - at(k, r, c, z0[k])
				if v != 0 {
					p.C = append(p.C, sdp.Entry{Block: k, I: r, J: c, V: v})
				}
			}
		}
	}
	return p
}

// gramMargin returns the margin SDP of the Gram family of p.
func gramMargin(t testing.TB, vars []string, text string) *sdp.Problem {
	t.Helper()
	r := poly.NewRing(vars, nil)
	g, _, err := sos.NewGram(poly.MustParse(r, text).Num, 0)
	if err != nil {
		t.Fatal(err)
	}
	return sdp.MarginProblem(g.Problem(), 10)
}

// randomSOSText returns Σ_{k<terms} q_k² for random quadratic forms q_k in
// vars with small integer coefficients, as text.
func randomSOSText(rng *rand.Rand, vars []string, terms int) string {
	var parts []string
	for k := 0; k < terms; k++ {
		var q []string
		for i := range vars {
			for j := i; j < len(vars); j++ {
				c := rng.IntN(7) - 3
				if c != 0 {
					q = append(q, fmt.Sprintf("(%d)*%s*%s", c, vars[i], vars[j]))
				}
			}
		}
		if len(q) == 0 {
			q = []string{vars[0] + "^2"}
		}
		parts = append(parts, "("+strings.Join(q, "+")+")^2")
	}
	return strings.Join(parts, "+")
}

type suiteCase struct {
	name string
	p    *sdp.Problem
}

func comparisonSuite(t testing.TB) []suiteCase {
	rng := rand.New(rand.NewPCG(20240607, 1))
	var cs []suiteCase
	shapes := []struct {
		blocks  []int
		m       int
		density float64
	}{
		{[]int{4}, 3, 1}, {[]int{5}, 6, 0.5}, {[]int{6}, 10, 0.3}, {[]int{8}, 12, 0.2},
		{[]int{3, 3}, 5, 0.6}, {[]int{5, -3}, 6, 0.5}, {[]int{10}, 20, 0.15}, {[]int{4, 4, -2}, 8, 0.4},
		{[]int{12}, 15, 0.1}, {[]int{6, -6}, 9, 0.3},
	}
	for k, s := range shapes {
		cs = append(cs, suiteCase{fmt.Sprintf("random-%d", k), randomFeasible(rng, s.blocks, s.m, s.density)})
	}
	lps := []struct{ n, m int }{{4, 2}, {6, 3}, {10, 5}, {15, 6}, {20, 10}}
	for k, s := range lps {
		cs = append(cs, suiteCase{fmt.Sprintf("lp-%d", k), randomFeasible(rng, []int{-s.n}, s.m, 0.5)})
	}
	sosCases := []struct {
		vars []string
		text string
	}{
		{[]string{"x", "y"}, "x^4 - 2*x^2*y^2 + 2*y^4"},
		{[]string{"x", "y", "z"}, "x^4 + y^4 + z^4 - x^2*y*z"},
		{[]string{"x", "y"}, "x^4*y^2 + x^2*y^4 - 3*x^2*y^2 + 1 + x^6 + y^6"},
		{[]string{"a", "b", "c"}, randomSOSText(rng, []string{"a", "b", "c"}, 4)},
		{[]string{"a", "b", "c", "d"}, randomSOSText(rng, []string{"a", "b", "c", "d"}, 5)},
		{[]string{"a", "b", "c", "d", "e"}, randomSOSText(rng, []string{"a", "b", "c", "d", "e"}, 6)},
	}
	for k, s := range sosCases {
		cs = append(cs, suiteCase{fmt.Sprintf("sos-%d", k), gramMargin(t, s.vars, s.text)})
	}
	return cs
}

var objRe = regexp.MustCompile(`(?m)^Dual objective value:\s*(\S+)`)

// csdpObjective runs csdp on an SDPA file and returns its optimal value.
func csdpObjective(t testing.TB, bin, file string) float64 {
	t.Helper()
	out, err := exec.Command(bin, file, file+".sol").CombinedOutput()
	var ee *exec.ExitError
	if err != nil && !errors.As(err, &ee) {
		t.Fatalf("csdp: %v", err)
	}
	mm := objRe.FindSubmatch(out)
	if mm == nil {
		t.Fatalf("csdp printed no objective on %s:\n%s", file, out)
	}
	v, err := strconv.ParseFloat(string(mm[1]), 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// TestAgainstCSDP: reference solver: coinor-csdp from Debian (Borchers'
// CSDP), run on the same SDPA sparse files. Optimal values agree to 1e-6
// relative.
func TestAgainstCSDP(t *testing.T) {
	bin, err := exec.LookPath("csdp")
	if err != nil {
		t.Skip("csdp not found (install Debian's coinor-csdp): the reference comparison is skipped")
	}
	dir := t.TempDir()
	cases := comparisonSuite(t)
	if len(cases) < 20 {
		t.Fatalf("only %d comparison problems", len(cases))
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := sdp.WriteSDPA(&buf, c.p); err != nil {
				t.Fatal(err)
			}
			file := filepath.Join(dir, c.name+".dat-s")
			if err := os.WriteFile(file, buf.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			// Solve what was written, read back: the file is the common input.
			p, err := sdp.ReadSDPA(bytes.NewReader(buf.Bytes()), file)
			if err != nil {
				t.Fatal(err)
			}
			r, err := sdp.Solve(context.Background(), p, nil)
			if err != nil {
				t.Fatal(err)
			}
			if r.Status != sdp.Optimal {
				t.Fatalf("status %v (pinf %.3g dinf %.3g gap %.3g)", r.Status, r.PrimalInf, r.DualInf, r.Gap)
			}
			ref := csdpObjective(t, bin, file)
			if d := math.Abs(r.DualObj-ref) / math.Max(1, math.Abs(ref)); d > 1e-6 {
				t.Errorf("objective %.12g, csdp %.12g (relative difference %.3g)", r.DualObj, ref, d)
			}
		})
	}
}

// TestMaxEigenvalue: λmax(C) = max{⟨C, X⟩ : tr X = 1, X ⪰ 0} (common
// practice), compared with gonum's EigenSym.
func TestMaxEigenvalue(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 7))
	for _, n := range []int{1, 2, 5, 9, 16} {
		s := mat.NewSymDense(n, nil)
		p := &sdp.Problem{Blocks: []int{n}, A: []sdp.Matrix{nil}, B: []float64{1}}
		for i := 0; i < n; i++ {
			p.A[0] = append(p.A[0], sdp.Entry{Block: 0, I: i, J: i, V: 1})
			for j := i; j < n; j++ {
				v := rng.NormFloat64()
				s.SetSym(i, j, v)
				p.C = append(p.C, sdp.Entry{Block: 0, I: i, J: j, V: v})
			}
		}
		var es mat.EigenSym
		if !es.Factorize(s, false) {
			t.Fatal("eigen")
		}
		want := es.Values(nil)[n-1]
		r, err := sdp.Solve(context.Background(), p, nil)
		if err != nil || r.Status != sdp.Optimal {
			t.Fatalf("n=%d: %v %v", n, r.Status, err)
		}
		if math.Abs(r.PrimalObj-want) > 1e-7*(1+math.Abs(want)) {
			t.Errorf("n=%d: λmax %.12g, EigenSym %.12g", n, r.PrimalObj, want)
		}
	}
}

// TestLP: max x₁ + x₂ s.t. x₁ + 2x₂ + s₁ = 4, 3x₁ + x₂ + s₂ = 6 (x, s ≥ 0)
// has the vertex optimum x = (8/5, 6/5), value 14/5 (hand computation).
func TestLP(t *testing.T) {
	p := &sdp.Problem{
		Blocks: []int{-4},
		C:      sdp.Matrix{{Block: 0, I: 0, J: 0, V: 1}, {Block: 0, I: 1, J: 1, V: 1}},
		A: []sdp.Matrix{
			{{Block: 0, I: 0, J: 0, V: 1}, {Block: 0, I: 1, J: 1, V: 2}, {Block: 0, I: 2, J: 2, V: 1}},
			{{Block: 0, I: 0, J: 0, V: 3}, {Block: 0, I: 1, J: 1, V: 1}, {Block: 0, I: 3, J: 3, V: 1}},
		},
		B: []float64{4, 6},
	}
	r, err := sdp.Solve(context.Background(), p, nil)
	if err != nil || r.Status != sdp.Optimal {
		t.Fatalf("%v %v", r.Status, err)
	}
	if math.Abs(r.PrimalObj-2.8) > 1e-7 || math.Abs(r.X[0].Data[0]-1.6) > 1e-6 || math.Abs(r.X[0].Data[1]-1.2) > 1e-6 {
		t.Errorf("value %.10g at %v, want 2.8 at (1.6, 1.2)", r.PrimalObj, r.X[0].Data[:2])
	}
}

// TestInfeasible: statuses on problems infeasible by hand computation.
func TestInfeasible(t *testing.T) {
	cases := []struct {
		name string
		p    *sdp.Problem
		want sdp.Status
	}{
		// X ⪰ 0 with X₁₁ = −1: no X (a diagonal entry of a PSD matrix is ≥ 0).
		{"primal", &sdp.Problem{Blocks: []int{2}, A: []sdp.Matrix{{{Block: 0, I: 0, J: 0, V: 1}}}, B: []float64{-1}}, sdp.PrimalInfeasible},
		// max X₁₁ s.t. X₂₂ = 1: unbounded, so the dual is infeasible.
		{"dual", &sdp.Problem{Blocks: []int{2}, C: sdp.Matrix{{Block: 0, I: 0, J: 0, V: 1}}, A: []sdp.Matrix{{{Block: 0, I: 1, J: 1, V: 1}}}, B: []float64{1}}, sdp.DualInfeasible},
	}
	for _, c := range cases {
		r, err := sdp.Solve(context.Background(), c.p, nil)
		if err != nil {
			t.Fatal(err)
		}
		if r.Status != c.want {
			t.Errorf("%s: status %v, want %v", c.name, r.Status, c.want)
		}
	}
}

// TestMargin: the Gram family of x⁴ + y⁴ in the basis (x², xy, y²) is
// [[1,0,a],[0,−2a,0],[a,0,1]]; its largest smallest eigenvalue is 2/3 at
// a = −1/3 (eigenvalues 1 ± a and −2a; hand computation).
func TestMargin(t *testing.T) {
	r := poly.NewRing([]string{"x", "y"}, nil)
	g, _, err := sos.NewGram(poly.MustParse(r, "x^4 + y^4").Num, 0)
	if err != nil {
		t.Fatal(err)
	}
	mr, err := sdp.SolveMargin(context.Background(), g.Problem(), 10, nil)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(mr.T-2.0/3) > 1e-7 {
		t.Errorf("margin %.10g, want 2/3", mr.T)
	}
}

func TestCancel(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	p := randomFeasible(rand.New(rand.NewPCG(1, 1)), []int{3}, 2, 1)
	if _, err := sdp.Solve(ctx, p, nil); !errors.Is(err, context.Canceled) {
		t.Errorf("error %v, want context.Canceled", err)
	}
}

func TestSDPARoundTrip(t *testing.T) {
	p := randomFeasible(rand.New(rand.NewPCG(3, 4)), []int{3, -2}, 4, 0.7)
	var buf bytes.Buffer
	if err := sdp.WriteSDPA(&buf, p); err != nil {
		t.Fatal(err)
	}
	q, err := sdp.ReadSDPA(&buf, "rt")
	if err != nil {
		t.Fatal(err)
	}
	var b2 bytes.Buffer
	if err := sdp.WriteSDPA(&b2, q); err != nil {
		t.Fatal(err)
	}
	var b1 bytes.Buffer
	sdp.WriteSDPA(&b1, p)
	if b1.String() != b2.String() {
		t.Error("write(read(write(p))) differs from write(p)")
	}
}

// TestSDPAErrors: bad files are refused with name:line:col, and absurd
// sizes before any allocation.
func TestSDPAErrors(t *testing.T) {
	cases := []struct{ name, text, want string }{
		{"empty", "", "f:0:0: unexpected end of file"},
		{"huge m", "999999999\n1\n2\n", "f:1:1: the number of constraints 999999999 out of range"},
		{"huge block", "1\n1\n100000000\n1\n", "f:3:1: a block order 100000000 out of range"},
		{"zero block", "1\n1\n0\n1\n", "f:3:1: block order 0"},
		{"bad number", "1\n1\n2\nx\n", `f:4:1: expected a finite number for a right-hand side, found "x"`},
		{"short entry", "1\n1\n2\n1\n1 1 1 1\n", "f:5:1: an entry line has 5 fields"},
		{"index", "1\n1\n2\n1\n1 1 3 1 1.0\n", "f:5:5: index 3 out of range [1, 2] of block 1"},
		{"matrix", "1\n1\n2\n1\n2 1 1 1 1.0\n", "f:5:1: matrix number 2 out of range [0, 1]"},
		{"diag", "1\n1\n-2\n1\n1 1 1 2 1.0\n", "f:5:5: off-diagonal entry in diagonal block 1"},
		{"nan", "1\n1\n2\n1\n1 1 1 1 nan\n", "f:5:9: expected a finite number for an entry"},
		{"truncated", "2\n1\n2\n1\n", "f:4:2: unexpected end of file, expected a right-hand side"},
	}
	for _, c := range cases {
		_, err := sdp.ReadSDPA(strings.NewReader(c.text), "f")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want %q", c.name, err, c.want)
		}
	}
	// Comments, separators and trailing text on the size lines are accepted.
	ok := "\"a comment\n* another\n1 =mDIM\n1 =nBLOCK\n{2}\n(1.5)\n0,1,1,1,1\n1 1 1 2 0.5\n"
	p, err := sdp.ReadSDPA(strings.NewReader(ok), "ok")
	if err != nil || len(p.A) != 1 || p.B[0] != 1.5 || len(p.C) != 1 || p.A[0][0].J != 1 {
		t.Errorf("good file: %v %+v", err, p)
	}
	_ = big.NewInt
}
