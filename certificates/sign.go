package certificates

import (
	"crypto/ed25519"
	"crypto/rand"
	"encoding/base64"
	"errors"
	"fmt"
	"io"
	"lyacert/checker"
	"os"
	"path/filepath"
	"strings"
)

// Key file headers: the first line of a key file says what it holds, so
// that a private key is never taken for a public one or the reverse.
const (
	privateKeyHeader = "lyacert ed25519 private key"
	publicKeyHeader  = "lyacert ed25519 public key"
)

// Sign signs d's canonical digest with priv and stores the signature in d.
// The signed message is the digest string ("sha256:…") as bytes. The digest
// is recomputed from the content first: Sign refuses a document whose stored
// digest does not match it, since signing it would vouch for content the
// digest does not describe. The signature is outside the canonical
// serialization, so signing does not change the digest.
func Sign(d *checker.Document, priv ed25519.PrivateKey) error {
	if len(priv) != ed25519.PrivateKeySize {
		return fmt.Errorf("sign: the private key has %d bytes, want %d", len(priv), ed25519.PrivateKeySize)
	}
	digest, err := d.ComputeDigest()
	if err != nil {
		return fmt.Errorf("sign: %w", err)
	}
	if digest != d.Digest {
		return fmt.Errorf("sign: the stored digest %q does not match the content (%s)", d.Digest, digest)
	}
	pub := priv.Public().(ed25519.PublicKey)
	d.Signature = &checker.Signature{
		Algorithm: checker.SignatureAlgorithm,
		PublicKey: base64.StdEncoding.EncodeToString(pub),
		Value:     base64.StdEncoding.EncodeToString(ed25519.Sign(priv, []byte(digest))),
	}
	return nil
}

// GenerateKey returns a new ed25519 key pair from the system's
// cryptographically secure random source.
func GenerateKey() (ed25519.PublicKey, ed25519.PrivateKey, error) {
	return ed25519.GenerateKey(rand.Reader)
}

// MarshalPrivateKey returns the key file text of a private key: the header
// line and the base64 of its 32-byte seed.
func MarshalPrivateKey(priv ed25519.PrivateKey) []byte {
	return []byte(privateKeyHeader + "\n" + base64.StdEncoding.EncodeToString(priv.Seed()) + "\n")
}

// MarshalPublicKey returns the key file text of a public key: the header
// line, the base64 of the 32-byte key, and its fingerprint as a comment.
func MarshalPublicKey(pub ed25519.PublicKey) []byte {
	return []byte(publicKeyHeader + "\n" + base64.StdEncoding.EncodeToString(pub) + "\n# fingerprint " + checker.Fingerprint(pub) + "\n")
}

// keyBody returns the base64 line of a key file after checking its header.
// Blank lines and lines starting with "#" after the header are ignored.
func keyBody(data []byte, header, other string) ([]byte, error) {
	lines := strings.Split(strings.ReplaceAll(string(data), "\r\n", "\n"), "\n")
	first := strings.TrimSpace(lines[0])
	switch first {
	case header:
	case other:
		return nil, fmt.Errorf("this is a %s, not a %s", other[len("lyacert ed25519 "):], header[len("lyacert ed25519 "):])
	default:
		return nil, fmt.Errorf("not a lyacert key file: the first line must be %q", header)
	}
	var body []string
	for _, l := range lines[1:] {
		l = strings.TrimSpace(l)
		if l != "" && !strings.HasPrefix(l, "#") {
			body = append(body, l)
		}
	}
	if len(body) != 1 {
		return nil, fmt.Errorf("a key file has one line of base64 after the header, found %d", len(body))
	}
	b, err := base64.StdEncoding.Strict().DecodeString(body[0])
	if err != nil {
		return nil, fmt.Errorf("the key is not valid base64: %w", err)
	}
	return b, nil
}

