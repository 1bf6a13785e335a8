package checker

import (
	"math/big"
	"os"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

// TestLinearizationForgeries changes a valid certificate consistently — the
// derived numbers recomputed so that only the mathematics can object — and
// requires Verify to reject it; and the verdict is the one the mathematics
// gives, whatever the file says.
func TestLinearizationForgeries(t *testing.T) {
	load := func(name string) *claims.Document {
		f, err := os.Open(filepath.Join("..", "testdata", "certificates", name))
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		d, err := claims.Read(f)
		if err != nil {
			t.Fatal(err)
		}
		if !Verify(d).Valid {
			t.Fatalf("%s does not verify", name)
		}
		return d
	}
	// Lorenz 1963 at σ = 10, b = 8/3, r = 20: the origin is a saddle, C− is
	// stable (Strogatz §9.2: C± lose stability at r ≈ 24.74).
	// Ogata, Modern Control Engineering: x' = A·x with A = [[0, 1], [−1, −1]]
	// is globally asymptotically stable (an affine model: the linearization
	// is the model); a map x+ = x/2 likewise (common practice); s³ + s² + s + 2
	// has roots in the right half-plane (Routh–Hurwitz: a2·a1 < a0).
	for file, want := range map[string]string{"lin-lorenz-r20-origin.json": KindUnstable, "lin-lorenz-r20-cminus.json": KindLocal,
		"lin-ogata.json": KindGlobal, "lin-discrete.json": KindGlobal, "lin-companion3-unstable.json": KindUnstable} {
		if got := Verify(load(file)).Kind; got != want {
			t.Errorf("%s: derived %s, want %s", file, got, want)
		}
	}
	seal := func(d *claims.Document) {
		var err error
		if d.Digest, err = d.ComputeDigest(); err != nil {
			t.Fatal(err)
		}
	}
	forgeries := []struct {
		name, file string
		change     func(d *claims.Document)
	}{
		{"box moved off the equilibrium, K recomputed", "lin-quadmap.json", func(d *claims.Document) {
			kz := firstClaim[*claims.KrawczykEnclosure](d)
			lo, hi := ratOf(kz.Box[0][0]), ratOf(kz.Box[0][1])
			shift := big.NewRat(1, 1000)
			box := []poly.Interval{poly.Closed(lo.Add(lo, shift), hi.Add(hi, shift))}
			kz.Box[0] = claims.IntervalText(box[0])
			r := poly.NewRing([]string{"x"}, nil)
			g := []*poly.Poly{poly.MustParse(r, "x^2 - 1/2 - x").Num}
			k := poly.KrawczykImage(g, box, ratMatrix([]string{kz.Preconditioner[0][0]}))
			kz.Krawczyk[0] = claims.IntervalText(k[0])
		}},
		{"P replaced by an indefinite one, decay recomputed", "lin-logistic.json", func(d *claims.Document) {
			lz := firstClaim[*claims.Linearization](d)
			p := ratMatrix([]string{"-1"})
			r := poly.NewRing([]string{"x"}, nil)
			f := []*poly.Poly{poly.MustParse(r, "-5/2*x^2 + 5/2*x").Num}
			e := poly.DecayEnclosure(f, true, p, []poly.Interval{poly.Point(big.NewRat(3, 5))})
			lz.P = [][]string{{"-1"}}
			lz.Decay = [][][2]string{{claims.IntervalText(e[0][0])}}
		}},
		// Ogata's A with P = I: M = −(A + Aᵀ) = [[0, 0], [0, 2]] is singular
		// (hand computation); a stability claim needs M ≻ 0.
		{"affine model, P = I, M recomputed (singular)", "lin-ogata.json", func(d *claims.Document) {
			setP(d, ratMatrix([]string{"1", "0"}, []string{"0", "1"}), ogataF(), false)
		}},
		// P = [[1, 2], [2, 1]] is indefinite; M = [[4, 2], [2, −2]] (hand
		// computation) is indefinite too.
		{"affine model, indefinite P, M recomputed", "lin-ogata.json", func(d *claims.Document) {
			setP(d, ratMatrix([]string{"1", "2"}, []string{"2", "1"}), ogataF(), false)
		}},
		{"affine model, P changed, M left as it was", "lin-ogata.json", func(d *claims.Document) {
			firstClaim[*claims.Linearization](d).P[0][0] = "7/5"
		}},
		{"affine model, one entry of M changed", "lin-ogata.json", func(d *claims.Document) {
			firstClaim[*claims.Linearization](d).Decay[1][1] = [2]string{"2", "2"}
		}},
		{"affine map, P scaled to a negative definite one, M recomputed", "lin-discrete.json", func(d *claims.Document) {
			lz := firstClaim[*claims.Linearization](d)
			p := make([][]*big.Rat, len(lz.P))
			for i := range lz.P {
				for _, v := range lz.P[i] {
					p[i] = append(p[i], new(big.Rat).Neg(ratOf(v)))
				}
			}
			r := poly.NewRing([]string{"x", "y"}, nil)
			setP(d, p, []*poly.Poly{poly.MustParse(r, "x/2").Num, poly.MustParse(r, "y/2").Num}, true)
		}},
		{"a candidate V slipped in", "lin-logistic.json", func(d *claims.Document) {
			d.Claims = append([]claims.Claim{&claims.OrbitalDerivative{V: "x^2", Vdot: "0"}}, d.Claims...)
		}},
		{"model with a free parameter", "lin-logistic.json", func(d *claims.Document) {
			d.Model = "state x\nparameter r in [0, 4]\nx+ = r*x*(1 - x)\nat x = 3/5\n"
		}},
	}
	// The control: P doubled is still a Lyapunov matrix (M doubles), so the
	// same recomputation gives a valid certificate and the global claim.
	d := load("lin-ogata.json")
	setP(d, ratMatrix([]string{"3", "1"}, []string{"1", "2"}), ogataF(), false)
	seal(d)
	if out := Verify(d); !out.Valid || out.Kind != KindGlobal {
		t.Errorf("Ogata with P = 2·[[3/2, 1/2], [1/2, 1]]: valid %v, kind %s", out.Valid, out.Kind)
	}
	for _, f := range forgeries {
		d := load(f.file)
		f.change(d)
		seal(d)
		if Verify(d).Valid {
			t.Errorf("%s: accepted", f.name)
		}
	}
}

// ogataF is Ogata's right-hand side (x1' = x2, x2' = −x1 − x2).
func ogataF() []*poly.Poly {
	r := poly.NewRing([]string{"x1", "x2"}, nil)
	return []*poly.Poly{poly.MustParse(r, "x2").Num, poly.MustParse(r, "-x1 - x2").Num}
}

// setP puts p in the document's linearization claim with the decay matrix
// recomputed at the origin, so that only the signs can object.
func setP(d *claims.Document, p [][]*big.Rat, f []*poly.Poly, discrete bool) {
	lz := firstClaim[*claims.Linearization](d)
	box := make([]poly.Interval, len(p))
	for i := range box {
		box[i] = poly.Point(new(big.Rat))
	}
	e := poly.DecayEnclosure(f, discrete, p, box)
	lz.P, lz.Decay = make([][]string, len(p)), make([][][2]string, len(p))
	for i := range p {
		for j := range p[i] {
			lz.P[i] = append(lz.P[i], poly.RatString(p[i][j]))
			lz.Decay[i] = append(lz.Decay[i], claims.IntervalText(e[i][j]))
		}
	}
}

func ratOf(s string) *big.Rat {
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		panic(s)
	}
	return q
}

func ratMatrix(rows ...[]string) [][]*big.Rat {
	out := make([][]*big.Rat, len(rows))
	for i, r := range rows {
		for _, s := range r {
			out[i] = append(out[i], ratOf(s))
		}
	}
	return out
}

func firstClaim[T claims.Claim](d *claims.Document) T {
	for _, c := range d.Claims {
		if t, ok := c.(T); ok {
			return t
		}
	}
	var zero T
	return zero
}
