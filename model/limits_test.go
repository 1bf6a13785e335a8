package model

import (
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
