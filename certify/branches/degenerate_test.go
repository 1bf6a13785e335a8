package branches

import (
	"fmt"
	"strings"
	"testing"
)

// TestDegenerate checks the places where a condition c ≠ 0 that the
// elimination divided by fails: hand computations (common practice).
func TestDegenerate(t *testing.T) {
	cases := []struct {
		name, src string
		// want: one entry per degeneracy, "param=value" then the found
		// equilibria as "coords|free|branch" (branch 0 for none).
		want []string
		note string
	}{
		// Lorenz (Lorenz 1963) with r = 2 and b allowed to reach 0: at
		// b = 0, z' = xy, so x = y = 0 with z free is a line of equilibria
		// that no branch gives (every branch divides by b or needs b > 0
		// for its square root).
		{"lorenz b = 0", "state x, y, z\nparameter b in [-1, 1]\nx' = 10*(y - x)\ny' = 2*x - y - x*z\nz' = x*y - b*z\n",
			[]string{"b=0", "[0 0 z]|[2]|0"}, ""},
		// The same with b > 0: b ≠ 0 never fails, nothing is said.
		{"lorenz b > 0", "state x, y, z\nparameter b > 0\nx' = 10*(y - x)\ny' = 2*x - y - x*z\nz' = x*y - b*z\n", nil, ""},
		// x' = y − ax, y' = 2(y − ax) + ay: the origin for a ≠ 0; at
		// a = 0, x' = y, y' = 2y: y = 0, x free.
		{"line at a = 0", "state x, y\nparameter a\nx' = y - a*x\ny' = 2*(y - a*x) + a*y\n",
			[]string{"a=0", "[x 0]|[0]|0"}, ""},
		// x' = ax + y − a, y' = x − 1 + y: dividing by a gives x = (a − y)/a,
		// then y(a − 1) = 0, so the branch (1, 0) for a ≠ 0, 1. At a = 0,
		// y = 0 and x = 1: the same point, so the branch's value there. At
		// a = 1 both equations are x + y − 1: the line x = 1 − y.
		{"matched", "state x, y\nparameter a\nx' = a*x + y - a\ny' = x - 1 + y\n",
			[]string{"a=0", "[1 0]|[]|1", "a=1", "[(-y + 1) y]|[1]|0"}, ""},
		// x' = xy, y' = a − 1: no equilibrium unless a = 1, where both
		// axes are lines of equilibria (a parameter equation, not a
		// divisor).
		{"equation", "state x, y\nparameter a\nx' = x*y\ny' = a - 1\n",
			[]string{"a=1 equation", "[0 y]|[1]|0", "[x 0]|[0]|0"}, ""},
		// x = 1/(a² − 2): the condition fails at a = √2, irrational: said,
		// not analysed.
		{"irrational", "state x, y\nparameter a in [0, 2]\nx' = (a^2 - 2)*x - 1\ny' = -y\n",
			[]string{"a=root"}, "an irrational value"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			an := analyze(t, parse(t, "deg.lya", tc.src))
			var got []string
			for _, d := range an.Degenerate {
				v := "root"
				if d.Value != nil && d.Value.Exact != nil {
					v = d.Value.Exact.RatString()
				}
				if d.Equation {
					v += " equation"
				}
				got = append(got, d.Param+"="+v)
				for k, f := range d.Found {
					var cs []string
					for _, c := range f.Coords {
						cs = append(cs, c.String())
					}
					got = append(got, fmt.Sprintf("[%s]|%v|%d", strings.Join(cs, " "), f.Free, d.OnBranch[k]+1))
				}
				if tc.note != "" && !strings.Contains(d.Note, tc.note) {
					t.Errorf("note %q, want %q", d.Note, tc.note)
				}
			}
			if strings.Join(got, "; ") != strings.Join(tc.want, "; ") {
				t.Fatalf("got %q, want %q", got, tc.want)
			}
		})
	}
}
