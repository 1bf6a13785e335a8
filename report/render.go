package report

import (
	"embed"
	htmltemplate "html/template"
	"io"
	"strings"
	texttemplate "text/template"
)

//go:embed templates
var templateFiles embed.FS

// texAlign sets displays as the rows of an aligned environment body: one
// "lhs &= …" row per display, a right side too wide for the page continued
// on further rows (texFitter).
func texAlign(ds []display) string {
	var rows []string
	for _, r := range texFitter.rows(ds) {
		switch r.kind {
		case firstRow:
			rows = append(rows, r.lhs.tex()+" &"+r.op.tex()+" "+r.body.tex())
		case contRow:
			indent := `\quad `
			if continuesParens(r.body) {
				indent = `\qquad `
			}
			rows = append(rows, `&`+indent+continued(r.body, true))
		case blockRow:
			rows = append(rows, `&\phantom{{}`+r.op.tex()+`{}} `+r.body.tex())
		}
	}
	return strings.Join(rows, " \\\\\n")
}

// htmlAlign sets displays as one block math element: a three-column
// table (left side, relation, right side) aligned like align*, a right side
// too wide for the page continued on further rows (htmlFitter).
func htmlAlign(ds []display) string {
	var b strings.Builder
	b.WriteString(`<math display="block"><mtable class="align">`)
	for _, r := range htmlFitter.rows(ds) {
		switch r.kind {
		case firstRow:
			b.WriteString(`<mtr><mtd class="lhs">` + r.lhs.html() + `</mtd><mtd>` + r.op.html() + `</mtd><mtd class="rhs">` + r.body.html() + `</mtd></mtr>`)
		case contRow:
			class := "rhs cont"
			if continuesParens(r.body) {
				class = "rhs cont inner"
			}
			b.WriteString(`<mtr><mtd></mtd><mtd></mtd><mtd class="` + class + `">` + continued(r.body, false) + `</mtd></mtr>`)
		case blockRow:
			b.WriteString(`<mtr><mtd></mtd><mtd></mtd><mtd class="rhs">` + r.body.html() + `</mtd></mtr>`)
		}
	}
	b.WriteString(`</mtable></math>`)
	return b.String()
}

func one(d display) []display { return []display{d} }

func inc(i int) int { return i + 1 }

// Fixed notation used in the templates.
var (
	gramRule = symbol{`G = L\,D\,L^{\mathsf{T}}`, mrow("<mi>G</mi><mo>=</mo><mi>L</mi>" + thinSpace + "<mi>D</mi>" + thinSpace + "<msup><mi>L</mi>" + transpose + "</msup>")}
	jac      = symbol{"J(x)", mrow("<mi>J</mi><mo>(</mo><mi>x</mi><mo>)</mo>")}
	xGx      = symbol{`x^{\mathsf{T}} G\, x`, mrow("<msup><mi>x</mi>" + transpose + "</msup><mi>G</mi>" + thinSpace + "<mi>x</mi>")}
)

// transpose is the upright sans-serif T of \mathsf{T}.
const transpose = `<mi mathvariant="normal">T</mi>`

var ()

// texReason is texText with break points inside long words (big
// rationals, digests), so that a checker's reason never runs off the page.
func texReason(s string) string {
	words := strings.Split(s, " ")
	for i, w := range words {
		if len([]rune(w)) > 24 {
			words[i] = texBreakable(w)
		} else {
			words[i] = texText(w)
		}
	}
	return strings.Join(words, " ")
}

// texBreakable is texText with break points every 8 characters, for long
// unbroken strings such as digests.
func texBreakable(s string) string {
	var b strings.Builder
	for i, r := range []rune(s) {
		if i > 0 && i%8 == 0 {
			b.WriteString(`\allowbreak{}`)
		}
		b.WriteString(texText(string(r)))
	}
	return b.String()
}

var mdTemplate = texttemplate.Must(texttemplate.New("report.md.tmpl").Funcs(texttemplate.FuncMap{
	"gram": func() node { return gramRule },
	"xGx":  func() node { return xGx },
	"jac":  func() node { return jac },
	"inc":  inc,
	"t":    mdText,
	"r":    mdRich,
	"code": mdCode,
	"m":    texInline,
	"disp": func(ds []display) string {
		return "$$\n\\begin{aligned}\n" + texAlign(ds) + "\n\\end{aligned}\n$$"
	},
	"one": one,
}).ParseFS(templateFiles, "templates/report.md.tmpl"))

