package claims

import (
	"maps"
	"slices"
	"strings"
)

// PointCheck is a certificate of the model with some free parameters
// fixed, whole: its model text must be this model's with those values
// (model.FixParams), and the kernel verifies it from scratch. A region's
// point piece at those values holds when it proves the claim there, where
// the quadratic test of the whole range is only inconclusive.
type PointCheck struct {
	Params      map[string]string `json:"params"`
	Certificate *Document         `json:"certificate"`
}

func (*PointCheck) Rule() string { return "point-check" }

// Key names the point of parameter space: "a=4, b=1/2" in name order.
func (p *PointCheck) Key() string {
	var parts []string
	for _, k := range slices.Sorted(maps.Keys(p.Params)) {
		parts = append(parts, k+"="+p.Params[k])
	}
	return strings.Join(parts, ", ")
}
