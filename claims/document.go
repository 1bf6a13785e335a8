package claims

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"maps"
	"math/big"
	"reflect"
	"slices"

	"github.com/lyacert/lyacert/poly"
)

// Format is the format version of the certificates this kernel reads.
const Format = "lyacert-certificate/3"

// MaxDocumentBytes bounds the size of a certificate that Read accepts.
const MaxDocumentBytes = 64 << 20

// Document is a certificate: a model, its restatement, and a list of claims,
// each naming the rule that checks it. Numbers are exact "p/q" strings;
// polynomials and rational functions are in poly's canonical text over the
// model's states and free parameters.
//
// Tool, Issued, Source and Description carry no claim and are not examined;
// everything else is. The document states no verdict: Verify derives it.
type Document struct {
	Format string `json:"format"`
	Tool   string `json:"tool"`
	Issued string `json:"issued"`
	Source string `json:"source"`
	// Description is the model file's leading comment, for people.
	Description []string `json:"description"`
	Model       string   `json:"model"`
	// Parameters restate the model's parameters and their assumptions, so
	// that a change to a range or a fixed value is caught even where no
	// claim depends on it.
	Parameters []Parameter `json:"parameters"`
	Claims     []Claim     `json:"claims"`
	Digest     string      `json:"digest"`
	// Signature is outside the digest: an ed25519 signature of it.
	Signature *Signature `json:"signature,omitempty"`
}

// Parameter is a parameter and its assumption as written in a model file.
type Parameter struct {
	Name  string `json:"name"`
	Range string `json:"range"`
}

// Signature is an ed25519 signature of the digest string.
type Signature struct {
	Algorithm string `json:"algorithm"`
	PublicKey string `json:"public_key"`
	Value     string `json:"value"`
}

// A Claim is one statement of a certificate. Its Rule names the kernel rule
// that checks it; in JSON the claim is an object with a "rule" member beside
// the fields of its type, and only those.
type Claim interface {
	Rule() string
}

// claimTypes makes an empty claim of each rule, for decoding.
var claimTypes = map[string]func() Claim{}

func init() {
	for _, c := range []Claim{new(OrbitalDerivative), new(QuadraticPart), new(MonomialGram), new(MarginGram), new(TriangularSquares),
		new(BoxMultiplier), new(MinorCondition), new(NullSpace), new(Invariance), new(PointCheck), new(AlgebraicPoint), new(SturmRegion),
		new(Paving), new(WitnessPoints), new(Refutation), new(NotSOS), new(KrawczykEnclosure), new(Linearization),
		new(VertexLyapunov), new(SublevelBasin), new(SublevelSProcedure)} {
		t := reflect.TypeOf(c).Elem()
		claimTypes[c.Rule()] = func() Claim { return reflect.New(t).Interface().(Claim) }
	}
}

// Rules returns the names of the rules a claim may name, sorted.
func Rules() []string { return slices.Sorted(maps.Keys(claimTypes)) }

// marshalClaim writes a claim with its rule name.
func marshalClaim(c Claim) (json.RawMessage, error) {
	body, err := marshalNoEscape(c)
	if err != nil {
		return nil, err
	}
	name, _ := marshalNoEscape(c.Rule())
	if bytes.Equal(body, []byte("{}")) {
		return json.RawMessage(`{"rule":` + string(name) + `}`), nil
	}
	return json.RawMessage(`{"rule":` + string(name) + `,` + string(body[1:])), nil
}

// docWire is a Document as JSON, with each claim as a raw object (the
// embedded fields are Document's, whose Claims this one shadows).
type docJSON Document

type docWire struct {
	*docJSON
	Claims []json.RawMessage `json:"claims"`
}

// MarshalJSON writes the document with every claim's rule name.
func (d Document) MarshalJSON() ([]byte, error) {
	w := docWire{(*docJSON)(&d), nil}
	var err error
	if w.Claims, err = marshalClaims(d.Claims); err != nil {
		return nil, err
	}
	return marshalNoEscape(w)
}

func marshalClaims(cs []Claim) ([]json.RawMessage, error) {
	out := []json.RawMessage{}
	for _, c := range cs {
		raw, err := marshalClaim(c)
		if err != nil {
			return nil, err
		}
		out = append(out, raw)
	}
	return out, nil
}

// UnmarshalJSON reads the document strictly: every claim must name a known
// rule and carry exactly the fields of that rule's type.
func (d *Document) UnmarshalJSON(b []byte) error {
	*d = Document{}
	w := docWire{docJSON: (*docJSON)(d)}
	if err := strictDecode(b, &w); err != nil {
		return err
	}
	var err error
	d.Claims, err = unmarshalClaims(w.Claims)
	return err
}

