// Package certify is lyacert's engine: it finds and proves, and hands every
// claim to the kernel (package checker) as a certificate, which the kernel
// re-checks with exact arithmetic before any claim is shown. Floating point
// may propose here; only the kernel decides.
//
// The engine is split by method, one sub-package each:
//
//	direct       Lyapunov's direct method for a given V: V̇, Gram matrices,
//	             symbolic LDLᵀ, conditions, exact regions, pavings, refutations
//	equilibria   equilibria (exact, or Newton plus Krawczyk), linearization
//	             certificates (Lyapunov's indirect method), find
//	sos          sums of squares: Gram matrices in monomial bases, exact
//	             rational certificates from an SDP solution
//	sdp          a primal–dual interior-point SDP solver (float, proposes)
//	lyapunov     float Lyapunov and Stein equations (Bartels–Stewart)
//	interval     float intervals with outward rounding (fast paving passes)
//	pave         set inversion over parameter boxes
//
// A new method gets a sub-package of its own that builds claims for the
// kernel; this package holds what every method shares: the certificate's
// header and the agreement check between the engine and the kernel.
package certify
