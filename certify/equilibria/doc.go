// Package equilibria finds the equilibria of a model whose parameters are
// all fixed and certifies each through its linearization (Lyapunov's
// indirect method): exact rational equilibria by elimination where the
// equations allow it, otherwise Newton's method proposes and the Krawczyk
// test (Krawczyk 1969; Moore 1977) proves a box with exactly one equilibrium;
// a float solution of the Lyapunov equation AᵀP + PA = −Q (AᵀPA − P = −Q for
// maps; Bartels & Stewart 1972) is rounded to a rational P, and the kernel
// decides: P ≻ 0 with M = −(JᵀP + PJ) ≻ 0 over the box gives local
// asymptotic stability, a negative pivot of P instability. Find does this
// for the model's own equilibrium (or every one, with All).
package equilibria
