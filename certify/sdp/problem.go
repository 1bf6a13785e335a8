package sdp

import (
	"errors"
	"fmt"
	"math"
)

// Entry is one entry of a sparse symmetric block-diagonal matrix: the value V
// at row I and column J (0-based, I ≤ J) of block Block (0-based). An entry
// below the diagonal stands for its mirror image; on a diagonal (LP) block
// only I = J is allowed.
type Entry struct {
	Block, I, J int
	V           float64
}

// Matrix is a sparse symmetric block-diagonal matrix given by the entries of
// its upper triangles. A position given twice counts as the sum.
type Matrix []Entry

// Problem is the semidefinite program in the primal–dual pair
//
//	(P)  maximise ⟨C, X⟩  subject to ⟨Aᵢ, X⟩ = bᵢ (i = 1..m),  X ⪰ 0,
//	(D)  minimise bᵀy     subject to Z = Σᵢ yᵢAᵢ − C ⪰ 0,
//
// with X, Z, C and every Aᵢ block diagonal of the shape Blocks. Blocks lists
// the orders of the diagonal blocks as in the SDPA format: a positive n is a
// dense symmetric n×n block constrained positive semidefinite, a negative −n
// a diagonal block of order n whose entries are constrained non-negative (a
// linear-programming block). A free variable is written as the difference
// of two entries of a diagonal block.
type Problem struct {
	Blocks []int
	C      Matrix
	A      []Matrix
	B      []float64
}

// Limits on the size of a problem that Solve and ReadSDPA accept. A problem
// beyond them would need more memory than this method can reasonably use
// (the dense blocks take n² floats each, the Schur complement m²).
const (
	MaxConstraints = 20000
	MaxOrder       = 5000 // sum of the block orders
)

// ErrTooLarge is returned for a problem beyond MaxConstraints or MaxOrder.
var ErrTooLarge = errors.New("sdp: problem too large")

// Validate checks the shape of p: block orders, entry positions, finiteness.
func (p *Problem) Validate() error {
	if len(p.Blocks) == 0 {
		return errors.New("sdp: no blocks")
	}
	total := 0
	for k, n := range p.Blocks {
		if n == 0 {
			return fmt.Errorf("sdp: block %d has order 0", k+1)
		}
		total += abs(n)
		if total > MaxOrder {
			return fmt.Errorf("%w: total block order above %d", ErrTooLarge, MaxOrder)
		}
	}
	if len(p.A) != len(p.B) {
		return fmt.Errorf("sdp: %d constraint matrices but %d right-hand sides", len(p.A), len(p.B))
	}
	if len(p.A) > MaxConstraints {
		return fmt.Errorf("%w: %d constraints, at most %d", ErrTooLarge, len(p.A), MaxConstraints)
	}
	for i, b := range p.B {
		if math.IsNaN(b) || math.IsInf(b, 0) {
			return fmt.Errorf("sdp: right-hand side %d is not finite", i+1)
		}
	}
	check := func(name string, m Matrix) error {
		for _, e := range m {
			if e.Block < 0 || e.Block >= len(p.Blocks) {
				return fmt.Errorf("sdp: %s: block %d out of range", name, e.Block+1)
			}
			n := abs(p.Blocks[e.Block])
			if e.I < 0 || e.J < 0 || e.I >= n || e.J >= n {
				return fmt.Errorf("sdp: %s: entry (%d,%d) outside block %d of order %d", name, e.I+1, e.J+1, e.Block+1, n)
			}
			if p.Blocks[e.Block] < 0 && e.I != e.J {
				return fmt.Errorf("sdp: %s: off-diagonal entry (%d,%d) in diagonal block %d", name, e.I+1, e.J+1, e.Block+1)
			}
			if math.IsNaN(e.V) || math.IsInf(e.V, 0) {
				return fmt.Errorf("sdp: %s: entry (%d,%d) of block %d is not finite", name, e.I+1, e.J+1, e.Block+1)
			}
		}
		return nil
	}
	if err := check("C", p.C); err != nil {
		return err
	}
	for i, a := range p.A {
		if err := check(fmt.Sprintf("A%d", i+1), a); err != nil {
			return err
		}
	}
	return nil
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

// Block is one diagonal block of a solution matrix: Data holds a dense
// symmetric N×N matrix row by row, or the N diagonal entries of an LP block
// (Diag set).
type Block struct {
	N    int
	Diag bool
	Data []float64
}

// At returns entry (i, j) of the block.
func (b *Block) At(i, j int) float64 {
	if b.Diag {
		if i != j {
			return 0
		}
		return b.Data[i]
	}
	return b.Data[i*b.N+j]
}
