package model

import (
	"math"
	"math/big"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

// plainStart may skip scanning a line only when the scanner's first token
// is a name other than state, parameter, param and next (checked here
// against the scanner itself, the reference).
func TestPlainStartAgreesWithScanner(t *testing.T) {
	for _, line := range []string{
		"state x", "  parameter a > 0", "param a", "next x = 1", "x' = -x", "V = x^2",
		"state2' = 1", "paramx = 3", "\tlet q = 1", "état x", "stateé x", "_x' = 1",
		"1 = x", "(x)", "# comment", "nextx+ = 1", "x1+ = x1", "ｘ' = 1",
	} {
		toks := poly.Scan(line, poly.Pos{File: "t", Line: 1, Col: 1})
		first := toks[0]
		keyword := first.Kind == poly.Name && (first.Text == "state" || first.Text == "parameter" || first.Text == "param" || first.Text == "next")
		if plainStart(line) && (first.Kind != poly.Name || keyword) {
			t.Errorf("%q: skipped, but its first token is %v", line, first)
		}
		if strings.HasPrefix(strings.TrimSpace(line), "x") && !plainStart(line) {
			t.Errorf("%q: not skipped", line)
		}
	}
}

// TestMonomials: the number of monomials of degree at most d in n
// variables is binomial(n+d, n) (common practice), against math/big's
// Binomial, saturated to MaxInt64 from MaxInt64/(n+d+1) on.
func TestMonomials(t *testing.T) {
	for _, c := range [][2]int{{0, 0}, {1, 5}, {3, 2}, {200, 1}, {200, 2}, {2, 200}, {10000, 3}, {40, 40}, {100, 100}, {5000, 5000}} {
		n, d := c[0], c[1]
		want := new(big.Int).Binomial(int64(n+d), int64(n))
		limit := big.NewInt(math.MaxInt64 / int64(n+d+1))
		got := monomials(n, d)
		if want.Cmp(limit) >= 0 {
			if got != math.MaxInt64 {
				t.Errorf("monomials(%d, %d) = %d, want saturation", n, d, got)
			}
		} else if got != want.Int64() {
			t.Errorf("monomials(%d, %d) = %d, want %v", n, d, got, want)
		}
	}
}
