package certificates

import "github.com/lyacert/lyacert/checker"

// Contents gathers a certificate's claims by kind, for people and programs
// that present them (reports, terminal text, --json). It decides nothing:
// present only a document that checker.Verify accepted.
type Contents struct {
	V, Vdot       string
	Forms         []FormView
	Conditions    []checker.MinorCondition
	Kernel        [][]string
	Region        *RegionView
	Witnesses     []checker.Witness
	Refutation    *checker.Refutation
	Krawczyk      *checker.KrawczykEnclosure
	Linearization *checker.Linearization
	// NotSOS are the proofs that V or −V̇ is no sum of squares in a basis.
	NotSOS []checker.NotSOS
	// Invariance is the invariance principle's identities; Points the
	// nested certificates of point pieces.
	Invariance *checker.Invariance
	Points     []*checker.PointCheck
}

// FormView is a Gram matrix with its LDLᵀ: of the quadratic part (Basis nil)
// or of the whole function in a monomial basis, less Margin when not "".
type FormView struct {
	Name   string
	Basis  []string
	Margin string
	checker.LDLForm
}

// RegionView is where the conditions hold: the pieces of one parameter's
// range, or a paving of several parameters' box (with its product form).
type RegionView struct {
	Param     string
	Intervals []checker.Interval
	Pieces    []checker.Piece
	Paving    *checker.Paving
}

// ContentsOf gathers the claims of d.
func ContentsOf(d *checker.Document) Contents {
	var c Contents
	for _, cl := range d.Claims {
		switch x := cl.(type) {
		case *checker.OrbitalDerivative:
			c.V, c.Vdot = x.V, x.Vdot
		case *checker.QuadraticPart:
			c.Forms = append(c.Forms, FormView{Name: x.Of, LDLForm: x.LDLForm})
		case *checker.MonomialGram:
			c.Forms = append(c.Forms, FormView{Name: x.Of, Basis: x.Basis, LDLForm: x.LDLForm})
		case *checker.MarginGram:
			c.Forms = append(c.Forms, FormView{Name: x.Of, Basis: x.Basis, Margin: x.Margin, LDLForm: x.LDLForm})
		case *checker.NotSOS:
			c.NotSOS = append(c.NotSOS, *x)
		case *checker.MinorCondition:
			c.Conditions = append(c.Conditions, *x)
		case *checker.Invariance:
			c.Invariance = x
		case *checker.PointCheck:
			c.Points = append(c.Points, x)
		case *checker.NullSpace:
			c.Kernel = x.Vectors
		case *checker.SturmRegion:
			c.Region = &RegionView{Param: x.Param, Intervals: x.Intervals, Pieces: x.Pieces}
		case *checker.Paving:
			c.Region = &RegionView{Intervals: []checker.Interval{}, Pieces: []checker.Piece{}, Paving: x}
		case *checker.WitnessPoints:
			c.Witnesses = x.Points
		case *checker.Refutation:
			c.Refutation = x
		case *checker.KrawczykEnclosure:
			c.Krawczyk = x
		case *checker.Linearization:
			c.Linearization = x
		}
	}
	return c
}

// ClaimsOf returns the claims of d of type T, in order.
func ClaimsOf[T checker.Claim](d *checker.Document) []T {
	var out []T
	for _, c := range d.Claims {
		if t, ok := c.(T); ok {
			out = append(out, t)
		}
	}
	return out
}

// First returns the first claim of d of type T.
func First[T checker.Claim](d *checker.Document) (T, bool) {
	if cs := ClaimsOf[T](d); len(cs) > 0 {
		return cs[0], true
	}
	var zero T
	return zero, false
}
