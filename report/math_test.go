package report

import (
	"math/big"
	"testing"

	"github.com/lyacert/lyacert/poly"
)

func TestRatFuncNode(t *testing.T) {
	const sp = thinSpace
	r := poly.NewRing([]string{"x", "y", "x1", "x_ref"}, []string{"r", "sigma", "kp", "b"})
	tests := []struct {
		text, tex, html string
	}{
		// common practice, no source: how these polynomials are typeset.
		{"-2*x^2 + (2*r + 2)*x*y", `-2\,x^{2} + \left(2\,r + 2\right)\,x\,y`, `<mrow><mo>−</mo><mrow><mn>2</mn>` + sp + `<msup><mi>x</mi><mn>2</mn></msup></mrow><mo>+</mo><mrow><mrow><mo>(</mo><mrow><mrow><mn>2</mn>` + sp + `<mi>r</mi></mrow><mo>+</mo><mn>2</mn></mrow><mo>)</mo></mrow>` + sp + `<mi>x</mi>` + sp + `<mi>y</mi></mrow></mrow>`},
		{"x^2/sigma", `\frac{x^{2}}{\sigma}`, ""},
		{"x^2/sigma + y^2", `\frac{x^{2}}{\sigma} + y^{2}`, ""},
		{"3/2", `\frac{3}{2}`, "<mfrac><mn>3</mn><mn>2</mn></mfrac>"},
		{"-3/2*x^2", `-\frac{3}{2}\,x^{2}`, ""},
		{"0", `0`, "<mn>0</mn>"},
		{"1", `1`, "<mn>1</mn>"},
		{"x", `x`, "<mi>x</mi>"},
		{"-x", `-x`, "<mrow><mo>−</mo><mi>x</mi></mrow>"},
		{"kp*x1^3", `\mathit{kp}\,{x_{1}}^{3}`, `<mrow><mi class="word">kp</mi>` + sp + `<msup><msub><mi>x</mi><mn>1</mn></msub><mn>3</mn></msup></mrow>`},
		{"x_ref - x", `-x + x_{\mathit{ref}}`, ""},
		{"r/(r + 1)", `\frac{r}{r + 1}`, ""},
		{"-r/(r + 1)", `-\frac{r}{r + 1}`, ""},
		{"x*y/(r*b)", `\frac{x\,y}{b\,r}`, ""},
		{"x^2/(r + 1)^2", `\frac{x^{2}}{r^{2} + 2\,r + 1}`, ""},
		{"(r - 1)*x^2 - r*y", `\left(r - 1\right)\,x^{2} - r\,y`, ""},
		{"2*sigma*x + 1", `2\,\sigma\,x + 1`, ""},
	}
	for _, tt := range tests {
		t.Run(tt.text, func(t *testing.T) {
			f := poly.MustParse(r, tt.text)
			n := ratFuncNode(f)
			if got := n.tex(); got != tt.tex {
				t.Errorf("tex %q\nwant %q", got, tt.tex)
			}
			if tt.html != "" {
				if got := n.html(); got != tt.html {
					t.Errorf("html %q\nwant %q", got, tt.html)
				}
			}
		})
	}
}

