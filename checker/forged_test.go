package checker_test

import (
	"context"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
)

// A forged verdict is rejected even with every derived number left intact
// and the digest re-sealed: the unstable scalar system x' = a·x has the
// condition −1 > 0 (−V̇ = −2a·x², a > 0), which never holds, so no claim
// list built from its numbers can make the kernel derive "holds" (common
// practice, no source).
func TestForgedVerdictRejected(t *testing.T) {
	doc, err := certificates.ReadFile(filepath.Join("..", "testdata", "certificates", "unstable.json"))
	if err != nil {
		t.Fatal(err)
	}
	// Drop the refutation and anything after the conditions: what remains
	// must not be taken for a proof.
	var kept []claims.Claim
	for _, c := range doc.Claims {
		if _, ok := c.(*claims.Refutation); !ok {
			kept = append(kept, c)
		}
	}
	doc.Claims = kept
	if err := certificates.Seal(doc); err != nil {
		t.Fatal(err)
	}
	if r := checker.Verify(doc); r.Verdict == checker.VerdictHolds || r.Verdict == checker.VerdictOnRegion {
		t.Errorf("a failing condition yields the verdict %q", r.Verdict)
	}
}

// Nothing unchecked may ride along: witness points beside a one-parameter
// region are refused rather than ignored.
func TestStrayWitnessRejected(t *testing.T) {
	doc, err := certificates.ReadFile(filepath.Join("..", "testdata", "certificates", "lorenz.json"))
	if err != nil {
		t.Fatal(err)
	}
	var cs []claims.Claim
	for _, c := range doc.Claims {
		cs = append(cs, c)
		if _, ok := c.(*claims.SturmRegion); ok {
			cs = append(cs, &claims.WitnessPoints{Points: []claims.Witness{{Params: map[string]string{"r": "5"}, Values: []string{"1"}, Holds: true}}})
		}
	}
	doc.Claims = cs
	if err := certificates.Seal(doc); err != nil {
		t.Fatal(err)
	}
	if checker.Verify(doc).Valid {
		t.Error("an unchecked witness beside a region is accepted")
	}
}

// A verification stopped by its context is invalid, never a verdict.
func TestVerifyStopped(t *testing.T) {
	doc, err := certificates.ReadFile(filepath.Join("..", "testdata", "certificates", "lorenz.json"))
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if out := checker.VerifyContext(ctx, doc); out.Valid || out.Verdict != "" {
		t.Errorf("a cancelled verification gives %+v", out)
	}
	if out := checker.VerifyContext(context.Background(), doc); !out.Valid {
		t.Error("the certificate does not verify")
	}
}
