package certificates

import (
	"bytes"
	"encoding/json"
	"errors"
	"slices"
)

// canonicalJSON rewrites JSON produced by encoding/json (without HTML
// escaping) with the keys of every object sorted and the top-level "digest"
// left out. Strings and numbers are copied byte for byte: encoding/json
// writes a given string one way only, so the result is the same as decoding
// into interfaces and encoding again, without the cost of doing so.
func canonicalJSON(raw []byte) ([]byte, error) {
	p := &jsonScanner{b: raw}
	var out bytes.Buffer
	out.Grow(len(raw))
	if err := p.value(&out, true); err != nil {
		return nil, err
	}
	p.space()
	if p.i != len(p.b) {
		return nil, errors.New("canonical: data after the document")
	}
	return out.Bytes(), nil
}

type jsonScanner struct {
	b []byte
	i int
}

var errCanonical = errors.New("canonical: malformed JSON")

func (p *jsonScanner) space() {
	for p.i < len(p.b) && (p.b[p.i] == ' ' || p.b[p.i] == '\n' || p.b[p.i] == '\t' || p.b[p.i] == '\r') {
		p.i++
	}
}

// str returns the raw bytes of the string starting at p.i, quotes included.
func (p *jsonScanner) str() ([]byte, error) {
	start := p.i
	p.i++
	for p.i < len(p.b) {
		switch p.b[p.i] {
		case '\\':
			p.i += 2
			continue
		case '"':
			p.i++
			return p.b[start:p.i], nil
		}
		p.i++
	}
	return nil, errCanonical
}

func (p *jsonScanner) value(out *bytes.Buffer, top bool) error {
	p.space()
	if p.i >= len(p.b) {
		return errCanonical
	}
	switch c := p.b[p.i]; {
	case c == '{':
		return p.object(out, top)
	case c == '[':
		p.i++
		out.WriteByte('[')
		p.space()
		if p.i < len(p.b) && p.b[p.i] == ']' {
			p.i++
			out.WriteByte(']')
			return nil
		}
		for {
			if err := p.value(out, false); err != nil {
				return err
			}
			p.space()
			if p.i >= len(p.b) {
				return errCanonical
			}
			if p.b[p.i] == ']' {
				p.i++
				out.WriteByte(']')
				return nil
			}
			if p.b[p.i] != ',' {
				return errCanonical
			}
			p.i++
			out.WriteByte(',')
		}
	case c == '"':
		s, err := p.str()
		out.Write(s)
		return err
	default: // number, true, false, null
		start := p.i
		for p.i < len(p.b) && !bytes.ContainsRune([]byte(",]} \n\t\r"), rune(p.b[p.i])) {
			p.i++
		}
		if p.i == start {
			return errCanonical
		}
		out.Write(p.b[start:p.i])
		return nil
	}
}

func (p *jsonScanner) object(out *bytes.Buffer, top bool) error {
	type member struct {
		key []byte // raw, with quotes
		val []byte
	}
	var ms []member
	p.i++
	p.space()
	if p.i < len(p.b) && p.b[p.i] == '}' {
		p.i++
		out.WriteString("{}")
		return nil
	}
	for {
		p.space()
		if p.i >= len(p.b) || p.b[p.i] != '"' {
			return errCanonical
		}
		k, err := p.str()
		if err != nil {
			return err
		}
		p.space()
		if p.i >= len(p.b) || p.b[p.i] != ':' {
			return errCanonical
		}
		p.i++
		var v bytes.Buffer
		if err := p.value(&v, false); err != nil {
			return err
		}
		if !(top && string(k) == `"digest"`) {
			ms = append(ms, member{k, v.Bytes()})
		}
		p.space()
		if p.i >= len(p.b) {
			return errCanonical
		}
		if p.b[p.i] == '}' {
			p.i++
			break
		}
		if p.b[p.i] != ',' {
			return errCanonical
		}
		p.i++
	}
	// encoding/json sorts map keys by their decoded strings; the keys of a
	// certificate need no escapes, so their raw bytes sort the same way.
	for _, m := range ms {
		if bytes.IndexByte(m.key, '\\') >= 0 {
			return errors.New("canonical: escaped object key")
		}
	}
	slices.SortFunc(ms, func(a, b member) int { return bytes.Compare(a.key, b.key) })
	for i := 1; i < len(ms); i++ {
		if bytes.Equal(ms[i].key, ms[i-1].key) {
			return errors.New("canonical: repeated object key")
		}
	}
	out.WriteByte('{')
	for i, m := range ms {
		if i > 0 {
			out.WriteByte(',')
		}
		out.Write(m.key)
		out.WriteByte(':')
		out.Write(m.val)
	}
	out.WriteByte('}')
	return nil
}

// marshalNoEscape encodes v as compact JSON without HTML escaping.
func marshalNoEscape(v any) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return bytes.TrimRight(buf.Bytes(), "\n"), nil
}
