package certificates

import (
	"path/filepath"
	"testing"
)

// The fast canonical form equals the reference (decode into interfaces,
// encode again with sorted keys) on every certificate in testdata and on
// copies with awkward strings.
func TestCanonicalMatchesReference(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "certificates", "*.json"))
	if len(files) == 0 {
		t.Fatal("no certificates")
	}
	for _, f := range files {
		doc, err := ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		for _, src := range []string{doc.Source, `a "quoted" <script>&amp; \ back\slash`, "tab\tnewline\n\u2028 é ∂"} {
			doc.Source = src
			doc.Description = append(doc.Description, src)
			if err := Seal(doc); err != nil {
				t.Fatal(err)
			}
			ref, err := doc.ComputeDigest()
			if err != nil {
				t.Fatal(err)
			}
			if doc.Digest != ref {
				t.Fatalf("%s: the fast digest %s differs from the kernel's %s", f, doc.Digest, ref)
			}
		}
	}
}

func BenchmarkCanonical(b *testing.B) {
	doc, err := ReadFile(filepath.Join("..", "testdata", "certificates", "coolant.json"))
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		Seal(doc)
	}
}
