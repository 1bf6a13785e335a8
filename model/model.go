package model

import (
	"errors"
	"fmt"
	"maps"
	"math/big"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/lyacert/lyacert/poly"
)

// Param is a declared parameter with its assumed range.
type Param struct {
	Name  string
	Range poly.Interval // the allowed values; a point when fixed
	Fixed *big.Rat      // the value when fixed (by "= c" or by Set)
	Pos   poly.Pos
}

// Model is a parsed model. Fixed parameters and let names are substituted;
// the ring holds the states followed by the free parameters.
type Model struct {
	File        string
	Description []string // the comment lines before the first declaration
	States      []string
	StatePos    []poly.Pos
	Params      []Param
	Discrete    bool
	Ring        *poly.Ring
	F           []poly.RatFunc // right-hand sides (x' = F or x+ = F), in state order
	FPos        []poly.Pos
	V           *poly.RatFunc // the candidate, nil when absent
	VPos        poly.Pos
	At          []poly.RatFunc // the equilibrium, in the parameters; zeros when absent
	AtGiven     bool
	AtPos       poly.Pos
}

// FreeParams returns the parameters that are not fixed, in declaration order.
func (m *Model) FreeParams() []Param {
	var out []Param
	for _, p := range m.Params {
		if p.Fixed == nil {
			out = append(out, p)
		}
	}
	return out
}

// Box returns the parameter box indexed like the ring's variables: nil
// (unconstrained) intervals for states, the assumed range for each free
// parameter.
func (m *Model) Box() []poly.Interval {
	box := make([]poly.Interval, m.Ring.NumVars())
	for i := range box {
		box[i] = poly.Entire()
	}
	for _, p := range m.FreeParams() {
		i, _ := m.Ring.Index(p.Name)
		box[i] = p.Range
	}
	return box
}

// Param returns the named parameter.
func (m *Model) Param(name string) (Param, bool) {
	for _, p := range m.Params {
		if p.Name == name {
			return p, true
		}
	}
	return Param{}, false
}

// ParamValues reads values of free parameters, each an exact rational
// (poly.ParseRat) inside the parameter's range, indexed like the ring's
// variables. The first bad entry in name order is the error.
func (m *Model) ParamValues(vals map[string]string) (map[int]*big.Rat, error) {
	out := map[int]*big.Rat{}
	for _, name := range slices.Sorted(maps.Keys(vals)) {
		p, ok := m.Param(name)
		i, isVar := m.Ring.Index(name)
		if !ok || !isVar || p.Fixed != nil {
			return nil, fmt.Errorf("%s is not a free parameter", name)
		}
		v, ok := poly.ParseRat(vals[name])
		if !ok || !p.Range.Contains(v) {
			return nil, fmt.Errorf("%s = %s does not lie in %s", name, vals[name], p.Range)
		}
		out[i] = v
	}
	return out, nil
}

// keywords cannot name a state or a parameter. The old spellings "param"
// and "next" stay reserved, so that a line written with them is always
// recognized and answered with the new spelling.
var keywords = []string{"state", "parameter", "let", "at", "V", "in", "param", "next"}

// Old spellings of declarations, answered with an error naming the new one.
const (
	oldParamMsg = "`param` is now written `parameter`"
	oldNextMsg  = "`next %s = ...` is now written `%s+ = ...` (the successor state %s⁺)"
)

// isOldNext reports a line "next name = ...", the old spelling of "name+ = ...".
func isOldNext(toks []poly.Token) bool {
	return len(toks) > 2 && toks[0].Kind == poly.Name && toks[0].Text == "next" &&
		toks[1].Kind == poly.Name && isOp(toks[2], "=")
}

// plainStart reports, without scanning the line, that its first token is a
// name other than the keywords that start the lines of pass 1 (state,
// parameter, param, next): an ASCII word not followed by more of a name.
// False means "scan it to know".
func plainStart(text string) bool {
	text = strings.TrimLeft(text, " \t")
	j := 0
	for j < len(text) {
		c := text[j]
		if c == '_' || 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || j > 0 && '0' <= c && c <= '9' {
			j++
			continue
		}
		break
	}
	if j == 0 || j < len(text) && text[j] >= utf8.RuneSelf {
		return false
	}
	switch text[:j] {
	case "state", "parameter", "param", "next":
		return false
	}
	return true
}

