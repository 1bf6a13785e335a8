package certificates

import "github.com/lyacert/lyacert/claims"

// Contents gathers a certificate's claims by kind, for people and programs
// that present them (reports, terminal text, --json). It decides nothing:
// present only a document that checker.Verify accepted.
type Contents struct {
	V, Vdot       string
	Forms         []FormView
	Conditions    []claims.MinorCondition
	Kernel        [][]string
	Region        *RegionView
	Witnesses     []claims.Witness
	Refutation    *claims.Refutation
	Krawczyk      *claims.KrawczykEnclosure
	Linearization *claims.Linearization
	// NotSOS are the proofs that V or −V̇ is no sum of squares in a basis.
	NotSOS []claims.NotSOS
	// Invariance is the invariance principle's identities; Points the
	// nested certificates of point pieces.
	Invariance *claims.Invariance
	Points     []*claims.PointCheck
	// Algebraic are the point pieces at irrational parameter values
	// settled by margin Gram forms whose pivots are ≥ 0 there.
	Algebraic []*claims.AlgebraicPoint
}

// FormView is a Gram matrix with its LDLᵀ: of the quadratic part (Basis nil)
// or of the whole function in a monomial basis, less Margin when not "".
type FormView struct {
	Name   string
	Basis  []string
	Margin string
	// Triangular orders the states when the form's squares solve for them
	// in turn (a semidefinite form that is definite after all).
	Triangular []string
	claims.LDLForm
}

// RegionView is where the conditions hold: the pieces of one parameter's
// range, or a paving of several parameters' box (with its product form).
type RegionView struct {
	Param     string
	Intervals []claims.Interval
	Pieces    []claims.Piece
	Paving    *claims.Paving
}

// ContentsOf gathers the claims of d.
func ContentsOf(d *claims.Document) Contents {
	var c Contents
	for _, cl := range d.Claims {
		switch x := cl.(type) {
		case *claims.OrbitalDerivative:
			c.V, c.Vdot = x.V, x.Vdot
		case *claims.QuadraticPart:
			c.Forms = append(c.Forms, FormView{Name: x.Of, LDLForm: x.LDLForm})
		case *claims.MonomialGram:
			c.Forms = append(c.Forms, FormView{Name: x.Of, Basis: x.Basis, LDLForm: x.LDLForm})
		case *claims.MarginGram:
			c.Forms = append(c.Forms, FormView{Name: x.Of, Basis: x.Basis, Margin: x.Margin, LDLForm: x.LDLForm})
		case *claims.NotSOS:
			c.NotSOS = append(c.NotSOS, *x)
		case *claims.TriangularSquares:
			for i := range c.Forms {
				if c.Forms[i].Name == x.Of {
					c.Forms[i].Triangular = x.Order
				}
			}
		case *claims.MinorCondition:
			c.Conditions = append(c.Conditions, *x)
		case *claims.Invariance:
			c.Invariance = x
		case *claims.PointCheck:
			c.Points = append(c.Points, x)
		case *claims.AlgebraicPoint:
			c.Algebraic = append(c.Algebraic, x)
		case *claims.NullSpace:
			c.Kernel = x.Vectors
		case *claims.SturmRegion:
			c.Region = &RegionView{Param: x.Param, Intervals: x.Intervals, Pieces: x.Pieces}
		case *claims.Paving:
			c.Region = &RegionView{Intervals: []claims.Interval{}, Pieces: []claims.Piece{}, Paving: x}
		case *claims.WitnessPoints:
			c.Witnesses = x.Points
		case *claims.Refutation:
			c.Refutation = x
		case *claims.KrawczykEnclosure:
			c.Krawczyk = x
		case *claims.Linearization:
			c.Linearization = x
		}
	}
	return c
}

// ClaimsOf returns the claims of d of type T, in order.
func ClaimsOf[T claims.Claim](d *claims.Document) []T {
	var out []T
	for _, c := range d.Claims {
		if t, ok := c.(T); ok {
			out = append(out, t)
		}
	}
	return out
}

// First returns the first claim of d of type T.
func First[T claims.Claim](d *claims.Document) (T, bool) {
	if cs := ClaimsOf[T](d); len(cs) > 0 {
		return cs[0], true
	}
	var zero T
	return zero, false
}
