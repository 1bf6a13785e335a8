package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/lyacert/lyacert/certify/vertex"
	"github.com/lyacert/lyacert/poly"
)

// VertexText writes the result of the vertex test: the box, P, the
// vertices with the smallest eigenvalue of −(AᵀP + PA) at each, and what
// follows for the whole box. written is the certificate's path, or "".
func VertexText(w io.Writer, res *vertex.Result, written string) {
	m := res.Model
	verdict, kind := res.Verdict()
	fmt.Fprintf(w, "%s: one quadratic V for the whole parameter box (continuous time)\n", m.File)
	var box []string
	for _, p := range m.FreeParams() {
		box = append(box, p.Name+" in "+p.Range.String())
	}
	fmt.Fprintf(w, "box: %s (%d vertices)\n", strings.Join(box, ", "), len(res.Vertices))
	at := make([]string, len(res.At))
	for i, v := range res.At {
		at[i] = m.States[i] + " = " + poly.RatString(v)
	}
	fmt.Fprintf(w, "equilibrium: %s\n", strings.Join(at, ", "))
	if res.P != nil {
		fmt.Fprintf(w, "P (common denominator %s, smallest eigenvalue %.4g):\n", res.Denominator, res.PMargin)
		for _, row := range res.P {
			cells := make([]string, len(row))
			for j, v := range row {
				cells[j] = poly.RatString(v)
			}
			fmt.Fprintf(w, "  [%s]\n", strings.Join(cells, ", "))
		}
	}
	fmt.Fprintln(w, "vertices:")
	for i, v := range res.Vertices {
		line := fmt.Sprintf("  %d. %s: max Re λ(A) = %.4g", i+1, res.VertexText(i), v.MaxRe)
		if !math.IsNaN(v.Margin) {
			line += fmt.Sprintf(", smallest eigenvalue of −(AᵀP + PA) = %.4g", v.Margin)
		}
		fmt.Fprintln(w, line)
	}
	if res.P == nil {
		fmt.Fprintf(w, "no certificate: %s\n", res.Reason)
		fmt.Fprintf(w, "verdict: %s\n", verdict)
		return
	}
	scope := "locally"
	if res.Global {
		scope = "globally"
	}
	fmt.Fprintf(w, "verdict: %s (%s): P ≻ 0 and AᵀP + PA ≺ 0 at every vertex, so on the whole box (A affine in the parameters); the equilibrium is %s asymptotically stable for every parameter value in it, with V = (x − x*)ᵀP(x − x*)\n", verdict, kind, scope)
	fmt.Fprintf(w, "checked by the kernel (rule vertex-lyapunov): %d checks passed\n", len(res.Outcome.Records))
	if written != "" {
		fmt.Fprintf(w, "certificate: %s\n", written)
	}
}

// VertexVertexJSON is one vertex in VertexJSON.
type VertexVertexJSON struct {
	Params map[string]string `json:"params"`
	A      [][]string        `json:"a"`
	MaxRe  float64           `json:"max_re_eigenvalue"`
	Margin *float64          `json:"margin,omitempty"` // smallest eigenvalue of −(AᵀP + PA)
}

// VertexResultJSON is the --json shape of the vertex test.
type VertexResultJSON struct {
	Model       string             `json:"model"`
	Verdict     string             `json:"verdict"`
	Claim       string             `json:"claim"`
	Params      []string           `json:"params"`
	Vertices    []VertexVertexJSON `json:"vertices"`
	P           [][]string         `json:"p,omitempty"`
	PMargin     *float64           `json:"p_margin,omitempty"`
	SDPMargin   float64            `json:"sdp_margin"`
	SDPStatus   string             `json:"sdp_status"`
	Reason      string             `json:"reason,omitempty"`
	Certificate string             `json:"certificate,omitempty"`
}

// VertexJSON returns the --json shape of res.
func VertexJSON(res *vertex.Result, written string) VertexResultJSON {
	verdict, kind := res.Verdict()
	out := VertexResultJSON{Model: res.Model.File, Verdict: verdict, Claim: kind, Params: res.Params,
		SDPMargin: finite(res.T), SDPStatus: res.Status, Reason: res.Reason, Certificate: written}
	for _, v := range res.Vertices {
		vj := VertexVertexJSON{Params: map[string]string{}, MaxRe: finite(v.MaxRe)}
		for j, name := range res.Params {
			vj.Params[name] = poly.RatString(v.Params[j])
		}
		for _, row := range v.A {
			var cells []string
			for _, x := range row {
				cells = append(cells, poly.RatString(x))
			}
			vj.A = append(vj.A, cells)
		}
		if !math.IsNaN(v.Margin) {
			mg := v.Margin
			vj.Margin = &mg
		}
		out.Vertices = append(out.Vertices, vj)
	}
	if res.P != nil {
		for _, row := range res.P {
			var cells []string
			for _, x := range row {
				cells = append(cells, poly.RatString(x))
			}
			out.P = append(out.P, cells)
		}
		pm := res.PMargin
		out.PMargin = &pm
	}
	return out
}

// finite keeps JSON encodable: NaN and infinities become 0.
func finite(x float64) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0
	}
	return x
}