// isDecl reports a "state" or "parameter" line (or the old "param"), read in
// pass 1.
func isDecl(toks []poly.Token) bool {
	t := toks[0]
	return t.Kind == poly.Name && (t.Text == "state" || t.Text == "parameter" || t.Text == "param") && !isAssign(toks)
}

// Setting fixes a parameter from the command line (--set name=value).
type Setting struct {
	Name  string
	Value *big.Rat
}

// ParseSetting reads "name=value" with an exact number or constant expression value.
func ParseSetting(s string) (Setting, error) {
	name, val, ok := strings.Cut(s, "=")
	name = strings.TrimSpace(name)
	if !ok || name == "" {
		return Setting{}, fmt.Errorf("--set %q: expected name=value", s)
	}
	v, err := poly.ParseConstant(strings.TrimSpace(val), poly.Pos{File: "--set", Line: 1, Col: len(name) + 2})
	if err != nil {
		return Setting{}, fmt.Errorf("--set %s: %w", name, err)
	}
	return Setting{name, v}, nil
}

type line struct {
	text string
	pos  poly.Pos
}

// Parse reads a model from src within the default limits; file names
// positions in errors. Settings fix parameters (they must lie in the declared
// range). The errors found are returned together as a poly.ErrorList: the
// first ones (see poly.Limits.Errors) sorted by position, then an entry
// "and K more errors" when there were more.
func Parse(file string, src []byte, settings ...Setting) (*Model, error) {
	return ParseWithLimits(file, src, poly.Limits{}, settings...)
}

// ParseWithLimits is Parse within the given limits (zero fields are the
// defaults). A limit reached is an input error at the place where it was
// reached, naming the limit and the flag that raises it. Besides bounding
// each expression, it refuses a model whose derived polynomials (V̇ or ΔV,
// the residuals at the equilibrium, the shift to it) would exceed the degree
// or terms limits, and one whose canonical text would not be read back under
// the same limits.
//
// A UTF-8 byte-order mark at the start is skipped; lines may end in CRLF.
func ParseWithLimits(file string, src []byte, lim poly.Limits, settings ...Setting) (*Model, error) {
	lim = lim.WithDefaults()
	if err := lim.Validate(); err != nil {
		return nil, err
	}
	return parse(file, src, lim, true, settings...)
}

