package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math/big"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/model"
)

// identityVersion names the line format and the identity text below; it
// changes whenever either does, so that lines of different formats never
// count as one sweep. Version 2 writes a grid axis "r = 0 .. 30, 61 points"
// (version 1: "r = 0 : 30 : 61").
const identityVersion = "lyacert sweep lines 2"

// Identity is what a sweep's lines depend on besides the grid point: the
// model, by the digest of its canonical text (so neither the path it was
// read from nor its comments and spacing matter), the fixed values, the
// grid, Q and the full check. Two runs with equal identities compute equal
// lines; the shard and the number of workers are not part of it.
type Identity struct {
	Model    string   // "sha256:" + hex of the canonical model text
	Settings []string // "name = value", sorted by name
	Grid     []string // "name = lo .. hi, n points", in grid order
	Q        string   // "identity", or the diagonal, one value per state
	Full     bool
}

// NewIdentity computes the identity of a sweep of the model text src.
func NewIdentity(file string, src []byte, settings []model.Setting, grid Grid, q []*big.Rat, full bool) (Identity, error) {
	m, err := model.Parse(file, src)
	if err != nil {
		return Identity{}, err
	}
	id := Identity{Model: digestOf([]byte(m.Canonical())), Full: full}
	for _, s := range settings {
		id.Settings = append(id.Settings, s.Name+" = "+s.Value.RatString())
	}
	slices.Sort(id.Settings)
	for _, a := range grid {
		id.Grid = append(id.Grid, fmt.Sprintf("%s = %s .. %s, %d points", a.Name, a.Lo.RatString(), a.Hi.RatString(), a.N))
	}
	id.Q = qText(q, len(m.States))
	return id, nil
}

// qText writes Q's diagonal with one value per state; all ones is the
// identity, however it was given.
func qText(q []*big.Rat, states int) string {
	if len(q) == 1 {
		q = slices.Repeat(q, states)
	}
	var parts []string
	ones := true
	for _, v := range q {
		parts = append(parts, v.RatString())
		ones = ones && v.Cmp(big.NewRat(1, 1)) == 0
	}
	if ones {
		return "identity"
	}
	return strings.Join(parts, " ")
}

// Text returns the identity as the text that Digest hashes: a version line,
// then one line per item.
func (id Identity) Text() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s\nmodel %s\n", identityVersion, id.Model)
	for _, s := range id.Settings {
		fmt.Fprintf(&b, "set %s\n", s)
	}
	for _, g := range id.Grid {
		fmt.Fprintf(&b, "grid %s\n", g)
	}
	fmt.Fprintf(&b, "q %s\nfull %v\n", id.Q, id.Full)
	return b.String()
}

// Digest returns the sweep digest, the "sweep_digest" of every line:
// "sha256:" and the hex SHA-256 of Text.
func (id Identity) Digest() string { return digestOf([]byte(id.Text())) }

func digestOf(b []byte) string {
	sum := sha256.Sum256(b)
	return "sha256:" + hex.EncodeToString(sum[:])
}

// isDigest reports whether s has the form of a digest: "sha256:" and 64
// lower-case hex digits.
func isDigest(s string) bool {
	h, ok := strings.CutPrefix(s, "sha256:")
	if !ok || len(h) != 64 {
		return false
	}
	for _, c := range []byte(h) {
		if !('0' <= c && c <= '9' || 'a' <= c && c <= 'f') {
			return false
		}
	}
	return true
}
