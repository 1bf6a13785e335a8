package poly

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func intMatrix(rows ...[]int64) [][]*big.Int {
	out := make([][]*big.Int, len(rows))
	for i, r := range rows {
		for _, v := range r {
			out[i] = append(out[i], big.NewInt(v))
		}
	}
	return out
}

func toDense(a [][]*big.Int) *mat.Dense {
	d := mat.NewDense(len(a), len(a[0]), nil)
	for i := range a {
		for j, v := range a[i] {
			f, _ := new(big.Float).SetInt(v).Float64()
			d.Set(i, j, f)
		}
	}
	return d
}

// TestFirstNonPositiveMinorCases: leading principal minors by hand.
func TestFirstNonPositiveMinorCases(t *testing.T) {
	cases := []struct {
		b           [][]*big.Int
		k           int
		minor, prev int64
	}{
		{intMatrix([]int64{2, 1}, []int64{1, 2}), -1, 0, 0},                                                       // hand computation: minors 2, 3
		{intMatrix([]int64{1, 2}, []int64{2, 1}), 1, -3, 1},                                                       // hand computation: 1 − 4
		{intMatrix([]int64{0, 1}, []int64{1, 0}), 0, 0, 1},                                                        // hand computation: a zero first minor
		{intMatrix([]int64{4, 2, 2}, []int64{2, 5, 3}, []int64{2, 3, 6}), -1, 0, 0},                               // hand computation: minors 4, 16, 64
		{intMatrix([]int64{4, 2, 2}, []int64{2, 5, 3}, []int64{2, 3, 1}), 2, -16, 16},                             // hand computation: det = 4·(−4) − 2·(−4) + 2·(−4) = −16
		{intMatrix([]int64{1, 1, 1}, []int64{1, 1, 1}, []int64{1, 1, 2}), 1, 0, 1},                                // hand computation: rank-1 leading block
		{intMatrix([]int64{2, -1, 0}, []int64{-1, 2, -1}, []int64{0, -1, 2}), -1, 0, 0},                           // the second-difference matrix: minors 2, 3, 4 (common practice)
		{intMatrix([]int64{1, 5, 0}, []int64{0, 1, 0}, []int64{7, 0, -1}), 2, -1, 1},                              // not symmetric, hand computation: minors 1, 1, −1
		{intMatrix([]int64{3, 0, 0, 0}, []int64{0, 3, 0, 0}, []int64{0, 0, 3, 0}, []int64{0, 0, 0, 3}), -1, 0, 0}, // 3·I
	}
	for i, c := range cases {
		k, minor, prev := FirstNonPositiveMinor(c.b)
		if k != c.k || (k >= 0 && (minor.Int64() != c.minor || prev.Int64() != c.prev)) {
			t.Errorf("case %d: %d (%v over %v), want %d (%d over %d)", i, k, minor, prev, c.k, c.minor, c.prev)
		}
	}
}

// TestFirstNonPositiveMinorAgainstGonum: on random symmetric integer
// matrices, definite ones (GᵀG + I) and shifted ones, the fraction-free
// elimination agrees with gonum's Cholesky factorization (which succeeds
// exactly for positive definite matrices, up to rounding: the shifts keep the
// smallest eigenvalue at least 1/2 away from 0), and each leading minor it
// returns equals gonum's determinant of the leading block.
func TestFirstNonPositiveMinorAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	definite, indefinite := 0, 0
	for trial := range 80 {
		n := 1 + trial%12
		g := make([][]*big.Int, n)
		for i := range g {
			for range n {
				g[i] = append(g[i], big.NewInt(int64(rng.IntN(21)-10)))
			}
		}
		b := IntProduct(IntTranspose(g), g)
		var sym mat.SymDense
		sym.SymOuterK(1, toDense(g).T())
		var eig mat.EigenSym
		if !eig.Factorize(&sym, false) {
			t.Fatal("eigenvalues")
		}
		ev := eig.Values(nil)
		// Shift by a point halfway between two eigenvalues (or below the
		// smallest) so that the result is well away from singular.
		j := rng.IntN(n)
		lo := ev[j] - 2
		if j > 0 {
			lo = ev[j-1]
		}
		s := int64(math.Floor((lo + ev[j]) / 2))
		if math.Abs(float64(s)-ev[j]) < 0.5 || (j > 0 && math.Abs(float64(s)-ev[j-1]) < 0.5) {
			continue
		}
		for i := range n {
			b[i][i].Sub(b[i][i], big.NewInt(s))
		}
		var c mat.Cholesky
		want := c.Factorize(mat.NewSymDense(n, toDense(b).RawMatrix().Data))
		k, minor, _ := FirstNonPositiveMinor(b)
		if (k < 0) != want {
			t.Fatalf("trial %d: first non-positive minor %d, gonum Cholesky %v", trial, k, want)
		}
		if want {
			definite++
		} else {
			indefinite++
		}
		if k >= 0 {
			lead := toDense(b).Slice(0, k+1, 0, k+1)
			det := mat.Det(lead)
			got, _ := new(big.Float).SetInt(minor).Float64()
			if math.Abs(got-det) > 1e-6*(1+math.Abs(det)) {
				t.Errorf("trial %d: minor %d = %v, gonum's determinant %v", trial, k+1, got, det)
			}
		}
	}
	if definite < 10 || indefinite < 10 {
		t.Errorf("only %d definite and %d indefinite cases", definite, indefinite)
	}
}

