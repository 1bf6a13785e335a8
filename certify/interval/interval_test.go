package interval

import (
	"math"
	"math/big"
	"math/rand/v2"
	"strconv"
	"testing"
)

// Sources named in the tables:
//   - "IEEE 1788-2015": the set-based flavor (intervals are sets of reals,
//     never containing infinity; results contain the range of the real
//     operation).
//   - "Moore": R. E. Moore, Interval Analysis (1966), endpoint formulas.
//   - "outward rounding": the one-ulp widening documented in doc.go.
//   - "brief": an example fixed by the task statement.

var (
	inf    = math.Inf(1)
	twoMax = new(big.Rat).Mul(new(big.Rat).SetFloat64(math.MaxFloat64), big.NewRat(2, 1)).RatString()
)

// ratOrInf is an extended rational: r finite when inf == 0.
type ratOrInf struct {
	r   *big.Rat
	inf int
}

func parseEnd(s string) ratOrInf {
	switch s {
	case "-inf":
		return ratOrInf{inf: -1}
	case "+inf":
		return ratOrInf{inf: +1}
	}
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		panic("bad rational " + s)
	}
	return ratOrInf{r: r}
}

// lowerOK reports whether the float lower end lo is <= e; upperOK whether
// hi >= e.
func lowerOK(lo float64, e ratOrInf) bool {
	switch {
	case lo == -inf:
		return true
	case e.inf != 0:
		return false // finite lo cannot be below -inf; +inf is no lower end
	}
	return new(big.Rat).SetFloat64(lo).Cmp(e.r) <= 0
}

func upperOK(hi float64, e ratOrInf) bool {
	switch {
	case hi == inf:
		return true
	case e.inf != 0:
		return false
	}
	return new(big.Rat).SetFloat64(hi).Cmp(e.r) >= 0
}

// checkEnclosure checks that got encloses the exact interval [lo, hi] and
// that each finite end is within ulps float64 steps of the exact end; with
// tight set, the ends must be the floats FromRat gives for the exact ends.
func checkEnclosure(t *testing.T, what string, got F, lo, hi string, ulps int, tight bool) {
	t.Helper()
	if !valid(got) {
		t.Errorf("%s = %v: not a valid interval", what, got)
		return
	}
	el, eh := parseEnd(lo), parseEnd(hi)
	if !lowerOK(got.Lo, el) || !upperOK(got.Hi, eh) {
		t.Errorf("%s = %v does not contain [%s, %s]", what, got, lo, hi)
		return
	}
	var wl, wh float64 // tightest float ends
	if el.inf != 0 {
		wl = float64(el.inf) * inf
	} else {
		wl = FromRat(el.r).Lo
	}
	if eh.inf != 0 {
		wh = float64(eh.inf) * inf
	} else {
		wh = FromRat(eh.r).Hi
	}
	if tight {
		if got.Lo != wl || got.Hi != wh {
			t.Errorf("%s = %v, want exactly %v", what, got, F{wl, wh})
		}
		return
	}
	l, h := wl, wh
	for range ulps {
		l, h = down(l), up(h)
	}
	if got.Lo < l || got.Hi > h {
		t.Errorf("%s = %v: more than %d ulps wider than [%s, %s]", what, got, ulps, lo, hi)
	}
}

// rmul and radd return the exact product and sum of float64 values.
func rmul(vs ...float64) string {
	p := big.NewRat(1, 1)
	for _, v := range vs {
		p.Mul(p, new(big.Rat).SetFloat64(v))
	}
	return p.RatString()
}

func radd(a, b float64) string {
	return new(big.Rat).Add(new(big.Rat).SetFloat64(a), new(big.Rat).SetFloat64(b)).RatString()
}

func valid(x F) bool {
	return x.Lo <= x.Hi && x.Lo != inf && x.Hi != -inf // false on NaN
}

type binCase struct {
	x, y   F
	lo, hi string // exact result
	ulps   int
	tight  bool // ends must be exact
	source string
}

