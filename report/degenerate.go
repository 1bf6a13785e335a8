package report

import (
	"fmt"
	"io"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certify/branches"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/poly"
)

// DegenerateOutput is a place where a condition "c != 0" that the
// elimination divided by fails within the parameters' ranges
// (branches.Degeneracy): the branches' formulas say nothing there.
type DegenerateOutput struct {
	Condition string     `json:"condition"` // "c != 0"
	Param     *string    `json:"param"`     // c's one free parameter, else null
	Value     *string    `json:"value"`     // exact p/q, the decimal of an irrational root, or null
	Decimal   *string    `json:"decimal"`
	Poly      *string    `json:"poly"`
	Isolating *[2]string `json:"isolating"`
	// Checked: the equilibria at the value were computed with the
	// parameter fixed there; Equilibria lists them.
	Checked    bool                `json:"checked"`
	Equilibria []DegenerateEquilib `json:"equilibria"`
	// OffBranches: some equilibrium there is the value of no branch.
	OffBranches bool   `json:"off_branches"`
	Note        string `json:"note"`
	// Kind: "divisor" (the elimination divided by c) or "equation" (c was
	// met as an equation in the parameters alone: a further case of
	// equilibria exists only where c = 0).
	Kind string `json:"kind"`
}

// DegenerateEquilib is one equilibrium (or set of equilibria) at a
// degenerate value, and the branch whose formula gives it there (null:
// none does).
type DegenerateEquilib struct {
	Coordinates map[string]string `json:"coordinates"`
	Isolated    bool              `json:"isolated"`
	FreeStates  []string          `json:"free_states"`
	Branch      *int              `json:"branch"`
}

// DegenerateJSON is the JSON of an's degeneracies ([] for none).
func DegenerateJSON(m *model.Model, an *branches.Analysis) []DegenerateOutput {
	out := []DegenerateOutput{}
	for _, d := range an.Degenerate {
		o := DegenerateOutput{Condition: d.Cond.String() + " != 0", Checked: d.Checked, Equilibria: []DegenerateEquilib{}, OffBranches: d.OffBranches(), Note: d.Note, Kind: "divisor"}
		if d.Equation {
			o.Kind = "equation"
		}
		if d.Param != "" {
			p := d.Param
			o.Param = &p
		}
		if v := d.Value; v != nil {
			dec := trimZeros(v.Decimal(branchDigits))
			o.Decimal = &dec
			if v.Exact != nil {
				s := v.Exact.RatString()
				o.Value = &s
			} else {
				o.Value = &dec
				pi, _ := an.Ring.Index(d.Param)
				ps := poly.FromUnivariate(an.Ring, pi, v.Poly).String()
				o.Poly = &ps
				o.Isolating = &[2]string{v.Lo.RatString(), v.Hi.RatString()}
			}
		}
		for k, f := range d.Found {
			e := DegenerateEquilib{Coordinates: map[string]string{}, Isolated: f.Isolated(), FreeStates: []string{}}
			for i, s := range m.States {
				e.Coordinates[s] = surdText(f.Coords[i])
			}
			for _, j := range f.Free {
				e.FreeStates = append(e.FreeStates, m.States[j])
			}
			if b := d.OnBranch[k]; b >= 0 {
				id := b + 1
				e.Branch = &id
			}
			o.Equilibria = append(o.Equilibria, e)
		}
		out = append(out, o)
	}
	return out
}

// degenerateText writes the degeneracies under the list of branches.
func degenerateText(w io.Writer, m *model.Model, an *branches.Analysis) {
	for _, d := range degenerateNotes(m, an) {
		fmt.Fprintf(w, "  %s\n", strings.ReplaceAll(d, "\n", "\n    "))
	}
}

// degenerateNotes says, one entry per degeneracy, where the branches'
// formulas do not apply and what the equilibria are there; the equilibria
// found there follow on lines of their own.
func degenerateNotes(m *model.Model, an *branches.Analysis) []string {
	var out []string
	for _, o := range DegenerateJSON(m, an) {
		where := "where " + strings.TrimSuffix(o.Condition, " != 0") + " = 0"
		if o.Param != nil {
			v := *o.Value
			if o.Poly != nil {
				v = fmt.Sprintf("%s (the root of %s in (%s, %s))", *o.Decimal, *o.Poly, o.Isolating[0], o.Isolating[1])
			}
			where = fmt.Sprintf("at %s = %s", *o.Param, v)
		}
		fails := o.Condition + " fails"
		apply := "the branches' formulas do not apply"
		if o.Kind == "equation" {
			fails = strings.TrimSuffix(o.Condition, " != 0") + ", met as an equation, vanishes"
			apply = "the elimination's list of branches misses a case"
		}
		switch {
		case !o.Checked:
			out = append(out, fmt.Sprintf("warning: %s (%s) %s, and equilibria that exist only there are not among them: %s", where, fails, apply, o.Note))
		case len(o.Equilibria) == 0:
			out = append(out, fmt.Sprintf("%s (%s) %s; with %s fixed there no equilibrium is found", where, fails, apply, *o.Param))
		default:
			word := "note"
			if o.OffBranches {
				word = "warning"
			}
			s := fmt.Sprintf("%s: %s (%s) %s; with %s fixed there the equilibria are:", word, where, fails, apply, *o.Param)
			for _, e := range o.Equilibria {
				var parts []string
				for _, st := range m.States {
					if slices.Contains(e.FreeStates, st) {
						continue
					}
					parts = append(parts, st+" = "+e.Coordinates[st])
				}
				what := "given by no branch's formula there"
				if !e.Isolated {
					parts = append(parts, strings.Join(e.FreeStates, ", ")+" free")
					what = "a set of equilibria, " + what
				}
				if e.Branch != nil {
					what = fmt.Sprintf("the value of branch %d there", *e.Branch)
				}
				s += fmt.Sprintf("\n%s  (%s)", strings.Join(parts, ", "), what)
			}
			out = append(out, s)
		}
	}
	return out
}

// degenerateReportNotes are degenerateNotes on one line each, for reports.
func degenerateReportNotes(m *model.Model, an *branches.Analysis) []string {
	var out []string
	for _, d := range degenerateNotes(m, an) {
		out = append(out, strings.ReplaceAll(strings.Replace(d, ":\n", ": ", 1), "\n", "; "))
	}
	return out
}
