package poly

import (
	"math/big"
	"testing"
)

// TestPairing: Σ p_γ·y_γ by hand (common practice).
func TestPairing(t *testing.T) {
	r := NewRing([]string{"x", "y"}, nil)
	cases := []struct{ p, y, want string }{
		{"x^2 + 3*x*y", "2*x^2 + 5*x*y + y^2", "17"},
		{"x^2", "y^2", "0"},
		{"1 - x^2*y^2", "4 + 1/2*x^2*y^2 + x", "7/2"},
		{"0", "x", "0"},
	}
	for _, c := range cases {
		got := Pairing(MustParse(r, c.p).Num, MustParse(r, c.y).Num)
		if got.Cmp(ratOf(c.want)) != 0 {
			t.Errorf("Pairing(%s, %s) = %v, want %s", c.p, c.y, got, c.want)
		}
	}
}

// TestMomentMatrix: the moments of the uniform probability measure on
// [−1, 1] are 1/(k+1) for even k and 0 for odd k (common practice), so its
// moment matrix in the basis 1, x, x² is the Hankel matrix
// [[1, 0, 1/3], [0, 1/3, 0], [1/3, 0, 1/5]]. In the basis x, x + x² the
// entries are L(x²) = 1/3, L(x² + x³) = 1/3 and L((x + x²)²) = 1/3 + 1/5.
func TestMomentMatrix(t *testing.T) {
	r := NewRing([]string{"x"}, nil)
	y := MustParse(r, "1 + 1/3*x^2 + 1/5*x^4").Num
	cases := []struct {
		basis []string
		want  [][]*big.Rat
	}{
		{[]string{"1", "x", "x^2"}, ratMatrix([]string{"1", "0", "1/3"}, []string{"0", "1/3", "0"}, []string{"1/3", "0", "1/5"})},
		{[]string{"x", "x + x^2"}, ratMatrix([]string{"1/3", "1/3"}, []string{"1/3", "8/15"})},
	}
	for _, c := range cases {
		var z []*Poly
		for _, s := range c.basis {
			z = append(z, MustParse(r, s).Num)
		}
		m, ok := MomentMatrix(y, z).Consts()
		if !ok {
			t.Fatal("moment matrix not constant")
		}
		for i := range c.want {
			for j := range c.want[i] {
				if m[i][j].Cmp(c.want[i][j]) != 0 {
					t.Errorf("basis %v: M[%d][%d] = %v, want %v", c.basis, i, j, m[i][j], c.want[i][j])
				}
			}
		}
	}
}

// TestEvenPowers: sums of positive multiples of even powers of every
// variable, and what is not one (common practice).
func TestEvenPowers(t *testing.T) {
	r := NewRing([]string{"x", "y"}, []string{"k"})
	cases := []struct {
		p    string
		n    int
		want bool
	}{
		{"x^2 + y^4", 2, true},
		{"1/3*x^4 + 2*x^2 + 1/8*y^2", 2, true},
		{"x^2", 2, false},           // y missing
		{"x^2 + y^4", 1, false},     // y is not among the first variable
		{"x^2 - y^2", 2, false},     // a negative coefficient
		{"x^2 + y^3", 2, false},     // an odd power
		{"x^2 + y^2 + 1", 2, false}, // a constant
		{"x^2 + x*y + y^2", 2, false},
		{"x^2 + y^2 + k^2", 2, false}, // a parameter
		{"x^2", 1, true},
		{"0", 0, false},
	}
	for _, c := range cases {
		if got := MustParse(r, c.p).Num.EvenPowers(c.n); got != c.want {
			t.Errorf("EvenPowers(%s, %d) = %v, want %v", c.p, c.n, got, c.want)
		}
	}
}
