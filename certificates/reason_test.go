package certificates

import (
	"errors"
	"fmt"
	"math/big"
	"testing"

	"lyacert/poly"
)

// TestReasonfMatchesSprintf checks the direct formatting of check records
// against fmt.Sprintf, which defines the texts (golden reports hold them).
func TestReasonfMatchesSprintf(t *testing.T) {
	iv := poly.Closed(big.NewRat(-1, 3), big.NewRat(5, 2))
	cases := []struct {
		format string
		args   []any
	}{
		{"format %q", []any{"lyacert-certificate/1"}},                                     // common practice, no source
		{"%s has %d rows", []any{"P", 3}},                                                 // common practice, no source
		{"entry (%d,%d) = %q is canonical", []any{1, -2, "a\"b\n"}},                       // quoting, escapes
		{"M = %s entry (%d,%d) equals the recomputed %s", []any{"−(JᵀP + PJ)", 1, 2, iv}}, // non-ASCII text, an interval
		{"the conditions hold there: %v", []any{true}},                                    // bool
		{"100%% of %v", []any{7}},                                                         // literal percent
		{"states %v", []any{[]string{"x", "y"}}},                                          // other types: fmt
		{"%5d|%-3s|%x", []any{42, "a", 255}},                                              // widths, other verbs: fmt
		{"%s and %s", []any{"one"}},                                                       // missing argument: fmt
		{"only %s", []any{"one", "two"}},                                                  // extra argument: fmt
		{"error %v", []any{errors.New("boom")}},                                           // an error: fmt
		{"ends with %", nil},                                                              // a lone percent: fmt
		{"no verbs", nil},                                                                 // plain text
	}
	for _, c := range cases {
		if got, want := reasonf(c.format, c.args), fmt.Sprintf(c.format, c.args...); got != want {
			t.Errorf("reasonf(%q) = %q, want %q", c.format, got, want)
		}
	}
}
