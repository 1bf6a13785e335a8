package certificates

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// Format is the format version written into every certificate.
const Format = "lyacert-certificate/1"

// Claims and verdicts, as written in certificates and in --json output.
const (
	ClaimGlobal = "global-asymptotic"
	ClaimLocal  = "local-asymptotic"
	ClaimStable = "stable"
	ClaimNone   = "none"

	VerdictHolds     = "holds"
	VerdictOnRegion  = "holds-on-region"
	VerdictFails     = "fails"
	VerdictUndecided = "undecided"
)

// Factor statuses.
const (
	StatusPositive  = "positive-by-assumption"
	StatusNegative  = "negative-by-assumption"
	StatusCondition = "condition"
)

// Document is a certificate: everything needed to re-check a claim about a
// model from scratch. Numbers are exact "p/q" strings, polynomials and
// rational functions are in poly's canonical text over the model's states
// and free parameters.
//
// Fields that carry no claim, and that Verify therefore does not examine, are
// Tool, Issued, Source and Description.
type Document struct {
	Format string `json:"format"`
	Tool   string `json:"tool"`
	Issued string `json:"issued"`
	Source string `json:"source,omitempty"`
	// Description is the model file's leading comment, for people.
	Description []string `json:"description,omitempty"`
	Model       string   `json:"model"`
	System      System   `json:"system"`
	V           string   `json:"V"`
	Vdot        string   `json:"vdot"`
	Claim       string   `json:"claim"`
	Verdict     string   `json:"verdict"`
	// Forms are the Gram matrices of the quadratic parts of V and of −V̇
	// (ΔV for discrete time) at the equilibrium, with their LDLᵀ factors.
	Forms      []Form      `json:"forms"`
	Conditions []Condition `json:"conditions"`
	Region     *Region     `json:"region,omitempty"`
	Witnesses  []Witness   `json:"witnesses,omitempty"`
	Refutation *Refutation `json:"refutation,omitempty"`
	// Kernel spans the set where the semidefinite quadratic form of −V̇
	// vanishes (claim "stable").
	Kernel [][]string `json:"kernel,omitempty"`
	// Linearization certifies one equilibrium through its linearization
	// (Lyapunov's indirect method); see Linearization.
	Linearization *Linearization `json:"linearization,omitempty"`
	Digest        string         `json:"digest"`
	Signature     *Signature     `json:"signature,omitempty"`
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

// Form is a Gram matrix G with G = L·diag(D)·Lᵀ, L unit lower triangular.
// Name is "V" or "-Vdot". A zero pivot is allowed only with a zero column of L
// below it (the semidefinite case).
type Form struct {
	Name string `json:"name"`
	// Basis, when present, lists monomials z in the states (each with
	// coefficient 1, a pure power of every state among them) and the form
	// is the whole function, all degrees: V or −V̇ = zᵀGz exactly. Without
	// a basis, z is the states and the form is the quadratic part.
	Basis  []string   `json:"basis,omitempty"`
	Gram   [][]string `json:"gram"`
	L      [][]string `json:"l"`
	D      []string   `json:"d"`
	Minors []string   `json:"minors"`
}

// Condition is what one leading principal minor (or, for a semidefinite
// form, one pivot) requires: Minor > 0, with Minor's numerator times its
// denominator factored as Constant · Π Factorᵢ^Powerᵢ. Factors whose sign the
// assumptions fix are discharged; Condition is the product of the rest (with
// the constant's sign and the discharged signs folded in), which must be > 0.
type Condition struct {
	Form      string      `json:"form"`
	Index     int         `json:"index"`
	Minor     string      `json:"minor"`
	Constant  string      `json:"constant"`
	Factors   []FactorDoc `json:"factors"`
	Condition string      `json:"condition"`
}

// FactorDoc is one factor of a condition.
type FactorDoc struct {
	Poly   string `json:"poly"`
	Power  int    `json:"power"`
	Status string `json:"status"`
}

// Region is the exact set of values of one parameter where every condition
// holds: Pieces partition the parameter's allowed range into intervals on
// which every condition holds (Holds) or some condition fails throughout;
// Intervals lists the holding pieces.
//
// A region in several parameters has Paving instead (Param empty, Intervals
// and Pieces empty), and Product when every condition involves at most one
// parameter: then the region within the paving's box is the product of one
// one-parameter region per paved parameter, each over its side of the box.
type Region struct {
	Param     string     `json:"param"`
	Intervals []Interval `json:"intervals"`
	Pieces    []Piece    `json:"pieces"`
	Paving    *Paving    `json:"paving,omitempty"`
	Product   []Region   `json:"product,omitempty"`
}

// Interval has ends that are "-inf", "inf", an exact rational, or an
// irrational algebraic number: the unique root of LoPoly (HiPoly) in the
// open isolating interval LoIsolating (HiIsolating), with Lo (Hi) its
// decimal value to 15 significant digits, correctly rounded.
type Interval struct {
	Lo          string     `json:"lo"`
	Hi          string     `json:"hi"`
	LoClosed    bool       `json:"lo_closed"`
	HiClosed    bool       `json:"hi_closed"`
	LoPoly      string     `json:"lo_poly,omitempty"`
	HiPoly      string     `json:"hi_poly,omitempty"`
	LoIsolating *[2]string `json:"lo_isolating,omitempty"`
	HiIsolating *[2]string `json:"hi_isolating,omitempty"`
}

// Piece is one interval of the partition of a parameter's range.
type Piece struct {
	Interval
	Holds bool `json:"holds"`
}

// Witness is a point of parameter space where every condition holds, or
// where one fails (several free parameters).
type Witness struct {
	// Params gives exactly the parameters the conditions involve.
	Params map[string]string `json:"params"`
	// Values are the conditions' values there, in order.
	Values []string `json:"values"`
	Holds  bool     `json:"holds"`
}

// Refutation is a point where the candidate fails: V ≤ 0 or V̇ ≥ 0 at a state
// other than the equilibrium. Params fixes only the parameters on which V or
// V̇ at Point depends; V and Vdot are the exact values there, as functions
// of the remaining parameters, whose sign must hold on their whole range.
type Refutation struct {
	Params map[string]string `json:"params"`
	Point  map[string]string `json:"point"`
	V      string            `json:"V"`
	Vdot   string            `json:"vdot"`
}

// Signature is an ed25519 signature of the digest.
type Signature struct {
	Algorithm string `json:"algorithm"`
	PublicKey string `json:"public_key"`
	Value     string `json:"value"`
}

// Canonical returns the canonical serialization of d without its digest and
// signature: JSON with object keys sorted, no insignificant white space, no
// HTML escaping, numbers as written. The digest is the SHA-256 of it.
func (d *Document) Canonical() ([]byte, error) {
	c := *d
	c.Digest = ""
	c.Signature = nil
	raw, err := marshalNoEscape(&c)
	if err != nil {
		return nil, err
	}
	return canonicalJSON(raw)
}

// canonicalReference is Canonical by decoding into interfaces and encoding
// again (encoding/json sorts map keys); the tests hold Canonical to it.
func (d *Document) canonicalReference() ([]byte, error) {
	c := *d
	c.Digest = ""
	c.Signature = nil
	raw, err := json.Marshal(&c)
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

// Seal sets the digest.
func (d *Document) Seal() error {
	s, err := d.ComputeDigest()
	if err != nil {
		return err
	}
	d.Digest = s
	return nil
}

// Marshal returns the document as indented JSON for people and files.
func (d *Document) Marshal() ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	if err := enc.Encode(d); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// Read decodes a certificate strictly: unknown fields and trailing data are errors.
func Read(r io.Reader) (*Document, error) {
	dec := json.NewDecoder(r)
	dec.DisallowUnknownFields()
	var d Document
	if err := dec.Decode(&d); err != nil {
		return nil, fmt.Errorf("not a lyacert certificate: %w", err)
	}
	if dec.More() {
		return nil, fmt.Errorf("not a lyacert certificate: data after the document")
	}
	if d.Format != Format {
		return nil, fmt.Errorf("not a lyacert certificate: format %q, want %q", d.Format, Format)
	}
	return &d, nil
}

// ReadFile reads a certificate file.
func ReadFile(path string) (*Document, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	d, err := Read(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return d, nil
}

// WriteFile writes the document to path atomically: to a temporary file in
// the same directory, then renamed over path, so that a reader never sees a
// half-written certificate and an existing file is never truncated.
func (d *Document) WriteFile(path string) error {
	b, err := d.Marshal()
	if err != nil {
		return err
	}
	return WriteFileAtomic(path, b, 0o644)
}

// WriteFileAtomic writes data to path through a temporary file and a rename.
func WriteFileAtomic(path string, data []byte, perm os.FileMode) error {
	dir := filepath.Dir(path)
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
	}
	tmp := f.Name()
	_, werr := f.Write(data)
	if werr == nil {
		werr = f.Sync()
	}
	cerr := f.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(tmp, perm)
	}
	if werr == nil {
		werr = os.Rename(tmp, path)
	}
	if werr != nil {
		os.Remove(tmp)
		return werr
	}
	return nil
}
