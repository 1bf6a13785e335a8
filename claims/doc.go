// Package claims is the certificate format that the kernel in package
// checker reads: a Document (a model text, its parameters restated, a list
// of claims, a digest and an optional signature) and one type per claim,
// each naming the kernel rule that checks it.
//
// Decoding is strict, and part of what the kernel trusts: a claim must name
// a known rule (Rules) and carry exactly the fields of that rule's type; no
// unknown field, no trailing data; Read takes a file only byte for byte as
// File writes it, so the digest (ComputeDigest: SHA-256 of the canonical
// serialization) and the ed25519 signature (VerifySignature) cover exactly
// the bytes that were read. The grammar of a paving's tree (WalkPaving) and
// the exact reading of numbers (CanonicalRat, poly.ParseRat) live here too.
//
// Nothing here decides whether a claim holds: that is checker.Verify's
// job. Like the kernel, this package uses no floating point and imports only
// poly and the standard library.
package claims
