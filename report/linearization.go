package report

import (
	"math"
	"math/big"
	"strings"

	"github.com/lyacert/lyacert/checker"
)

// linearizationView is the section of a certificate that rests on the
// linearization at one equilibrium (Lyapunov's indirect method).
type linearizationView struct {
	Equilibrium rich      // the point, or the box that holds it alone
	Krawczyk    rich      // why the box holds exactly one equilibrium; nil for a point
	P           []display // P = (…)
	V           []display // V = (x − x*)ᵀ P (x − x*)
	MRule       []display // M(x) = …
	Decay       []display // the enclosure of M (at the point, exact)
	Conclusion  rich
	Rounded     bool // entries are shown as decimals
}

// decimalOutward shows q with k significant digits, rounded down (up when
// up is set), so that an interval shown with such ends contains the exact
// one.
func decimalOutward(q *big.Rat, k int, up bool) string {
	if q.Sign() == 0 {
		return "0"
	}
	f, _ := new(big.Rat).Abs(q).Float64()
	e := int(math.Floor(math.Log10(f)))
	shift := k - 1 - e
	scale := new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(abs(shift))), nil))
	x := new(big.Rat).Set(q)
	if shift >= 0 {
		x.Mul(x, scale)
	} else {
		x.Quo(x, scale)
	}
	n := new(big.Int).Div(x.Num(), x.Denom()) // floor (Euclidean division, positive denominator)
	if up && !x.IsInt() {
		n.Add(n, big.NewInt(1))
	}
	r := new(big.Rat).SetInt(n)
	if shift >= 0 {
		r.Quo(r, scale)
		s := r.FloatString(shift)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
		}
		return s
	}
	return r.Mul(r, scale).RatString()
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

// shortRat reports a rational short enough to show exactly.
func shortRat(s string) (*big.Rat, bool) {
	q, ok := new(big.Rat).SetString(s)
	return q, ok && len(q.RatString()) <= 12
}

