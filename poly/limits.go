package poly

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync/atomic"
)

// Limits bounds what reading one input may cost, so that hostile input
// (a huge literal, a tower of powers, parentheses nested a million deep, a
// file of a million bad lines) ends in an input error instead of a crash, a
// hang or an exhausted memory. Each limit has a name, used on the command
// line as --limit NAME=VALUE (see SetLimit and LimitNames).
//
// A zero field means the default (see DefaultLimits), so the zero Limits is
// the default limits.
//
// The limits are consistent with the canonical printer: every expression the
// parser accepts prints as text that the parser accepts again under the same
// limits. For that the written exponent may reach the degree (x^80 is the
// canonical text of (x^2)^40), and a literal may have as many digits as a
// folded constant of ConstBits bits (Validate checks both).
type Limits struct {
	InputBytes int // "input-bytes": bytes of one input (a model file)
	LineLength int // "line-length": bytes of one line
	Depth      int // "depth": nesting depth of parentheses and signs in an expression
	Digits     int // "digits": digits of one number literal
	ConstBits  int // "const-bits": bits of the numerator or denominator of any constant or coefficient
	Exponent   int // "exponent": the exponent written after ^
	Degree     int // "degree": total degree of a numerator or denominator, also after composition
	Terms      int // "terms": terms of one polynomial, and term products of one multiplication
	Work       int // "work": term products (weighted by coefficient size) spent on one expression
	States     int // "states": state variables of a model
	Params     int // "params": parameters of a model
	Errors     int // "errors": errors reported; the rest are counted
}

// limitSpec describes one limit: its name, its field, its default, the
// largest value it may be raised to, and what it bounds.
type limitSpec struct {
	name  string
	field func(*Limits) *int
	def   int
	max   int
	doc   string
}

// The largest degree keeps a product of two polynomials of that degree within
// the 16-bit exponents of a monomial key (see key).
const maxDegreeCap = 1 << 14

var limitSpecs = []limitSpec{
	{"input-bytes", func(l *Limits) *int { return &l.InputBytes }, 4 << 20, 1 << 30, "bytes of one input file"},
	{"line-length", func(l *Limits) *int { return &l.LineLength }, 1 << 20, 1 << 30, "bytes of one line"},
	{"depth", func(l *Limits) *int { return &l.Depth }, 256, 100000, "nesting depth of parentheses and signs"},
	{"digits", func(l *Limits) *int { return &l.Digits }, 10000, 1 << 24, "digits of one number literal"},
	{"const-bits", func(l *Limits) *int { return &l.ConstBits }, 1 << 15, 1 << 26, "bits of a numerator or denominator of a constant"},
	{"exponent", func(l *Limits) *int { return &l.Exponent }, 256, maxDegreeCap, "exponent written after ^"},
	{"degree", func(l *Limits) *int { return &l.Degree }, 256, maxDegreeCap, "total degree of a polynomial"},
	{"terms", func(l *Limits) *int { return &l.Terms }, 200000, 1 << 28, "terms of a polynomial, term products of one multiplication"},
	{"work", func(l *Limits) *int { return &l.Work }, 4000000, 1 << 40, "weighted term products spent on one expression"},
	{"states", func(l *Limits) *int { return &l.States }, 100, 10000, "state variables"},
	{"params", func(l *Limits) *int { return &l.Params }, 100, 10000, "parameters"},
	{"errors", func(l *Limits) *int { return &l.Errors }, 20, 1 << 20, "errors reported"},
}

// DefaultLimits returns the default limits, every field set: those of
// SetDefaultLimits when it was called, else the built-in ones.
func DefaultLimits() Limits {
	if l := processLimits.Load(); l != nil {
		return *l
	}
	return builtinLimits()
}

func builtinLimits() Limits {
	var l Limits
	for _, s := range limitSpecs {
		*s.field(&l) = s.def
	}
	return l
}

// processLimits, when set, replaces the built-in defaults.
var processLimits atomic.Pointer[Limits]

// SetDefaultLimits makes l (its zero fields the built-in defaults) the
// default limits of every reader in the process that is given no limits of
// its own: the model parser, the expression reader, and the model text
// inside a certificate that the kernel re-reads. It is for a command line's
// --limit flags, set once before any reading; it returns the error of
// Validate and then changes nothing.
func SetDefaultLimits(l Limits) error {
	for _, s := range limitSpecs {
		if p := s.field(&l); *p == 0 {
			*p = s.def
		}
	}
	if err := l.Validate(); err != nil {
		return err
	}
	processLimits.Store(&l)
	return nil
}