func runBin(t *testing.T, op string, f func(x, y F) F, tests []binCase) {
	t.Helper()
	for _, tc := range tests {
		if !valid(tc.x) || !valid(tc.y) {
			t.Fatalf("invalid operand in case %v %s %v", tc.x, op, tc.y)
		}
		checkEnclosure(t, tc.x.String()+" "+op+" "+tc.y.String(), f(tc.x, tc.y), tc.lo, tc.hi, tc.ulps, tc.tight)
		if tc.source == "" {
			t.Errorf("case %v %s %v names no source", tc.x, op, tc.y)
		}
	}
}

func TestMul(t *testing.T) {
	max := math.MaxFloat64
	runBin(t, "×", F.Mul, []binCase{
		{F{0, inf}, F{0, 0}, "0", "0", 0, true, "brief; IEEE 1788-2015 set-based multiplication: 0 × unbounded = 0"},
		{F{0, 0}, F{-inf, inf}, "0", "0", 0, true, "IEEE 1788-2015 set-based multiplication: [0, 0] × Entire = [0, 0]"},
		{F{1, inf}, F{-1, 2}, "-inf", "+inf", 0, true, "brief; IEEE 1788-2015 infinite ends"},
		{F{-inf, inf}, F{2, 3}, "-inf", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{0, inf}, F{0, inf}, "0", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{-inf, -1}, F{-inf, -1}, "1", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{0, 1}, F{1, inf}, "0", "+inf", 0, true, "IEEE 1788-2015: 0 end × unbounded"},
		{F{-2, 3}, F{-5, 4}, "-15", "12", 0, true, "Moore: min/max of endpoint products; exact floats stay exact"},
		{F{1, 2}, F{3, 4}, "3", "8", 0, true, "Moore"},
		{F{-2, -1}, F{3, 4}, "-8", "-3", 0, true, "Moore"},
		{F{-2, -1}, F{-4, 3}, "-6", "8", 0, true, "Moore"},
		{F{2, 2}, F{3, 3}, "6", "6", 0, true, "IEEE 1788-2015: zero-width"},
		{F{0.1, 0.1}, F{3, 3}, rmul(0.1, 3), rmul(0.1, 3), 0, true, "outward rounding: inexact product, the two floats around it"},
		{F{0.1, 1.0 / 3}, F{-3, 0.7}, rmul(1.0/3, -3), rmul(1.0/3, 0.7), 0, true, "outward rounding: mixed signs, inexact ends"},
		{F{max, max}, F{2, 2}, twoMax, twoMax, 0, true, "outward rounding: overflow, lower end back to MaxFloat64"},
		{F{1e-300, 1e-300}, F{1e-300, 1e-300}, rmul(1e-300, 1e-300), rmul(1e-300, 1e-300), 0, true, "outward rounding: underflow to 0 below, SmallestNonzero above"},
		{F{-1e-160, -1e-160}, F{1e-160, 1e-160}, rmul(-1e-160, 1e-160), rmul(-1e-160, 1e-160), 1, false, "outward rounding: subnormal product, widened without the FMA check"},
	})
}

func TestAddSub(t *testing.T) {
	runBin(t, "+", F.Add, []binCase{
		{F{1, 2}, F{3, 5}, "4", "7", 0, true, "Moore: [a+c, b+d]"},
		{F{2, 2}, F{3, 3}, "5", "5", 0, true, "IEEE 1788-2015: zero-width; exact floats stay exact"},
		{F{0.1, 0.1}, F{0.2, 0.2}, radd(0.1, 0.2), radd(0.1, 0.2), 0, true, "outward rounding: inexact sum, the two floats around it"},
		{F{1, 1}, F{0x1p-60, 0x1p-60}, radd(1, 0x1p-60), radd(1, 0x1p-60), 0, true, "outward rounding: tiny addend lost in rounding"},
		{F{1, 2}, F{0, 0}, "1", "2", 0, true, "outward rounding: x + 0 is exact"},
		{F{0, inf}, F{-inf, 0}, "-inf", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{-inf, 1.5}, F{0.5, 0.5}, "-inf", "2", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{math.MaxFloat64, math.MaxFloat64}, F{math.MaxFloat64, math.MaxFloat64}, twoMax, "+inf", 0, true, "outward rounding: overflow"},
	})
	runBin(t, "-", F.Sub, []binCase{
		{F{1, 2}, F{3, 5}, "-4", "-1", 0, true, "Moore: [a-d, b-c]"},
		{F{0, 1}, F{0, 1}, "-1", "1", 0, true, "IEEE 1788-2015: x - x is not 0 (dependency); zero ends exact"},
		{F{0, inf}, F{0, inf}, "-inf", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{3, 3}, F{3, 3}, "0", "0", 0, true, "IEEE 1788-2015: zero-width"},
	})
	if got := (F{-inf, 1.5}).Neg(); got != (F{-1.5, inf}) {
		t.Errorf("Neg = %v", got)
	}
}

