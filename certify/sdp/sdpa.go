package sdp

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// MaxEntries bounds the number of matrix entries ReadSDPA accepts.
const MaxEntries = 5_000_000

// maxLine bounds the length of one line of an SDPA file.
const maxLine = 1 << 20

// ReadSDPA reads a problem in the SDPA sparse format:
//
//	m                      number of constraints
//	nblocks                number of blocks
//	n₁ n₂ …               block orders (negative: diagonal block)
//	b₁ … bₘ               right-hand sides
//	k blk i j v            entry (i, j) of block blk of matrix k (k = 0 is C)
//
// Lines starting with " or * are comments; the separators , ( ) { } count as
// blanks; text after the number on the m and nblocks lines is ignored. The
// problem is read as (P) of the package documentation: C = F₀, Aᵢ = Fᵢ,
// b = c, which is how the format's minimise cᵀx, Σxᵢ Fᵢ − F₀ ⪰ 0 reads as
// a dual. Sizes are checked against MaxConstraints, MaxOrder and MaxEntries
// before anything is allocated from them. Errors name the place as
// name:line:col.
func ReadSDPA(r io.Reader, name string) (*Problem, error) {
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 64*1024), maxLine)
	type tok struct {
		s         string
		line, col int
	}
	line := 0
	var pending []tok
	eof := false
	lastLine, lastCol := 0, 0
	nextLine := func() ([]tok, bool, error) {
		for sc.Scan() {
			line++
			text := sc.Text()
			if t := strings.TrimSpace(text); t == "" || t[0] == '"' || t[0] == '*' {
				continue
			}
			var toks []tok
			start := -1
			for i := 0; i <= len(text); i++ {
				sep := i == len(text) || strings.IndexByte(" \t\r,(){}", text[i]) >= 0
				if sep && start >= 0 {
					toks = append(toks, tok{text[start:i], line, start + 1})
					start = -1
				} else if !sep && start < 0 {
					start = i
				}
			}
			if len(toks) > 0 {
				lastLine, lastCol = line, len(text)+1
				return toks, true, nil
			}
		}
		if err := sc.Err(); err != nil {
			if errors.Is(err, bufio.ErrTooLong) {
				return nil, false, fmt.Errorf("%s:%d: line longer than %d bytes", name, line+1, maxLine)
			}
			return nil, false, fmt.Errorf("%s: %w", name, err)
		}
		return nil, false, nil
	}
	errAt := func(t tok, format string, args ...any) error {
		return fmt.Errorf("%s:%d:%d: %s", name, t.line, t.col, fmt.Sprintf(format, args...))
	}
	endErr := func(what string) error {
		return fmt.Errorf("%s:%d:%d: unexpected end of file, expected %s", name, lastLine, lastCol, what)
	}
	// next returns the next token of the stream (across lines).
	next := func(what string) (tok, error) {
		for len(pending) == 0 {
			if eof {
				return tok{}, endErr(what)
			}
			ts, ok, err := nextLine()
			if err != nil {
				return tok{}, err
			}
			if !ok {
				eof = true
				return tok{}, endErr(what)
			}
			pending = ts
		}
		t := pending[0]
		pending = pending[1:]
		return t, nil
	}
	readInt := func(what string, lo, hi int) (int, tok, error) {
		t, err := next(what)
		if err != nil {
			return 0, t, err
		}
		v, err := strconv.Atoi(t.s)
		if err != nil {
			return 0, t, errAt(t, "expected %s, found %q", what, t.s)
		}
		if v < lo || v > hi {
			return 0, t, errAt(t, "%s %d out of range [%d, %d]", what, v, lo, hi)
		}
		return v, t, nil
	}
	readFloat := func(t tok, what string) (float64, error) {
		s := strings.NewReplacer("D", "e", "d", "e").Replace(t.s) // Fortran exponents
		v, err := strconv.ParseFloat(s, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, errAt(t, "expected a finite number for %s, found %q", what, t.s)
		}
		return v, nil
	}
	m, _, err := readInt("the number of constraints", 0, MaxConstraints)
	if err != nil {
		return nil, err
	}
	pending = nil // rest of the line is a comment
	nb, _, err := readInt("the number of blocks", 1, MaxOrder)
	if err != nil {
		return nil, err
	}
	pending = nil
	p := &Problem{Blocks: make([]int, 0, nb), A: make([]Matrix, m), B: make([]float64, 0, m)}
	total := 0
	for k := 0; k < nb; k++ {
		v, t, err := readInt("a block order", -MaxOrder, MaxOrder)
		if err != nil {
			return nil, err
		}
		if v == 0 {
			return nil, errAt(t, "block order 0")
		}
		total += abs(v)
		if total > MaxOrder {
			return nil, errAt(t, "total block order above %d", MaxOrder)
		}
		p.Blocks = append(p.Blocks, v)
	}
	for i := 0; i < m; i++ {
		t, err := next("a right-hand side")
		if err != nil {
			return nil, err
		}
		v, err := readFloat(t, "a right-hand side")
		if err != nil {
			return nil, err
		}
		p.B = append(p.B, v)
	}
	if len(pending) > 0 {
		return nil, errAt(pending[0], "unexpected %q after the right-hand sides", pending[0].s)
	}
	count := 0
	for {
		ts, ok, err := nextLine()
		if err != nil {
			return nil, err
		}
		if !ok {
			break
		}
		if len(ts) != 5 {
			return nil, errAt(ts[0], "an entry line has 5 fields (matrix block i j value), found %d", len(ts))
		}
		var f [4]int
		for q := 0; q < 4; q++ {
			v, err := strconv.Atoi(ts[q].s)
			if err != nil {
				return nil, errAt(ts[q], "expected an integer, found %q", ts[q].s)
			}
			f[q] = v
		}
		if f[0] < 0 || f[0] > m {
			return nil, errAt(ts[0], "matrix number %d out of range [0, %d]", f[0], m)
		}
		if f[1] < 1 || f[1] > nb {
			return nil, errAt(ts[1], "block number %d out of range [1, %d]", f[1], nb)
		}
		n := abs(p.Blocks[f[1]-1])
		for q := 2; q < 4; q++ {
			if f[q] < 1 || f[q] > n {
				return nil, errAt(ts[q], "index %d out of range [1, %d] of block %d", f[q], n, f[1])
			}
		}
		if p.Blocks[f[1]-1] < 0 && f[2] != f[3] {
			return nil, errAt(ts[2], "off-diagonal entry in diagonal block %d", f[1])
		}
		v, err := readFloat(ts[4], "an entry")
		if err != nil {
			return nil, err
		}
		count++
		if count > MaxEntries {
			return nil, errAt(ts[0], "more than %d entries", MaxEntries)
		}
		i, j := f[2]-1, f[3]-1
		if i > j {
			i, j = j, i
		}
		e := Entry{Block: f[1] - 1, I: i, J: j, V: v}
		if f[0] == 0 {
			p.C = append(p.C, e)
		} else {
			p.A[f[0]-1] = append(p.A[f[0]-1], e)
		}
	}
	return p, nil
}

// WriteSDPA writes p in the SDPA sparse format (see ReadSDPA), numbers in
// the shortest form that reads back exactly.
func WriteSDPA(w io.Writer, p *Problem) error {
	if err := p.Validate(); err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%d\n%d\n", len(p.B), len(p.Blocks))
	for k, n := range p.Blocks {
		if k > 0 {
			bw.WriteByte(' ')
		}
		fmt.Fprintf(bw, "%d", n)
	}
	bw.WriteByte('\n')
	for i, b := range p.B {
		if i > 0 {
			bw.WriteByte(' ')
		}
		bw.WriteString(strconv.FormatFloat(b, 'g', -1, 64))
	}
	bw.WriteByte('\n')
	put := func(k int, m Matrix) {
		for _, e := range m {
			if e.V == 0 {
				continue
			}
			i, j := e.I, e.J
			if i > j {
				i, j = j, i
			}
			fmt.Fprintf(bw, "%d %d %d %d %s\n", k, e.Block+1, i+1, j+1, strconv.FormatFloat(e.V, 'g', -1, 64))
		}
	}
	put(0, p.C)
	for i, a := range p.A {
		put(i+1, a)
	}
	return bw.Flush()
}
