package direct

import (
	"errors"
	"fmt"
	"math/big"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

// Randomized soundness: models with a planted truth, run through Check, the
// verdict compared with the truth. The truths are textbook facts (from
// memory: Khalil, Nonlinear Systems, the Lyapunov equation and Lyapunov's
// direct method):
//
//   - for x' = Ax and V = xᵀPx, V̇ = xᵀ(AᵀP + PA)x; with PA = −(Q + S), S
//     skew-symmetric, AᵀP + PA = −2Q. So V proves global asymptotic
//     stability iff P ≻ 0 and Q ≻ 0, proves stability (not asymptotic)
//     when Q ⪰ 0 is singular, and proves nothing when P or Q is indefinite
//     (V or V̇ takes the wrong sign somewhere);
//   - for x' = −a·x³ and V = x², V̇ = −2a·x⁴: the test holds iff a > 0.
//
// A false "holds" is a verdict "holds" (or "holds-on-region" where the
// truth is the same everywhere) where the planted V does not prove the claim
// made; a false "fails" is "fails" where it does.
//
// go test -short runs a few hundred cases, go test a few thousand, and with
// LYACERT_SOUNDNESS_FULL=1 (or a number of cases) the full run of 10⁵.

// soundnessCases returns the number of cases to run.
func soundnessCases(t *testing.T) int {
	if s := os.Getenv("LYACERT_SOUNDNESS_FULL"); s != "" {
		if n, err := strconv.Atoi(s); err == nil && n > 1 {
			return n
		}
		return 100000
	}
	if testing.Short() {
		return 300
	}
	return 2000
}

// truth is what the planted V proves.
type truth int

const (
	provesAsymptotic truth = iota // P ≻ 0, V̇ negative definite
	provesStable                  // P ≻ 0, V̇ ≤ 0 and zero on a subspace
	provesNothing                 // V or −V̇ indefinite (or V semidefinite)
)

func (tr truth) String() string {
	return [...]string{"asymptotic", "stable", "nothing"}[tr]
}

type plantedCase struct {
	name  string
	src   string
	truth truth
}

// randRat returns a random small rational p/q.
func randRat(r *rand.Rand, span int) *big.Rat {
	return big.NewRat(int64(r.IntN(2*span+1)-span), int64(1+r.IntN(4)))
}

type ratMat [][]*big.Rat

func newMat(n int) ratMat {
	m := make(ratMat, n)
	for i := range m {
		m[i] = make([]*big.Rat, n)
		for j := range m[i] {
			m[i][j] = new(big.Rat)
		}
	}
	return m
}

// gram returns MᵀM for a random k×n matrix M (rank at most k).
func gram(r *rand.Rand, k, n int) ratMat {
	m := make(ratMat, k)
	for i := range m {
		m[i] = make([]*big.Rat, n)
		for j := range m[i] {
			m[i][j] = randRat(r, 3)
		}
	}
	g := newMat(n)
	for i := range n {
		for j := range n {
			for l := range k {
				g[i][j].Add(g[i][j], new(big.Rat).Mul(m[l][i], m[l][j]))
			}
		}
	}
	return g
}

func addDiag(a ratMat, d []*big.Rat) ratMat {
	for i := range a {
		a[i][i].Add(a[i][i], d[i])
	}
	return a
}

// inverse returns a⁻¹ by exact Gauss–Jordan elimination, or false.
func inverse(a ratMat) (ratMat, bool) {
	n := len(a)
	w := newMat(n)
	inv := newMat(n)
	for i := range n {
		for j := range n {
			w[i][j].Set(a[i][j])
		}
		inv[i][i].SetInt64(1)
	}
	for c := range n {
		p := -1
		for i := c; i < n; i++ {
			if w[i][c].Sign() != 0 {
				p = i
				break
			}
		}
		if p < 0 {
			return nil, false
		}
		w[c], w[p] = w[p], w[c]
		inv[c], inv[p] = inv[p], inv[c]
		piv := new(big.Rat).Inv(w[c][c])
		for j := range n {
			w[c][j].Mul(w[c][j], piv)
			inv[c][j].Mul(inv[c][j], piv)
		}
		for i := range n {
			if i == c || w[i][c].Sign() == 0 {
				continue
			}
			f := new(big.Rat).Set(w[i][c])
			for j := range n {
				w[i][j].Sub(w[i][j], new(big.Rat).Mul(f, w[c][j]))
				inv[i][j].Sub(inv[i][j], new(big.Rat).Mul(f, inv[c][j]))
			}
		}
	}
	return inv, true
}

// observable reports that rank [Q; QA; …; QAⁿ⁻¹] = n, by exact elimination.
func observable(q, a ratMat) bool {
	n := len(q)
	var rows [][]*big.Rat
	blk := q
	for range n {
		for _, r := range blk {
			rows = append(rows, r)
		}
		next := newMat(n)
		for i := range n {
			for j := range n {
				for l := range n {
					next[i][j].Add(next[i][j], new(big.Rat).Mul(blk[i][l], a[l][j]))
				}
			}
		}
		blk = next
	}
	rank := 0
	w := make([][]*big.Rat, len(rows))
	for i, r := range rows {
		w[i] = make([]*big.Rat, n)
		for j := range n {
			w[i][j] = new(big.Rat).Set(r[j])
		}
	}
	for c := 0; c < n && rank < len(w); c++ {
		p := -1
		for i := rank; i < len(w); i++ {
			if w[i][c].Sign() != 0 {
				p = i
				break
			}
		}
		if p < 0 {
			continue
		}
		w[rank], w[p] = w[p], w[rank]
		for i := range w {
			if i != rank && w[i][c].Sign() != 0 {
				f := new(big.Rat).Quo(w[i][c], w[rank][c])
				for j := range n {
					w[i][j].Sub(w[i][j], new(big.Rat).Mul(f, w[rank][j]))
				}
			}
		}
		rank++
	}
	return rank == n
}

// linearCase plants x' = Ax, V = xᵀPx with PA = −(Q + S).
func linearCase(r *rand.Rand, k int) plantedCase {
	n := 1 + r.IntN(3)
	one := big.NewRat(1, 1)
	diag := func(x *big.Rat) []*big.Rat {
		d := make([]*big.Rat, n)
		for i := range d {
			d[i] = x
		}
		return d
	}
	// P: positive definite (MᵀM + I), or indefinite.
	p, pPos := addDiag(gram(r, n, n), diag(one)), true
	if r.IntN(5) == 0 {
		// A diagonal P with a zero entry (V vanishes along that axis) and
		// perhaps a negative one (V < 0 along that axis).
		p, pPos = newMat(n), false
		for i := range n {
			p[i][i].SetInt64(int64(1 + r.IntN(3)))
		}
		i := r.IntN(n)
		p[i][i].SetInt64(0)
		if r.IntN(2) == 0 {
			i := r.IntN(n)
			p[i][i].SetInt64(-int64(1 + r.IntN(3)))
		}
	}
	// Q: definite, near-singular definite, singular semidefinite, or indefinite.
	var q ratMat
	tr := provesAsymptotic
	kind := r.IntN(4)
	switch {
	case kind == 0:
		q = addDiag(gram(r, n, n), diag(big.NewRat(1, 2)))
	case kind == 1:
		q = addDiag(gram(r, n, n), diag(big.NewRat(1, 1000000000)))
	case kind == 2 && n > 1:
		q, tr = gram(r, n-1, n), provesStable // rank ≤ n − 1: singular
	default:
		q = newMat(n)
		for i := range n {
			q[i][i] = big.NewRat(int64(1+r.IntN(5)), 1)
		}
		q[r.IntN(n)][r.IntN(n)].SetInt64(0)
		i := r.IntN(n)
		q[i][i] = big.NewRat(-int64(1+r.IntN(5)), int64(1+r.IntN(3)))
		tr = provesNothing
	}
	if !pPos {
		tr = provesNothing
	}
	s := newMat(n)
	for i := range n {
		for j := i + 1; j < n; j++ {
			s[i][j] = randRat(r, 3)
			s[j][i] = new(big.Rat).Neg(s[i][j])
		}
	}
	pinv, ok := inverse(p)
	if !ok {
		return linearCase(r, k) // P singular by chance: draw again
	}
	a := newMat(n)
	for i := range n {
		for j := range n {
			for l := range n {
				t := new(big.Rat).Add(q[l][j], s[l][j])
				a[i][j].Sub(a[i][j], t.Mul(t, pinv[i][l]))
			}
		}
	}
	// With V̇ = −2xᵀQx only semidefinite, the invariance principle gives
	// asymptotic stability exactly when no solution but 0 stays in ker Q:
	// when the pair (Q, A) is observable, rank [Q; QA; …; QAⁿ⁻¹] = n
	// (Kalman's rank condition, common practice).
	if tr == provesStable && observable(q, a) {
		tr = provesAsymptotic
	}
	var b strings.Builder
	b.WriteString("# planted linear case\nstate ")
	for i := range n {
		if i > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "x%d", i+1)
	}
	b.WriteString("\n")
	for i := range n {
		fmt.Fprintf(&b, "x%d' = 0", i+1)
		for j := range n {
			if a[i][j].Sign() != 0 {
				fmt.Fprintf(&b, " + (%s)*x%d", a[i][j].RatString(), j+1)
			}
		}
		b.WriteString("\n")
	}
	b.WriteString("V = 0")
	for i := range n {
		for j := range n {
			if p[i][j].Sign() != 0 {
				fmt.Fprintf(&b, " + (%s)*x%d*x%d", p[i][j].RatString(), i+1, j+1)
			}
		}
	}
	b.WriteString("\n")
	return plantedCase{fmt.Sprintf("linear-%d", k), b.String(), tr}
}

