package poly

import (
	"fmt"
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

func (e *Error) Error() string { return e.Pos.String() + ": " + e.Msg }

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

// Scan splits one line (without its newline, comments already removed or
// not) into tokens; the position of the first character is start. A "#"
// ends the line. Invalid characters become Invalid tokens.
func Scan(line string, start Pos) []Token {
	toks := make([]Token, 0, len(line)/2+2)
	col := 0
	i := 0
	for i < len(line) {
		r, w := utf8.DecodeRuneInString(line[i:])
		pos := start.Shift(col)
		switch {
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
	toks = append(toks, Token{EOF, "", start.Shift(col)})
	return toks
}
