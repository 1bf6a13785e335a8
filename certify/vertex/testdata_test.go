package vertex

import (
	"context"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

var update = flag.Bool("update", false, "rewrite the vertex certificates in testdata/certificates")

// TestTestdataCertificates keeps the vertex certificates of
// testdata/certificates as the engine writes them (-update rewrites them).
// boxgain.lya is x' = y, y' = −k·x − c·y on k, c ∈ [1, 2]: stable at every
// point of the box (Routh–Hurwitz for s² + c·s + k; common practice), with a
// common P (by hand, see TestFind), globally since the model is linear in
// the states.
func TestTestdataCertificates(t *testing.T) {
	for _, c := range []struct{ name, model, kind string }{
		{"box-gain", "boxgain.lya", checker.KindGlobal},
	} {
		t.Run(c.name, func(t *testing.T) {
			src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "models", c.model))
			if err != nil {
				t.Fatal(err)
			}
			m, err := model.Parse(c.model, src)
			if err != nil {
				t.Fatal(err)
			}
			res, err := Find(context.Background(), m, Options{Source: c.model, Issued: "2026-12-01T00:00:00Z"})
			if err != nil {
				t.Fatal(err)
			}
			if res.Doc == nil || res.Outcome.Kind != c.kind {
				t.Fatalf("no certificate of kind %s: %q, %+v", c.kind, res.Reason, res.Outcome.Kind)
			}
			res.Doc.Tool = "lyacert"
			if err := certificates.Seal(res.Doc); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join("..", "..", "testdata", "certificates", c.name+".json")
			if *update {
				if err := certificates.WriteFile(res.Doc, path); err != nil {
					t.Fatal(err)
				}
				return
			}
			doc, err := certificates.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run go test ./certify/vertex -run TestTestdataCertificates -update)", err)
			}
			if r := checker.Verify(doc); !r.Valid || r.Verdict != checker.VerdictHolds || r.Kind != c.kind {
				t.Fatalf("stored certificate: valid %v, %s (%s)", r.Valid, r.Verdict, r.Kind)
			}
			if res.Doc.Digest != doc.Digest {
				t.Errorf("the engine now writes a different certificate; rerun with -update and review the diff")
			}
		})
	}
}
