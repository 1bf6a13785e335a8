package certificates

import (
	"path/filepath"
	"testing"
)

// A forged verdict is rejected even with every derived number left intact
// and the digest re-sealed: the unstable scalar system x' = a·x has the
// condition −1 > 0 (−V̇ = −2a·x², a > 0), which never holds, so "holds"
// must not pass (common practice, no source).
func TestForgedVerdictRejected(t *testing.T) {
	doc, err := ReadFile(filepath.Join("..", "testdata", "certificates", "unstable.json"))
	if err != nil {
		t.Fatal(err)
	}
	for _, claim := range []string{ClaimGlobal, ClaimLocal} {
		forged := *doc
		forged.Verdict, forged.Claim, forged.Refutation, forged.Region = VerdictHolds, claim, nil, nil
		if err := forged.Seal(); err != nil {
			t.Fatal(err)
		}
		if Verify(&forged).Valid {
			t.Errorf("a forged %q verdict on a failing condition is accepted", claim)
		}
	}
}

// Nothing unchecked may ride along: witness points beside a one-parameter
// region are refused rather than ignored.
func TestStrayWitnessRejected(t *testing.T) {
	doc, err := ReadFile(filepath.Join("..", "testdata", "certificates", "lorenz.json"))
	if err != nil {
		t.Fatal(err)
	}
	doc.Witnesses = []Witness{{Params: map[string]string{"r": "5"}, Values: []string{"1"}, Holds: true}}
	if err := doc.Seal(); err != nil {
		t.Fatal(err)
	}
	if Verify(doc).Valid {
		t.Error("an unchecked witness beside a region is accepted")
	}
}
