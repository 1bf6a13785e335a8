package poly

import "math/big"

// Enclose returns an interval that contains p(x) for every x in the box
// (one interval per ring variable; nil entries stand for the whole real line).
// It is the natural interval extension of p written as a sum of terms, each
// term evaluated with exact powers (Moore 1966): sound, not always tight.
func (p *Poly) Enclose(box []Interval) Interval {
	sum := Point(new(big.Rat))
	for _, t := range p.sortedTerms() {
		v := Point(t.Coef)
		for i, e := range t.Exp {
			if e == 0 {
				continue
			}
			x := Entire()
			if box[i].Lo.Value != nil || box[i].Lo.Inf != 0 {
				x = box[i]
			}
			v = v.Mul(x.Pow(e))
		}
		sum = sum.Add(v)
	}
	return sum
}
