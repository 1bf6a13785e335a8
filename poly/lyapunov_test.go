package poly

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func ratRows(t *testing.T, rows [][]string) [][]*big.Rat {
	t.Helper()
	out := make([][]*big.Rat, len(rows))
	for i, row := range rows {
		for _, s := range row {
			v, ok := new(big.Rat).SetString(s)
			if !ok {
				t.Fatalf("bad rational %q", s)
			}
			out[i] = append(out[i], v)
		}
	}
	return out
}

func identityRat(n int) [][]*big.Rat {
	q := make([][]*big.Rat, n)
	for i := range q {
		q[i] = make([]*big.Rat, n)
		for j := range q[i] {
			q[i][j] = new(big.Rat)
		}
		q[i][i].SetInt64(1)
	}
	return q
}

// TestLyapunovRatWorked compares LyapunovRat with solutions worked by hand
// or in print, entry by entry and exactly.
func TestLyapunovRatWorked(t *testing.T) {
	cases := []struct {
		name     string
		a, q, p  [][]string
		discrete bool
	}{
		// Ogata, Modern Control Engineering, the worked example of the
		// Lyapunov equation: A = [[0, 1], [−1, −1]], Q = I gives
		// P = [[3/2, 1/2], [1/2, 1]].
		{"ogata", [][]string{{"0", "1"}, {"-1", "-1"}}, nil, [][]string{{"3/2", "1/2"}, {"1/2", "1"}}, false},
		// hand computation: A = diag(−1, −2), Q = I: P = diag(1/2, 1/4).
		{"diagonal", [][]string{{"-1", "0"}, {"0", "-2"}}, nil, [][]string{{"1/2", "0"}, {"0", "1/4"}}, false},
		// hand computation: Q = diag(2, 6) scales each entry, A = diag(−1, −2):
		// P = diag(1, 3/2).
		{"diagonal-q", [][]string{{"-1", "0"}, {"0", "-2"}}, [][]string{{"2", "0"}, {"0", "6"}}, [][]string{{"1", "0"}, {"0", "3/2"}}, false},
		// hand computation (Stein equation): A = [[1/2, 1], [0, 1/2]], Q = I:
		// p₁₁ = 4/3 from (1/4 − 1)p₁₁ = −1, then p₁₂ = 8/9, p₂₂ = 116/27.
		{"stein", [][]string{{"1/2", "1"}, {"0", "1/2"}}, nil, [][]string{{"4/3", "8/9"}, {"8/9", "116/27"}}, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			a := ratRows(t, c.a)
			q := identityRat(len(a))
			if c.q != nil {
				q = ratRows(t, c.q)
			}
			p, ok := LyapunovRat(a, q, c.discrete)
			if !ok {
				t.Fatal("LyapunovRat: singular")
			}
			want := ratRows(t, c.p)
			for i := range want {
				for j := range want[i] {
					if p[i][j].Cmp(want[i][j]) != 0 {
						t.Errorf("P[%d][%d] = %s, want %s", i, j, p[i][j].RatString(), want[i][j].RatString())
					}
				}
			}
		})
	}
}

// TestLyapunovRatSingular: eigenvalues with λ₁ + λ₂ = 0 (a saddle ±1, a
// centre ±i) or λ₁λ₂ = 1 for maps make the equation singular (common
// practice: the spectrum of the Sylvester operator is {λᵢ + λⱼ}).
func TestLyapunovRatSingular(t *testing.T) {
	cases := []struct {
		name     string
		a        [][]string
		discrete bool
	}{
		{"saddle", [][]string{{"1", "0"}, {"0", "-1"}}, false},
		{"centre", [][]string{{"0", "1"}, {"-1", "0"}}, false},
		{"map-unit", [][]string{{"2", "0"}, {"0", "1/2"}}, true},
	}
	for _, c := range cases {
		a := ratRows(t, c.a)
		if _, ok := LyapunovRat(a, identityRat(2), c.discrete); ok {
			t.Errorf("%s: LyapunovRat solved a singular equation", c.name)
		}
	}
}

