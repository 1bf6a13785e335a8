package ode

import (
	"math"
	"testing"
)

// Against closed-form solutions (common practice: linear equations solved
// by hand).
func TestClosedForms(t *testing.T) {
	cases := []struct {
		name  string
		f     Func
		x0    []float64
		t1    float64
		exact func(t float64) []float64
	}{
		{"decay x' = -x", func(x, dx []float64) { dx[0] = -x[0] }, []float64{1}, 5,
			func(t float64) []float64 { return []float64{math.Exp(-t)} }},
		{"harmonic oscillator", func(x, dx []float64) { dx[0], dx[1] = x[1], -x[0] }, []float64{1, 0}, 10,
			func(t float64) []float64 { return []float64{math.Cos(t), -math.Sin(t)} }},
		{"x' = x^2 blows up at t = 1", func(x, dx []float64) { dx[0] = x[0] * x[0] }, []float64{1}, 0.9,
			func(t float64) []float64 { return []float64{1 / (1 - t)} }},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r, err := Integrate(c.f, 0, c.t1, c.x0, Options{RelTol: 1e-10, AbsTol: 1e-12})
			if err != nil {
				t.Fatal(err)
			}
			last := r.X[len(r.X)-1]
			if r.T[len(r.T)-1] != c.t1 {
				t.Fatalf("ends at %g", r.T[len(r.T)-1])
			}
			for i, v := range c.exact(c.t1) {
				if math.Abs(last[i]-v) > 1e-7*math.Max(1, math.Abs(v)) {
					t.Errorf("x%d(%g) = %.12g, want %.12g", i, c.t1, last[i], v)
				}
			}
		})
	}
}

// The error estimate controls the step: a looser tolerance takes fewer
// steps, and the global error of the fifth-order solution falls roughly with
// the tolerance (Hairer, Nørsett & Wanner, §II.4: tolerance proportionality).
func TestToleranceProportionality(t *testing.T) {
	f := func(x, dx []float64) { dx[0], dx[1] = x[1], -x[0] }
	var prevSteps int
	var prevErr float64
	for i, tol := range []float64{1e-4, 1e-7, 1e-10} {
		r, err := Integrate(f, 0, 20, []float64{1, 0}, Options{RelTol: tol, AbsTol: tol})
		if err != nil {
			t.Fatal(err)
		}
		last := r.X[len(r.X)-1]
		e := math.Hypot(last[0]-math.Cos(20), last[1]+math.Sin(20))
		if i > 0 && (r.Accepted <= prevSteps || e >= prevErr) {
			t.Errorf("tol %g: %d steps, error %g; looser: %d steps, error %g", tol, r.Accepted, e, prevSteps, prevErr)
		}
		if e > 1e3*tol {
			t.Errorf("tol %g: global error %g", tol, e)
		}
		prevSteps, prevErr = r.Accepted, e
	}
}

func TestStopAndLimits(t *testing.T) {
	f := func(x, dx []float64) { dx[0] = -x[0] }
	r, err := Integrate(f, 0, 100, []float64{1}, Options{Stop: func(_ float64, x []float64) bool { return x[0] < 0.5 }})
	if err != nil || !r.Stopped || r.X[len(r.X)-1][0] >= 0.5 {
		t.Errorf("stop: %v %v", err, r.Stopped)
	}
	if _, err := Integrate(f, 0, 100, []float64{1}, Options{MaxSteps: 3}); err != ErrSteps {
		t.Errorf("max steps: %v", err)
	}
	g := func(x, dx []float64) { dx[0] = x[0] * x[0] }
	if _, err := Integrate(g, 0, 2, []float64{1}, Options{MaxSteps: 100000}); err == nil {
		t.Errorf("through a blow-up: no error")
	}
}