var texTemplate = texttemplate.Must(texttemplate.New("report.tex.tmpl").Funcs(texttemplate.FuncMap{
	"gram":      func() node { return gramRule },
	"xGx":       func() node { return xGx },
	"jac":       func() node { return jac },
	"breakable": texBreakable,
	"reason":    texReason,
	"t":         texText,
	"r":         texRich,
	"m":         texInline,
	"disp": func(ds []display) string {
		return "\\begin{align*}\n" + texAlign(ds) + "\n\\end{align*}"
	},
	"one":     one,
	"picture": stripPicture,
	"paving":  pavingPicture,
	"code":    func(s string) string { return `\texttt{` + texText(s) + `}` },
	// longcode is code that may break anywhere (a file name of any length).
	"longcode": func(s string) string { return `\texttt{` + texBreakable(s) + `}` },
}).ParseFS(templateFiles, "templates/report.tex.tmpl"))

// The HTML template gets only what this package generated itself as
// trusted HTML (mathematics built from parsed polynomials, with every name
// escaped, and the plots drawn here); every string from the certificate or
// the user goes in as a plain string and html/template escapes it for its
// context.
var htmlTemplate = htmltemplate.Must(htmltemplate.New("report.html.tmpl").Funcs(htmltemplate.FuncMap{
	"gram": func() node { return gramRule },
	"xGx":  func() node { return xGx },
	"jac":  func() node { return jac },
	"inc":  inc,
	"r":    func(x rich) htmltemplate.HTML { return htmltemplate.HTML(htmlRich(x)) },
	"m":    func(n node) htmltemplate.HTML { return htmltemplate.HTML(htmlInline(n)) },
	"disp": func(ds []display) htmltemplate.HTML { return htmltemplate.HTML(htmlAlign(ds)) },
	"one":  one,
	"svg":  func(s string) htmltemplate.HTML { return htmltemplate.HTML(s) },
}).ParseFS(templateFiles, "templates/report.html.tmpl"))

// texData adds what only LaTeX needs to the page.
type texData struct {
	*page
	WholeDocument bool
}

func renderMarkdown(w io.Writer, p *page, opts Options) error {
	for _, rv := range p.Regions {
		if opts.Figure == nil {
			rv.Note = "The strip plot of this region is in the HTML report (lyacert report --format html), or beside this file when it is written with -o."
			continue
		}
		svg, err := stripSVG(rv)
		if err != nil {
			return err
		}
		ref, err := opts.Figure("region-"+rv.Name+".svg", []byte(`<?xml version="1.0" encoding="UTF-8"?>`+"\n"+svg))
		if err != nil {
			return err
		}
		rv.Figure = ref
	}
	if pv := p.Paving; pv != nil && pv.SVG != "" && opts.Figure != nil {
		ref, err := opts.Figure("paving.svg", []byte(`<?xml version="1.0" encoding="UTF-8"?>`+"\n"+pv.SVG))
		if err != nil {
			return err
		}
		pv.Figure = ref
	}
	if err := attractionFile(p.Attraction, opts, "png"); err != nil {
		return err
	}
	return mdTemplate.Execute(w, p)
}

// attractionFile writes the basin picture beside a Markdown (PNG) or
// LaTeX (PDF, for \includegraphics) report through opts.Figure, or notes
// where to find it.
func attractionFile(a *attractionView, opts Options, format string) error {
	if a == nil || a.scene == nil {
		return nil
	}
	if opts.Figure == nil {
		a.Note = "The picture of the certified set is written beside this file when the report is written with -o (lyacert report -o FILE), and is inline in the HTML report."
		return nil
	}
	data, err := a.figure(format)
	if err != nil {
		return err
	}
	ref, err := opts.Figure("attraction."+format, data)
	if err != nil {
		return err
	}
	// LaTeX reads a file name as text: one with spaces or special
	// characters is named rather than included.
	if format == "pdf" && strings.ContainsFunc(ref, func(r rune) bool {
		return !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("-./", r))
	}) {
		a.Note = "The picture of the certified set is written beside this file as " + ref + "; its name is not one LaTeX can include as it stands."
		return nil
	}
	a.Figure = ref
	return nil
}

func renderLaTeX(w io.Writer, p *page, opts Options) error {
	if err := attractionFile(p.Attraction, opts, "pdf"); err != nil {
		return err
	}
	return texTemplate.Execute(w, texData{p, opts.WholeDocument})
}

func renderHTML(w io.Writer, p *page) error {
	for _, rv := range p.Regions {
		svg, err := stripSVG(rv)
		if err != nil {
			return err
		}
		rv.SVG = svg
	}
	if a := p.Attraction; a != nil && a.scene != nil {
		svg, err := a.svg()
		if err != nil {
			return err
		}
		a.SVG = svg
	}
	return htmlTemplate.Execute(w, p)
}
