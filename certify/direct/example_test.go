package direct_test

import (
	"fmt"
	"log"

	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/model"
)

// An invented damped pair: x' = −x + y, y' = −x − c·y with V = x² + y²
// gives V̇ = −2x² − 2c·y², negative definite exactly when c > 0 (common
// practice: a sum of negative squares); at c = 0 only semidefinite, and
// the invariance principle settles it (on x ≡ 0, x' = y forces y = 0).
func ExampleCheck() {
	const src = `# An invented damped pair.
state x, y
parameter c in [0, 2]
x' = -x + y
y' = -x - c*y
V = x^2 + y^2
`
	m, err := model.Parse("pair.lya", []byte(src))
	if err != nil {
		log.Fatal(err)
	}
	res, err := direct.Check(m, "pair.lya")
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("V' =", res.Vdot)
	fmt.Println("verdict:", res.Verdict)
	for _, pc := range res.Region.Pieces {
		fmt.Printf("%s: c from %s to %s\n", pc.Status, pc.Lo, pc.Hi)
	}
	fmt.Println("certificate re-checked:", res.Doc != nil)
	// Output:
	// V' = -2*x^2 - 2*c*y^2
	// verdict: holds
	// holds: c from 0 to 0
	// holds: c from 0 to 2
	// certificate re-checked: true
}