func TestPow(t *testing.T) {
	tests := []struct {
		x      F
		n      int
		lo, hi string
		ulps   int
		tight  bool
		source string
	}{
		{F{-2, 1}, 2, "0", "4", 0, true, "brief; IEEE 1788-2015 pown: even power straddling zero"},
		{F{-1, 2}, 2, "0", "4", 0, true, "IEEE 1788-2015 pown"},
		{F{-2, 1}, 3, "-8", "1", 0, true, "IEEE 1788-2015 pown: odd power is increasing"},
		{F{-3, -2}, 2, "4", "9", 0, true, "IEEE 1788-2015 pown: even power, negative base"},
		{F{-3, -2}, 3, "-27", "-8", 0, true, "IEEE 1788-2015 pown"},
		{F{2, 2}, 5, "32", "32", 0, true, "IEEE 1788-2015: zero-width"},
		{F{0, 0}, 2, "0", "0", 0, true, "IEEE 1788-2015: zero-width"},
		{F{-3, 2}, 0, "1", "1", 0, true, "IEEE 1788-2015 pown(x, 0) = [1, 1]"},
		{F{-inf, inf}, 0, "1", "1", 0, true, "IEEE 1788-2015 pown(x, 0) = [1, 1]"},
		{F{-inf, 2}, 3, "-inf", "8", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{-inf, 2}, 2, "0", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{-inf, -1}, 2, "1", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{-inf, inf}, 4, "0", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{0.5, 1.5}, 1, "1/2", "3/2", 0, true, "identity"},
		{F{1e-200, 1e-100}, 3, rmul(1e-200, 1e-200, 1e-200), rmul(1e-100, 1e-100, 1e-100), 2, false, "outward rounding: underflow clamps at 0"},
		{F{0.1, 0.1}, 2, rmul(0.1, 0.1), rmul(0.1, 0.1), 0, true, "outward rounding: one rounding, tightest"},
		{F{-1.1, 1.1}, 7, rmul(-1.1, 1.1, 1.1, 1.1, 1.1, 1.1, 1.1), rmul(1.1, 1.1, 1.1, 1.1, 1.1, 1.1, 1.1), 8, false, "outward rounding: binary powering rounds per product"},
	}
	for _, tc := range tests {
		checkEnclosure(t, tc.x.String()+"^"+strconv.Itoa(tc.n), tc.x.Pow(tc.n), tc.lo, tc.hi, tc.ulps, tc.tight)
	}
}

func TestScale(t *testing.T) {
	runBin(t, "·", func(x, y F) F { return x.Scale(y.Lo) }, []binCase{
		{F{1, 2}, F{-3, -3}, "-6", "-3", 0, true, "Moore"},
		{F{-inf, 1}, F{0, 0}, "0", "0", 0, true, "IEEE 1788-2015 set-based multiplication: 0 × unbounded"},
		{F{-inf, 1}, F{2, 2}, "-inf", "2", 0, true, "IEEE 1788-2015 infinite ends"},
		{F{-inf, 1}, F{-2, -2}, "-2", "+inf", 0, true, "IEEE 1788-2015 infinite ends"},
	})
}

