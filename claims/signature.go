package claims

import (
	"crypto/ed25519"
	"encoding/base64"
	"errors"
	"fmt"
)

// SignatureAlgorithm is the only signature algorithm a certificate may carry.
const SignatureAlgorithm = "ed25519"

// Errors of signature checking: no signature at all, or a signature that
// does not fit the content (or the key it names).
var (
	ErrUnsigned     = errors.New("no signature")
	ErrBadSignature = errors.New("signature does not match: the certificate was altered or signed by another key")
)

// Signer returns the public key that d's signature names, without checking
// the signature; ErrUnsigned when there is none.
func (d *Document) Signer() (ed25519.PublicKey, error) {
	s := d.Signature
	if s == nil {
		return nil, ErrUnsigned
	}
	if s.Algorithm != SignatureAlgorithm {
		return nil, fmt.Errorf("%w: algorithm %q, want %q", ErrBadSignature, s.Algorithm, SignatureAlgorithm)
	}
	pub, err := base64.StdEncoding.Strict().DecodeString(s.PublicKey)
	if err != nil || len(pub) != ed25519.PublicKeySize {
		return nil, fmt.Errorf("%w: the public key is not %d bytes of base64", ErrBadSignature, ed25519.PublicKeySize)
	}
	return ed25519.PublicKey(pub), nil
}

// VerifySignature checks d's signature against the digest recomputed from
// d's content (not the stored one, so that content and signature are tied
// even when the stored digest is stale) and returns the signing key: ed25519
// (RFC 8032) over the digest string. A valid signature says only that the
// holder of that key signed this content; VerifyTrusted asks whether the key
// is trusted.
func (d *Document) VerifySignature() (ed25519.PublicKey, error) {
	pub, err := d.Signer()
	if err != nil {
		return nil, err
	}
	sig, err := base64.StdEncoding.Strict().DecodeString(d.Signature.Value)
	if err != nil || len(sig) != ed25519.SignatureSize {
		return nil, fmt.Errorf("%w: the value is not %d bytes of base64", ErrBadSignature, ed25519.SignatureSize)
	}
	digest, err := d.ComputeDigest()
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrBadSignature, err)
	}
	if !ed25519.Verify(pub, []byte(digest), sig) {
		return nil, ErrBadSignature
	}
	return pub, nil
}
