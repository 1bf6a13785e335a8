package lyapunov

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func eye(n int) *mat.Dense {
	m := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		m.Set(i, i, 1)
	}
	return m
}

// relDiff returns ‖X − Y‖_F / ‖Y‖_F.
func relDiff(x, y mat.Matrix) float64 {
	var d mat.Dense
	d.Sub(x, y)
	return mat.Norm(&d, 2) / mat.Norm(y, 2)
}

// TestKnownSolutions checks small equations whose solution is known in closed
// form; the source of each is named beside the case.
func TestKnownSolutions(t *testing.T) {
	cases := []struct {
		name     string
		source   string
		discrete bool
		a, q, p  []float64
	}{
		{
			name:   "Ogata 2x2",
			source: "K. Ogata, Modern Control Engineering, Lyapunov stability analysis worked example: A = [0 1; −1 −1], Q = I",
			a:      []float64{0, 1, -1, -1}, q: []float64{1, 0, 0, 1},
			p: []float64{1.5, 0.5, 0.5, 1},
		},
		{
			name:   "scalar continuous",
			source: "common practice, no source: −2p − 2p = −1",
			a:      []float64{-2}, q: []float64{1}, p: []float64{0.25},
		},
		{
			name:     "scalar discrete",
			source:   "common practice, no source: p/4 − p = −1",
			discrete: true,
			a:        []float64{0.5}, q: []float64{1}, p: []float64{4.0 / 3},
		},
		{
			name:   "diagonal continuous",
			source: "direct calculation: P = diag(1/(−2aᵢ)) decouples",
			a:      []float64{-1, 0, 0, 0, -2, 0, 0, 0, -4}, q: []float64{1, 0, 0, 0, 1, 0, 0, 0, 1},
			p: []float64{0.5, 0, 0, 0, 0.25, 0, 0, 0, 0.125},
		},
		{
			name:     "diagonal discrete",
			source:   "direct calculation: P = diag(1/(1−aᵢ²)) decouples",
			discrete: true,
			a:        []float64{0.5, 0, 0, -0.5}, q: []float64{3, 0, 0, 3},
			p: []float64{4, 0, 0, 4},
		},
		{
			// A = σI + ωJ with J skew: Aᵀ + A = 2σI, so P = I/(−2σ).
			// One 2×2 Schur block: the 2×2/2×2 Dlasy2 path.
			name:   "complex pair continuous",
			source: "direct calculation: AᵀP + PA = 2σP for P = pI",
			a:      []float64{-0.5, 2, -2, -0.5}, q: []float64{1, 0, 0, 1},
			p: []float64{1, 0, 0, 1},
		},
		{
			// A = r·R(θ), R a rotation: AᵀPA = r²P for P = pI, so p = 1/(1−r²).
			name:     "complex pair discrete",
			source:   "direct calculation: AᵀA = r²I",
			discrete: true,
			a:        []float64{0.3, 0.4, -0.4, 0.3}, q: []float64{3, 0, 0, 3}, // r = 1/2
			p: []float64{4, 0, 0, 4},
		},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			n := int(math.Sqrt(float64(len(c.a))))
			a := mat.NewDense(n, n, c.a)
			q := mat.NewDense(n, n, c.q)
			want := mat.NewDense(n, n, c.p)
			var got *mat.SymDense
			var err error
			var res float64
			if c.discrete {
				got, err = Discrete(a, q)
				if err == nil {
					res = DiscreteResidual(a, got, q)
				}
			} else {
				got, err = Continuous(a, q)
				if err == nil {
					res = ContinuousResidual(a, got, q)
				}
			}
			if err != nil {
				t.Fatalf("%s: unexpected error: %v", c.source, err)
			}
			var d mat.Dense
			d.Sub(got, want)
			if e := mat.Norm(&d, math.Inf(1)); e > 1e-12 {
				t.Errorf("%s: P = %v, want %v (max error %.3g)", c.source, mat.Formatted(got), mat.Formatted(want), e)
			}
			if res > 1e-15 {
				t.Errorf("%s: relative residual %.3g", c.source, res)
			}
		})
	}
}

