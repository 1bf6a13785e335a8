package report_test

import (
	"encoding/xml"
	"errors"
	"io"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/lyacert/lyacert/report"
)

// mathmlArity is every element of W3C MathML Core (from memory: its
// presentation elements) with the number of children
// its layout requires (-1: any number).
var mathmlArity = map[string]int{
	"math": -1, "mrow": -1, "mstyle": -1, "merror": -1, "mpadded": -1, "mphantom": -1, "msqrt": -1,
	"mi": 0, "mn": 0, "mo": 0, "mtext": 0, "ms": 0, "mspace": 0,
	"mfrac": 2, "mroot": 2, "msub": 2, "msup": 2, "msubsup": 3, "munder": 2, "mover": 2, "munderover": 3,
	"mtable": -1, "mtr": -1, "mtd": -1, "mmultiscripts": -1, "mprescripts": 0, "none": 0,
	"semantics": -1, "annotation": 0, "annotation-xml": -1,
}

// mathmlAttrs are the attributes the reports may use: MathML Core's
// display, mathvariant (only "normal" is in Core), width of mspace and
// accent of mover, and the global class.
var mathmlAttrs = map[string]bool{"display": true, "mathvariant": true, "width": true, "accent": true, "class": true}

var mathFragment = regexp.MustCompile(`(?s)<math[ >].*?</math>`)

// checkMathML parses one <math> fragment as strict XML and checks that it
// uses MathML Core elements only, with the children each needs; token
// elements hold text only, and <mn> a number.
func checkMathML(frag string) error {
	d := xml.NewDecoder(strings.NewReader(frag))
	d.Strict = true
	type open struct {
		name     string
		children int
	}
	var stack []*open
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return err
		}
		switch t := tok.(type) {
		case xml.StartElement:
			n := t.Name.Local
			_, ok := mathmlArity[n]
			if !ok {
				return errors.New("<" + n + "> is not a MathML element")
			}
			if (n == "math") != (len(stack) == 0) {
				return errors.New("<math> must be the root and only the root")
			}
			for _, a := range t.Attr {
				if !mathmlAttrs[a.Name.Local] {
					return errors.New("attribute " + a.Name.Local + " on <" + n + ">")
				}
				if a.Name.Local == "mathvariant" && a.Value != "normal" {
					return errors.New(`mathvariant="` + a.Value + `" is not MathML Core`)
				}
			}
			if len(stack) > 0 {
				p := stack[len(stack)-1]
				if mathmlArity[p.name] == 0 {
					return errors.New("<" + n + "> inside the token element <" + p.name + ">")
				}
				p.children++
			}
			stack = append(stack, &open{name: n})
		case xml.EndElement:
			e := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			if want := mathmlArity[e.name]; want > 0 && e.children != want {
				return errors.New("<" + e.name + "> has " + itoa(e.children) + " children, needs " + itoa(want))
			}
		case xml.CharData:
			s := strings.TrimSpace(string(t))
			if s == "" || len(stack) == 0 {
				continue
			}
			e := stack[len(stack)-1]
			if mathmlArity[e.name] != 0 {
				return errors.New("text " + s + " directly inside <" + e.name + ">")
			}
			if e.name == "mn" && !mnText.MatchString(s) {
				return errors.New("<mn>" + s + "</mn> is not a number")
			}
		}
	}
	if len(stack) != 0 {
		return errors.New("unclosed elements")
	}
	return nil
}

// mnText is an unsigned decimal numeral (the sign is an operator), its
// digits possibly in groups of three separated by thin spaces (ISO
// 80000-1, from memory).
var mnText = regexp.MustCompile(`^([0-9]+|[0-9]{1,3}(\x{2009}[0-9]{3})+)(\.[0-9]+)?$`)

func itoa(i int) string { return strconv.Itoa(i) }

// TestHTMLMathMLWellFormed renders the HTML report of every test
// certificate (the ones whose Markdown and LaTeX reports are golden) and
// checks each <math> fragment with a strict XML parser: well-formed, and
// MathML Core elements only.
func TestHTMLMathMLWellFormed(t *testing.T) {
	for _, c := range certs(t) {
		t.Run(c.name, func(t *testing.T) {
			page := string(render(t, c, report.HTML, false))
			frags := mathFragment.FindAllString(page, -1)
			if len(frags) == 0 {
				t.Fatal("no <math> element")
			}
			if n := strings.Count(page, "<math"); n != len(frags) {
				t.Errorf("%d <math> start tags, %d fragments", n, len(frags))
			}
			blocks := 0
			for _, f := range frags {
				if err := checkMathML(f); err != nil {
					t.Errorf("%v in\n%s", err, f)
				}
				if strings.HasPrefix(f, `<math display="block">`) {
					blocks++
				}
			}
			if blocks == 0 {
				t.Error("no display math")
			}
			// The drawings of the CSS era are gone.
			for _, old := range []string{`class="frac"`, `class="math"`, `class="dotted"`, `<table class="matrix"`, `<table class="align"`} {
				if strings.Contains(page, old) {
					t.Errorf("the page still has %s", old)
				}
			}
		})
	}
}

func TestCheckMathMLRejects(t *testing.T) {
	// common practice, no source: the checker must itself fail on bad markup.
	for _, bad := range []string{
		"<math><mi>x</math>",
		"<math><mfrac><mn>1</mn></mfrac></math>",
		"<math><span>x</span></math>",
		"<math><mi>a&nbsp;b</mi></math>",
		"<math><mi>x<mi>y</mi></mi></math>",
		"<math><mn>x</mn></math>",
		`<math><mi mathvariant="bold">x</mi></math>`,
		`<math><mi onclick="f()">x</mi></math>`,
	} {
		if checkMathML(bad) == nil {
			t.Errorf("accepted %s", bad)
		}
	}
	if err := checkMathML(`<math display="block"><msup><mi>x</mi><mn>2</mn></msup></math>`); err != nil {
		t.Errorf("rejected good markup: %v", err)
	}
}
