package layout

import (
	"go/ast"
	"go/build"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// layers lists lyacert's packages from the bottom up; a package may import
// only packages of lower layers (common practice: a layered architecture
// with one-way imports).
var layers = [][]string{
	{"poly", "internal/workpool", "internal/bounded", "examples", "certify/interval", "certify/lyapunov", "certify/sdp", "certify/ode"},
	{"model"},
	{"claims"},
	{"checker"},
	{"certificates"},
	{"certify", "certify/pave", "certify/sos"},
	{"certify/direct", "certify/branches"},
	{"certify/equilibria", "certify/sossearch", "certify/basin", "certify/vertex", "certify/boxsos"},
	{"certify/boxsearch"},
	{"sweep"},
	{"report"},
	{"cmd/lyacert", "examples/slurm"},
}

const module = "github.com/lyacert/lyacert"

func root(t *testing.T) string {
	t.Helper()
	dir, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	return dir
}

// packages returns every package directory of the module with its
// non-test imports of the module.
func packages(t *testing.T) map[string][]string {
	t.Helper()
	out := map[string][]string{}
	base := root(t)
	err := filepath.WalkDir(base, func(path string, d os.DirEntry, err error) error {
		if err != nil || !d.IsDir() {
			return err
		}
		name := d.Name()
		if path != base && (strings.HasPrefix(name, ".") || name == "testdata") {
			return filepath.SkipDir
		}
		if _, err := os.Stat(filepath.Join(path, "go.mod")); err == nil && path != base {
			return filepath.SkipDir // a module of its own (examples/kubernetes)
		}
		pkg, err := build.ImportDir(path, 0)
		if err != nil {
			return nil // no Go files, or only tests
		}
		rel, _ := filepath.Rel(base, path)
		rel = filepath.ToSlash(rel)
		var own []string
		for _, imp := range pkg.Imports {
			if imp == module || strings.HasPrefix(imp, module+"/") {
				own = append(own, strings.TrimPrefix(imp, module+"/"))
			}
		}
		out[rel] = own
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func TestImportsFlowOneWay(t *testing.T) {
	layer := map[string]int{}
	for i, ps := range layers {
		for _, p := range ps {
			layer[p] = i
		}
	}
	for pkg, imports := range packages(t) {
		if strings.HasPrefix(pkg, "internal/layout") {
			continue
		}
		l, ok := layer[pkg]
		if !ok {
			t.Errorf("package %s has no layer: add it to layers", pkg)
			continue
		}
		for _, imp := range imports {
			if li, ok := layer[imp]; !ok || li >= l {
				t.Errorf("%s (layer %d) imports %s (layer %d): imports must flow down", pkg, l, imp, li)
			}
		}
	}
}

// kernelBudget is the kernel's size in lines of non-test Go. A new rule
// pays for itself by moving general algebra to poly or model, or the
// format's reading to claims; the budget never rises above 2,000.
const kernelBudget = 2000

// TestKernelIsSmallAndExact: the kernel imports only poly, model, claims
// and the standard library (no third-party code), the format it reads
// (claims) only poly and the standard library; neither names a
// floating-point type or function, and the kernel stays within
// kernelBudget.
func TestKernelIsSmallAndExact(t *testing.T) {
	allowed := map[string][]string{"checker": {"poly", "model", "claims"}, "claims": {"poly"}}
	for _, name := range []string{"checker", "claims"} {
		lines := exactPackage(t, name, allowed[name])
		if name == "checker" && lines > kernelBudget {
			t.Errorf("the kernel has %d lines of non-test Go; its budget is %d", lines, kernelBudget)
		}
	}
}

// exactPackage checks the imports of a package of the trusted base and that
// it names no floating-point type or function; it returns the package's
// lines of non-test Go.
func exactPackage(t *testing.T, name string, own []string) int {
	t.Helper()
	dir := filepath.Join(root(t), name)
	pkg, err := build.ImportDir(dir, 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, imp := range pkg.Imports {
		switch {
		case slices.Contains(own, strings.TrimPrefix(imp, module+"/")):
		case strings.Contains(strings.SplitN(imp, "/", 2)[0], "."), strings.HasPrefix(imp, module):
			t.Errorf("%s imports %s", name, imp)
		case imp == "math" || imp == "strconv" || imp == "unsafe":
			t.Errorf("%s imports %s (floating point or unchecked memory)", name, imp)
		}
	}
	lines := 0
	fset := token.NewFileSet()
	for _, file := range pkg.GoFiles {
		src, err := os.ReadFile(filepath.Join(dir, file))
		if err != nil {
			t.Fatal(err)
		}
		lines += strings.Count(string(src), "\n")
		f, err := parser.ParseFile(fset, file, src, 0)
		if err != nil {
			t.Fatal(err)
		}
		ast.Inspect(f, func(n ast.Node) bool {
			switch x := n.(type) {
			case *ast.Ident:
				if x.Name == "float32" || x.Name == "float64" || x.Name == "complex64" || x.Name == "complex128" {
					t.Errorf("%s: %s uses %s", fset.Position(x.Pos()), name, x.Name)
				}
			case *ast.SelectorExpr:
				if x.Sel.Name == "Float64" || x.Sel.Name == "Float32" || x.Sel.Name == "SetFloat64" || x.Sel.Name == "ParseFloat" {
					t.Errorf("%s: %s calls %s", fset.Position(x.Pos()), name, x.Sel.Name)
				}
			}
			return true
		})
	}
	return lines
}

// TestNoNamesSharedWithEngine: no exported name of the kernel or of the
// format it reads is also an exported name of the engine (certify/...), so
// that a reader never mistakes what the engine computed for what the kernel
// checked.
func TestNoNamesSharedWithEngine(t *testing.T) {
	trusted := map[string]string{}
	for _, dir := range []string{"checker", "claims"} {
		for name := range exported(t, dir) {
			trusted[name] = dir
		}
	}
	for pkg := range packages(t) {
		if pkg != "certify" && !strings.HasPrefix(pkg, "certify/") {
			continue
		}
		for name := range exported(t, pkg) {
			if dir, ok := trusted[name]; ok {
				t.Errorf("%s.%s has the name of %s.%s", pkg, name, dir, name)
			}
		}
	}
}

// exported returns the exported top-level names (types, functions,
// constants, variables) of a package's non-test files.
func exported(t *testing.T, dir string) map[string]bool {
	t.Helper()
	pkg, err := build.ImportDir(filepath.Join(root(t), dir), 0)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]bool{}
	fset := token.NewFileSet()
	for _, file := range pkg.GoFiles {
		f, err := parser.ParseFile(fset, filepath.Join(pkg.Dir, file), nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range f.Decls {
			switch d := d.(type) {
			case *ast.FuncDecl:
				if d.Recv == nil && d.Name.IsExported() {
					out[d.Name.Name] = true
				}
			case *ast.GenDecl:
				for _, s := range d.Specs {
					switch s := s.(type) {
					case *ast.TypeSpec:
						if s.Name.IsExported() {
							out[s.Name.Name] = true
						}
					case *ast.ValueSpec:
						for _, n := range s.Names {
							if n.IsExported() {
								out[n.Name] = true
							}
						}
					}
				}
			}
		}
	}
	return out
}