// randn returns an n×n matrix with independent N(0, 1/n) entries.
func randn(n int, rng *rand.Rand) *mat.Dense {
	m := mat.NewDense(n, n, nil)
	s := 1 / math.Sqrt(float64(n))
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			m.Set(i, j, s*rng.NormFloat64())
		}
	}
	return m
}

// randStable returns M − (α(M)+1)·I for a random M, so that α(A) = −1.
func randStable(n int, rng *rand.Rand) *mat.Dense {
	a := randn(n, rng)
	shift := SpectralAbscissa(a) + 1
	for i := 0; i < n; i++ {
		a.Set(i, i, a.At(i, i)-shift)
	}
	return a
}

// randSchurStable returns 0.9·M/ρ(M) for a random M, so that ρ(A) = 0.9.
func randSchurStable(n int, rng *rand.Rand) *mat.Dense {
	a := randn(n, rng)
	a.Scale(0.9/SpectralRadius(a), a)
	return a
}

// randPairs returns S·B·S⁻¹ where B is block upper triangular with 2×2
// diagonal blocks of complex-conjugate eigenvalue pairs (plus one real
// eigenvalue if n is odd) and a random strictly block-upper part, and
// S = I + 0.3·N(0, 1/n) is well conditioned. Continuous: eigenvalues
// σ ± iω, σ ∈ [−3, −0.5], ω ∈ [0.5, 5]. Discrete: r·e^{±iθ}, r ∈ [0.3, 0.9].
func randPairs(n int, rng *rand.Rand, discrete bool) *mat.Dense {
	b := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			b.Set(i, j, 0.5*rng.NormFloat64()/math.Sqrt(float64(n)))
		}
	}
	for i := 0; i < n; i += 2 {
		if i+1 == n {
			if discrete {
				b.Set(i, i, 1.8*rng.Float64()-0.9)
			} else {
				b.Set(i, i, -0.5-2.5*rng.Float64())
			}
			break
		}
		var re, im float64
		if discrete {
			r, th := 0.3+0.6*rng.Float64(), 0.2+2.7*rng.Float64()
			re, im = r*math.Cos(th), r*math.Sin(th)
		} else {
			re, im = -0.5-2.5*rng.Float64(), 0.5+4.5*rng.Float64()
		}
		b.Set(i, i, re)
		b.Set(i+1, i+1, re)
		b.Set(i, i+1, im)
		b.Set(i+1, i, -im)
	}
	s := randn(n, rng)
	s.Scale(0.3, s)
	s.Add(s, eye(n))
	var sinv mat.Dense
	if err := sinv.Inverse(s); err != nil {
		panic(err)
	}
	var a mat.Dense
	a.Product(s, b, &sinv)
	return &a
}

// randSPD returns a random symmetric positive definite Q = MMᵀ + I.
func randSPD(n int, rng *rand.Rand) *mat.Dense {
	m := randn(n, rng)
	var q mat.Dense
	q.Mul(m, m.T())
	q.Add(&q, eye(n))
	return &q
}

// kroneckerSolve solves the equation through its n²×n² Kronecker form with
// mat.Dense.Solve (LU): (I⊗Aᵀ + Aᵀ⊗I)·vec P = −vec Q, or
// (Aᵀ⊗Aᵀ − I)·vec P = −vec Q, vec stacking columns.
func kroneckerSolve(a, q *mat.Dense, discrete bool) *mat.Dense {
	n, _ := a.Dims()
	var k mat.Dense
	if discrete {
		k.Kronecker(a.T(), a.T())
		k.Sub(&k, eye(n*n))
	} else {
		var k2 mat.Dense
		k.Kronecker(eye(n), a.T())
		k2.Kronecker(a.T(), eye(n))
		k.Add(&k, &k2)
	}
	rhs := mat.NewVecDense(n*n, nil)
	for j := 0; j < n; j++ {
		for i := 0; i < n; i++ {
			rhs.SetVec(j*n+i, -q.At(i, j))
		}
	}
	var x mat.VecDense
	if err := x.SolveVec(&k, rhs); err != nil {
		panic(err)
	}
	p := mat.NewDense(n, n, nil)
	for j := 0; j < n; j++ {
		for i := 0; i < n; i++ {
			p.Set(i, j, x.AtVec(j*n+i))
		}
	}
	return p
}

