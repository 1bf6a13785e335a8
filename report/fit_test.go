package report

import (
	"fmt"
	"math/big"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

func TestDigitGroups(t *testing.T) {
	tests := []struct{ in, tex string }{
		// ISO 80000-1 (from memory): groups of three from the decimal
		// sign, a four-digit number not split.
		{"7", "7"},
		{"1234", "1234"},
		{"12345", `12\,345`},
		{"123456", `123\,456`},
		{"1234567", `1\,234\,567`},
	}
	for _, tt := range tests {
		if got := texDigits(tt.in, false); got != tt.tex {
			t.Errorf("texDigits(%s) = %s, want %s", tt.in, got, tt.tex)
		}
		if got := strings.Join(digitGroups(tt.in), ""); got != tt.in {
			t.Errorf("the groups of %s join to %s", tt.in, got)
		}
	}
}

func bigRat(s string) *big.Rat {
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		panic(s)
	}
	return r
}

// widthCases are formulas whose estimated width is compared with TeX's.
func widthCases() []struct {
	name string
	n    node
} {
	r := poly.NewRing([]string{"x1", "x2", "x3", "x4"}, []string{"k", "sigma"})
	f := func(s string) node { return ratFuncNode(poly.MustParse(r, s)) }
	return []struct {
		name string
		n    node
	}{
		{"integer", number{bigRat("12345678901234567890")}},
		{"fraction", number{bigRat("1765816957332809/57431517800475")}},
		{"short fraction", number{bigRat("3/7")}},
		{"sum", f("-246/7*x1^4 - 1/3*x1^3*x2 - 2221/21*x1^2 + 1922/77*x1*x2")},
		{"parameter", f("262/31*k*x4^2 - 19765986164603087519662161542010/22033165106014764632976413409048649*x4^2")},
		{"denominator", f("x1^2/(sigma + 1) + x2^2")},
		{"square", product{number{bigRat("647298031/28217805")}, power{parens{f("x2 + 607131756/8414874403*x3 - 806223/647298031*x4")}, 2}}},
		{"matrix", matrix{{number{bigRat("2221/21")}, number{bigRat("-961/77")}}, {number{bigRat("-961/77")}, number{bigRat("4028/165")}}}},
		{"relation", relation{name{"x1"}, symEq, number{bigRat("-235133363912438686630320/9239714399296514200925592719923627")}}},
		{"stacked", stackedNumber{bigRat("45854662031248209433873909280018/1745767104015038500738907567405"), 4}},
	}
}

// TestWidthEstimate sets formulas with pdflatex in the report's page
// (article, 11 pt) and compares the widths TeX measures (\wd of a box:
// The TeXbook, ch. 12) with the estimate: it must never be narrower, the
// breaking relies on that, and not more than 60% wider, or lines would be
// broken long before the margin.
func TestWidthEstimate(t *testing.T) {
	pdflatex, err := exec.LookPath("pdflatex")
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatal("pdflatex not found; .ci/run installs it")
		}
		t.Skip("pdflatex not found (CI installs it)")
	}
	cases := widthCases()
	var doc strings.Builder
	doc.WriteString("\\documentclass[11pt]{article}\n\\usepackage{amsmath}\n\\newsavebox\\probe\n\\begin{document}\n")
	for i, c := range cases {
		for _, st := range []struct {
			name string
			open string
		}{{"display", `\displaystyle `}, {"text", `\textstyle `}} {
			fmt.Fprintf(&doc, "\\sbox\\probe{$%s%s$}\\typeout{WIDTH %d %s \\the\\wd\\probe\\space\\the\\fontdimen6\\textfont2}\n", st.open, c.n.tex(), i, st.name)
		}
	}
	doc.WriteString("\\end{document}\n")
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "w.tex"), []byte(doc.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(pdflatex, "-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", "w.tex")
	cmd.Dir = dir
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("pdflatex: %v\n%s", err, out)
	}
	log, err := os.ReadFile(filepath.Join(dir, "w.log"))
	if err != nil {
		t.Fatal(err)
	}
	re := regexp.MustCompile(`WIDTH (\d+) (\w+) ([0-9.]+)pt ([0-9.]+)pt`)
	found := 0
	for _, m := range re.FindAllStringSubmatch(string(log), -1) {
		i, _ := strconv.Atoi(m[1])
		wd, _ := strconv.ParseFloat(m[3], 64)
		quad, _ := strconv.ParseFloat(m[4], 64)
		st := displayStyle
		if m[2] == "text" {
			st = textStyle
		}
		got := wd / quad
		est := cases[i].n.em(st)
		if _, ok := cases[i].n.(matrix); ok {
			est = matrixEm(cases[i].n.(matrix), textStyle)
		}
		found++
		if est < got || est > 1.6*got {
			t.Errorf("%s (%s style): estimated %.2f em, TeX sets %.2f em", cases[i].name, m[2], est, got)
		}
	}
	if found != 2*len(cases) {
		t.Fatalf("%d widths in the log, want %d", found, 2*len(cases))
	}
}