func TestFromRat(t *testing.T) {
	tests := []struct {
		q      string
		lo, hi float64
	}{
		{"1/2", 0.5, 0.5},
		{"-3", -3, -3},
		{"0", 0, 0},
		{"1/3", 1.0 / 3, math.Nextafter(1.0/3, 2)}, // 1.0/3 rounds down
		{"-1/3", math.Nextafter(-1.0/3, -2), -1.0 / 3},
		{"1/10", math.Nextafter(0.1, 0), 0.1}, // 0.1 is above 1/10
		{"1e400", math.MaxFloat64, inf},
		{"-1e400", -inf, -math.MaxFloat64},
		{"1e-400", 0, math.SmallestNonzeroFloat64},
		{"-1e-400", -math.SmallestNonzeroFloat64, 0},
	}
	for _, tc := range tests {
		q, _ := new(big.Rat).SetString(tc.q)
		got := FromRat(q)
		if got.Lo != tc.lo || got.Hi != tc.hi {
			t.Errorf("FromRat(%s) = %v, want %v", tc.q, got, F{tc.lo, tc.hi})
		}
		if !lowerOK(got.Lo, ratOrInf{r: q}) || !upperOK(got.Hi, ratOrInf{r: q}) {
			t.Errorf("FromRat(%s) = %v does not contain it", tc.q, got)
		}
	}
}

func TestPredicatesWidthMidSplit(t *testing.T) {
	tests := []struct {
		x             F
		pos, neg, zer bool
		width         float64
	}{
		{F{1, 2}, true, false, false, 1},
		{F{0, 2}, false, false, true, 2},
		{F{-2, -1}, false, true, false, 1},
		{F{-inf, 0}, false, false, true, inf},
		{F{3, 3}, true, false, false, 0},
		{F{0, 0}, false, false, true, 0},
	}
	for _, tc := range tests {
		got := [3]bool{tc.x.Positive(), tc.x.Negative(), tc.x.ContainsZero()}
		if got != [3]bool{tc.pos, tc.neg, tc.zer} {
			t.Errorf("%v: [Positive Negative ContainsZero] = %v", tc.x, got)
		}
		if w := tc.x.Width(); w < tc.width || (tc.width == 0) != (w == 0) || w > math.Nextafter(tc.width, inf) {
			t.Errorf("%v.Width() = %v, want %v (+1 ulp)", tc.x, w, tc.width)
		}
	}
	l, r := F{0, 1}.Split()
	if l != (F{0, 0.5}) || r != (F{0.5, 1}) {
		t.Errorf("[0, 1].Split() = %v, %v", l, r)
	}
	m := math.MaxFloat64
	if got := (F{-m, m}).Mid(); got != 0 {
		t.Errorf("[-max, max].Mid() = %v", got)
	}
	if got := (F{m, m}).Mid(); got != m {
		t.Errorf("[max, max].Mid() = %v", got)
	}
	s := math.SmallestNonzeroFloat64
	if got := (F{s, 2 * s}).Mid(); got < s || got > 2*s {
		t.Errorf("subnormal Mid %v outside", got)
	}
}

func TestPanics(t *testing.T) {
	nan := math.NaN()
	for name, f := range map[string]func(){
		"New(2, 1)":       func() { New(2, 1) },
		"New(NaN, 1)":     func() { New(nan, 1) },
		"New(+Inf, +Inf)": func() { New(inf, inf) },
		"New(-Inf, -Inf)": func() { New(-inf, -inf) },
		"Pt(+Inf)":        func() { Pt(inf) },
		"Pt(NaN)":         func() { Pt(nan) },
		"Scale(NaN)":      func() { F{0, 1}.Scale(nan) },
		"Scale(Inf)":      func() { F{0, 1}.Scale(inf) },
		"Pow(-1)":         func() { F{1, 2}.Pow(-1) },
		"Mid unbounded":   func() { F{0, inf}.Mid() },
		"Split unbounded": func() { F{-inf, 0}.Split() },
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s did not panic", name)
				}
			}()
			f()
		}()
	}
	if New(-inf, inf) != (F{-inf, inf}) || Pt(2) != (F{2, 2}) {
		t.Errorf("constructors")
	}
}

// ---- property tests ----