// ParsePrivateKey reads the text written by MarshalPrivateKey.
func ParsePrivateKey(data []byte) (ed25519.PrivateKey, error) {
	seed, err := keyBody(data, privateKeyHeader, publicKeyHeader)
	if err != nil {
		return nil, err
	}
	if len(seed) != ed25519.SeedSize {
		return nil, fmt.Errorf("the private key has %d bytes, want %d", len(seed), ed25519.SeedSize)
	}
	return ed25519.NewKeyFromSeed(seed), nil
}

// ParsePublicKey reads the text written by MarshalPublicKey.
func ParsePublicKey(data []byte) (ed25519.PublicKey, error) {
	b, err := keyBody(data, publicKeyHeader, privateKeyHeader)
	if err != nil {
		return nil, err
	}
	if len(b) != ed25519.PublicKeySize {
		return nil, fmt.Errorf("the public key has %d bytes, want %d", len(b), ed25519.PublicKeySize)
	}
	return ed25519.PublicKey(b), nil
}

// MaxKeyFileBytes bounds what is read of a key file: a key file is two
// short lines and a comment, so anything longer (a device such as /dev/zero
// given by mistake, a certificate) is refused after reading this much.
const MaxKeyFileBytes = 64 << 10

// readKeyFile reads at most MaxKeyFileBytes of a key file.
func readKeyFile(path string) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, MaxKeyFileBytes+1))
	if err != nil {
		return nil, err
	}
	if len(b) > MaxKeyFileBytes {
		return nil, fmt.Errorf("%s: not a lyacert key file: larger than %d bytes", path, MaxKeyFileBytes)
	}
	return b, nil
}

// ReadPrivateKeyFile reads a private key file.
func ReadPrivateKeyFile(path string) (ed25519.PrivateKey, error) {
	b, err := readKeyFile(path)
	if err != nil {
		return nil, err
	}
	k, err := ParsePrivateKey(b)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return k, nil
}

// ReadPublicKeyFile reads a public key file.
func ReadPublicKeyFile(path string) (ed25519.PublicKey, error) {
	b, err := readKeyFile(path)
	if err != nil {
		return nil, err
	}
	k, err := ParsePublicKey(b)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return k, nil
}

// WriteKeyPair writes the private key to path (mode 0600) and the public key
// to path + ".pub" (mode 0644). It never overwrites: when either file exists
// it writes nothing and returns an error wrapping os.ErrExist. Each file is
// written to a temporary file and hard-linked into place, which fails rather
// than replaces when the name was taken in the meantime, so a reader never
// sees a half-written key.
func WriteKeyPair(path string, pub ed25519.PublicKey, priv ed25519.PrivateKey) error {
	pubPath := path + ".pub"
	for _, p := range []string{path, pubPath} {
		if _, err := os.Lstat(p); err == nil {
			return fmt.Errorf("%s: %w; refusing to overwrite a key", p, os.ErrExist)
		}
	}
	if err := createExclusive(path, MarshalPrivateKey(priv), 0o600); err != nil {
		return err
	}
	if err := createExclusive(pubPath, MarshalPublicKey(pub), 0o644); err != nil {
		os.Remove(path) // ours: created just above
		return err
	}
	return nil
}

// createExclusive writes data to a new file at path: through a temporary
// file that is linked to path only when complete; the link fails if path
// exists.
func createExclusive(path string, data []byte, perm os.FileMode) error {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
	}
	tmp := f.Name()
	defer os.Remove(tmp)
	// CreateTemp makes the file 0600, so a private key is never readable by
	// others, not even while it is being written.
	_, werr := f.Write(data)
	if werr == nil {
		werr = f.Sync()
	}
	if cerr := f.Close(); werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(tmp, perm)
	}
	if werr != nil {
		return werr
	}
	if err := os.Link(tmp, path); err != nil {
		if errors.Is(err, os.ErrExist) {
			return fmt.Errorf("%s: %w; refusing to overwrite a key", path, os.ErrExist)
		}
		return err
	}
	return nil
}