// fillSum is a sum of n terms, each c·x1 with a coefficient of the given
// number of digits.
func fillSum(n, digits int) sum {
	var s sum
	c := strings.Repeat("9", digits)
	for i := range n {
		s = append(s, term{i%3 == 1, product{number{bigRat(c)}, name{"x1"}}})
	}
	return s
}

// flatten lists the terms a broken sum's lines carry, the pieces of a
// broken parenthesized sum by their inner terms.
func flatten(ls []sum) []string {
	var out []string
	for _, l := range ls {
		for _, t := range l {
			out = append(out, fmt.Sprint(t.neg, t.n.tex()))
		}
	}
	return out
}

func TestBreakSum(t *testing.T) {
	tests := []struct {
		name        string
		s           sum
		first, rest float64
		lines       int
	}{
		// common practice, no source: a line holds as many terms as fit.
		{"fits", fillSum(4, 2), 30, 30, 1},
		{"two lines", fillSum(12, 4), 30, 28, 2},
		{"many lines", fillSum(40, 10), 30, 28, 0},
		{"narrow first line", fillSum(6, 4), 5, 30, 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			ls := breakSum(tt.s, tt.first, tt.rest, displayStyle)
			if tt.lines > 0 && len(ls) != tt.lines {
				t.Errorf("%d lines, want %d", len(ls), tt.lines)
			}
			if got, want := flatten(ls), flatten([]sum{tt.s}); strings.Join(got, ";") != strings.Join(want, ";") {
				t.Errorf("the lines do not carry the sum's terms in order:\n%v\n%v", got, want)
			}
			for i, l := range ls {
				w := l.em(displayStyle)
				limit := tt.first
				if i > 0 {
					w, limit = 0, tt.rest
					for _, x := range l {
						w += termEm(x, false, displayStyle)
					}
				}
				if w > limit && len(l) > 1 {
					t.Errorf("line %d is %.1f em, over %.1f", i, w, limit)
				}
			}
			// Greedy: the first term of each next line would not have fit.
			for i := 0; i+1 < len(ls); i++ {
				limit := tt.rest
				w := 0.0
				if i == 0 {
					limit, w = tt.first, ls[0].em(displayStyle)
				} else {
					for _, x := range ls[i] {
						w += termEm(x, false, displayStyle)
					}
				}
				if w+termEm(ls[i+1][0], false, displayStyle) <= limit {
					t.Errorf("line %d ends early", i)
				}
			}
		})
	}
}

func TestSplitTerm(t *testing.T) {
	r := poly.NewRing([]string{"x1", "x2", "x3", "x4", "x5", "x6"}, nil)
	inner := ratFuncNode(poly.MustParse(r, "x1 + 123456789012/345678901234567*x2 - 223456789012/345678901234567*x3 + 323456789012/345678901234567*x4 - 423456789012/345678901234567*x5"))
	tests := []struct {
		name string
		t    term
		w    float64
		// pieces: 0 for any number above one
		pieces int
	}{
		// common practice, no source: a long bracket is continued on the
		// next line, opened with \left( and closed with \right)^{2}.
		{"square", term{false, product{number{bigRat("647298031/28217805")}, power{parens{inner}, 2}}}, 30, 0},
		{"bare square", term{true, power{parens{inner}, 2}}, 25, 0},
		{"fits", term{false, power{parens{inner}, 2}}, 200, 1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			ps := splitTerm(tt.t, tt.w, displayStyle)
			if tt.pieces > 0 && len(ps) != tt.pieces {
				t.Fatalf("%d pieces, want %d", len(ps), tt.pieces)
			}
			if tt.pieces == 0 && len(ps) < 2 {
				t.Fatalf("%d pieces, want several", len(ps))
			}
			if ps[0].neg != tt.t.neg {
				t.Error("the first piece lost the term's sign")
			}
			var tex strings.Builder
			for i, p := range ps {
				if w := termEm(p, false, displayStyle); w > tt.w && len(ps) > 1 {
					t.Errorf("piece %d is %.1f em, over %.1f", i, w, tt.w)
				}
				b, ok := p.n.(brokenParens)
				if !ok {
					continue
				}
				if b.open != (i == 0) || b.close != (i == len(ps)-1) {
					t.Errorf("piece %d: open %v close %v", i, b.open, b.close)
				}
				if i > 0 {
					tex.WriteString(continued(sum{p}, true))
				} else {
					tex.WriteString(p.n.tex())
				}
			}
			if len(ps) > 1 {
				s := tex.String()
				if strings.Count(s, `\left`) != strings.Count(s, `\right`) || !strings.Contains(s, `\right)^{2}`) {
					t.Errorf("unbalanced pieces: %s", s)
				}
			}
		})
	}
}

