package pave

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"runtime"
	"slices"
	"strings"

	"sync/atomic"

	"github.com/lyacert/lyacert/certify/interval"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/internal/workpool"
	"github.com/lyacert/lyacert/poly"
)

// Side is one side of the box to pave: the ring index of a parameter and its
// range there, bounded. An open end stays open: the boxes at it exclude it.
type Side struct {
	Var   int
	Range poly.Interval
}

// Progress receives how much of the box has been classified, as a share of
// its volume in [0, 1], for display. Calls come from the goroutine that
// called PaveRegion, in increasing order.
type Progress interface {
	Paved(share float64)
}

// TaskProgress is a Progress that is also told how many of the paving's
// subtrees are classified, out of how many. Work is counted, not volume:
// the boxes near the boundary of the region cost the most and hold the least
// volume, so a count of subtrees predicts the remaining time better.
type TaskProgress interface {
	Progress
	Tasks(done, total int)
}

// Options tune PaveRegion; the zero value is ready to use.
type Options struct {
	// Workers is the number of goroutines; ≤ 0 means GOMAXPROCS. The
	// result does not depend on it.
	Workers int
	// Progress, if not nil, is told how far the paving has come.
	Progress Progress
	// MaxBoxes bounds the number of boxes of the tree; ≤ 0 means
	// DefaultMaxBoxes.
	MaxBoxes int
}

// DefaultMaxBoxes is the default bound on the number of boxes.
const DefaultMaxBoxes = 4 << 20

// ErrTooManyBoxes is returned when the tree would exceed Options.MaxBoxes.
var ErrTooManyBoxes = errors.New("the paving needs more boxes than allowed; use a coarser resolution or a smaller box")

// Result is the result of PaveRegion: the tree in the encoding of
// claims.Paving, and statistics.
type Result struct {
	Box   []Side
	Level int    // the resolution is 2^-Level of each side
	Tree  string // depth-first codes, see claims.Paving
	// Boxes is the number of boxes of the tree (len(Tree)).
	Boxes int
	// Inside, Outside, Undecided count the leaves of each class.
	Inside, Outside, Undecided int
	// Rejected counts the boxes that the float pass proposed as inside or
	// outside and the exact test did not confirm.
	Rejected int
}

// Level returns the smallest L ≥ 0 with 2^-L ≤ res: boxes are halved until
// each side is at most res times the corresponding side of the box. It
// returns an error unless 2^-claims.MaxPavingLevel ≤ res.
func Level(res *big.Rat) (int, error) {
	if res == nil || res.Sign() <= 0 {
		return 0, fmt.Errorf("the resolution must be > 0")
	}
	for l := 0; l <= claims.MaxPavingLevel; l++ {
		// 2^-l ≤ res ⇔ num·2^l ≥ den
		if new(big.Int).Lsh(res.Num(), uint(l)).Cmp(res.Denom()) >= 0 {
			return l, nil
		}
	}
	return 0, fmt.Errorf("resolution %s is finer than 2^-%d", res.RatString(), claims.MaxPavingLevel)
}

