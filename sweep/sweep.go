package sweep

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/big"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"

	"lyacert/certify/equilibria"
	"lyacert/checker"
	"lyacert/model"
	"lyacert/poly"
)

// GridAxis is one swept parameter: N exact values Lo + k·(Hi − Lo)/(N − 1),
// k = 0 … N−1, from Lo to Hi inclusive (Lo alone when N = 1).
type GridAxis struct {
	Name   string
	Lo, Hi *big.Rat
	N      int
}

// maxGridPoints bounds a grid so that an index fits comfortably in an int
// and a typing slip does not start a sweep of years.
const maxGridPoints = 1 << 40

// ParseGridAxis reads "name=lo:hi:n" with exact numbers or constant
// expressions lo and hi (lo < hi when n > 1) and an integer n ≥ 1.
func ParseGridAxis(s string) (GridAxis, error) {
	name, spec, ok := strings.Cut(s, "=")
	name = strings.TrimSpace(name)
	parts := strings.Split(spec, ":")
	if !ok || name == "" || len(parts) != 3 {
		return GridAxis{}, fmt.Errorf("--grid %q: expected name=lo:hi:n, e.g. r=0:30:61", s)
	}
	lo, err := model.ParseSetting(name + "=" + parts[0])
	if err != nil {
		return GridAxis{}, fmt.Errorf("--grid %s: lower end: %w", name, err)
	}
	hi, err := model.ParseSetting(name + "=" + parts[1])
	if err != nil {
		return GridAxis{}, fmt.Errorf("--grid %s: upper end: %w", name, err)
	}
	n, err := strconv.Atoi(strings.TrimSpace(parts[2]))
	if err != nil || n < 1 || n > maxGridPoints {
		return GridAxis{}, fmt.Errorf("--grid %s: the number of points %q is not an integer from 1 to %d", name, parts[2], maxGridPoints)
	}
	if n > 1 && lo.Value.Cmp(hi.Value) >= 0 {
		return GridAxis{}, fmt.Errorf("--grid %s: %d points need lo < hi, got %s:%s", name, n, lo.Value.RatString(), hi.Value.RatString())
	}
	return GridAxis{Name: name, Lo: lo.Value, Hi: hi.Value, N: n}, nil
}

// Value returns the k-th value of the axis, exactly.
func (a GridAxis) Value(k int) *big.Rat {
	if a.N == 1 {
		return new(big.Rat).Set(a.Lo)
	}
	v := poly.SubRat(new(big.Rat), a.Hi, a.Lo)
	poly.MulRat(v, v, new(big.Rat).SetInt64(int64(k)))
	poly.QuoRat(v, v, new(big.Rat).SetInt64(int64(a.N-1)))
	return poly.AddRat(v, v, a.Lo)
}

// Grid is the Cartesian product of its axes. Point indices run in row-major
// order: the last axis varies fastest.
type Grid []GridAxis

// Size returns the number of grid points, or an error beyond maxGridPoints.
func (g Grid) Size() (int, error) {
	size := 1
	for _, a := range g {
		if size > maxGridPoints/a.N {
			return 0, fmt.Errorf("the grid has more than %d points", maxGridPoints)
		}
		size *= a.N
	}
	return size, nil
}

// Coords returns the per-axis indices of point k.
func (g Grid) Coords(k int) []int {
	c := make([]int, len(g))
	for i := len(g) - 1; i >= 0; i-- {
		c[i] = k % g[i].N
		k /= g[i].N
	}
	return c
}

// Values returns the parameter values of point k, one per axis.
func (g Grid) Values(k int) []*big.Rat {
	c := g.Coords(k)
	out := make([]*big.Rat, len(g))
	for i, a := range g {
		out[i] = a.Value(c[i])
	}
	return out
}

// Shard selects the grid points with index ≡ I (mod N), 0 ≤ I < N: the
// deterministic slices that a job array runs in parallel. Round-robin
// spreads the expensive parts of a grid evenly over the shards.
type Shard struct{ I, N int }

// ParseShard reads "i/N".
func ParseShard(s string) (Shard, error) {
	a, b, ok := strings.Cut(s, "/")
	i, err1 := strconv.Atoi(strings.TrimSpace(a))
	n, err2 := strconv.Atoi(strings.TrimSpace(b))
	if !ok || err1 != nil || err2 != nil || n < 1 || i < 0 || i >= n {
		return Shard{}, fmt.Errorf("--shard %q: expected i/N with 0 ≤ i < N, e.g. 0/4", s)
	}
	return Shard{i, n}, nil
}