func TestMatrixBlocks(t *testing.T) {
	// An 8×8 matrix of wide fractions.
	var m matrix
	for i := range 8 {
		m = append(m, nil)
		for j := range 8 {
			m[i] = append(m[i], number{bigRat(fmt.Sprintf("%d1234567/89%d", i+1, j+1))})
		}
	}
	tests := []struct {
		name   string
		w      float64
		blocks int // 0: several
	}{
		// common practice, no source: a wide matrix is shown in blocks of
		// whole columns, each labelled with its column range.
		{"fits", 200, 1},
		{"page", 30, 0},
		{"narrow", 8, 8},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			bs := texFitter.blocks(m, tt.w)
			if tt.blocks > 0 && len(bs) != tt.blocks {
				t.Fatalf("%d blocks, want %d", len(bs), tt.blocks)
			}
			if tt.blocks == 0 && len(bs) < 2 {
				t.Fatalf("%d blocks, want several", len(bs))
			}
			next := 1
			for _, b := range bs {
				mb, ok := b.(matrixBlock)
				if !ok {
					if len(bs) != 1 {
						t.Fatal("a block without its label")
					}
					continue
				}
				if mb.from != next || mb.to < mb.from || mb.of != 8 {
					t.Errorf("block of columns %d–%d of %d after column %d", mb.from, mb.to, mb.of, next-1)
				}
				next = mb.to + 1
				if w := mb.em(displayStyle); w > tt.w && mb.to > mb.from {
					t.Errorf("block %s is %.1f em, over %.1f", mb.label(), w, tt.w)
				}
			}
			if len(bs) > 1 && next != 9 {
				t.Errorf("the blocks end at column %d", next-1)
			}
		})
	}
}

func TestInlineForm(t *testing.T) {
	long := bigRat("235133363912438686630320/9239714399296514200925592719923627")
	tests := []struct {
		name string
		n    node
		tex  string
	}{
		// ISO 80000-2 (from memory): a/b for a fraction in running text.
		{"short stays built up", number{bigRat("199183/2772")}, `\frac{199\,183}{2772}`},
		{"long", number{long}, `235\allowbreak\,133\allowbreak\,363\allowbreak\,912\allowbreak\,438\allowbreak\,686\allowbreak\,630\allowbreak\,320/\allowbreak 9\allowbreak\,239\allowbreak\,714\allowbreak\,399\allowbreak\,296\allowbreak\,514\allowbreak\,200\allowbreak\,925\allowbreak\,592\allowbreak\,719\allowbreak\,923\allowbreak\,627`},
		{"long factor in parentheses", product{number{bigRat("12345678901/3")}, name{"k"}}, `(12\allowbreak\,345\allowbreak\,678\allowbreak\,901/\allowbreak 3)\,k`},
		{"long integer", number{bigRat("12345678901")}, `12\allowbreak\,345\allowbreak\,678\allowbreak\,901`},
		{"long radicand", radical{big.NewInt(123456789012)}, `(123\allowbreak\,456\allowbreak\,789\allowbreak\,012)^{1/2}`},
	}
	for _, tt := range tests {
		if got := inlineForm(tt.n).tex(); got != tt.tex {
			t.Errorf("%s: %s\nwant %s", tt.name, got, tt.tex)
		}
	}
	// In HTML a long number leaves the math element, so that the browser
	// may break it.
	h := htmlInline(relation{name{"x1"}, symEq, ratNode(new(big.Rat).Neg(long))})
	if !strings.Contains(h, `<span class="num">235`) || !strings.Contains(h, "<mo>−</mo>") || !strings.Contains(h, "/<wbr>") {
		t.Errorf("htmlInline: %s", h)
	}
}
