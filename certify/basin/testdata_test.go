package basin

import (
	"context"
	"flag"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
)

var update = flag.Bool("update", false, "rewrite the basin certificates of testdata/certificates")

// basinCases are the basin certificates that live in testdata/certificates
// for the checker's tests (mutations, hostile copies); a coarse gap keeps
// them small.
var basinCases = []struct{ name, model, method string }{
	{"basin-ring", "ring.lya", MethodBranch},
	{"basin-vanderpol", "vanderpol.lya", MethodBranch},
	{"basin-ringbox", "ringbox.lya", MethodBranch},
	{"basin-vanderpol-sos", "vanderpol.lya", MethodSOS},
}

// TestTestdataBasinCertificates rewrites them with -update; without, it
// checks that each still verifies with the level the engine finds.
func TestTestdataBasinCertificates(t *testing.T) {
	for _, c := range basinCases {
		t.Run(c.name, func(t *testing.T) {
			r, err := Find(context.Background(), load(t, c.model), c.model, Options{Gap: 0.05, Method: c.method})
			if err != nil {
				t.Fatal(err)
			}
			path := filepath.Join("..", "..", "testdata", "certificates", c.name+".json")
			if *update {
				if err := certificates.WriteFile(r.Doc, path); err != nil {
					t.Fatal(err)
				}
				return
			}
			d, err := certificates.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			out := checker.Verify(d)
			if !out.Valid || out.Basin != r.Level.RatString() {
				t.Errorf("%s: valid %v, level %q; the engine finds %s (run with -update)", path, out.Valid, out.Basin, r.Level.RatString())
			}
		})
	}
}
