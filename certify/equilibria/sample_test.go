package equilibria

import (
	"context"
	"math"
	"testing"
)

// TestSampleQuintic samples the invented model testdata/models/quintic.lya,
// x' = x + a − x⁵ on a ∈ [−2, 2], whose equilibria solve the quintic
// x⁵ − x = a (no closed form). Hand computation: x⁵ − x has extrema ∓4/(5·5^¼)
// ≈ ∓0.535 at x = ±5^(−¼), so three equilibria for |a| < 0.535 and one for
// |a| > 0.535; f'(x) = 1 − 5x⁴, so x is stable iff 5x⁴ > 1. At a = 0 they are
// −1, 0, 1: stable, unstable, stable.
func TestSampleQuintic(t *testing.T) {
	m := parseModel(t, string(readModel(t, "quintic.lya")))
	s, err := Sample(context.Background(), m, SampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Points) != DefaultSamplePoints || s.Window != "" {
		t.Fatalf("%d points, window %q; want %d over the model's range", len(s.Points), s.Window, DefaultSamplePoints)
	}
	for _, p := range s.Points {
		a, _ := p.Value.Float64()
		if p.Err != "" {
			t.Fatalf("a = %s: %s", p.Value.RatString(), p.Err)
		}
		eqs := p.Result.Search.Equilibria
		want := 1
		if math.Abs(a) < 0.535 {
			want = 3
		}
		if len(eqs) != want {
			t.Errorf("a = %s: %d equilibria, want %d", p.Value.RatString(), len(eqs), want)
			continue
		}
		for i, e := range eqs {
			x := e.Approx[0]
			stable := 5*x*x*x*x > 1
			got := p.SampleStability(i)
			if (got == SampleStable) != stable || got == SampleUndetermined {
				t.Errorf("a = %s, x ≈ %g: %s, want stable = %v", p.Value.RatString(), x, got, stable)
			}
		}
		if p.Value.Sign() == 0 {
			for i, want := range []string{"-1", "0", "1"} {
				if eqs[i].Status != EquilibriumExact || eqs[i].Point[0].RatString() != want {
					t.Errorf("a = 0: equilibrium %d is %v, want %s exactly", i+1, eqs[i].Approx, want)
				}
			}
		}
	}
}

// TestSampleGrid: the grid's ends and spacing (common practice: an open end
// of the range is not sampled; an unbounded side gets a window).
func TestSampleGrid(t *testing.T) {
	cases := []struct {
		name, src   string
		points      int
		first, last string
		window      bool
	}{
		{"closed", "state x\nparameter a in [0, 1]\nx' = a - x\n", 5, "0", "1", false},
		{"open", "state x\nparameter a in (0, 1)\nx' = a - x\n", 3, "1/4", "3/4", false},
		{"half-line", "state x\nparameter a >= 1\nx' = a - x\n", 11, "1", "11", true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := Sample(context.Background(), parseModel(t, c.src), SampleOptions{Points: c.points})
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Points) != c.points {
				t.Fatalf("%d points, want %d", len(s.Points), c.points)
			}
			if f, l := s.Points[0].Value.RatString(), s.Points[c.points-1].Value.RatString(); f != c.first || l != c.last {
				t.Errorf("grid %s … %s, want %s … %s", f, l, c.first, c.last)
			}
			if (s.Window != "") != c.window {
				t.Errorf("window %q", s.Window)
			}
		})
	}
}