// Owns reports whether grid point k belongs to the shard.
func (s Shard) Owns(k int) bool { return s.N <= 1 || k%s.N == s.I }

// OrderedStrings is a JSON object of strings whose keys keep their order.
type OrderedStrings struct {
	Keys, Values []string
}

// MarshalJSON writes the object with the keys in order.
func (o OrderedStrings) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	b.WriteByte('{')
	for i, k := range o.Keys {
		if i > 0 {
			b.WriteByte(',')
		}
		kj, _ := json.Marshal(k)
		vj, _ := json.Marshal(o.Values[i])
		b.Write(kj)
		b.WriteByte(':')
		b.Write(vj)
	}
	b.WriteByte('}')
	return b.Bytes(), nil
}

// UnmarshalJSON reads an object of strings, keeping the key order.
func (o *OrderedStrings) UnmarshalJSON(data []byte) error {
	dec := json.NewDecoder(bytes.NewReader(data))
	t, err := dec.Token()
	if err != nil {
		return err
	}
	if d, ok := t.(json.Delim); !ok || d != '{' {
		return errors.New("expected an object")
	}
	o.Keys, o.Values = nil, nil
	for dec.More() {
		kt, err := dec.Token()
		if err != nil {
			return err
		}
		var v string
		if err := dec.Decode(&v); err != nil {
			return err
		}
		o.Keys = append(o.Keys, kt.(string))
		o.Values = append(o.Values, v)
	}
	_, err = dec.Token()
	return err
}

// Get returns the value of key k.
func (o OrderedStrings) Get(k string) (string, bool) {
	i := slices.Index(o.Keys, k)
	if i < 0 {
		return "", false
	}
	return o.Values[i], true
}

// SweepLine is one line of a sweep's output: one equilibrium at one grid
// point (Eq of Eqs), or, with Eq = Eqs = 0, a grid point where no isolated
// equilibrium was found or the model is undefined. Lines hold no times or
// host names, so that equal inputs give byte-equal lines.
type SweepLine struct {
	Index       int             `json:"index"` // grid point, row-major
	Of          int             `json:"of"`    // grid points in all
	Params      OrderedStrings  `json:"params"`
	Eq          int             `json:"eq"`
	Eqs         int             `json:"eqs"`
	Equilibrium *OrderedStrings `json:"equilibrium"` // decimals; null without one
	Status      string          `json:"status,omitempty"`
	Class       string          `json:"class,omitempty"`
	MaxRealEig  *float64        `json:"max_real_eig"`
	// SpectralRadius is the largest |λ| of the map's Jacobian (discrete time).
	SpectralRadius *float64 `json:"spectral_radius,omitempty"`
	Verdict        string   `json:"verdict"`
	Claim          string   `json:"claim"`
	Digest         *string  `json:"certificate_digest"`
	Reason         string   `json:"reason,omitempty"`
}

// Marshal returns the line as compact JSON with a final newline.
func (l *SweepLine) Marshal() []byte {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(l); err != nil {
		panic(err) // every field is marshalable
	}
	return b.Bytes()
}

// SweepPoint is the result at one grid point: its lines, and the
// certificates behind them (Docs[i] backs Lines[i]; nil where nothing is
// claimed).
type SweepPoint struct {
	Index int
	Lines []SweepLine
	Docs  []*checker.Document
}

// Progress receives the number of grid points completed.
type Progress interface{ Add(points int) }

// SweepOptions describe a sweep.
type SweepOptions struct {
	File     string          // the model's name in messages and certificates
	Src      []byte          // the model text
	Settings []model.Setting // parameters fixed for the whole sweep
	Grid     Grid
	Shard    Shard
	Q        []*big.Rat // diagonal of Q; nil for the identity
	Full     bool       // full nonlinear check at exact stable equilibria
	Jobs     int        // workers; ≤ 0 means runtime.GOMAXPROCS(0)
	// Skip reports grid points that are already done (resume).
	Skip func(index int) bool
	// MaxPoints stops after that many points of this run (0: no limit).
	MaxPoints int
	Progress  Progress
}

// SweepSummary counts what a sweep did.
type SweepSummary struct {
	Points    int            // grid points computed in this run
	Remaining int            // points of the shard left undone (interrupted or stopped)
	Lines     int            // lines written in this run
	Verdicts  map[string]int // lines by verdict
}

