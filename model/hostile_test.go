package model

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/lyacert/lyacert/internal/bounded"

	"github.com/rogpeppe/go-internal/txtar"

	"github.com/lyacert/lyacert/poly"
)

var (
	update         = flag.Bool("update", false, "rewrite testdata/hostile/models.golden")
	hostileTimeout = flag.Duration("hostile.timeout", 10*time.Second, "time allowed to each hostile model (a hang guard against minutes-long runs, not a speed target: generous, so that a loaded machine does not fail it)")
)

// hostileMemory bounds the heap a hostile model may make the reader take
// (common practice: a generous bound far above what a model file needs).
const hostileMemory = 256 << 20

const hostileGolden = "../testdata/hostile/models.golden"

// hostileCase is a model that must be read, or refused, quickly, in bounded
// memory and without a panic.
type hostileCase struct {
	name   string
	src    func() []byte
	limits []string // --limit arguments, NAME=VALUE
}

// generatedCases are too big to keep in the repository; they are built here.
func generatedCases() []hostileCase {
	head := "state x\nx' = -x\n"
	rep := func(s string, n int) string { return strings.Repeat(s, n) }
	states := func(n int) string {
		var b strings.Builder
		b.WriteString("state x0")
		for i := 1; i < n; i++ {
			fmt.Fprintf(&b, ", x%d", i)
		}
		b.WriteString("\n")
		return b.String()
	}
	stateLines := func(n, per int) string {
		var b strings.Builder
		for i := 0; i < n; i += per {
			b.WriteString("state ")
			for j := i; j < i+per; j++ {
				if j > i {
					b.WriteString(", ")
				}
				fmt.Fprintf(&b, "s%d", j)
			}
			b.WriteString("\n")
		}
		return b.String()
	}
	sumOfFractions := func(n int) string {
		var b strings.Builder
		b.WriteString(head + "V = x^2*(1")
		for i := 2; i < n; i++ {
			fmt.Fprintf(&b, " + 1/%d", i)
		}
		b.WriteString(")\n")
		return b.String()
	}
	lets := func(n int) string {
		var b strings.Builder
		for i := 0; i < n; i++ {
			fmt.Fprintf(&b, "let q%d = p*p\n", i)
		}
		return b.String()
	}
	big := "let p = (a + b + c + d + 1)^5\n" // 126 terms
	return []hostileCase{
		{"gen/literal-1e6-digits", func() []byte { return []byte(head + "V = " + rep("7", 1e6) + "*x^2\n") }, nil},
		{"gen/literal-1e5-digits-raised", func() []byte { return []byte(head + "V = " + rep("7", 1e5) + "*x^2\n") }, []string{"digits=200000", "const-bits=600000"}},
		{"gen/parens-1e6-deep", func() []byte { return []byte(head + "V = " + rep("(", 1e6) + "x" + rep(")", 1e6) + "\n") }, nil},
		{"gen/parens-1e6-deep-raised", func() []byte { return []byte(head + "V = " + rep("(", 1e6) + "x" + rep(")", 1e6) + "\n") }, []string{"input-bytes=8000000", "line-length=8000000"}},
		{"gen/signs-1e6-deep-raised", func() []byte { return []byte(head + "V = " + rep("-", 1e6) + "x\n") }, []string{"input-bytes=8000000", "line-length=8000000"}},
		{"gen/states-1e5-one-line", func() []byte { return []byte(states(1e5) + "x0' = -x0\n") }, nil},
		{"gen/states-1e5-many-lines", func() []byte { return []byte(stateLines(1e5, 50) + "s0' = -s0\n") }, nil},
		{"gen/params-1e5", func() []byte {
			return []byte(head + strings.ReplaceAll(stateLines(1e5, 50), "state s", "parameter p"))
		}, nil},
		{"gen/line-100MB", func() []byte { return []byte(head + "V = x^2" + rep(" ", 100<<20) + "\n") }, nil},
		{"gen/line-2MB", func() []byte { return []byte(head + "V = x^2" + rep(" ", 2<<20) + "\n") }, nil},
		{"gen/bad-lines-1e6", func() []byte { return []byte(head + rep("x x\n", 1e6)) }, nil},
		{"gen/bad-expr-lines-1e5", func() []byte { return []byte(head + rep("V = (\n", 1e5)) }, nil},
		{"gen/sum-1e5-terms", func() []byte { return []byte(head + "V = x^2" + rep(" + x^2", 1e5) + "\n") }, nil},
		{"gen/sum-of-fractions", func() []byte { return []byte(sumOfFractions(20000)) }, nil},
		{"gen/work-products", func() []byte {
			return []byte("state a, b, c, d\na' = -a\nb' = -b\nc' = -c\nd' = -d\n" + big + "V = a^2" + rep(" + p*p", 2000) + "\n")
		}, nil},
		{"gen/work-lines", func() []byte {
			return []byte("state a, b, c, d\na' = -a\nb' = -b\nc' = -c\nd' = -d\n" + big + lets(5000))
		}, nil},
		{"gen/powers-of-constants", func() []byte { return []byte(head + "V = x^2" + rep(" + (3^256)^100", 5000) + "\n") }, nil},
	}
}

