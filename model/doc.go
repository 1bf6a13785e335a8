// Package model reads lyacert model files: polynomial dynamical systems with
// symbolic parameters, their assumptions, an optional candidate V and the
// equilibrium.
//
// A model file has one declaration a line; "#" starts a comment:
//
//	state u, v, w                  # state variables, in order
//	parameter g > 0                # also >=, <, <=
//	parameter h in [0, 4]          # closed, open or half-open: (0, 4], [0, 4) ...
//	parameter m = 8/3              # fixed value
//	let q = u*v                    # named sub-expression, substituted
//	u' = g*(v - u)                 # exactly one equation per state
//	v' = h*u - v - q
//	w' = q - m*w
//	V = u^2/g + v^2 + w^2          # the candidate (optional)
//	at u = 0, v = 0, w = 0         # the equilibrium; the origin when left out
//
// Discrete-time models (maps) write the successor state u⁺ as "u+ = ..."
// instead of "u' = ...", for all states alike.
//
// Earlier versions spelled "parameter" as "param" and "u+ = ..." as
// "next u = ..."; those spellings are input errors that name the new ones.
//
// The package sits between poly and certificates: the certificate checker
// re-reads a model's canonical text with it.
package model
