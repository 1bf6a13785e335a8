package sweep

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"slices"

	"github.com/lyacert/lyacert/checker"
)

// OrderedStrings is a JSON object of strings whose keys keep their order.
type OrderedStrings struct {
	Keys, Values []string
}

// MarshalJSON writes the object with the keys in order.
func (o OrderedStrings) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	b.WriteByte('{')
	for i, k := range o.Keys {
		if i > 0 {
			b.WriteByte(',')
		}
		kj, _ := json.Marshal(k)
		vj, _ := json.Marshal(o.Values[i])
		b.Write(kj)
		b.WriteByte(':')
		b.Write(vj)
	}
	b.WriteByte('}')
	return b.Bytes(), nil
}

// UnmarshalJSON reads an object of strings, keeping the key order.
func (o *OrderedStrings) UnmarshalJSON(data []byte) error {
	dec := json.NewDecoder(bytes.NewReader(data))
	t, err := dec.Token()
	if err != nil {
		return err
	}
	if d, ok := t.(json.Delim); !ok || d != '{' {
		return errors.New("expected an object")
	}
	o.Keys, o.Values = nil, nil
	for dec.More() {
		kt, err := dec.Token()
		if err != nil {
			return err
		}
		if slices.Contains(o.Keys, kt.(string)) {
			return fmt.Errorf("the key %q appears twice", kt)
		}
		var v string
		if err := dec.Decode(&v); err != nil {
			return err
		}
		o.Keys = append(o.Keys, kt.(string))
		o.Values = append(o.Values, v)
	}
	_, err = dec.Token()
	return err
}

// Get returns the value of key k.
func (o OrderedStrings) Get(k string) (string, bool) {
	i := slices.Index(o.Keys, k)
	if i < 0 {
		return "", false
	}
	return o.Values[i], true
}

// SweepLine is one line of a sweep's output: one equilibrium at one grid
// point (Eq of Eqs), or, with Eq = Eqs = 0, a grid point where no isolated
// equilibrium was found or the model is undefined. Lines hold no times or
// host names, so that equal inputs give byte-equal lines.
type SweepLine struct {
	Index       int             `json:"index"` // grid point, row-major
	Of          int             `json:"of"`    // grid points in all
	Params      OrderedStrings  `json:"params"`
	Eq          int             `json:"eq"`
	Eqs         int             `json:"eqs"`
	Equilibrium *OrderedStrings `json:"equilibrium"` // decimals; null without one
	Status      string          `json:"status,omitempty"`
	Class       string          `json:"class,omitempty"`
	// Own marks the model's own equilibrium (its "at" point, or the
	// origin): the one whose verdict is the sweep's exit status unless
	// every equilibrium is asked for.
	Own        bool     `json:"own"`
	MaxRealEig *float64 `json:"max_real_eig"`
	// SpectralRadius is the largest |λ| of the map's Jacobian (discrete time).
	SpectralRadius *float64 `json:"spectral_radius,omitempty"`
	Verdict        string   `json:"verdict"`
	Claim          string   `json:"claim"`
	Digest         *string  `json:"certificate_digest"`
	Reason         string   `json:"reason,omitempty"`
	// Sweep is the sweep digest (Identity.Digest) of the sweep that wrote
	// the line.
	Sweep string `json:"sweep_digest"`
	// LineDigest is the digest of the line itself: SHA-256 of the line as
	// Marshal writes it with LineDigest empty (see Seal).
	LineDigest string `json:"line_digest"`
}

// Marshal returns the line as compact JSON with a final newline.
func (l *SweepLine) Marshal() []byte {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(l); err != nil {
		panic(err) // every field is marshalable
	}
	return b.Bytes()
}

// Seal sets the line's digest: LineDigest becomes the SHA-256 of the line
// as Marshal writes it with LineDigest empty. Sweep seals every line it
// writes; Read re-computes the digest of every line it reads.
func (l *SweepLine) Seal() { l.LineDigest = l.contentDigest() }

