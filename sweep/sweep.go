package sweep

import (
	"context"
	"fmt"
	"math"
	"math/big"
	"runtime"
	"slices"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/internal/workpool"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// SweepPoint is the result at one grid point: its lines, and the
// certificates behind them (Docs[i] backs Lines[i]; nil where nothing is
// claimed).
type SweepPoint struct {
	Index int
	Lines []SweepLine
	Docs  []*claims.Document
}

// Progress receives the number of grid points completed.
type Progress interface{ Add(points int) }

// SweepOptions describe a sweep.
type SweepOptions struct {
	File     string          // the model's name in messages
	Src      []byte          // the model text
	Settings []model.Setting // parameters fixed for the whole sweep
	Grid     Grid
	Shard    Shard      // the zero Shard is the whole grid
	Q        []*big.Rat // diagonal of Q; nil for the identity
	Full     bool       // full nonlinear check at exact stable equilibria
	Jobs     int        // workers, at most MaxJobs(); ≤ 0 means runtime.GOMAXPROCS(0)
	// Resume is the number of the shard's first grid points that are done
	// already: a partial output that File.CheckResume accepted holds them.
	Resume int
	// MaxPoints stops after that many points of this run (0: no limit).
	MaxPoints int
	Progress  Progress
}

// Identity returns the identity of the sweep (see Identity).
func (o *SweepOptions) Identity() (Identity, error) {
	return NewIdentity(o.File, o.Src, o.Settings, o.Grid, o.Q, o.Full)
}

// SweepSummary counts what a sweep did.
type SweepSummary struct {
	Points    int            // grid points computed in this run
	Remaining int            // points of the shard left undone (interrupted or stopped)
	Lines     int            // lines written in this run
	Verdicts  map[string]int // lines by verdict
}

// Sweep finds and certifies the equilibria at every grid point of the shard
// after the first opts.Resume, on opts.Jobs workers, and calls emit for each
// point in increasing index order (whatever order the workers finish in).
// Every line carries the sweep digest and is sealed (SweepLine.Seal).
// Cancelling ctx stops the sweep cleanly: points already emitted stay
// emitted, and the summary counts the rest as remaining. Every line that
// claims something is backed by a certificate that checker.Verify has
// accepted (equilibria.CertifyEquilibrium); the certificates name the model
// by its digest (Identity.Model), so that they, too, do not depend on the
// path of the model file. An error from emit stops the sweep and is
// returned. Memory does not grow with the grid: points are handed out one
// by one.
func Sweep(ctx context.Context, opts SweepOptions, emit func(SweepPoint) error) (SweepSummary, error) {
	sum := SweepSummary{Verdicts: map[string]int{}}
	size, err := opts.Grid.Size()
	if err != nil {
		return sum, err
	}
	shard := opts.Shard.norm()
	owned := shard.Points(size)
	switch {
	case shard.I < 0 || shard.I >= shard.N || shard.N > MaxGridPoints:
		return sum, fmt.Errorf("shard %d/%d: expected 0 ≤ i < N ≤ %d", shard.I, shard.N, MaxGridPoints)
	case opts.Jobs > MaxJobs():
		return sum, fmt.Errorf("%d workers: at most %d", opts.Jobs, MaxJobs())
	case opts.Resume < 0 || opts.Resume > owned:
		return sum, fmt.Errorf("%d grid points done already, but the shard has %d", opts.Resume, owned)
	case opts.MaxPoints < 0:
		return sum, fmt.Errorf("--max-points %d is negative", opts.MaxPoints)
	}
	id, err := opts.Identity()
	if err != nil {
		return sum, err
	}
	base, err := model.Parse(opts.File, opts.Src, opts.Settings...)
	if err != nil {
		return sum, err
	}
	pc := pointContext{opts: &opts, base: base, size: size, sweep: id.Digest(), source: "model " + id.Model}
	sum.Remaining = owned - opts.Resume
	todo := sum.Remaining
	if opts.MaxPoints > 0 {
		todo = min(todo, opts.MaxPoints)
	}
	points := func(yield func(int) bool) {
		for j := range todo {
			if !yield(shard.Nth(opts.Resume + j)) {
				return
			}
		}
	}
	jobs := opts.Jobs
	if jobs <= 0 {
		jobs = runtime.GOMAXPROCS(0)
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	results := workpool.Run(ctx, points, min(jobs, max(todo, 1)), func() func(int) SweepPoint {
		return pc.point
	})
	pending := map[int]SweepPoint{} // by position in the sequence
	next := 0
	var emitErr error
	for r := range results {
		pending[r.Seq] = r.Value
		for emitErr == nil {
			p, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			next++
			if err := emit(p); err != nil {
				emitErr = err
				cancel()
				break
			}
			sum.Points++
			sum.Remaining--
			sum.Lines += len(p.Lines)
			for _, l := range p.Lines {
				sum.Verdicts[l.Verdict]++
			}
			if opts.Progress != nil {
				opts.Progress.Add(1)
			}
		}
	}
	return sum, emitErr
}

// pointContext is what every grid point of one sweep shares.
type pointContext struct {
	opts   *SweepOptions
	base   *model.Model
	size   int
	sweep  string // the sweep digest
	source string // the certificates' source
}

// point computes grid point index and seals its lines.
func (pc *pointContext) point(index int) SweepPoint {
	sp := sweepPoint(pc.opts, pc.base, index, pc.size, pc.source)
	for i := range sp.Lines {
		sp.Lines[i].Sweep = pc.sweep
		sp.Lines[i].Seal()
	}
	return sp
}

// sweepPoint computes one grid point.
func sweepPoint(opts *SweepOptions, base *model.Model, index, size int, source string) SweepPoint {
	vals := opts.Grid.Values(index)
	var settings []model.Setting
	params := OrderedStrings{}
	for i, a := range opts.Grid {
		settings = append(settings, model.Setting{Name: a.Name, Value: vals[i]})
		params.Keys = append(params.Keys, a.Name)
		params.Values = append(params.Values, poly.RatString(vals[i]))
	}
	sp := SweepPoint{Index: index}
	none := func(reason string) SweepPoint {
		sp.Lines = []SweepLine{{Index: index, Of: size, Params: params, Verdict: checker.VerdictUndecided, Claim: checker.KindNone, Reason: reason}}
		sp.Docs = []*claims.Document{nil}
		return sp
	}
	m, err := model.FixParams(base, settings)
	if err != nil {
		return none("the model is undefined here: " + oneLine(err))
	}
	search, err := equilibria.FindEquilibria(m)
	if err != nil {
		return none("no equilibria: " + oneLine(err))
	}
	if len(search.Equilibria) == 0 {
		if search.NonIsolated {
			return none("the equilibria are not isolated (a curve or surface of equilibria); the linearization certifies none of them")
		}
		return none("no equilibrium found")
	}
	co := equilibria.CertifyOptions{Q: opts.Q, Full: opts.Full, Source: source}
	eqs := len(search.Equilibria)
	for i := range search.Equilibria {
		e := &search.Equilibria[i]
		line := SweepLine{Index: index, Of: size, Params: params, Eq: i + 1, Eqs: eqs,
			Equilibrium: equilibriumDecimals(m, e), Status: e.Status, Class: e.Class, Own: equilibria.IsOwn(m, e)}
		if v := equilibria.MaxRealPart(e.Eigenvalues); !math.IsNaN(v) {
			v = round6(v)
			line.MaxRealEig = &v
		}
		if m.Discrete {
			if v := equilibria.SpectralRadius(e.Eigenvalues); !math.IsNaN(v) {
				v = round6(v)
				line.SpectralRadius = &v
			}
		}
		// A grid point runs to its end: the sweep stops between points, so
		// that no line records a point cut off half way.
		c, err := equilibria.CertifyEquilibrium(context.Background(), m, e, co)
		var doc *claims.Document
		switch {
		case err != nil:
			line.Verdict, line.Claim, line.Reason = checker.VerdictUndecided, checker.KindNone, "not certified: "+oneLine(err)
		default:
			line.Verdict, line.Claim, line.Reason = c.Verdict, c.Claim, c.Reason
			if c.Doc != nil {
				d := c.Doc.Digest
				line.Digest = &d
				doc = c.Doc
			}
		}
		if search.NonIsolated {
			line.Reason += "; there is also a curve or surface of equilibria"
		}
		sp.Lines = append(sp.Lines, line)
		sp.Docs = append(sp.Docs, doc)
	}
	return sp
}

// round6 rounds to 6 significant digits, so that lines do not depend on the
// last bits of a float eigenvalue.
func round6(v float64) float64 {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 6, 64), 64)
	if r == 0 {
		return 0 // no negative zero
	}
	return r
}

