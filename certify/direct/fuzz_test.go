package direct

import (
	"errors"
	"os"
	"path/filepath"
	"testing"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/examples"
	"github.com/lyacert/lyacert/model"
)

// FuzzCheck runs the whole engine on arbitrary models that parse: it may
// refuse them, but must not panic, and whatever it returns has passed the
// exact checker (Check returns certify.ErrUnverified otherwise, which fails here).
func FuzzCheck(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "models", "*.lya"))
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add(examples.Coolant)
	f.Fuzz(func(t *testing.T, src []byte) {
		m, err := model.Parse("fuzz.lya", src)
		if err != nil || m.V == nil || len(m.States) > 4 || len(m.Params) > 3 {
			return
		}
		for _, fi := range m.F {
			if fi.Num.Degree() > 6 || fi.Num.NumTerms() > 40 {
				return
			}
		}
		if m.V.Num.Degree() > 6 || m.V.Num.NumTerms() > 40 {
			return
		}
		if _, err := Check(m, "fuzz.lya"); errors.Is(err, certify.ErrUnverified) {
			t.Fatalf("the engine built a certificate the checker rejects: %v\n%s", err, src)
		}
	})
}
