package report

import (
	"bytes"
	"math/big"
	"strings"
	"testing"
)

// TestMapOutput checks the map's JSON and text for a companion form with
// two gains, x”' + 2x” + k₂x' + k₁x = 0 (an invented scenario): by the
// Routh–Hurwitz criterion for a cubic (Dorf & Bishop, Modern Control
// Systems, §6.2) the origin is stable iff k₁ > 0 and 2k₂ > k₁, which on
// [−1, 4]² is the exact share ∫ (4 − k₁/2) dk₁ over (0, 4] divided by 25,
// that is 12/25; the stable leaves must stay inside it and the stable plus
// undecided leaves must cover it. The shares of every branch sum to 1.
func TestMapOutput(t *testing.T) {
	m, an := analyzeText(t, `# Companion form with two gains (an invented scenario).
state x, y, z
parameter k1 in [-1, 4]
parameter k2 in [-1, 4]
x' = y
y' = z
z' = -k1*x - k2*y - 2*z
`)
	out := MapJSON(an)
	if out == nil {
		t.Fatal("no map")
	}
	if out.Resolution != "1/64" || len(out.Box) != 2 || out.Box[0].Lo != "-1" || out.Box[1].Hi != "4" || !out.Box[0].LoClosed {
		t.Fatalf("box %+v, resolution %s", out.Box, out.Resolution)
	}
	sum, stable, undecided := new(big.Rat), new(big.Rat), new(big.Rat)
	for _, s := range out.Shares {
		q, ok := new(big.Rat).SetString(s.Share)
		if !ok {
			t.Fatalf("share %q", s.Share)
		}
		sum.Add(sum, q)
		switch {
		case s.Stability == "stable":
			stable.Add(stable, q)
		case s.Class == "undecided":
			undecided.Add(undecided, q)
		}
	}
	exact := big.NewRat(12, 25)
	if sum.Cmp(big.NewRat(1, 1)) != 0 || stable.Cmp(exact) > 0 || new(big.Rat).Add(stable, undecided).Cmp(exact) < 0 {
		t.Fatalf("shares: sum %s, stable %s, undecided %s (exact stable share 12/25)", sum.RatString(), stable.RatString(), undecided.RatString())
	}
	if f, _ := stable.Float64(); f < 0.45 {
		t.Fatalf("stable share %g: too little decided", f)
	}
	if len(out.Leaves) == 0 || len(out.Leaves[0].Labels) != 1 {
		t.Fatalf("%d leaves", len(out.Leaves))
	}
	var b bytes.Buffer
	if err := BranchesText(&b, m, an, nil); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Classification over the box k1 ∈ [-1, 4] × k2 ∈ [-1, 4]", "node, stable", "% of the box ("} {
		if !strings.Contains(b.String(), want) {
			t.Fatalf("text lacks %q:\n%s", want, b.String())
		}
	}
	svg, err := BranchMap(m, an, "svg")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(svg, []byte("<svg")) || !bytes.Contains(svg, []byte("undecided")) {
		t.Fatal("the map's SVG lacks its legend")
	}
}

// TestMapInAnalysisReport: the analysis report shows the map's shares and,
// for two parameters, its picture (inline SVG in HTML, a PNG beside a
// Markdown file).
func TestMapInAnalysisReport(t *testing.T) {
	m, an := analyzeText(t, `# Companion form with two gains (an invented scenario).
state x, y, z
parameter k1 in [-1, 4]
parameter k2 in [-1, 4]
x' = y
y' = z
z' = -k1*x - k2*y - 2*z
`)
	var html bytes.Buffer
	if err := RenderAnalysis(&html, m, an, nil, AnalysisOptions{Format: HTML, WholeDocument: true, Tool: "test"}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(html.String(), `<section id="map">`) || !strings.Contains(html.String(), "node, stable: ") || strings.Count(html.String(), "<svg") != 1 {
		t.Fatal("the HTML report lacks the map")
	}
	var md bytes.Buffer
	var figure []byte
	opts := AnalysisOptions{Format: Markdown, Tool: "test", Figure: func(name string, data []byte) (string, error) {
		figure = data
		return "f-" + name, nil
	}}
	if err := RenderAnalysis(&md, m, an, nil, opts); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(md.String(), "## Classification over the box of k1 and k2") || !strings.Contains(md.String(), "![Map of the labels](f-map.png)") || !bytes.HasPrefix(figure, []byte("\x89PNG")) {
		t.Fatalf("the Markdown report lacks the map:\n%s", md.String())
	}
}