// LimitNames returns the names of the limits, in the order of Limits' fields.
func LimitNames() []string {
	out := make([]string, len(limitSpecs))
	for i, s := range limitSpecs {
		out[i] = s.name
	}
	return out
}

// LimitHelp returns one line per limit: its name, its default and what it
// bounds, for a command's help text.
func LimitHelp() string {
	var b strings.Builder
	for _, s := range limitSpecs {
		fmt.Fprintf(&b, "%-12s %10d  %s\n", s.name, s.def, s.doc)
	}
	return b.String()
}

// WithDefaults returns l with every zero field set to its default.
func (l Limits) WithDefaults() Limits {
	d := DefaultLimits()
	for _, s := range limitSpecs {
		if p := s.field(&l); *p == 0 {
			*p = *s.field(&d)
		}
	}
	return l
}

// Get returns the value of the named limit (its default when the field is
// zero) and whether the name is known.
func (l Limits) Get(name string) (int, bool) {
	l = l.WithDefaults()
	for _, s := range limitSpecs {
		if s.name == name {
			return *s.field(&l), true
		}
	}
	return 0, false
}

// SetLimit parses "NAME=VALUE" (the argument of --limit) and sets that limit
// in l. The value is a positive integer, at most the limit's cap; the result
// must pass Validate.
func (l *Limits) SetLimit(arg string) error {
	name, val, ok := strings.Cut(arg, "=")
	name, val = strings.TrimSpace(name), strings.TrimSpace(val)
	if !ok || name == "" {
		return fmt.Errorf("--limit %q: expected NAME=VALUE with NAME one of %s", arg, strings.Join(LimitNames(), ", "))
	}
	for _, s := range limitSpecs {
		if s.name != name {
			continue
		}
		n, err := strconv.ParseInt(val, 10, 64)
		if err != nil || n <= 0 {
			return fmt.Errorf("--limit %s: %q is not a positive integer", name, val)
		}
		if n > int64(s.max) {
			return fmt.Errorf("--limit %s: %d is above the largest allowed value %d", name, n, s.max)
		}
		*s.field(l) = int(n)
		return nil
	}
	return fmt.Errorf("--limit %q: unknown limit %q; the limits are %s", arg, name, strings.Join(LimitNames(), ", "))
}

// ParseLimits applies every "NAME=VALUE" of args to the default limits, in
// order, and validates the result.
func ParseLimits(args []string) (Limits, error) {
	l := builtinLimits()
	for _, a := range args {
		if err := l.SetLimit(a); err != nil {
			return Limits{}, err
		}
	}
	return l, l.Validate()
}

// digitsFor returns the decimal digits of a number of the given bits.
func digitsFor(bits int) int { return int(math.Ceil(float64(bits)*math.Log10(2))) + 1 }

// Validate reports limits out of range or inconsistent with the canonical
// printer (see Limits).
func (l Limits) Validate() error {
	l = l.WithDefaults()
	for _, s := range limitSpecs {
		if v := *s.field(&l); v < 0 || v > s.max {
			return fmt.Errorf("limit %s=%d is outside 1..%d", s.name, v, s.max)
		}
	}
	if l.Exponent < l.Degree {
		return fmt.Errorf("limit exponent=%d is below degree=%d: canonical text writes powers up to the degree, so raise exponent with it", l.Exponent, l.Degree)
	}
	if d := digitsFor(l.ConstBits); l.Digits < d {
		return fmt.Errorf("limit digits=%d is below the %d digits of a constant of const-bits=%d: canonical text writes such constants, so raise digits with it", l.Digits, d, l.ConstBits)
	}
	if l.LineLength > l.InputBytes {
		return fmt.Errorf("limit line-length=%d is above input-bytes=%d", l.LineLength, l.InputBytes)
	}
	return nil
}

// Exceeded returns the message for a limit reached: what was found, the
// limit's name and value, and the flag that raises it.
func Exceeded(name, found string, limit int) string {
	return fmt.Sprintf("%s, above the limit %s=%d (raise it with --limit %s=N)", found, name, limit, name)
}

// IsExceeded reports that msg contains a message of Exceeded: a limit was
// reached, rather than the input found wrong.
func IsExceeded(msg string) bool { return strings.Contains(msg, "(raise it with --limit ") }
