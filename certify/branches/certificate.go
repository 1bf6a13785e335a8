package branches

import (
	"errors"
	"fmt"
	"strings"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// ErrNoLinearModel says that a branch has no linear model for the kernel:
// it is irrational (its Jacobian involves √w), not isolated, has no
// symbolic P, or its Jacobian divides by the parameters.
var ErrNoLinearModel = errors.New("no linear model")

// LinearModel returns the text of a model the kernel can check for branch
// i of an: the linearisation ξ⁺ = J(p)ξ (ξ' = J(p)ξ) in the deviation
// ξ = x − x*(p), its states named as the model's, with the candidate
//
//	V = D(p)²·ξᵀP(p)ξ,
//
// P the symbolic solution of AᵀP + PA = −I (AᵀPA − P = −I) and D the
// denominator of ξᵀPξ. The factor D² > 0 clears the parameters'
// denominators, which the model language refuses where they may vanish,
// without changing where V is positive definite or V̇ (ΔV) negative
// definite, except at the roots of D, where V vanishes and nothing is
// claimed. Where the kernel then finds V ≻ 0 and −V̇ ≻ 0 the linear system
// is asymptotically stable, so J(p) is Hurwitz (Schur) and the branch is
// locally exponentially stable (Lyapunov's indirect method).
func LinearModel(m *model.Model, an *Analysis, i int) (string, error) {
	if i < 0 || i >= len(an.Branches) {
		return "", fmt.Errorf("branch %d: %w", i+1, ErrNoLinearModel)
	}
	b := an.Branches[i]
	switch {
	case !b.Isolated():
		return "", fmt.Errorf("branch %d is not isolated: %w", i+1, ErrNoLinearModel)
	case b.W != nil:
		return "", fmt.Errorf("branch %d involves sqrt(%s): %w", i+1, b.W, ErrNoLinearModel)
	case b.Quadratic == nil || b.Quadratic.P == nil:
		return "", fmt.Errorf("branch %d has no symbolic P: %w", i+1, ErrNoLinearModel)
	}
	r := an.Ring
	n := len(m.States)
	var sb strings.Builder
	fmt.Fprintf(&sb, "# The linearisation of %s along branch %d in the deviation from it (states named as the model's),\n", baseName(m.File), i+1)
	fmt.Fprintf(&sb, "# with V = D^2 * xi' P xi, P solving the Lyapunov equation exactly in the parameters.\n")
	fmt.Fprintf(&sb, "state %s\n", strings.Join(m.States, ", "))
	for _, p := range m.FreeParams() {
		if t := model.RangeText(p); t != "" {
			fmt.Fprintf(&sb, "parameter %s %s\n", p.Name, t)
		} else {
			fmt.Fprintf(&sb, "parameter %s\n", p.Name)
		}
	}
	for k, s := range m.States {
		f := zeroRF(r)
		for j := range n {
			e := b.Jacobian[k][j]
			if !e.IsRational() {
				return "", fmt.Errorf("branch %d: %w", i+1, ErrNoLinearModel)
			}
			if !e.A.IsPoly() {
				return "", fmt.Errorf("branch %d: the Jacobian entry %s divides by the parameters: %w", i+1, e.A, ErrNoLinearModel)
			}
			f = f.Add(e.A.Mul(poly.FromPoly(poly.Var(r, j))))
		}
		if m.Discrete {
			fmt.Fprintf(&sb, "%s+ = %s\n", s, f)
		} else {
			fmt.Fprintf(&sb, "%s' = %s\n", s, f)
		}
	}
	v := zeroRF(r)
	for k := range n {
		for j := range n {
			e := b.Quadratic.P[k][j]
			if !e.IsRational() {
				return "", fmt.Errorf("branch %d: %w", i+1, ErrNoLinearModel)
			}
			v = v.Add(e.A.Mul(poly.FromPoly(new(poly.Poly).Mul(poly.Var(r, k), poly.Var(r, j)))))
		}
	}
	if d := v.DenPoly(); !v.IsPoly() {
		v = v.Mul(poly.FromPoly(new(poly.Poly).Mul(d, d)))
	}
	if !v.IsPoly() {
		return "", fmt.Errorf("branch %d: V keeps a denominator: %w", i+1, ErrNoLinearModel)
	}
	fmt.Fprintf(&sb, "V = %s\n", v)
	return sb.String(), nil
}

func baseName(path string) string {
	if k := strings.LastIndexAny(path, `/\`); k >= 0 {
		return path[k+1:]
	}
	return path
}