func TestNames(t *testing.T) {
	tests := []struct{ name, tex, html string }{
		// common practice, no source: engineering names in mathematics.
		{"x", "x", "<mi>x</mi>"},
		{"x1", "x_{1}", "<msub><mi>x</mi><mn>1</mn></msub>"},
		{"x12", "x_{12}", "<msub><mi>x</mi><mn>12</mn></msub>"},
		{"sigma", `\sigma`, "<mi>σ</mi>"},
		{"Omega", `\Omega`, `<mi mathvariant="normal">Ω</mi>`},
		{"sigma2", `\sigma_{2}`, "<msub><mi>σ</mi><mn>2</mn></msub>"},
		{"σ", `\sigma`, "<mi>σ</mi>"},
		{"kp", `\mathit{kp}`, `<mi class="word">kp</mi>`},
		{"k_p", `k_{p}`, "<msub><mi>k</mi><mi>p</mi></msub>"},
		{"x_ref", `x_{\mathit{ref}}`, `<msub><mi>x</mi><mi class="word">ref</mi></msub>`},
		{"gain_", `\mathit{gain\_}`, `<mi class="word">gain_</mi>`},
		{"ä", `\mathit{\text{ä}}`, "<mi>ä</mi>"},
	}
	for _, tt := range tests {
		if got := texName(tt.name); got != tt.tex {
			t.Errorf("texName(%q) = %q, want %q", tt.name, got, tt.tex)
		}
		if got := htmlName(tt.name); got != tt.html {
			t.Errorf("htmlName(%q) = %q, want %q", tt.name, got, tt.html)
		}
	}
}

