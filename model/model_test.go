package model

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/examples"
)

// The sample model of the format's documentation (an invented scenario).
const sample = `# Reduced three-mode model of a stirred-tank cooling loop (invented scenario)
state u, v, w                  # state variables, in order
parameter g > 0                # also >=, <, <=
parameter h in [0, 4]          # closed, open or half-open
parameter m = 8/3              # fixed value
let q = u*v                    # named sub-expression, substituted
u' = g*(v - u)                 # exactly one equation per state
v' = h*u - v - q
w' = q - m*w
V = u^2/g + v^2 + w^2          # the candidate
at u = 0, v = 0, w = 0         # the equilibrium
`

func TestParseSample(t *testing.T) {
	m, err := Parse("sample.lya", []byte(sample))
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(m.States, ","); got != "u,v,w" {
		t.Errorf("states %s", got)
	}
	if len(m.FreeParams()) != 2 || m.Params[2].Fixed == nil || m.Params[2].Fixed.RatString() != "8/3" {
		t.Errorf("params %+v", m.Params)
	}
	if got := m.F[2].String(); got != "u*v - 8/3*w" {
		t.Errorf("w' = %s: the let and the fixed parameter must be substituted", got)
	}
	if got := m.Description[0]; !strings.Contains(got, "stirred-tank") {
		t.Errorf("description %q", got)
	}
	// Canonical text parses back to the same model.
	c := m.Canonical()
	m2, err := Parse("canonical", []byte(c))
	if err != nil {
		t.Fatalf("canonical text does not parse: %v\n%s", err, c)
	}
	if m2.Canonical() != c {
		t.Errorf("canonical text is not stable:\n%s\n%s", c, m2.Canonical())
	}
	if err := m.CheckEquilibrium(); err != nil {
		t.Error(err)
	}
}

func TestParseErrors(t *testing.T) {
	for _, c := range []struct{ name, src, want string }{
		{"unknown name", "state x\nx' = -x + y\n", "m.lya:2:11: unknown name \"y\""},
		{"no equation", "state x, y\nx' = -x\n", "m.lya:1:10: state y has no equation"},
		{"two equations", "state x\nx' = -x\nx' = x\n", "m.lya:3:1: a second equation for x"},
		{"division by state", "state x\nx' = 1/x\n", "m.lya:2:8: division by an expression in the states"},
		{"undeclared parameter", "state x\nx' = -k*x\n", "m.lya:2:7: unknown name \"k\""},
		{"empty range", "state x\nparameter k in [4, 0]\nx' = -k*x\n", "m.lya:2:16: empty range"},
		{"empty half-open range", "state x\nparameter k in (1, 1]\nx' = -k*x\n", "m.lya:2:16: empty range"},
		{"contradictory ranges", "state x\nparameter k > 2\nparameter k < 1\nx' = -k*x\n", "m.lya:3:11: contradictory range for k"},
		{"not an equilibrium", "state x\nx' = 1 - x\nat x = 0\n", "m.lya:3:1: not an equilibrium"},
		{"division not kept from zero", "state x\nparameter k\nx' = -x/k\n", "m.lya:3:1: x' divides by k, which the assumptions do not keep away from zero"},
		{"no states", "parameter k > 0\n", "m.lya:1:1: no states"},
		{"equation for a parameter", "state x\nparameter k\nx' = -x\nk' = 1\n", "m.lya:4:1: \"k\" is a parameter, not a state"},
		{"mixed time", "state x, y\nx' = -x\ny+ = y/2\n", "m.lya:3:1: mixes continuous-time"},
		{"keyword as state", "state V\nV' = -V\n", "m.lya:1:7: \"V\" is a keyword"},
		{"at with a state value", "state x, y\nx' = -x\ny' = -y\nat x = y, y = 0\n", "m.lya:4:8: the equilibrium may depend on parameters, not on states"},
		{"garbage line", "state x\nx' = -x\nhello world\n", "m.lya:3:1: expected a declaration"},
		{"range with a name", "state x\nparameter k in [0, j]\nx' = -x\n", "m.lya:2:20: a parameter's range takes constants only"},
		// The spellings of earlier versions name the new ones (common practice
		// when a keyword is renamed: the old word is answered, not ignored).
		{"old param", "state x\nparam k > 0\nx' = -k*x\n", "m.lya:2:1: `param` is now written `parameter`"},
		{"old param indented", "state x\n  param k, j\nx' = -k*x\n", "m.lya:2:3: `param` is now written `parameter`"},
		{"old next", "state x\nnext x = x/2\n", "m.lya:2:1: `next x = ...` is now written `x+ = ...` (the successor state x⁺)"},
		{"old next, long line", "state x\nnext x = x/2" + strings.Repeat(" + 0*x", 100) + "\n", "m.lya:2:1: `next x = ...` is now written `x+ = ...`"},
		{"mixed time, map first", "state x, y\nx+ = x/2\ny' = -y\n", "m.lya:3:1: mixes continuous-time (x' = ...) and discrete-time (x+ = ...)"},
		{"map missing an equation", "state x, y\nx+ = x/2\n", "m.lya:1:10: state y has no equation (write y+ = ...)"},
		{"map divides by a free parameter", "state x\nparameter k\nx+ = x/k\n", "m.lya:3:1: x+ divides by k"},
		{"keyword parameter as a state", "state parameter\nparameter' = 0\n", "m.lya:1:7: \"parameter\" is a keyword and cannot name a state"},
		{"old keyword as a parameter", "state x\nparameter next\nx' = -x\n", "m.lya:2:11: \"next\" is a keyword and cannot name a parameter"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("m.lya", []byte(c.src))
			if err == nil {
				t.Fatalf("no error, want %q", c.want)
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error\n  %v\nwant\n  %s", err, c.want)
			}
		})
	}
}

