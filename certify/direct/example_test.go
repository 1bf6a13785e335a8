package direct_test

import (
	"fmt"
	"log"

	"github.com/lyacert/lyacert/certify/direct"
	"github.com/lyacert/lyacert/model"
)

// An invented damped pair: x' = −x + y, y' = −x − c·y with V = x² + y²
// gives V̇ = −2x² − 2c·y², negative definite exactly when c > 0 (common
// practice: a sum of negative squares).
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
	for _, iv := range res.Region.Intervals {
		fmt.Printf("holds for %s in (%s, %s], closed below: %v\n", res.Region.Param, iv.Lo, iv.Hi, iv.LoClosed)
	}
	fmt.Println("certificate re-checked:", res.Doc != nil)
	// Output:
	// V' = -2*x^2 - 2*c*y^2
	// verdict: holds-on-region
	// holds for c in (0, 2], closed below: false
	// certificate re-checked: true
}
