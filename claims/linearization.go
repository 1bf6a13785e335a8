package claims

import (
	"math/big"

	"github.com/lyacert/lyacert/poly"
)

// KrawczykEnclosure proves that a box holds exactly one equilibrium of a
// model without free parameters and without an "at" point (Krawczyk 1969;
// Moore 1977): with g = f (continuous time) or g = f − x (discrete time), J
// its Jacobian, Y a rational preconditioner and m the box's midpoint,
// K(X) = m − Y·g(m) + (I − Y·J(X))·(X − m) lies in the interior of X. Box
// has one closed [lo, hi] per state; every number is in canonical form.
type KrawczykEnclosure struct {
	Box            [][2]string `json:"box"`
	Preconditioner [][]string  `json:"preconditioner"` // Y
	Krawczyk       [][2]string `json:"krawczyk"`       // K(Box), recomputed
}

// Linearization certifies the stability or the instability of one
// equilibrium x* of a model without free parameters through its
// linearization (Lyapunov's indirect method). x* is the model's "at" point,
// a rational zero of the equations, or the box of a preceding
// KrawczykEnclosure. With J(x) the Jacobian of f, Decay encloses over the box
// (or gives at the point) the symmetric matrix
//
//	M(x) = −(J(x)ᵀP + P·J(x))   (continuous time)
//	M(x) = P − J(x)ᵀP·J(x)      (discrete time)
//
// The rule requires M(x*) ≻ 0; then P ≻ 0 gives local asymptotic stability
// (V = (x − x*)ᵀP(x − x*) decreases near x*) and a negative LDLᵀ pivot of P
// gives instability (W = −V increases near x* and is positive arbitrarily
// close to it: Lyapunov's instability theorem). When every fᵢ has degree ≤ 1
// the linearization is exact, f(x) = J·(x − x*), so V̇ (ΔV) equals
// −(x − x*)ᵀM(x − x*) everywhere and P ≻ 0 gives global asymptotic stability
// (Lyapunov's direct method, V radially unbounded).
type Linearization struct {
	P     [][]string    `json:"p"`     // symmetric
	Decay [][][2]string `json:"decay"` // M entrywise over the box, recomputed
}

func (*KrawczykEnclosure) Rule() string { return "krawczyk-enclosure" }
func (*Linearization) Rule() string     { return "linearization" }

// Sides reads the box: one closed side [lo, hi] per entry, canonical
// rational ends, lo < hi.
func (k *KrawczykEnclosure) Sides() ([]poly.Interval, error) {
	lo, hi := make([]string, len(k.Box)), make([]string, len(k.Box))
	for i, s := range k.Box {
		lo[i], hi[i] = s[0], s[1]
	}
	return closedBox(lo, hi)
}

// RatMatrix reads an n×n matrix of canonical rationals (CanonicalRat),
// symmetric when asked.
func RatMatrix(rows [][]string, n int, symmetric bool) ([][]*big.Rat, bool) {
	out := make([][]*big.Rat, n)
	ok := len(rows) == n
	for i := 0; ok && i < n; i++ {
		out[i] = make([]*big.Rat, n)
		ok = len(rows[i]) == n
		for j := 0; ok && j < n; j++ {
			out[i][j], ok = CanonicalRat(rows[i][j])
		}
	}
	for i := 0; ok && symmetric && i < n*n; i++ {
		ok = out[i/n][i%n].Cmp(out[i%n][i/n]) == 0
	}
	return out, ok
}