// cubicCase plants x' = −a·x³, V = x² with a of known sign, or a free
// parameter a whose range sets the truth.
func cubicCase(r *rand.Rand, k int) plantedCase {
	a := randRat(r, 4)
	tr := provesAsymptotic
	switch a.Sign() {
	case 0:
		tr = provesStable
	case -1:
		tr = provesNothing
	}
	return plantedCase{fmt.Sprintf("cubic-%d", k), fmt.Sprintf("# planted cubic case\nstate x\nx' = -(%s)*x^3\nV = x^2\n", a.RatString()), tr}
}

// TestRandomizedSoundness runs the planted cases and counts false verdicts.
func TestRandomizedSoundness(t *testing.T) {
	n := soundnessCases(t)
	r := rand.New(rand.NewPCG(1, 2))
	start := time.Now()
	var falseHolds, falseFails, missed, refused int
	byTruth := map[truth]int{}
	for k := range n {
		var c plantedCase
		if k%4 == 3 {
			c = cubicCase(r, k)
		} else {
			c = linearCase(r, k)
		}
		byTruth[c.truth]++
		m, err := model.Parse(c.name+".lya", []byte(c.src))
		if err != nil {
			t.Fatalf("%s: the planted model does not parse: %v\n%s", c.name, err, c.src)
		}
		res, err := Check(m, c.name+".lya")
		if errors.Is(err, certify.ErrUnverified) {
			t.Fatalf("%s: the checker rejects the engine's certificate: %v\n%s", c.name, err, c.src)
		}
		if err != nil {
			refused++
			continue
		}
		holds := res.Verdict == checker.VerdictHolds || res.Verdict == checker.VerdictOnRegion
		asymptotic := res.Claim == checker.KindGlobal || res.Claim == checker.KindLocal
		switch {
		case holds && c.truth == provesNothing,
			holds && asymptotic && c.truth == provesStable:
			falseHolds++
			t.Errorf("%s: false %s (%s), truth: V proves %v\n%s", c.name, res.Verdict, res.Claim, c.truth, c.src)
		case res.Verdict == checker.VerdictFails && c.truth != provesNothing:
			falseFails++
			t.Errorf("%s: false fails, truth: V proves %v\n%s", c.name, c.truth, c.src)
		case !holds && c.truth != provesNothing:
			missed++
		}
	}
	t.Logf("%d planted cases (asymptotic %d, stable %d, nothing %d) in %v: %d false holds, %d false fails, %d undecided where V proves the claim, %d refused",
		n, byTruth[provesAsymptotic], byTruth[provesStable], byTruth[provesNothing], time.Since(start).Round(time.Millisecond), falseHolds, falseFails, missed, refused)
	if byTruth[provesAsymptotic] == 0 || byTruth[provesStable] == 0 || byTruth[provesNothing] == 0 {
		t.Error("some planted truth was never drawn")
	}
}
