package certificates

import (
	"crypto/ed25519"
	"encoding/base64"
	"encoding/hex"
	"errors"
	"lyacert/checker"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func testKey(t *testing.T, seedByte byte) ed25519.PrivateKey {
	t.Helper()
	seed := make([]byte, ed25519.SeedSize)
	for i := range seed {
		seed[i] = seedByte + byte(i)
	}
	return ed25519.NewKeyFromSeed(seed)
}

func signedCoolant(t *testing.T, priv ed25519.PrivateKey) *checker.Document {
	t.Helper()
	d, err := ReadFile("../testdata/certificates/coolant.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := Sign(d, priv); err != nil {
		t.Fatal(err)
	}
	return d
}

func TestSignatures(t *testing.T) {
	alice, bob := testKey(t, 1), testKey(t, 101)
	alicePub := alice.Public().(ed25519.PublicKey)
	bobPub := bob.Public().(ed25519.PublicKey)
	tests := []struct {
		name    string
		alter   func(d *checker.Document)
		trusted []ed25519.PublicKey
		want    error // nil: valid and trusted
	}{
		// common practice, no source: the four cases a reader meets.
		{"good", func(*checker.Document) {}, []ed25519.PublicKey{alicePub}, nil},
		{"good among several trusted", func(*checker.Document) {}, []ed25519.PublicKey{bobPub, alicePub}, nil},
		{"altered after signing, digest re-sealed", func(d *checker.Document) {
			d.Issued = "2030-01-01T00:00:00Z"
			if err := Seal(d); err != nil {
				t.Fatal(err)
			}
		}, []ed25519.PublicKey{alicePub}, checker.ErrBadSignature},
		{"altered after signing, digest stale", func(d *checker.Document) { d.Source = "other.lya" }, []ed25519.PublicKey{alicePub}, checker.ErrBadSignature},
		{"wrong key", func(*checker.Document) {}, []ed25519.PublicKey{bobPub}, ErrUntrusted},
		{"no trusted key", func(*checker.Document) {}, nil, ErrUntrusted},
		{"absent", func(d *checker.Document) { d.Signature = nil }, []ed25519.PublicKey{alicePub}, checker.ErrUnsigned},
		{"public key swapped", func(d *checker.Document) {
			d.Signature.PublicKey = base64.StdEncoding.EncodeToString(bobPub)
		}, []ed25519.PublicKey{bobPub}, checker.ErrBadSignature},
		{"re-signed by another key", func(d *checker.Document) {
			if err := Sign(d, bob); err != nil {
				t.Fatal(err)
			}
		}, []ed25519.PublicKey{alicePub}, ErrUntrusted},
		{"value not base64", func(d *checker.Document) { d.Signature.Value = "!!" }, []ed25519.PublicKey{alicePub}, checker.ErrBadSignature},
		{"value truncated", func(d *checker.Document) { d.Signature.Value = d.Signature.Value[:20] }, []ed25519.PublicKey{alicePub}, checker.ErrBadSignature},
		{"other algorithm", func(d *checker.Document) { d.Signature.Algorithm = "rsa" }, []ed25519.PublicKey{alicePub}, checker.ErrBadSignature},
		{"one bit of the signature flipped", func(d *checker.Document) {
			b, _ := base64.StdEncoding.DecodeString(d.Signature.Value)
			b[5] ^= 1
			d.Signature.Value = base64.StdEncoding.EncodeToString(b)
		}, []ed25519.PublicKey{alicePub}, checker.ErrBadSignature},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := signedCoolant(t, alice)
			tt.alter(d)
			pub, err := VerifyTrusted(d, tt.trusted)
			switch {
			case tt.want == nil && err != nil:
				t.Fatalf("VerifyTrusted: %v", err)
			case tt.want == nil && !pub.Equal(alicePub):
				t.Fatalf("signer %x, want alice", pub)
			case tt.want != nil && !errors.Is(err, tt.want):
				t.Fatalf("VerifyTrusted error %v, want %v", err, tt.want)
			}
			// The checker records a present signature among its checks and
			// fails on a bad one; it does not require one.
			res := checker.Verify(d)
			sig := findCheck(res, "signature")
			switch {
			case d.Signature == nil && sig != nil:
				t.Errorf("unsigned document has a signature check %+v", *sig)
			case d.Signature != nil && sig == nil:
				t.Errorf("signed document has no signature check")
			case sig != nil && sig.OK != !errors.Is(err, checker.ErrBadSignature):
				t.Errorf("signature check %+v, VerifyTrusted said %v", *sig, err)
			}
			if errors.Is(err, checker.ErrBadSignature) && res.Valid {
				t.Errorf("checker.Verify accepts a document with a bad signature")
			}
		})
	}
}

func findCheck(r checker.Outcome, name string) *checker.Record {
	for i := range r.Records {
		if r.Records[i].Name == name {
			return &r.Records[i]
		}
	}
	return nil
}

func TestErrorMessagesAreDistinct(t *testing.T) {
	d := signedCoolant(t, testKey(t, 1))
	_, err := VerifyTrusted(d, []ed25519.PublicKey{testKey(t, 2).Public().(ed25519.PublicKey)})
	want := "signed by a key that is not trusted: " + checker.Fingerprint(testKey(t, 1).Public().(ed25519.PublicKey))
	if err == nil || err.Error() != want {
		t.Errorf("untrusted: %v, want %q", err, want)
	}
	msgs := map[string]bool{checker.ErrUnsigned.Error(): true, checker.ErrBadSignature.Error(): true, ErrUntrusted.Error(): true}
	if len(msgs) != 3 {
		t.Errorf("the three signature errors share a message")
	}
}