func solve(a, q *mat.Dense, discrete bool) (*mat.SymDense, float64, error) {
	if discrete {
		p, err := Discrete(a, q)
		if err != nil {
			return nil, 0, err
		}
		return p, DiscreteResidual(a, p, q), nil
	}
	p, err := Continuous(a, q)
	if err != nil {
		return nil, 0, err
	}
	return p, ContinuousResidual(a, p, q), nil
}

// TestAgainstKronecker compares with gonum as a reference: a dense LU solve of
// the Kronecker form, for random stable matrices of size 1…30.
func TestAgainstKronecker(t *testing.T) {
	sizes := []int{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 15, 20, 25, 30}
	kinds := []struct {
		name     string
		discrete bool
		gen      func(n int, rng *rand.Rand) *mat.Dense
	}{
		{"continuous/shifted random", false, randStable},
		{"continuous/complex pairs", false, func(n int, rng *rand.Rand) *mat.Dense { return randPairs(n, rng, false) }},
		{"discrete/scaled random", true, randSchurStable},
		{"discrete/complex pairs", true, func(n int, rng *rand.Rand) *mat.Dense { return randPairs(n, rng, true) }},
	}
	for ki, kind := range kinds {
		for _, n := range sizes {
			if testing.Short() && n > 12 && n != 30 {
				continue
			}
			t.Run(fmt.Sprintf("%s/n=%d", kind.name, n), func(t *testing.T) {
				rng := rand.New(rand.NewPCG(uint64(n), uint64(ki)))
				a := kind.gen(n, rng)
				q := randSPD(n, rng)
				p, res, err := solve(a, q, kind.discrete)
				if err != nil {
					t.Fatal(err)
				}
				want := kroneckerSolve(a, q, kind.discrete)
				d := relDiff(p, want)
				t.Logf("relative difference %.2g, relative residual %.2g", d, res)
				if d > 1e-9 {
					t.Errorf("relative difference from Kronecker solve %.3g > 1e-9", d)
				}
				if res > 1e-12 {
					t.Errorf("relative residual %.3g", res)
				}
			})
		}
	}
}

// TestLargeResidual checks the relative residual for n = 50, 100, 200.
func TestLargeResidual(t *testing.T) {
	cases := []struct {
		n        int
		discrete bool
		pairs    bool
	}{
		{50, false, false}, {50, false, true}, {100, false, false}, {100, false, true}, {200, false, false},
		{50, true, false}, {50, true, true}, {100, true, false}, {100, true, true}, {200, true, false},
	}
	for i, c := range cases {
		name := fmt.Sprintf("continuous/n=%d", c.n)
		if c.discrete {
			name = fmt.Sprintf("discrete/n=%d", c.n)
		}
		if c.pairs {
			name += "/complex pairs"
		}
		t.Run(name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(uint64(c.n), uint64(100+i)))
			var a *mat.Dense
			switch {
			case c.pairs:
				a = randPairs(c.n, rng, c.discrete)
			case c.discrete:
				a = randSchurStable(c.n, rng)
			default:
				a = randStable(c.n, rng)
			}
			q := randSPD(c.n, rng)
			_, res, err := solve(a, q, c.discrete)
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("relative residual %.2g", res)
			if res > 1e-10 {
				t.Errorf("relative residual %.3g > 1e-10", res)
			}
		})
	}
}