// TestHostileModels reads every model of testdata/hostile/models and the
// generated ones, each within the time limit and the memory bound, and
// compares the outcome (ok, or the errors) with the golden file.
func TestHostileModels(t *testing.T) {
	files, err := filepath.Glob("../testdata/hostile/models/*.lya")
	if err != nil {
		t.Fatal(err)
	}
	var cases []hostileCase
	for _, f := range files {
		f := f
		cases = append(cases, hostileCase{name: filepath.Base(f), src: func() []byte {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			return b
		}})
	}
	if len(cases) < 100 {
		t.Errorf("only %d hostile model files", len(cases))
	}
	cases = append(cases, generatedCases()...)

	want := map[string]string{}
	if !*update {
		a, err := txtar.ParseFile(hostileGolden)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range a.Files {
			want[f.Name] = string(f.Data)
		}
	}
	got := map[string]string{}
	for _, c := range cases {
		out, ok := runHostile(t, c)
		if !ok {
			continue
		}
		got[c.name] = out
		if *update {
			continue
		}
		w, found := want[c.name]
		switch {
		case !found:
			t.Errorf("%s: no golden answer (run with -update); got\n%s", c.name, out)
		case w != out:
			t.Errorf("%s:\ngot\n%swant\n%s", c.name, out, w)
		}
	}
	if *update {
		names := make([]string, 0, len(got))
		for n := range got {
			names = append(names, n)
		}
		sort.Strings(names)
		a := &txtar.Archive{Comment: []byte("Expected outcome of reading each hostile model (model.TestHostileModels; rewrite with -update).\n")}
		for _, n := range names {
			a.Files = append(a.Files, txtar.File{Name: n, Data: []byte(got[n])})
		}
		if err := os.WriteFile(hostileGolden, txtar.Format(a), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// runHostile reads one case in a goroutine, under the time limit, sampling
// the heap; it returns "ok\n" or the error text, and false when the case
// failed already (panic, time, memory).
func runHostile(t *testing.T, c hostileCase) (string, bool) {
	t.Helper()
	lim, err := poly.ParseLimits(c.limits)
	if err != nil {
		t.Fatalf("%s: %v", c.name, err)
	}
	src := c.src()
	out, err := bounded.Run(func() string {
		m, err := ParseWithLimits(c.name, src, lim)
		if err != nil {
			return err.Error() + "\n"
		}
		// What a command does next must not panic either.
		if m.V != nil {
			m.Shift(m.Derivative(*m.V))
		}
		if _, err := ParseWithLimits("canonical", []byte(m.Canonical()), lim); err != nil {
			return "canonical text refused: " + err.Error() + "\n"
		}
		return "ok\n"
	}, *hostileTimeout, hostileMemory)
	if err != nil {
		t.Errorf("%s: %v", c.name, err)
		return "", false
	}
	return out, true
}

// The golden file holds text; a message quoting a NUL byte must not break it.
func TestGoldenIsText(t *testing.T) {
	b, err := os.ReadFile(hostileGolden)
	if err != nil {
		t.Skip("no golden file yet")
	}
	if bytes.IndexByte(b, 0) >= 0 {
		t.Error("golden file contains a NUL byte")
	}
}
