package model_test

import (
	"fmt"
	"log"

	"github.com/lyacert/lyacert/model"
)

// A model file is read into states, parameters, equations and the candidate;
// the orbital derivative follows (an invented damped oscillator; by hand,
// V̇ = 2x·y + 2y·(−x − c·y) = −2c·y², common practice).
func ExampleParse() {
	src := `# An invented damped oscillator.
state x, y
parameter c > 0
x' = y
y' = -x - c*y
V = x^2 + y^2
`
	m, err := model.Parse("oscillator.lya", []byte(src))
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(m.States, len(m.Params))
	fmt.Println(m.Derivative(*m.V))
	// Output:
	// [x y] 1
	// -2*c*y^2
}
