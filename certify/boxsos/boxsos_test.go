package boxsos

import (
	"context"
	"errors"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
)

func load(t *testing.T, name string) *model.Model {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "models", name))
	if err != nil {
		t.Fatal(err)
	}
	m, err := model.Parse(name, src)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// certify runs the direct method for V's form and the box search for −V̇.
func certify(t *testing.T, name string) (*claims.Document, error) {
	t.Helper()
	m := load(t, name)
	res, err := direct.Check(m, name)
	if err != nil {
		t.Fatal(err)
	}
	bm, err := Find(context.Background(), m)
	if err != nil {
		return nil, err
	}
	return Certify(res.Doc, bm)
}

// TestFind: the kernel accepts the certificates found where V works on the
// whole box, with the verdict the mathematics gives.
func TestFind(t *testing.T) {
	for _, c := range []struct {
		file, why string
	}{
		// V̇ = −2a·x² − 2b·y² ≤ −2(x² + y²) for a, b ≥ 1 (computed by hand;
		// common practice).
		{"boxdamped.lya", "diagonal −V̇"},
		// −V̇ = 2x² − 2(p − 1)xy + 2y²: Sylvester's criterion (common
		// practice) gives 4 − (p − 1)² > 0 for p ∈ [0, 2] (computed by hand).
		{"boxcross.lya", "cross term in p"},
		// −V̇ = 2x² + 2c·x⁴ − 2(p − 1)xy + 2y² ≥ its quadratic part for
		// c ≥ 0, definite as above (computed by hand): two multipliers,
		// a quartic term.
		{"boxquartic.lya", "two parameters, quartic"},
	} {
		t.Run(c.file, func(t *testing.T) {
			doc, err := certify(t, c.file)
			if err != nil {
				t.Fatalf("%s: %v", c.why, err)
			}
			out := checker.Verify(doc)
			if !out.Valid {
				for _, r := range out.Records {
					if !r.OK {
						t.Errorf("%s: %s", r.Name, r.Reason)
					}
				}
				t.FailNow()
			}
			if out.Verdict != checker.VerdictHolds || out.Kind != checker.KindGlobal {
				t.Errorf("%s: verdict %s (%s), want holds (global)", c.why, out.Verdict, out.Kind)
			}
		})
	}
}

// TestFindFails: on p ∈ [0, 4] the candidate fails at p = 4, where
// −V̇ = 2x² − 6xy + 2y² is indefinite (determinant 4 − 9 < 0, Sylvester's
// criterion, computed by hand): no certificate may be found.
func TestFindFails(t *testing.T) {
	m := load(t, "boxcross-wide.lya")
	bm, err := Find(context.Background(), m)
	if !errors.Is(err, ErrNotFound) {
		t.Fatalf("found %v (error %v), want ErrNotFound", bm, err)
	}
}

var update = flag.Bool("update", false, "rewrite testdata/certificates/box-multiplier.json")

// TestTestdataCertificate keeps testdata/certificates/box-multiplier.json
// (boxcross.lya) in step with the engine; the checker's hostile and tamper
// tests read it.
func TestTestdataCertificate(t *testing.T) {
	doc, err := certify(t, "boxcross.lya")
	if err != nil {
		t.Fatal(err)
	}
	doc.Issued, doc.Tool = "2026-12-01T00:00:00Z", "lyacert"
	if err := certificates.Seal(doc); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join("..", "..", "testdata", "certificates", "box-multiplier.json")
	if *update {
		if err := certificates.WriteFile(doc, path); err != nil {
			t.Fatal(err)
		}
		return
	}
	stored, err := certificates.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./certify/boxsos -run TestTestdataCertificate -update)", err)
	}
	if r := checker.Verify(stored); !r.Valid || r.Verdict != checker.VerdictHolds {
		t.Fatalf("stored certificate: valid %v, verdict %s", r.Valid, r.Verdict)
	}
	if stored.Digest != doc.Digest {
		t.Errorf("the engine now writes a different certificate; rerun with -update and review the diff")
	}
}
