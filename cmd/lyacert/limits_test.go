package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

// runCmd runs the command line in this process and returns its exit code
// and outputs; the limits of a run are reset afterwards.
func runCmd(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	t.Cleanup(func() { poly.SetDefaultLimits(poly.Limits{}) })
	var out, errb bytes.Buffer
	code := run(args, &env{stdin: strings.NewReader(""), stdout: &out, stderr: &errb})
	return code, out.String(), errb.String()
}

func writeModel(t *testing.T, name, src string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// Exit codes and messages of the limits, the deadline and the cases that
// once ended in an internal error or a misleading message. The verdicts are
// facts of the trade (common practice): V = x² + x⁸⁰ is a Lyapunov function
// of x' = −x (V̇ = −2x² − 80x⁸⁰); V = a·x has a linear part, so the
// equilibrium is not a minimum; x' = x + y, y' = x + y has a line of
// equilibria through the origin.
func TestLimitsCommandLine(t *testing.T) {
	dir := t.TempDir()
	pow := writeModel(t, "pow.lya", "state x\nx' = -x\nV = x^2 + (x^2)^40\n")
	cert := filepath.Join(dir, "pow.json")
	lin := writeModel(t, "lin.lya", "state x\nparameter a in [-3, 3)\nx' = 0\nV = a*x\n")
	sing := writeModel(t, "sing.lya", "state x, y\nx' = x + y\ny' = x + y\nV = x^2 + y^2\n")
	var bad strings.Builder
	bad.WriteString("state x\n")
	for range 30 {
		bad.WriteString("x' = = 1\n")
	}
	bad.WriteString("V = x^2\n")
	badf := writeModel(t, "bad.lya", bad.String())
	lorenz := "../../testdata/models/lorenz.lya"

	for _, c := range []struct {
		name   string
		args   []string
		code   int
		stdout string // a substring, or ""
		stderr string
	}{
		{"canonical power", []string{"check", pow, "-o", cert}, exitHolds, "Verdict: holds", ""},
		{"its certificate", []string{"verify", cert}, exitHolds, "valid", ""},
		{"degree limit", []string{"check", pow, "--limit", "degree=40"}, exitInput, "", "above the limit degree=40 (raise it with --limit degree=N)"},
		{"degree limit in the kernel", []string{"verify", cert, "--limit", "degree=40"}, exitInput, "degree=40", "a limit was reached"},
		{"limits of report", []string{"report", cert, "--limit", "degree=40"}, exitInput, "", "(raise it with --limit degree=N)"},
		{"limits of report, raised", []string{"report", cert, "--limit", "degree=80"}, exitHolds, "", ""},
		{"unknown limit", []string{"check", pow, "--limit", "nosuch=1"}, exitInput, "", `unknown limit "nosuch"`},
		{"limit not a number", []string{"check", pow, "--limit", "degree=x"}, exitInput, "", "not a positive integer"},
		{"inconsistent limits", []string{"check", pow, "--limit", "exponent=10"}, exitInput, "", "raise exponent with it"},
		{"endless model file", []string{"check", "/dev/zero"}, exitInput, "", "above the limit input-bytes=4194304 (raise it with --limit input-bytes=N)"},
		{"raised input bytes", []string{"check", "/dev/zero", "--limit", "input-bytes=100", "--limit", "line-length=100"}, exitInput, "", "input-bytes=100"},
		{"endless certificate", []string{"verify", "/dev/zero"}, exitInput, "", "larger than"},
		{"errors listed", []string{"check", badf, "--limit", "errors=3"}, exitInput, "", "\nand 27 more errors\n"},
		{"timeout", []string{"find", lorenz, "--set", "sigma=10", "--set", "b=8/3", "--set", "r=28", "--timeout", "1ns"}, exitStopped, "", "stopped early: the time limit --timeout 1ns was reached"},
		{"timeout of check", []string{"check", lorenz, "--timeout", "1ns"}, exitStopped, "", "stopped early"},
		{"timeout of sweep", []string{"sweep", "../../testdata/models/lorenz-classic.lya", "--grid", "r=1/2..30", "--points", "200000", "--jobs", "1", "-o", filepath.Join(dir, "s.jsonl"), "--timeout", "300ms"}, exitStopped, "stopped at the timeout", ""},
		{"limit in sweep", []string{"sweep", pow, "--grid", "x=0..1", "--points", "2", "--limit", "degree=40"}, exitInput, "", "degree=40"},
		{"linear part vanishing at a sample", []string{"check", lin}, exitFails, "Refutation (exact)", ""},
		{"non-isolated origin", []string{"find", sing}, exitFails, "", "the equilibrium is not isolated"},
		{"beyond float range", []string{"find", lorenz, "--set", "sigma=10", "--set", "b=8/3", "--set", "r=1e400"}, exitFails, "beyond floating-point range", ""},
	} {
		code, out, errs := runCmd(t, c.args...)
		if code != c.code || !strings.Contains(out, c.stdout) || !strings.Contains(errs, c.stderr) {
			t.Errorf("%s: lyacert %s: exit %d, want %d\nstdout:\n%s\nstderr:\n%s", c.name, strings.Join(c.args, " "), code, c.code, out, errs)
		}
	}
	// The errors list: three errors with their positions, then the count
	// without a position.
	_, _, errs := runCmd(t, "check", badf, "--limit", "errors=3")
	lines := strings.Split(strings.TrimSpace(errs), "\n")
	if len(lines) != 4 || !strings.HasPrefix(lines[0], badf+":2:") || lines[3] != "and 27 more errors" {
		t.Errorf("errors list:\n%s", errs)
	}
}

// sign and check --sign refuse a private key file that others may read,
// and accept it with --insecure-key; a certificate rewritten in place keeps
// its mode.
func TestInsecureKey(t *testing.T) {
	dir := t.TempDir()
	name := filepath.Join(dir, "team")
	if code, _, errs := runCmd(t, "key", "new", "-o", name); code != exitHolds {
		t.Fatalf("key new: %d %s", code, errs)
	}
	if err := os.Chmod(name+".key", 0o644); err != nil {
		t.Fatal(err)
	}
	cert := filepath.Join(dir, "c.json")
	ogata := "../../testdata/models/ogata.lya"
	if code, _, errs := runCmd(t, "check", ogata, "-o", cert, "--sign", name+".key"); code != exitInput || !strings.Contains(errs, "readable by group or others") || !strings.Contains(errs, "--insecure-key") {
		t.Errorf("check --sign with a shared key: exit %d\n%s", code, errs)
	}
	if code, _, errs := runCmd(t, "check", ogata, "-o", cert); code != exitHolds {
		t.Fatalf("check: %d %s", code, errs)
	}
	if err := os.Chmod(cert, 0o600); err != nil {
		t.Fatal(err)
	}
	if code, _, errs := runCmd(t, "sign", cert, "--key", name+".key"); code != exitInput || !strings.Contains(errs, "--insecure-key") {
		t.Errorf("sign with a shared key: exit %d\n%s", code, errs)
	}
	if code, _, errs := runCmd(t, "sign", cert, "--key", name+".key", "--insecure-key"); code != exitHolds {
		t.Errorf("sign --insecure-key: exit %d\n%s", code, errs)
	}
	if st, err := os.Stat(cert); err != nil || st.Mode().Perm() != 0o600 {
		t.Errorf("the signed certificate's mode: %v %v, want 0600 kept", st.Mode(), err)
	}
	if code, out, errs := runCmd(t, "verify", cert, "--trust", name+".pub.pem"); code != exitHolds || !strings.Contains(out, "signed by the trusted key") {
		t.Errorf("verify: exit %d\n%s%s", code, out, errs)
	}
}
