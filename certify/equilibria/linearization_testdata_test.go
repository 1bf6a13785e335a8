package equilibria

import (
	"context"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/model"
)

// linearizationCases are the linearization certificates kept in
// testdata/certificates (rewritten with -update, like certificateCases):
// exact and enclosed equilibria, stable and unstable, in continuous and
// discrete time, nonlinear and affine.
var linearizationCases = []struct {
	name, model string
	set         []string
	eq          int    // index in the ordered list of equilibria
	claim       string // expected
}{
	{"lin-lorenz-r20-cminus", "lorenz-classic.lya", []string{"r=20"}, 0, checker.KindLocal},
	{"lin-lorenz-r20-origin", "lorenz-classic.lya", []string{"r=20"}, 1, checker.KindUnstable},
	{"lin-lorenz-r28-cplus", "lorenz-classic.lya", []string{"r=28"}, 2, checker.KindUnstable},
	{"lin-quadmap", "quadmap.lya", nil, 0, checker.KindLocal},
	{"lin-logistic", "logistic.lya", []string{"r=5/2"}, 1, checker.KindLocal},
	// Affine models: the linearization is the model, so the claim is global.
	{"lin-ogata", "ogata.lya", nil, 0, checker.KindGlobal},
	{"lin-discrete", "discrete.lya", nil, 0, checker.KindGlobal},
	// s³ + s² + s + 2: a2·a1 = 1 < a0 = 2, two roots in the right half-plane
	// (Routh–Hurwitz criterion, as stated in companion3.lya).
	{"lin-companion3-unstable", "companion3.lya", []string{"a0=2", "a1=1", "a2=1"}, 0, checker.KindUnstable},
}

func TestTestdataLinearizationCertificates(t *testing.T) {
	for _, c := range linearizationCases {
		t.Run(c.name, func(t *testing.T) {
			m := loadCase(t, c.model, c.set...)
			s, err := FindEquilibria(m)
			if err != nil {
				t.Fatal(err)
			}
			ct, err := CertifyEquilibrium(context.Background(), m, &s.Equilibria[c.eq], CertifyOptions{Source: c.model, Issued: "2026-12-01T00:00:00Z"})
			if err != nil {
				t.Fatal(err)
			}
			if ct.Claim != c.claim || ct.Doc == nil {
				t.Fatalf("claim %s (%s), want %s", ct.Claim, ct.Reason, c.claim)
			}
			ct.Doc.Tool = "lyacert"
			if err := certificates.Seal(ct.Doc); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join("..", "..", "testdata", "certificates", c.name+".json")
			if *update {
				if err := certificates.WriteFile(ct.Doc, path); err != nil {
					t.Fatal(err)
				}
				return
			}
			doc, err := certificates.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run go test ./certify/equilibria -run TestTestdataLinearizationCertificates -update)", err)
			}
			if r := checker.Verify(doc); !r.Valid {
				t.Fatalf("stored certificate no longer verifies: %v", failed(r))
			}
			if ct.Doc.Digest != doc.Digest {
				t.Errorf("the engine now writes a different certificate; rerun with -update and review the diff")
			}
		})
	}
}

var update = flag.Bool("update", false, "rewrite the linearization certificates in testdata/certificates")

func loadCase(t testing.TB, file string, set ...string) *model.Model {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "models", file))
	if err != nil {
		t.Fatal(err)
	}
	return parseModel(t, string(src), set...)
}

func failed(r checker.Outcome) string {
	var out []string
	for _, c := range r.Records {
		if !c.OK {
			out = append(out, c.Name+": "+c.Reason)
		}
	}
	return strings.Join(out, "; ")
}
