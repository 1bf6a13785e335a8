package certify

import (
	"errors"
	"fmt"
	"strings"
	"time"

	"lyacert/checker"
	"lyacert/model"
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
func NewDocument(m *model.Model, source string) *checker.Document {
	desc := m.Description
	if desc == nil {
		desc = []string{}
	}
	params := []checker.Parameter{}
	for _, p := range m.Params {
		params = append(params, checker.Parameter{Name: p.Name, Range: model.RangeText(p)})
	}
	return &checker.Document{
		Parameters:  params,
		Format:      checker.Format,
		Tool:        "lyacert " + Version,
		Issued:      time.Now().UTC().Format(time.RFC3339),
		Source:      source,
		Description: desc,
		Model:       m.Canonical(),
		Claims:      []checker.Claim{},
	}
}