func (l *SweepLine) contentDigest() string {
	c := *l
	c.LineDigest = ""
	return digestOf(c.Marshal())
}

// MaxEquilibria bounds the "eqs" of a line read back (no sweep finds that
// many isolated equilibria at one point).
const MaxEquilibria = 1 << 16

// Record is one line of a sweep output as read back: its bytes, verbatim
// with the final newline, its fields, and its line number.
type Record struct {
	Raw     []byte
	Line    SweepLine
	LineNum int
}

// Block is the lines of one grid point, in order.
type Block struct {
	Index   int
	Records []Record
}

// Lines returns the fields of the block's lines.
func (b Block) Lines() []SweepLine {
	out := make([]SweepLine, len(b.Records))
	for i, r := range b.Records {
		out[i] = r.Line
	}
	return out
}

// File is a sweep output as read back by Read.
type File struct {
	Name   string
	Blocks []Block // the complete grid points, in file order
	// Good is the byte length of the complete grid points: the bytes after
	// it are an interrupted write (a line without its newline, or a grid
	// point with lines missing at the end).
	Good int
	Size int // the length of the data read
	// Sweep and Of are the sweep digest and the grid size of every line;
	// empty and 0 when there is no complete line.
	Sweep  string
	Of     int
	Params []string // the swept parameters' names, in order
}

// Complete reports whether the file ends with a complete grid point (or is
// empty).
func (f *File) Complete() bool { return f.Good == f.Size }

// Read reads the lines of a sweep output and checks each of them before
// anything is derived from its numbers: the fields are exactly those of a
// SweepLine (nothing unknown, no key twice), "of" is at most MaxGridPoints,
// 0 ≤ index < of, 0 ≤ eq ≤ eqs ≤ MaxEquilibria, the verdict is one of the
// checker's, a verdict other than undecided comes with a certificate digest,
// every digest has the form sha256:<64 hex digits>, the bytes are exactly
// what Marshal writes for the fields (so nothing outside the digested
// fields can change), the line digest matches (see Seal), and every line has
// the same sweep digest, grid size and parameter names as the first.
//
// A line that changed after it was written fails the line-digest check
// unless whoever changed it also recomputed the digest: the digest guards
// against mistakes (hand edits, truncated or damaged copies, lines pasted
// from another file), not against forgery — it holds no secret. What a
// line claims rests on its certificate, re-checked by lyacert verify.
//
// A trailing line without its newline, or a trailing grid point with lines
// missing, is an interrupted write: it is left out of the blocks and its
// bytes lie after Good. Anything else that is not a well-formed sequence of
// sweep lines is an error naming the file and line.
func Read(name string, data []byte) (*File, error) {
	f := &File{Name: name, Size: len(data)}
	var cur *Block
	off := 0
	for n := 1; off < len(data); n++ {
		end := bytes.IndexByte(data[off:], '\n')
		if end < 0 {
			break // a partial last line: an interrupted write
		}
		raw := data[off : off+end+1]
		l, err := parseLine(raw)
		if err != nil {
			return nil, fmt.Errorf("%s:%d: not a sweep line: %w", name, n, err)
		}
		if f.Sweep == "" {
			f.Sweep, f.Of, f.Params = l.Sweep, l.Of, l.Params.Keys
		}
		switch {
		case l.Sweep != f.Sweep:
			return nil, fmt.Errorf("%s:%d: a line of another sweep (sweep digest %s, the first line's is %s)", name, n, l.Sweep, f.Sweep)
		case l.Of != f.Of:
			return nil, fmt.Errorf("%s:%d: a line of a grid of %d points, the first line's grid has %d", name, n, l.Of, f.Of)
		case !slices.Equal(l.Params.Keys, f.Params):
			return nil, fmt.Errorf("%s:%d: the parameters %v differ from the first line's %v", name, n, l.Params.Keys, f.Params)
		}
		newBlock := true
		if cur != nil {
			last := cur.Records[len(cur.Records)-1].Line
			if last.Eq < last.Eqs {
				// The block continues: the next equilibrium of the same point.
				if l.Index != last.Index || l.Eq != last.Eq+1 || l.Eqs != last.Eqs {
					return nil, fmt.Errorf("%s:%d: expected equilibrium %d of %d at grid point %d", name, n, last.Eq+1, last.Eqs, last.Index)
				}
				newBlock = false
			}
		}
		if newBlock {
			if l.Eq > 1 {
				return nil, fmt.Errorf("%s:%d: a grid point starts with equilibrium %d", name, n, l.Eq)
			}
			f.Blocks = append(f.Blocks, Block{Index: l.Index})
			cur = &f.Blocks[len(f.Blocks)-1]
		}
		cur.Records = append(cur.Records, Record{Raw: raw, Line: l, LineNum: n})
		off += end + 1
		if l.Eq == l.Eqs {
			f.Good = off
		}
	}
	if cur != nil {
		if l := cur.Records[len(cur.Records)-1].Line; l.Eq < l.Eqs {
			f.Blocks = f.Blocks[:len(f.Blocks)-1] // written in part
		}
	}
	if len(f.Blocks) == 0 {
		f.Sweep, f.Of, f.Params = "", 0, nil
	}
	return f, nil
}