// PaveRegion paves the box for the set where every condition is > 0 (set
// inversion by interval arithmetic; Moore 1966; Jaulin & Walter 1993).
//
// Boxes are halved along their widest side relative to the box (ties to the
// first side) while a side is wider than 2^-level of the box's side. Each
// box is first classified by a float64 pass with outward rounding (package
// interval): the natural extension of every condition intersected with its
// mean-value form. The float pass only proposes. Every leaf is then
// decided by the exact test that checker.Verify applies: the centred
// form of each condition (poly.CenteredForm), exact, with the box's faces
// on an open end of the box excluded. A box proposed inside or outside
// that the exact test does not confirm is treated as undecided: halved, or
// at the resolution left undecided (or classified by the exact test). So
// the tree is exactly what the checker accepts.
//
// The work is spread over Options.Workers goroutines by subtrees; the
// result does not depend on their number. PaveRegion returns ctx.Err()
// (wrapped) when ctx is cancelled, ErrTooManyBoxes when the tree would
// exceed Options.MaxBoxes, and an error when a condition involves a
// variable that is not a side of the box or a side is not bounded.
func PaveRegion(ctx context.Context, conds []*poly.Poly, box []Side, level int, opts Options) (*Result, error) {
	n := len(box)
	if n == 0 || n > poly.MaxCenteredDims {
		return nil, fmt.Errorf("a paving needs 1 to %d parameters, not %d", poly.MaxCenteredDims, n)
	}
	if level < 0 || level > claims.MaxPavingLevel {
		return nil, fmt.Errorf("resolution level %d outside [0, %d]", level, claims.MaxPavingLevel)
	}
	vars := make([]int, n)
	sides := make([]poly.Interval, n)
	var open poly.OpenFaces
	for i, s := range box {
		vars[i], sides[i] = s.Var, s.Range
		if s.Range.Lo.Inf != 0 || s.Range.Hi.Inf != 0 {
			return nil, fmt.Errorf("side %d of the box, %s, is not bounded", i+1, s.Range)
		}
		if s.Range.Lo.Open {
			open.Lo |= 1 << i
		}
		if s.Range.Hi.Open {
			open.Hi |= 1 << i
		}
	}
	e := &engine{n: n, level: level, open: open, max: int64(opts.MaxBoxes)}
	if e.max <= 0 {
		e.max = DefaultMaxBoxes
	}
	root := make([]*poly.CenteredForm, len(conds))
	for j, q := range conds {
		f, err := poly.NewCenteredForm(q, vars, sides)
		if err != nil {
			return nil, fmt.Errorf("condition %d: %w", j+1, err)
		}
		root[j] = f
		e.fps = append(e.fps, newFloatPoly(q, vars))
	}
	e.deg = maxDegree(e.fps)
	for _, s := range sides {
		w, _ := s.Width()
		e.lo = append(e.lo, interval.FromRat(s.Lo.Value))
		e.w = append(e.w, interval.FromRat(w))
	}
	workers := opts.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}

	// The top of the tree is classified here, down to a fixed depth (not
	// depending on the number of workers); the subtrees below are tasks.
	var segs []segment
	var tasks []task
	var topShare float64
	tw := e.newWorker()
	var top func(g grid, forms []*poly.CenteredForm) error
	top = func(g grid, forms []*poly.CenteredForm) error {
		code, split, err := tw.classify(g, forms)
		if err != nil {
			return err
		}
		if !split {
			segs = append(segs, segment{code: code})
			topShare += volumeShare(g)
			return nil
		}
		if depth(g) >= taskDepth {
			segs = append(segs, segment{task: len(tasks) + 1})
			tasks = append(tasks, task{g: g, forms: forms})
			return nil
		}
		segs = append(segs, segment{code: claims.PaveSplit})
		dim := poly.SplitDim(g.K)
		lo, hi := g.Halves(dim)
		if err := top(lo, halves(forms, dim, false)); err != nil {
			return err
		}
		return top(hi, halves(forms, dim, true))
	}
	if err := top(grid{A: make([]int64, n), K: make([]int, n)}, root); err != nil {
		return nil, err
	}
	report := func(share float64) {
		if opts.Progress != nil {
			opts.Progress.Paved(min(share, 1))
		}
	}
	report(topShare)
	tp, _ := opts.Progress.(TaskProgress)
	if tp != nil {
		tp.Tasks(0, len(tasks))
	}
	rejectedTop := tw.rejected

	results := make([]taskResult, len(tasks))
	parent := ctx
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	done := workpool.Run(ctx, workpool.Count(len(tasks)), min(workers, max(len(tasks), 1)), func() func(int) taskResult {
		w := e.newWorker()
		return func(i int) taskResult {
			var b strings.Builder
			err := w.subtree(ctx, tasks[i].g, tasks[i].forms, &b)
			r := taskResult{tree: b.String(), err: err, rejected: w.rejected, ran: true}
			w.rejected = 0
			if err != nil {
				cancel()
			}
			return r
		}
	})
	share, finished := topShare, 0
	for r := range done {
		results[r.Item] = r.Value
		share += volumeShare(tasks[r.Item].g)
		report(share)
		finished++
		if tp != nil {
			tp.Tasks(finished, len(tasks))
		}
	}
	// The first error in task order, so that the error, too, does not
	// depend on scheduling; a cancellation from outside comes last.
	firstErr := parent.Err()
	for _, r := range results {
		if r.err != nil && !errors.Is(r.err, context.Canceled) {
			firstErr = r.err
			break
		}
		if !r.ran || r.err != nil {
			firstErr = context.Cause(ctx)
		}
	}
	if firstErr != nil {
		if errors.Is(firstErr, context.Canceled) || errors.Is(firstErr, context.DeadlineExceeded) {
			return nil, fmt.Errorf("paving interrupted: %w", firstErr)
		}
		return nil, firstErr
	}

	var b strings.Builder
	pv := &Result{Box: slices.Clone(box), Level: level, Rejected: rejectedTop}
	for _, s := range segs {
		if s.task == 0 {
			b.WriteByte(s.code)
			continue
		}
		r := results[s.task-1]
		b.WriteString(r.tree)
		pv.Rejected += r.rejected
	}
	pv.Tree = b.String()
	pv.Boxes = len(pv.Tree)
	if int64(pv.Boxes) > e.max {
		return nil, ErrTooManyBoxes
	}
	for _, c := range []byte(pv.Tree) {
		switch c {
		case claims.PaveInside:
			pv.Inside++
		case claims.PaveOutside:
			pv.Outside++
		case claims.PaveUndecided:
			pv.Undecided++
		}
	}
	return pv, nil
}

// taskDepth is the depth at which the tree is cut into tasks (at most
// 2^taskDepth of them).
const taskDepth = 6

type segment struct {
	code byte
	task int // 1 + the index of the task whose tree goes here; 0 for a code
}

type task struct {
	g     grid
	forms []*poly.CenteredForm
}

type taskResult struct {
	tree     string
	err      error
	rejected int
	ran      bool
}

