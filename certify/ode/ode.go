package ode

import (
	"errors"
	"math"
)

// Func is the right-hand side: it writes f(x) into dx.
type Func func(x, dx []float64)

// Options are the tolerances and limits of an integration; zero fields take
// the defaults.
type Options struct {
	RelTol, AbsTol float64 // default 1e-8 and 1e-10
	MaxSteps       int     // accepted and rejected steps, default 100000
	// Stop, when not nil, is asked after every accepted step and ends the
	// integration early when it returns true.
	Stop func(t float64, x []float64) bool
}

// Result is an integration: the accepted times and states (the start
// first), and the numbers of accepted and rejected steps.
type Result struct {
	T                  []float64
	X                  [][]float64
	Accepted, Rejected int
	Stopped            bool // Options.Stop ended it
}

// ErrSteps is returned when MaxSteps is reached before the end time.
var ErrSteps = errors.New("ode: too many steps")

// ErrNotFinite is returned when the solution leaves the finite numbers.
var ErrNotFinite = errors.New("ode: the solution is not finite")

// The Dormand–Prince 5(4) tableau.
var (
	dpC = [7]float64{0, 1.0 / 5, 3.0 / 10, 4.0 / 5, 8.0 / 9, 1, 1}
	dpA = [7][6]float64{
		{},
		{1.0 / 5},
		{3.0 / 40, 9.0 / 40},
		{44.0 / 45, -56.0 / 15, 32.0 / 9},
		{19372.0 / 6561, -25360.0 / 2187, 64448.0 / 6561, -212.0 / 729},
		{9017.0 / 3168, -355.0 / 33, 46732.0 / 5247, 49.0 / 176, -5103.0 / 18656},
		{35.0 / 384, 0, 500.0 / 1113, 125.0 / 192, -2187.0 / 6784, 11.0 / 84},
	}
	dpB    = [7]float64{35.0 / 384, 0, 500.0 / 1113, 125.0 / 192, -2187.0 / 6784, 11.0 / 84, 0}
	dpBhat = [7]float64{5179.0 / 57600, 0, 7571.0 / 16695, 393.0 / 640, -92097.0 / 339200, 187.0 / 2100, 1.0 / 40}
)

// Integrate solves x' = f(x), x(t0) = x0 up to t1 > t0.
func Integrate(f Func, t0, t1 float64, x0 []float64, o Options) (*Result, error) {
	if o.RelTol <= 0 {
		o.RelTol = 1e-8
	}
	if o.AbsTol <= 0 {
		o.AbsTol = 1e-10
	}
	if o.MaxSteps <= 0 {
		o.MaxSteps = 100000
	}
	n := len(x0)
	x := append([]float64(nil), x0...)
	res := &Result{T: []float64{t0}, X: [][]float64{append([]float64(nil), x...)}}
	var k [7][]float64
	for i := range k {
		k[i] = make([]float64, n)
	}
	y, xn := make([]float64, n), make([]float64, n)
	f(x, k[0])
	h := initialStep(f, x, k[0], t1-t0, o)
	t := t0
	for t < t1 {
		if res.Accepted+res.Rejected >= o.MaxSteps {
			return res, ErrSteps
		}
		if t+h > t1 {
			h = t1 - t
		}
		for s := 1; s < 7; s++ {
			for i := range n {
				sum := 0.0
				for j := range s {
					sum += dpA[s][j] * k[j][i]
				}
				y[i] = x[i] + h*sum
			}
			f(y, k[s])
		}
		// Stage 7 was evaluated at the fifth-order solution: y = x⁺.
		copy(xn, y)
		e := 0.0
		for i := range n {
			d := 0.0
			for s := range 7 {
				d += (dpB[s] - dpBhat[s]) * k[s][i]
			}
			sc := o.AbsTol + o.RelTol*math.Max(math.Abs(x[i]), math.Abs(xn[i]))
			e += (h * d / sc) * (h * d / sc)
		}
		e = math.Sqrt(e / float64(n))
		if math.IsNaN(e) || math.IsInf(e, 0) {
			return res, ErrNotFinite
		}
		fac := 5.0
		if e > 0 {
			fac = math.Min(5, math.Max(0.2, 0.9*math.Pow(e, -0.2)))
		}
		if e > 1 {
			res.Rejected++
			h *= math.Min(1, fac)
			continue
		}
		res.Accepted++
		t += h
		copy(x, xn)
		k[0], k[6] = k[6], k[0] // first same as last
		res.T = append(res.T, t)
		res.X = append(res.X, append([]float64(nil), x...))
		if o.Stop != nil && o.Stop(t, x) {
			res.Stopped = true
			return res, nil
		}
		h *= fac
	}
	return res, nil
}

// initialStep guesses a first step from the size of x and f(x) (Hairer,
// Nørsett & Wanner's starting step, simplified): h with ‖h·f‖ ≈ 0.01‖x‖.
func initialStep(f Func, x, fx []float64, span float64, o Options) float64 {
	d0, d1 := 0.0, 0.0
	for i := range x {
		sc := o.AbsTol + o.RelTol*math.Abs(x[i])
		d0 += (x[i] / sc) * (x[i] / sc)
		d1 += (fx[i] / sc) * (fx[i] / sc)
	}
	h := 1e-6
	if d0 > 1e-10 && d1 > 1e-10 {
		h = 0.01 * math.Sqrt(d0/d1)
	}
	return math.Min(h, span)
}
