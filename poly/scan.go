package poly

import (
	"fmt"
	"slices"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Pos is a position in an input file: line and column count from 1, the
// column in characters (runes).
type Pos struct {
	File string
	Line int
	Col  int
}

func (p Pos) String() string {
	f := p.File
	if f == "" {
		f = "<input>"
	}
	return fmt.Sprintf("%s:%d:%d", f, p.Line, p.Col)
}

// Shift returns the position n characters further on the same line.
func (p Pos) Shift(n int) Pos { p.Col += n; return p }

// Error is an input error at a position.
type Error struct {
	Pos Pos
	Msg string
}

func (e *Error) Error() string {
	if e.Pos == (Pos{}) {
		return e.Msg // a summary such as "and 12 more errors"
	}
	return e.Pos.String() + ": " + e.Msg
}

// ErrorList collects input errors so that a user sees all of them at once.
type ErrorList []*Error

// Add appends an error.
func (l *ErrorList) Add(pos Pos, format string, args ...any) {
	*l = append(*l, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...)})
}

// Sort orders the errors by position.
func (l ErrorList) Sort() {
	sort.SliceStable(l, func(i, j int) bool {
		a, b := l[i].Pos, l[j].Pos
		if (a == Pos{}) || (b == Pos{}) {
			return b == Pos{} && a != Pos{} // a summary comes last
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
}

func (l ErrorList) Error() string {
	switch len(l) {
	case 0:
		return "no errors"
	case 1:
		return l[0].Error()
	}
	var b strings.Builder
	for i, e := range l {
		if i > 0 {
			b.WriteString("\n")
		}
		b.WriteString(e.Error())
	}
	return b.String()
}

// Err returns the list as an error, or nil when it is empty.
func (l ErrorList) Err() error {
	if len(l) == 0 {
		return nil
	}
	l.Sort()
	return l
}

// TokenKind classifies a token.
type TokenKind int

// Token kinds.
const (
	EOF TokenKind = iota
	Name
	Number
	Op // one of + - * / ^ ( ) = , ' [ ] < > <= >=
	Invalid
)

// Token is one lexical item of a line.
type Token struct {
	Kind TokenKind
	Text string
	Pos  Pos
}

func (t Token) String() string {
	switch t.Kind {
	case EOF:
		return "end of line"
	case Name:
		return fmt.Sprintf("name %q", t.Text)
	case Number:
		return fmt.Sprintf("number %s", t.Text)
	}
	return fmt.Sprintf("%q", t.Text)
}

// ScanLine is Scan within limits: a line longer than lim.LineLength bytes, a
// number literal with more than lim.Digits digits, or parentheses and signs
// nested deeper than the parser allows (see ExprParser) is an error, found
// without scanning the rest of the line.
func ScanLine(line string, start Pos, lim Limits) ([]Token, *Error) {
	lim = lim.WithDefaults()
	if len(line) > lim.LineLength {
		return nil, &Error{Pos: start, Msg: Exceeded("line-length", fmt.Sprintf("line of %d bytes", len(line)), lim.LineLength)}
	}
	// The nesting is the open parentheses plus the signs in a row before
	// the current token: never more than the parser's depth, plus one for
	// a binary sign, so the parser would refuse whatever this refuses.
	parens, signs := 0, 0
	var err *Error
	toks := scan(line, start, func(t Token) bool {
		switch {
		case t.Kind == Number && len(t.Text) > lim.Digits:
			if n := countDigits(t.Text); n > lim.Digits {
				err = &Error{Pos: t.Pos, Msg: Exceeded("digits", fmt.Sprintf("number literal of %d digits", n), lim.Digits)}
				return false
			}
		case t.Kind == Op && t.Text == "(":
			parens++
		case t.Kind == Op && t.Text == ")":
			parens = max(parens-1, 0)
		}
		if t.Kind == Op && (t.Text == "+" || t.Text == "-") {
			signs++
		} else {
			signs = 0
		}
		if parens+signs > lim.Depth+1 {
			err = &Error{Pos: t.Pos, Msg: Exceeded("depth", fmt.Sprintf("parentheses or signs nested more than %d deep", lim.Depth), lim.Depth)}
			return false
		}
		return true
	})
	if err != nil {
		return nil, err
	}
	return toks, nil
}

func countDigits(s string) int {
	n := 0
	for i := 0; i < len(s); i++ {
		if s[i] >= '0' && s[i] <= '9' {
			n++
		}
	}
	return n
}

// InvalidChar describes the text of an Invalid token for an error message:
// a byte that is not UTF-8, or the character with its code point.
func InvalidChar(text string) string {
	if !utf8.ValidString(text) {
		return fmt.Sprintf("invalid UTF-8 byte 0x%02x (the input must be UTF-8 text)", text[0])
	}
	r, _ := utf8.DecodeRuneInString(text)
	return fmt.Sprintf("unexpected character %q (U+%04X)", text, r)
}

// Scan splits one line (without its newline, comments already removed or
// not) into tokens; the position of the first character is start. A "#"
// ends the line. Invalid characters become Invalid tokens.
func Scan(line string, start Pos) []Token { return scan(line, start, nil) }

// scan is Scan that calls keep, when not nil, with each token and stops
// (returning nil) when it returns false.
func scan(line string, start Pos, keep func(Token) bool) []Token {
	toks := make([]Token, 0, min(len(line)/2+2, 4096))
	col := 0
	i := 0
	checked := 0 // tokens passed to keep; an iteration adds at most one
	for i < len(line) {
		if keep != nil && len(toks) > checked {
			if !keep(toks[len(toks)-1]) {
				return nil
			}
			checked = len(toks)
		}
		r, w := utf8.DecodeRuneInString(line[i:])
		pos := start.Shift(col)
		switch {
		case r == utf8.RuneError && w == 1:
			// Not UTF-8: keep the byte itself so that the error can name it.
			toks = append(toks, Token{Invalid, line[i : i+1], pos})
		case r == '#':
			i = len(line)
			continue
		case unicode.IsSpace(r):
			i += w
			col++
			continue
		case r == '_' || unicode.IsLetter(r):
			j, n := i, 0
			for j < len(line) {
				r2, w2 := utf8.DecodeRuneInString(line[j:])
				if r2 != '_' && !unicode.IsLetter(r2) && !unicode.IsDigit(r2) {
					break
				}
				j += w2
				n++
			}
			toks = append(toks, Token{Name, line[i:j], pos})
			i, col = j, col+n
			continue
		case r >= '0' && r <= '9' || r == '.':
			j := i
			for j < len(line) && (line[j] >= '0' && line[j] <= '9' || line[j] == '.') {
				j++
			}
			if j < len(line) && (line[j] == 'e' || line[j] == 'E') {
				k := j + 1
				if k < len(line) && (line[k] == '+' || line[k] == '-') {
					k++
				}
				if k < len(line) && line[k] >= '0' && line[k] <= '9' {
					for k < len(line) && line[k] >= '0' && line[k] <= '9' {
						k++
					}
					j = k
				}
			}
			toks = append(toks, Token{Number, line[i:j], pos})
			col += j - i
			i = j
			continue
		case strings.HasPrefix(line[i:], "<=") || strings.HasPrefix(line[i:], ">="):
			toks = append(toks, Token{Op, line[i : i+2], pos})
			i += 2
			col += 2
			continue
		case strings.ContainsRune("+-*/^()=,'[]<>", r):
			toks = append(toks, Token{Op, line[i : i+w], pos}) // the rune's own text
		case r == '′' || r == '’':
			toks = append(toks, Token{Op, "'", pos})
		default:
			toks = append(toks, Token{Invalid, string(r), pos})
		}
		i += w
		col++
	}
	if keep != nil && len(toks) > checked && !keep(toks[len(toks)-1]) {
		return nil
	}
	toks = append(toks, Token{EOF, "", start.Shift(col)})
	return toks
}

// Errors collects input errors up to a maximum and counts the rest, so that
// a file of a million bad lines costs neither a million messages nor the
// memory to hold them.
type Errors struct {
	List    ErrorList // the errors kept, in the order found
	Max     int       // how many to keep; 0 keeps all
	Dropped int       // how many were found beyond Max
	Stopped bool      // the reader stopped at a full list (see Stop): Dropped is a lower bound
}

// Full reports that many more errors were found than are kept (a thousand
// more): a reader may stop there (see Stop) rather than spend the time to
// count the rest of a file of a million bad lines. Below that the count is
// exact.
func (e *Errors) Full() bool { return e.Max > 0 && e.Dropped >= errorsCounted }

// errorsCounted is how many errors beyond the kept ones a reader counts
// before it may stop.
const errorsCounted = 1000

// Stop records that the reader stopped at a full list, so that Err says
// "and more errors" without a count.
func (e *Errors) Stop() { e.Stopped = true }

// Add records an error at pos.
func (e *Errors) Add(pos Pos, format string, args ...any) {
	if e.Max > 0 && len(e.List) >= e.Max {
		e.Dropped++
		return
	}
	e.List.Add(pos, format, args...)
}

// Append records err.
func (e *Errors) Append(err *Error) {
	if e.Max > 0 && len(e.List) >= e.Max {
		e.Dropped++
		return
	}
	e.List = append(e.List, err)
}

// Len returns the number of errors found, kept or not.
func (e *Errors) Len() int { return len(e.List) + e.Dropped }

// Err returns the errors kept, sorted by position, followed by one entry
// "and K more errors" (an Error without a position) when some were dropped;
// nil when there are none.
func (e *Errors) Err() error {
	if e.Len() == 0 {
		return nil
	}
	l := slices.Clone(e.List)
	l.Sort()
	if e.Dropped > 0 {
		msg := fmt.Sprintf("and %d more errors", e.Dropped)
		switch {
		case e.Stopped:
			msg = fmt.Sprintf("and at least %d more errors (reading stopped there; see more with --limit errors=N)", e.Dropped)
		case e.Dropped == 1:
			msg = "and 1 more error"
		}
		l = append(l, &Error{Msg: msg})
	}
	return l
}

// Truncate returns l sorted by position with at most n errors, followed by
// an entry "and K more errors" when it had more; l itself when n <= 0.
func (l ErrorList) Truncate(n int) ErrorList {
	if n <= 0 || len(l) <= n {
		return l
	}
	e := Errors{List: slices.Clone(l)}
	e.List.Sort()
	e.Dropped = len(e.List) - n
	e.List = e.List[:n]
	return e.Err().(ErrorList)
}