// TestIntProduct: both paths against gonum's product (every value exact in
// float64 here).
func TestIntProduct(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 9))
	for _, bound := range []int64{100, 1 << 40} { // the int64 path, then math/big
		a := make([][]*big.Int, 5)
		b := make([][]*big.Int, 7)
		for i := range a {
			for range 7 {
				a[i] = append(a[i], big.NewInt(rng.Int64N(2*bound)-bound))
			}
		}
		for i := range b {
			for range 3 {
				b[i] = append(b[i], big.NewInt(rng.Int64N(2*bound)-bound))
			}
		}
		got := IntProduct(a, b)
		if bound > 100 {
			// Values up to 7·2⁸⁰: compare exactly, entry by entry.
			for i := range a {
				for j := range b[0] {
					s := new(big.Int)
					for k := range b {
						s.Add(s, new(big.Int).Mul(a[i][k], b[k][j]))
					}
					if s.Cmp(got[i][j]) != 0 {
						t.Fatalf("bound %d: (%d, %d) = %v, want %v", bound, i, j, got[i][j], s)
					}
				}
			}
			continue
		}
		var want mat.Dense
		want.Mul(toDense(a), toDense(b))
		if !mat.Equal(toDense(got), &want) {
			t.Errorf("bound %d: product differs from gonum's", bound)
		}
	}
}

// TestSolveRat: the solution satisfies the equations exactly and agrees
// with gonum's LU solve; singular systems are refused.
func TestSolveRat(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 4))
	for trial := range 30 {
		n := 1 + trial%8
		a := make([][]*big.Rat, n)
		b := make([]*big.Rat, n)
		for i := range a {
			for range n {
				a[i] = append(a[i], big.NewRat(int64(rng.IntN(19)-9), int64(1+rng.IntN(7))))
			}
			b[i] = big.NewRat(int64(rng.IntN(19)-9), int64(1+rng.IntN(5)))
		}
		if trial%5 == 0 {
			a[0][0].SetInt64(0) // a row exchange is needed
		}
		x, ok := SolveRat(a, b)
		af := mat.NewDense(n, n, nil)
		bf := mat.NewVecDense(n, nil)
		for i := range n {
			for j := range n {
				v, _ := a[i][j].Float64()
				af.Set(i, j, v)
			}
			v, _ := b[i].Float64()
			bf.SetVec(i, v)
		}
		var xf mat.VecDense
		if err := xf.SolveVec(af, bf); err != nil || mat.Cond(af, 1) > 1e10 {
			continue // singular or nearly so in floating point: no reference
		}
		if !ok {
			t.Fatalf("trial %d: refused a nonsingular system", trial)
		}
		for i := range n {
			s := new(big.Rat)
			for j := range n {
				s.Add(s, new(big.Rat).Mul(a[i][j], x[j]))
			}
			if s.Cmp(b[i]) != 0 {
				t.Fatalf("trial %d: row %d gives %v, want %v", trial, i, s, b[i])
			}
			got, _ := x[i].Float64()
			if math.Abs(got-xf.AtVec(i)) > 1e-8*(1+math.Abs(got)) {
				t.Errorf("trial %d: x%d = %v, gonum %v", trial, i, got, xf.AtVec(i))
			}
		}
	}
	// hand computation: the rows (1, 2) and (2, 4) are dependent.
	if _, ok := SolveRat(ratMatrix([]string{"1", "2"}, []string{"2", "4"}), []*big.Rat{big.NewRat(1, 1), big.NewRat(2, 1)}); ok {
		t.Error("a singular system was solved")
	}
	// hand computation: x + y = 1, x − y = 1/2 gives x = 3/4, y = 1/4.
	x, ok := SolveRat(ratMatrix([]string{"1", "1"}, []string{"1", "-1"}), []*big.Rat{big.NewRat(1, 1), big.NewRat(1, 2)})
	if !ok || x[0].Cmp(big.NewRat(3, 4)) != 0 || x[1].Cmp(big.NewRat(1, 4)) != 0 {
		t.Errorf("x, y = %v, want 3/4, 1/4", x)
	}
}