// TestSingular checks that singular equations return an error wrapping
// ErrSingular instead of a meaningless P.
func TestSingular(t *testing.T) {
	s := mat.NewDense(2, 2, []float64{2, 1, 1, 1})
	var sinv mat.Dense
	if err := sinv.Inverse(s); err != nil {
		t.Fatal(err)
	}
	var similar mat.Dense // S·diag(1, −1)·S⁻¹: eigenvalues 1 and −1, not diagonal
	similar.Product(s, mat.NewDiagDense(2, []float64{1, -1}), &sinv)
	cases := []struct {
		name     string
		discrete bool
		a        *mat.Dense
		want     string
	}{
		{"continuous eigenvalues 1 and −1", false, mat.NewDense(2, 2, []float64{1, 0, 0, -1}), "λi+λj"},
		{"continuous eigenvalues 1 and −1, non-diagonal", false, &similar, "λi+λj"},
		{"continuous imaginary pair ±i", false, mat.NewDense(2, 2, []float64{0, 1, -1, 0}), "λi+λj"},
		{"continuous singular A", false, mat.NewDense(2, 2, []float64{-1, 0, 0, 0}), "λi+λj"},
		{"continuous zero A", false, mat.NewDense(2, 2, nil), "λi+λj"},
		{"discrete eigenvalues 1 and −1", true, mat.NewDense(2, 2, []float64{1, 0, 0, -1}), "λiλj−1"},
		{"discrete eigenvalues 2 and 1/2", true, mat.NewDense(2, 2, []float64{2, 5, 0, 0.5}), "λiλj−1"},
		{"discrete rotation", true, mat.NewDense(2, 2, []float64{0.6, 0.8, -0.8, 0.6}), "λiλj−1"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, _, err := solve(c.a, eye(2), c.discrete)
			if err == nil {
				t.Fatalf("no error; P = %v", mat.Formatted(p))
			}
			if !errors.Is(err, ErrSingular) {
				t.Errorf("error %q does not wrap ErrSingular", err)
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %q does not mention %s", err, c.want)
			}
		})
	}
}

// TestSingularTol checks both sides of the SingularTol threshold: an
// eigenvalue pair whose sum (product − 1) is far below SingularTol times the
// operator-norm bound is rejected; one well above it is solved accurately.
func TestSingularTol(t *testing.T) {
	cases := []struct {
		name     string
		discrete bool
		a        []float64
		wantErr  bool
	}{
		{"continuous 1, −1+1e-13", false, []float64{1, 1, 0, -1 + 1e-13}, true},
		{"continuous 1, −1+1e-6", false, []float64{1, 1, 0, -1 + 1e-6}, false},
		{"discrete 2, 1/2+1e-14", true, []float64{2, 1, 0, 0.5 + 1e-14}, true},
		{"discrete 2, 1/2+1e-6", true, []float64{2, 1, 0, 0.5 + 1e-6}, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			a := mat.NewDense(2, 2, c.a)
			_, res, err := solve(a, eye(2), c.discrete)
			if c.wantErr {
				if !errors.Is(err, ErrSingular) {
					t.Errorf("err = %v, want ErrSingular", err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if res > 1e-14 {
				t.Errorf("relative residual %.3g", res)
			}
		})
	}
}

func TestNonFinite(t *testing.T) {
	a := mat.NewDense(2, 2, []float64{-1, math.NaN(), 0, -1})
	if _, err := Continuous(a, eye(2)); err == nil {
		t.Error("Continuous: no error for NaN in A")
	}
	q := mat.NewDense(2, 2, []float64{1, 0, 0, math.Inf(1)})
	if _, err := Discrete(mat.NewDense(2, 2, []float64{0.5, 0, 0, 0.5}), q); err == nil {
		t.Error("Discrete: no error for Inf in Q")
	}
}

func TestDimensionPanics(t *testing.T) {
	sq := mat.NewDense(2, 2, []float64{-1, 0, 0, -1})
	rect := mat.NewDense(2, 3, nil)
	cases := []struct {
		name string
		f    func()
	}{
		{"Continuous non-square A", func() { Continuous(rect, eye(2)) }},
		{"Continuous Q mismatch", func() { Continuous(sq, eye(3)) }},
		{"Discrete non-square A", func() { Discrete(rect, eye(2)) }},
		{"Discrete Q mismatch", func() { Discrete(sq, eye(3)) }},
		{"Continuous empty", func() { Continuous(&mat.Dense{}, &mat.Dense{}) }},
		{"ContinuousResidual P mismatch", func() { ContinuousResidual(sq, mat.NewSymDense(3, nil), eye(2)) }},
		{"DiscreteResidual Q mismatch", func() { DiscreteResidual(sq, mat.NewSymDense(2, nil), eye(3)) }},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			defer func() {
				if recover() == nil {
					t.Error("no panic")
				}
			}()
			c.f()
		})
	}
}

