// Package pave paves a box of parameter values by set inversion (Moore 1966;
// Jaulin & Walter 1993): boxes are bisected along poly.SplitDim, a float
// interval pass with outward rounding proposes inside and outside boxes, and
// every proposal is confirmed by the exact centred form of each condition
// before it enters the tree that the certificate's paving claim states.
package pave