func TestTexText(t *testing.T) {
	tests := []struct{ in, want string }{
		// The ten special characters of TeX (Knuth, The TeXbook, ch. 7).
		{`$ % & _ # { } \ ^ ~`, `\$ \% \& \_ \# \{ \} \textbackslash{} \^{} \~{}`},
		// common practice, no source: characters the OT1 fonts lack.
		{"a < b > c | d", "a $<$ b $>$ c $|$ d"},
		{`say "hi"`, "say ''hi''"},
		{"§9.2 – x — y", `\S{}9.2 -- x --- y`},
		{"V̇ ≤ 0", `\.{V} $\le$ 0`},
		{"σ > 0", `$\sigma$ $>$ 0`},
		{"Lᵢₖ·xᵢ", `L$_{i}$$_{k}$$\cdot$x$_{i}$`},
		{"café", "café"},
		{"✓", "[U+2713]"},
		{"a\tb", "a b"},
	}
	for _, tt := range tests {
		if got := texText(tt.in); got != tt.want {
			t.Errorf("texText(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestMdText(t *testing.T) {
	tests := []struct{ in, want string }{
		// CommonMark 0.31, §2.4 backslash escapes and §6.6 raw HTML.
		{"<script>alert(1)</script>", "&lt;script&gt;alert(1)&lt;/script&gt;"},
		{"*bold* _it_ `code`", `\*bold\* \_it\_ \` + "`" + `code\` + "`"},
		{"[link](javascript:x)", `\[link\](javascript:x)`},
		{"# heading", `\# heading`},
		{"- item", `\- item`},
		{"1. item", `1\. item`},
		{"a | b", `a \| b`},
		{"$x$ & y", `\$x\$ &amp; y`},
		{"plain text, 3.5 > 2", "plain text, 3.5 &gt; 2"},
	}
	for _, tt := range tests {
		if got := mdText(tt.in); got != tt.want {
			t.Errorf("mdText(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
	if got := mdCode("a`b"); got != "`` a`b ``" {
		t.Errorf("mdCode = %q", got)
	}
}

func TestQuadraticRoot(t *testing.T) {
	q := func(c ...int64) poly.Univariate { return poly.UnivariateFromInts(c...) }
	rat := func(s string) *big.Rat { r, _ := new(big.Rat).SetString(s); return r }
	tests := []struct {
		name   string
		p      poly.Univariate
		lo, hi string
		want   string // "" when no closed form is given
	}{
		// from memory: the quadratic formula, x = (−b ± √(b² − 4ac)) / 2a.
		{"k^2 - 2k - 7, upper", q(-7, -2, 1), "3", "4", `1 + 2\,\sqrt{2}`},
		{"k^2 - 2k - 7, lower", q(-7, -2, 1), "-2", "-1", `1 - 2\,\sqrt{2}`},
		{"x^2 - 2", q(-2, 0, 1), "1", "2", `\sqrt{2}`},
		{"x^2 - 2, negative root", q(-2, 0, 1), "-2", "-1", `-\sqrt{2}`},
		{"4x^2 - 2", q(-2, 0, 4), "0", "1", `\frac{\sqrt{2}}{2}`},
		{"x^2 + x - 1", q(-1, 1, 1), "0", "1", `-\frac{1}{2} + \frac{\sqrt{5}}{2}`},
		{"x^2 - 8", q(-8, 0, 1), "2", "3", `2\,\sqrt{2}`},
		{"-x^2 + 3, leading coefficient negative", q(3, 0, -1), "1", "2", `\sqrt{3}`},
		{"rational roots", q(-4, 0, 1), "1", "3", ""},
		{"both roots inside", q(-2, 0, 1), "-2", "2", ""},
		{"cubic", q(-2, 0, 0, 1), "1", "2", ""},
		{"no real root", q(1, 0, 1), "-1", "1", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			n, ok := quadraticRoot(tt.p, rat(tt.lo), rat(tt.hi))
			switch {
			case tt.want == "" && ok:
				t.Errorf("closed form %q, want none", n.tex())
			case tt.want != "" && !ok:
				t.Errorf("no closed form, want %q", tt.want)
			case ok && n.tex() != tt.want:
				t.Errorf("closed form %q, want %q", n.tex(), tt.want)
			}
		})
	}
}

func TestSquareFactor(t *testing.T) {
	tests := []struct{ n, k, w int64 }{
		// from memory: 72 = 6²·2, 32 = 4²·2, 45 = 3²·5.
		{72, 6, 2}, {32, 4, 2}, {45, 3, 5}, {1, 1, 1}, {49, 7, 1}, {2, 1, 2}, {30, 1, 30},
	}
	for _, tt := range tests {
		k, w := squareFactor(big.NewInt(tt.n))
		if k.Int64() != tt.k || w.Int64() != tt.w {
			t.Errorf("squareFactor(%d) = %v²·%v, want %d²·%d", tt.n, k, w, tt.k, tt.w)
		}
	}
	// A square of a prime above the trial bound still comes out whole.
	p := big.NewInt(1_000_003)
	n := new(big.Int).Mul(p, p)
	if k, w := squareFactor(n); k.Cmp(p) != 0 || w.Int64() != 1 {
		t.Errorf("squareFactor(p²) = %v²·%v", k, w)
	}
}

func TestDecimalOutward(t *testing.T) {
	rat := func(s string) *big.Rat { r, _ := new(big.Rat).SetString(s); return r }
	tests := []struct {
		q        string
		k        int
		down, up string
	}{
		// common practice, no source: outward rounding keeps the exact
		// value between the two decimals.
		{"1/3", 4, "0.3333", "0.3334"},
		{"-1/3", 4, "-0.3334", "-0.3333"},
		{"2/3", 3, "0.666", "0.667"},
		{"7247757311/268435456", 10, "26.99999999", "27"},
		{"7247757313/268435456", 10, "27", "27.00000001"},
		{"123456789012", 4, "123400000000", "123500000000"},
		{"1/8", 5, "0.125", "0.125"},
		{"0", 5, "0", "0"},
	}
	for _, tt := range tests {
		q := rat(tt.q)
		if got := decimalOutward(q, tt.k, false); got != tt.down {
			t.Errorf("decimalOutward(%s, %d, down) = %s, want %s", tt.q, tt.k, got, tt.down)
		}
		if got := decimalOutward(q, tt.k, true); got != tt.up {
			t.Errorf("decimalOutward(%s, %d, up) = %s, want %s", tt.q, tt.k, got, tt.up)
		}
		for _, s := range []string{decimalOutward(q, tt.k, false), decimalOutward(q, tt.k, true)} {
			if rat(s) == nil {
				t.Errorf("%q is not a number", s)
			}
		}
		if rat(decimalOutward(q, tt.k, false)).Cmp(q) > 0 || rat(decimalOutward(q, tt.k, true)).Cmp(q) < 0 {
			t.Errorf("%s: the rounded ends do not enclose it", tt.q)
		}
	}
}