// TestNonSymmetricQ checks that only the symmetric part of Q is used.
func TestNonSymmetricQ(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 7))
	for _, discrete := range []bool{false, true} {
		var a *mat.Dense
		if discrete {
			a = randSchurStable(6, rng)
		} else {
			a = randStable(6, rng)
		}
		q := randn(6, rng)
		var qs mat.Dense
		qs.Add(q, q.T())
		qs.Scale(0.5, &qs)
		p1, _, err1 := solve(a, q, discrete)
		p2, _, err2 := solve(a, &qs, discrete)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		if d := relDiff(p1, p2); d > 1e-14 {
			t.Errorf("discrete=%v: P(Q) and P((Q+Qᵀ)/2) differ by %.3g", discrete, d)
		}
	}
}

// TestStridedViews checks that A and Q given as views into larger matrices
// (stride ≠ columns) are read correctly.
func TestStridedViews(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, discrete := range []bool{false, true} {
		var a *mat.Dense
		if discrete {
			a = randSchurStable(5, rng)
		} else {
			a = randStable(5, rng)
		}
		q := randSPD(5, rng)
		bigA, bigQ := mat.NewDense(7, 8, nil), mat.NewDense(7, 8, nil)
		for i := range 7 {
			for j := range 8 {
				bigA.Set(i, j, 99)
				bigQ.Set(i, j, -99)
			}
		}
		va := bigA.Slice(1, 6, 2, 7).(*mat.Dense)
		vq := bigQ.Slice(2, 7, 1, 6).(*mat.Dense)
		va.Copy(a)
		vq.Copy(q)
		p1, _, err1 := solve(a, q, discrete)
		p2, _, err2 := solve(va, vq, discrete)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		if d := relDiff(p1, p2); d != 0 {
			t.Errorf("discrete=%v: view and copy give different P (%.3g)", discrete, d)
		}
	}
}

