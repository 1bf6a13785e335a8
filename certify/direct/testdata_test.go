package direct

import (
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/examples"
	"github.com/lyacert/lyacert/model"
)

var update = flag.Bool("update", false, "rewrite testdata/certificates from testdata/models")

// certificateCases are the models whose certificates live in
// testdata/certificates; the checker's tests (mutation, golden reports) read
// them. Settings fix parameters for cases that need a point.
var certificateCases = []struct {
	name, model string
	set         []string
}{
	{"coolant", "", nil}, // the embedded demo (invented scenario)
	{"lorenz", "lorenz.lya", nil},
	{"lorenz-r1", "lorenz.lya", []string{"r=1"}},
	{"ogata", "ogata.lya", nil},
	{"oscillator", "oscillator.lya", nil},
	{"strogatz72", "strogatz72.lya", nil},
	{"local", "local.lya", nil},
	{"unstable", "unstable.lya", nil},
	{"twogains", "twogains.lya", nil},
	{"shifted", "shifted.lya", nil},
	{"linearpart", "linearpart.lya", nil},
	{"discrete", "discrete.lya", nil},
	{"strogatz72-a4", "strogatz72.lya", []string{"a=4"}},
	{"cubic", "cubic.lya", nil},
	{"quartic", "quartic.lya", nil},
	{"margin", "margin.lya", nil},
	{"motzkin", "motzkin.lya", nil},
	{"algebraic", "algebraic.lya", nil},
	{"triangular", "triangular.lya", nil},
}

func loadCase(t testing.TB, file string, set []string) *model.Model {
	t.Helper()
	name, src := examples.CoolantName, examples.Coolant
	if file != "" {
		var err error
		name = file
		src, err = os.ReadFile(filepath.Join("..", "..", "testdata", "models", file))
		if err != nil {
			t.Fatal(err)
		}
	}
	var settings []model.Setting
	for _, s := range set {
		st, err := model.ParseSetting(s)
		if err != nil {
			t.Fatal(err)
		}
		settings = append(settings, st)
	}
	m, err := model.Parse(name, src, settings...)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestTestdataCertificates keeps testdata/certificates in step with the
// engine: with -update it rewrites them; without, it checks that each is
// still valid and still what the engine produces (but for the issue date).
func TestTestdataCertificates(t *testing.T) {
	for _, c := range certificateCases {
		t.Run(c.name, func(t *testing.T) {
			m := loadCase(t, c.model, c.set)
			res, err := Check(m, c.model)
			if err != nil {
				t.Fatal(err)
			}
			path := filepath.Join("..", "..", "testdata", "certificates", c.name+".json")
			if *update {
				res.Doc.Issued = "2026-12-01T00:00:00Z"
				res.Doc.Tool = "lyacert"
				if err := certificates.Seal(res.Doc); err != nil {
					t.Fatal(err)
				}
				if err := certificates.WriteFile(res.Doc, path); err != nil {
					t.Fatal(err)
				}
				return
			}
			doc, err := certificates.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run go test ./certify/direct -run TestTestdataCertificates -update)", err)
			}
			if r := checker.Verify(doc); !r.Valid {
				t.Fatalf("stored certificate no longer verifies: %v", failed(r))
			}
			res.Doc.Issued, res.Doc.Tool = doc.Issued, doc.Tool
			if err := certificates.Seal(res.Doc); err != nil {
				t.Fatal(err)
			}
			if res.Doc.Digest != doc.Digest {
				t.Errorf("the engine now writes a different certificate; rerun with -update and review the diff")
			}
		})
	}
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