// halves returns the forms on one half of the box.
func halves(forms []*poly.CenteredForm, dim int, upper bool) []*poly.CenteredForm {
	out := make([]*poly.CenteredForm, len(forms))
	for j, f := range forms {
		out[j] = new(poly.CenteredForm).Half(f, dim, upper)
	}
	return out
}

// grid is a box of the paving in normalized coordinates (poly.DyadicBox,
// the kernel's encoding).
type grid = poly.DyadicBox

// depth returns the number of halvings that made g.
func depth(g grid) int {
	d := 0
	for _, k := range g.K {
		d += k
	}
	return d
}

// volumeShare returns g's share of the paved box's volume.
func volumeShare(g grid) float64 { return math.Ldexp(1, -depth(g)) }

// engine holds what all workers share (read only).
type engine struct {
	n     int
	level int
	open  poly.OpenFaces
	fps   []floatPoly
	deg   int
	lo, w []interval.F // float enclosures of each side's lower end and width
	max   int64
	boxes atomic.Int64
}

// worker classifies boxes; one per goroutine.
type worker struct {
	*engine
	x        []interval.F
	pm       []interval.F
	rejected int
	bufs     [][]*poly.CenteredForm // forms per depth below a task's root
	steps    int
}

func (e *engine) newWorker() *worker {
	return &worker{engine: e, x: make([]interval.F, e.n), pm: make([]interval.F, e.n)}
}

// floatClass proposes a class for the box by the float pass.
func (w *worker) floatClass(g grid) byte {
	for i := range g.A {
		s := interval.F{Lo: math.Ldexp(float64(g.A[i]), -g.K[i]), Hi: math.Ldexp(float64(g.A[i]+1), -g.K[i])}
		w.x[i] = w.lo[i].Add(w.w[i].Mul(s))
		if math.IsInf(w.x[i].Lo, 0) || math.IsInf(w.x[i].Hi, 0) {
			// A side beyond float64 (an end past 1e308): the float pass
			// proposes nothing there; the exact test decides alone.
			return claims.PaveUndecided
		}
		w.pm[i] = interval.Pt(w.x[i].Mid())
	}
	ps, pm := powersOf(w.x, w.deg), powersOf(w.pm, w.deg)
	inside := true
	for _, fp := range w.fps {
		y := fp.enclose(w.x, ps, pm)
		if y.Hi <= 0 {
			return claims.PaveOutside
		}
		inside = inside && y.Lo > 0
	}
	if inside {
		return claims.PaveInside
	}
	return claims.PaveUndecided
}

// exactClass decides the box by the centred forms, as the checker does.
func (w *worker) exactClass(g grid, forms []*poly.CenteredForm) byte {
	faces := g.OpenFacesOn(w.open)
	inside := true
	for _, f := range forms {
		if f.NonPositive() {
			return claims.PaveOutside
		}
		inside = inside && f.PositiveOn(faces)
	}
	if inside {
		return claims.PaveInside
	}
	return claims.PaveUndecided
}

// classify returns the code of a leaf, or split true when the box is to be
// halved: the float pass proposes, the exact test decides.
func (w *worker) classify(g grid, forms []*poly.CenteredForm) (code byte, split bool, err error) {
	if w.boxes.Add(1) > w.max {
		return 0, false, ErrTooManyBoxes
	}
	splittable := g.K[poly.SplitDim(g.K)] < w.level
	if fc := w.floatClass(g); fc != claims.PaveUndecided {
		ec := w.exactClass(g, forms)
		if ec != claims.PaveUndecided {
			return ec, false, nil
		}
		w.rejected++
	} else if splittable {
		return 0, true, nil
	}
	if splittable {
		return 0, true, nil
	}
	return w.exactClass(g, forms), false, nil
}

// subtree writes the codes of the subtree at g, depth first.
func (w *worker) subtree(ctx context.Context, g grid, forms []*poly.CenteredForm, b *strings.Builder) error {
	if w.steps%1024 == 0 {
		if err := ctx.Err(); err != nil {
			return err
		}
	}
	w.steps++
	code, split, err := w.classify(g, forms)
	if err != nil {
		return err
	}
	if !split {
		b.WriteByte(code)
		return nil
	}
	b.WriteByte(claims.PaveSplit)
	// Children's forms live in per-depth buffers: the lower child's subtree
	// only uses deeper ones, so the upper child can reuse the same slot.
	d := depth(g) + 1
	for len(w.bufs) <= d {
		fs := make([]*poly.CenteredForm, len(forms))
		for j := range fs {
			fs[j] = new(poly.CenteredForm)
		}
		w.bufs = append(w.bufs, fs)
	}
	child := w.bufs[d]
	dim := poly.SplitDim(g.K)
	lo, hi := g.Halves(dim)
	for j, f := range forms {
		child[j].Half(f, dim, false)
	}
	if err := w.subtree(ctx, lo, child, b); err != nil {
		return err
	}
	for j, f := range forms {
		child[j].Half(f, dim, true)
	}
	return w.subtree(ctx, hi, child, b)
}
