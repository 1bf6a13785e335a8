package report

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// texRunes sets the characters that LaTeX's text mode treats specially, or
// that pdflatex with its default fonts cannot set from UTF-8, in commands
// that work with the LaTeX kernel and amsmath alone. The angle brackets and
// the bar go through math mode because the default OT1 font encoding has no
// glyphs for them.
var texRunes = map[rune]string{
	'\\':     `\textbackslash{}`,
	'{':      `\{`,
	'}':      `\}`,
	'$':      `\$`,
	'%':      `\%`,
	'&':      `\&`,
	'#':      `\#`,
	'_':      `\_`,
	'^':      `\^{}`,
	'~':      `\~{}`,
	'<':      `$<$`,
	'>':      `$>$`,
	'|':      `$|$`,
	'"':      `''`,
	'\u00a0': `~`,
	'§':      `\S{}`,
	'¶':      `\P{}`,
	'©':      `\copyright{}`,
	'±':      `$\pm$`,
	'×':      `$\times$`,
	'÷':      `$\div$`,
	'·':      `$\cdot$`,
	'°':      `$^\circ$`,
	'µ':      `$\mu$`,
	'²':      `$^{2}$`,
	'³':      `$^{3}$`,
	'¹':      `$^{1}$`,
	'ᵀ':      `$^{\mathsf{T}}$`,
	'ᵢ':      `$_{i}$`,
	'ₖ':      `$_{k}$`,
	'ⱼ':      `$_{j}$`,
	'–':      `--`,
	'—':      `---`,
	'‘':      "`",
	'’':      `'`,
	'“':      "``",
	'”':      `''`,
	'…':      `\ldots{}`,
	'′':      `$'$`,
	'•':      `$\bullet$`,
	'→':      `$\to$`,
	'←':      `$\leftarrow$`,
	'⇒':      `$\Rightarrow$`,
	'⇔':      `$\Leftrightarrow$`,
	'∂':      `$\partial$`,
	'∑':      `$\sum$`,
	'∏':      `$\prod$`,
	'−':      `$-$`,
	'∘':      `$\circ$`,
	'∩':      `$\cap$`,
	'∪':      `$\cup$`,
	'∈':      `$\in$`,
	'∉':      `$\notin$`,
	'∞':      `$\infty$`,
	'√':      `$\surd$`,
	'≈':      `$\approx$`,
	'≠':      `$\neq$`,
	'≤':      `$\le$`,
	'≥':      `$\ge$`,
	'≺':      `$\prec$`,
	'≻':      `$\succ$`,
	'⪰':      `$\succeq$`,
	'⪯':      `$\preceq$`,
	'∀':      `$\forall$`,
	'∃':      `$\exists$`,
	'∅':      `$\emptyset$`,
	'ℝ':      `$\mathbb{R}$`,
}

func init() {
	for i := 0; i <= 9; i++ {
		texRunes['₀'+rune(i)] = fmt.Sprintf("$_{%d}$", i)
	}
	texRunes['⁰'] = `$^{0}$`
	for i, r := range []rune("⁴⁵⁶⁷⁸⁹") {
		texRunes[r] = fmt.Sprintf("$^{%d}$", i+4)
	}
}

// texText escapes a string for LaTeX's text mode so that every character
// prints as itself and none is read as markup: the ten special characters
// of TeX, Greek letters and common mathematical signs by command, a
// combining dot above (as in V̇) as the text accent \. , accented Latin
// letters as UTF-8 (pdflatex sets them), and anything else as its code point
// "[U+XXXX]" rather than a compile error.
func texText(s string) string {
	var b strings.Builder
	rs := []rune(s)
	for i := 0; i < len(rs); i++ {
		r := rs[i]
		if i+1 < len(rs) && rs[i+1] == '\u0307' {
			b.WriteString(`\.{` + texText(string(r)) + `}`)
			i++
			continue
		}
		switch t, ok := texRunes[r]; {
		case ok:
			b.WriteString(t)
		case r == '\t' || r == '\n' || r == '\r':
			b.WriteRune(' ')
		case r < 0x20 || r == 0x7f || r == utf8.RuneError:
			b.WriteString(fmt.Sprintf("[U+%04X]", r))
		case r < 128:
			b.WriteRune(r)
		case greek[string(r)] != "":
			b.WriteString("$" + greek[string(r)] + "$")
		case latinLetter(r):
			b.WriteRune(r)
		default:
			b.WriteString(fmt.Sprintf("[U+%04X]", r))
		}
	}
	return b.String()
}

// latinLetter reports the accented letters of Latin-1 and Latin Extended-A,
// which pdflatex's UTF-8 input support sets in its default fonts.
func latinLetter(r rune) bool {
	return unicode.IsLetter(r) && (r >= 0xc0 && r <= 0xff || r >= 0x100 && r <= 0x17f)
}

// mdText escapes a string for GitHub-flavoured Markdown so that it shows as
// written: the punctuation that Markdown, its tables or its math extension
// read as markup inside a line is backslash-escaped, a leading character
// that would start a heading, list, quote or rule is too, and <, > and &
// become character references, so that no raw HTML reaches the page.
func mdText(s string) string {
	var b strings.Builder
	for i, r := range s {
		switch r {
		case '<':
			b.WriteString("&lt;")
		case '>':
			b.WriteString("&gt;")
		case '&':
			b.WriteString("&amp;")
		case '\\', '`', '*', '_', '[', ']', '$', '~', '|':
			b.WriteRune('\\')
			b.WriteRune(r)
		case '\n', '\r', '\t':
			b.WriteRune(' ')
		default:
			if i == 0 && strings.ContainsRune("#+-=", r) || i == 1 && (r == '.' || r == ')') && s[0] >= '0' && s[0] <= '9' {
				b.WriteRune('\\')
			}
			b.WriteRune(r)
		}
	}
	return b.String()
}

// mdCode returns s as a Markdown code span, with a fence of backticks longer
// than any run inside it.
func mdCode(s string) string {
	s = strings.NewReplacer("\n", " ", "\r", " ").Replace(s)
	longest, run := 0, 0
	for _, r := range s {
		if r == '`' {
			run++
			longest = max(longest, run)
		} else {
			run = 0
		}
	}
	fence := strings.Repeat("`", longest+1)
	if strings.HasPrefix(s, "`") || strings.HasSuffix(s, "`") || longest > 0 {
		return fence + " " + s + " " + fence
	}
	return fence + s + fence
}
