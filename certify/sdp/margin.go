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
	return solveMargin(ctx, p, tmax, opts, true)
}

// SolvePositiveMargin is SolveMargin with t ≥ 0: for a caller that has use
// only for a positive margin (a certificate to round), not for the
// multipliers of a negative one (a refutation). t is then an ordinary
// non-negative variable, not the difference t⁺ − t⁻ of a split free one,
// whose two halves grow together and stall the interior-point method (the
// primal infeasibility stops decreasing while t⁺ and t⁻ drift). When no
// solution has t ≥ 0 the status says infeasible (numerically).
func SolvePositiveMargin(ctx context.Context, p *Problem, tmax float64, opts *Options) (*MarginResult, error) {
	return solveMargin(ctx, p, tmax, opts, false)
}

func solveMargin(ctx context.Context, p *Problem, tmax float64, opts *Options, free bool) (*MarginResult, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	if !(tmax > 0) {
		return nil, errors.New("sdp: margin bound must be positive")
	}
	q := marginProblem(p, tmax, free)
	nb := len(p.Blocks)
	extra := nb
	r, err := Solve(ctx, q, opts)
	if err != nil {
		return nil, fmt.Errorf("margin problem: %w", err)
	}
	ex := r.X[extra]
	t := ex.Data[0]
	if free {
		t -= ex.Data[1]
	}
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
func MarginProblem(p *Problem, tmax float64) *Problem { return marginProblem(p, tmax, true) }

// PositiveMarginProblem is the problem SolvePositiveMargin solves: the
// diagonal block (t, w), t ≥ 0, in place of (t⁺, t⁻, w).
func PositiveMarginProblem(p *Problem, tmax float64) *Problem { return marginProblem(p, tmax, false) }

func marginProblem(p *Problem, tmax float64, free bool) *Problem {
	nb := len(p.Blocks)
	extra, w := nb, 1
	if free {
		w = 2
	}
	q := &Problem{Blocks: append(append([]int(nil), p.Blocks...), -(w + 1))}
	for i, a := range p.A {
		var tr float64
		row := append(Matrix(nil), a...)
		for _, e := range a {
			if e.I == e.J {
				tr += e.V
			}
		}
		if tr != 0 {
			row = append(row, Entry{extra, 0, 0, tr})
			if free {
				row = append(row, Entry{extra, 1, 1, -tr})
			}
		}
		q.A = append(q.A, row)
		q.B = append(q.B, p.B[i])
	}
	last, obj := Matrix{{extra, 0, 0, 1}, {extra, w, w, 1}}, Matrix{{extra, 0, 0, 1}}
	if free {
		last = Matrix{{extra, 0, 0, 1}, {extra, 1, 1, -1}, {extra, 2, 2, 1}}
		obj = Matrix{{extra, 0, 0, 1}, {extra, 1, 1, -1}}
	}
	q.A = append(q.A, last)
	q.B = append(q.B, tmax)
	q.C = obj
	return q
}