// CheckSweep validates a sweep before it starts: every axis names a
// declared parameter not fixed otherwise, every grid value lies in the
// parameter's declared range, and no parameter stays free. Errors carry
// the model's positions.
func CheckSweep(file string, src []byte, settings []model.Setting, grid Grid) error {
	m, err := model.Parse(file, src, settings...)
	if err != nil {
		return err
	}
	var errs poly.ErrorList
	seen := map[string]bool{}
	for _, a := range grid {
		p, ok := m.Param(a.Name)
		switch {
		case !ok:
			errs.Add(poly.Pos{File: "--grid", Line: 1, Col: 1}, "--grid %s: no parameter of that name in %s", a.Name, file)
			continue
		case seen[a.Name]:
			errs.Add(poly.Pos{File: "--grid", Line: 1, Col: 1}, "--grid %s is given twice", a.Name)
			continue
		case p.Fixed != nil:
			errs.Add(p.Pos, "--grid %s: the parameter is fixed (= %s) and cannot be swept", a.Name, p.Fixed.RatString())
			continue
		}
		seen[a.Name] = true
		// The range is an interval, so the two ends decide for every value.
		for _, v := range []*big.Rat{a.Lo, a.Hi} {
			if !p.Range.Contains(v) {
				errs.Add(p.Pos, "--grid %s: the value %s lies outside the declared range %s", a.Name, v.RatString(), p.Range)
			}
		}
	}
	for _, p := range m.FreeParams() {
		if !seen[p.Name] {
			errs.Add(p.Pos, "parameter %s is free; sweep it (--grid %s=LO:HI:N) or fix it (--set %s=VALUE)", p.Name, p.Name, p.Name)
		}
	}
	if _, err := grid.Size(); err != nil {
		errs.Add(poly.Pos{File: "--grid", Line: 1, Col: 1}, "%v", err)
	}
	return errs.Err()
}

// Sweep finds and certifies the equilibria at every grid point of the shard
// that Skip does not exclude, on opts.Jobs workers, and calls emit for each
// point in increasing index order (whatever order the workers finish in).
// Cancelling ctx stops the sweep cleanly: points already emitted stay
// emitted, and the summary counts the rest as remaining. Every line that
// claims something is backed by a certificate that checker.Verify has
// accepted (equilibria.CertifyEquilibrium). An error from emit stops the sweep and is
// returned.
func Sweep(ctx context.Context, opts SweepOptions, emit func(SweepPoint) error) (SweepSummary, error) {
	sum := SweepSummary{Verdicts: map[string]int{}}
	size, err := opts.Grid.Size()
	if err != nil {
		return sum, err
	}
	base, err := model.Parse(opts.File, opts.Src, opts.Settings...)
	if err != nil {
		return sum, err
	}
	var todo []int
	for k := 0; k < size; k++ {
		if opts.Shard.Owns(k) && (opts.Skip == nil || !opts.Skip(k)) {
			todo = append(todo, k)
		}
	}
	sum.Remaining = len(todo)
	if opts.MaxPoints > 0 && len(todo) > opts.MaxPoints {
		todo = todo[:opts.MaxPoints]
	}
	jobs := opts.Jobs
	if jobs <= 0 {
		jobs = runtime.GOMAXPROCS(0)
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	work := make(chan int)
	results := make(chan SweepPoint, 2*jobs)
	var wg sync.WaitGroup
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for pos := range work {
				sp := sweepPoint(opts, base, todo[pos], size)
				sp.Index = pos // position in todo; restored below
				results <- sp
			}
		}()
	}
	go func() {
		defer close(work)
		for pos := range todo {
			select {
			case work <- pos:
			case <-ctx.Done():
				return
			}
		}
	}()
	go func() {
		wg.Wait()
		close(results)
	}()
	pending := map[int]SweepPoint{}
	next := 0
	var emitErr error
	for sp := range results {
		pending[sp.Index] = sp
		for {
			p, ok := pending[next]
			if !ok || emitErr != nil {
				break
			}
			delete(pending, next)
			p.Index = todo[next]
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

// sweepPoint computes one grid point.
func sweepPoint(opts SweepOptions, base *model.Model, index, size int) SweepPoint {
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
		sp.Docs = []*checker.Document{nil}
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
	co := equilibria.CertifyOptions{Q: opts.Q, Full: opts.Full, Source: opts.File}
	eqs := len(search.Equilibria)
	for i := range search.Equilibria {
		e := &search.Equilibria[i]
		line := SweepLine{Index: index, Of: size, Params: params, Eq: i + 1, Eqs: eqs,
			Equilibrium: equilibriumDecimals(m, e), Status: e.Status, Class: e.Class}
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
		c, err := equilibria.CertifyEquilibrium(m, e, co)
		var doc *checker.Document
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