// TestCommonDenominator: the least common multiple, and the refusal beyond
// the bound.
func TestCommonDenominator(t *testing.T) {
	a := ratMatrix([]string{"1/6", "3/4"}, []string{"-5", "7/10"})
	b, d, ok := CommonDenominator(a, 64)
	// hand computation: lcm(6, 4, 10) = 60.
	if !ok || d.Int64() != 60 || b[0][0].Int64() != 10 || b[0][1].Int64() != 45 || b[1][0].Int64() != -300 || b[1][1].Int64() != 42 {
		t.Errorf("got %v over %v", b, d)
	}
	if _, _, ok := CommonDenominator(a, 5); ok { // 60 has 6 bits
		t.Error("a denominator beyond the bound was accepted")
	}
}

// TestDecayAtKnown: the Lyapunov and Stein equations' textbook solutions
// give M = Q, on the integer path and on the entry-by-entry one.
func TestDecayAtKnown(t *testing.T) {
	cases := []struct {
		j, p     [][]*big.Rat
		discrete bool
	}{
		// Ogata, Modern Control Engineering: A = [[0, 1], [−1, −1]],
		// AᵀP + PA = −I for P = [[3/2, 1/2], [1/2, 1]].
		{ratMatrix([]string{"0", "1"}, []string{"-1", "-1"}), ratMatrix([]string{"3/2", "1/2"}, []string{"1/2", "1"}), false},
		// hand computation: A = [[1/2, 1], [0, 1/2]], AᵀPA − P = −I for
		// P = [[4/3, 8/9], [8/9, 116/27]].
		{ratMatrix([]string{"1/2", "1"}, []string{"0", "1/2"}), ratMatrix([]string{"4/3", "8/9"}, []string{"8/9", "116/27"}), true},
	}
	for i, c := range cases {
		for _, m := range [][][]*big.Rat{DecayAt(c.j, c.discrete, c.p), decayRat(c.j, c.discrete, c.p)} {
			for r := range m {
				for s := range m[r] {
					want := int64(0)
					if r == s {
						want = 1
					}
					if m[r][s].Cmp(big.NewRat(want, 1)) != 0 {
						t.Errorf("case %d: M[%d][%d] = %v, want %d", i, r, s, m[r][s], want)
					}
				}
			}
		}
	}
}

// TestDecayAtPaths: on random rational matrices the integer path gives the
// entry-by-entry values (the definition of M, common practice).
func TestDecayAtPaths(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 8))
	for trial := range 40 {
		n := 1 + trial%7
		j := make([][]*big.Rat, n)
		p := make([][]*big.Rat, n)
		for i := range n {
			j[i], p[i] = make([]*big.Rat, n), make([]*big.Rat, n)
		}
		for i := range n {
			for k := range n {
				j[i][k] = big.NewRat(int64(rng.IntN(41)-20), int64(1+rng.IntN(9)))
				if k >= i {
					p[i][k] = big.NewRat(int64(rng.IntN(41)-20), int64(1+rng.IntN(30)))
					p[k][i] = p[i][k]
				}
			}
		}
		for _, discrete := range []bool{false, true} {
			got, want := DecayAt(j, discrete, p), decayRat(j, discrete, p)
			for r := range n {
				for s := range n {
					if got[r][s].Cmp(want[r][s]) != 0 {
						t.Fatalf("trial %d (discrete %v): M[%d][%d] = %v, want %v", trial, discrete, r, s, got[r][s], want[r][s])
					}
				}
			}
		}
	}
}

