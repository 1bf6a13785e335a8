package claims

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
