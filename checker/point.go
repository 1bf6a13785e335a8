package checker

import (
	"slices"

	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// pointCheck: the model with the stated parameters fixed (model.FixParams,
// each value inside its range) is a model in its own right; the nested
// certificate is verified against it by the same rules, from scratch (its
// digest included, no deeper nesting), and the verdict and kind derived
// there hold at that point (Lyapunov's theorems apply to each parameter
// value separately).
func (c *run) pointCheck(cl claims.Claim) bool {
	pc := cl.(*claims.PointCheck)
	key := pc.Key()
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
