package checker

import (
	"os"
	"slices"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/claims"
)

// TestRuleTableCoversFormat: every claim type of the format has exactly one
// rule of the kernel, and every rule a claim type (common practice: a
// dispatch table checked against the types it dispatches on).
func TestRuleTableCoversFormat(t *testing.T) {
	var names []string
	for _, r := range rules {
		names = append(names, r.name)
	}
	slices.Sort(names)
	if want := claims.Rules(); !slices.Equal(names, want) {
		t.Errorf("the rule table has %v; the format has %v", names, want)
	}
}

// TestRuleTableDocumented: every rule of the table has its line in the
// package documentation's table (doc.go).
func TestRuleTableDocumented(t *testing.T) {
	doc, err := os.ReadFile("doc.go")
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rules {
		if !strings.Contains(string(doc), "//\t"+r.name+" ") {
			t.Errorf("doc.go does not list the rule %s", r.name)
		}
	}
}