// parse is ParseWithLimits; canonical asks for the canonical text to be
// read back (see checkCanonical).
func parse(file string, src []byte, lim poly.Limits, canonical bool, settings ...Setting) (*Model, error) {
	errs := &poly.Errors{Max: lim.Errors}
	start := poly.Pos{File: file, Line: 1, Col: 1}
	if len(src) > lim.InputBytes {
		errs.Add(start, "%s", poly.Exceeded("input-bytes", fmt.Sprintf("input of %d bytes", len(src)), lim.InputBytes))
		return nil, errs.Err()
	}
	if len(src) >= 2 && (src[0] == 0xff && src[1] == 0xfe || src[0] == 0xfe && src[1] == 0xff) {
		errs.Add(start, "the input is UTF-16 text (it starts with a UTF-16 byte-order mark); save it as UTF-8")
		return nil, errs.Err()
	}
	text := strings.TrimPrefix(string(src), "\ufeff") // a UTF-8 byte-order mark
	m := &Model{File: file}
	// Sized once: growing a slice of a million lines costs more than reading them.
	lines := make([]line, 0, strings.Count(text, "\n")+1)
	seenDecl := false
	scan := func(l line) []poly.Token {
		toks, err := poly.ScanLine(l.text, l.pos, lim)
		if err != nil {
			errs.Append(err)
			return nil
		}
		return toks
	}
	// head returns at least the first three tokens of a line (what decides
	// its kind) without scanning all of a long line: tokens that end before
	// the cut are the same as in the whole line.
	head := func(l line) []poly.Token {
		if len(l.text) > 256 {
			cut := 256
			for cut < len(l.text) && !utf8.RuneStart(l.text[cut]) {
				cut++
			}
			if toks := poly.Scan(l.text[:cut], l.pos); len(toks) > 4 {
				return toks[:3]
			}
		}
		return poly.Scan(l.text, l.pos)
	}
	for i := 0; text != ""; i++ {
		if errs.Full() {
			errs.Stop()
			break
		}
		lt, rest, _ := strings.Cut(text, "\n")
		text = rest
		lt = strings.TrimSuffix(lt, "\r")
		l := line{lt, poly.Pos{File: file, Line: i + 1, Col: 1}}
		if len(lt) > lim.LineLength {
			errs.Add(l.pos, "%s", poly.Exceeded("line-length", fmt.Sprintf("line of %d bytes", len(lt)), lim.LineLength))
			seenDecl = true
			continue
		}
		// A line with no token: blank, or a comment (as the scanner sees it).
		if rest := strings.TrimLeftFunc(lt, unicode.IsSpace); rest == "" || rest[0] == '#' {
			if !seenDecl {
				if c, ok := strings.CutPrefix(strings.TrimSpace(lt), "#"); ok {
					m.Description = append(m.Description, strings.TrimSpace(c))
				}
			}
			continue
		}
		seenDecl = true
		lines = append(lines, l)
	}
	if errs.Len() > 0 {
		return nil, errs.Err()
	}

	// Pass 1: states and parameters, wherever they are declared. Lines are
	// scanned again in each pass rather than kept as tokens, which would
	// take ten times the input's memory.
	paramIdx := map[string]int{}
	for _, l := range lines {
		if errs.Full() {
			errs.Stop()
			break
		}
		if plainStart(l.text) {
			continue // neither a declaration nor an old "next" line
		}
		ltoks := head(l)
		t := ltoks[0]
		if t.Kind == poly.Invalid {
			errs.Add(t.Pos, "%s at the start of a declaration", poly.InvalidChar(t.Text))
			continue
		}
		if isOldNext(ltoks) {
			// Reported here, with the other old spellings, rather than
			// after pass 1 has stopped at them.
			errs.Add(t.Pos, oldNextMsg, ltoks[1].Text, ltoks[1].Text, ltoks[1].Text)
			continue
		}
		if !isDecl(ltoks) {
			continue
		}
		if t.Text == "param" {
			// Read as "parameter" as well, so that the error comes alone.
			errs.Add(t.Pos, oldParamMsg)
		}
		if ltoks = scan(l); ltoks == nil {
			continue
		}
		names, rest, ok := nameList(ltoks[1:], errs)
		if !ok {
			continue
		}
		for _, n := range names {
			if n.Text == "inf" {
				errs.Add(n.Pos, "\"inf\" stands for infinity in ranges and cannot name a %s", declKind(t.Text))
				continue
			}
			if t.Text == "state" && len(m.States) >= lim.States {
				errs.Add(n.Pos, "%s", poly.Exceeded("states", fmt.Sprintf("state %d", len(m.States)+1), lim.States))
				break
			}
			if t.Text != "state" && len(m.Params) >= lim.Params && !isParam(paramIdx, n.Text) {
				errs.Add(n.Pos, "%s", poly.Exceeded("params", fmt.Sprintf("parameter %d", len(m.Params)+1), lim.Params))
				break
			}
			if slices.Contains(keywords, n.Text) {
				errs.Add(n.Pos, "%q is a keyword and cannot name a %s", n.Text, declKind(t.Text))
				continue
			}
			if slices.Contains(m.States, n.Text) {
				errs.Add(n.Pos, "%q is already declared as a state", n.Text)
				continue
			}
			if t.Text == "state" {
				if _, dup := paramIdx[n.Text]; dup {
					errs.Add(n.Pos, "%q is already declared as a parameter", n.Text)
					continue
				}
				m.States = append(m.States, n.Text)
				m.StatePos = append(m.StatePos, n.Pos)
			}
		}
		if t.Text == "state" {
			if rest[0].Kind != poly.EOF {
				errs.Add(rest[0].Pos, "expected , or the end of the line after the state names, found %s", rest[0])
			}
			continue
		}
		rng, fixed, ok := parseAssumption(rest, errs, lim)
		if !ok {
			continue
		}
		for _, n := range names {
			if slices.Contains(keywords, n.Text) || slices.Contains(m.States, n.Text) || n.Text == "inf" {
				continue
			}
			if _, seen := paramIdx[n.Text]; !seen && len(m.Params) >= lim.Params {
				break
			}
			j, seen := paramIdx[n.Text]
			if !seen {
				paramIdx[n.Text] = len(m.Params)
				m.Params = append(m.Params, Param{Name: n.Text, Range: rng, Fixed: fixed, Pos: n.Pos})
				continue
			}
			// A repeated declaration narrows the range.
			p := &m.Params[j]
			both, ok := intersect(p.Range, rng)
			if !ok {
				errs.Add(n.Pos, "contradictory range for %s: %s and %s have no value in common", n.Text, p.Range, rng)
				continue
			}
			p.Range = both
			if fixed != nil {
				p.Fixed = fixed
			}
		}
	}
	if len(m.States) == 0 && errs.Len() == 0 {
		errs.Add(poly.Pos{File: file, Line: 1, Col: 1}, "no states: declare them with a line such as \"state x, y\"")
	}
	if len(m.States) == 0 {
		return nil, errs.Err()
	}
	for _, s := range settings {
		j, ok := paramIdx[s.Name]
		if !ok {
			errs.Add(poly.Pos{File: "--set", Line: 1, Col: 1}, "--set %s: no parameter of that name in %s", s.Name, file)
			continue
		}
		p := &m.Params[j]
		if !p.Range.Contains(s.Value) {
			errs.Add(p.Pos, "--set %s=%s lies outside the declared range %s", s.Name, s.Value.RatString(), p.Range)
			continue
		}
		p.Fixed = new(big.Rat).Set(s.Value)
		p.Range = poly.Point(s.Value)
	}
	if errs.Len() > 0 {
		return nil, errs.Err()
	}

	var free []string
	for _, p := range m.Params {
		if p.Fixed == nil {
			free = append(free, p.Name)
		}
	}
	m.Ring = poly.NewRing(m.States, free)
	r := m.Ring
	lets := map[string]poly.RatFunc{}
	env := func(name string) (poly.RatFunc, bool) {
		if v, ok := lets[name]; ok {
			return v, true
		}
		if i, ok := r.Index(name); ok {
			return poly.FromPoly(poly.Var(r, i)), true
		}
		if j, ok := paramIdx[name]; ok && m.Params[j].Fixed != nil {
			return poly.RatConst(r, m.Params[j].Fixed), true
		}
		return poly.RatFunc{}, false
	}
	// One parser for the whole file, so that its work limit bounds the
	// file and not just each expression.
	ep := &poly.ExprParser{Ring: r, Env: env, Limits: lim}
	expr := func(toks []poly.Token) (poly.RatFunc, bool) {
		f, err := ep.ParseTokens(toks)
		if err != nil {
			errs.Append(err.(*poly.Error))
			return f, false
		}
		return f, true
	}

	// Pass 2: everything else, in order (a let must precede its uses).
	m.F = make([]poly.RatFunc, len(m.States))
	m.FPos = make([]poly.Pos, len(m.States))
	have := make([]bool, len(m.States))
	kinds := map[bool]poly.Pos{}
	for _, ln := range lines {
		if errs.Full() {
			errs.Stop()
			break
		}
		if !plainStart(ln.text) {
			if h := head(ln); isDecl(h) || isOldNext(h) {
				continue // read in pass 1
			}
		}
		l := struct{ toks []poly.Token }{scan(ln)}
		if l.toks == nil {
			continue
		}
		t := l.toks[0]
		switch {
		case t.Kind == poly.Name && t.Text == "let" && !isAssign(l.toks):
			if len(l.toks) < 4 || l.toks[1].Kind != poly.Name || !isOp(l.toks[2], "=") {
				errs.Add(l.toks[1].Pos, "expected \"let name = expression\"")
				continue
			}
			n := l.toks[1]
			if _, taken := env(n.Text); taken || slices.Contains(keywords, n.Text) || isParam(paramIdx, n.Text) {
				errs.Add(n.Pos, "%q is already a name in this model", n.Text)
				continue
			}
			if f, ok := expr(l.toks[3:]); ok {
				lets[n.Text] = f
			}
		case t.Kind == poly.Name && t.Text == "V" && len(l.toks) > 1 && isOp(l.toks[1], "="):
			if m.V != nil {
				errs.Add(t.Pos, "a second candidate V; the first is at %s", m.VPos)
				continue
			}
			if f, ok := expr(l.toks[2:]); ok {
				m.V, m.VPos = &f, t.Pos
			}
		case t.Kind == poly.Name && t.Text == "at" && !isAssign(l.toks):
			if m.AtGiven {
				errs.Add(t.Pos, "a second \"at\"; the first is at %s", m.AtPos)
				continue
			}
			m.parseAt(l.toks[1:], t.Pos, expr, errs)
		case t.Kind == poly.Name && len(l.toks) > 2 && (isOp(l.toks[1], "'") || isOp(l.toks[1], "+")) && isOp(l.toks[2], "="):
			discrete := isOp(l.toks[1], "+")
			nameTok, rhs := t, l.toks[3:]
			i := slices.Index(m.States, nameTok.Text)
			if i < 0 {
				if isParam(paramIdx, nameTok.Text) {
					errs.Add(nameTok.Pos, "%q is a parameter, not a state; parameters have no equation", nameTok.Text)
				} else {
					errs.Add(nameTok.Pos, "equation for %q, which is not a declared state", nameTok.Text)
				}
				continue
			}
			if have[i] {
				errs.Add(nameTok.Pos, "a second equation for %s; the first is at %s", nameTok.Text, m.FPos[i])
				continue
			}
			if _, ok := kinds[!discrete]; ok {
				errs.Add(t.Pos, "mixes continuous-time (x' = ...) and discrete-time (x+ = ...) equations; use one kind for all states")
				continue
			}
			kinds[discrete] = t.Pos
			m.Discrete = discrete
			if f, ok := expr(rhs); ok {
				m.F[i], m.FPos[i], have[i] = f, nameTok.Pos, true
			}
		default:
			errs.Add(t.Pos, "expected a declaration (state, parameter, let, an equation x' = ... or x+ = ..., V = ..., at ...), found %s", t)
		}
	}
	if errs.Len() > 0 {
		return nil, errs.Err()
	}
	for i, s := range m.States {
		if !have[i] {
			mark := "'"
			if m.Discrete {
				mark = "+"
			}
			errs.Add(m.StatePos[i], "state %s has no equation (write %s%s = ...)", s, s, mark)
		}
	}
	if !m.AtGiven {
		m.At = make([]poly.RatFunc, len(m.States))
		for i := range m.At {
			m.At[i] = poly.FromPoly(poly.Zero(r))
		}
	}
	if errs.Len() > 0 {
		return nil, errs.Err()
	}
	m.checkDenominators(errs)
	if errs.Len() > 0 {
		return nil, errs.Err()
	}
	m.checkDerived(errs, lim)
	if errs.Len() > 0 {
		return nil, errs.Err()
	}
	if m.AtGiven {
		// A stated equilibrium must be one, exactly, for every allowed
		// parameter value. (Without "at", the origin is checked by the
		// commands that assume it; find searches instead.)
		if err := m.CheckEquilibrium(); err != nil {
			var l poly.ErrorList
			if errors.As(err, &l) {
				return nil, l.Truncate(lim.Errors)
			}
			return nil, err
		}
	}
	if canonical && m.Canonical() != text { // text already canonical reads back: it just did
		m.checkCanonical(errs, lim)
		if errs.Len() > 0 {
			return nil, errs.Err()
		}
	}
	return m, nil
}

