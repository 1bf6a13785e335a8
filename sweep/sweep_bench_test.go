package sweep

import (
	"context"
	"fmt"
	"runtime/debug"
	"testing"
)

// BenchmarkSweep measures the throughput of Sweep with exact checks: every
// line is backed by a certificate that checker.Verify accepted. One
// operation is a whole grid; points/s is reported, with one worker and
// with two (the scaling).
func BenchmarkSweep(b *testing.B) {
	defer debug.SetGCPercent(debug.SetGCPercent(GCPercent)) // as lyacert sweep runs
	cases := []struct {
		name, model string
		axes        []string
		points      []int
	}{
		// three states, one rational equilibrium per point
		{"companion3", "companion3.lya", []string{"a2=-1..3", "a1=1/2..3", "a0=-1..3"}, []int{20, 10, 10}},
		// three states, the origin and (for r > 1) two irrational equilibria
		{"lorenz", "lorenz-classic.lya", []string{"r=1/2..30"}, []int{200}},
	}
	for _, c := range cases {
		for _, jobs := range []int{1, 2} {
			b.Run(fmt.Sprintf("%s/jobs=%d", c.name, jobs), func(b *testing.B) {
				src := readModel(b, c.model)
				var grid Grid
				for i, a := range c.axes {
					ax, err := ParseGridAxis(a, c.points[i])
					if err != nil {
						b.Fatal(err)
					}
					grid = append(grid, ax)
				}
				size, _ := grid.Size()
				points := 0
				for b.Loop() {
					sum, err := Sweep(context.Background(), SweepOptions{File: c.model, Src: src, Grid: grid, Jobs: jobs}, func(SweepPoint) error { return nil })
					if err != nil || sum.Points != size {
						b.Fatalf("%v, %d points", err, sum.Points)
					}
					points += sum.Points
				}
				b.ReportMetric(float64(points)/b.Elapsed().Seconds(), "points/s")
			})
		}
	}
}
