// Package poly is lyacert's exact algebra, in the manner of math/big: the
// receiver is the result, and nothing is rounded.
//
//   - Ring: the variables of a model, its states first, then its free
//     parameters. *Poly is a sparse polynomial over Q in a ring; RatFunc a
//     polynomial over a product of parameter-only factors, cancelled exactly.
//   - The expression scanner and recursive-descent parser (file:line:col
//     errors, collected), bounded by Limits (bytes, depth, digits, bits of
//     folded constants, exponents, degrees, terms), and the canonical
//     printer, whose text the parser reads back under the same limits.
//   - Matrix of rational functions, GramMatrix (q(x) = xᵀGx), Jacobian, and
//     exact LDLᵀ pivots of rational matrices (Sylvester's criterion: a
//     symmetric matrix is positive definite iff all pivots are > 0), in
//     integers over a common denominator by Bareiss' fraction-free
//     elimination where the entries share a short one (PositiveLDL; and
//     EqualLDL, by the uniqueness of the factorization).
//   - Exact intervals with open or closed, finite or infinite ends, and the
//     enclosure of a polynomial over a box (Moore 1966); centred forms on
//     dyadic boxes for set inversion (Ratschek & Rokne 1984); the Krawczyk
//     operator (Krawczyk 1969) and enclosures of M = −(JᵀP + PJ).
//   - Univariate polynomials: Sturm sequences, root counting and isolation
//     (Sturm 1829), gcds, rational roots (p-adic lifting, Loos 1983, or
//     isolation), correctly rounded decimals, and
//     spans whose ends are algebraic numbers given by isolating intervals.
//
// Example: the orbital derivative of V = x² + y² along x' = −x + y, y' = −y
// is −2x² + 2xy − 2y², whose Gram matrix [[−2, 1], [1, −2]] has the pivots
// −2 and −3/2.
package poly
