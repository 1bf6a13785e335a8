package main

import (
	"crypto/ed25519"
	"errors"
	"fmt"
	"io"
	"strings"

	"lyacert/certificates"
	"lyacert/checker"
)

// keyCmd groups the key commands.
type keyCmd struct {
	New keyNewCmd `cmd:"" help:"Write a new ed25519 key pair as PEM: NAME.key (private, PKCS #8, mode 0600) and NAME.pub.pem (public, SubjectPublicKeyInfo). Never overwrites."`
}

type keyNewCmd struct {
	Out string `short:"o" name:"out" required:"" placeholder:"NAME" help:"Name of the key pair: the private key goes to NAME.key, the public key to NAME.pub.pem."`
}

type signCmd struct {
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
		fmt.Fprintln(e.stderr, "lyacert: generating a key:", err)
		return exitInput
	}
	privPath, pubPath, err := certificates.WriteKeyPair(c.Out, pub, priv)
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return exitInput
	}
	fmt.Fprintf(e.stdout, "wrote the private key %s (keep it secret) and the public key %s\n  fingerprint %s\n", privPath, pubPath, certificates.Fingerprint(pub))
	return exitHolds
}

func (c *signCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	key, err := c.keyFlags.read(c.Key)
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return exitInput
	}
	name, src, err := readCertificate(c.Cert, e.stdin)
	if err != nil {
		fmt.Fprintln(e.stderr, "lyacert:", err)
		return exitInput
	}
	doc, err := checker.Read(strings.NewReader(string(src)))
	if err != nil {
		fmt.Fprintf(e.stderr, "lyacert: %s: %v\n", name, err)
		return exitInput
	}
	// A signature vouches for the content: only a certificate that the
	// checker accepts is signed.
	old := doc.Signature
	doc.Signature = nil
	if res := checker.Verify(doc); !res.Valid {
		renderVerify(e.stderr, name, doc, res)
		fmt.Fprintf(e.stderr, "lyacert: %s: not signed: the checker rejects the certificate\n", name)
		return exitFails
	}
	if err := certificates.Sign(doc, key); err != nil {
		fmt.Fprintf(e.stderr, "lyacert: %s: %v\n", name, err)
		return exitFails
	}
	if old != nil {
		if pub, err := (&checker.Document{Signature: old}).Signer(); err == nil {
			fmt.Fprintf(e.stderr, "lyacert: %s: replacing the signature by key %s\n", name, certificates.Fingerprint(pub))
		} else {
			fmt.Fprintf(e.stderr, "lyacert: %s: replacing a malformed signature\n", name)
		}
	}
	out := c.Out
	if out == "" {
		out = c.Cert
	}
	if out == "-" {
		b, err := certificates.Marshal(doc)
		if err != nil {
			fmt.Fprintln(e.stderr, "lyacert:", err)
			return exitInput
		}
		e.stdout.Write(b)
		return exitHolds
	}
	if err := certificates.WriteFile(doc, out); err != nil {
		fmt.Fprintln(e.stderr, "lyacert: writing the certificate:", err)
		return exitInput
	}
	fmt.Fprintf(e.stdout, "signed %s with key %s\n  digest %s\n", out, certificates.Fingerprint(key.Public().(ed25519.PublicKey)), doc.Digest)
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
		fmt.Fprintln(e.stderr, "lyacert: signing the certificate:", err)
		return exitInput
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

// applyTrust adds the trust check of verify --trust to the checker's
// result: a valid signature by one of the trusted keys is required. Without
// trusted keys the result is unchanged (Verify has already checked a
// present signature).
func applyTrust(doc *checker.Document, res checker.Outcome, trusted []ed25519.PublicKey) checker.Outcome {
	if len(trusted) == 0 {
		return res
	}
	pub, err := certificates.VerifyTrusted(doc, trusted)
	ch := checker.Record{Name: "trust", OK: err == nil}
	switch {
	case err == nil:
		ch.Reason = "signed by the trusted key " + certificates.Fingerprint(pub)
	case errors.Is(err, checker.ErrUnsigned):
		ch.Reason = "no signature, but --trust requires one by a trusted key"
	default:
		ch.Reason = err.Error()
	}
	res.Records = append(res.Records, ch)
	if !ch.OK {
		res.Valid = false
	}
	return res
}

// renderSigner says who signed a valid certificate, after verify's text.
func renderSigner(w io.Writer, doc *checker.Document, res checker.Outcome, trusted bool) {
	if !res.Valid {
		return
	}
	pub, err := doc.Signer()
	switch {
	case err != nil:
		fmt.Fprintln(w, "  not signed")
	case trusted:
		fmt.Fprintf(w, "  signed by the trusted key %s\n", certificates.Fingerprint(pub))
	default:
		fmt.Fprintf(w, "  signed by key %s (signature valid; use --trust KEY.pub.pem to require a trusted signer)\n", certificates.Fingerprint(pub))
	}
}
