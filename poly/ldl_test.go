package poly

import (
	"math/big"
	"testing"
)

func ratOf(s string) *big.Rat {
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		panic(s)
	}
	return q
}

func ratMatrix(rows ...[]string) [][]*big.Rat {
	out := make([][]*big.Rat, len(rows))
	for i, r := range rows {
		for _, s := range r {
			out[i] = append(out[i], ratOf(s))
		}
	}
	return out
}

func TestFirstNonPositivePivot(t *testing.T) {
	cases := []struct {
		a     [][]*big.Rat
		k     int
		pivot string
	}{
		{ratMatrix([]string{"2", "1"}, []string{"1", "2"}), -1, ""},                                    // hand computation: pivots 2, 3/2
		{ratMatrix([]string{"1", "2"}, []string{"2", "1"}), 1, "-3"},                                   // hand computation: 1 − 4/1
		{ratMatrix([]string{"0", "1"}, []string{"1", "0"}), 0, "0"},                                    // hand computation: a zero first pivot
		{ratMatrix([]string{"3/2", "1/2"}, []string{"1/2", "1"}), -1, ""},                              // Ogata's P: pivots 3/2, 5/6
		{ratMatrix([]string{"1", "1", "1"}, []string{"1", "1", "1"}, []string{"1", "1", "2"}), 1, "0"}, // hand computation: rank 2 leading block
		// Strictly diagonally dominant with a positive diagonal: definite
		// without elimination (Levy–Desplanques; common practice).
		{ratMatrix([]string{"3", "1", "-1"}, []string{"1", "3", "1"}, []string{"-1", "1", "3"}), -1, ""},
		// Definite but not dominant (eigenvalues 14/5, 1/10, 1/10; hand
		// computation): decided by elimination.
		{ratMatrix([]string{"1", "9/10", "9/10"}, []string{"9/10", "1", "9/10"}, []string{"9/10", "9/10", "1"}), -1, ""},
		// Dominant rows but a negative diagonal entry: leading minors 4, 15
		// and −63/2 (Laplace expansion), so the third pivot is −21/10.
		{ratMatrix([]string{"4", "1", "1/2"}, []string{"1", "4", "1/2"}, []string{"1/2", "1/2", "-2"}), 2, "-21/10"},
	}
	for i, c := range cases {
		k, p := FirstNonPositivePivot(c.a)
		if k != c.k || (k >= 0 && p.Cmp(ratOf(c.pivot)) != 0) {
			t.Errorf("case %d: pivot %d = %v, want %d = %s", i, k, p, c.k, c.pivot)
		}
	}
}