func TestSignMessageIsTheDigest(t *testing.T) {
	priv := testKey(t, 7)
	d := signedCoolant(t, priv)
	sig, err := base64.StdEncoding.DecodeString(d.Signature.Value)
	if err != nil {
		t.Fatal(err)
	}
	// The signed message is the digest string itself, so that anyone with
	// an ed25519 implementation can check it without our code.
	if !ed25519.Verify(priv.Public().(ed25519.PublicKey), []byte(d.Digest), sig) {
		t.Error("the signature is not over the digest string")
	}
	if got, _ := d.ComputeDigest(); got != d.Digest {
		t.Error("signing changed the digest")
	}
}

func TestSignRefusesStaleDigest(t *testing.T) {
	d, err := ReadFile("../testdata/certificates/coolant.json")
	if err != nil {
		t.Fatal(err)
	}
	d.Source = "changed.lya"
	if err := Sign(d, testKey(t, 1)); err == nil || !strings.Contains(err.Error(), "does not match the content") {
		t.Errorf("Sign of a document with a stale digest: %v", err)
	}
}

func TestKeyFiles(t *testing.T) {
	// RFC 8032 §7.1, TEST 1: the public key derived from this secret seed.
	seed, _ := hex.DecodeString("9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60")
	wantPub := "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a"
	priv := ed25519.NewKeyFromSeed(seed)
	pub := priv.Public().(ed25519.PublicKey)

	dir := t.TempDir()
	path := filepath.Join(dir, "team")
	if err := WriteKeyPair(path, pub, priv); err != nil {
		t.Fatal(err)
	}
	gotPriv, err := ReadPrivateKeyFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if hex.EncodeToString(gotPriv.Public().(ed25519.PublicKey)) != wantPub {
		t.Errorf("public key from the read seed is %x, want %s", gotPriv.Public(), wantPub)
	}
	gotPub, err := ReadPublicKeyFile(path + ".pub")
	if err != nil || hex.EncodeToString(gotPub) != wantPub {
		t.Errorf("public key file: %x, %v", gotPub, err)
	}
	for p, mode := range map[string]os.FileMode{path: 0o600, path + ".pub": 0o644} {
		fi, err := os.Stat(p)
		if err != nil {
			t.Fatal(err)
		}
		if fi.Mode().Perm() != mode {
			t.Errorf("%s: mode %v, want %v", p, fi.Mode().Perm(), mode)
		}
	}
	// Refuse to overwrite either file, and leave the other untouched.
	before, _ := os.ReadFile(path)
	_, other, err := GenerateKey()
	if err != nil {
		t.Fatal(err)
	}
	if err := WriteKeyPair(path, other.Public().(ed25519.PublicKey), other); !errors.Is(err, os.ErrExist) {
		t.Errorf("second WriteKeyPair: %v, want os.ErrExist", err)
	}
	after, _ := os.ReadFile(path)
	if string(before) != string(after) {
		t.Error("WriteKeyPair changed an existing private key")
	}
	os.Remove(path)
	if err := WriteKeyPair(path, pub, priv); !errors.Is(err, os.ErrExist) {
		t.Errorf("WriteKeyPair with the .pub present: %v, want os.ErrExist", err)
	}
	if _, err := os.Stat(path); err == nil {
		t.Error("WriteKeyPair wrote the private key although the public one existed")
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.Contains(e.Name(), ".tmp") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}

func TestParseKeyErrors(t *testing.T) {
	priv := testKey(t, 3)
	pub := priv.Public().(ed25519.PublicKey)
	tests := []struct {
		name    string
		private bool
		text    string
		want    string
	}{
		// common practice, no source: a key of the wrong kind is named as such.
		{"public given as private", true, string(MarshalPublicKey(pub)), "this is a public key, not a private key"},
		{"private given as public", false, string(MarshalPrivateKey(priv)), "this is a private key, not a public key"},
		{"no header", false, base64.StdEncoding.EncodeToString(pub) + "\n", "not a lyacert key file"},
		{"bad base64", false, "lyacert ed25519 public key\n@@@\n", "not valid base64"},
		{"short key", false, "lyacert ed25519 public key\nAAAA\n", "has 3 bytes, want 32"},
		{"two bodies", true, "lyacert ed25519 private key\nAAAA\nAAAA\n", "one line of base64"},
		{"round trip public", false, string(MarshalPublicKey(pub)), ""},
		{"round trip private with CRLF", true, strings.ReplaceAll(string(MarshalPrivateKey(priv)), "\n", "\r\n"), ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var err error
			if tt.private {
				var k ed25519.PrivateKey
				k, err = ParsePrivateKey([]byte(tt.text))
				if err == nil && !k.Equal(priv) {
					t.Error("private key changed in the round trip")
				}
			} else {
				var k ed25519.PublicKey
				k, err = ParsePublicKey([]byte(tt.text))
				if err == nil && !k.Equal(pub) {
					t.Error("public key changed in the round trip")
				}
			}
			switch {
			case tt.want == "" && err != nil:
				t.Errorf("unexpected error %v", err)
			case tt.want != "" && (err == nil || !strings.Contains(err.Error(), tt.want)):
				t.Errorf("error %v, want it to contain %q", err, tt.want)
			}
		})
	}
}

func TestFingerprint(t *testing.T) {
	// common practice, no source: 16 hex digits, stable for a key.
	pub := testKey(t, 9).Public().(ed25519.PublicKey)
	fp := checker.Fingerprint(pub)
	if len(fp) != 16 || strings.Trim(fp, "0123456789abcdef") != "" {
		t.Errorf("fingerprint %q is not 16 lowercase hex digits", fp)
	}
	if fp != checker.Fingerprint(append(ed25519.PublicKey(nil), pub...)) {
		t.Error("fingerprint not stable")
	}
}
