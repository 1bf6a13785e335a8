package checker_test

import (
	"bytes"
	"crypto/ed25519"
	"encoding/base64"
	"flag"
	"math/big"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/claims"
	"github.com/lyacert/lyacert/poly"
)

var writeHostile = flag.Bool("hostile.write", false, "rewrite the files of testdata/hostile/certificates from testdata/certificates")

// The hostile certificate files are made from the honest ones of
// testdata/certificates by the changes below (go test ./checker -run
// TestWriteHostileCertificates -hostile.write), then kept as files so that
// a change to the reader or to the honest certificates cannot change what
// they test unnoticed.

func honest(t *testing.T, name string) *claims.Document {
	t.Helper()
	d, err := certificates.ReadFile(filepath.Join("..", "testdata", "certificates", name))
	if err != nil {
		t.Fatal(err)
	}
	return d
}

func honestBytes(t *testing.T, name string) []byte {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "testdata", "certificates", name))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// sealed re-seals d (a correct digest for the forged content, as a forger
// would write) and returns its file text.
func sealed(t *testing.T, d *claims.Document) []byte {
	t.Helper()
	if err := certificates.Seal(d); err != nil {
		t.Fatal(err)
	}
	b, err := certificates.Marshal(d)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// edit returns the honest certificate name changed by f and re-sealed.
func edit(t *testing.T, name string, f func(d *claims.Document)) []byte {
	d := honest(t, name)
	f(d)
	return sealed(t, d)
}

// replace returns the honest file text with old replaced once by new;
// the test fails if old is not there.
func replace(t *testing.T, name, old, new string) []byte {
	t.Helper()
	b := honestBytes(t, name)
	if !bytes.Contains(b, []byte(old)) {
		t.Fatalf("%s has no %q", name, old)
	}
	return bytes.Replace(b, []byte(old), []byte(new), 1)
}

func claimOf[T claims.Claim](t *testing.T, d *claims.Document, k int) T {
	t.Helper()
	cs := certificates.ClaimsOf[T](d)
	if len(cs) <= k {
		t.Fatalf("no claim %d of that rule", k)
	}
	return cs[k]
}

func signingKey(b byte) ed25519.PrivateKey {
	seed := bytes.Repeat([]byte{b}, ed25519.SeedSize)
	return ed25519.NewKeyFromSeed(seed)
}

func signed(t *testing.T, name string, f func(s *claims.Signature)) []byte {
	t.Helper()
	d := honest(t, name)
	if err := certificates.Sign(d, signingKey(7)); err != nil {
		t.Fatal(err)
	}
	f(d.Signature)
	b, err := certificates.Marshal(d)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func hostileFiles(t *testing.T) map[string][]byte {
	first := `{
  "format"`
	return map[string][]byte{
		// The reader: JSON that another reader might take differently.
		"dup-key-claims-first.json":      replace(t, "cubic.json", first, "{\n  \"claims\": [],\n  \"format\""),
		"dup-key-claims-last.json":       replace(t, "cubic.json", "\n  \"digest\"", "\n  \"claims\": [],\n  \"digest\""),
		"dup-key-format.json":            replace(t, "cubic.json", first, "{\n  \"format\": \"lyacert-certificate/1\",\n  \"format\""),
		"dup-key-in-claim.json":          replace(t, "cubic.json", `"V": "x^2",`, `"V": "x^2", "V": "2*x^2",`),
		"dup-key-in-parameters.json":     replace(t, "coolant.json", `"name": "k",`, `"name": "k", "name": "c",`),
		"dup-key-digest.json":            replace(t, "cubic.json", "\n  \"digest\"", "\n  \"digest\": \"sha256:00\",\n  \"digest\""),
		"dup-key-escaped.json":           replace(t, "cubic.json", `"V": "x^2",`, `"V": "x^2", "\u0056": "2*x^2",`),
		"unknown-key-verdict.json":       replace(t, "cubic.json", first, "{\n  \"verdict\": \"holds\",\n  \"format\""),
		"unknown-key-in-claim.json":      replace(t, "cubic.json", `"V": "x^2",`, `"V": "x^2", "holds": true,`),
		"unknown-key-in-parameters.json": replace(t, "coolant.json", `"name": "k",`, `"name": "k", "stable": true,`),
		"unknown-key-case.json":          replace(t, "cubic.json", `"V": "x^2",`, `"v": "x^2",`),
		"dup-key-case.json":              replace(t, "cubic.json", `"V": "x^2",`, `"V": "x^2", "v": "2*x^2",`),
		"key-long-s.json":                replace(t, "coolant.json", `"source": `, `"\u017fource": `),
		"key-kelvin-sign.json":           replace(t, "lin-quadmap.json", `"krawczyk": [`, `"\u212arawczyk": [`),
		"trailing-object.json":           append(honestBytes(t, "cubic.json"), "{}\n"...),
		"trailing-garbage.json":          append(honestBytes(t, "cubic.json"), "holds\n"...),
		"trailing-second-doc.json":       append(honestBytes(t, "cubic.json"), honestBytes(t, "unstable.json")...),
		"format-v2.json":                 replace(t, "cubic.json", "lyacert-certificate/3", "lyacert-certificate/2"),
		"format-v4.json":                 replace(t, "cubic.json", "lyacert-certificate/3", "lyacert-certificate/4"),
		"format-missing.json":            replace(t, "cubic.json", "\"format\": \"lyacert-certificate/3\",", ""),
		"format-number.json":             replace(t, "cubic.json", "\"lyacert-certificate/3\"", "2"),
		"empty.json":                     nil,
		"null.json":                      []byte("null\n"),
		"array.json":                     []byte("[]\n"),
		"not-json.json":                  []byte("state x\nx' = -x\nV = x^2\n"),
		"bom.json":                       append([]byte("\xef\xbb\xbf"), honestBytes(t, "cubic.json")...),
		"nested-65.json":                 replace(t, "cubic.json", first, "{\n  \"description\": "+strings.Repeat("[", 65)+strings.Repeat("]", 65)+",\n  \"format\""),
		"number-huge-index.json":         replace(t, "cubic.json", `"index": 1,`, `"index": 1e400,`),
		"number-fraction-index.json":     replace(t, "cubic.json", `"index": 1,`, `"index": 1.5,`),
		"claim-not-object.json":          replace(t, "cubic.json", "\"claims\": [", "\"claims\": [1,"),
		"claim-without-rule.json":        replace(t, "cubic.json", `"rule": "orbital-derivative",`, ""),
		"claim-rule-number.json":         replace(t, "cubic.json", `"rule": "orbital-derivative"`, `"rule": 1`),
		"rule-unknown.json":              replace(t, "cubic.json", `"rule": "monomial-gram-ldl"`, `"rule": "sum-of-squares"`),
		"rule-renamed-case.json":         replace(t, "cubic.json", `"rule": "orbital-derivative"`, `"rule": "Orbital-Derivative"`),
		"rule-renamed-to-other.json":     replace(t, "cubic.json", `"rule": "quadratic-part-ldl"`, `"rule": "monomial-gram-ldl"`),
		"rule-renamed-refutation.json":   replace(t, "coolant.json", `"rule": "refutation"`, `"rule": "witness-points"`),

		// The claims: content a forger re-sealed.
		"claims-null.json": edit(t, "cubic.json", func(d *claims.Document) { d.Claims = nil }),
		"claims-out-of-order.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims[0], d.Claims[1] = d.Claims[1], d.Claims[0]
		}),
		"claims-conditions-first.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims = append(d.Claims[3:], d.Claims[:3]...)
		}),
		"claims-duplicated-derivative.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims = append([]claims.Claim{d.Claims[0]}, d.Claims...)
		}),
		"claims-duplicated-condition.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims = append(d.Claims, d.Claims[len(d.Claims)-1])
		}),
		"claims-duplicated-form.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims = append(d.Claims[:2], d.Claims[1:]...)
		}),
		"claims-condition-dropped.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims = d.Claims[:len(d.Claims)-1]
		}),
		"claims-only-derivative-lin.json": edit(t, "lin-logistic.json", func(d *claims.Document) {
			d.Claims = append(honest(t, "cubic.json").Claims[:1], d.Claims...)
		}),
		"forged-refutation-values.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims = append(d.Claims, &claims.Refutation{Params: map[string]string{}, Point: map[string]string{"x": "1"}, V: "1", Vdot: "2"})
		}),
		"forged-refutation-equilibrium.json": edit(t, "coolant.json", func(d *claims.Document) {
			rf := claimOf[*claims.Refutation](t, d, 0)
			rf.Point = map[string]string{"h": "0", "q": "0", "z": "0"}
			rf.V, rf.Vdot = "0", "0"
		}),
		"forged-refutation-param-outside.json": edit(t, "coolant.json", func(d *claims.Document) {
			claimOf[*claims.Refutation](t, d, 0).Params = map[string]string{"k": "-1"}
		}),
		"forged-refutation-unknown-state.json": edit(t, "coolant.json", func(d *claims.Document) {
			claimOf[*claims.Refutation](t, d, 0).Point = map[string]string{"y": "1"}
		}),
		// A point where V̇ > 0 far from the equilibrium only: V = x² + y²
		// for x' = −x, y' = −y³ + y⁵ has V̇ = −2x² − 2y⁴ + 2y⁶, < 0 near the
		// origin, > 0 at (0, 2); it denies no local claim.
		"forged-refutation-far.json": edit(t, "local.json", func(d *claims.Document) {
			d.Model = "state x, y\nx' = -x\ny' = -y^3 + y^5\nV = x^2 + y^2\n"
			d.Claims = []claims.Claim{
				&claims.OrbitalDerivative{V: "x^2 + y^2", Vdot: "-2*x^2 - 2*y^4 + 2*y^6"},
				&claims.Refutation{Params: map[string]string{}, Point: map[string]string{"x": "0", "y": "2"}, V: "4", Vdot: "96"},
			}
		}),
		// Sublevel basins: the ring example's best level is exactly 2
		// (V̇ = 2V(V − 2)); its certificate states a level near 1.9.
		"forged-basin-level-beyond-chi.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			claimOf[*claims.SublevelBasin](t, d, 0).Level = "201/100"
		}),
		"forged-basin-level-huge.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			claimOf[*claims.SublevelBasin](t, d, 0).Level = "10"
		}),
		// At a = √2 a bigger margin on x² keeps every identity but makes
		// the pivot 7/4 − a² negative there: the sign at the root refuses it.
		"forged-algebraic-negative-pivot.json": edit(t, "algebraic.json", func(d *claims.Document) {
			f := &claimOf[*claims.AlgebraicPoint](t, d, 0).Forms[1]
			f.Margin = "1/4*x^2 + 1/2*x^4 + 1/2*y^4"
			f.Gram[1][1], f.D[1] = "7/4", "-a^2 + 7/4"
		}),
		"forged-algebraic-other-root.json": edit(t, "algebraic.json", func(d *claims.Document) {
			ap := claimOf[*claims.AlgebraicPoint](t, d, 0)
			ap.Value, ap.Isolating = "-1.41421356237310", [2]string{"-2", "-1"}
		}),
		"forged-algebraic-decimal.json": edit(t, "algebraic.json", func(d *claims.Document) {
			claimOf[*claims.AlgebraicPoint](t, d, 0).Value = "1.41421356237311"
		}),
		"forged-algebraic-minors.json": edit(t, "algebraic.json", func(d *claims.Document) {
			f := &claimOf[*claims.AlgebraicPoint](t, d, 0).Forms[0]
			f.Minors = []string{"3/4", "9/16"}
		}),
		// The squares are x, then y − x²: y first solves for nothing.
		"forged-triangular-order.json": edit(t, "triangular.json", func(d *claims.Document) {
			claimOf[*claims.TriangularSquares](t, d, 0).Order = []string{"y", "x"}
		}),
		"forged-triangular-short.json": edit(t, "triangular.json", func(d *claims.Document) {
			claimOf[*claims.TriangularSquares](t, d, 0).Order = []string{"x"}
		}),
		"forged-basin-level-zero.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			claimOf[*claims.SublevelBasin](t, d, 0).Level = "0"
		}),
		"forged-basin-edge-box-inside.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			b := claimOf[*claims.SublevelBasin](t, d, 0)
			b.Tree = strings.Replace(b.Tree, "O", "I", 1) // the first leaf is a corner
		}),
		"forged-basin-box-reclassified.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			b := claimOf[*claims.SublevelBasin](t, d, 0)
			b.Tree = strings.Replace(b.Tree, "I", "O", 1)
		}),
		"forged-basin-box-removed.json": edit(t, "basin-vanderpol.json", func(d *claims.Document) {
			b := claimOf[*claims.SublevelBasin](t, d, 0)
			b.Tree = b.Tree[:len(b.Tree)-1]
		}),
		"forged-basin-undecided-box.json": edit(t, "basin-vanderpol.json", func(d *claims.Document) {
			b := claimOf[*claims.SublevelBasin](t, d, 0)
			b.Tree = strings.Replace(b.Tree, "I", "U", 1)
		}),
		"forged-basin-equilibrium-outside.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			b := claimOf[*claims.SublevelBasin](t, d, 0)
			b.Lo = []string{"0", "0"}
		}),
		"forged-basin-box-shrunk.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			b := claimOf[*claims.SublevelBasin](t, d, 0)
			b.Lo, b.Hi = []string{"-1", "-1"}, []string{"1", "1"}
		}),
		"forged-basin-alone.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			d.Claims = []claims.Claim{claimOf[*claims.SublevelBasin](t, d, 0)}
		}),
		// The same claim for a system whose best level is 1 (V̇ = 2V(V − 1)),
		// with its derivative stated correctly: V̇ > 0 on part of the set.
		"forged-basin-other-model.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			d.Model = "state x1, x2\nx1' = x1^3 - 3*x1*x2^2 - x1\nx2' = 5*x1^2*x2 + x2^3 - x2\nV = x1^2 + x2^2\n"
			d.Claims = []claims.Claim{
				&claims.OrbitalDerivative{V: "x1^2 + x2^2", Vdot: "2*x1^4 + 4*x1^2*x2^2 + 2*x2^4 - 2*x1^2 - 2*x2^2"},
				claimOf[*claims.SublevelBasin](t, d, 0),
			}
		}),
		// The ring with its radius a ∈ [1, 2] (V̇ = 2V(V − a)): one level for
		// every a is at best 1, the smallest a; the certificate states a
		// level near 0.99.
		"forged-basin-box-level-above-one.json": edit(t, "basin-ringbox.json", func(d *claims.Document) {
			claimOf[*claims.SublevelBasin](t, d, 0).Level = "11/10"
		}),
		// The same tree over a ∈ [1/2, 2], the direct method's claims
		// restated for the wider range (they hold there): at a = 1/2 the
		// circles V = c > 1/2 grow, so the level near 0.99 must fail.
		"forged-basin-box-range-widened.json": edit(t, "basin-ringbox.json", func(d *claims.Document) {
			widen(t, d, "in [1/2, 2]", claims.Interval{Lo: "1/2", Hi: "2", LoClosed: true, HiClosed: true})
		}),
		// An open end leaves no closed box to bisect.
		"forged-basin-box-range-open.json": edit(t, "basin-ringbox.json", func(d *claims.Document) {
			widen(t, d, "in (1, 2]", claims.Interval{Lo: "1", Hi: "2", HiClosed: true})
		}),
		// A split along a fourth coordinate of a box of three (x1, x2, a).
		"forged-basin-split-beyond-coordinates.json": edit(t, "basin-ringbox.json", func(d *claims.Document) {
			b := claimOf[*claims.SublevelBasin](t, d, 0)
			i := strings.IndexAny(b.Tree, "abc")
			if i < 0 {
				t.Fatal("the ringbox tree has no directed split")
			}
			b.Tree = b.Tree[:i] + "d" + b.Tree[i+1:]
		}),
		// Directed splits belong to basin trees only: a paving tree keeps S.
		"forged-paving-directed-split.json": edit(t, "twogains.json", func(d *claims.Document) {
			pv := claimOf[*claims.Paving](t, d, 0)
			pv.Tree = strings.Replace(pv.Tree, "S", "a", 1)
		}),
		// The S-procedure on the ring (V̇ = 2V(V − 2), best level 2) at the
		// level 3: with s = 2V the identity leaves σ = −(2 + 1/256)·V, so
		// the remainder's pivots are negative (hand computation).
		"forged-sprocedure-negative-pivot.json": edit(t, "basin-ring.json", func(d *claims.Document) {
			sq := func(g string) claims.SquareSum {
				return claims.SquareSum{Basis: []string{"x1", "x2"}, Gram: [][]string{{g, "0"}, {"0", g}}, L: [][]string{{"1", "0"}, {"0", "1"}}, D: []string{g, g}}
			}
			d.Claims[len(d.Claims)-1] = &claims.SublevelSProcedure{Level: "3", Margin: "1/256*x1^2 + 1/256*x2^2", Multiplier: sq("2"), Remainder: sq("-513/256")}
		}),
		// The Van der Pol S-procedure claim raised beyond the optimal level
		// (about 2.3045 by the polar scan of certify/basin's tests).
		"forged-sprocedure-level-raised.json": edit(t, "basin-vanderpol-sos.json", func(d *claims.Document) {
			claimOf[*claims.SublevelSProcedure](t, d, 0).Level = "5/2"
		}),
		// Two basin claims: a certificate states one level.
		"forged-sprocedure-two-basins.json": edit(t, "basin-vanderpol.json", func(d *claims.Document) {
			d.Claims = append(d.Claims, claimOf[*claims.SublevelSProcedure](t, honest(t, "basin-vanderpol-sos.json"), 0))
		}),
		// The claim alone: no derivative, no form of V.
		"forged-sprocedure-alone.json": edit(t, "basin-vanderpol-sos.json", func(d *claims.Document) {
			d.Claims = d.Claims[len(d.Claims)-1:]
		}),
		// Without V's form nothing makes {V ≤ c} compact.
		"forged-sprocedure-no-v-form.json": edit(t, "basin-vanderpol-sos.json", func(d *claims.Document) {
			d.Claims = []claims.Claim{d.Claims[0], d.Claims[len(d.Claims)-1]}
		}),
		"forged-region-piece-holds.json": edit(t, "lorenz.json", func(d *claims.Document) {
			rg := claimOf[*claims.SturmRegion](t, d, 0)
			rg.Pieces[2].Holds = true
			rg.Intervals = append(rg.Intervals, rg.Pieces[2].Interval)
		}),
		"forged-point-value.json": edit(t, "lorenz.json", func(d *claims.Document) {
			// The certificate at r = 1 stated for r = 2.
			pc := claimOf[*claims.PointCheck](t, d, 0)
			pc.Params = map[string]string{"r": "2"}
		}),
		"forged-point-dropped.json": edit(t, "lorenz.json", func(d *claims.Document) {
			// The point piece r = 1 left holding without its certificate.
			d.Claims = slices.DeleteFunc(d.Claims, func(c claims.Claim) bool { return c.Rule() == "point-check" })
		}),
		"forged-point-claims.json": edit(t, "lorenz.json", func(d *claims.Document) {
			// A cofactor of the nested certificate's invariance claim
			// changed, and the nested certificate re-sealed.
			sub := claimOf[*claims.PointCheck](t, d, 0).Certificate
			claimOf[*claims.Invariance](t, sub, 0).States[0].Cofactors[0] = "1"
			if err := certificates.Seal(sub); err != nil {
				t.Fatal(err)
			}
		}),
		"forged-region-piece-refuted.json": edit(t, "coolant.json", func(d *claims.Document) {
			rg := claimOf[*claims.SturmRegion](t, d, 0)
			for i := range rg.Pieces {
				if rg.Pieces[i].Status == claims.PieceUndecided {
					rg.Pieces[i].Status = claims.PieceFails
				}
			}
		}),
		"forged-region-status-unknown.json": edit(t, "lorenz.json", func(d *claims.Document) {
			claimOf[*claims.SturmRegion](t, d, 0).Pieces[0].Status = "likely"
		}),
		"forged-invariance-cofactor.json": edit(t, "oscillator.json", func(d *claims.Document) {
			iv := claimOf[*claims.Invariance](t, d, 0)
			iv.States[0].Cofactors[0] = "2"
		}),
		"forged-invariance-other-root.json": edit(t, "oscillator.json", func(d *claims.Document) {
			// x³ − x has the real roots −1, 0, 1: a solution could sit at x = ±1.
			iv := claimOf[*claims.Invariance](t, d, 0)
			iv.States[0].Poly = "x^3 - x"
		}),
		"forged-invariance-order.json": edit(t, "oscillator.json", func(d *claims.Document) {
			claimOf[*claims.Invariance](t, d, 0).Lie[0].Order = 99
		}),
		"forged-invariance-zero-pivot.json": edit(t, "oscillator.json", func(d *claims.Document) {
			claimOf[*claims.Invariance](t, d, 0).Lie[0].Square = 1
		}),
		"forged-invariance-line.json": edit(t, "oscillator.json", func(d *claims.Document) {
			// x' = y, y' = −c·y: every point of the x axis is an equilibrium,
			// so no identity can exist; the oscillator's claims, V̇ first,
			// no longer match the model.
			d.Model = strings.Replace(d.Model, "y' = -k*x - c*y", "y' = -c*y", 1)
		}),
		"forged-region-piece-moved.json": edit(t, "lorenz.json", func(d *claims.Document) {
			rg := claimOf[*claims.SturmRegion](t, d, 0)
			rg.Pieces[0].Hi, rg.Pieces[1].Lo, rg.Pieces[1].Hi, rg.Pieces[2].Lo = "2", "2", "2", "2"
			rg.Intervals[0].Hi = "2"
		}),
		"forged-region-gap.json": edit(t, "lorenz.json", func(d *claims.Document) {
			rg := claimOf[*claims.SturmRegion](t, d, 0)
			rg.Pieces = append(rg.Pieces[:1], rg.Pieces[2:]...)
		}),
		"forged-region-intervals.json": edit(t, "lorenz.json", func(d *claims.Document) {
			rg := claimOf[*claims.SturmRegion](t, d, 0)
			rg.Intervals[0].Hi = "inf"
		}),
		"forged-paving-code.json": edit(t, "twogains.json", func(d *claims.Document) {
			pv := claimOf[*claims.Paving](t, d, 0)
			pv.Tree = strings.Replace(pv.Tree, "U", "I", 1)
		}),
		"forged-paving-resolution.json": edit(t, "twogains.json", func(d *claims.Document) {
			claimOf[*claims.Paving](t, d, 0).Resolution = "1/1152921504606846976"
		}),
		"forged-paving-truncated.json": edit(t, "twogains.json", func(d *claims.Document) {
			pv := claimOf[*claims.Paving](t, d, 0)
			pv.Tree = pv.Tree[:len(pv.Tree)-1]
		}),
		"forged-paving-box.json": edit(t, "twogains.json", func(d *claims.Document) {
			claimOf[*claims.Paving](t, d, 0).Box[0].Hi = "3"
		}),
		"forged-witness.json": edit(t, "twogains.json", func(d *claims.Document) {
			w := claimOf[*claims.WitnessPoints](t, d, 0)
			w.Points[0].Holds = !w.Points[0].Holds
		}),
		"forged-kernel.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Claims = append(d.Claims[:3], append([]claims.Claim{&claims.NullSpace{Of: "-Vdot", Vectors: [][]string{{"1"}}}}, d.Claims[3:]...)...)
		}),
		// Margin forms: a changed ε, a changed Gram entry, a margin
		// without y (consistent otherwise: ε·y⁴ moved back onto G).
		"forged-margin-epsilon.json": edit(t, "margin.json", func(d *claims.Document) {
			claimOf[*claims.MarginGram](t, d, 0).Margin = "x^4 + y^4"
		}),
		"forged-margin-gram.json": edit(t, "margin.json", func(d *claims.Document) {
			claimOf[*claims.MarginGram](t, d, 0).Gram[2][4] = "-3/2"
		}),
		"forged-margin-state-missing.json": edit(t, "margin.json", func(d *claims.Document) {
			mg := claimOf[*claims.MarginGram](t, d, 0)
			mg.Margin, mg.Gram[0][0], mg.D[0], mg.Minors = "1/2*x^4", "2", "2", []string{"2", "4", "6"}
			for k, m := range []string{"2", "4", "6"} {
				mc := claimOf[*claims.MinorCondition](t, d, 2+k)
				mc.Minor, mc.Constant = m, m
			}
		}),
		// Box multipliers: a changed Gram entry of σ₀, the box widened to
		// p ∈ [0, 4] (where V fails at p = 4) in the model and its restated
		// parameters, a negative margin, an unbounded range.
		"forged-box-gram.json": edit(t, "box-multiplier.json", func(d *claims.Document) {
			// Refactored exactly, so that only the identity can catch it.
			tm := &claimOf[*claims.BoxMultiplier](t, d, 0).Terms[0]
			tm.Gram[0][0] = "2"
			g := make([][]*big.Rat, len(tm.Gram))
			for i, row := range tm.Gram {
				for _, e := range row {
					q, _ := new(big.Rat).SetString(e)
					g[i] = append(g[i], q)
				}
			}
			l, dd, ok, _ := poly.RatLDL(g)
			if !ok {
				t.Fatal("the changed Gram matrix does not factor")
			}
			for i := range l {
				tm.D[i] = dd[i].RatString()
				for j := range l[i] {
					tm.L[i][j] = l[i][j].RatString()
				}
			}
		}),
		"forged-box-widened.json": edit(t, "box-multiplier.json", func(d *claims.Document) {
			d.Model = strings.Replace(d.Model, "p in [0, 2]", "p in [0, 4]", 1)
			d.Parameters[0].Range = "in [0, 4]"
		}),
		"forged-box-negative-epsilon.json": edit(t, "box-multiplier.json", func(d *claims.Document) {
			claimOf[*claims.BoxMultiplier](t, d, 0).Margin = "-1/4*x^2 - 1/4*y^2"
		}),
		"forged-box-negative-pivot.json": edit(t, "box-multiplier.json", func(d *claims.Document) {
			tm := &claimOf[*claims.BoxMultiplier](t, d, 0).Terms[1]
			tm.D[0] = "-" + tm.D[0]
		}),
		"forged-box-unbounded.json": edit(t, "box-multiplier.json", func(d *claims.Document) {
			d.Model = strings.Replace(d.Model, "p in [0, 2]", "p > 0", 1)
			d.Parameters[0].Range = "> 0"
		}),
		// Moment separations: the moment matrix not ⪰ 0 (the z⁶ moment
		// made negative, everything else consistent), a value L(p) that
		// is not the pairing, a moment matrix other than L(z_a·z_b).
		"forged-moments-not-psd.json": edit(t, "motzkin.json", func(d *claims.Document) {
			ns := claimOf[*claims.NotSOS](t, d, 0)
			ns.Moments = strings.Replace(ns.Moments, "+ 1/7168*z^6", "- 1/7168*z^6", 1)
			ns.Moment[0][0], ns.D[0], ns.Value = "-1/7168", "-1/7168", "-483859/161280"
		}),
		"forged-moments-value.json": edit(t, "motzkin.json", func(d *claims.Document) {
			claimOf[*claims.NotSOS](t, d, 0).Value = "-1"
		}),
		"forged-moments-matrix.json": edit(t, "motzkin.json", func(d *claims.Document) {
			ns := claimOf[*claims.NotSOS](t, d, 0)
			ns.Moment[1][1], ns.D[1] = "1", "1"
		}),
		"forged-moments-sos.json": edit(t, "margin.json", func(d *claims.Document) {
			// −V̇ of margin.json is a sum of squares: no functional can
			// separate it; this one is positive on it.
			d.Claims = append(d.Claims, &claims.NotSOS{Of: "-Vdot", Basis: []string{"x^2", "y^2"}, Moments: "x^4 + y^4",
				Moment: [][]string{{"1", "0"}, {"0", "1"}}, L: [][]string{{"1", "0"}, {"0", "1"}}, D: []string{"1", "1"}, Value: "-4"})
		}),
		"forged-minor-constant-zero.json": edit(t, "cubic.json", func(d *claims.Document) {
			claimOf[*claims.MinorCondition](t, d, 0).Constant = "0"
		}),
		"forged-condition.json": edit(t, "unstable.json", func(d *claims.Document) {
			mc := claimOf[*claims.MinorCondition](t, d, 1)
			mc.Condition = "1"
		}),
		"forged-factor-status.json": edit(t, "coolant.json", func(d *claims.Document) {
			mc := claimOf[*claims.MinorCondition](t, d, 4)
			for i := range mc.Factors {
				mc.Factors[i].Status = claims.StatusPositive
			}
		}),
		"factor-power-1e6.json": edit(t, "coolant.json", func(d *claims.Document) {
			claimOf[*claims.MinorCondition](t, d, 4).Factors[0].Power = 1000000
		}),
		"factor-power-negative.json": edit(t, "coolant.json", func(d *claims.Document) {
			claimOf[*claims.MinorCondition](t, d, 4).Factors[0].Power = -1
		}),
		"factor-power-maxint.json": edit(t, "coolant.json", func(d *claims.Document) {
			claimOf[*claims.MinorCondition](t, d, 4).Factors[0].Power = 1<<63 - 1
		}),
		"forged-gram.json": edit(t, "cubic.json", func(d *claims.Document) {
			claimOf[*claims.QuadraticPart](t, d, 0).Gram[0][0] = "2"
		}),
		"forged-ldl-pivot.json": edit(t, "ogata.json", func(d *claims.Document) {
			f := claimOf[*claims.QuadraticPart](t, d, 0)
			f.D[0] = "-" + f.D[0]
		}),
		"gram-100-rows.json": edit(t, "cubic.json", func(d *claims.Document) {
			f := claimOf[*claims.QuadraticPart](t, d, 0)
			for range 99 {
				f.Gram = append(f.Gram, []string{"0"})
			}
		}),
		"gram-long-row.json": edit(t, "cubic.json", func(d *claims.Document) {
			f := claimOf[*claims.QuadraticPart](t, d, 0)
			for range 10000 {
				f.Gram[0] = append(f.Gram[0], "0")
			}
		}),
		"number-200000-digits.json": edit(t, "cubic.json", func(d *claims.Document) {
			claimOf[*claims.MinorCondition](t, d, 0).Constant = strings.Repeat("9", 200000)
		}),
		"exponent-1e6.json": edit(t, "cubic.json", func(d *claims.Document) {
			claimOf[*claims.OrbitalDerivative](t, d, 0).Vdot = "-2*x^1000000"
		}),
		"parens-300.json": edit(t, "cubic.json", func(d *claims.Document) {
			claimOf[*claims.OrbitalDerivative](t, d, 0).Vdot = strings.Repeat("(", 300) + "-2*x^4" + strings.Repeat(")", 300)
		}),
		"model-power-tower.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Model = "state x\nx' = -x^3\nV = x^2*((((((2^64)^64)^64)^64)^64)^64)\n"
		}),
		"model-changed.json": edit(t, "cubic.json", func(d *claims.Document) {
			d.Model = "state x\nx' = x^3\nV = x^2\n"
		}),
		"model-empty.json": edit(t, "cubic.json", func(d *claims.Document) { d.Model = "" }),
		"parameters-range.json": edit(t, "coolant.json", func(d *claims.Document) {
			d.Parameters[0].Range = "in [0, 10]"
		}),
		"parameters-dropped.json": edit(t, "coolant.json", func(d *claims.Document) {
			d.Parameters = d.Parameters[1:]
		}),
		"derivative-wrong-V.json": edit(t, "cubic.json", func(d *claims.Document) {
			claimOf[*claims.OrbitalDerivative](t, d, 0).V = "2*x^2"
		}),
		"linearization-asymmetric.json": edit(t, "lin-lorenz-r20-origin.json", func(d *claims.Document) {
			lz := claimOf[*claims.Linearization](t, d, 0)
			lz.P[0][1] = lz.P[0][1] + "1"
		}),
		"linearization-decay.json": edit(t, "lin-logistic.json", func(d *claims.Document) {
			lz := claimOf[*claims.Linearization](t, d, 0)
			lz.Decay[0][0][0] = "1000"
		}),
		"vertex-p-indefinite.json": edit(t, "box-gain.json", func(d *claims.Document) {
			claimOf[*claims.VertexLyapunov](t, d, 0).P = [][]string{{"1", "2"}, {"2", "1"}}
		}),
		"vertex-not-affine.json": edit(t, "box-gain.json", func(d *claims.Document) {
			d.Model = strings.Replace(d.Model, "-k*x", "-k^2*x", 1)
		}),
		"vertex-unbounded.json": edit(t, "box-gain.json", func(d *claims.Document) {
			d.Model = strings.Replace(d.Model, "k in [1, 2]", "k >= 1", 1)
			d.Parameters[0].Range = ">= 1"
		}),
		"vertex-box-widened.json": edit(t, "box-gain.json", func(d *claims.Document) {
			d.Model = strings.Replace(d.Model, "k in [1, 2]", "k in [1, 4]", 1)
			d.Parameters[0].Range = "in [1, 4]"
		}),
		"vertex-map.json": edit(t, "box-gain.json", func(d *claims.Document) {
			d.Model = strings.NewReplacer("x' = y", "x+ = y", "y' =", "y+ =").Replace(d.Model)
		}),
		"krawczyk-box-reversed.json": edit(t, "lin-quadmap.json", func(d *claims.Document) {
			kz := claimOf[*claims.KrawczykEnclosure](t, d, 0)
			kz.Box[0][0], kz.Box[0][1] = kz.Box[0][1], kz.Box[0][0]
		}),
		"krawczyk-image-forged.json": edit(t, "lin-quadmap.json", func(d *claims.Document) {
			kz := claimOf[*claims.KrawczykEnclosure](t, d, 0)
			kz.Krawczyk[0] = kz.Box[0]
		}),

		// The seal: digest and signature.
		"digest-stale.json": replace(t, "cubic.json", `"tool": "lyacert"`, `"tool": "lyacert 2"`),
		"digest-missing.json": func() []byte {
			d := honest(t, "cubic.json")
			d.Digest = ""
			b, err := certificates.Marshal(d)
			if err != nil {
				t.Fatal(err)
			}
			return b
		}(),
		"digest-tampered.json": replace(t, "cubic.json", `"digest": "sha256:`, `"digest": "sha256:0`),
		"signature-tampered.json": signed(t, "cubic.json", func(s *claims.Signature) {
			v := []byte(s.Value)
			v[0] ^= 'A' ^ 'B'
			s.Value = string(v)
		}),
		"signature-other-key.json": signed(t, "cubic.json", func(s *claims.Signature) {
			s.PublicKey = base64Key(signingKey(8))
		}),
		"signature-algorithm.json": signed(t, "cubic.json", func(s *claims.Signature) { s.Algorithm = "ed448" }),
		"signature-not-base64.json": signed(t, "cubic.json", func(s *claims.Signature) {
			s.Value = "!" + s.Value[1:]
		}),
		"signature-empty.json": signed(t, "cubic.json", func(s *claims.Signature) { *s = claims.Signature{} }),
		"signature-content-changed.json": func() []byte {
			b := signed(t, "cubic.json", func(*claims.Signature) {})
			return bytes.Replace(b, []byte(`"tool": "lyacert"`), []byte(`"tool": "lyacert 2"`), 1)
		}(),
	}
}