// TestQuadraticAbout: (x − a)ᵀP(x − a) against the sum of its n² products
// built with Poly arithmetic (the definition, common practice), and a case by
// hand.
func TestQuadraticAbout(t *testing.T) {
	r := NewRing([]string{"x", "y", "z"}, []string{"k"})
	p := ratMatrix([]string{"2", "1/2", "0"}, []string{"1/2", "3", "-1"}, []string{"0", "-1", "5/7"})
	a := []*big.Rat{big.NewRat(1, 1), big.NewRat(-2, 3), new(big.Rat)}
	want := Zero(r)
	for i := range 3 {
		for j := range 3 {
			di := new(Poly).Sub(Var(r, i), Const(r, a[i]))
			dj := new(Poly).Sub(Var(r, j), Const(r, a[j]))
			t := new(Poly).Mul(di, dj)
			want.Add(want, t.Scale(t, p[i][j]))
		}
	}
	if got := QuadraticAbout(r, p, a); !got.Equal(want) {
		t.Errorf("got %v, want %v", got, want)
	}
	// hand computation: P = I at (1, 0, 0) is x² − 2x + 1 + y² + z².
	id := ratMatrix([]string{"1", "0", "0"}, []string{"0", "1", "0"}, []string{"0", "0", "1"})
	if got := QuadraticAbout(r, id, []*big.Rat{big.NewRat(1, 1), new(big.Rat), new(big.Rat)}).String(); got != "x^2 + y^2 + z^2 - 2*x + 1" {
		t.Errorf("got %s", got)
	}
}

// TestTermsOrderAndDerivative: Terms come in descending GradedCompare
// order (the definition of the graded lexicographic order), and Derivative
// reads exponents from the keys as unkey does (∂(x²y³)/∂y = 3x²y², common
// practice).
func TestTermsOrderAndDerivative(t *testing.T) {
	r := NewRing([]string{"x", "y", "z"}, []string{"k"})
	p := MustParse(r, "x^2*y^3 + 4*z^5 - y + k*x*y*z + 7 + x^3 - 2*y^2*z^3 + k^2*x").Num
	ts := p.Terms()
	for i := 1; i < len(ts); i++ {
		if GradedCompare(ts[i-1].Exp, ts[i].Exp) <= 0 {
			t.Errorf("terms %d and %d out of order: %v, %v", i-1, i, ts[i-1].Exp, ts[i].Exp)
		}
	}
	d := new(Poly).Derivative(MustParse(r, "x^2*y^3 + k*y - z").Num, 1)
	if want := MustParse(r, "3*x^2*y^2 + k").Num; !d.Equal(want) {
		t.Errorf("∂/∂y = %v, want %v", d, want)
	}
}

// TestNonsingularModPrime: a true answer agrees with gonum's determinant
// being far from zero, a singular matrix (dependent rows, hand
// computation) is never called nonsingular, and the modular product is the
// exact one (checked with math/big).
func TestNonsingularModPrime(t *testing.T) {
	rng := rand.New(rand.NewPCG(6, 6))
	for trial := range 40 {
		n := 1 + trial%9
		a := make([][]*big.Rat, n)
		af := mat.NewDense(n, n, nil)
		for i := range a {
			for j := range n {
				v := big.NewRat(int64(rng.IntN(19)-9), int64(1+rng.IntN(7)))
				a[i] = append(a[i], v)
				f, _ := v.Float64()
				af.Set(i, j, f)
			}
		}
		if det := mat.Det(af); math.Abs(det) > 1e-6 && !NonsingularModPrime(a) {
			t.Errorf("trial %d: det ≈ %v, not shown nonsingular", trial, det)
		}
		if n > 1 {
			// Row 1 := row 0 · 3/2: singular.
			for j := range n {
				a[1][j] = new(big.Rat).Mul(a[0][j], big.NewRat(3, 2))
			}
			if NonsingularModPrime(a) {
				t.Errorf("trial %d: a singular matrix shown nonsingular", trial)
			}
		}
	}
	p := big.NewInt(mersenne61)
	for range 1000 {
		x, y := rng.Uint64N(mersenne61), rng.Uint64N(mersenne61)
		want := new(big.Int).Mul(new(big.Int).SetUint64(x), new(big.Int).SetUint64(y))
		if got := mulMod61(x, y); want.Mod(want, p).Uint64() != got {
			t.Fatalf("%d·%d mod p = %d, want %v", x, y, got, want)
		}
	}
}

