package main

import (
	"crypto/ed25519"
	"errors"
	"fmt"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/report"
)

// keyCmd groups the key commands.
type keyCmd struct {
	New keyNewCmd `cmd:"" help:"Write a new ed25519 key pair as PEM: NAME.key (private, PKCS #8, mode 0600) and NAME.pub.pem (public, SubjectPublicKeyInfo). Never overwrites."`
}

type keyNewCmd struct {
	common
	Out string `short:"o" name:"out" required:"" placeholder:"NAME" help:"Name of the key pair: the private key goes to NAME.key, the public key to NAME.pub.pem."`
}

type signCmd struct {
	common
	Cert string `arg:"" placeholder:"CERT" help:"Certificate file (JSON)."`
	Key  string `name:"key" required:"" placeholder:"KEY" help:"Private key file: PEM, PKCS #8, ed25519 (NAME.key from lyacert key new)."`
	Out  string `short:"o" name:"out" placeholder:"OUT" help:"Write the signed certificate here; by default CERT is rewritten in place (atomically)."`
	keyFlags
	limitFlags
}

// keyFlags are the flags of the commands that read a private key.
type keyFlags struct {
	InsecureKey bool `name:"insecure-key" help:"Accept a private key file that group or others may read (refused otherwise)."`
}

// read reads a private key file, refusing one that others may read
// unless --insecure-key.
func (kf keyFlags) read(path string) (ed25519.PrivateKey, error) {
	if kf.InsecureKey {
		return certificates.ReadSharedPrivateKeyFile(path)
	}
	return certificates.ReadPrivateKeyFile(path)
}

func init() {
	register("key", "Manage the ed25519 keys that sign checker.", func() any { return &keyCmd{} })
	register("sign", "Sign a certificate's digest with an ed25519 private key.", func() any { return &signCmd{} })
}

// Run writes a new key pair.
func (c *keyNewCmd) Run(e *env) error { return exit(c.run(e)) }

// Run signs a certificate.
func (c *signCmd) Run(e *env) error { return exit(c.run(e)) }

func (c *keyNewCmd) run(e *env) int {
	pub, priv, err := certificates.GenerateKey()
	if err != nil {
		return e.failf(exitInput, "generating a key: %w", err)
	}
	privPath, pubPath, err := certificates.WriteKeyPair(c.Out, pub, priv)
	if err != nil {
		return e.fail(exitInput, err)
	}
	k := report.KeyOutput{PrivateKey: privPath, PublicKey: pubPath, Fingerprint: certificates.Fingerprint(pub)}
	if c.JSON {
		writeJSON(e.stdout, k)
	} else {
		report.KeyText(e.stdout, k)
	}
	return exitHolds
}

func (c *signCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	key, err := c.keyFlags.read(c.Key)
	if err != nil {
		return e.fail(exitInput, err)
	}
	name, src, err := readCertificate(c.Cert, e.stdin)
	if err != nil {
		return e.fail(exitInput, err)
	}
	doc, err := claims.Read(strings.NewReader(string(src)))
	if err != nil {
		return e.failf(exitInput, "%s: %w", name, err)
	}
	// A signature vouches for the content: only a certificate that the
	// checker accepts is signed.
	old := doc.Signature
	doc.Signature = nil
	if res := checker.Verify(doc); !res.Valid {
		if !e.json {
			report.VerifyText(e.stderr, name, doc, res, report.Trust{})
		}
		return e.failf(exitRejected, "%s: not signed: the checker rejects the certificate", name)
	}
	if err := certificates.Sign(doc, key); err != nil {
		return e.failf(exitInput, "%s: %w", name, err)
	}
	so := report.SignOutput{Certificate: c.Cert, Digest: doc.Digest, Fingerprint: certificates.Fingerprint(key.Public().(ed25519.PublicKey))}
	if old != nil {
		replaced := "a malformed signature"
		if pub, err := (&claims.Document{Signature: old}).Signer(); err == nil {
			replaced = certificates.Fingerprint(pub)
			fmt.Fprintf(e.stderr, "lyacert: %s: replacing the signature by key %s\n", name, replaced)
		} else {
			fmt.Fprintf(e.stderr, "lyacert: %s: replacing a malformed signature\n", name)
		}
		so.Replaced = &replaced
	}
	out := c.Out
	if out == "" {
		out = c.Cert
	}
	if out == "-" {
		b, err := certificates.Marshal(doc)
		if err != nil {
			return e.fail(exitInput, err)
		}
		if c.JSON {
			return e.failf(exitInput, "-o - writes the certificate to standard output: it cannot be combined with --json")
		}
		e.stdout.Write(b)
		return exitHolds
	}
	if err := certificates.WriteFile(doc, out); err != nil {
		return e.failf(exitInput, "writing the certificate: %w", err)
	}
	so.Output = out
	if c.JSON {
		writeJSON(e.stdout, so)
	} else {
		report.SignText(e.stdout, so)
	}
	return exitHolds
}

// loadSigningKey reads the key of check --sign; signing needs a certificate
// file to sign.
func loadSigningKey(path, out string, kf keyFlags, e *env) (ed25519.PrivateKey, int) {
	if path == "" {
		return nil, 0
	}
	if out == "" {
		fmt.Fprintln(e.stderr, "lyacert: --sign needs -o CERT: it signs the certificate file that check writes")
		return nil, exitInput
	}
	key, err := kf.read(path)
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return nil, exitInput
	}
	return key, 0
}

// signWritten signs the certificate that check has just written to out (it
// was re-checked by Verify before it was written) and rewrites it
// atomically. code is check's exit code, returned unless signing fails.
func signWritten(out string, key ed25519.PrivateKey, code int, asJSON bool, e *env) int {
	if key == nil || code == exitInput {
		return code
	}
	doc, err := certificates.ReadFile(out)
	if err == nil {
		err = certificates.Sign(doc, key)
	}
	if err == nil {
		err = certificates.WriteFile(doc, out)
	}
	if err != nil {
		return e.failf(exitInput, "signing the certificate: %w", err)
	}
	w := e.stdout
	if asJSON {
		w = e.stderr // keep standard output one JSON document
	}
	fmt.Fprintf(w, "Signed %s with key %s.\n", out, certificates.Fingerprint(key.Public().(ed25519.PublicKey)))
	return code
}

// readTrusted reads the public keys of verify --trust.
func readTrusted(paths []string) ([]ed25519.PublicKey, error) {
	var keys []ed25519.PublicKey
	for _, p := range paths {
		k, err := certificates.ReadPublicKeyFile(p)
		if err != nil {
			return nil, err
		}
		keys = append(keys, k)
	}
	return keys, nil
}

// trustOf checks the signature against the keys of verify --trust; the
// mathematics is checker.Verify's. Without trusted keys only the signer is
// named (Verify has already checked a present signature).
func trustOf(doc *claims.Document, trusted []ed25519.PublicKey) report.Trust {
	t := report.Trust{Required: len(trusted) > 0}
	if pub, err := doc.Signer(); err == nil {
		t.Signer = certificates.Fingerprint(pub)
	}
	if !t.Required {
		return t
	}
	pub, err := certificates.VerifyTrusted(doc, trusted)
	switch {
	case err == nil:
		t.Trusted, t.Signer = true, certificates.Fingerprint(pub)
	case errors.Is(err, claims.ErrUnsigned):
		t.Reason = "the certificate is not signed, and --trust requires a signature by a trusted key"
	case errors.Is(err, certificates.ErrUntrusted):
		t.Reason = "it is signed by key " + t.Signer + ", which is none of the keys given with --trust"
	default:
		t.Reason = err.Error()
	}
	return t
}
