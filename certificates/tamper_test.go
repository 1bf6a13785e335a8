package certificates

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"
)

// noClaim lists the fields that carry no claim; the mutation test leaves
// them alone. Everything else that is a number, or contains one, is changed
// one at a time.
var noClaim = map[string]bool{"tool": true, "issued": true, "source": true, "description": true}

// numberRE finds numeric literals inside strings (model text, polynomials).
var numberRE = regexp.MustCompile(`[0-9]+(\.[0-9]+)?`)

type mutation struct {
	path string
	doc  []byte
}

// mutations returns one copy of the document per change: every numeric
// literal in every string is increased by one, every JSON number is
// increased by one, every boolean is flipped, and every sign between terms
// of a string is flipped.
func mutations(t *testing.T, raw []byte) []mutation {
	var root any
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.UseNumber()
	if err := dec.Decode(&root); err != nil {
		t.Fatal(err)
	}
	var out []mutation
	var walk func(v any, path string, set func(any))
	emit := func(path string, set func(any), nv any, old any) {
		set(nv)
		b, err := json.Marshal(root)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, mutation{path, b})
		set(old)
	}
	walk = func(v any, path string, set func(any)) {
		switch x := v.(type) {
		case map[string]any:
			keys := make([]string, 0, len(x))
			for k := range x {
				keys = append(keys, k)
			}
			sort.Strings(keys)
			for _, k := range keys {
				if path == "" && (noClaim[k] || k == "digest") {
					continue
				}
				walk(x[k], path+"/"+k, func(nv any) { x[k] = nv })
			}
		case []any:
			for i := range x {
				walk(x[i], fmt.Sprintf("%s/%d", path, i), func(nv any) { x[i] = nv })
			}
		case bool:
			emit(path, set, !x, x)
		case json.Number:
			emit(path, set, json.Number(bump(string(x))), x)
		case string:
			for _, loc := range numberRE.FindAllStringIndex(x, -1) {
				m := x[:loc[0]] + bump(x[loc[0]:loc[1]]) + x[loc[1]:]
				emit(fmt.Sprintf("%s[%d]", path, loc[0]), set, m, x)
			}
			for i := 0; i+3 <= len(x); i++ {
				switch x[i : i+3] {
				case " + ":
					emit(fmt.Sprintf("%s[%d+]", path, i), set, x[:i]+" - "+x[i+3:], x)
				case " - ":
					emit(fmt.Sprintf("%s[%d-]", path, i), set, x[:i]+" + "+x[i+3:], x)
				}
			}
		}
	}
	walk(root, "", nil)
	return out
}

// bump increases a decimal literal by one in its last integer digit group.
func bump(s string) string {
	if i := strings.IndexByte(s, '.'); i >= 0 {
		// change the last fractional digit
		last := s[len(s)-1]
		nd := byte('0' + (last-'0'+1)%10)
		return s[:len(s)-1] + string(nd)
	}
	n := []byte(s)
	for i := len(n) - 1; i >= 0; i-- {
		if n[i] < '9' {
			n[i]++
			return string(n)
		}
		n[i] = '0'
	}
	return "1" + string(n)
}

// TestTamperedCertificatesRejected changes every number and every model
// string of every certificate in testdata, one at a time, re-seals the
// digest, and requires Verify to reject each copy: the mathematics must
// catch the change, not only the digest.
func TestTamperedCertificatesRejected(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "testdata", "certificates", "*.json"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no certificates in testdata (%v)", err)
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			raw, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			orig, err := Read(bytes.NewReader(raw))
			if err != nil {
				t.Fatal(err)
			}
			if r := Verify(orig); !r.Valid {
				t.Fatalf("the original does not verify")
			}
			ms := mutations(t, raw)
			if len(ms) < 10 {
				t.Fatalf("only %d mutations", len(ms))
			}
			undecodable := 0
			for _, m := range ms {
				doc, err := Read(bytes.NewReader(m.doc))
				if err != nil {
					undecodable++ // no longer a certificate at all: rejected
					continue
				}
				if err := doc.Seal(); err != nil {
					t.Fatal(err)
				}
				if r := Verify(doc); r.Valid {
					t.Errorf("mutation at %s is accepted", m.path)
				}
			}
			t.Logf("%d mutations, %d no longer decode", len(ms), undecodable)
			if undecodable > len(ms)/10 {
				t.Errorf("too many mutations fail to decode; the test would prove little")
			}
		})
	}
}

// TestDigestCatchesUnsealedChange checks the digest on its own: a change to a
// field that carries no claim, without re-sealing, is rejected by the digest.
func TestDigestCatchesUnsealedChange(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "certificates", "*.json"))
	for _, f := range files {
		doc, err := ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		doc.Source = doc.Source + "x"
		r := Verify(doc)
		if r.Valid {
			t.Errorf("%s: an unsealed change is accepted", f)
		}
		last := r.Checks[len(r.Checks)-1]
		if last.Name != "digest" || last.OK {
			t.Errorf("%s: the digest check did not fail: %+v", f, last)
		}
	}
}
