package checker

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"reflect"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Format is the format version of the certificates this kernel reads.
const Format = "lyacert-certificate/2"

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
	System      System   `json:"system"`
	Claims      []Claim  `json:"claims"`
	Digest      string   `json:"digest"`
	// Signature is outside the digest: an ed25519 signature of it.
	Signature *Signature `json:"signature,omitempty"`
}

// System repeats what the model text says, so that a change to either is caught.
type System struct {
	Time        string     `json:"time"` // "continuous" or "discrete"
	States      []string   `json:"states"`
	Params      []ParamDoc `json:"params"`
	Equations   []string   `json:"equations"`
	Equilibrium []string   `json:"equilibrium"`
}

// ParamDoc is a parameter and its assumption as written in a model file.
type ParamDoc struct {
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
	for _, r := range rules {
		claimTypes[r.name] = r.new
	}
}

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

// docWire is a Document as JSON, with each claim as a raw object.
type docWire struct {
	Format      string            `json:"format"`
	Tool        string            `json:"tool"`
	Issued      string            `json:"issued"`
	Source      string            `json:"source"`
	Description []string          `json:"description"`
	Model       string            `json:"model"`
	System      System            `json:"system"`
	Claims      []json.RawMessage `json:"claims"`
	Digest      string            `json:"digest"`
	Signature   *Signature        `json:"signature,omitempty"`
}

// MarshalJSON writes the document with every claim's rule name.
func (d Document) MarshalJSON() ([]byte, error) {
	w := docWire{d.Format, d.Tool, d.Issued, d.Source, d.Description, d.Model, d.System, []json.RawMessage{}, d.Digest, d.Signature}
	for _, c := range d.Claims {
		raw, err := marshalClaim(c)
		if err != nil {
			return nil, err
		}
		w.Claims = append(w.Claims, raw)
	}
	return marshalNoEscape(w)
}

// UnmarshalJSON reads the document strictly: every claim must name a known
// rule and carry exactly the fields of that rule's type.
func (d *Document) UnmarshalJSON(b []byte) error {
	var w docWire
	if err := strictDecode(b, &w); err != nil {
		return err
	}
	*d = Document{Format: w.Format, Tool: w.Tool, Issued: w.Issued, Source: w.Source, Description: w.Description,
		Model: w.Model, System: w.System, Digest: w.Digest, Signature: w.Signature}
	for i, raw := range w.Claims {
		var fields map[string]json.RawMessage
		if err := json.Unmarshal(raw, &fields); err != nil {
			return fmt.Errorf("claim %d: %w", i+1, err)
		}
		var name string
		if err := json.Unmarshal(fields["rule"], &name); err != nil {
			return fmt.Errorf("claim %d names no rule", i+1)
		}
		make, ok := claimTypes[name]
		if !ok {
			return fmt.Errorf("claim %d: unknown rule %q", i+1, name)
		}
		delete(fields, "rule")
		body, _ := json.Marshal(fields)
		c := make()
		if err := strictDecode(body, c); err != nil {
			return fmt.Errorf("claim %d (%s): %w", i+1, name, err)
		}
		d.Claims = append(d.Claims, c)
	}
	return nil
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

// Read decodes a certificate strictly: at most MaxDocumentBytes, no
// duplicate object keys (another JSON reader might keep the other one), no
// unknown fields, no trailing data, and the format this kernel reads.
func Read(r io.Reader) (*Document, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxDocumentBytes+1))
	if err != nil {
		return nil, err
	}
	if len(data) > MaxDocumentBytes {
		return nil, fmt.Errorf("not a lyacert certificate: larger than %d bytes", MaxDocumentBytes)
	}
	if err := noDuplicateKeys(data); err != nil {
		return nil, fmt.Errorf("not a lyacert certificate: %w", err)
	}
	var d Document
	if err := strictDecode(data, &d); err != nil {
		return nil, fmt.Errorf("not a lyacert certificate: %w", err)
	}
	if d.Format != Format {
		return nil, fmt.Errorf("not a lyacert certificate: format %q, want %q", d.Format, Format)
	}
	return &d, nil
}