func isParam(idx map[string]int, name string) bool { _, ok := idx[name]; return ok }

func isOp(t poly.Token, s string) bool { return t.Kind == poly.Op && t.Text == s }

// isAssign reports a line "name = ...", "name' = ..." or "name+ = ...",
// which is never a declaration even when the name is a keyword (a state
// cannot be called so).
func isAssign(toks []poly.Token) bool {
	return len(toks) > 1 && (isOp(toks[1], "=") || isOp(toks[1], "'")) ||
		len(toks) > 2 && isOp(toks[1], "+") && isOp(toks[2], "=")
}

// declKind names what a declaration line declares.
func declKind(keyword string) string {
	if keyword == "state" {
		return "state"
	}
	return "parameter"
}

func nameList(toks []poly.Token, errs *poly.Errors) ([]poly.Token, []poly.Token, bool) {
	var names []poly.Token
	for {
		if toks[0].Kind != poly.Name {
			errs.Add(toks[0].Pos, "expected a name, found %s", toks[0])
			return nil, nil, false
		}
		names = append(names, toks[0])
		toks = toks[1:]
		if !isOp(toks[0], ",") {
			return names, toks, true
		}
		toks = toks[1:]
	}
}

// parseAssumption reads what follows the names of a parameter line.
func parseAssumption(toks []poly.Token, errs *poly.Errors, lim poly.Limits) (poly.Interval, *big.Rat, bool) {
	t := toks[0]
	if t.Kind == poly.EOF {
		return poly.Entire(), nil, true
	}
	num := func(ts []poly.Token) (*big.Rat, bool) {
		r := poly.NewRing(nil, nil)
		p := &poly.ExprParser{Ring: r, Env: func(string) (poly.RatFunc, bool) { return poly.RatFunc{}, false }, Limits: lim}
		f, err := p.ParseTokens(ts)
		if err != nil {
			e := err.(*poly.Error)
			if strings.HasPrefix(e.Msg, "unknown name") {
				e.Msg = "a parameter's range takes constants only: " + e.Msg
			}
			errs.Append(e)
			return nil, false
		}
		return f.Num.ConstTerm(), true
	}
	switch {
	case t.Kind == poly.Op && (t.Text == ">" || t.Text == ">=" || t.Text == "<" || t.Text == "<=" || t.Text == "="):
		c, ok := num(toks[1:])
		if !ok {
			return poly.Interval{}, nil, false
		}
		switch t.Text {
		case ">":
			return mustInterval(poly.Bound{Value: c, Open: true}, poly.Bound{Inf: 1, Open: true}), nil, true
		case ">=":
			return mustInterval(poly.Bound{Value: c}, poly.Bound{Inf: 1, Open: true}), nil, true
		case "<":
			return mustInterval(poly.Bound{Inf: -1, Open: true}, poly.Bound{Value: c, Open: true}), nil, true
		case "<=":
			return mustInterval(poly.Bound{Inf: -1, Open: true}, poly.Bound{Value: c}), nil, true
		}
		return poly.Point(c), c, true
	case t.Kind == poly.Name && t.Text == "in":
		open := toks[1]
		if !isOp(open, "[") && !isOp(open, "(") {
			errs.Add(open.Pos, "expected [ or ( after \"in\", found %s", open)
			return poly.Interval{}, nil, false
		}
		// Find the comma and the closing bracket at depth zero.
		depth, comma, end := 0, -1, -1
		for i := 2; i < len(toks); i++ {
			switch {
			case isOp(toks[i], "("):
				depth++
			case isOp(toks[i], ")") && depth > 0:
				depth--
			case depth == 0 && isOp(toks[i], ",") && comma < 0:
				comma = i
			case depth == 0 && comma > 0 && (isOp(toks[i], "]") || isOp(toks[i], ")")):
				end = i
			}
			if end > 0 {
				break
			}
		}
		if comma < 0 || end < 0 {
			errs.Add(open.Pos, "expected a range such as [0, 4], (0, 4] or [0, 4)")
			return poly.Interval{}, nil, false
		}
		if toks[end+1].Kind != poly.EOF {
			errs.Add(toks[end+1].Pos, "unexpected %s after the range", toks[end+1])
			return poly.Interval{}, nil, false
		}
		loToks := append(slices.Clone(toks[2:comma]), poly.Token{Kind: poly.EOF, Pos: toks[comma].Pos})
		hiToks := append(slices.Clone(toks[comma+1:end]), poly.Token{Kind: poly.EOF, Pos: toks[end].Pos})
		lo, ok1 := boundOf(loToks, num, -1, errs)
		hi, ok2 := boundOf(hiToks, num, 1, errs)
		if !ok1 || !ok2 {
			return poly.Interval{}, nil, false
		}
		// An infinite end is never attained: [0, inf] is a slip for [0, inf).
		if lo.Inf != 0 && isOp(open, "[") {
			errs.Add(open.Pos, "an infinite end is open: write ( before -inf, not [")
			return poly.Interval{}, nil, false
		}
		if hi.Inf != 0 && isOp(toks[end], "]") {
			errs.Add(toks[end].Pos, "an infinite end is open: write ) after inf, not ]")
			return poly.Interval{}, nil, false
		}
		lo.Open = lo.Inf != 0 || isOp(open, "(")
		hi.Open = hi.Inf != 0 || isOp(toks[end], ")")
		iv, err := poly.NewInterval(lo, hi)
		if err != nil {
			errs.Add(open.Pos, "empty range: no number lies in %s%s, %s%s", open.Text, tokText(loToks), tokText(hiToks), toks[end].Text)
			return poly.Interval{}, nil, false
		}
		if iv.Lo.Inf == 0 && iv.Hi.Inf == 0 && iv.Lo.Value.Cmp(iv.Hi.Value) == 0 {
			return iv, new(big.Rat).Set(iv.Lo.Value), true
		}
		return iv, nil, true
	}
	errs.Add(t.Pos, "expected a range after the parameter names (> c, >= c, < c, <= c, = c, or in [a, b]), found %s", t)
	return poly.Interval{}, nil, false
}

