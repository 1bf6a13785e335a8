package certificates

import (
	"bytes"
	"crypto/ed25519"
	"os"
	"path/filepath"
	"testing"
)

// FuzzParseKey reads arbitrary bytes as a public and as a private key file:
// no panic, and whatever is read writes back to a file that reads as the
// same key (the key file format round-trips, common practice). Seeds: the
// key files of testdata/keys.
func FuzzParseKey(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("testdata", "keys", "*"))
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	// The PEM files this version writes, from a fixed seed (RFC 8032 test 1).
	priv := ed25519.NewKeyFromSeed(make([]byte, ed25519.SeedSize))
	if b, err := MarshalPrivateKey(priv); err == nil {
		f.Add(b)
	}
	if b, err := MarshalPublicKey(priv.Public().(ed25519.PublicKey)); err == nil {
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		if pub, err := ParsePublicKey(data); err == nil {
			if len(pub) != ed25519.PublicKeySize {
				t.Fatalf("a public key of %d bytes", len(pub))
			}
			b, err := MarshalPublicKey(pub)
			if err != nil {
				t.Fatal(err)
			}
			again, err := ParsePublicKey(b)
			if err != nil || !again.Equal(pub) {
				t.Fatalf("the public key does not round-trip: %v", err)
			}
		}
		if priv, err := ParsePrivateKey(data); err == nil {
			b, err := MarshalPrivateKey(priv)
			if err != nil {
				t.Fatal(err)
			}
			again, err := ParsePrivateKey(b)
			if err != nil || !again.Equal(priv) {
				t.Fatalf("the private key does not round-trip: %v", err)
			}
		}
	})
}

// A key file name that is a device or a huge file is refused after reading
// MaxKeyFileBytes (common practice: bounded reads of untrusted input); this
// read /dev/zero without end before the bound.
func TestKeyFileBounded(t *testing.T) {
	big := filepath.Join(t.TempDir(), "big.key.pub")
	if err := os.WriteFile(big, bytes.Repeat([]byte("#"), MaxKeyFileBytes+1), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, path := range []string{"/dev/zero", "/dev/urandom", big} {
		if _, err := os.Stat(path); err != nil {
			continue
		}
		if _, err := ReadPublicKeyFile(path); err == nil {
			t.Errorf("%s read as a public key", path)
		}
		if _, err := ReadPrivateKeyFile(path); err == nil {
			t.Errorf("%s read as a private key", path)
		}
	}
	k, err := ReadPublicKeyFile(filepath.Join("testdata", "keys", "seed.pub.pem"))
	if err != nil || len(k) != ed25519.PublicKeySize {
		t.Errorf("the test key file is not read: %v", err)
	}
}
