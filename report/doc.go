// Package report turns a certificate into a document that a reviewer can
// read and re-check: GitHub-flavoured Markdown, LaTeX (a fragment for a
// paper or a whole document) or one self-contained, printable HTML page.
//
// A report is made from the certificate alone. Render re-checks it with
// checker.Verify and refuses one that the checker rejects; the
// verification record in the report is that fresh result. The model text
// in the certificate is parsed again to show the equations, and every
// formula is typeset from the exact polynomials, not from floating point:
//
//	canonical text            LaTeX
//	-2*x^2 + (2*r + 2)*x*y    -2\,x^{2} + \left(2\,r + 2\right)\,x\,y
//	x^2/sigma                 \frac{x^{2}}{\sigma}
//	3/2                       \frac{3}{2}
//
// The completed squares come from the forms' LDLᵀ factors,
// V₂ = Σₖ dₖ·(xₖ + Σᵢ>ₖ Lᵢₖ·xᵢ)² (Lagrange), zero pivots left out. An
// irrational end of a parameter region is named (α₁, α₂, …) with its
// polynomial and isolating interval, and given in closed form u ± v√w when
// the polynomial is quadratic. Plots (the region strip, a paving) are drawn
// with gonum/plot; their float64 coordinates only place the picture.
//
// Formulas are fitted to the page (fit.go, align.go, inline.go): a display
// whose right side is wider than the line, by an estimate of its width in
// TeX's rules, is broken between terms, a parenthesized sum inside a term
// across rows; a matrix too wide is shown in labelled blocks of columns;
// numbers of five digits or more are set in groups of three (ISO 80000-1),
// and in running text a rational with a long numerator or denominator is
// set n/d with permitted breaks between digit groups. HTML uses the same
// breaking with the width of its column.
//
// Every string that comes from a model file or a certificate is escaped for
// the format (texText, mdText, html/template), and the HTML page carries no
// script and a content security policy that forbids one. Every report ends
// with the cautions: a certificate proves a property of the model under its
// assumptions, not of the physical system.
//
// # The command line's output
//
// The package also holds everything the command line shows, so that the
// command keeps only flags, files and exit codes:
//
//   - terminal text: CheckText (the direct method), FindText (equilibria
//     and linearization certificates), VerifyText (a re-check, naming an
//     altered file and an untrusted signer), MergeText, KeyText, SignText,
//     ErrorText, Caution;
//   - the --json shapes: CheckJSON, FindJSON, VerifyJSON, MergeJSON,
//     KeyOutput, SignOutput, ReportOutput and ErrorJSON (the error of any
//     command), whose keys are a contract: no key is dropped when empty;
//   - FindVerdict, the one verdict that the text, the JSON and the exit
//     code of a search for equilibria state;
//   - pictures: PavingPlot (a paving of two parameters, or a slice of
//     more) and SweepPlot (the verdicts over a parameter grid).
//
// The terminal text and the JSON are made from the engine's results
// (certify/direct, certify/equilibria), whose certificates the checker has
// already accepted; the mathematics in CheckJSON is read from the
// certificate itself (certificates.ContentsOf). A report (Render) needs
// the certificate alone.
//
// A condition q > 0 on the parameters is stated the same way in the text,
// the JSON and the reports: when q = a·p + c is linear in one parameter p
// it reads p > −c/a for a > 0 and p < −c/a for a < 0; a positive constant
// needs no statement and a non-positive one never holds.
package report
