package pave

import (
	"context"
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

// BenchmarkPaveRegion: the engine alone (float pass and exact confirmation
// of every leaf) on the three conditions of testdata/models/crossgain.lya,
// (a, b) in [-3, 3]², resolution 1/1024.
func BenchmarkPaveRegion(b *testing.B) {
	r := poly.NewRing(nil, []string{"a", "b"})
	var conds []*poly.Poly
	for _, s := range []string{"-a^2 + 4", "a*b + 2", "-a^2*b^2 - a^2 + 4"} {
		conds = append(conds, poly.MustParse(r, s).Num)
	}
	side := poly.Closed(big.NewRat(-3, 1), big.NewRat(3, 1))
	box := []Side{{0, side}, {1, side}}
	boxes := 0
	for b.Loop() {
		pv, err := PaveRegion(context.Background(), conds, box, 10, Options{})
		if err != nil {
			b.Fatal(err)
		}
		boxes = pv.Boxes
	}
	b.ReportMetric(float64(boxes), "boxes")
	b.ReportMetric(float64(boxes)*float64(b.N)/b.Elapsed().Seconds(), "boxes/s")
}
