package poly

import (
	"math/big"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// Test helpers in this file carry the prefix "ivt": other test files of
// package poly are written independently.
//
// Sources named in the tables:
//   - "IEEE 1788-2015": the standard's set-based flavor (intervals are sets
//     of reals, never containing infinity; results are the tightest
//     intervals containing the range of the real operation).
//   - "open-end extension": the rules documented in interval.go for ends
//     that are not attained (IEEE 1788-2015 has closed intervals only).
//   - "Moore": R. E. Moore, Interval Analysis (1966), endpoint formulas.
//   - "brief": an example fixed by the task statement.

// ivtParse parses the String form: "[0, 1)", "(-inf, 3/2]", "[2, 2]".
func ivtParse(t testing.TB, s string) Interval {
	t.Helper()
	x, err := ivtTryParse(s)
	if err != nil {
		t.Fatalf("parse %q: %v", s, err)
	}
	return x
}

func ivtTryParse(s string) (Interval, error) {
	s = strings.TrimSpace(s)
	if len(s) < 5 {
		return Interval{}, ivtErr("too short")
	}
	l, r := s[0], s[len(s)-1]
	parts := strings.Split(s[1:len(s)-1], ",")
	if len(parts) != 2 || (l != '[' && l != '(') || (r != ']' && r != ')') {
		return Interval{}, ivtErr("bad syntax")
	}
	end := func(p string, open bool) (Bound, error) {
		p = strings.TrimSpace(p)
		switch p {
		case "-inf":
			return Bound{Inf: -1, Open: true}, nil
		case "+inf":
			return Bound{Inf: +1, Open: true}, nil
		}
		v, ok := new(big.Rat).SetString(p)
		if !ok {
			return Bound{}, ivtErr("bad number " + p)
		}
		return Bound{Value: v, Open: open}, nil
	}
	lo, err := end(parts[0], l == '(')
	if err != nil {
		return Interval{}, err
	}
	hi, err := end(parts[1], r == ')')
	if err != nil {
		return Interval{}, err
	}
	return NewInterval(lo, hi)
}

type ivtErr string

func (e ivtErr) Error() string { return string(e) }

func ivtRat(s string) *big.Rat {
	v, ok := new(big.Rat).SetString(s)
	if !ok {
		panic("bad rational " + s)
	}
	return v
}

func TestIntervalStringRoundTrip(t *testing.T) {
	for _, s := range []string{
		"[0, 1)", "(-inf, 3/2]", "(-inf, +inf)", "[2, 2]", "(-1/3, 7]", "[0, +inf)",
	} {
		if got := ivtParse(t, s).String(); got != s {
			t.Errorf("String(parse(%q)) = %q", s, got)
		}
	}
	if got := Point(big.NewRat(-3, 6)).String(); got != "[-1/2, -1/2]" {
		t.Errorf("Point(-3/6) = %s", got)
	}
	if got := Closed(big.NewRat(0, 1), big.NewRat(4, 2)).String(); got != "[0, 2]" {
		t.Errorf("Closed(0, 2) = %s", got)
	}
	if got := Entire().String(); got != "(-inf, +inf)" {
		t.Errorf("Entire() = %s", got)
	}
}

func TestNewInterval(t *testing.T) {
	one, two := big.NewRat(1, 1), big.NewRat(2, 1)
	tests := []struct {
		name    string
		lo, hi  Bound
		want    string // "" means an error is expected
		comment string
	}{
		{"lo > hi", Bound{Value: two}, Bound{Value: one}, "", "IEEE 1788-2015: no empty or reversed intervals from constructors"},
		{"[1, 1)", Bound{Value: one}, Bound{Value: one, Open: true}, "", "open-end extension: empty"},
		{"(1, 1]", Bound{Value: one, Open: true}, Bound{Value: one}, "", "open-end extension: empty"},
		{"(1, 1)", Bound{Value: one, Open: true}, Bound{Value: one, Open: true}, "", "open-end extension: empty"},
		{"lo at +inf", Bound{Inf: +1}, Bound{Inf: +1}, "", "IEEE 1788-2015: +inf is not a real"},
		{"hi at -inf", Bound{Inf: -1}, Bound{Inf: -1}, "", "IEEE 1788-2015: -inf is not a real"},
		{"bad Inf", Bound{Inf: 2}, Bound{Value: one}, "", "malformed"},
		{"nil Value", Bound{}, Bound{Value: one}, "", "malformed"},
		{"[1, 1]", Bound{Value: one}, Bound{Value: one}, "[1, 1]", "IEEE 1788-2015: zero-width"},
		{"closed inf normalized", Bound{Inf: -1, Value: one}, Bound{Inf: +1}, "(-inf, +inf)", "brief: infinite ends are always open"},
	}
	for _, tc := range tests {
		x, err := NewInterval(tc.lo, tc.hi)
		switch {
		case tc.want == "" && err == nil:
			t.Errorf("%s [%s]: got %s, want error", tc.name, tc.comment, x)
		case tc.want != "" && err != nil:
			t.Errorf("%s [%s]: unexpected error %v", tc.name, tc.comment, err)
		case tc.want != "" && x.String() != tc.want:
			t.Errorf("%s [%s]: got %s, want %s", tc.name, tc.comment, x, tc.want)
		}
	}
	// The constructor copies its inputs.
	v := big.NewRat(1, 1)
	x, _ := NewInterval(Bound{Value: v}, Bound{Value: v})
	v.SetInt64(5)
	if x.String() != "[1, 1]" {
		t.Errorf("NewInterval aliases its input: %s", x)
	}
}

type ivtBinCase struct {
	x, y, want string
	source     string
}

func ivtRunBin(t *testing.T, op string, f func(x, y Interval) Interval, tests []ivtBinCase) {
	t.Helper()
	for _, tc := range tests {
		got := f(ivtParse(t, tc.x), ivtParse(t, tc.y)).String()
		if got != tc.want {
			t.Errorf("%s %s %s = %s, want %s  [%s]", tc.x, op, tc.y, got, tc.want, tc.source)
		}
	}
}

func TestIntervalAdd(t *testing.T) {
	ivtRunBin(t, "+", Interval.Add, []ivtBinCase{
		{"[1, 2]", "[3, 5]", "[4, 7]", "Moore: [a+c, b+d]"},
		{"[2, 2]", "[3, 3]", "[5, 5]", "IEEE 1788-2015: zero-width"},
		{"[0, 1)", "(0, 2]", "(0, 3)", "brief; open-end extension"},
		{"[0, +inf)", "(-inf, 0]", "(-inf, +inf)", "IEEE 1788-2015: infinite ends"},
		{"(-inf, 3/2]", "[1/2, 1/2]", "(-inf, 2]", "IEEE 1788-2015: infinite ends"},
		{"(-inf, +inf)", "[0, 0]", "(-inf, +inf)", "IEEE 1788-2015: Entire + [0, 0]"},
		{"(1, +inf)", "[-1, 2]", "(0, +inf)", "open-end extension"},
	})
}

func TestIntervalSub(t *testing.T) {
	ivtRunBin(t, "-", Interval.Sub, []ivtBinCase{
		{"[1, 2]", "[3, 5]", "[-4, -1]", "Moore: [a-d, b-c]"},
		{"[0, 1]", "[0, 1]", "[-1, 1]", "IEEE 1788-2015: x - x is not 0 (dependency)"},
		{"[0, 1)", "(0, 2]", "[-2, 1)", "open-end extension"},
		{"[0, +inf)", "[0, +inf)", "(-inf, +inf)", "IEEE 1788-2015: infinite ends"},
		{"[3, 3]", "[3, 3]", "[0, 0]", "IEEE 1788-2015: zero-width"},
	})
	if got := ivtParse(t, "(-inf, 3/2]").Neg().String(); got != "[-3/2, +inf)" {
		t.Errorf("-(-inf, 3/2] = %s", got)
	}
}

func TestIntervalMul(t *testing.T) {
	ivtRunBin(t, "×", Interval.Mul, []ivtBinCase{
		{"[-2, 3]", "[-5, 4]", "[-15, 12]", "Moore: min/max of endpoint products"},
		{"[1, 2]", "[3, 4]", "[3, 8]", "Moore"},
		{"[-2, -1]", "[3, 4]", "[-8, -3]", "Moore"},
		{"[2, 2]", "[3, 3]", "[6, 6]", "IEEE 1788-2015: zero-width"},
		{"[2, 2]", "[-1, 3]", "[-2, 6]", "IEEE 1788-2015: zero-width"},
		{"[0, +inf)", "[0, 0]", "[0, 0]", "brief; IEEE 1788-2015 set-based multiplication: 0 × unbounded is 0"},
		{"[0, 0]", "(-inf, +inf)", "[0, 0]", "IEEE 1788-2015 set-based multiplication: [0, 0] × Entire = [0, 0]"},
		{"[1, +inf)", "[-1, 2]", "(-inf, +inf)", "brief; IEEE 1788-2015 infinite ends"},
		{"[0, +inf)", "[0, +inf)", "[0, +inf)", "IEEE 1788-2015 infinite ends"},
		{"(-inf, -1]", "(-inf, -1]", "[1, +inf)", "IEEE 1788-2015 infinite ends"},
		{"[0, 1]", "[1, +inf)", "[0, +inf)", "IEEE 1788-2015: attained 0 × unbounded"},
		{"(0, 1]", "(0, 1]", "(0, 1]", "brief; open-end extension"},
		{"(0, 1]", "[0, 0]", "[0, 0]", "open-end extension: attained 0 wins"},
		{"(0, 1]", "[1, +inf)", "(0, +inf)", "open-end extension: open 0 × inf stays open"},
		{"(0, 1]", "[-1, 0)", "[-1, 0)", "open-end extension"},
		{"(-1, 2)", "(-1, 2)", "(-2, 4)", "open-end extension: all ends open"},
		{"[-1, 1)", "(-1, 1]", "[-1, 1)", "open-end extension: 1 only as a limit"},
		{"[-1, 1]", "(-1, 1]", "[-1, 1]", "open-end extension: tie, the attained candidate wins"},
		{"[0, 1)", "(-inf, 0]", "(-inf, 0]", "open-end extension with infinite end"},
		{"(0, +inf)", "(-inf, 0)", "(-inf, 0)", "open-end extension with infinite ends"},
		{"(0, 1)", "(-inf, +inf)", "(-inf, +inf)", "IEEE 1788-2015 infinite ends"},
	})
}

func TestIntervalPow(t *testing.T) {
	tests := []struct {
		x      string
		n      int
		want   string
		source string
	}{
		{"[-2, 1]", 2, "[0, 4]", "brief; IEEE 1788-2015 pown: even power straddling zero"},
		{"[-1, 2]", 2, "[0, 4]", "IEEE 1788-2015 pown"},
		{"[-2, 2]", 2, "[0, 4]", "IEEE 1788-2015 pown"},
		{"[-2, 1]", 3, "[-8, 1]", "IEEE 1788-2015 pown: odd power is increasing"},
		{"[-3, -2]", 2, "[4, 9]", "IEEE 1788-2015 pown: even power, negative base"},
		{"[-3, -2]", 3, "[-27, -8]", "IEEE 1788-2015 pown"},
		{"[2, 2]", 3, "[8, 8]", "IEEE 1788-2015: zero-width"},
		{"[0, 0]", 2, "[0, 0]", "IEEE 1788-2015: zero-width"},
		{"[-3, 2]", 0, "[1, 1]", "IEEE 1788-2015 pown(x, 0) = [1, 1]"},
		{"(-inf, +inf)", 0, "[1, 1]", "IEEE 1788-2015 pown(x, 0) = [1, 1]"},
		{"(-inf, 2]", 3, "(-inf, 8]", "IEEE 1788-2015 infinite ends"},
		{"(-inf, 2]", 2, "[0, +inf)", "IEEE 1788-2015 infinite ends"},
		{"(-inf, -1]", 2, "[1, +inf)", "IEEE 1788-2015 infinite ends"},
		{"(-inf, +inf)", 4, "[0, +inf)", "IEEE 1788-2015 infinite ends"},
		{"(-1, 1)", 2, "[0, 1)", "open-end extension: interior 0 attained"},
		{"(-1, 1]", 2, "[0, 1]", "open-end extension: tie, attained wins"},
		{"(-2, 1]", 2, "[0, 4)", "open-end extension: larger magnitude end open"},
		{"[-2, -1)", 2, "(1, 4]", "open-end extension: swapped ends"},
		{"[-1, 0)", 2, "(0, 1]", "open-end extension: swapped ends"},
		{"(0, 1]", 2, "(0, 1]", "open-end extension"},
		{"(-2, -1]", 3, "(-8, -1]", "open-end extension"},
		{"[1/2, 2/3)", 2, "[1/4, 4/9)", "open-end extension"},
		{"[-1/2, 1/3]", 5, "[-1/32, 1/243]", "IEEE 1788-2015 pown"},
		{"(0, 1]", 1, "(0, 1]", "identity"},
	}
	for _, tc := range tests {
		if got := ivtParse(t, tc.x).Pow(tc.n).String(); got != tc.want {
			t.Errorf("%s^%d = %s, want %s  [%s]", tc.x, tc.n, got, tc.want, tc.source)
		}
	}
	defer func() {
		if recover() == nil {
			t.Errorf("Pow(-1) did not panic")
		}
	}()
	ivtParse(t, "[1, 2]").Pow(-1)
}

func TestIntervalRecip(t *testing.T) {
	tests := []struct {
		x, want string // want "" means refused
		source  string
	}{
		{"[2, 4]", "[1/4, 1/2]", "IEEE 1788-2015 recip"},
		{"[-4, -2]", "[-1/2, -1/4]", "IEEE 1788-2015 recip"},
		{"[3, 3]", "[1/3, 1/3]", "IEEE 1788-2015: zero-width"},
		{"(0, 2]", "[1/2, +inf)", "open-end extension: open 0 → infinite end"},
		{"(0, 1)", "(1, +inf)", "open-end extension"},
		{"[1, +inf)", "(0, 1]", "brief: infinite end → open 0"},
		{"(0, +inf)", "(0, +inf)", "open-end extension"},
		{"(-inf, -1]", "[-1, 0)", "brief: infinite end → open 0"},
		{"[-2, -1/2)", "(-2, -1/2]", "open-end extension"},
		{"[-1, 0)", "(-inf, -1]", "open-end extension"},
		{"[-1, 1]", "", "refused by design: contains zero"},
		{"[0, 1]", "", "refused by design: contains zero"},
		{"(-1, 0]", "", "refused by design: contains zero"},
		{"[0, 0]", "", "refused by design: contains zero"},
		{"(-inf, +inf)", "", "refused by design: contains zero"},
	}
	for _, tc := range tests {
		got, err := ivtParse(t, tc.x).Recip()
		switch {
		case tc.want == "" && err == nil:
			t.Errorf("1/%s = %s, want refusal  [%s]", tc.x, got, tc.source)
		case tc.want != "" && err != nil:
			t.Errorf("1/%s: %v  [%s]", tc.x, err, tc.source)
		case tc.want != "" && got.String() != tc.want:
			t.Errorf("1/%s = %s, want %s  [%s]", tc.x, got, tc.want, tc.source)
		}
	}
}

func TestIntervalScaleRat(t *testing.T) {
	tests := []struct {
		x, c, want string
		source     string
	}{
		{"[1, 2)", "-3", "(-6, -3]", "open-end extension"},
		{"[1, 2)", "1/2", "[1/2, 1)", "open-end extension"},
		{"(-inf, 1]", "0", "[0, 0]", "IEEE 1788-2015 set-based multiplication: 0 × unbounded"},
		{"(-inf, 1]", "2", "(-inf, 2]", "IEEE 1788-2015 infinite ends"},
		{"(-inf, 1]", "-2", "[-2, +inf)", "IEEE 1788-2015 infinite ends"},
	}
	for _, tc := range tests {
		if got := ivtParse(t, tc.x).ScaleRat(ivtRat(tc.c)).String(); got != tc.want {
			t.Errorf("%s · %s = %s, want %s  [%s]", tc.x, tc.c, got, tc.want, tc.source)
		}
	}
}

func TestIntervalPredicates(t *testing.T) {
	tests := []struct {
		x                            string
		pos, neg, nonneg, nonpos, zr bool
	}{
		{"(0, 1]", true, false, true, false, false},
		{"[0, 1]", false, false, true, false, true},
		{"[1/2, +inf)", true, false, true, false, false},
		{"[-1, 0)", false, true, false, true, false},
		{"(-inf, 0]", false, false, false, true, true},
		{"(-inf, -1)", false, true, false, true, false},
		{"[0, 0]", false, false, true, true, true},
		{"(-inf, +inf)", false, false, false, false, true},
		{"(-1, 1)", false, false, false, false, true},
	}
	for _, tc := range tests {
		x := ivtParse(t, tc.x)
		got := [5]bool{x.Positive(), x.Negative(), x.NonNegative(), x.NonPositive(), x.ContainsZero()}
		want := [5]bool{tc.pos, tc.neg, tc.nonneg, tc.nonpos, tc.zr}
		if got != want {
			t.Errorf("%s: [Positive Negative NonNegative NonPositive ContainsZero] = %v, want %v", tc.x, got, want)
		}
	}
}

func TestIntervalContains(t *testing.T) {
	tests := []struct {
		x, q string
		want bool
	}{
		{"[0, 1)", "0", true},
		{"[0, 1)", "1", false},
		{"[0, 1)", "999/1000", true},
		{"(0, 1]", "0", false},
		{"(0, 1]", "1", true},
		{"(-inf, 3/2]", "-1000000", true},
		{"(-inf, 3/2]", "3/2", true},
		{"(-inf, 3/2)", "3/2", false},
		{"[2, 2]", "2", true},
		{"[2, 2]", "2000001/1000000", false},
	}
	for _, tc := range tests {
		if got := ivtParse(t, tc.x).Contains(ivtRat(tc.q)); got != tc.want {
			t.Errorf("%s.Contains(%s) = %v", tc.x, tc.q, got)
		}
	}
}

func TestIntervalWidthMidSplit(t *testing.T) {
	tests := []struct {
		x, width, mid, left, right string
	}{
		{"[0, 1)", "1", "1/2", "[0, 1/2]", "(1/2, 1)"},
		{"(-1, 3]", "4", "1", "(-1, 1]", "(1, 3]"},
		{"(0, 1)", "1", "1/2", "(0, 1/2]", "(1/2, 1)"},
		{"[1/3, 1/2]", "1/6", "5/12", "[1/3, 5/12]", "(5/12, 1/2]"},
	}
	for _, tc := range tests {
		x := ivtParse(t, tc.x)
		w, ok := x.Width()
		if !ok || w.RatString() != tc.width {
			t.Errorf("%s.Width() = %v, %v", tc.x, w, ok)
		}
		if m := x.Mid(); m.RatString() != tc.mid {
			t.Errorf("%s.Mid() = %s", tc.x, m.RatString())
		}
		l, r := x.Split()
		if l.String() != tc.left || r.String() != tc.right {
			t.Errorf("%s.Split() = %s, %s", tc.x, l, r)
		}
	}
	if w, ok := ivtParse(t, "[2, 2]").Width(); !ok || w.Sign() != 0 {
		t.Errorf("[2, 2].Width() = %v, %v", w, ok)
	}
	if _, ok := ivtParse(t, "[0, +inf)").Width(); ok {
		t.Errorf("[0, +inf).Width() reported bounded")
	}
	for _, s := range []string{"[0, +inf)", "(-inf, 1]", "(-inf, +inf)", "[2, 2]"} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s.Split() did not panic", s)
				}
			}()
			ivtParse(t, s).Split()
		}()
	}
	defer func() {
		if recover() == nil {
			t.Errorf("Mid of unbounded interval did not panic")
		}
	}()
	Entire().Mid()
}

