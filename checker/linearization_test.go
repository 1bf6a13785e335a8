package checker

import (
	"math/big"
	"os"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

// TestLinearizationForgeries changes a valid certificate consistently — the
// derived numbers recomputed so that only the mathematics can object — and
// requires Verify to reject it; and the verdict is the one the mathematics
// gives, whatever the file says.
func TestLinearizationForgeries(t *testing.T) {
	load := func(name string) *Document {
		f, err := os.Open(filepath.Join("..", "testdata", "certificates", name))
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		d, err := Read(f)
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
	for file, want := range map[string]string{"lin-lorenz-r20-origin.json": KindUnstable, "lin-lorenz-r20-cminus.json": KindLocal} {
		if got := Verify(load(file)).Kind; got != want {
			t.Errorf("%s: derived %s, want %s", file, got, want)
		}
	}
	seal := func(d *Document) {
		var err error
		if d.Digest, err = d.ComputeDigest(); err != nil {
			t.Fatal(err)
		}
	}
	forgeries := []struct {
		name, file string
		change     func(d *Document)
	}{
		{"box moved off the equilibrium, K recomputed", "lin-quadmap.json", func(d *Document) {
			kz := firstClaim[*KrawczykEnclosure](d)
			lo, hi := ratOf(kz.Box[0][0]), ratOf(kz.Box[0][1])
			shift := big.NewRat(1, 1000)
			box := []poly.Interval{poly.Closed(lo.Add(lo, shift), hi.Add(hi, shift))}
			kz.Box[0] = IntervalText(box[0])
			r := poly.NewRing([]string{"x"}, nil)
			g := []*poly.Poly{poly.MustParse(r, "x^2 - 1/2 - x").Num}
			k := poly.KrawczykImage(g, box, ratMatrix([]string{kz.Preconditioner[0][0]}))
			kz.Krawczyk[0] = IntervalText(k[0])
		}},
		{"P replaced by an indefinite one, decay recomputed", "lin-logistic.json", func(d *Document) {
			lz := firstClaim[*Linearization](d)
			p := ratMatrix([]string{"-1"})
			r := poly.NewRing([]string{"x"}, nil)
			f := []*poly.Poly{poly.MustParse(r, "-5/2*x^2 + 5/2*x").Num}
			e := poly.DecayEnclosure(f, true, p, []poly.Interval{poly.Point(big.NewRat(3, 5))})
			lz.P = [][]string{{"-1"}}
			lz.Decay = [][][2]string{{IntervalText(e[0][0])}}
		}},
		{"a candidate V slipped in", "lin-logistic.json", func(d *Document) {
			d.Claims = append([]Claim{&OrbitalDerivative{V: "x^2", Vdot: "0"}}, d.Claims...)
		}},
		{"model with a free parameter", "lin-logistic.json", func(d *Document) {
			d.Model = "state x\nparameter r in [0, 4]\nx+ = r*x*(1 - x)\nat x = 3/5\n"
		}},
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

func firstClaim[T Claim](d *Document) T {
	for _, c := range d.Claims {
		if t, ok := c.(T); ok {
			return t
		}
	}
	var zero T
	return zero
}
