package basin

import (
	"math"
	"math/big"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/poly"
)

// rays holds what the float search needs: the equilibrium and V, V̇ in
// float64.
type rays struct {
	at      []float64
	v, vdot certify.FloatPoly
}

func (r *rays) point(u []float64, t float64) []float64 {
	x := make([]float64, len(u))
	for i := range u {
		x[i] = r.at[i] + t*u[i]
	}
	return x
}

// Radii scanned along each ray: geometric from rayMin to rayMax.
const (
	rayMin   = 1e-4
	rayMax   = 1e3
	raySteps = 700
)

// firstRise returns the least V over the points of the ray x* + t·u
// (rayMin ≤ t ≤ rayMax) where V̇ ≥ 0, located to float precision, with the
// parameter t of that point; ok is false when V̇ < 0 at every scanned point.
func (r *rays) firstRise(u []float64) (v, t float64, ok bool) {
	q := math.Pow(rayMax/rayMin, 1/float64(raySteps))
	best := math.Inf(1)
	prev, prevNeg := rayMin, r.vdot.Eval(r.point(u, rayMin)) < 0
	for k := 1; k <= raySteps; k++ {
		s := rayMin * math.Pow(q, float64(k))
		x := r.point(u, s)
		if d := r.vdot.Eval(x); d >= 0 {
			at := s
			if prevNeg { // bisect to the sign change
				lo, hi := prev, s
				for range 80 {
					mid := (lo + hi) / 2
					if r.vdot.Eval(r.point(u, mid)) >= 0 {
						hi = mid
					} else {
						lo = mid
					}
				}
				at = hi
			}
			if w := r.v.Eval(r.point(u, at)); w < best {
				best, t, ok = w, at, true
			}
			prevNeg = false
		} else {
			prevNeg = true
		}
		prev = s
		if ok && r.v.Eval(x) > 4*best+1 {
			break // V far above the best already: nothing lower further out on a growing V
		}
	}
	return best, t, ok
}

// lowestRise searches the directions for the least V at a point with V̇ ≥ 0,
// then refines the best direction by a pattern search on the sphere.
func (r *rays) lowestRise(n int) (x []float64, v float64, ok bool) {
	count := map[int]int{1: 2, 2: 1440, 3: 3000}[n]
	if count == 0 {
		count = 1500 * n
	}
	var bu []float64
	bt := 0.0
	v = math.Inf(1)
	for _, u := range directions(n, count) {
		if w, t, found := r.firstRise(u); found && w < v {
			v, bu, bt, ok = w, u, t, true
		}
	}
	if !ok {
		return nil, 0, false
	}
	for step := 0.02; step > 1e-10 && n > 1; {
		improved := false
		for i := range n {
			for _, s := range []float64{step, -step} {
				u := append([]float64(nil), bu...)
				u[i] += s
				u = unit(u)
				if w, t, found := r.firstRise(u); found && w < v {
					v, bu, bt, improved = w, u, t, true
				}
			}
		}
		if !improved {
			step /= 2
		}
	}
	return r.point(bu, bt), v, true
}

// exactRise returns a rational point near x, other than the equilibrium,
// with V̇ ≥ 0 exactly: x rounded (outward from x*, or to nearest) to the fewest decimals that keep V̇ ≥ 0 and
// V within a relative 1e-7 of V at x, or failing that x itself pushed
// outward along its ray.
func exactRise(v, vdot *poly.Poly, at []*big.Rat, x []float64, vx float64) ([]*big.Rat, bool) {
	n := len(x)
	good := func(p []*big.Rat) bool {
		same := true
		for i := range p {
			same = same && p[i].Cmp(at[i]) == 0
		}
		if same || vdot.Eval(p).Sign() < 0 {
			return false
		}
		w, _ := v.Eval(p).Float64()
		return w <= vx+1e-7*math.Abs(vx)+1e-300
	}
	atf := make([]float64, n)
	for i := range at {
		atf[i], _ = at[i].Float64()
	}
	for digits := 1; digits <= 17; digits++ {
		for _, away := range []bool{true, false} {
			p := make([]*big.Rat, n)
			for i := range x {
				if away { // |x − x*| rounded up: outward, where V̇ ≥ 0 is likelier
					p[i] = new(big.Rat).Add(at[i], decimalAway(x[i]-atf[i], digits))
				} else {
					p[i] = decimal(x[i], digits)
				}
			}
			if good(p) {
				return p, true
			}
		}
	}
	for eps := 1e-12; eps < 1e-2; eps *= 4 {
		p := make([]*big.Rat, n)
		for i := range x {
			p[i] = new(big.Rat).SetFloat64(atf[i] + (x[i]-atf[i])*(1+eps))
		}
		if vdot.Eval(p).Sign() >= 0 {
			return p, true
		}
	}
	return nil, false
}

// decimalAway returns x rounded away from zero to the given number of
// significant digits.
func decimalAway(x float64, digits int) *big.Rat {
	if x == 0 {
		return new(big.Rat)
	}
	e := int(math.Floor(math.Log10(math.Abs(x)))) - digits + 1
	m := math.Ceil(math.Abs(x) / math.Pow(10, float64(e)))
	r := new(big.Rat).SetFloat64(math.Copysign(m, x))
	p := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(abs(e))), nil))
	if e >= 0 {
		return r.Mul(r, p)
	}
	return r.Quo(r, p)
}

// decimal returns x rounded to the given number of significant digits.
func decimal(x float64, digits int) *big.Rat {
	if x == 0 {
		return new(big.Rat)
	}
	e := int(math.Floor(math.Log10(math.Abs(x)))) - digits + 1
	m := math.Round(x / math.Pow(10, float64(e)))
	r := new(big.Rat).SetFloat64(m)
	p := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(abs(e))), nil))
	if e >= 0 {
		return r.Mul(r, p)
	}
	return r.Quo(r, p)
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// extent returns, per state, the largest |xᵢ − xᵢ*| over the points of the
// rays where V first exceeds c: the half-widths of a box that holds the
// star-shaped part of {V ≤ c} around x*.
func (r *rays) extent(n int, c float64) []float64 {
	out := make([]float64, n)
	count := map[int]int{1: 2, 2: 720, 3: 2000}[n]
	if count == 0 {
		count = 1000 * n
	}
	for _, u := range directions(n, count) {
		lo, hi := 0.0, rayMin
		for hi < rayMax && r.v.Eval(r.point(u, hi)) <= c {
			lo, hi = hi, hi*1.25
		}
		for range 60 {
			mid := (lo + hi) / 2
			if r.v.Eval(r.point(u, mid)) <= c {
				lo = mid
			} else {
				hi = mid
			}
		}
		for i := range n {
			out[i] = math.Max(out[i], hi*math.Abs(u[i]))
		}
	}
	return out
}
