package certificates

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// noTemps fails when a temporary file of WriteFileAtomic is left in dir.
func noTemps(t *testing.T, dir string) {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range ents {
		if strings.Contains(e.Name(), ".tmp") {
			t.Errorf("temporary file %s left in %s", e.Name(), dir)
		}
	}
}

// A rewritten file keeps its mode, a new one gets the given mode whatever
// the umask (common practice for editors that save atomically).
func TestWriteFileAtomicMode(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct {
		name      string
		existing  os.FileMode // 0: no file yet
		perm, out os.FileMode
	}{
		{"new.json", 0, 0o644, 0o644},
		{"new.key", 0, 0o600, 0o600},
		{"private.json", 0o600, 0o644, 0o600},
		{"group.json", 0o640, 0o644, 0o640},
		{"open.key", 0o644, 0o600, 0o644},
	} {
		path := filepath.Join(dir, c.name)
		if c.existing != 0 {
			if err := os.WriteFile(path, []byte("old"), c.existing); err != nil {
				t.Fatal(err)
			}
			if err := os.Chmod(path, c.existing); err != nil {
				t.Fatal(err)
			}
		}
		if err := WriteFileAtomic(path, []byte("new"), c.perm); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		st, err := os.Stat(path)
		if err != nil {
			t.Fatal(err)
		}
		if st.Mode().Perm() != c.out {
			t.Errorf("%s: mode %04o, want %04o", c.name, st.Mode().Perm(), c.out)
		}
		if b, _ := os.ReadFile(path); string(b) != "new" {
			t.Errorf("%s: content %q", c.name, b)
		}
	}
	noTemps(t, dir)
}

// Writing through a symbolic link replaces the file it points to and keeps
// the link (relative, absolute, chained and dangling links); a path that is
// not a regular file is refused and left alone.
func TestWriteFileAtomicSymlink(t *testing.T) {
	dir := t.TempDir()
	sub := filepath.Join(dir, "store")
	if err := os.Mkdir(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	target := filepath.Join(sub, "cert.json")
	if err := os.WriteFile(target, []byte("old"), 0o600); err != nil {
		t.Fatal(err)
	}
	rel := filepath.Join(dir, "rel.json")
	abs := filepath.Join(dir, "abs.json")
	chain := filepath.Join(dir, "chain.json")
	dangling := filepath.Join(dir, "dangling.json")
	for _, l := range [][2]string{{"store/cert.json", rel}, {target, abs}, {"rel.json", chain}, {"store/later.json", dangling}} {
		if err := os.Symlink(l[0], l[1]); err != nil {
			t.Skip("no symbolic links here:", err)
		}
	}
	for _, c := range []struct{ link, file string }{{rel, target}, {abs, target}, {chain, target}, {dangling, filepath.Join(sub, "later.json")}} {
		if err := WriteFileAtomic(c.link, []byte("via "+filepath.Base(c.link)), 0o644); err != nil {
			t.Fatalf("%s: %v", c.link, err)
		}
		st, err := os.Lstat(c.link)
		if err != nil || st.Mode()&os.ModeSymlink == 0 {
			t.Errorf("%s is no longer a symbolic link", c.link)
		}
		if b, _ := os.ReadFile(c.file); string(b) != "via "+filepath.Base(c.link) {
			t.Errorf("%s: %s holds %q", c.link, c.file, b)
		}
	}
	if st, _ := os.Stat(target); st.Mode().Perm() != 0o600 {
		t.Errorf("the target's mode became %04o, want 0600 kept", st.Mode().Perm())
	}
	if err := WriteFileAtomic(sub, []byte("x"), 0o644); err == nil {
		t.Error("a directory was replaced")
	}
	loop := filepath.Join(dir, "loop.json")
	os.Symlink("loop.json", loop)
	if err := WriteFileAtomic(loop, []byte("x"), 0o644); err == nil {
		t.Error("a loop of links was written")
	}
	noTemps(t, dir)
	noTemps(t, sub)
}

// A private key file that group or others may read is refused unless the
// caller accepts it; the public key file may be read by anyone (common
// practice, as ssh does for identity files).
func TestSharedPrivateKeyRefused(t *testing.T) {
	pub, priv, err := GenerateKey()
	if err != nil {
		t.Fatal(err)
	}
	privPath, pubPath, err := WriteKeyPair(filepath.Join(t.TempDir(), "team"), pub, priv)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		mode   os.FileMode
		shared bool
	}{{0o600, false}, {0o400, false}, {0o640, true}, {0o604, true}, {0o644, true}} {
		if err := os.Chmod(privPath, c.mode); err != nil {
			t.Fatal(err)
		}
		k, err := ReadPrivateKeyFile(privPath)
		if c.shared != errors.Is(err, ErrSharedKey) || (!c.shared && !k.Equal(priv)) {
			t.Errorf("mode %04o: %v", c.mode, err)
		}
		if c.shared && (err == nil || !strings.Contains(err.Error(), "--insecure-key")) {
			t.Errorf("mode %04o: the message does not name --insecure-key: %v", c.mode, err)
		}
		if k, err := ReadSharedPrivateKeyFile(privPath); err != nil || !k.Equal(priv) {
			t.Errorf("mode %04o, accepted: %v", c.mode, err)
		}
	}
	if k, err := ReadPublicKeyFile(pubPath); err != nil || !k.Equal(pub) {
		t.Errorf("public key: %v", err)
	}
}