// parseLine decodes one line (with its newline) and checks it on its own.
func parseLine(raw []byte) (SweepLine, error) {
	var l SweepLine
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&l); err != nil {
		return l, err
	}
	if dec.More() {
		return l, errors.New("more than one JSON value")
	}
	switch {
	case l.Of < 1 || l.Of > MaxGridPoints:
		return l, fmt.Errorf(`"of" is %d, not a grid size from 1 to %d`, l.Of, MaxGridPoints)
	case l.Index < 0 || l.Index >= l.Of:
		return l, fmt.Errorf(`"index" %d is not a grid point of %d`, l.Index, l.Of)
	case l.Eqs < 0 || l.Eqs > MaxEquilibria:
		return l, fmt.Errorf(`"eqs" is %d, not from 0 to %d`, l.Eqs, MaxEquilibria)
	case l.Eq < 0 || l.Eq > l.Eqs || (l.Eq == 0) != (l.Eqs == 0):
		return l, fmt.Errorf(`equilibrium %d of %d`, l.Eq, l.Eqs)
	case len(l.Params.Keys) == 0:
		return l, errors.New(`no "params"`)
	case !slices.Contains([]string{checker.VerdictHolds, checker.VerdictFails, checker.VerdictUndecided}, l.Verdict):
		return l, fmt.Errorf("unknown verdict %q", l.Verdict)
	case l.Verdict != checker.VerdictUndecided && l.Digest == nil:
		return l, fmt.Errorf("the verdict %s has no certificate_digest", l.Verdict)
	case l.Digest != nil && !isDigest(*l.Digest):
		return l, fmt.Errorf("the certificate_digest %q is not sha256:<64 hex digits>", *l.Digest)
	case l.Sweep == "":
		return l, errors.New("no sweep_digest (written by an older lyacert? run the sweep again)")
	case !isDigest(l.Sweep):
		return l, fmt.Errorf("the sweep_digest %q is not sha256:<64 hex digits>", l.Sweep)
	case !isDigest(l.LineDigest):
		return l, fmt.Errorf("the line_digest %q is not sha256:<64 hex digits>", l.LineDigest)
	case !bytes.Equal(raw, l.Marshal()):
		return l, errors.New("the line is not written as lyacert writes it (edited?)")
	case l.contentDigest() != l.LineDigest:
		return l, errors.New("the line_digest does not match the line: the line was changed after it was written")
	}
	return l, nil
}
