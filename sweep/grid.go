package sweep

import (
	"fmt"
	"maps"
	"math/big"
	"runtime"
	"slices"
	"strconv"
	"strings"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// GridAxis is one swept parameter: N exact values Lo + k·(Hi − Lo)/(N − 1),
// k = 0 … N−1, from Lo to Hi inclusive (Lo alone when N = 1).
type GridAxis struct {
	Name   string
	Lo, Hi *big.Rat
	N      int
}

// MaxGridPoints bounds a grid (the product of its axes), a shard count and
// the "of" of a line read back: 10⁸ points are days of work on a cluster at
// the measured few hundred points per second and core, and the bound keeps
// every count and index far from overflow (index·N < 2⁶³). A typing slip
// such as a grid of 10⁹ points is refused before anything is allocated.
const MaxGridPoints = 100_000_000

// MaxJobs is the largest --jobs accepted: four workers per CPU, and at least
// 256 (the workers of a sweep wait on exact arithmetic, not on I/O, so more
// only costs memory).
func MaxJobs() int { return max(256, 4*runtime.NumCPU()) }

// ParseGridRange reads a --grid range "name=lo..hi" with exact numbers or
// constant expressions lo and hi. The colon forms "name=lo:hi:n" and
// "name=lo:hi" of earlier versions are refused with the new spelling: a
// colon reads start:step:stop to many engineers, so r=0:30:61 could be
// taken for a step of 30.
func ParseGridRange(s string) (name string, lo, hi *big.Rat, err error) {
	name, spec, ok := strings.Cut(s, "=")
	name = strings.TrimSpace(name)
	if ok && name != "" && strings.Contains(spec, ":") {
		parts := strings.Split(spec, ":")
		hint := fmt.Sprintf("--grid %s=LO..HI --points %s=N", name, name)
		if len(parts) == 3 {
			hint = fmt.Sprintf("--grid %s=%s..%s --points %s=%s", name, strings.TrimSpace(parts[0]), strings.TrimSpace(parts[1]), name, strings.TrimSpace(parts[2]))
		}
		return "", nil, nil, fmt.Errorf("--grid %q: ranges are written with two dots and the number of points is given apart: %s", s, hint)
	}
	a, b, ok2 := strings.Cut(spec, "..")
	if !ok || !ok2 || name == "" || strings.Contains(b, "..") || strings.HasPrefix(b, ".") || strings.HasSuffix(a, ".") {
		return "", nil, nil, fmt.Errorf("--grid %q: expected NAME=LO..HI, e.g. --grid r=0..30 --points 61", s)
	}
	l, err := model.ParseSetting(name + "=" + a)
	if err != nil {
		return "", nil, nil, fmt.Errorf("--grid %s: lower end: %w", name, err)
	}
	h, err := model.ParseSetting(name + "=" + b)
	if err != nil {
		return "", nil, nil, fmt.Errorf("--grid %s: upper end: %w", name, err)
	}
	return name, l.Value, h.Value, nil
}

// ParseGridAxis reads the range "name=lo..hi" (ParseGridRange) of an axis
// of n points, 1 ≤ n ≤ MaxGridPoints (lo < hi when n > 1).
func ParseGridAxis(s string, n int) (GridAxis, error) {
	name, lo, hi, err := ParseGridRange(s)
	if err != nil {
		return GridAxis{}, err
	}
	return newAxis(name, lo, hi, n)
}

func newAxis(name string, lo, hi *big.Rat, n int) (GridAxis, error) {
	if n < 1 || n > MaxGridPoints {
		return GridAxis{}, fmt.Errorf("--points %s=%d: the number of points must be an integer from 1 to %d", name, n, MaxGridPoints)
	}
	if n > 1 && lo.Cmp(hi) >= 0 {
		return GridAxis{}, fmt.Errorf("--grid %s: %d points need LO < HI, got %s..%s", name, n, lo.RatString(), hi.RatString())
	}
	return GridAxis{Name: name, Lo: lo, Hi: hi, N: n}, nil
}

// ParseGrid reads the --grid ranges and --points counts of a sweep into a
// grid, in the order of the ranges. A count is "N" (every axis without its
// own count) or "NAME=N" (that axis); every axis needs one.
func ParseGrid(ranges, points []string) (Grid, error) {
	all := 0
	per := map[string]int{}
	for _, p := range points {
		name, num, named := strings.Cut(p, "=")
		if !named {
			name, num = "", p
		}
		name = strings.TrimSpace(name)
		if strings.Contains(num, ":") || strings.Contains(num, "..") {
			return nil, fmt.Errorf("--points %q: expected a number of points, N or NAME=N (the range goes to --grid NAME=LO..HI)", p)
		}
		n, err := strconv.Atoi(strings.TrimSpace(num))
		if err != nil || n < 1 || n > MaxGridPoints || (named && name == "") {
			return nil, fmt.Errorf("--points %q: expected N or NAME=N with an integer N from 1 to %d, e.g. --points 61 or --points r=61", p, MaxGridPoints)
		}
		if !named {
			if all != 0 {
				return nil, fmt.Errorf("--points %q: a count for every axis is given twice", p)
			}
			all = n
			continue
		}
		if _, dup := per[name]; dup {
			return nil, fmt.Errorf("--points %s: given twice", name)
		}
		per[name] = n
	}
	var g Grid
	seen := map[string]bool{}
	for _, r := range ranges {
		name, lo, hi, err := ParseGridRange(r)
		if err != nil {
			return nil, err
		}
		n, ok := per[name]
		if !ok {
			n = all
		}
		if n == 0 {
			return nil, fmt.Errorf("--grid %s: how many points? give --points N (every axis) or --points %s=N", name, name)
		}
		a, err := newAxis(name, lo, hi, n)
		if err != nil {
			return nil, err
		}
		seen[name] = true
		g = append(g, a)
	}
	for _, name := range slices.Sorted(maps.Keys(per)) {
		if !seen[name] {
			return nil, fmt.Errorf("--points %s: no --grid %s=LO..HI to count", name, name)
		}
	}
	return g, nil
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

// Size returns the number of grid points, or an error beyond MaxGridPoints.
func (g Grid) Size() (int, error) {
	size := 1
	for _, a := range g {
		if size > MaxGridPoints/a.N {
			return 0, fmt.Errorf("the grid has more than %d points", MaxGridPoints)
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
	if n > MaxGridPoints {
		return Shard{}, fmt.Errorf("--shard %q: at most %d shards", s, MaxGridPoints)
	}
	return Shard{i, n}, nil
}

// Owns reports whether grid point k belongs to the shard.
func (s Shard) Owns(k int) bool { return s.N <= 1 || k%s.N == s.I }

// norm returns the shard with N ≥ 1 (the zero Shard is the whole grid).
func (s Shard) norm() Shard {
	if s.N < 1 {
		return Shard{0, 1}
	}
	return s
}

// Points returns the number of points of a grid of size points that the
// shard owns: the k < size with k ≡ I (mod N).
func (s Shard) Points(size int) int {
	s = s.norm()
	if s.I >= size {
		return 0
	}
	return (size-s.I-1)/s.N + 1
}

// Nth returns the grid index of the shard's j-th point (j = 0, 1, …).
func (s Shard) Nth(j int) int {
	s = s.norm()
	return s.I + j*s.N
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
			errs.Add(p.Pos, "parameter %s is free; sweep it (--grid %s=LO..HI --points N) or fix it (--set %s=VALUE)", p.Name, p.Name, p.Name)
		}
	}
	if _, err := grid.Size(); err != nil {
		errs.Add(poly.Pos{File: "--grid", Line: 1, Col: 1}, "%v", err)
	}
	return errs.Err()
}
