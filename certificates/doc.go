// Package certificates reads, seals, signs and writes certificate documents
// (the format the kernel in package checker defines and checks). Nothing here
// decides whether a claim holds: sealing computes the digest that Verify
// recomputes, and signing adds an ed25519 signature that Verify checks.
package certificates
