package checker_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"

	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
)

// Re-checking a certificate needs nothing but the file: the kernel reads it
// byte for byte, checks every claim by the rule it names, and derives the
// verdict (here the invented coolant-loop demo, which holds for gains
// k < 1 + 2√2).
func ExampleVerify() {
	f, err := os.Open(filepath.Join("..", "testdata", "certificates", "coolant.json"))
	if err != nil {
		log.Fatal(err)
	}
	defer f.Close()
	doc, err := claims.Read(f)
	if err != nil {
		log.Fatal(err)
	}
	out := checker.Verify(doc)
	fmt.Println(out.Valid, out.Verdict, out.Kind, out.Region)
	// Output:
	// true holds-on-region global-asymptotic sturm-region
}