// ---- property tests ----

// ivtRandRat returns a random rational with small numerator and
// denominator; half of the time a very small one, so that ends coincide
// in magnitude and candidate products tie often.
func ivtRandRat(r *rand.Rand) *big.Rat {
	if r.IntN(2) == 0 {
		return big.NewRat(r.Int64N(5)-2, r.Int64N(2)+1)
	}
	return big.NewRat(r.Int64N(41)-20, r.Int64N(6)+1)
}

// ivtRandInterval returns a random interval: ends are random rationals, each
// possibly infinite and possibly open, sometimes zero-width.
func ivtRandInterval(r *rand.Rand) Interval {
	for {
		var lo, hi Bound
		if r.IntN(8) == 0 {
			lo = Bound{Inf: -1, Open: true}
		} else {
			lo = Bound{Value: ivtRandRat(r), Open: r.IntN(2) == 0}
		}
		switch {
		case r.IntN(8) == 0:
			hi = Bound{Inf: +1, Open: true}
		case lo.Inf == 0 && r.IntN(8) == 0:
			hi = Bound{Value: lo.Value}
			lo.Open = false
		case lo.Inf == 0:
			hi = Bound{Value: new(big.Rat).Add(lo.Value, new(big.Rat).Abs(ivtRandRat(r))), Open: r.IntN(2) == 0}
		default:
			hi = Bound{Value: ivtRandRat(r), Open: r.IntN(2) == 0}
		}
		if x, err := NewInterval(lo, hi); err == nil {
			return x
		}
	}
}

