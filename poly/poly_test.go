package poly

import (
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"
)

func testRing() *Ring { return NewRing([]string{"u", "v", "w"}, []string{"g", "h"}) }

// randomPoly builds a polynomial with small random coefficients and degrees.
func randomPoly(rng *rand.Rand, r *Ring, terms, maxExp int, vars []int) *Poly {
	p := Zero(r)
	for k := 0; k < terms; k++ {
		e := make([]int, r.NumVars())
		for _, v := range vars {
			e[v] = rng.IntN(maxExp + 1)
		}
		c := big.NewRat(int64(rng.IntN(41)-20), int64(rng.IntN(9)+1))
		p.Add(p, Monomial(r, e, c))
	}
	return p
}

// Property: printing and parsing give back the same polynomial, for
// polynomials and for rational functions with parameter denominators.
func TestPrintParseRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	r := testRing()
	all := []int{0, 1, 2, 3, 4}
	params := []int{3, 4}
	for i := 0; i < 400; i++ {
		p := randomPoly(rng, r, rng.IntN(6), 3, all)
		f := FromPoly(p)
		if i%2 == 1 {
			d := randomPoly(rng, r, 1+rng.IntN(3), 2, params)
			if d.IsZero() {
				continue
			}
			f = f.Quo(FromPoly(d))
		}
		text := f.String()
		g, err := Parse(r, text)
		if err != nil {
			t.Fatalf("%q does not parse: %v", text, err)
		}
		if !g.Equal(f) {
			t.Fatalf("round trip changed %q into %q", text, g)
		}
		if g.String() != text {
			t.Fatalf("printing is not canonical: %q then %q", text, g)
		}
	}
}

func TestExactNumbers(t *testing.T) {
	r := testRing()
	for _, c := range []struct{ in, want string }{
		{"0.35", "7/20"},
		{"1e-3", "1/1000"},
		{"2.5E+2", "250"},
		{"8/3", "8/3"},
		{"-1/2 + 1/3", "-1/6"},
		{"(1/2)^3", "1/8"},
	} {
		f, err := Parse(r, c.in)
		if err != nil {
			t.Fatalf("%s: %v", c.in, err)
		}
		if got := f.String(); got != c.want {
			t.Errorf("%s = %s, want %s", c.in, got, c.want)
		}
	}
}

func TestParseErrors(t *testing.T) {
	r := testRing()
	for _, c := range []struct{ in, want string }{
		{"u +", "1:4: expected a number, a name or (, found end of line"},
		{"u / v", "1:5: division by an expression in the states"},
		{"u / (g - g)", "1:5: division by zero"},
		{"u^-1", "1:3: expected a non-negative integer exponent"},
		{"u^257", "1:3: exponent 257, above the limit exponent=256 (raise it with --limit exponent=N)"},
		{"(u + v", "1:7: expected ), found end of line"},
		{"u @ v", "1:3: unexpected character"},
		{"q + 1", "1:1: unknown name \"q\""},
		{"u^2^3", "1:4: a^b^c is ambiguous"},
		{"1.2.3", "1:1: malformed number"},
		{"u v", "1:3: expected an operator or the end of the expression"},
	} {
		_, err := Parse(r, c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.in, err, c.want)
		}
	}
}

func TestArithmetic(t *testing.T) {
	r := testRing()
	p := func(s string) RatFunc { return MustParse(r, s) }
	for _, c := range []struct {
		name      string
		got, want RatFunc
	}{
		{"square", p("(u + v)^2"), p("u^2 + 2*u*v + v^2")},
		{"product", p("(u - g)*(u + g)"), p("u^2 - g^2")},
		{"derivative", p("u^3*v + g*u").Derivative(0), p("3*u^2*v + g")},
		// Exact cancellation of a parameter denominator: V = u²/g,
		// u' = g·(v − u) gives 2uv − 2u² with no g left (common practice).
		{"cancellation", p("u^2/g").Derivative(0).Mul(p("g*(v - u)")), p("2*u*v - 2*u^2")},
		{"quotient sum", p("1/g + 1/h"), p("(g + h)/(g*h)")},
		{"quotient power", p("(u/g)^2").Mul(p("g^2")), p("u^2")},
		{"compose", p("u*v").ComposeStates([]RatFunc{p("v + 1"), p("u")}, []bool{true, true, false, false, false}), p("u*v + u")},
		{"homogeneous", p("u + u^2 + g*u*v + u^3").Homogeneous(2, r.StateMask()), p("u^2 + g*u*v")},
		{"coefficient", p("3*g*u*v + h*u*v + u^2").Coefficient([]int{1, 1, 0, 0, 0}, r.StateMask()), p("3*g + h")},
	} {
		if !c.got.Equal(c.want) {
			t.Errorf("%s: got %s, want %s", c.name, c.got, c.want)
		}
	}
	x := MustParse(r, "u^2 - v^2").Num
	var q Poly
	if !q.DivExact(x, MustParse(r, "u - v").Num) || !q.Equal(MustParse(r, "u + v").Num) {
		t.Errorf("(u² − v²)/(u − v) = %s", &q)
	}
	if q.DivExact(x, MustParse(r, "u - 2*v").Num) {
		t.Errorf("u − 2v divides u² − v²?")
	}
	val := MustParse(r, "u^2*g - v/2").Num.Eval([]*big.Rat{big.NewRat(3, 1), big.NewRat(1, 1), new(big.Rat), big.NewRat(2, 3), new(big.Rat)})
	if val.Cmp(big.NewRat(11, 2)) != 0 {
		t.Errorf("eval = %s, want 11/2", val.RatString())
	}
	if d := MustParse(r, "u^2*v + g^5").Num.DegreeIn(r.StateMask()); d != 3 {
		t.Errorf("state degree %d, want 3", d)
	}
}

// The natural interval extension contains the value at every point of the
// box (Moore 1966).
func TestEncloseContainsValues(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	r := testRing()
	for i := 0; i < 200; i++ {
		p := randomPoly(rng, r, 4, 3, []int{3, 4})
		box := make([]Interval, r.NumVars())
		point := make([]*big.Rat, r.NumVars())
		for j := range box {
			lo := big.NewRat(int64(rng.IntN(9)-4), 2)
			hi := new(big.Rat).Add(lo, big.NewRat(int64(rng.IntN(5)+1), 3))
			box[j] = Closed(lo, hi)
			t := big.NewRat(int64(rng.IntN(11)), 10)
			point[j] = new(big.Rat).Add(lo, t.Mul(t, new(big.Rat).Sub(hi, lo)))
		}
		if e := p.Enclose(box); !e.Contains(p.Eval(point)) {
			t.Fatalf("%s: enclosure %s misses the value %s", p, e, p.Eval(point).RatString())
		}
	}
}

func BenchmarkMul(b *testing.B) {
	r := testRing()
	x := MustParse(r, "(u + v + w + g + h + 1)^4").Num
	for b.Loop() {
		new(Poly).Mul(x, x)
	}
}