// TestFormatWithoutParameters: for polynomials free of parameters the
// short path of Format prints what the grouped printing prints, and the
// text reads back to the same polynomial (the printer's contract).
func TestFormatWithoutParameters(t *testing.T) {
	r := NewRing([]string{"x", "y"}, []string{"k"})
	rng := rand.New(rand.NewPCG(4, 2))
	srcs := []string{"3/2*x^2 + x*y + y^2", "-x + 1", "x - y^3/7 - 2", "-1", "x^2*y - x*y^2 + 5*x", "x"}
	for range 50 {
		p := Zero(r)
		for range 1 + rng.IntN(6) {
			e := []int{rng.IntN(4), rng.IntN(4), 0}
			p.Add(p, Monomial(r, e, big.NewRat(int64(rng.IntN(21)-10), int64(1+rng.IntN(5)))))
		}
		srcs = append(srcs, p.String())
	}
	for _, src := range srcs {
		f := MustParse(r, src)
		got := f.Format(r.Names())
		if want := f.formatGrouped(r.Names(), r.StateMask()); got != want && f.Num.DegreeIn(r.StateMask()) > 0 {
			t.Errorf("%q: %q, grouped %q", src, got, want)
		}
		if back := MustParse(r, got); !back.Equal(f) {
			t.Errorf("%q printed as %q, which reads back as %v", src, got, back)
		}
	}
}

// hilbert returns the n×n Hilbert matrix 1/(i + j + 1).
func hilbert(n int) [][]*big.Rat {
	h := make([][]*big.Rat, n)
	for i := range h {
		h[i] = make([]*big.Rat, n)
		for j := range h[i] {
			h[i][j] = big.NewRat(1, int64(i+j+1))
		}
	}
	return h
}

// TestPositiveLDLHilbert: the leading minors of the Hilbert matrix are
// det Hₙ = cₙ⁴/c₂ₙ with cₙ = 1!·2!···(n−1)! (Choi 1983, "Tricks or treats
// with the Hilbert matrix", Amer. Math. Monthly 90), so the pivots are the
// ratios of consecutive ones and all positive.
func TestPositiveLDLHilbert(t *testing.T) {
	c := func(n int) *big.Int {
		p, f := big.NewInt(1), big.NewInt(1)
		for i := 1; i < n; i++ {
			f.Mul(f, big.NewInt(int64(i)))
			p.Mul(p, f)
		}
		return p
	}
	det := func(n int) *big.Rat {
		num := new(big.Int).Exp(c(n), big.NewInt(4), nil)
		return new(big.Rat).SetFrac(num, c(2*n))
	}
	for _, n := range []int{1, 2, 5, 12} {
		_, d, k, ok := PositiveLDL(hilbert(n), 1<<14)
		if !ok || k != -1 || len(d) != n {
			t.Fatalf("n=%d: ok %v, k %d, %d pivots", n, ok, k, len(d))
		}
		prod := big.NewRat(1, 1)
		for i, di := range d {
			prod.Mul(prod, di)
			if want := det(i + 1); prod.Cmp(want) != 0 {
				t.Errorf("n=%d: leading minor %d is %s, want %s", n, i+1, prod.RatString(), want.RatString())
			}
		}
	}
}

