package sdp

import (
	"context"
	"errors"
	"fmt"
)

// MarginResult is the outcome of SolveMargin.
type MarginResult struct {
	// T is the margin: X − T·I ⪰ 0 for the returned X (numerically).
	T float64
	// X satisfies A(X) = b (numerically), block by block as in the
	// original problem.
	X []Block
	// Y are the multipliers of the original constraints. When T < 0 at
	// optimality they satisfy Σ yᵢAᵢ ⪰ 0, Σ yᵢ tr(Aᵢ) = 1 and bᵀy = T < 0:
	// evidence that no X ≻ 0 (indeed no X ⪰ 0) solves A(X) = b.
	Y []float64
	// Inner is the result of the extended problem that was solved.
	Inner *Result
}

// SolveMargin looks for a solution of A(X) = b, X ⪰ 0 that is as far inside
// the cone as possible: it maximises t subject to A(X) = b, X − tI ⪰ 0,
// t ≤ tmax, ignoring p.C. Writing X = X′ + tI with X′ ⪰ 0, the problem is
//
//	maximise t  subject to  ⟨Aᵢ, X′⟩ + t·tr(Aᵢ) = bᵢ,  t + w = tmax,  X′ ⪰ 0, w ≥ 0,
//
// with the free t split as t⁺ − t⁻ in an extra diagonal block. A margin
// T > 0 leaves room for rounding X to rationals: any perturbation of norm
// below T keeps it positive definite. tmax (> 0) keeps the problem bounded.
func SolveMargin(ctx context.Context, p *Problem, tmax float64, opts *Options) (*MarginResult, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	if !(tmax > 0) {
		return nil, errors.New("sdp: margin bound must be positive")
	}
	q := MarginProblem(p, tmax)
	nb := len(p.Blocks)
	extra := nb
	r, err := Solve(ctx, q, opts)
	if err != nil {
		return nil, fmt.Errorf("margin problem: %w", err)
	}
	ex := r.X[extra]
	t := ex.Data[0] - ex.Data[1]
	xs := make([]Block, nb)
	for k := 0; k < nb; k++ {
		b := r.X[k]
		d := append([]float64(nil), b.Data...)
		for i := 0; i < b.N; i++ {
			if b.Diag {
				d[i] += t
			} else {
				d[i*b.N+i] += t
			}
		}
		xs[k] = Block{N: b.N, Diag: b.Diag, Data: d}
	}
	return &MarginResult{T: t, X: xs, Y: append([]float64(nil), r.Y[:len(p.B)]...), Inner: r}, nil
}

// MarginProblem returns the extended problem that SolveMargin solves: the
// blocks of p and a diagonal block (t⁺, t⁻, w) appended, constraints
// ⟨Aᵢ, X′⟩ + (t⁺ − t⁻)·tr(Aᵢ) = bᵢ and t⁺ − t⁻ + w = tmax, objective t⁺ − t⁻.
func MarginProblem(p *Problem, tmax float64) *Problem {
	nb := len(p.Blocks)
	q := &Problem{Blocks: append(append([]int(nil), p.Blocks...), -3)}
	extra := nb
	for i, a := range p.A {
		var tr float64
		row := append(Matrix(nil), a...)
		for _, e := range a {
			if e.I == e.J {
				tr += e.V
			}
		}
		if tr != 0 {
			row = append(row, Entry{extra, 0, 0, tr}, Entry{extra, 1, 1, -tr})
		}
		q.A = append(q.A, row)
		q.B = append(q.B, p.B[i])
	}
	q.A = append(q.A, Matrix{{extra, 0, 0, 1}, {extra, 1, 1, -1}, {extra, 2, 2, 1}})
	q.B = append(q.B, tmax)
	q.C = Matrix{{extra, 0, 0, 1}, {extra, 1, 1, -1}}
	return q
}