func (b *builder) linearization(p *page) error {
	lz, kz := b.doc.Linearization, b.doc.Krawczyk
	if lz == nil {
		return nil
	}
	m := b.m
	v := &linearizationView{}
	rounded := false
	// An enclosure is shown exactly when its ends are short, otherwise with
	// outward-rounded decimals of at least digits significant digits, as
	// many as it takes to tell the ends apart.
	ivNode := func(iv [2]string, digits int) node {
		lo, ok1 := shortRat(iv[0])
		hi, ok2 := shortRat(iv[1])
		if ok1 && ok2 {
			if lo.Cmp(hi) == 0 {
				return ratNode(lo)
			}
			return interval{lo: ratNode(lo), hi: ratNode(hi), loClosed: true, hiClosed: true}
		}
		lo, _ = new(big.Rat).SetString(iv[0])
		hi, _ = new(big.Rat).SetString(iv[1])
		if lo == nil || hi == nil {
			return symbol{texText(iv[0] + ", " + iv[1]), mtext(iv[0] + ", " + iv[1])}
		}
		rounded = true
		var a, b string
		for k := digits; k <= 40; k += 2 {
			a, b = decimalOutward(lo, k, false), decimalOutward(hi, k, true)
			if a != b || lo.Cmp(hi) == 0 {
				break
			}
		}
		if lo.Cmp(hi) == 0 {
			return decimalSym(a)
		}
		return interval{lo: decimalSym(a), hi: decimalSym(b), loClosed: true, hiClosed: true}
	}
	star := func(s string) node {
		return symbol{texName(s) + "^{*}", "<msup>" + htmlName(s) + mo("*") + "</msup>"}
	}
	if kz != nil {
		var box list
		for i, s := range m.States {
			box = append(box, relation{star(s), symIn, ivNode(kz.Box[i], 10)})
		}
		v.Equilibrium = rich{"The equilibrium ", symbol{"x^{*}", xStar}, " is the only one in the box ", box, "."}
		v.Krawczyk = rich{"The Krawczyk operator of the box lies in its interior, which proves that the box holds exactly one equilibrium (Krawczyk 1969; Moore 1977); the certificate states the operator's exact image and the preconditioner used."}
	} else {
		var at list
		for i, s := range m.States {
			at = append(at, relation{star(s), symEq, ratFuncNode(m.At[i])})
		}
		v.Equilibrium = rich{"The equilibrium is the rational point ", at, ", where the right-hand side vanishes exactly."}
	}
	pm, err := b.matrix(lz.P)
	if err != nil {
		return err
	}
	pSym := symbol{"P", "<mi>P</mi>"}
	v.P = []display{{pSym, pm, nil}}
	dx := symbol{`(x - x^{*})`, mrow("<mo>(</mo><mi>x</mi><mo>−</mo>" + xStar + "<mo>)</mo>")}
	v.V = []display{{vSym, symbol{dx.t + `^{\mathsf{T}} P\, ` + dx.t, mrow("<msup>" + dx.m + transpose + "</msup><mi>P</mi>" + thinSpace + dx.m)}, nil}}
	mSym := symbol{"M(x)", mrow("<mi>M</mi><mo>(</mo><mi>x</mi><mo>)</mo>")}
	jT := "<msup>" + jac.m + transpose + "</msup>"
	if m.Discrete {
		v.MRule = []display{{mSym, symbol{`P - J(x)^{\mathsf{T}} P\, J(x)`, mrow("<mi>P</mi><mo>−</mo>" + jT + "<mi>P</mi>" + thinSpace + jac.m)}, nil}}
	} else {
		v.MRule = []display{{mSym, symbol{`-\left(J(x)^{\mathsf{T}} P + P\, J(x)\right)`, mrow("<mo>−</mo><mrow><mo>(</mo>" + jT + "<mi>P</mi><mo>+</mo><mi>P</mi>" + thinSpace + jac.m + "<mo>)</mo></mrow>")}, nil}}
	}
	var dm matrix
	for i, row := range lz.Decay {
		dm = append(dm, nil)
		for _, iv := range row {
			dm[i] = append(dm[i], ivNode(iv, 4)) // a looser enclosure, still one
		}
	}
	lhs := symbol{"M(x^{*})", mrow("<mi>M</mi><mo>(</mo>" + xStar + "<mo>)</mo>")}
	if kz != nil {
		// M over the whole box, entry by entry: it holds M(x*) wherever in
		// the box x* is.
		v.Decay = []display{{LHS: mSym, RHS: dm, Op: symIn}}
	} else {
		v.Decay = []display{{LHS: lhs, RHS: dm}}
	}
	v.Rounded = rounded
	switch b.doc.Claim {
	case checker.KindUnstable:
		v.Conclusion = rich{"The matrix ", lhs, " is positive definite (for every matrix in the enclosure), and ", pSym, " has a negative pivot in its exact ", ldlT, " factorization: ", symbol{"W = -V", mrow("<mi>W</mi><mo>=</mo><mo>−</mo><mi>V</mi>")}, " increases near the equilibrium and is positive arbitrarily close to it, so the equilibrium is unstable (Lyapunov's instability theorem)."}
	case checker.KindGlobal:
		v.Conclusion = rich{"The matrices ", pSym, " and ", lhs, " are positive definite (exact ", ldlT, " with positive pivots). The right-hand side is affine: its Jacobian is constant and the linearization is the model itself, so ", vSym, " decreases everywhere, not only near the equilibrium, and grows without bound; the equilibrium is globally asymptotically stable (Lyapunov's direct method)."}
	default:
		v.Conclusion = rich{"The matrices ", pSym, " and ", lhs, " are positive definite (exact ", ldlT, " with positive pivots; for ", lhs, " every matrix in the enclosure), so ", vSym, " decreases near the equilibrium: it is locally asymptotically stable (Lyapunov's indirect method)."}
	}
	p.Linearization = v
	if kz != nil {
		p.Equilibrium = rich{"The equilibrium is not a rational point: see the linearization below for the box that holds it."}
	}
	return nil
}

var (
	// xStar is x*, the equilibrium.
	xStar = "<msup><mi>x</mi><mo>*</mo></msup>"
	ldlT  = symbol{`L\,D\,L^{\mathsf{T}}`, mrow("<mi>L</mi>" + thinSpace + "<mi>D</mi>" + thinSpace + "<msup><mi>L</mi>" + transpose + "</msup>")}
)