// gonum as a reference: on random symmetric rational matrices with a
// common denominator, PositiveLDL agrees with mat.Cholesky on positive
// definiteness, and where all pivots are positive its factors reproduce the
// matrix exactly and are those of the rational elimination.
func TestPositiveLDLAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(1968, 14))
	agreed, pd := 0, 0
	for trial := range 300 {
		n := 1 + rng.IntN(7)
		den := int64(1 + rng.IntN(12))
		a := make([][]*big.Rat, n)
		f := mat.NewSymDense(n, nil)
		for i := range a {
			a[i] = make([]*big.Rat, n)
		}
		for i := range n {
			for j := 0; j <= i; j++ {
				v := int64(rng.IntN(21) - 10)
				if i == j {
					v += int64(rng.IntN(3 * n * int(den)))
				}
				if rng.IntN(3) == 0 && i != j {
					v = 0
				}
				a[i][j], a[j][i] = big.NewRat(v, den), big.NewRat(v, den)
				f.SetSym(i, j, float64(v)/float64(den))
			}
		}
		var eig mat.EigenSym
		if !eig.Factorize(f, false) {
			t.Fatal("eigen decomposition failed")
		}
		minAbs := math.Inf(1)
		for _, v := range eig.Values(nil) {
			minAbs = math.Min(minAbs, math.Abs(v))
		}
		l, d, k, ok := PositiveLDL(a, 1<<14)
		if !ok {
			t.Fatalf("trial %d: no common denominator", trial)
		}
		if minAbs > 1e-6 {
			var chol mat.Cholesky
			if chol.Factorize(f) != (k == -1) {
				t.Fatalf("trial %d: Cholesky %v, PositiveLDL stops at %d", trial, !(k == -1), k)
			}
			agreed++
		}
		if k >= 0 {
			if d[k].Sign() > 0 || len(d) != k+1 {
				t.Fatalf("trial %d: stopped at %d with pivot %s", trial, k, d[k].RatString())
			}
			continue
		}
		pd++
		rl, rd, rok, _ := RatLDL(a)
		if !rok {
			t.Fatalf("trial %d: RatLDL fails on a positive definite matrix", trial)
		}
		for i := range n {
			if rd[i].Cmp(d[i]) != 0 {
				t.Fatalf("trial %d: pivot %d %s, rational elimination %s", trial, i, d[i].RatString(), rd[i].RatString())
			}
			for j := range n {
				if rl[i][j].Cmp(l[i][j]) != 0 {
					t.Fatalf("trial %d: L[%d][%d] %s, rational elimination %s", trial, i, j, l[i][j].RatString(), rl[i][j].RatString())
				}
			}
			for j := 0; j <= i; j++ {
				s := new(big.Rat)
				for m := range n {
					s.Add(s, new(big.Rat).Mul(new(big.Rat).Mul(l[i][m], d[m]), l[j][m]))
				}
				if s.Cmp(a[i][j]) != 0 {
					t.Fatalf("trial %d: (L·D·Lᵀ)[%d][%d] = %s, want %s", trial, i, j, s.RatString(), a[i][j].RatString())
				}
			}
		}
	}
	if agreed < 200 || pd < 50 {
		t.Errorf("only %d trials compared with Cholesky, %d positive definite", agreed, pd)
	}
}

// TestEqualLDLUnique: the decision by uniqueness (Golub & Van Loan,
// Matrix Computations, Thm. 4.1.3) agrees with the sums Σₖ Lᵢₖ·dₖ·Lⱼₖ on
// exact factorizations and on every single-entry change of a, L or d, and
// a matrix with a zero leading minor is left to the sums.
func TestEqualLDLUnique(t *testing.T) {
	rng := rand.New(rand.NewPCG(413, 1))
	decidedTrue, decidedFalse := 0, 0
	for trial := range 120 {
		n := 1 + rng.IntN(6)
		a := make([][]*big.Rat, n)
		for i := range a {
			a[i] = make([]*big.Rat, n)
		}
		for i := range n {
			for j := 0; j <= i; j++ {
				v := big.NewRat(int64(rng.IntN(15)-7), int64(1+rng.IntN(4)))
				if trial%10 == 0 && i == 0 {
					v.SetInt64(0) // a zero first row: a zero leading minor
				}
				a[i][j], a[j][i] = v, new(big.Rat).Set(v)
			}
		}
		l, d, ok, _ := RatLDL(a)
		if !ok {
			continue
		}
		check := func(what string, a, l [][]*big.Rat, d []*big.Rat) {
			want := equalLDLSums(a, l, d)
			eq, decided := equalUniqueLDL(a, l, d)
			if decided && eq != want {
				t.Fatalf("trial %d, %s: uniqueness says %v, the sums %v", trial, what, eq, want)
			}
			if decided && eq {
				decidedTrue++
			} else if decided {
				decidedFalse++
			}
		}
		check("exact", a, l, d)
		clone := func(m [][]*big.Rat) [][]*big.Rat {
			out := make([][]*big.Rat, len(m))
			for i := range m {
				out[i] = make([]*big.Rat, len(m[i]))
				for j := range m[i] {
					out[i][j] = new(big.Rat).Set(m[i][j])
				}
			}
			return out
		}
		bump := big.NewRat(1, int64(1+rng.IntN(5)))
		i, j := rng.IntN(n), rng.IntN(n)
		ma := clone(a)
		ma[i][j].Add(ma[i][j], bump)
		check("a changed", ma, l, d)
		ml := clone(l)
		ml[i][j].Add(ml[i][j], bump)
		check("L changed", a, ml, d)
		md := clone([][]*big.Rat{d})[0]
		md[i].Add(md[i], bump)
		check("d changed", a, l, md)
	}
	if decidedTrue < 50 || decidedFalse < 100 {
		t.Errorf("decided %d true and %d false", decidedTrue, decidedFalse)
	}
}