// noDuplicateKeys walks the JSON tokens and refuses an object with a key
// twice, or nesting deeper than 64.
func noDuplicateKeys(data []byte) error {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	type frame struct {
		keys   map[string]bool
		object bool
		key    bool   // the next string token is a key
		last   string // the last key read
		isMap  bool   // an object whose keys are names of the model, not fields
	}
	var stack []frame
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
		top := len(stack) - 1
		if d, ok := tok.(json.Delim); ok {
			switch d {
			case '{', '[':
				isMap := false
				if top >= 0 && stack[top].object {
					stack[top].key = true
					isMap = d == '{' && mapFields[stack[top].last]
				}
				if len(stack) == 64 {
					return errors.New("nested deeper than 64")
				}
				stack = append(stack, frame{keys: map[string]bool{}, object: d == '{', key: d == '{', isMap: isMap})
			default:
				stack = stack[:top]
			}
			continue
		}
		if top < 0 || !stack[top].object {
			continue
		}
		if stack[top].key {
			k := tok.(string)
			if stack[top].keys[k] {
				return fmt.Errorf("the key %q appears twice in one object", k)
			}
			if name, ok := foldedFields[foldKey(k)]; ok && !stack[top].isMap && k != name {
				return fmt.Errorf("the key %q is not the field %q (keys are case-sensitive)", k, name)
			}
			stack[top].keys[k] = true
			stack[top].key = false
			stack[top].last = k
		} else {
			stack[top].key = true
		}
	}
}

// mapFields are the fields whose value is an object keyed by names of the
// model (parameters, states) rather than by fields.
var mapFields = map[string]bool{"params": true, "point": true}

// foldedFields maps each JSON field name of the document and its claims,
// folded as encoding/json folds names when it matches a key to a field, to
// the name itself. encoding/json takes a key that differs from a field name
// only in case ("v" for "V", "ſtates" for "states") for that field; another
// JSON reader would not, and would read different content. Read refuses
// such keys.
var foldedFields = func() map[string]string {
	out := map[string]string{"RULE": "rule"}
	seen := map[reflect.Type]bool{}
	var walk func(t reflect.Type)
	walk = func(t reflect.Type) {
		for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice || t.Kind() == reflect.Array || t.Kind() == reflect.Map {
			t = t.Elem()
		}
		if t.Kind() != reflect.Struct || seen[t] {
			return
		}
		seen[t] = true
		for i := range t.NumField() {
			f := t.Field(i)
			name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
			if f.Anonymous && name == "" {
				walk(f.Type)
				continue
			}
			if !f.IsExported() || name == "-" {
				continue
			}
			if name == "" {
				name = f.Name
			}
			out[foldKey(name)] = name
			walk(f.Type)
		}
	}
	walk(reflect.TypeFor[docWire]())
	for _, r := range rules {
		walk(reflect.TypeOf(r.new()))
	}
	return out
}()

// foldKey folds a key as encoding/json does when it matches keys to fields
// case-insensitively: ASCII letters to upper case, other runes to the upper
// case of their lower case.
func foldKey(k string) string {
	var b strings.Builder
	for _, r := range k {
		if r < utf8.RuneSelf {
			if 'a' <= r && r <= 'z' {
				r -= 'a' - 'A'
			}
			b.WriteRune(r)
			continue
		}
		b.WriteRune(unicode.ToUpper(unicode.ToLower(r)))
	}
	return b.String()
}

// Canonical returns the canonical serialization of d without its digest and
// signature: JSON with object keys sorted, no insignificant white space, no
// HTML escaping. The digest is the SHA-256 of it.
func (d *Document) Canonical() ([]byte, error) {
	c := *d
	c.Digest = ""
	c.Signature = nil
	raw, err := marshalNoEscape(c)
	if err != nil {
		return nil, err
	}
	var v any
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.UseNumber()
	if err := dec.Decode(&v); err != nil {
		return nil, err
	}
	delete(v.(map[string]any), "digest")
	return marshalNoEscape(v)
}

// ComputeDigest returns "sha256:" and the hex SHA-256 of the canonical serialization.
func (d *Document) ComputeDigest() (string, error) {
	b, err := d.Canonical()
	if err != nil {
		return "", err
	}
	sum := sha256.Sum256(b)
	return "sha256:" + hex.EncodeToString(sum[:]), nil
}

// ClaimsOf returns the claims of d of type T, in order.
func ClaimsOf[T Claim](d *Document) []T {
	var out []T
	for _, c := range d.Claims {
		if t, ok := c.(T); ok {
			out = append(out, t)
		}
	}
	return out
}

// First returns the first claim of d of type T, or the zero T.
func First[T Claim](d *Document) (T, bool) {
	if cs := ClaimsOf[T](d); len(cs) > 0 {
		return cs[0], true
	}
	var zero T
	return zero, false
}

// ruleNames lists the rules in the order of the table, for messages.
func ruleNames() []string {
	var out []string
	for _, r := range rules {
		out = append(out, r.name)
	}
	return slices.Clip(out)
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