// ivtRandPoint returns a random element of x. Attained ends and zero are
// drawn often, since a wrongly opened end is only caught by a point on it.
func ivtRandPoint(r *rand.Rand, x Interval) *big.Rat {
	for {
		var q *big.Rat
		switch r.IntN(6) {
		case 0:
			if x.Lo.Inf == 0 {
				q = x.Lo.Value
			}
		case 1:
			if x.Hi.Inf == 0 {
				q = x.Hi.Value
			}
		case 2:
			q = new(big.Rat)
		default:
			pos := new(big.Rat).Abs(ivtRandRat(r))
			pos.Add(pos, big.NewRat(1, r.Int64N(100)+1))
			switch {
			case x.Lo.Inf != 0 && x.Hi.Inf != 0:
				q = ivtRandRat(r)
			case x.Lo.Inf != 0:
				q = new(big.Rat).Sub(x.Hi.Value, pos)
			case x.Hi.Inf != 0:
				q = new(big.Rat).Add(x.Lo.Value, pos)
			default:
				m := r.Int64N(30) + 2
				u := big.NewRat(r.Int64N(m-1)+1, m) // in (0, 1)
				w, _ := x.Width()
				q = new(big.Rat).Add(x.Lo.Value, w.Mul(w, u))
			}
		}
		if q != nil && x.Contains(q) {
			return q
		}
	}
}

