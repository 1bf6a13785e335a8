package report_test

import (
	"encoding/json"
	"html"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/report"
)

// textProbe measures, after layout, every text element of the page's
// pictures against its picture: the text's rendered box (the bounding box
// of getBBox, mapped through the element's transforms, as the browser
// reports it with getBoundingClientRect) must lie within the picture's
// viewport. Chromium lays the text out with whatever font it finds for the
// picture's font-family.
const textProbe = `<script>
window.addEventListener("load", function () {
  var out = [];
  document.querySelectorAll("svg").forEach(function (svg, i) {
    var v = svg.getBoundingClientRect();
    svg.querySelectorAll("text").forEach(function (t) {
      var b = t.getBoundingClientRect();
      if (t.getBBox().width === 0) { return; }
      var tol = 0.5;
      if (b.left < v.left - tol || b.right > v.right + tol || b.top < v.top - tol || b.bottom > v.bottom + tol) {
        out.push({svg: i, text: t.textContent, box: [b.left, b.top, b.right, b.bottom], view: [v.left, v.top, v.right, v.bottom]});
      }
    });
  });
  var pre = document.createElement("pre");
  pre.id = "probe";
  pre.textContent = JSON.stringify({svgs: document.querySelectorAll("svg").length, texts: document.querySelectorAll("svg text").length, outside: out});
  document.body.appendChild(pre);
});
</script>`

var svgProlog = regexp.MustCompile(`(?s)^<\?xml[^>]*\?>\s*(<!--.*?-->\s*)?`)

// TestSVGTextInChromium loads every kind of picture lyacert draws in SVG (a
// paving with its legend, a sweep's heat map and strip with theirs, a
// one-parameter region's strip, and the pictures inline in the HTML
// reports) in headless Chromium and checks that no text runs past the
// picture's edge: legends placed flush with the right edge were cut off
// when the browser lacked the one font the SVG named.
func TestSVGTextInChromium(t *testing.T) {
	chromium := tool(t, "chromium", "chromium-browser")
	dir := t.TempDir()
	pages := map[string]string{}
	for _, c := range certs(t) {
		rg := certificates.ContentsOf(c.doc).Region
		if rg == nil {
			continue
		}
		if rg.Paving != nil && len(rg.Paving.Params) == 2 {
			b, err := report.PavingPlot(rg.Paving, nil, "svg")
			if err != nil {
				t.Fatal(err)
			}
			pages["paving-"+c.name] = string(b)
		}
		if rg.Param != "" {
			b, err := report.RegionPlot(c.doc, "svg")
			if err != nil {
				t.Fatal(err)
			}
			pages["region-"+c.name] = string(b)
		}
		pages["report-"+c.name] = string(render(t, c, report.HTML, false))
	}
	var cells2, cells1 []report.SweepCell
	for i := range 6 {
		for j := range 4 {
			cells2 = append(cells2, report.SweepCell{Values: []float64{float64(i), float64(j) / 4}, Category: report.SweepCategory((i + j) % 4)})
		}
		cells1 = append(cells1, report.SweepCell{Values: []float64{float64(i)}, Category: report.SweepCategory(i % 4)})
	}
	for name, cells := range map[string][]report.SweepCell{"sweep-2d": cells2, "sweep-1d": cells1} {
		names := []string{"r", "b"}[:len(cells[0].Values)]
		b, err := report.SweepPlot("an invented grid with a long title", names, cells, "svg")
		if err != nil {
			t.Fatal(err)
		}
		pages[name] = string(b)
	}
	if len(pages) < 5 {
		t.Fatalf("only %d pictures to test", len(pages))
	}
	for name, content := range pages {
		t.Run(name, func(t *testing.T) {
			var page string
			if strings.HasPrefix(name, "report-") {
				page = strings.Replace(content, "<head>", "<head>\n"+textProbe, 1)
			} else {
				page = "<!DOCTYPE html><html><head><meta charset=\"utf-8\">" + textProbe + "</head><body style=\"margin:20px\">" + svgProlog.ReplaceAllString(content, "") + "</body></html>"
			}
			file := filepath.Join(dir, name+".html")
			if err := os.WriteFile(file, []byte(page), 0o644); err != nil {
				t.Fatal(err)
			}
			args := append(chromiumArgs(filepath.Join(dir, "profile-"+name)), "--window-size=1200,900", "--virtual-time-budget=3000", "--dump-dom", "file://"+file)
			dom := runTool(t, dir, 2*time.Minute, chromium, args...)
			m := probeOut.FindSubmatch(dom)
			if m == nil {
				t.Fatalf("the probe wrote nothing; the page did not load:\n%s", tail(string(dom), 20))
			}
			var got struct {
				SVGs, Texts int
				Outside     []struct {
					SVG       int
					Text      string
					Box, View []float64
				}
			}
			if err := json.Unmarshal([]byte(html.UnescapeString(string(m[1]))), &got); err != nil {
				t.Fatal(err)
			}
			if !strings.HasPrefix(name, "report-") && (got.SVGs != 1 || got.Texts == 0) {
				t.Fatalf("%d pictures with %d texts, want one picture with text", got.SVGs, got.Texts)
			}
			for _, o := range got.Outside {
				t.Errorf("picture %d: %q at %v runs outside the picture %v", o.SVG, o.Text, o.Box, o.View)
			}
		})
	}
}