func unmarshalClaims(raws []json.RawMessage) ([]Claim, error) {
	var out []Claim
	for i, raw := range raws {
		var fields map[string]json.RawMessage
		if err := json.Unmarshal(raw, &fields); err != nil {
			return nil, fmt.Errorf("claim %d: %w", i+1, err)
		}
		var name string
		if err := json.Unmarshal(fields["rule"], &name); err != nil {
			return nil, fmt.Errorf("claim %d names no rule", i+1)
		}
		make, ok := claimTypes[name]
		if !ok {
			return nil, fmt.Errorf("claim %d: unknown rule %q", i+1, name)
		}
		delete(fields, "rule")
		body, _ := json.Marshal(fields)
		c := make()
		if err := strictDecode(body, c); err != nil {
			return nil, fmt.Errorf("claim %d (%s): %w", i+1, name, err)
		}
		out = append(out, c)
	}
	return out, nil
}

func strictDecode(b []byte, v any) error {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		return err
	}
	if dec.More() {
		return errors.New("data after the document")
	}
	return nil
}

// Read reads a certificate file: at most MaxDocumentBytes, decoded strictly
// (Decode), and byte for byte as File writes it, so that the digest and the
// signature cover exactly the bytes that were read (a duplicate key, another
// key order or any edit is refused, whatever another JSON reader would make
// of it).
func Read(r io.Reader) (*Document, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxDocumentBytes+1))
	if err != nil {
		return nil, err
	}
	if len(data) > MaxDocumentBytes {
		return nil, fmt.Errorf("not a lyacert certificate: larger than %d bytes", MaxDocumentBytes)
	}
	d, err := Decode(data)
	if err != nil {
		return nil, err
	}
	if file, err := d.File(); err != nil || !bytes.Equal(file, data) {
		return nil, errors.New("not a lyacert certificate file: not byte for byte as lyacert writes it (reformatted or edited)")
	}
	return d, nil
}

// Decode decodes a certificate strictly: no unknown fields, no trailing
// data, and the format this kernel reads.
func Decode(data []byte) (*Document, error) {
	var d Document
	if err := strictDecode(data, &d); err != nil {
		return nil, fmt.Errorf("not a lyacert certificate: %w", err)
	}
	if d.Format != Format {
		return nil, fmt.Errorf("not a lyacert certificate: format %q, want %q", d.Format, Format)
	}
	return &d, nil
}

// File returns the document as a certificate file: JSON indented by two
// spaces, no HTML escaping, a final newline.
func (d *Document) File() ([]byte, error) {
	raw, err := marshalNoEscape(d)
	if err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if err := json.Indent(&buf, raw, "", "  "); err != nil {
		return nil, err
	}
	buf.WriteByte('\n')
	return buf.Bytes(), nil
}

// ComputeDigest returns "sha256:" and the hex SHA-256 of the canonical
// serialization of d without its digest and signature: JSON with object keys
// sorted, no insignificant white space, no HTML escaping.
func (d *Document) ComputeDigest() (string, error) {
	c := *d
	c.Digest = ""
	c.Signature = nil
	raw, err := marshalNoEscape(c)
	var v any
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.UseNumber()
	if err == nil {
		err = dec.Decode(&v)
	}
	if err != nil {
		return "", err
	}
	delete(v.(map[string]any), "digest")
	b, err := marshalNoEscape(v)
	sum := sha256.Sum256(b)
	return "sha256:" + hex.EncodeToString(sum[:]), err
}

// marshalNoEscape encodes v as compact JSON without HTML escaping.
func marshalNoEscape(v any) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return bytes.TrimSuffix(buf.Bytes(), []byte("\n")), nil
}

// CanonicalRat reads a number that must be in poly.RatString form.
func CanonicalRat(s string) (*big.Rat, bool) {
	q, ok := poly.ParseRat(s)
	if !ok || poly.RatString(q) != s {
		return nil, false
	}
	return q, true
}

// IntervalText writes the closed interval [lo, hi] of x, ends in canonical
// form; a stated interval equal to it is closed with exactly those ends.
func IntervalText(x poly.Interval) [2]string {
	if x.Lo.Open || x.Hi.Open || x.Lo.Value == nil || x.Hi.Value == nil {
		return [2]string{"(", ")"} // equal to no stated closed interval
	}
	return [2]string{poly.RatString(x.Lo.Value), poly.RatString(x.Hi.Value)}
}
