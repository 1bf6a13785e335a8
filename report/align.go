package report

import (
	"fmt"
	"slices"
	"strings"
)

// The widths that displays are fitted to, in em of the text font.
const (
	// texLineEm is the text width of the whole-document LaTeX report
	// (A4, 25 mm margins: 160 mm, 41.6 em at 11 pt) less a margin for the
	// errors of the estimate.
	texLineEm = 39.0
	// htmlLineEm is the column of the HTML page (52 rem less 2 rem of
	// padding on a screen; A4 with 16 mm margins at 10.5 pt, 48 em, in
	// print) less the padding of the alignment's cells and a margin for
	// the browser's fonts.
	htmlLineEm = 42.0
)

// fitter fits displays to a line width.
type fitter struct {
	line   float64 // the width of a display
	indent float64 // the indentation of a continued row
	cell   style   // the style a matrix cell is set in
}

var (
	// In LaTeX a continued row starts with \quad, and amsmath sets the
	// cells of a pmatrix in text style.
	texFitter = fitter{line: texLineEm, indent: 1, cell: textStyle}
	// In HTML a continued row is indented 1.5 rem (the stylesheet's
	// mtd.cont); matrix cells are estimated in display style, the wider.
	htmlFitter = fitter{line: htmlLineEm, indent: 1.5, cell: displayStyle}
)

// rowKind tells how a row of an aligned display starts.
type rowKind int

const (
	firstRow rowKind = iota // lhs op body
	contRow                 // a sum continued: indented, led by its sign
	blockRow                // a further block of a matrix, under the first
)

// row is one row of an aligned display.
type row struct {
	kind rowKind
	lhs  node // on a first row
	op   node
	body node
}

// rows lays out displays that share their alignment: the right sides are
// broken so that the widest left side, the relation and each row's right
// side fit in the line.
func (f fitter) rows(ds []display) []row {
	lhsW := 0.0
	for _, d := range ds {
		lhsW = max(lhsW, d.LHS.em(displayStyle))
	}
	first := f.line - lhsW - relEm(displayStyle)
	rest := f.line - lhsW - f.indent
	var out []row
	for _, d := range ds {
		op := d.op()
		if m, ok := d.RHS.(matrix); ok {
			for i, b := range f.blocks(m, first) {
				k := firstRow
				if i > 0 {
					k = blockRow
				}
				out = append(out, row{k, d.LHS, op, b})
			}
			continue
		}
		s, ok := d.RHS.(sum)
		if !ok {
			s = sum{{false, d.RHS}}
		}
		for i, l := range breakSum(s, first, rest, displayStyle) {
			var body node = l
			if len(l) == 1 && !l[0].neg {
				body = l[0].n
			}
			if i == 0 {
				out = append(out, row{firstRow, d.LHS, op, body})
			} else {
				out = append(out, row{contRow, nil, op, l})
			}
		}
	}
	return out
}

// breakSum breaks a sum into lines greedily: the first line at most first
// em wide, the others at most rest em with the sign that leads them. A
// term wider than a line is itself broken (splitTerm).
func breakSum(s sum, first, rest float64, st style) []sum {
	var items []term
	for _, t := range s {
		if termEm(t, false, st) > rest {
			items = append(items, splitTerm(t, rest, st)...)
		} else {
			items = append(items, t)
		}
	}
	var out []sum
	var cur sum
	w, avail := 0.0, first
	for _, t := range items {
		tw := termEm(t, len(out) == 0 && len(cur) == 0, st)
		if len(cur) > 0 && w+tw > avail {
			out = append(out, cur)
			cur, w, avail = nil, 0, rest
			tw = termEm(t, false, st)
		}
		cur = append(cur, t)
		w += tw
	}
	if len(cur) > 0 {
		out = append(out, cur)
	}
	return out
}

// splitTerm breaks a term wider than w em (with its sign) into pieces that
// fit: a factor that is a parenthesized sum, or its power, is broken
// across lines as \left( … \right. and \left. … \right)^{e}, the factors
// before it going on the first piece and those after it on the last; a
// number that is still too wide is stacked (stackNumbers).
func splitTerm(t term, w float64, st style) []term {
	fs, ok := t.n.(product)
	if !ok {
		fs = product{t.n}
	}
	// The widest factor that is a parenthesized sum.
	at, exp, widest := -1, 1, 0.0
	var inner sum
	for i, f := range fs {
		e := 1
		if p, ok := f.(power); ok {
			f, e = p.base, p.exp
		}
		p, ok := f.(parens)
		if !ok {
			continue
		}
		s, ok := p.n.(sum)
		if !ok || len(s) < 2 {
			continue
		}
		if fw := s.em(st); fw > widest {
			at, exp, widest, inner = i, e, fw, slices.Clone(s)
		}
	}
	if at < 0 {
		return []term{{t.neg, stackNumbers(t.n, w-binEm(st), st)}}
	}
	pre, post := fs[:at], fs[at+1:]
	var preN, postN node
	// The room for the inner terms: the sign, the parentheses, the
	// exponent, and the factors before (first line) or after (last),
	// which are stacked if they would leave less than the first (last)
	// inner term room.
	room := w - binEm(st) - 2*emBigParen - 0.5
	if len(pre) > 0 {
		preN = stackNumbers(factorsNode(pre), room-emThin-termEm(inner[0], true, st), st)
	}
	if len(post) > 0 {
		postN = stackNumbers(factorsNode(post), room-emThin-termEm(inner[len(inner)-1], false, st), st)
	}
	tall := hasFraction(inner)
	firstRoom, lastRoom := room, room
	if preN != nil {
		firstRoom -= preN.em(st) + emThin
	}
	if postN != nil {
		lastRoom -= postN.em(st) + emThin
	}
	for i, it := range inner {
		if termEm(it, false, st) > room {
			inner[i] = term{it.neg, stackNumbers(it.n, room-binEm(st), st)}
		}
	}
	// Greedy, with the last line's room for all lines but the first; a
	// last line that turns out too narrow for what follows the group gets
	// a line of its own for it.
	chunks := breakSum(inner, firstRoom, min(room, lastRoom)-innerIndentEm, st)
	out := make([]term, len(chunks))
	for i, c := range chunks {
		g := brokenParens{body: c, open: i == 0, close: i == len(chunks)-1, exp: exp, tall: tall}
		neg := t.neg
		if i == 0 {
			g.pre = preN
		} else {
			// The piece's sign is its first inner term's.
			neg = c[0].neg
			g.body = append(sum{{false, c[0].n}}, c[1:]...)
		}
		if g.close {
			g.post = postN
		}
		out[i] = term{neg, g}
	}
	return out
}