func TestResidual(t *testing.T) {
	a := mat.NewDense(2, 2, []float64{0, 1, -1, -1})
	p := mat.NewSymDense(2, []float64{1.5, 0.5, 0.5, 1})
	q := eye(2)
	if r := ContinuousResidual(a, p, q); r != 0 {
		t.Errorf("Ogata exact P: residual %g, want 0", r)
	}
	// P + δI changes AᵀP + PA by 2δ·sym(A) = δ·[0 0; 0 −2]: residual 2δ over
	// ‖A‖_F‖P‖_F + ‖Q‖_F.
	const delta = 1e-3
	pd := mat.NewSymDense(2, []float64{1.5 + delta, 0.5, 0.5, 1 + delta})
	want := 2 * delta / (math.Sqrt(3)*mat.Norm(pd, 2) + math.Sqrt(2))
	if r := ContinuousResidual(a, pd, q); math.Abs(r-want) > 1e-15 {
		t.Errorf("perturbed P: residual %g, want %g", r, want)
	}
	ad := mat.NewDense(1, 1, []float64{0.5})
	if r := DiscreteResidual(ad, mat.NewSymDense(1, []float64{4.0 / 3}), eye(1)); r > 1e-16 {
		t.Errorf("discrete scalar: residual %g", r)
	}
	// |p/4 − p + 1| = 1/2 for p = 2, over ‖A‖²‖P‖ + ‖P‖ + ‖Q‖ = 1/2 + 2 + 1.
	if r := DiscreteResidual(ad, mat.NewSymDense(1, []float64{2}), eye(1)); math.Abs(r-0.5/3.5) > 1e-15 {
		t.Errorf("discrete scalar p=2: residual %g, want %g", r, 0.5/3.5)
	}
	z := mat.NewDense(2, 2, nil)
	if r := ContinuousResidual(z, mat.NewSymDense(2, nil), z); r != 0 {
		t.Errorf("all zero: residual %g, want 0", r)
	}
}

func TestSpectral(t *testing.T) {
	cases := []struct {
		name            string
		a               []float64
		abscissa, rho   float64
		hurwitz, schurS bool
	}{
		// Ogata's A: eigenvalues (−1 ± i√3)/2.
		{"Ogata", []float64{0, 1, -1, -1}, -0.5, 1, true, false},
		{"diag(−1, −3)", []float64{-1, 0, 0, -3}, -1, 3, true, false},
		{"diag(1, −1)", []float64{1, 0, 0, -1}, 1, 1, false, false},
		{"0.5·rotation", []float64{0.3, 0.4, -0.4, 0.3}, 0.3, 0.5, false, true},
		{"Jordan block at −0.5", []float64{-0.5, 1, 0, -0.5}, -0.5, 0.5, true, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			a := mat.NewDense(2, 2, c.a)
			if got := SpectralAbscissa(a); math.Abs(got-c.abscissa) > 1e-12 {
				t.Errorf("SpectralAbscissa = %g, want %g", got, c.abscissa)
			}
			if got := SpectralRadius(a); math.Abs(got-c.rho) > 1e-12 {
				t.Errorf("SpectralRadius = %g, want %g", got, c.rho)
			}
			if got := IsHurwitz(a); got != c.hurwitz {
				t.Errorf("IsHurwitz = %v, want %v", got, c.hurwitz)
			}
			if got := IsSchurStable(a); got != c.schurS {
				t.Errorf("IsSchurStable = %v, want %v", got, c.schurS)
			}
		})
	}
}

// TestSchurForm checks the internal decomposition A = Z T Zᵀ, ZᵀZ = I, and
// the block structure, on matrices with real and complex eigenvalues.
func TestSchurForm(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for _, n := range []int{1, 2, 3, 8, 17} {
		for _, a := range []*mat.Dense{randStable(n, rng), randPairs(n, rng, false)} {
			s, err := newRealSchur(a)
			if err != nil {
				t.Fatal(err)
			}
			T := mat.NewDense(n, n, s.t)
			Z := mat.NewDense(n, n, s.z)
			var zt mat.Dense
			zt.Product(Z, T, Z.T())
			if d := relDiff(&zt, a); d > 1e-13 {
				t.Errorf("n=%d: ‖ZTZᵀ − A‖/‖A‖ = %.3g", n, d)
			}
			var ztz mat.Dense
			ztz.Mul(Z.T(), Z)
			if d := relDiff(&ztz, eye(n)); d > 1e-13 {
				t.Errorf("n=%d: ZᵀZ ≠ I (%.3g)", n, d)
			}
			for k := 0; k+1 < len(s.starts); k++ {
				if sz := s.starts[k+1] - s.starts[k]; sz != 1 && sz != 2 {
					t.Fatalf("n=%d: block %d has size %d", n, k, sz)
				}
			}
			for i := 0; i < n; i++ {
				for j := 0; j < i; j++ {
					inBlock := false
					for k := 0; k+1 < len(s.starts); k++ {
						if s.starts[k] <= j && i < s.starts[k+1] {
							inBlock = true
						}
					}
					if !inBlock && T.At(i, j) != 0 {
						t.Errorf("n=%d: T[%d,%d] = %g below the block diagonal", n, i, j, T.At(i, j))
					}
				}
			}
		}
	}
}