// ivtWitnesses returns the finite ends of x, zero if x contains it, and one
// more element of x: attained holds the elements, all holds every one.
func ivtWitnesses(x Interval) (attained, all []*big.Rat) {
	for _, b := range []Bound{x.Lo, x.Hi} {
		if b.Inf == 0 {
			all = append(all, b.Value)
			if !b.Open {
				attained = append(attained, b.Value)
			}
		}
	}
	if x.ContainsZero() {
		attained = append(attained, new(big.Rat))
		all = append(all, new(big.Rat))
	}
	// Some element, for attained values like 0·t and t^0.
	e := ivtSomeElement(x)
	return append(attained, e), append(all, e)
}

func ivtSomeElement(x Interval) *big.Rat {
	switch {
	case x.Lo.Inf == 0 && x.Hi.Inf == 0:
		return x.Mid()
	case x.Lo.Inf == 0:
		return new(big.Rat).Add(x.Lo.Value, big.NewRat(1, 1))
	case x.Hi.Inf == 0:
		return new(big.Rat).Sub(x.Hi.Value, big.NewRat(1, 1))
	}
	return new(big.Rat)
}

func ivtIn(v *big.Rat, vs []*big.Rat) bool {
	for _, w := range vs {
		if v.Cmp(w) == 0 {
			return true
		}
	}
	return false
}