func base64Key(priv ed25519.PrivateKey) string {
	return base64.StdEncoding.EncodeToString(priv.Public().(ed25519.PublicKey))
}

// TestWriteHostileCertificates rewrites the hostile files (with
// -hostile.write); without the flag it checks that they are as the changes
// above make them.
func TestWriteHostileCertificates(t *testing.T) {
	files := hostileFiles(t)
	names := make([]string, 0, len(files))
	for n := range files {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		path := filepath.Join(hostileDir, n)
		if *writeHostile {
			if err := os.MkdirAll(hostileDir, 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(path, files[n], 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		b, err := os.ReadFile(path)
		if err != nil || !bytes.Equal(b, files[n]) {
			t.Errorf("%s is not as made from testdata/certificates (rewrite with -hostile.write): %v", n, err)
		}
	}
}

// generatedCertificates are the cases too big to keep, or devices.
func generatedCertificates(t *testing.T) []hostileInput {
	cubic := honest(t, "cubic.json")
	withVdot := func(s string) []byte {
		d := honest(t, "cubic.json")
		claimOf[*claims.OrbitalDerivative](t, d, 0).Vdot = s
		return sealed(t, d)
	}
	deep := 1000000
	head := `{"format":"lyacert-certificate/3","tool":`
	rows := `{"format":"lyacert-certificate/3","claims":[{"rule":"quadratic-part-ldl","of":"V","gram":[`
	row := "[" + strings.TrimSuffix(strings.Repeat(`"0",`, 10000), ",") + "],"
	_ = cubic
	return []hostileInput{
		{"gen/dev-zero", device("/dev/zero")},
		{"gen/dev-urandom", device("/dev/urandom")},
		{"gen/json-nested-1e6", stream(head, "[", deep, strings.Repeat("]", deep)+"}")},
		{"gen/gram-1e4x1e4", stream(rows, row, 10000, `[]]}]}`)},
		{"gen/spaces-64MiB", stream("", " ", claims.MaxDocumentBytes+1, "")},
		{"gen/parens-1e6-vdot", inMemory(withVdot(strings.Repeat("(", deep) + "-2*x^4" + strings.Repeat(")", deep)))},
		{"gen/parens-1e6-model", inMemory(edit(t, "cubic.json", func(d *claims.Document) {
			d.Model = "state x\nx' = -x^3\nV = " + strings.Repeat("(", deep) + "x^2" + strings.Repeat(")", deep) + "\n"
		}))},
		{"gen/string-1e7-vdot", inMemory(withVdot(strings.Repeat("x", 1e7)))},
		{"gen/string-1e7-tool", inMemory(edit(t, "cubic.json", func(d *claims.Document) { d.Tool = strings.Repeat("t", 1e7) }))},
		{"gen/string-1e7-number", inMemory(edit(t, "cubic.json", func(d *claims.Document) {
			claimOf[*claims.MinorCondition](t, d, 0).Constant = strings.Repeat("7", 1e7)
		}))},
		{"gen/gram-1e4-rows", inMemory(edit(t, "cubic.json", func(d *claims.Document) {
			f := claimOf[*claims.QuadraticPart](t, d, 0)
			for range 9999 {
				f.Gram = append(f.Gram, []string{"0"})
			}
		}))},
		{"gen/claims-1e5", inMemory(edit(t, "cubic.json", func(d *claims.Document) {
			for range 100000 {
				d.Claims = append(d.Claims, d.Claims[0])
			}
		}))},
		{"gen/factors-1e4", inMemory(edit(t, "coolant.json", func(d *claims.Document) {
			mc := claimOf[*claims.MinorCondition](t, d, 4)
			f := mc.Factors[len(mc.Factors)-1]
			for range 10000 {
				mc.Factors = append(mc.Factors, f)
			}
		}))},
		{"gen/witnesses-1e4", inMemory(edit(t, "twogains.json", func(d *claims.Document) {
			w := claimOf[*claims.WitnessPoints](t, d, 0)
			p := w.Points[0]
			for range 10000 {
				w.Points = append(w.Points, p)
			}
		}))},
	}
}

// widen restates the range of the parameter a of the ring with a radius
// (basin-ringbox.json) in the model, the parameters and the region.
func widen(t *testing.T, d *claims.Document, rng string, iv claims.Interval) {
	t.Helper()
	if !strings.Contains(d.Model, "in [1, 2]") {
		t.Fatal("the ring's model has no range [1, 2]")
	}
	d.Model = strings.Replace(d.Model, "in [1, 2]", rng, 1)
	d.Parameters[0].Range = rng
	rg := claimOf[*claims.SturmRegion](t, d, 0)
	rg.Intervals = []claims.Interval{iv}
	rg.Pieces[0].Interval = iv
}