// randFloat returns a random float64 drawn from several regimes: small
// integers and simple fractions, ordinary magnitudes, any exponent, and
// extreme magnitudes (near overflow, subnormal), with random sign.
func randFloat(r *rand.Rand) float64 {
	var v float64
	switch r.IntN(9) {
	case 0:
		return 0
	case 1, 2:
		v = float64(r.IntN(41)-20) / float64(r.IntN(6)+1)
	case 3, 4:
		v = math.Ldexp(1+r.Float64(), r.IntN(80)-40)
	case 5:
		v = math.Ldexp(1+r.Float64(), r.IntN(1023+1075)-1075) // any exponent
	case 6:
		v = math.Ldexp(1+r.Float64(), 1000+r.IntN(24)) // near overflow
	default:
		v = math.Ldexp(r.Float64(), -1000-r.IntN(75)) // tiny, subnormal
	}
	if r.IntN(2) == 0 {
		v = -v
	}
	return v
}

func randF(r *rand.Rand) F {
	a, b := randFloat(r), randFloat(r)
	switch r.IntN(8) {
	case 0:
		b = a // zero-width
	case 1:
		a = -inf
	case 2:
		b = inf
	}
	if a > b {
		a, b = b, a
	}
	return F{a, b}
}

// randPoint returns a random real (rational) in x: often an end.
func randPoint(r *rand.Rand, x F) *big.Rat {
	finite := func(v float64) bool { return !math.IsInf(v, 0) }
	switch k := r.IntN(5); {
	case k == 0 && finite(x.Lo):
		return new(big.Rat).SetFloat64(x.Lo)
	case k == 1 && finite(x.Hi):
		return new(big.Rat).SetFloat64(x.Hi)
	case k == 2 && x.ContainsZero():
		return new(big.Rat)
	}
	off := new(big.Rat).SetFloat64(math.Abs(randFloat(r)))
	switch {
	case !finite(x.Lo) && !finite(x.Hi):
		return new(big.Rat).SetFloat64(randFloat(r))
	case !finite(x.Lo):
		return off.Sub(new(big.Rat).SetFloat64(x.Hi), off)
	case !finite(x.Hi):
		return off.Add(new(big.Rat).SetFloat64(x.Lo), off)
	}
	lo, hi := new(big.Rat).SetFloat64(x.Lo), new(big.Rat).SetFloat64(x.Hi)
	m := r.Int64N(1000) + 1
	u := big.NewRat(r.Int64N(m+1), m) // in [0, 1]
	w := new(big.Rat).Sub(hi, lo)
	return w.Add(lo, w.Mul(w, u))
}

// contains reports whether the real v is in x, both by exact comparison
// and as FromRat(v) ⊆ x (equivalent, since FromRat is tightest); it
// reports a disagreement as false too.
func contains(x F, v *big.Rat) bool {
	exact := lowerOK(x.Lo, ratOrInf{r: v}) && upperOK(x.Hi, ratOrInf{r: v})
	e := FromRat(v)
	return exact && x.Lo <= e.Lo && e.Hi <= x.Hi
}

func bounded(x F) bool { return !math.IsInf(x.Lo, 0) && !math.IsInf(x.Hi, 0) }