func tokText(ts []poly.Token) string {
	var parts []string
	for _, t := range ts {
		if t.Kind != poly.EOF {
			parts = append(parts, t.Text)
		}
	}
	return strings.Join(parts, "")
}

func boundOf(ts []poly.Token, num func([]poly.Token) (*big.Rat, bool), inf int, errs *poly.Errors) (poly.Bound, bool) {
	if len(ts) == 2 && ts[0].Kind == poly.Name && ts[0].Text == "inf" {
		if inf < 0 {
			errs.Add(ts[0].Pos, "a lower end of +inf leaves the range empty; write -inf")
			return poly.Bound{}, false
		}
		return poly.Bound{Inf: 1, Open: true}, true
	}
	if len(ts) == 3 && isOp(ts[0], "-") && ts[1].Kind == poly.Name && ts[1].Text == "inf" {
		if inf > 0 {
			errs.Add(ts[0].Pos, "an upper end of -inf leaves the range empty; write inf")
			return poly.Bound{}, false
		}
		return poly.Bound{Inf: -1, Open: true}, true
	}
	c, ok := num(ts)
	if !ok {
		return poly.Bound{}, false
	}
	return poly.Bound{Value: c}, true
}

func mustInterval(lo, hi poly.Bound) poly.Interval {
	iv, err := poly.NewInterval(lo, hi)
	if err != nil {
		panic(err)
	}
	return iv
}