func oneLine(err error) string {
	return strings.Join(strings.Fields(strings.ReplaceAll(err.Error(), "\n", "; ")), " ")
}

// GCPercent is the garbage collector's target (runtime/debug.SetGCPercent)
// that lyacert sweep runs with: a sweep allocates many short-lived values
// per point and keeps little alive, and collecting at 400 % heap growth
// instead of Go's default 100 % costs a few megabytes while letting two
// workers scale (measured in BENCHMARKS.md: 1.9× instead of 1.4×).
const GCPercent = 400

// EquilibriumDigits is the number of significant digits of the decimals of
// an exact equilibrium; an enclosed one gets enclosedDigits, fewer than its
// box pins down.
const (
	EquilibriumDigits = 15
	enclosedDigits    = 9
)

// equilibriumDecimals returns the coordinates as decimals: correctly
// rounded for an exact point and for the centre of a box (whose half-width
// is below the last digit shown), Newton's floats otherwise.
func equilibriumDecimals(m *model.Model, e *equilibria.Equilibrium) *OrderedStrings {
	o := &OrderedStrings{Keys: slices.Clone(m.States)}
	for i := range m.States {
		var s string
		switch e.Status {
		case equilibria.EquilibriumExact:
			s = RatDecimal(e.Point[i], EquilibriumDigits)
		case equilibria.EquilibriumEnclosed:
			s = RatDecimal(e.Box[i].Mid(), enclosedDigits)
		default:
			s = strconv.FormatFloat(e.Approx[i], 'g', enclosedDigits, 64)
		}
		o.Values = append(o.Values, s)
	}
	return o
}

// RatDecimal formats q with the given number of significant digits,
// correctly rounded (poly.URoot.Decimal).
func RatDecimal(q *big.Rat, digits int) string {
	return poly.URoot{Exact: q}.Decimal(digits)
}
