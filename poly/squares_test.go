package poly

import (
	"strings"
	"testing"
)

// TestSquaresLDL: x² − 2xy + 2y² = (x − y)² + y², G = [[1, −1], [−1, 2]]
// = L·diag(1, 1)·Lᵀ with L = [[1, 0], [−1, 1]] (completing the square by
// hand, common practice), and the ways a claimed factorization can be
// wrong.
func TestSquaresLDL(t *testing.T) {
	r := NewRing([]string{"x", "y"}, nil)
	rd := func(s string) RatFunc {
		f, err := Parse(r, s)
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	m := func(rows ...[]string) Matrix {
		out := make(Matrix, len(rows))
		for i, row := range rows {
			for _, s := range row {
				out[i] = append(out[i], rd(s))
			}
		}
		return out
	}
	list := func(ss ...string) []RatFunc {
		var out []RatFunc
		for _, s := range ss {
			out = append(out, rd(s))
		}
		return out
	}
	z := []*Poly{rd("x").Num, rd("y").Num}
	for _, c := range []struct {
		name  string
		g, l  Matrix
		d     []RatFunc
		want  string // the polynomial, or a part of the error
		holds bool
	}{
		{"completed square", m([]string{"1", "-1"}, []string{"-1", "2"}), m([]string{"1", "0"}, []string{"-1", "1"}), list("1", "1"), "x^2 - 2*x*y + 2*y^2", true},
		{"zero pivot, zero column", m([]string{"1", "0"}, []string{"0", "0"}), m([]string{"1", "0"}, []string{"0", "1"}), list("1", "0"), "x^2", true},
		{"negative pivot", m([]string{"1", "0"}, []string{"0", "-1"}), m([]string{"1", "0"}, []string{"0", "1"}), list("1", "-1"), "negative", false},
		{"L not unit", m([]string{"2", "0"}, []string{"0", "1"}), m([]string{"2", "0"}, []string{"0", "1"}), list("1/2", "1"), "unit lower", false},
		{"L·D·Lᵀ differs", m([]string{"1", "-1"}, []string{"-1", "2"}), m([]string{"1", "0"}, []string{"1", "1"}), list("1", "1"), "reproduce", false},
		{"a variable in G", m([]string{"x", "0"}, []string{"0", "1"}), m([]string{"1", "0"}, []string{"0", "1"}), list("x", "1"), "rational numbers", false},
		// Below a zero pivot the column must vanish: L = [[1, 0], [1, 1]]
		// with D = (0, 1) gives G = [[0, 0], [0, 1]] but hides nothing;
		// the factorization is refused all the same (not Lagrange's).
		{"column below a zero pivot", m([]string{"0", "0"}, []string{"0", "1"}), m([]string{"1", "0"}, []string{"1", "1"}), list("0", "1"), "unit lower", false},
	} {
		p, err := SquaresLDL(z, c.g, c.l, c.d)
		switch {
		case c.holds && (err != nil || p.String() != c.want):
			t.Errorf("%s: %v, %v; want %s", c.name, p, err, c.want)
		case !c.holds && (err == nil || !strings.Contains(err.Error(), c.want)):
			t.Errorf("%s: error %v, want one about %q", c.name, err, c.want)
		}
	}
}