// intersect returns x ∩ y and whether it is non-empty.
func intersect(x, y poly.Interval) (poly.Interval, bool) {
	lo, hi := x.Lo, x.Hi
	if cmpLo(y.Lo, lo) > 0 {
		lo = y.Lo
	}
	if cmpHi(y.Hi, hi) < 0 {
		hi = y.Hi
	}
	iv, err := poly.NewInterval(lo, hi)
	return iv, err == nil
}

// cmpLo orders lower ends: a larger value, or the same value open, is tighter.
func cmpLo(a, b poly.Bound) int {
	if a.Inf != b.Inf || a.Inf != 0 {
		return a.Inf - b.Inf
	}
	if c := a.Value.Cmp(b.Value); c != 0 {
		return c
	}
	switch {
	case a.Open == b.Open:
		return 0
	case a.Open:
		return 1
	}
	return -1
}

func cmpHi(a, b poly.Bound) int {
	if a.Inf != b.Inf || a.Inf != 0 {
		return a.Inf - b.Inf
	}
	if c := a.Value.Cmp(b.Value); c != 0 {
		return c
	}
	switch {
	case a.Open == b.Open:
		return 0
	case a.Open:
		return -1
	}
	return 1
}

func (m *Model) parseAt(toks []poly.Token, pos poly.Pos, expr func([]poly.Token) (poly.RatFunc, bool), errs *poly.Errors) {
	m.AtGiven, m.AtPos = true, pos
	r := m.Ring
	m.At = make([]poly.RatFunc, len(m.States))
	set := make([]bool, len(m.States))
	for len(toks) > 0 && toks[0].Kind != poly.EOF {
		n := toks[0]
		if n.Kind != poly.Name || len(toks) < 3 || !isOp(toks[1], "=") {
			errs.Add(n.Pos, "expected \"state = value\" in \"at\", found %s", n)
			return
		}
		// The value runs to the next comma at depth zero.
		depth, end := 0, 2
		for ; toks[end].Kind != poly.EOF; end++ {
			if isOp(toks[end], "(") {
				depth++
			} else if isOp(toks[end], ")") {
				depth--
			} else if depth == 0 && isOp(toks[end], ",") {
				break
			}
		}
		vt := append(slices.Clone(toks[2:end]), poly.Token{Kind: poly.EOF, Pos: toks[end].Pos})
		i := slices.Index(m.States, n.Text)
		switch {
		case i < 0:
			errs.Add(n.Pos, "%q in \"at\" is not a state", n.Text)
		case set[i]:
			errs.Add(n.Pos, "%s is given twice in \"at\"", n.Text)
		default:
			if f, ok := expr(vt); ok {
				if f.DegreeIn(r.StateMask()) > 0 {
					errs.Add(vt[0].Pos, "the equilibrium may depend on parameters, not on states")
				} else {
					m.At[i], set[i] = f, true
				}
			}
		}
		toks = toks[end:]
		if isOp(toks[0], ",") {
			toks = toks[1:]
		}
	}
	for i, s := range m.States {
		if !set[i] && errs.Len() == 0 {
			errs.Add(pos, "\"at\" gives no value for state %s", s)
		}
	}
}