func TestSolveSmallStein(t *testing.T) {
	// All four shapes against the Kronecker form built independently.
	rng := rand.New(rand.NewPCG(5, 6))
	for _, n1 := range []int{1, 2} {
		for _, n2 := range []int{1, 2} {
			tl := make([]float64, 2*3)
			tr := make([]float64, 2*3)
			for i := range tl {
				tl[i], tr[i] = rng.NormFloat64(), rng.NormFloat64()
			}
			b := []float64{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
			x := make([]float64, 4)
			if !solveSmallStein(n1, n2, tl, tr, 3, b, x) {
				t.Fatalf("%d×%d: reported singular", n1, n2)
			}
			TL := mat.NewDense(n1, n1, nil)
			TR := mat.NewDense(n2, n2, nil)
			X := mat.NewDense(n1, n2, nil)
			B := mat.NewDense(n1, n2, nil)
			for i := 0; i < n1; i++ {
				for j := 0; j < n1; j++ {
					TL.Set(i, j, tl[i*3+j])
				}
			}
			for i := 0; i < n2; i++ {
				for j := 0; j < n2; j++ {
					TR.Set(i, j, tr[i*3+j])
				}
			}
			for i := 0; i < n1; i++ {
				for j := 0; j < n2; j++ {
					X.Set(i, j, x[i*2+j])
					B.Set(i, j, b[i*2+j])
				}
			}
			var lhs mat.Dense
			lhs.Product(TL.T(), X, TR)
			lhs.Sub(&lhs, X)
			if d := relDiff(&lhs, B); d > 1e-13 {
				t.Errorf("%d×%d: TLᵀXTR − X differs from B by %.3g", n1, n2, d)
			}
		}
	}
	// Singular: TL = TR = 1.
	one := []float64{1}
	if solveSmallStein(1, 1, one, one, 1, []float64{1}, make([]float64, 4)) {
		t.Error("1·x·1 − x = 1 not reported singular")
	}
}

// TestSignIteration: for a Hurwitz A, Newton's iteration for the matrix
// sign function (Roberts 1980) gives P with a residual at rounding level;
// for an A with an eigenvalue in the right half-plane it declines, and
// Continuous still solves the equation by the Schur method (Bartels &
// Stewart 1972), checked by its residual.
func TestSignIteration(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 8))
	for _, n := range []int{1, 2, 7, 30} {
		a, q := randStable(n, rng), randSPD(n, rng)
		p, ok := continuousSign(a, q)
		if !ok {
			t.Fatalf("n=%d: the sign iteration declines a Hurwitz A", n)
		}
		if r := ContinuousResidual(a, p, q); r > 1e-12 {
			t.Errorf("n=%d: residual %.3g", n, r)
		}
		shifted := mat.DenseCopyOf(a)
		shifted.Set(0, 0, shifted.At(0, 0)+10) // an eigenvalue moves right
		if IsHurwitz(shifted) {
			continue
		}
		if _, ok := continuousSign(shifted, q); ok {
			t.Errorf("n=%d: the sign iteration accepts a non-Hurwitz A", n)
		}
		p, err := Continuous(shifted, q)
		if err != nil {
			continue // singular or ill-conditioned: the Schur method says so
		}
		if r := ContinuousResidual(shifted, p, q); r > 1e-9 {
			t.Errorf("n=%d: non-Hurwitz A: residual %.3g", n, r)
		}
	}
}