// TestLyapunovRatGonum cross-checks LyapunovRat against gonum: the same
// equation in Kronecker form, (I ⊗ Aᵀ + Aᵀ ⊗ I)·vec P = −vec Q (respectively
// (Aᵀ ⊗ Aᵀ − I)·vec P = −vec Q), n² unknowns solved by gonum's LU in
// floating point, for random stable A with small integer entries (stable by
// Gershgorin's theorem: diagonal below minus the row's other entries). The
// exact solution must also satisfy the equation with no residual.
func TestLyapunovRatGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 11))
	for trial := range 30 {
		n := 2 + trial%5
		discrete := trial%2 == 1
		a := make([][]*big.Rat, n)
		af := mat.NewDense(n, n, nil)
		for i := range n {
			a[i] = make([]*big.Rat, n)
			off := int64(0)
			for j := range n {
				v := rng.Int64N(7) - 3
				if i != j {
					off += max(v, -v)
				}
				a[i][j] = big.NewRat(v, 1)
			}
			if discrete {
				// |aᵢᵢ| + Σ|aᵢⱼ| < 1 after dividing the row by its sum + 1.
				d := off + 1 + max(a[i][i].Num().Int64(), -a[i][i].Num().Int64())
				for j := range n {
					a[i][j].Quo(a[i][j], big.NewRat(d, 1))
				}
			} else {
				a[i][i].SetInt64(-off - 1 - rng.Int64N(3))
			}
			for j := range n {
				f, _ := a[i][j].Float64()
				af.Set(i, j, f)
			}
		}
		q := identityRat(n)
		p, ok := LyapunovRat(a, q, discrete)
		if !ok {
			t.Fatalf("trial %d: singular", trial)
		}
		// Exact residual.
		m := DecayAt(a, discrete, p)
		for i := range n {
			for j := range n {
				if m[i][j].Cmp(q[i][j]) != 0 {
					t.Fatalf("trial %d: residual at (%d, %d): %s", trial, i, j, m[i][j].RatString())
				}
			}
		}
		// gonum, Kronecker form, column-major vec.
		at := mat.DenseCopyOf(af.T())
		k := mat.NewDense(n*n, n*n, nil)
		eye := mat.NewDiagDense(n, nil)
		for i := range n {
			eye.SetDiag(i, 1)
		}
		var k1, k2 mat.Dense
		if discrete {
			k1.Kronecker(at, at)
			k.Sub(&k1, identityDense(n*n))
		} else {
			k1.Kronecker(eye, at)
			k2.Kronecker(at, eye)
			k.Add(&k1, &k2)
		}
		rhs := mat.NewVecDense(n*n, nil)
		for i := range n {
			rhs.SetVec(i*n+i, -1)
		}
		var x mat.VecDense
		if err := x.SolveVec(k, rhs); err != nil {
			t.Fatalf("trial %d: gonum: %v", trial, err)
		}
		scale := mat.Norm(&x, math.Inf(1))
		for i := range n {
			for j := range n {
				got, _ := p[i][j].Float64()
				if want := x.AtVec(j*n + i); math.Abs(got-want) > 1e-9*(1+scale) {
					t.Errorf("trial %d: P[%d][%d] = %g, gonum %g", trial, i, j, got, want)
				}
			}
		}
	}
}

func identityDense(n int) *mat.Dense {
	d := mat.NewDense(n, n, nil)
	for i := range n {
		d.Set(i, i, 1)
	}
	return d
}

func BenchmarkLyapunovRat(b *testing.B) {
	n := 10
	a := make([][]*big.Rat, n)
	for i := range n {
		a[i] = make([]*big.Rat, n)
		for j := range n {
			a[i][j] = big.NewRat(int64((i*7+j*3)%5-2), 1)
		}
		a[i][i] = big.NewRat(-int64(3*n), 1)
	}
	q := identityRat(n)
	for b.Loop() {
		LyapunovRat(a, q, false)
	}
}
