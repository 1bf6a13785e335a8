package sweep

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math/big"
	"strings"
	"sync"
	"testing"

	"github.com/lyacert/lyacert/model"
)

// stableSrc is a model of our own: x' = -a x + y, y' = -y is stable for
// a > 0 (triangular, eigenvalues -a and -1: common practice).
const stableSrc = "state x, y\nparameter a > 0\nx' = -a*x + y\ny' = -y\n"

func axis(t testing.TB, s string, n int) GridAxis {
	t.Helper()
	a, err := ParseGridAxis(s, n)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// run sweeps and returns the bytes written.
func run(t testing.TB, opts SweepOptions) []byte {
	t.Helper()
	var b bytes.Buffer
	sum, err := Sweep(context.Background(), opts, func(sp SweepPoint) error {
		for _, l := range sp.Lines {
			b.Write(l.Marshal())
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if opts.MaxPoints == 0 && sum.Remaining != 0 {
		t.Fatalf("%d points remaining", sum.Remaining)
	}
	return b.Bytes()
}

func stableOpts(t testing.TB, file, src, grid string, n int) SweepOptions {
	return SweepOptions{File: file, Src: []byte(src), Grid: Grid{axis(t, grid, n)}, Jobs: 2}
}

func TestReadBack(t *testing.T) {
	opts := stableOpts(t, "s.lya", stableSrc, "a=1..5", 9)
	data := run(t, opts)
	f, err := Read("out.jsonl", data)
	if err != nil {
		t.Fatal(err)
	}
	id, _ := opts.Identity()
	if !f.Complete() || len(f.Blocks) != 9 || f.Of != 9 || f.Sweep != id.Digest() || len(f.Params) != 1 || f.Params[0] != "a" {
		t.Fatalf("read back: complete %v, %d blocks of %d, sweep %s (want %s), params %v", f.Complete(), len(f.Blocks), f.Of, f.Sweep, id.Digest(), f.Params)
	}
	// A cut anywhere inside the last grid point is an interrupted write:
	// the complete points before it stay (common practice for append-only
	// logs).
	last := bytes.LastIndexByte(data[:len(data)-1], '\n') + 1
	for _, cut := range []int{last + 1, len(data) - 1} {
		f, err := Read("cut.jsonl", data[:cut])
		if err != nil {
			t.Fatalf("cut at %d: %v", cut, err)
		}
		if f.Complete() || f.Good != last || len(f.Blocks) != 8 {
			t.Errorf("cut at %d: complete %v, good %d (want %d), %d blocks", cut, f.Complete(), f.Good, last, len(f.Blocks))
		}
	}
}

// TestReadRefuses changes one line of a valid output in the ways a hostile
// or damaged file could, and expects Read to refuse it with a message
// naming the file and line.
func TestReadRefuses(t *testing.T) {
	opts := stableOpts(t, "s.lya", stableSrc, "a=1..5", 9)
	data := run(t, opts)
	other := run(t, stableOpts(t, "s.lya", stableSrc, "a=1..4", 9))
	lines := strings.SplitAfter(string(data), "\n")
	lines = lines[:len(lines)-1]
	otherLines := strings.SplitAfter(string(other), "\n")
	resealed := func(edit func(*SweepLine)) string {
		l, err := parseLine([]byte(lines[2]))
		if err != nil {
			t.Fatal(err)
		}
		edit(&l)
		l.Seal()
		return string(l.Marshal())
	}
	cases := []struct {
		name, line, want string
	}{
		{"huge of", strings.Replace(lines[2], `"of":9`, `"of":1000000000000`, 1), `"of" is 1000000000000`},
		{"index beyond of", strings.Replace(lines[2], `"index":2`, `"index":9`, 1), `"index" 9 is not a grid point of 9`},
		{"negative index", strings.Replace(lines[2], `"index":2`, `"index":-1`, 1), `"index" -1`},
		{"huge eqs", strings.Replace(strings.Replace(lines[2], `"eqs":1`, `"eqs":99999999`, 1), `"eq":1`, `"eq":2`, 1), `"eqs" is 99999999`},
		{"eq beyond eqs", strings.Replace(lines[2], `"eq":1`, `"eq":2`, 1), "equilibrium 2 of 1"},
		{"verdict edited", strings.Replace(lines[2], `"verdict":"holds"`, `"verdict":"fails"`, 1), "the line was changed"},
		{"parameter edited", strings.Replace(lines[2], `"a":"2"`, `"a":"3"`, 1), "the line was changed"},
		{"unknown verdict", resealed(func(l *SweepLine) { l.Verdict = "maybe" }), `unknown verdict "maybe"`},
		{"holds without certificate", resealed(func(l *SweepLine) { l.Digest = nil }), "has no certificate_digest"},
		{"bad certificate digest", resealed(func(l *SweepLine) { d := "sha256:XYZ"; l.Digest = &d }), `certificate_digest "sha256:XYZ" is not`},
		{"bad sweep digest", resealed(func(l *SweepLine) { l.Sweep = "md5:0" }), `sweep_digest "md5:0" is not`},
		{"no sweep digest", resealed(func(l *SweepLine) { l.Sweep = "" }), "no sweep_digest"},
		{"bad line digest", strings.Replace(lines[2], `"line_digest":"sha256:`, `"line_digest":"sha256:0`, 1), `line_digest "sha256:0`},
		{"unknown field", strings.Replace(lines[2], `{"index"`, `{"extra":1,"index"`, 1), `unknown field "extra"`},
		{"key twice", strings.Replace(lines[2], `"params":{"a":"2"}`, `"params":{"a":"2","a":"2"}`, 1), `the key "a" appears twice`},
		{"spacing", strings.Replace(lines[2], `"index":2,`, `"index": 2,`, 1), "not written as lyacert writes it"},
		{"line of another sweep", otherLines[2], "a line of another sweep"},
		{"not JSON", "index 2\n", "not a sweep line"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			edited := slicesReplace(lines, 2, c.line)
			_, err := Read("out.jsonl", []byte(strings.Join(edited, "")))
			if err == nil {
				t.Fatalf("accepted:\n%s", c.line)
			}
			if !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "out.jsonl:3: ") {
				t.Errorf("error %q, want out.jsonl:3: … %s", err, c.want)
			}
		})
	}
}

func slicesReplace(s []string, i int, v string) []string {
	out := append([]string{}, s...)
	out[i] = v
	return out
}

func TestIdentity(t *testing.T) {
	// The model is identified by its canonical text: the path it was read
	// from, comments and spacing do not matter; every input that changes
	// the lines does.
	grid := Grid{axis(t, "a=1..5", 9)}
	digest := func(file, src string, set []model.Setting, g Grid, q []*big.Rat, full bool) string {
		id, err := NewIdentity(file, []byte(src), set, g, q, full)
		if err != nil {
			t.Fatal(err)
		}
		return id.Digest()
	}
	base := digest("s.lya", stableSrc, nil, grid, nil, false)
	same := []string{
		digest("/some/where/else/t.lya", stableSrc, nil, grid, nil, false),
		digest("s.lya", "# a comment\nstate x,y\nparameter a>0\nx' = y - a*x\ny'=-y\n", nil, grid, nil, false),
		digest("s.lya", stableSrc, nil, Grid{axis(t, "a=2/2..10/2", 9)}, nil, false),
		digest("s.lya", stableSrc, nil, grid, []*big.Rat{big.NewRat(1, 1)}, false),
	}
	for i, d := range same {
		if d != base {
			t.Errorf("variant %d: digest %s, want %s", i, d, base)
		}
	}
	differ := []string{
		digest("s.lya", strings.Replace(stableSrc, "-y\n", "-2*y\n", 1), nil, grid, nil, false),
		digest("s.lya", stableSrc, nil, Grid{axis(t, "a=1..5", 10)}, nil, false),
		digest("s.lya", stableSrc, nil, grid, []*big.Rat{big.NewRat(2, 1)}, false),
		digest("s.lya", stableSrc, nil, grid, nil, true),
		digest("s.lya", "state x, y\nparameter a > 0\nparameter c > 0\nx' = -a*x + y\ny' = -c*y\n", []model.Setting{{Name: "c", Value: big.NewRat(1, 1)}}, grid, nil, false),
	}
	for i, d := range differ {
		if d == base || !isDigest(d) {
			t.Errorf("change %d: digest %s", i, d)
		}
	}
	// The lines, too, do not depend on the path.
	a := run(t, stableOpts(t, "s.lya", stableSrc, "a=1..5", 9))
	b := run(t, stableOpts(t, "../elsewhere/./copy.lya", stableSrc, "a=1..5", 9))
	if !bytes.Equal(a, b) {
		t.Error("the lines depend on the model's path")
	}
}

func TestMergeShards(t *testing.T) {
	// The shards of a sweep merged give what one unsharded run gives, byte
	// for byte (the promise of --shard).
	whole := run(t, stableOpts(t, "s.lya", stableSrc, "a=1..5", 9))
	var files []*File
	for i := range 3 {
		opts := stableOpts(t, "s.lya", stableSrc, "a=1..5", 9)
		opts.Shard = Shard{i, 3}
		f, err := Read(fmt.Sprintf("s%d.jsonl", i), run(t, opts))
		if err != nil {
			t.Fatal(err)
		}
		files = append(files, f)
	}
	m, err := Merge([]*File{files[2], files[0], files[1], files[0]})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	m.WriteTo(&b)
	if !bytes.Equal(b.Bytes(), whole) {
		t.Errorf("merged:\n%s\nunsharded:\n%s", b.Bytes(), whole)
	}

	_, err = Merge(files[:2])
	if !errors.Is(err, ErrIncomplete) || !strings.Contains(err.Error(), "3 of 9 grid points missing (the first is 2)") {
		t.Errorf("a shard missing: %v", err)
	}
	otherOpts := stableOpts(t, "s.lya", stableSrc, "a=1..4", 9)
	otherOpts.Shard = Shard{2, 3}
	other, _ := Read("other.jsonl", run(t, otherOpts))
	if _, err := Merge([]*File{files[0], files[1], other}); err == nil || errors.Is(err, ErrIncomplete) || !strings.Contains(err.Error(), "not shards of one sweep") {
		t.Errorf("a shard of another sweep: %v", err)
	}
	cut, _ := Read("cut.jsonl", whole[:len(whole)-3])
	if _, err := Merge([]*File{cut}); !errors.Is(err, ErrIncomplete) {
		t.Errorf("an interrupted file: %v", err)
	}
}

func TestMergeHugeOfAllocatesNothing(t *testing.T) {
	// A line claiming a grid of MaxGridPoints points with one point
	// present: Merge reports the missing points without allocating for
	// them (testing.AllocsPerRun counts allocations, common practice).
	l := SweepLine{Index: 5, Of: MaxGridPoints, Params: OrderedStrings{Keys: []string{"a"}, Values: []string{"1"}},
		Verdict: "undecided", Claim: "none", Sweep: "sha256:" + strings.Repeat("0", 64)}
	l.Seal()
	f, err := Read("big.jsonl", l.Marshal())
	if err != nil {
		t.Fatal(err)
	}
	allocs := testing.AllocsPerRun(10, func() {
		if _, err := Merge([]*File{f}); !errors.Is(err, ErrIncomplete) || !strings.Contains(err.Error(), "(the first is 0)") {
			t.Fatal(err)
		}
	})
	if allocs > 50 {
		t.Errorf("%v allocations", allocs)
	}
}

func TestCheckResume(t *testing.T) {
	opts := stableOpts(t, "s.lya", stableSrc, "a=1..5", 9)
	opts.Shard = Shard{1, 2}
	opts.MaxPoints = 2
	part := run(t, opts)
	f, err := Read("p.jsonl", part)
	if err != nil {
		t.Fatal(err)
	}
	id, _ := opts.Identity()
	if err := f.CheckResume(id, opts.Grid, opts.Shard); err != nil {
		t.Fatal(err)
	}
	// Continued, the result is the uninterrupted shard.
	rest := opts
	rest.MaxPoints, rest.Resume = 0, len(f.Blocks)
	full := opts
	full.MaxPoints = 0
	if got, want := append(part, run(t, rest)...), run(t, full); !bytes.Equal(got, want) {
		t.Errorf("resumed:\n%s\nuninterrupted:\n%s", got, want)
	}
	if err := f.CheckResume(id, opts.Grid, Shard{0, 2}); err == nil || !strings.Contains(err.Error(), "grid point 1 where 0 was expected") {
		t.Errorf("another shard: %v", err)
	}
	otherID, _ := NewIdentity("s.lya", []byte(stableSrc), nil, Grid{axis(t, "a=1..6", 9)}, nil, false)
	if err := f.CheckResume(otherID, Grid{axis(t, "a=1..6", 9)}, opts.Shard); err == nil || !strings.Contains(err.Error(), "not written by this sweep") {
		t.Errorf("another sweep: %v", err)
	}
}

func TestBounds(t *testing.T) {
	// Sizes are refused from the numbers alone, before any allocation.
	if _, err := ParseGridAxis("a=0..1", 1000000000); err == nil {
		t.Error("an axis of 10⁹ points accepted")
	}
	g := Grid{axis(t, "a=0..1", 100000), axis(t, "b=0..1", 100000)}
	if _, err := g.Size(); err == nil {
		t.Error("a grid of 10¹⁰ points accepted")
	}
	if _, err := ParseShard("0/1000000000"); err == nil {
		t.Error("10⁹ shards accepted")
	}
	opts := stableOpts(t, "s.lya", stableSrc, "a=1..5", 9)
	opts.Jobs = MaxJobs() + 1
	if _, err := Sweep(context.Background(), opts, func(SweepPoint) error { return nil }); err == nil {
		t.Errorf("%d workers accepted", opts.Jobs)
	}
	opts.Jobs, opts.Resume = 2, 10
	if _, err := Sweep(context.Background(), opts, func(SweepPoint) error { return nil }); err == nil {
		t.Error("resuming after more points than the shard has accepted")
	}
	// Shard arithmetic against counting (common practice: k ≡ i mod N).
	for _, c := range []struct{ size, i, n int }{{9, 0, 1}, {9, 2, 3}, {10, 2, 3}, {2, 4, 5}, {0, 0, 1}} {
		want := 0
		for k := range c.size {
			if k%c.n == c.i {
				want++
			}
		}
		if got := (Shard{c.i, c.n}).Points(c.size); got != want {
			t.Errorf("shard %d/%d of %d: %d points, want %d", c.i, c.n, c.size, got, want)
		}
	}
}

func TestLockOutput(t *testing.T) {
	// Two writers of one output at the same time: exactly one gets the
	// lock, the other fails at once with ErrLocked.
	out := t.TempDir() + "/out.jsonl"
	var wg sync.WaitGroup
	locks := make([]*OutputLock, 8)
	errs := make([]error, 8)
	for i := range locks {
		wg.Add(1)
		go func() {
			defer wg.Done()
			locks[i], errs[i] = LockOutput(out)
		}()
	}
	wg.Wait()
	held := 0
	var holder *OutputLock
	for i, err := range errs {
		switch {
		case err == nil:
			held++
			holder = locks[i]
		case !errors.Is(err, ErrLocked) || !strings.Contains(err.Error(), "is being written by another lyacert sweep"):
			t.Errorf("writer %d: %v", i, err)
		}
	}
	if held != 1 {
		t.Fatalf("%d writers hold the lock", held)
	}
	if err := holder.Unlock(); err != nil {
		t.Fatal(err)
	}
	again, err := LockOutput(out)
	if err != nil {
		t.Fatalf("after Unlock: %v", err)
	}
	again.Unlock()
}
