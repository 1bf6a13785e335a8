package report

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/certify/equilibria"
)

// TestSamplesQuintic: the invented quintic model (testdata/models/quintic.lya,
// x' = x + a − x⁵) has no closed form; its samples at a = −1, 0, 1 are, by
// hand, one stable equilibrium (x⁵ − x = ∓1, |x| ≈ 1.167 where 5x⁴ > 1), then
// −1, 0, 1 (stable, unstable, stable: f'(x) = 1 − 5x⁴), then one stable.
func TestSamplesQuintic(t *testing.T) {
	m, an := readModelFile(t, "quintic.lya")
	if an.ClosedForm {
		t.Fatal("the quintic has a closed form?")
	}
	s, err := equilibria.Sample(context.Background(), m, equilibria.SampleOptions{Points: 5})
	if err != nil {
		t.Fatal(err)
	}
	out := BranchesJSON(m, an, nil)
	out.Samples = SamplesJSON(m, s)
	b, err := json.Marshal(out)
	if err != nil {
		t.Fatal(err)
	}
	var top struct {
		Samples struct {
			Kind string
			Grid []struct {
				Value      string
				Equilibria []struct {
					Exact     map[string]string
					Stability string
				}
			}
		}
	}
	if err := json.Unmarshal(b, &top); err != nil {
		t.Fatal(err)
	}
	want := map[string][]string{
		"-1": {"stable"},
		"0":  {"stable", "unstable", "stable"},
		"1":  {"stable"},
	}
	if top.Samples.Kind != "sampled" || len(top.Samples.Grid) != 5 {
		t.Fatalf("samples %+v", top.Samples)
	}
	for _, g := range top.Samples.Grid {
		w, ok := want[g.Value]
		if !ok {
			continue
		}
		var got []string
		for _, e := range g.Equilibria {
			got = append(got, e.Stability)
		}
		if strings.Join(got, ",") != strings.Join(w, ",") {
			t.Errorf("a = %s: %v, want %v", g.Value, got, w)
		}
		if g.Value == "0" && g.Equilibria[1].Exact["x"] != "0" {
			t.Errorf("a = 0: middle equilibrium %v, want x = 0 exactly", g.Equilibria[1].Exact)
		}
	}
	var text bytes.Buffer
	if err := BranchesSampledText(&text, m, an, nil, s); err != nil {
		t.Fatal(err)
	}
	for _, line := range []string{"Sampled along a on 5 grid values from -2 to 2", SampledNote, "x = 0: source (1 with Re > 0), unstable"} {
		if !strings.Contains(text.String(), line) {
			t.Errorf("text lacks %q", line)
		}
	}
}
