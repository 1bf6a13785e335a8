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

// AlgebraicPoint proves the claim at one irrational value α of the
// parameter Param: the unique root of Poly in the isolating interval
// Isolating, Value its decimal, as a region's piece writes that end.
// Forms are margin Gram forms of V and of −V̇, in that order, without
// minors: their identities hold for every value of the parameter, and
// their pivots are ≥ 0 at α.
type AlgebraicPoint struct {
	Param     string       `json:"param"`
	Value     string       `json:"value"`
	Poly      string       `json:"poly"`
	Isolating [2]string    `json:"isolating"`
	Forms     []MarginGram `json:"forms"`
}

func (*AlgebraicPoint) Rule() string { return "algebraic-point" }

// EndKey names a value of a parameter as a region's piece writes it: the
// decimal, and for an irrational value its polynomial and isolating
// interval.
func EndKey(param, value, poly string, iso *[2]string) string {
	if iso == nil {
		return param + "=" + value
	}
	return param + "=" + value + " " + poly + " (" + iso[0] + ", " + iso[1] + ")"
}