// innerIndentEm is the further indentation of a row that continues a sum
// inside parentheses, so that it is not read as a term of the outer sum.
const innerIndentEm = 1.0

// continuesParens reports whether a row's body starts inside parentheses
// opened on a row before.
func continuesParens(body node) bool {
	s, ok := body.(sum)
	if !ok || len(s) == 0 {
		return false
	}
	b, ok := s[0].n.(brokenParens)
	return ok && !b.open
}

// brokenParens is one line's piece of a parenthesized sum broken across
// the rows of a display: pre\,\left( body \right. on the first row,
// \left. body \right. on middle ones, \left. body \right)^{exp}\,post on
// the last. tall gives every piece the height of a fraction so that the
// parentheses of all rows come out alike.
type brokenParens struct {
	pre, post   node
	body        sum
	open, close bool
	exp         int
	tall        bool
}

func (b brokenParens) tex() string {
	var s strings.Builder
	if b.pre != nil {
		s.WriteString(b.pre.tex() + `\,`)
	}
	if b.open {
		s.WriteString(`\left(`)
	} else {
		s.WriteString(`\left.`)
	}
	if b.tall {
		s.WriteString(`\vphantom{\frac{1}{1}}`)
	}
	s.WriteString(b.body.tex())
	if b.close {
		s.WriteString(`\right)`)
		if b.exp > 1 {
			fmt.Fprintf(&s, "^{%d}", b.exp)
		}
		if b.post != nil {
			s.WriteString(`\,` + b.post.tex())
		}
	} else {
		s.WriteString(`\right.`)
	}
	return s.String()
}

func (b brokenParens) html() string {
	var s strings.Builder
	if b.pre != nil {
		s.WriteString(b.pre.html() + thinSpace)
	}
	if b.open {
		s.WriteString(mo("("))
	}
	s.WriteString(b.body.html())
	if b.close {
		if b.exp > 1 {
			s.WriteString("<msup>" + mo(")") + mn(fmt.Sprint(b.exp)) + "</msup>")
		} else {
			s.WriteString(mo(")"))
		}
		if b.post != nil {
			s.WriteString(thinSpace + b.post.html())
		}
	}
	return mrow(s.String())
}

func (b brokenParens) em(st style) float64 {
	w := b.body.em(st) + 2*emBigParen*st.scale()
	if b.pre != nil {
		w += b.pre.em(st) + emThin
	}
	if b.close && b.exp > 1 {
		w += 0.5
	}
	if b.close && b.post != nil {
		w += b.post.em(st) + emThin
	}
	return w
}

// matrixBlock is some columns of a matrix too wide for a line, labelled
// with which.
type matrixBlock struct {
	m            matrix
	from, to, of int // columns from..to (from 1) of of
}

func (b matrixBlock) label() string {
	if b.from == b.to {
		return fmt.Sprintf("column %d of %d:", b.from, b.of)
	}
	return fmt.Sprintf("columns %d–%d of %d:", b.from, b.to, b.of)
}

func (b matrixBlock) tex() string {
	return `\text{` + texText(b.label()) + `}\ ` + b.m.tex()
}

func (b matrixBlock) html() string {
	return mrow(mtext(b.label()) + `<mspace width="0.5em"></mspace>` + b.m.html())
}

func (b matrixBlock) em(st style) float64 { return blockLabelEm(b.of) + b.m.em(st) }

// blockLabelEm is the width of the widest label of a matrix of n columns:
// upright text is about half an em a character.
func blockLabelEm(n int) float64 {
	return 0.5*float64(len(fmt.Sprintf("columns %d–%d of %d:", n, n, n))) + 0.33
}

// blocks splits a matrix too wide for w em into blocks of columns that fit,
// each with its label; a matrix that fits stays whole. A cell wider than a
// line has its long numbers stacked.
func (f fitter) blocks(m matrix, w float64) []node {
	if matrixEm(m, f.cell) <= w || len(m) == 0 {
		return []node{m}
	}
	n := len(m[0])
	label := blockLabelEm(n)
	room := w - label - 2*matrixParenEm
	m = rewrite(m, func(c node) node {
		if _, ok := c.(matrix); ok {
			return nil
		}
		if c.em(f.cell) > room {
			return stackNumbers(c, room, f.cell)
		}
		return c
	}).(matrix)
	ws := columnEms(m, f.cell)
	var out []node
	for a := 0; a < n; {
		b, used := a+1, ws[a]
		for b < n && used+colSepEm+ws[b] <= room {
			used += colSepEm + ws[b]
			b++
		}
		blk := make(matrix, len(m))
		for i, r := range m {
			blk[i] = r[a:b]
		}
		out = append(out, matrixBlock{blk, a + 1, b, n})
		a = b
	}
	return out
}
