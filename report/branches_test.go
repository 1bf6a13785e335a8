package report

import (
	"bytes"
	"context"
	"encoding/json"
	"encoding/xml"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/model"
)

func analyzeText(t testing.TB, src string) (*model.Model, *branches.Analysis) {
	t.Helper()
	m, err := model.Parse("test.lya", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	an, err := branches.Analyze(context.Background(), m, branches.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return m, an
}

func readModelFile(t testing.TB, name string, set ...string) (*model.Model, *branches.Analysis) {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "testdata", "models", name))
	if err != nil {
		t.Fatal(err)
	}
	var st []model.Setting
	for _, s := range set {
		v, err := model.ParseSetting(s)
		if err != nil {
			t.Fatal(err)
		}
		st = append(st, v)
	}
	m, err := model.Parse(name, src, st...)
	if err != nil {
		t.Fatal(err)
	}
	an, err := branches.Analyze(context.Background(), m, branches.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return m, an
}

// referenceModels are scanned on a grid of their free parameter by the
// numpy reference.
var referenceModels = []struct {
	name     string
	file     string // in testdata/models, or "" for src
	set      []string
	src      string
	lo, hi   float64
	gridStep float64
}{
	{name: "lorenz", file: "lorenz.lya", set: []string{"sigma=10", "b=8/3"}, lo: 0, hi: 40, gridStep: 0.173},
	{name: "logistic", file: "logistic.lya", lo: 0, hi: 4, gridStep: 0.0371},
	// Of our own: a damped oscillator with a cubic spring, damping a free.
	{name: "oscillator", src: "state x, y\nparameter a\nx' = y\ny' = -x - a*y - x^3\n", lo: -3, hi: 3, gridStep: 0.0537},
	// Of our own: a saddle-node pair x = ±√a with a damped second state.
	{name: "fold", src: "state x, y\nparameter a\nx' = a - x^2\ny' = x - y\n", lo: -2, hi: 3, gridStep: 0.0419},
	// Of our own: a map with a pitchfork (x = ±√(a − 1)) and period-doubling.
	{name: "cubicmap", src: "state x\nparameter a\nx+ = a*x - x^3\n", lo: -1.5, hi: 3, gridStep: 0.0313},
}

// pythonRef is the script of the reference: for each point it evaluates
// the model's right-hand side at the branch's equilibrium (the residual
// must vanish), differentiates it by central differences and returns the
// eigenvalues from numpy.linalg.eigvals (LAPACK geev).
const pythonRef = `
import json, sys
import numpy as np
req = json.load(sys.stdin)
names = req["states"]
p = req["param"]
code = [compile(e.replace("^", "**"), "f", "eval") for e in req["f"]]
def f(x, t):
    env = dict(zip(names, x)); env[p] = t
    v = np.array([float(eval(c, {}, env)) for c in code])
    if req["discrete"]:
        v = v - np.array(x)
    return v
def rhs(x, t):
    env = dict(zip(names, x)); env[p] = t
    return np.array([float(eval(c, {}, env)) for c in code])
out = []
for pt in req["points"]:
    x = np.array(pt["x"], dtype=float); t = pt["t"]
    n = len(x); J = np.zeros((n, n))
    h = 1e-6 * max(1.0, float(np.max(np.abs(x))))
    for j in range(n):
        e = np.zeros(n); e[j] = h
        J[:, j] = (rhs(x + e, t) - rhs(x - e, t)) / (2 * h)
    ev = np.linalg.eigvals(J)
    scale = 1.0 + float(np.max(np.abs(x)))
    out.append({"residual": float(np.max(np.abs(f(x, t)))) / scale, "re": [float(v.real) for v in ev], "im": [float(v.imag) for v in ev]})
json.dump(out, sys.stdout)
`

// numpyPython returns a python3 that imports numpy, or skips the test.
func numpyPython(t *testing.T) string {
	t.Helper()
	for _, p := range []string{"/usr/bin/python3", "python3"} {
		path, err := exec.LookPath(p)
		if err != nil {
			continue
		}
		if exec.Command(path, "-c", "import numpy").Run() == nil {
			return path
		}
	}
	t.Skip("no python3 with numpy (Debian: apt-get install python3-numpy): the eigenvalue reference is skipped")
	return ""
}

type refPoint struct {
	T float64   `json:"t"`
	X []float64 `json:"x"`
}

type refResult struct {
	Residual float64   `json:"residual"`
	Re       []float64 `json:"re"`
	Im       []float64 `json:"im"`
}

// TestClassificationAgainstNumpy compares the exact classification with
// the eigenvalues numpy computes (reference library: numpy.linalg.eigvals)
// on a grid of parameter values: at every grid point away from a piece's
// end, the number of eigenvalues with positive real part (modulus above 1
// for maps) must be the classification's, stable must agree, and the type
// must match the eigenvalues: saddle iff 0 < #unstable < n, focus iff a
// complex pair, node iff all real (common practice).
func TestClassificationAgainstNumpy(t *testing.T) {
	py := numpyPython(t)
	for _, tc := range referenceModels {
		t.Run(tc.name, func(t *testing.T) {
			var m *model.Model
			var an *branches.Analysis
			if tc.file != "" {
				m, an = readModelFile(t, tc.file, tc.set...)
			} else {
				m, an = analyzeText(t, tc.src)
			}
			if !an.ClosedForm || an.Param == "" {
				t.Fatalf("closed form %v (%s), param %q", an.ClosedForm, an.Reason, an.Param)
			}
			pi, _ := an.Ring.Index(an.Param)
			nv := len(an.Ring.Names())
			var pts []refPoint
			type want struct {
				branch int
				label  branches.Label
			}
			var wants []want
			for i, b := range an.Branches {
				ps := BranchPieces(an, i)
				for x := tc.lo; x <= tc.hi; x += tc.gridStep {
					var lab *branches.Label
					for _, pc := range ps {
						lo, hi := endFloatOf(pc.Span.Lo), endFloatOf(pc.Span.Hi)
						if pc.Span.Point() || x <= lo+1e-6 || x >= hi-1e-6 {
							continue
						}
						lab = &pc.Label
					}
					if lab == nil {
						continue
					}
					pt := refPoint{T: x}
					for k := range m.States {
						v, ok := surdFloat(b.Coords[k], nv, pi, x)
						if !ok {
							t.Fatalf("branch %d undefined at %s = %g inside a piece where it exists", i+1, an.Param, x)
						}
						pt.X = append(pt.X, v)
					}
					pts = append(pts, pt)
					wants = append(wants, want{i, *lab})
				}
			}
			if len(pts) < 20 {
				t.Fatalf("only %d grid points", len(pts))
			}
			fs := make([]string, len(m.F))
			for i, f := range m.F {
				fs[i] = f.String()
			}
			req, _ := json.Marshal(map[string]any{"f": fs, "states": m.States, "param": an.Param, "discrete": m.Discrete, "points": pts})
			cmd := exec.Command(py, "-c", pythonRef)
			cmd.Stdin = bytes.NewReader(req)
			var stderr bytes.Buffer
			cmd.Stderr = &stderr
			out, err := cmd.Output()
			if err != nil {
				t.Fatalf("python: %v\n%s", err, stderr.String())
			}
			var res []refResult
			if err := json.Unmarshal(out, &res); err != nil {
				t.Fatal(err)
			}
			n := len(m.States)
			for j, r := range res {
				w, pt := wants[j], pts[j]
				if r.Residual > 1e-9 {
					t.Errorf("branch %d at %s = %g: f(x*) = %g, not an equilibrium", w.branch+1, an.Param, pt.T, r.Residual)
				}
				unstable, complexPair := 0, false
				for k := range r.Re {
					if m.Discrete {
						if math.Hypot(r.Re[k], r.Im[k]) > 1 {
							unstable++
						}
					} else if r.Re[k] > 0 {
						unstable++
					}
					if math.Abs(r.Im[k]) > 1e-7 {
						complexPair = true
					}
				}
				l := w.label
				where := func() string {
					return strings.Join([]string{an.Param, "=", jsonFloat(pt.T)}, " ")
				}
				if l.Unstable != unstable {
					t.Errorf("branch %d at %s: %d unstable eigenvalues, numpy %d (%v %v)", w.branch+1, where(), l.Unstable, unstable, r.Re, r.Im)
				}
				if (l.Stability == "stable") != (unstable == 0) {
					t.Errorf("branch %d at %s: %s, numpy finds %d unstable eigenvalues", w.branch+1, where(), l.Stability, unstable)
				}
				switch l.Kind {
				case "saddle":
					if unstable == 0 || unstable == n {
						t.Errorf("branch %d at %s: saddle, numpy %d of %d unstable", w.branch+1, where(), unstable, n)
					}
				case "focus":
					if !complexPair {
						t.Errorf("branch %d at %s: focus, numpy eigenvalues all real %v", w.branch+1, where(), r.Re)
					}
				case "node":
					if complexPair || (n > 1 && unstable > 0 && unstable < n) {
						t.Errorf("branch %d at %s: node, numpy %v %v", w.branch+1, where(), r.Re, r.Im)
					}
				}
			}
		})
	}
}

func jsonFloat(x float64) string {
	b, _ := json.Marshal(x)
	return string(b)
}

// TestBifurcationDiagramFormats draws the Lorenz diagram in each format
// and decodes it: a PNG that image/png reads, SVG that is well-formed XML
// naming the bifurcations, a PDF with its header (PNG: ISO/IEC 15948;
// PDF: ISO 32000-1, §7.5.2).
func TestBifurcationDiagramFormats(t *testing.T) {
	m, an := readModelFile(t, "lorenz.lya", "sigma=10", "b=8/3")
	all, err := DiagramStates(m, "")
	if err != nil {
		t.Fatal(err)
	}
	for _, format := range PlotFormats {
		t.Run(format, func(t *testing.T) {
			b, err := BifurcationDiagram(m, an, all, format)
			if err != nil {
				t.Fatal(err)
			}
			switch format {
			case "png":
				img, err := png.Decode(bytes.NewReader(b))
				if err != nil {
					t.Fatal(err)
				}
				if s := img.Bounds().Size(); s.X < 200 || s.Y < 200 {
					t.Errorf("image %v", s)
				}
			case "svg":
				d := xml.NewDecoder(bytes.NewReader(b))
				for {
					_, err := d.Token()
					if err != nil {
						if err.Error() != "EOF" {
							t.Fatalf("SVG is not well-formed XML: %v", err)
						}
						break
					}
				}
				for _, s := range []string{"pitchfork at r = 1", "hopf at r = 470/19 ≈ 24.7368", "branch 3"} {
					if !bytes.Contains(b, []byte(s)) {
						t.Errorf("SVG lacks %q", s)
					}
				}
			case "pdf":
				if !bytes.HasPrefix(b, []byte("%PDF-")) {
					t.Errorf("PDF header %q", b[:8])
				}
			}
		})
	}
	if _, err := BifurcationDiagram(m, an, all, "jpg"); err == nil {
		t.Error("jpg accepted")
	}
	if _, err := DiagramStates(m, "w"); err == nil {
		t.Error("unknown state accepted")
	}
}

// TestBranchesJSONKeys checks the contract: every key is present, lists
// empty rather than missing, with two free parameters (no classification).
func TestBranchesJSONKeys(t *testing.T) {
	for _, tc := range []struct {
		name string
		set  []string
	}{{"one free", []string{"sigma=10", "b=8/3"}}, {"two free", []string{"sigma=10"}}} {
		t.Run(tc.name, func(t *testing.T) {
			m, an := readModelFile(t, "lorenz.lya", tc.set...)
			b, err := json.Marshal(BranchesJSON(m, an, nil))
			if err != nil {
				t.Fatal(err)
			}
			var top map[string]json.RawMessage
			if err := json.Unmarshal(b, &top); err != nil {
				t.Fatal(err)
			}
			for _, k := range []string{"analysis", "certificate", "time_kind", "params", "free", "closed_form", "reason", "param", "notes", "branches", "bifurcations", "linear_certificates", "samples"} {
				if _, ok := top[k]; !ok {
					t.Errorf("top-level key %q missing", k)
				}
			}
			if string(top["bifurcations"]) == "null" || string(top["notes"]) == "null" {
				t.Error("an empty list is null")
			}
			var bs []map[string]json.RawMessage
			if err := json.Unmarshal(top["branches"], &bs); err != nil || len(bs) != 3 {
				t.Fatalf("branches %s: %v", top["branches"], err)
			}
			for _, br := range bs {
				for _, k := range []string{"id", "coordinates", "isolated", "free_states", "exists", "assumes", "region", "jacobian", "charpoly", "trace", "det", "discriminant", "hurwitz", "bilinear_lead", "stable_iff_positive", "classification", "lyapunov"} {
					if _, ok := br[k]; !ok {
						t.Errorf("branch key %q missing", k)
					}
				}
				if string(br["classification"]) == "null" {
					t.Error("classification is null, want []")
				}
			}
		})
	}
}

// benchAnalysis runs find's symbolic path end to end: parse, analyse,
// write the text and the JSON.
func benchAnalysis(b *testing.B, src string, set ...string) {
	var st []model.Setting
	for _, s := range set {
		v, err := model.ParseSetting(s)
		if err != nil {
			b.Fatal(err)
		}
		st = append(st, v)
	}
	for b.Loop() {
		m, err := model.Parse("bench.lya", []byte(src), st...)
		if err != nil {
			b.Fatal(err)
		}
		an, err := branches.Analyze(context.Background(), m, branches.Options{})
		if err != nil || !an.ClosedForm {
			b.Fatal(err, an.Reason)
		}
		var buf bytes.Buffer
		if err := BranchesText(&buf, m, an, nil); err != nil {
			b.Fatal(err)
		}
		if _, err := json.Marshal(BranchesJSON(m, an, nil)); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkBranchesLorenz is find on Lorenz with r free (target < 100 ms).
func BenchmarkBranchesLorenz(b *testing.B) {
	src, err := os.ReadFile(filepath.Join("..", "testdata", "models", "lorenz.lya"))
	if err != nil {
		b.Fatal(err)
	}
	benchAnalysis(b, string(src), "sigma=10", "b=8/3")
}

// BenchmarkBranchesFourStatesTwoParams is find on a 4-state chain of our
// own with two symbolic parameters (target < 2 s).
func BenchmarkBranchesFourStatesTwoParams(b *testing.B) {
	benchAnalysis(b, "state x, y, z, w\nparameter a\nparameter b\nx' = y - a*x\ny' = z - y\nz' = w - b*z + x^2\nw' = x - w\n")
}
