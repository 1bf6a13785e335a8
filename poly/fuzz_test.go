package poly

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzParseExpr feeds arbitrary text to the expression parser over a ring of
// two states and a parameter: it may refuse the text but must not panic, and
// what it accepts must print as canonical text that parses back to an equal
// function (common practice for a parser with a canonical printer).
func FuzzParseExpr(f *testing.F) {
	for _, s := range []string{
		"u^2/g + v^2", "(u + v)^3 - 2*g*u", "0.35*u - 1e-3*v", "((((2^64)^64)^64)^64)", "(u^2)^40",
		"u/(g^2 + 1)", "-(-(-u))", "u^(3)", "1/3 + 1/5 + 1/7", strings.Repeat("(", 300) + "u" + strings.Repeat(")", 300),
	} {
		f.Add(s)
	}
	// Seeds kept as files: the expressions of the hostile models.
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "hostile", "models", "*.lya"))
	for _, p := range files {
		b, err := os.ReadFile(p)
		if err != nil {
			continue
		}
		for _, line := range strings.Split(string(b), "\n") {
			if _, rhs, ok := strings.Cut(line, "= "); ok && len(rhs) < 4096 {
				f.Add(rhs)
			}
		}
	}
	r := NewRing([]string{"u", "v"}, []string{"g"})
	env := func(name string) (RatFunc, bool) {
		i, ok := r.Index(name)
		if !ok {
			return RatFunc{}, false
		}
		return FromPoly(Var(r, i)), true
	}
	lim := Limits{Work: 200000}
	f.Fuzz(func(t *testing.T, text string) {
		v, err := ParseExprLimits(r, env, text, Pos{Line: 1, Col: 1}, lim)
		if err != nil {
			if _, ok := err.(*Error); !ok {
				t.Fatalf("error of type %T: %v", err, err)
			}
			return
		}
		// Division by g may be written; the canonical text must still parse.
		c := v.String()
		w, err := ParseExprLimits(r, env, c, Pos{Line: 1, Col: 1}, lim)
		if err != nil {
			t.Fatalf("canonical text %q of %q does not parse: %v", c, text, err)
		}
		if !w.Equal(v) {
			t.Fatalf("canonical text %q of %q parses to %s", c, text, w)
		}
	})
}