// checkTightest checks that Add, Sub and Mul of bounded x, y give the
// tightest float64 enclosure of the exact range (the floats FromRat gives
// for its ends), but for products whose exact end is tiny (below 2^-950),
// where one more ulp is allowed (doc.go: not checked with FMA).
func checkTightest(t *testing.T, x, y F) {
	t.Helper()
	xl, xh := new(big.Rat).SetFloat64(x.Lo), new(big.Rat).SetFloat64(x.Hi)
	yl, yh := new(big.Rat).SetFloat64(y.Lo), new(big.Rat).SetFloat64(y.Hi)
	tiny := new(big.Rat).SetFloat64(0x1p-950)
	check := func(op string, got F, cands []*big.Rat, slack bool) {
		lo, hi := cands[0], cands[0]
		for _, c := range cands[1:] {
			if c.Cmp(lo) < 0 {
				lo = c
			}
			if c.Cmp(hi) > 0 {
				hi = c
			}
		}
		wl, wh := FromRat(lo).Lo, FromRat(hi).Hi
		okLo := got.Lo == wl || (slack && lo.Sign() != 0 && new(big.Rat).Abs(lo).Cmp(tiny) < 0 && got.Lo == down(wl))
		okHi := got.Hi == wh || (slack && hi.Sign() != 0 && new(big.Rat).Abs(hi).Cmp(tiny) < 0 && got.Hi == up(wh))
		if !okLo || !okHi {
			t.Fatalf("%v %s %v = %v, tightest enclosure of [%s, %s] is %v", x, op, y, got,
				lo.FloatString(30), hi.FloatString(30), F{wl, wh})
		}
	}
	r := func() *big.Rat { return new(big.Rat) }
	check("+", x.Add(y), []*big.Rat{r().Add(xl, yl), r().Add(xh, yh)}, false)
	check("-", x.Sub(y), []*big.Rat{r().Sub(xl, yh), r().Sub(xh, yl)}, false)
	check("×", x.Mul(y), []*big.Rat{r().Mul(xl, yl), r().Mul(xl, yh), r().Mul(xh, yl), r().Mul(xh, yh)}, true)
}

// mulRef is the four-corner reference multiplication.
func mulRef(x, y F) F {
	return F{
		min(mulDown(x.Lo, y.Lo), mulDown(x.Lo, y.Hi), mulDown(x.Hi, y.Lo), mulDown(x.Hi, y.Hi)),
		max(mulUp(x.Lo, y.Lo), mulUp(x.Lo, y.Hi), mulUp(x.Hi, y.Lo), mulUp(x.Hi, y.Hi)),
	}
}

// TestContainmentProperty checks the containment property of IEEE
// 1788-2015 for the float type: for random intervals and random real
// points s, t inside them, the exact s∘t (computed with big.Rat) lies in
// the float result, and FromRat(s∘t) is contained in it.
func TestContainmentProperty(t *testing.T) {
	r := rand.New(rand.NewPCG(1788, 2015))
	iters := 6000
	if testing.Short() {
		iters = 1000
	}
	binops := []struct {
		name string
		f    func(x, y F) F
		rat  func(a, b *big.Rat) *big.Rat
	}{
		{"+", F.Add, func(a, b *big.Rat) *big.Rat { return new(big.Rat).Add(a, b) }},
		{"-", F.Sub, func(a, b *big.Rat) *big.Rat { return new(big.Rat).Sub(a, b) }},
		{"×", F.Mul, func(a, b *big.Rat) *big.Rat { return new(big.Rat).Mul(a, b) }},
	}
	for range iters {
		x, y := randF(r), randF(r)
		for _, op := range binops {
			res := op.f(x, y)
			if !valid(res) {
				t.Fatalf("%v %s %v = %v: invalid", x, op.name, y, res)
			}
			for range 4 {
				a, b := randPoint(r, x), randPoint(r, y)
				if v := op.rat(a, b); !contains(res, v) {
					t.Fatalf("%v %s %v = %v does not contain %s %s %s = %s (%v)", x, op.name, y, res,
						a.FloatString(20), op.name, b.FloatString(20), v.FloatString(20), FromRat(v))
				}
			}
		}
		if bounded(x) && bounded(y) {
			checkTightest(t, x, y)
		}
		// The sign-case Mul is never wider than the four-corner one.
		if got, ref := x.Mul(y), mulRef(x, y); got.Lo < ref.Lo || got.Hi > ref.Hi {
			t.Fatalf("%v × %v = %v, wider than the four-corner reference %v", x, y, got, ref)
		}
		n := r.IntN(8)
		pw := x.Pow(n)
		if !valid(pw) {
			t.Fatalf("%v^%d = %v: invalid", x, n, pw)
		}
		for range 4 {
			a := randPoint(r, x)
			v := new(big.Rat).SetInt64(1)
			for range n {
				v.Mul(v, a)
			}
			if !contains(pw, v) {
				t.Fatalf("%v^%d = %v does not contain %s^%d (%v)", x, n, pw, a.FloatString(20), n, FromRat(v))
			}
		}
		c := randFloat(r)
		sc := x.Scale(c)
		a := randPoint(r, x)
		if v := new(big.Rat).Mul(new(big.Rat).SetFloat64(c), a); !valid(sc) || !contains(sc, v) {
			t.Fatalf("%v · %v = %v does not contain %s", x, c, sc, v.FloatString(20))
		}
		if !math.IsInf(x.Lo, 0) && !math.IsInf(x.Hi, 0) {
			left, right := x.Split()
			m := x.Mid()
			if !x.Contains(m) || left.Lo != x.Lo || right.Hi != x.Hi || left.Hi != m || right.Lo != m {
				t.Fatalf("%v.Split() = %v, %v (mid %v)", x, left, right, m)
			}
			if w := x.Width(); !upperOK(w, ratOrInf{r: new(big.Rat).Sub(new(big.Rat).SetFloat64(x.Hi), new(big.Rat).SetFloat64(x.Lo))}) {
				t.Fatalf("%v.Width() = %v too small", x, w)
			}
		}
	}
}

