package certificates_test

import (
	"bytes"
	"fmt"
	"log"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
)

// A certificate travels as JSON: written by Marshal, read back by
// claims.Read and re-checked from scratch by checker.Verify, which
// derives the verdict from the claims. The model is an invented scenario,
// x' = −x + y, y' = −2y with V = x² + y², so V̇ = −2x² + 2xy − 4y²
// (negative definite by Sylvester's criterion: 2 > 0 and 2·4 − 1 > 0,
// common practice).
func ExampleMarshal() {
	src := []byte("state x, y\nx' = -x + y\ny' = -2*y\nV = x^2 + y^2\n")
	m, err := model.Parse("pair.lya", src)
	if err != nil {
		log.Fatal(err)
	}
	res, err := direct.Check(m, "pair.lya")
	if err != nil {
		log.Fatal(err)
	}
	data, err := certificates.Marshal(res.Doc)
	if err != nil {
		log.Fatal(err)
	}
	doc, err := claims.Read(bytes.NewReader(data))
	if err != nil {
		log.Fatal(err)
	}
	out := checker.Verify(doc)
	fmt.Println(out.Valid, out.Verdict, out.Kind)
	fmt.Println("V̇ =", certificates.ContentsOf(doc).Vdot)
	// Output:
	// true holds global-asymptotic
	// V̇ = -2*x^2 + 2*x*y - 4*y^2
}
