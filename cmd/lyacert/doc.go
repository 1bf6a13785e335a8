// Command lyacert checks, finds and documents Lyapunov-function certificates
// for polynomial dynamical systems, with exact arithmetic.
//
// The command reads flags and files, runs the engine (package certify and
// its methods) and the kernel (package checker), writes certificates, and
// turns what happened into an exit code: 0 the claim holds for every
// allowed parameter value, 1 it does not (or only on part of the range, or
// is undecided), 2 bad input or usage, 3 stopped early, 4 shards missing
// (merge), 5 a certificate failed verification, 6 the mathematics passed
// but the signer is not trusted (verify --trust). With --json an error is
// a JSON document on standard output. What it prints, as text or --json,
// and the plots it draws are made by package report.
package main