// TestFromRatProperty checks FromRat against big.Float rounding in both
// directions for random rationals.
func TestFromRatProperty(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for range 5000 {
		q := big.NewRat(r.Int64()>>uint(r.IntN(63)), (r.Int64()>>uint(r.IntN(63)))|1)
		if r.IntN(4) == 0 { // scale by 2^k, often out of float64 range
			k := r.IntN(2300) - 1150
			p := new(big.Int).Lsh(big.NewInt(1), uint(max(k, -k)))
			if k >= 0 {
				q.Mul(q, new(big.Rat).SetInt(p))
			} else {
				q.Quo(q, new(big.Rat).SetInt(p))
			}
		}
		got := FromRat(q)
		down := new(big.Float).SetPrec(53).SetMode(big.ToNegativeInf).SetRat(q)
		up := new(big.Float).SetPrec(53).SetMode(big.ToPositiveInf).SetRat(q)
		if !lowerOK(got.Lo, ratOrInf{r: q}) || !upperOK(got.Hi, ratOrInf{r: q}) {
			t.Fatalf("FromRat(%s) = %v does not contain it", q, got)
		}
		// Normal range: the ends are big.Float's directed roundings.
		if e := down.MantExp(nil); e > -1021 && e < 1024 {
			dl, _ := down.Float64()
			dh, _ := up.Float64()
			if got.Lo != dl || got.Hi != dh {
				t.Fatalf("FromRat(%s) = %v, big.Float directed roundings [%v, %v]", q, got, dl, dh)
			}
		}
	}
}

// TestNextSteps checks the bit-stepping nextDown/nextUp against
// math.Nextafter.
func TestNextSteps(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	vals := []float64{math.MaxFloat64, -math.MaxFloat64, math.SmallestNonzeroFloat64,
		-math.SmallestNonzeroFloat64, 1, -1, 0x1p-1022, -0x1p-1022}
	for range 10000 {
		if v := randFloat(r); v != 0 {
			vals = append(vals, v)
		}
	}
	for _, v := range vals {
		if d, u := nextDown(v), nextUp(v); d != math.Nextafter(v, -inf) || u != math.Nextafter(v, inf) {
			t.Fatalf("nextDown/nextUp(%v) = %v, %v", v, d, u)
		}
	}
}

// BenchmarkMul multiplies intervals of all sign combinations.
func BenchmarkMul(b *testing.B) {
	xs := []F{{1, 2}, {-3, -1}, {-1, 2}, {0.5, 0.75}, {-2, 3}, {-inf, 1}}
	var sink F
	for i := 0; b.Loop(); i++ {
		sink = xs[i%len(xs)].Mul(xs[(i/len(xs))%len(xs)])
	}
	_ = sink
}

// BenchmarkMulMixed is the four-product case (both operands straddle 0).
func BenchmarkMulMixed(b *testing.B) {
	x, y := F{-1.5, 2.25}, F{-3.125, 0.5}
	var sink F
	for b.Loop() {
		sink = x.Mul(y)
	}
	_ = sink
}
