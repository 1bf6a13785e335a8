package report

import (
	"strings"
	"testing"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// TestConditionText checks the one reading of q > 0 that the terminal
// text, the JSON and the reports share. A linear a·p + c > 0 is p > −c/a
// for a > 0 and p < −c/a for a < 0 (dividing an inequality by a negative
// number turns it, elementary algebra, common practice).
func TestConditionText(t *testing.T) {
	r := poly.NewRing([]string{"x"}, []string{"r", "b"})
	for _, tc := range []struct {
		q, text, tex string
	}{
		{"4*r - 1", "r > 1/4", `r > \frac{1}{4}`},
		{"1 - r", "r < 1", "r < 1"},
		{"-2*b + 3", "b < 3/2", `b < \frac{3}{2}`},
		{"r", "r > 0", "r > 0"},
		{"3", "", ""},                                  // a positive constant: nothing to state
		{"-2", "false (-2 > 0 never holds)", "-2 > 0"}, // never holds
		{"0", "false (0 > 0 never holds)", "0 > 0"},
		{"r*b - 1", "r*b - 1 > 0", "r\\,b - 1 > 0"}, // not linear: stays as it is
		{"r^2 - 2", "r^2 - 2 > 0", "r^{2} - 2 > 0"},
	} {
		f, err := poly.Parse(r, tc.q)
		if err != nil {
			t.Fatalf("%s: %v", tc.q, err)
		}
		if got := conditionText(f.Num); got != tc.text {
			t.Errorf("conditionText(%s) = %q, want %q", tc.q, got, tc.text)
		}
		got := ""
		if n := conditionNode(f.Num); n != nil {
			got = n.tex()
		}
		if got != tc.tex {
			t.Errorf("conditionNode(%s).tex() = %q, want %q", tc.q, got, tc.tex)
		}
	}
}

// TestPercent checks that a share is never rounded to look like exactly
// 0% or 100% (common practice for reporting proportions).
func TestPercent(t *testing.T) {
	for _, tc := range []struct{ share, want string }{
		{"1/2", "50.00%"},
		{"1", "100.00%"},
		{"0", "0.00%"},
		{"1/3", "33.33%"},
		{"99999/100000", ">99.99%"},
		{"1/100000", "<0.01%"},
		{"not a number", "not a number"},
	} {
		if got := percent(tc.share); got != tc.want {
			t.Errorf("percent(%s) = %q, want %q", tc.share, got, tc.want)
		}
	}
}

// TestVerifyTextInvalidNotAltered: a certificate whose digest matches its
// content but whose mathematics fails is called invalid, not altered (the
// digest is SHA-256 of the canonical serialization: common practice for
// telling a changed file from a wrong one).
func TestVerifyTextInvalidNotAltered(t *testing.T) {
	doc := &claims.Document{Format: "lyacert-certificate/3"}
	d, err := doc.ComputeDigest()
	if err != nil {
		t.Fatal(err)
	}
	doc.Digest = d
	out := checker.Outcome{Records: []checker.Record{{Name: "model", OK: false, Reason: "the model text parses"}}}
	var b strings.Builder
	VerifyText(&b, "c.json", doc, out, Trust{})
	if got := b.String(); !strings.Contains(got, "c.json: INVALID. The file is as it was written") || !strings.Contains(got, "    model: the model text parses") {
		t.Errorf("got %q", got)
	}
	doc.Digest = "sha256:" + strings.Repeat("0", 64)
	b.Reset()
	VerifyText(&b, "c.json", doc, out, Trust{})
	if got := b.String(); !strings.Contains(got, "c.json: ALTERED.") {
		t.Errorf("a stale digest: got %q", got)
	}
}