// Several mistakes are reported together, in order.
func TestErrorsCollected(t *testing.T) {
	_, err := Parse("m.lya", []byte("state x, y\nx' = -x + a\ny' = -y + b\n"))
	if err == nil {
		t.Fatal("no error")
	}
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != 2 || !strings.HasPrefix(lines[0], "m.lya:2:") || !strings.HasPrefix(lines[1], "m.lya:3:") {
		t.Errorf("errors %q", lines)
	}
}

// Every old spelling in a file is reported, together and in order, and
// nothing else: an old "param" line still declares its parameter.
func TestOldSpellingsCollected(t *testing.T) {
	src := "state x, y\nparam k > 0\nnext x = x/2 + k*y\nnext y = y/2\n"
	_, err := Parse("m.lya", []byte(src))
	if err == nil {
		t.Fatal("no error")
	}
	want := []string{
		"m.lya:2:1: `param` is now written `parameter`",
		"m.lya:3:1: `next x = ...` is now written `x+ = ...` (the successor state x⁺)",
		"m.lya:4:1: `next y = ...` is now written `y+ = ...` (the successor state y⁺)",
	}
	if got := strings.Split(err.Error(), "\n"); !slices.Equal(got, want) {
		t.Errorf("errors\n  %q\nwant\n  %q", got, want)
	}
}

// A map is written with the successor state x⁺ as "x+ = ..." (the notation
// of the trade for the next state of a discrete-time system, common
// practice), and the canonical text writes the same spellings.
func TestMapSpelling(t *testing.T) {
	for _, c := range []struct{ name, src, canonical string }{
		{"map", "state x, y\nparameter a in [0, 1)\nx+ = x/2 + y\ny + = a*y   # a space before + is allowed\n",
			"state x, y\nparameter a in [0, 1)\nx+ = 1/2*x + y\ny+ = a*y\n"},
		{"flow", "state x\nparameter k > 0\nparameter m = 2\nx' = -k*m*x\n",
			"state x\nparameter k > 0\nparameter m = 2\nx' = -2*k*x\n"},
	} {
		t.Run(c.name, func(t *testing.T) {
			m, err := Parse("m.lya", []byte(c.src))
			if err != nil {
				t.Fatal(err)
			}
			if m.Discrete != (c.name == "map") {
				t.Errorf("Discrete = %v", m.Discrete)
			}
			if got := m.Canonical(); got != c.canonical {
				t.Errorf("canonical\n%s\nwant\n%s", got, c.canonical)
			}
			if _, err := Parse("canonical", []byte(m.Canonical())); err != nil {
				t.Errorf("canonical text does not parse: %v", err)
			}
		})
	}
}

func TestSettings(t *testing.T) {
	src := "state x\nparameter k in [0, 4]\nx' = -k*x\nV = x^2\n"
	s, err := ParseSetting("k=1/2")
	if err != nil {
		t.Fatal(err)
	}
	m, err := Parse("m.lya", []byte(src), s)
	if err != nil {
		t.Fatal(err)
	}
	if len(m.FreeParams()) != 0 || m.F[0].String() != "-1/2*x" {
		t.Errorf("setting not applied: %s", m.F[0])
	}
	bad, _ := ParseSetting("k=5")
	if _, err := Parse("m.lya", []byte(src), bad); err == nil || !strings.Contains(err.Error(), "outside the declared range") {
		t.Errorf("out of range setting: %v", err)
	}
	if _, err := ParseSetting("k"); err == nil {
		t.Errorf("malformed setting accepted")
	}
}

// FuzzParse feeds arbitrary text to the parser: it may reject the input, but
// must never panic, and what it accepts must survive the canonical round trip.
func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "models", "*.lya"))
	for _, p := range files {
		b, err := os.ReadFile(p)
		if err == nil {
			f.Add(b)
		}
	}
	hostile, _ := filepath.Glob(filepath.Join("..", "testdata", "hostile", "models", "*.lya"))
	for _, p := range hostile {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add(examples.Coolant)
	f.Add([]byte(sample))
	f.Fuzz(func(t *testing.T, src []byte) {
		m, err := Parse("fuzz.lya", src)
		if err != nil {
			return
		}
		c := m.Canonical()
		m2, err := Parse("canonical", []byte(c))
		if err != nil {
			t.Fatalf("canonical text does not parse: %v\n%s", err, c)
		}
		if m2.Canonical() != c {
			t.Fatalf("canonical text is not stable")
		}
	})
}

// TestAtPoint: the stated point with its parameters fixed, and the origin
// when no point is stated (the model file's definition).
func TestAtPoint(t *testing.T) {
	cases := []struct {
		src  string
		want []string
	}{
		{"state x, y\nparameter a = 3\nx' = y - a\ny' = x - 1/2\nat x = 1/2, y = a\n", []string{"1/2", "3"}},
		{"state x, y\nx' = -x\ny' = -y\n", []string{"0", "0"}},
	}
	for _, c := range cases {
		m, err := Parse("at.lya", []byte(c.src))
		if err != nil {
			t.Fatal(err)
		}
		pt, err := m.AtPoint()
		if err != nil {
			t.Fatal(err)
		}
		for i, v := range pt {
			if v.RatString() != c.want[i] {
				t.Errorf("%q: coordinate %d = %s, want %s", c.src, i, v.RatString(), c.want[i])
			}
		}
	}
}