// checkDenominators requires every parameter expression that divides to be
// kept away from zero by the assumptions.
func (m *Model) checkDenominators(errs *poly.Errors) {
	box := m.Box()
	check := func(f poly.RatFunc, pos poly.Pos, what string) {
		for _, d := range f.Den {
			if d.P.Enclose(box).ContainsZero() {
				errs.Add(pos, "%s divides by %s, which the assumptions do not keep away from zero; narrow the parameter's range (for example parameter %s > 0)", what, d.P, d.P.String())
			}
		}
	}
	for i, f := range m.F {
		mark := "'"
		if m.Discrete {
			mark = "+"
		}
		check(f, m.FPos[i], m.States[i]+mark)
	}
	if m.V != nil {
		check(*m.V, m.VPos, "V")
	}
	for i, f := range m.At {
		check(f, m.AtPos, "the equilibrium's "+m.States[i])
	}
}

// EquilibriumEquations returns g with g(x) = 0 exactly at the equilibria:
// g = f for continuous time, g = f − x for discrete time. Every f must be a
// polynomial (a model without free parameters has no denominators).
func EquilibriumEquations(f []poly.RatFunc, discrete bool) ([]*poly.Poly, error) {
	g := make([]*poly.Poly, len(f))
	for i, fi := range f {
		if !fi.IsPoly() {
			return nil, fmt.Errorf("equation %d has a denominator", i+1)
		}
		g[i] = fi.Num.Clone()
		if discrete {
			g[i].Sub(g[i], poly.Var(fi.Ring(), i))
		}
	}
	return g, nil
}
