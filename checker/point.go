package checker

import (
	"maps"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
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

// pointKey names a point of parameter space: "a=4, b=1/2" in name order.
func pointKey(vals map[string]string) string {
	var parts []string
	for _, k := range slices.Sorted(maps.Keys(vals)) {
		parts = append(parts, k+"="+vals[k])
	}
	return strings.Join(parts, ", ")
}

// pointCheck: the model with the stated parameters fixed (model.FixParams,
// each value inside its range) is a model in its own right; the nested
// certificate is verified against it by the same rules, from scratch (its
// digest included, no deeper nesting), and the verdict and kind derived
// there hold at that point (Lyapunov's theorems apply to each parameter
// value separately).
func (c *run) pointCheck(cl Claim) bool {
	pc := cl.(*PointCheck)
	key := pointKey(pc.Params)
	vals, ok := c.paramValues(pc.Params, "point "+key)
	if !ok || !c.add("point "+key, len(vals) > 0 && c.points[key] == nil && !c.nested, "a new point, not inside another") {
		return false
	}
	var sets []model.Setting
	for name := range pc.Params {
		i, _ := c.r.Index(name)
		sets = append(sets, model.Setting{Name: name, Value: vals[i]})
	}
	fixed, err := model.FixParams(c.m, sets)
	if !c.add("point "+key, err == nil, "the model with %s fixed%s", key, errSuffix(err)) {
		return false
	}
	doc := pc.Certificate
	if !c.add("point "+key, doc != nil && doc.Model == fixed.Canonical() && doc.Signature == nil, "a certificate of the model with %s fixed, unsigned", key) {
		return false
	}
	sub := &run{ctx: c.ctx, doc: doc, nested: true, forms: map[string]*checkedForm{}, seen: map[string]bool{}, sturm: map[string]*poly.Sturm{}, points: map[string]*[2]string{}}
	verdict, kind := sub.verify()
	for _, r := range sub.records {
		c.add("at "+key+": "+r.Name, r.OK, "%s", r.Reason)
	}
	c.points[key] = &[2]string{verdict, kind}
	return !sub.failed && c.add("point "+key, verdict == VerdictHolds, "the certificate proves %s at %s", kind, key)
}

// kindRank orders the kinds of claim from the weakest.
func kindRank(k string) int {
	return slices.Index([]string{KindStable, KindLocal, KindGlobal}, k)
}
