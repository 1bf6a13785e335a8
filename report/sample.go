package report

import (
	"fmt"
	"io"
	"strings"

	"github.com/lyacert/lyacert/certify/equilibria"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/sweep"
)

// SampledNote says what a sampled analysis is, in the text and the JSON.
const SampledNote = "sampled, not exact: at each grid value the equilibria are found and their linearizations certified exactly as find --set does there, but nothing is known between grid values (a bifurcation or a change of stability can lie between two of them)"

// SamplesOutput is the JSON of a sampled analysis ("samples" in find
// --json with one free parameter and no closed form).
type SamplesOutput struct {
	Kind   string         `json:"kind"` // always "sampled"
	Note   string         `json:"note"`
	Param  string         `json:"param"`
	Lo     string         `json:"lo"`
	Hi     string         `json:"hi"`
	Window *string        `json:"window"` // why the grid is not the range's own ends; null when it is
	Grid   []SampleOutput `json:"grid"`
}

// SampleOutput is one grid value: the parameter's exact value and
// decimal, whether the equilibrium search was complete there, and its
// equilibria; error is why the value was not analysed (else null).
type SampleOutput struct {
	Value      string               `json:"value"`
	Decimal    string               `json:"decimal"`
	Complete   bool                 `json:"complete"`
	Equilibria []SampledEquilibrium `json:"equilibria"`
	Error      *string              `json:"error"`
}

// SampledEquilibrium is one equilibrium at a grid value: point (decimals),
// exact (rational coordinates, else null), status, class, stability
// (stable, unstable, undetermined: the linearization certificate's
// verdict there) and verdict.
type SampledEquilibrium struct {
	Point     sweep.OrderedStrings  `json:"point"`
	Exact     *sweep.OrderedStrings `json:"exact"`
	Status    string                `json:"status"`
	Class     string                `json:"class"`
	Stability string                `json:"stability"`
	Verdict   string                `json:"verdict"`
}

// SamplesJSON is the JSON of a sampled analysis.
func SamplesJSON(m *model.Model, s *equilibria.Sampling) *SamplesOutput {
	out := &SamplesOutput{Kind: "sampled", Note: SampledNote, Param: s.Param, Lo: s.Lo.RatString(), Hi: s.Hi.RatString(), Grid: []SampleOutput{}}
	if s.Window != "" {
		out.Window = &s.Window
	}
	for i := range s.Points {
		p := &s.Points[i]
		so := SampleOutput{Value: p.Value.RatString(), Decimal: sweep.RatDecimal(p.Value, 9), Equilibria: []SampledEquilibrium{}}
		if p.Err != "" {
			so.Error = &p.Err
			out.Grid = append(out.Grid, so)
			continue
		}
		so.Complete = p.Result.Search.Complete
		for j := range p.Result.Search.Equilibria {
			e := &p.Result.Search.Equilibria[j]
			eo := SampledEquilibrium{Status: e.Status, Class: e.Class, Stability: p.SampleStability(j)}
			if ct := p.Result.Certs[j]; ct != nil {
				eo.Verdict = ct.Verdict
			}
			eo.Point = pointDecimals(m, e)
			if e.Status == equilibria.EquilibriumExact {
				ex := &sweep.OrderedStrings{Keys: m.States}
				for _, v := range e.Point {
					ex.Values = append(ex.Values, v.RatString())
				}
				eo.Exact = ex
			}
			so.Equilibria = append(so.Equilibria, eo)
		}
		out.Grid = append(out.Grid, so)
	}
	return out
}

// samplesText writes a sampled analysis: one line per grid value with its
// equilibria, their class and stability.
func samplesText(w io.Writer, m *model.Model, s *equilibria.Sampling) {
	fmt.Fprintf(w, "\nSampled along %s on %d grid values from %s to %s\n  %s\n", s.Param, len(s.Points), s.Lo.RatString(), s.Hi.RatString(), SampledNote)
	if s.Window != "" {
		fmt.Fprintf(w, "  note: %s\n", s.Window)
	}
	width := 0
	for _, p := range s.Points {
		width = max(width, len([]rune(p.Value.RatString())))
	}
	for i := range s.Points {
		p := &s.Points[i]
		v := p.Value.RatString()
		head := fmt.Sprintf("  %s = %s%s  ", s.Param, v, strings.Repeat(" ", width-len([]rune(v))))
		if p.Err != "" {
			fmt.Fprintf(w, "%snot analysed: %s\n", head, p.Err)
			continue
		}
		eqs := p.Result.Search.Equilibria
		count := fmt.Sprintf("%d equilibria", len(eqs))
		if len(eqs) == 1 {
			count = "1 equilibrium"
		}
		if !p.Result.Search.Complete {
			count += " (search not complete)"
		}
		fmt.Fprintf(w, "%s%s\n", head, count)
		for j := range eqs {
			fmt.Fprintf(w, "      %s: %s, %s\n", equilibriumText(m, &eqs[j]), eqs[j].Class, p.SampleStability(j))
		}
	}
}

// pointDecimals is an equilibrium's point in decimals, as in find --json.
func pointDecimals(m *model.Model, e *equilibria.Equilibrium) sweep.OrderedStrings {
	o := sweep.OrderedStrings{Keys: m.States}
	for j := range m.States {
		switch e.Status {
		case equilibria.EquilibriumExact:
			o.Values = append(o.Values, sweep.RatDecimal(e.Point[j], sweep.EquilibriumDigits))
		case equilibria.EquilibriumEnclosed:
			o.Values = append(o.Values, sweep.RatDecimal(e.Box[j].Mid(), 9))
		default:
			o.Values = append(o.Values, fmt.Sprintf("%.9g", e.Approx[j]))
		}
	}
	return o
}
