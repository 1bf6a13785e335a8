package certify

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// Version is the engine's version, written into certificates.
const Version = "0.1.0"

// Agrees returns ErrUnverified, with the failed checks, unless the kernel
// accepted the certificate and derived the verdict and kind the engine found.
func Agrees(out checker.Outcome, verdict, kind string) error {
	if !out.Valid {
		var failed []string
		for _, c := range out.Records {
			if !c.OK {
				failed = append(failed, c.Name+": "+c.Reason)
			}
		}
		return fmt.Errorf("%w: %s", ErrUnverified, strings.Join(failed, "; "))
	}
	if out.Verdict != verdict || out.Kind != kind {
		return fmt.Errorf("%w: the checker derives %s (%s), the engine found %s (%s)", ErrUnverified, out.Verdict, out.Kind, verdict, kind)
	}
	return nil
}

// ErrUnverified reports a certificate that the exact checker rejected: a bug
// in the engine, never a claim.
var ErrUnverified = errors.New("internal error: the exact checker rejected the certificate the engine built")

// NewDocument starts a certificate of m with no claims.
func NewDocument(m *model.Model, source string) *claims.Document {
	desc := m.Description
	if desc == nil {
		desc = []string{}
	}
	params := []claims.Parameter{}
	for _, p := range m.Params {
		params = append(params, claims.Parameter{Name: p.Name, Range: model.RangeText(p)})
	}
	return &claims.Document{
		Parameters:  params,
		Format:      claims.Format,
		Tool:        "lyacert " + Version,
		Issued:      time.Now().UTC().Format(time.RFC3339),
		Source:      source,
		Description: desc,
		Model:       m.Canonical(),
		Claims:      []claims.Claim{},
	}
}

// Budget is what one run of the engine may spend: the limits on reading
// (poly.Limits; the engine's derived polynomials are bounded by them too)
// and the time. It travels in a context.Context, whose deadline is the one
// the engine honours (see WithBudget).
type Budget struct {
	Limits  poly.Limits
	Timeout time.Duration // zero: no deadline
}

type budgetKey struct{}

// WithBudget returns a context that carries b, with the deadline
// b.Timeout from now when it is positive.
func WithBudget(ctx context.Context, b Budget) (context.Context, context.CancelFunc) {
	ctx = context.WithValue(ctx, budgetKey{}, b)
	if b.Timeout > 0 {
		return context.WithTimeout(ctx, b.Timeout)
	}
	return context.WithCancel(ctx)
}

// BudgetOf returns the budget that ctx carries, if any.
func BudgetOf(ctx context.Context) (Budget, bool) {
	b, ok := ctx.Value(budgetKey{}).(Budget)
	return b, ok
}