// ivtCheckEnds checks the ends of res against the values of the operation
// at witness points: a closed finite end must be such a value at attained
// points (so it is attained); an open finite end must not be (else it would
// be attained), but must be one at the finite ends (so it is tight).
func ivtCheckEnds(t *testing.T, what string, res Interval, attained, all []*big.Rat) {
	t.Helper()
	for _, b := range []Bound{res.Lo, res.Hi} {
		if b.Inf != 0 {
			continue
		}
		switch {
		case !b.Open && !ivtIn(b.Value, attained):
			t.Errorf("%s = %s: closed end %s not attained", what, res, b.Value.RatString())
		case b.Open && ivtIn(b.Value, attained):
			t.Errorf("%s = %s: open end %s is attained", what, res, b.Value.RatString())
		case b.Open && !ivtIn(b.Value, all):
			t.Errorf("%s = %s: open end %s is not an endpoint value", what, res, b.Value.RatString())
		}
	}
}

// TestIntervalContainmentProperty checks the containment property of IEEE
// 1788-2015 (for s in x, t in y, s∘t is in x∘y) with random points,
// and that the ends are exact (see ivtCheckEnds).
func TestIntervalContainmentProperty(t *testing.T) {
	r := rand.New(rand.NewPCG(1788, 2015))
	iters := 3000
	if testing.Short() {
		iters = 300
	}
	binops := []struct {
		name string
		iv   func(x, y Interval) Interval
		rat  func(a, b *big.Rat) *big.Rat
	}{
		{"+", Interval.Add, func(a, b *big.Rat) *big.Rat { return new(big.Rat).Add(a, b) }},
		{"-", Interval.Sub, func(a, b *big.Rat) *big.Rat { return new(big.Rat).Sub(a, b) }},
		{"×", Interval.Mul, func(a, b *big.Rat) *big.Rat { return new(big.Rat).Mul(a, b) }},
	}
	for range iters {
		x, y := ivtRandInterval(r), ivtRandInterval(r)
		xs, ys := x.String(), y.String()
		for _, op := range binops {
			res := op.iv(x, y)
			if x.String() != xs || y.String() != ys {
				t.Fatalf("%s %s %s modified an operand", xs, op.name, ys)
			}
			what := xs + " " + op.name + " " + ys
			for range 8 {
				a, b := ivtRandPoint(r, x), ivtRandPoint(r, y)
				if v := op.rat(a, b); !res.Contains(v) {
					t.Errorf("%s = %s does not contain %s %s %s = %s", what, res,
						a.RatString(), op.name, b.RatString(), v.RatString())
				}
			}
			xa, xall := ivtWitnesses(x)
			ya, yall := ivtWitnesses(y)
			var att, all []*big.Rat
			for _, a := range xa {
				for _, b := range ya {
					att = append(att, op.rat(a, b))
				}
			}
			for _, a := range xall {
				for _, b := range yall {
					all = append(all, op.rat(a, b))
				}
			}
			ivtCheckEnds(t, what, res, att, all)
		}
		n := r.IntN(6)
		pw := x.Pow(n)
		for range 8 {
			a := ivtRandPoint(r, x)
			if v := ivRatPow(a, n); !pw.Contains(v) {
				t.Errorf("%s^%d = %s does not contain %s^%d = %s", xs, n, pw, a.RatString(), n, v.RatString())
			}
		}
		xa, xall := ivtWitnesses(x)
		var att, all []*big.Rat
		for _, a := range xa {
			att = append(att, ivRatPow(a, n))
		}
		for _, a := range xall {
			all = append(all, ivRatPow(a, n))
		}
		ivtCheckEnds(t, xs+"^"+strconv.Itoa(n), pw, att, all)

		c := ivtRandRat(r)
		sc := x.ScaleRat(c)
		a := ivtRandPoint(r, x)
		if v := new(big.Rat).Mul(c, a); !sc.Contains(v) {
			t.Errorf("%s · %s = %s does not contain %s", xs, c.RatString(), sc, v.RatString())
		}
		if sc.String() != Point(c).Mul(x).String() {
			t.Errorf("%s · %s = %s, but [c, c] × x = %s", xs, c.RatString(), sc, Point(c).Mul(x))
		}

		rc, err := x.Recip()
		if x.ContainsZero() != (err != nil) {
			t.Errorf("1/%s: ContainsZero %v, err %v", xs, x.ContainsZero(), err)
		}
		if err == nil {
			for range 4 {
				a := ivtRandPoint(r, x)
				if v := new(big.Rat).Inv(a); !rc.Contains(v) {
					t.Errorf("1/%s = %s does not contain 1/%s", xs, rc, a.RatString())
				}
			}
			// Recip is an involution on intervals without zero.
			if back, err := rc.Recip(); err != nil || back.String() != xs {
				t.Errorf("1/(1/%s) = %s, %v", xs, back, err)
			}
		}

		// Split partitions x exactly.
		if _, ok := x.Width(); ok && x.Lo.Value.Cmp(x.Hi.Value) != 0 {
			left, right := x.Split()
			for range 8 {
				a := ivtRandPoint(r, x)
				if left.Contains(a) == right.Contains(a) {
					t.Errorf("%s split as %s, %s: %s in both or neither", xs, left, right, a.RatString())
				}
			}
			if m := x.Mid(); !left.Contains(m) || right.Contains(m) {
				t.Errorf("%s split as %s, %s: midpoint misplaced", xs, left, right)
			}
			for _, b := range []Bound{x.Lo, x.Hi} {
				if (left.Contains(b.Value) || right.Contains(b.Value)) != x.Contains(b.Value) {
					t.Errorf("%s split as %s, %s: end %s", xs, left, right, b.Value.RatString())
				}
			}
		}
	}
}

// Compact: closed, bounded and wider than a point (common practice).
func TestIntervalCompact(t *testing.T) {
	one, two := big.NewRat(1, 1), big.NewRat(2, 1)
	cases := []struct {
		x    Interval
		want bool
	}{
		{Closed(one, two), true},
		{Point(one), false},
		{Interval{Lo: Bound{Value: one}, Hi: Bound{Value: two, Open: true}}, false},
		{Interval{Lo: Bound{Value: one}, Hi: ivPosInf}, false},
		{Entire(), false},
	}
	for _, c := range cases {
		if got := c.x.Compact(); got != c.want {
			t.Errorf("%v: %v, want %v", c.x, got, c.want)
		}
	}
}
