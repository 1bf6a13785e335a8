package checker_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"maps"
	"math/big"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/claims"
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
			orig, err := claims.Read(bytes.NewReader(raw))
			if err != nil {
				t.Fatal(err)
			}
			first := checker.Verify(orig)
			if !first.Valid {
				t.Fatalf("the original does not verify")
			}
			ms := mutations(t, raw)
			if len(ms) < 10 {
				t.Fatalf("only %d mutations", len(ms))
			}
			undecodable := 0
			for _, m := range ms {
				doc, err := claims.Decode(m.doc)
				if err != nil {
					undecodable++ // no longer a certificate at all: rejected
					continue
				}
				if err := certificates.Seal(doc); err != nil {
					t.Fatal(err)
				}
				if r := checker.Verify(doc); r.Valid && !weakerBasin(first, r) {
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

// weakerBasin reports a mutation that lowered a basin's level and changed
// nothing else the kernel derives: a weaker claim that is still true (the
// component of a lower sublevel set lies in the higher one's), visible in the
// outcome, not an error of the kernel.
func weakerBasin(orig, r checker.Outcome) bool {
	a, ok1 := new(big.Rat).SetString(orig.Basin)
	b, ok2 := new(big.Rat).SetString(r.Basin)
	return ok1 && ok2 && b.Cmp(a) < 0 && r.Verdict == orig.Verdict && r.Kind == orig.Kind && r.Region == orig.Region
}

// TestDigestCatchesUnsealedChange checks the digest on its own: a change to a
// field that carries no claim, without re-sealing, is rejected by the digest.
func TestDigestCatchesUnsealedChange(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "certificates", "*.json"))
	for _, f := range files {
		doc, err := certificates.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		doc.Source = doc.Source + "x"
		r := checker.Verify(doc)
		if r.Valid {
			t.Errorf("%s: an unsealed change is accepted", f)
		}
		last := r.Records[len(r.Records)-1]
		if last.Name != "digest" || last.OK {
			t.Errorf("%s: the digest check did not fail: %+v", f, last)
		}
	}
}

// TestClaimEditsRejected edits the list of claims of every testdata
// certificate, re-sealed: a claim whose rule is renamed to any other rule,
// a claim duplicated, and a claim deleted. Renaming and duplicating must be
// rejected. A deletion must be rejected, or leave a certificate from which
// the kernel derives a different conclusion (a refutation or witnesses are
// facts that a weaker certificate may lack; nothing else may go unnoticed).
func TestClaimEditsRejected(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "certificates", "*.json"))
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			raw, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			var top map[string]json.RawMessage
			if err := json.Unmarshal(raw, &top); err != nil {
				t.Fatal(err)
			}
			var objs []map[string]any
			if err := json.Unmarshal(top["claims"], &objs); err != nil {
				t.Fatal(err)
			}
			orig := checker.Verify(mustRead(t, raw))
			check := func(what string, edited []map[string]any, deletion bool) {
				t.Helper()
				c, _ := json.Marshal(edited)
				top["claims"] = c
				b, _ := json.Marshal(top)
				doc, err := claims.Decode(b)
				if err != nil {
					return // no longer decodes: rejected
				}
				if err := certificates.Seal(doc); err != nil {
					t.Fatal(err)
				}
				r := checker.Verify(doc)
				if !r.Valid {
					return
				}
				if deletion && (r.Verdict != orig.Verdict || r.Kind != orig.Kind || r.Refuted != orig.Refuted || r.Region != orig.Region || r.Basin != orig.Basin || !slices.Equal(r.NotSOS, orig.NotSOS)) {
					return
				}
				t.Errorf("%s is accepted (verdict %s, kind %s)", what, r.Verdict, r.Kind)
			}
			for i, cl := range objs {
				rule := cl["rule"].(string)
				for _, other := range ruleNames {
					if other == rule {
						continue
					}
					edited := slices.Clone(objs)
					c := maps.Clone(cl)
					c["rule"] = other
					edited[i] = c
					check(fmt.Sprintf("claim %d renamed %s → %s", i+1, rule, other), edited, false)
				}
				check(fmt.Sprintf("claim %d (%s) duplicated", i+1, rule), slices.Insert(slices.Clone(objs), i, cl), false)
				check(fmt.Sprintf("claim %d (%s) deleted", i+1, rule), slices.Delete(slices.Clone(objs), i, i+1), true)
			}
		})
	}
}

var ruleNames = []string{"orbital-derivative", "quadratic-part-ldl", "monomial-gram-ldl", "minor-condition",
	"semidefinite-kernel", "sturm-region", "paving", "witness-points", "refutation", "krawczyk-enclosure", "linearization", "sublevel-basin",
	"margin-gram-ldl", "moment-separation", "box-multiplier-sos"}

func mustRead(t *testing.T, raw []byte) *claims.Document {
	t.Helper()
	d, err := claims.Read(bytes.NewReader(raw))
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// TestReadRefusesReformattedFiles: Read takes a file only byte for byte as
// lyacert writes it, so that the digest covers what was read; a duplicate
// key (which another JSON reader might resolve the other way) is refused.
func TestReadRefusesReformattedFiles(t *testing.T) {
	raw, err := os.ReadFile(filepath.Join("..", "testdata", "certificates", "coolant.json"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := claims.Read(bytes.NewReader(raw)); err != nil {
		t.Fatalf("the file as written: %v", err)
	}
	for name, edit := range map[string]func([]byte) []byte{
		"compact":        func(b []byte) []byte { var c bytes.Buffer; json.Compact(&c, b); return c.Bytes() },
		"no final line":  func(b []byte) []byte { return bytes.TrimSuffix(b, []byte("\n")) },
		"duplicate key":  func(b []byte) []byte { return bytes.Replace(b, []byte(`"tool":`), []byte(`"tool": "x", "tool":`), 1) },
		"trailing data":  func(b []byte) []byte { return append(slices.Clone(b), "{}\n"...) },
		"CRLF line ends": func(b []byte) []byte { return bytes.ReplaceAll(b, []byte("\n"), []byte("\r\n")) },
	} {
		if _, err := claims.Read(bytes.NewReader(edit(raw))); err == nil {
			t.Errorf("%s: accepted", name)
		}
	}
}
