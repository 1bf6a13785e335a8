// Package layout holds no code: its tests pin the architecture. Imports flow
// one way, from the exact algebra up to the command line, and the kernel
// (package checker) imports only poly, model and the standard library, and
// uses no floating point.
package layout
