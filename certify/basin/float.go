package basin

import (
	"math"
)

// directions returns unit vectors spread over the sphere in n dimensions:
// equal angles in the plane, a Fibonacci lattice on the 2-sphere (common
// practice), and a fixed pseudo-random sample beyond.
func directions(n, count int) [][]float64 {
	out := make([][]float64, 0, count)
	switch n {
	case 1:
		return [][]float64{{1}, {-1}}
	case 2:
		for k := range count {
			a := 2 * math.Pi * float64(k) / float64(count)
			out = append(out, []float64{math.Cos(a), math.Sin(a)})
		}
	case 3:
		golden := math.Pi * (3 - math.Sqrt(5))
		for k := range count {
			z := 1 - 2*(float64(k)+0.5)/float64(count)
			r := math.Sqrt(1 - z*z)
			a := golden * float64(k)
			out = append(out, []float64{r * math.Cos(a), r * math.Sin(a), z})
		}
	default:
		s := uint64(0x9e3779b97f4a7c15)
		next := func() float64 { // xorshift64*, then a Box–Muller normal
			s ^= s >> 12
			s ^= s << 25
			s ^= s >> 27
			return float64((s*0x2545f4914f6cdd1d)>>11) / (1 << 53)
		}
		for range count {
			u := make([]float64, n)
			for i := range u {
				u[i] = math.Sqrt(-2*math.Log(next()+1e-300)) * math.Cos(2*math.Pi*next())
			}
			out = append(out, unit(u))
		}
	}
	return out
}

func unit(u []float64) []float64 {
	s := 0.0
	for _, x := range u {
		s += x * x
	}
	s = math.Sqrt(s)
	for i := range u {
		u[i] /= s
	}
	return u
}
