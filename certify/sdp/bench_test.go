package sdp_test

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/lyacert/lyacert/certify/sdp"
	"github.com/lyacert/lyacert/certify/sos"
	"github.com/lyacert/lyacert/poly"
)

// sosMargin returns the margin SDP of a random degree-4 SOS form in n
// variables (N+2 squares of random integer quadratic forms, N = n(n+1)/2).
func sosMargin(tb testing.TB, n int) *sdp.Problem {
	rng := rand.New(rand.NewPCG(1, uint64(n)))
	vars := make([]string, n)
	for i := range vars {
		vars[i] = fmt.Sprintf("x%d", i)
	}
	text := randomSOSText(rng, vars, n*(n+1)/2+2)
	r := poly.NewRing(vars, nil)
	g, _, err := sos.NewGram(poly.MustParse(r, text).Num, 0)
	if err != nil {
		tb.Fatal(err)
	}
	return sdp.MarginProblem(g.Problem(), 10)
}

// BenchmarkSolveSOS: the margin SDP of degree-4 forms in 3..8 variables.
func BenchmarkSolveSOS(b *testing.B) {
	for n := 3; n <= 8; n++ {
		p := sosMargin(b, n)
		b.Run(fmt.Sprintf("vars=%d", n), func(b *testing.B) {
			for b.Loop() {
				r, err := sdp.Solve(context.Background(), p, nil)
				if err != nil || r.Status != sdp.Optimal {
					b.Fatalf("%v %v", r.Status, err)
				}
			}
		})
	}
}

var compare = flag.Bool("sdp.compare", false, "time this solver and csdp on the benchmark's SDPA files and print a table")

// TestCompareTimes prints the time of Solve and of csdp (the reference
// solver: coinor-csdp from Debian, as a separate process, so its time
// includes start-up and file reading) on the files of BenchmarkSolveSOS.
// Run with: go test ./certify/sdp -run TestCompareTimes -sdp.compare -v
func TestCompareTimes(t *testing.T) {
	if !*compare {
		t.Skip("timing table only with -sdp.compare")
	}
	bin, err := exec.LookPath("csdp")
	if err != nil {
		t.Skip("csdp not found (install Debian's coinor-csdp)")
	}
	dir := t.TempDir()
	var tab strings.Builder
	fmt.Fprintf(&tab, "%-5s %-6s %-6s %-12s %-12s %s\n", "vars", "basis", "m", "lyacert", "csdp", "ratio")
	for n := 3; n <= 8; n++ {
		p := sosMargin(t, n)
		var buf bytes.Buffer
		if err := sdp.WriteSDPA(&buf, p); err != nil {
			t.Fatal(err)
		}
		file := filepath.Join(dir, fmt.Sprintf("sos%d.dat-s", n))
		if err := os.WriteFile(file, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		const reps = 5
		start := time.Now()
		for i := 0; i < reps; i++ {
			if _, err := sdp.Solve(context.Background(), p, nil); err != nil {
				t.Fatal(err)
			}
		}
		ours := time.Since(start) / reps
		start = time.Now()
		for i := 0; i < reps; i++ {
			exec.Command(bin, file, file+".sol").Run()
		}
		theirs := time.Since(start) / reps
		fmt.Fprintf(&tab, "%-5d %-6d %-6d %-12v %-12v %.2f\n", n, p.Blocks[0], len(p.B), ours.Round(time.Microsecond), theirs.Round(time.Microsecond), float64(ours)/float64(theirs))
	}
	t.Log("\n" + tab.String())
}
