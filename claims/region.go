package claims

import (
	"errors"
	"fmt"

	"github.com/lyacert/lyacert/poly"
)

// SturmRegion is the exact set of values of one parameter where every
// condition holds: Pieces partition the parameter's allowed range (or a side
// of a paving's box) into intervals on which every condition holds (Holds)
// or some condition fails throughout; Intervals lists the holding pieces.
type SturmRegion struct {
	Param     string     `json:"param"`
	Intervals []Interval `json:"intervals"`
	Pieces    []Piece    `json:"pieces"`
}

func (*SturmRegion) Rule() string { return "sturm-region" }

// Interval has ends that are "-inf", "inf", an exact rational, or an
// irrational algebraic number: the unique root of LoPoly (HiPoly) in the
// open isolating interval LoIsolating (HiIsolating), with Lo (Hi) its
// decimal value to 15 significant digits, correctly rounded.
type Interval struct {
	Lo          string     `json:"lo"`
	Hi          string     `json:"hi"`
	LoClosed    bool       `json:"lo_closed"`
	HiClosed    bool       `json:"hi_closed"`
	LoPoly      string     `json:"lo_poly,omitempty"`
	HiPoly      string     `json:"hi_poly,omitempty"`
	LoIsolating *[2]string `json:"lo_isolating,omitempty"`
	HiIsolating *[2]string `json:"hi_isolating,omitempty"`
}

// Piece is one interval of the partition of a parameter's range. Status
// is "holds" (every condition > 0 throughout; Holds), "fails" (the
// candidate is refuted throughout: a quadratic part takes negative values,
// see regionPieces) or "undecided" (some condition ≤ 0 throughout, and no
// refutation).
type Piece struct {
	Interval
	Holds  bool   `json:"holds"`
	Status string `json:"status"`
}

// Statuses of a piece.
const (
	PieceHolds     = "holds"
	PieceFails     = "fails"
	PieceUndecided = "undecided"
)

// ReadEnd reads one end of a piece of parameter param's range: "-inf" or
// "inf" (open), an exact rational, or an algebraic number: the only root
// of the polynomial polyText (degree ≥ 2 in the parameter) in the isolating
// interval iso, which the decimal value rounds (poly.Sturm.Isolates). The
// Sturm sequence of each polynomial is built once, in cache.
func ReadEnd(r *poly.Ring, param int, value, polyText string, iso *[2]string, closed bool, cache map[string]*poly.Sturm) (poly.End, error) {
	e := poly.End{Closed: closed}
	switch {
	case polyText == "" && iso == nil && (value == "-inf" || value == "inf"):
		e.Inf = map[bool]int{true: -1, false: 1}[value == "-inf"]
		if closed {
			return e, errors.New("an infinite end is open")
		}
		return e, nil
	case polyText == "" && iso == nil:
		q, ok := poly.ParseRat(value)
		if !ok {
			return e, fmt.Errorf("%q is not a rational", value)
		}
		e.Value = q
		return e, nil
	case iso == nil:
		return e, fmt.Errorf("%s comes without an isolating interval", polyText)
	}
	key := fmt.Sprint(param, " ", polyText)
	if cache[key] == nil {
		f, err := poly.Parse(r, polyText)
		if err != nil {
			return e, err
		}
		u, uni := f.Num.Univariate(param)
		if !f.IsPoly() || !uni || u.Degree() < 2 {
			return e, fmt.Errorf("%s is not a polynomial of degree ≥ 2 in %s", polyText, r.Name(param))
		}
		cache[key] = poly.NewSturm(u)
	}
	st := cache[key]
	a, b, err := st.Isolates(*iso, value)
	e.P, e.A, e.B = st.P, a, b
	return e, err
}
