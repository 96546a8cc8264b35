package reports

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/jung-kurt/gofpdf"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goitalic"
	"golang.org/x/image/font/gofont/gomono"
	"golang.org/x/image/font/gofont/goregular"

	"welfare/checker"
)

// PDFOptions shapes the PDF audit report.
type PDFOptions struct {
	// Inspector is printed on the cover; empty prints "(not stated)".
	Inspector string
	// GeneratedAt is printed on the cover and stored as the PDF's creation
	// and modification dates. It is required: with it fixed, the same
	// Result gives a byte-identical PDF.
	GeneratedAt time.Time
	// MaxPerCheck is how many findings of one check are listed in the
	// findings section before "N more in the attached findings.csv /
	// findings.json": 0 means DefaultPDFMaxPerCheck, a negative number
	// lists every finding.
	MaxPerCheck int
	// SiteOf maps the subject of a cold finding (an enclosure or a staff
	// id) to its weather site, so the cold-season chart of that site marks
	// the finding's days. A finding whose subject is a site itself needs no
	// entry; with a single weather site every cold finding is that site's.
	SiteOf map[string]string
}

// DefaultPDFMaxPerCheck keeps a report with thousands of findings printable;
// every finding is still in the attached files.
const DefaultPDFMaxPerCheck = 25

// Page geometry, in millimetres (A4 portrait).
const (
	pageW     = 210.0
	pageH     = 297.0
	margin    = 15.0
	contentW  = pageW - 2*margin
	topMargin = 22.0
	breakAt   = 18.0 // distance from the page bottom where content stops
	ptToMM    = 25.4 / 72
)

// Font families registered from the embedded Go fonts.
const (
	sans = "go"
	mono = "gomono"
)

const producer = "welfare records checker"

// doc is one PDF being written.
type doc struct {
	pdf  *gofpdf.Fpdf
	r    *checker.Result
	opt  PDFOptions
	tall tally
}

// WritePDF writes the PDF audit report of r to w: cover, summary, cold
// season (when r.Weather has data), findings with an empty plan-for-correction
// cell for each, limits in force, cautions and sign-off, with findings.json
// and findings.csv attached. The same r and opt give the same bytes.
func WritePDF(w io.Writer, r *checker.Result, opt PDFOptions) error {
	if r == nil {
		return errors.New("reports: no result to write")
	}
	if opt.GeneratedAt.IsZero() {
		return errors.New("reports: PDFOptions.GeneratedAt is required: it is printed on the report and fixes its bytes")
	}
	if opt.MaxPerCheck == 0 {
		opt.MaxPerCheck = DefaultPDFMaxPerCheck
	}
	var js, cs bytes.Buffer
	if err := WriteJSON(&js, r); err != nil {
		return fmt.Errorf("reports: attached findings.json: %w", err)
	}
	if err := WriteCSV(&cs, r); err != nil {
		return fmt.Errorf("reports: attached findings.csv: %w", err)
	}

	pdf := gofpdf.New("P", "mm", "A4", "")
	// Determinism: fixed dates, producer and catalogue order, so no clock
	// or map iteration order reaches the bytes.
	pdf.SetCatalogSort(true)
	pdf.SetCreationDate(opt.GeneratedAt)
	pdf.SetModificationDate(opt.GeneratedAt)
	pdf.SetProducer(producer, false)
	pdf.SetCreator(producer, false)
	pdf.SetTitle(clean("Welfare records audit: "+orNone(r.Facility)), true)
	pdf.SetSubject(clean("Period "+dayOrNone(r.Period.From)+" to "+dayOrNone(r.Period.To)), true)
	if opt.Inspector != "" {
		pdf.SetAuthor(clean(opt.Inspector), true)
	}
	// The alias must be set before the fonts are added (gofpdf sizes the
	// font subsets by it). The digits of the total are always in the font
	// subset: the last page prints its own number, which is the total.
	pdf.AliasNbPages("{nb}")
	// gofpdf writes into the font bytes it is given while subsetting, so
	// each report gets its own copy: sharing the package-level slices made
	// the second report in a process differ from the first.
	pdf.AddUTF8FontFromBytes(sans, "", bytes.Clone(goregular.TTF))
	pdf.AddUTF8FontFromBytes(sans, "B", bytes.Clone(gobold.TTF))
	pdf.AddUTF8FontFromBytes(sans, "I", bytes.Clone(goitalic.TTF))
	pdf.AddUTF8FontFromBytes(mono, "", bytes.Clone(gomono.TTF))
	pdf.SetMargins(margin, topMargin, margin)
	pdf.SetAutoPageBreak(true, breakAt)
	if err := pdf.Error(); err != nil {
		return fmt.Errorf("reports: loading the embedded fonts: %w", err)
	}

	d := &doc{pdf: pdf, r: r, opt: opt, tall: countFindings(r.Findings)}
	pdf.SetHeaderFunc(d.header)
	pdf.SetFooterFunc(d.footer)

	d.cover()
	d.summary()
	if hasWeather(r) {
		d.coldSeason()
	}
	d.findings()
	d.limits()
	d.cautions()
	d.signOff()

	pdf.SetAttachments([]gofpdf.Attachment{
		{Content: js.Bytes(), Filename: "findings.json", Description: "Every finding, with the accounting and the checks in force (JSON)"},
		{Content: cs.Bytes(), Filename: "findings.csv", Description: "Every finding, one per row (CSV)"},
	})
	if err := pdf.Output(w); err != nil {
		return fmt.Errorf("reports: writing the PDF: %w", err)
	}
	return nil
}

func hasWeather(r *checker.Result) bool {
	for _, s := range r.Weather {
		if len(s.Days) > 0 {
			return true
		}
	}
	return false
}

// clean makes text safe for the embedded fonts: gofpdf's UTF-8 fonts cover
// the Basic Multilingual Plane only, and control characters would print as
// boxes. Line breaks are kept; the callers decide what they mean.
func clean(s string) string {
	ok := true
	for _, c := range s {
		if c > 0xFFFF || c == utf8.RuneError || (unicode.IsControl(c) && c != '\n') {
			ok = false
			break
		}
	}
	if ok {
		return s
	}
	var b strings.Builder
	for _, c := range s {
		switch {
		case c == '\n':
			b.WriteRune(c)
		case c == '\t' || c == '\r' || unicode.IsControl(c):
			b.WriteByte(' ')
		case c > 0xFFFF || c == utf8.RuneError:
			b.WriteByte('?')
		default:
			b.WriteRune(c)
		}
	}
	return b.String()
}

// celsius prints a temperature as a whole degree with a true minus sign, as
// the wind chill index is published (rounded half away from zero).
func celsius(v float64) string {
	n := int(roundHalfAway(v))
	if n < 0 {
		return fmt.Sprintf("−%d °C", -n)
	}
	return fmt.Sprintf("%d °C", n)
}

func signed(n int) string {
	if n < 0 {
		return fmt.Sprintf("−%d", -n)
	}
	return fmt.Sprintf("%d", n)
}

func roundHalfAway(v float64) float64 {
	if v < 0 {
		return -float64(int(-v + 0.5))
	}
	return float64(int(v + 0.5))
}

func (d *doc) font(family, style string, size float64) {
	d.pdf.SetFont(family, style, size)
}

func lineHeight(size float64) float64 { return size * ptToMM * 1.3 }

// bottom is the lowest y content may reach on a page.
func (d *doc) bottom() float64 { return pageH - breakAt }

// ensure starts a new page unless h millimetres fit below the cursor.
func (d *doc) ensure(h float64) {
	if d.pdf.GetY()+h > d.bottom() {
		d.pdf.AddPage()
	}
}

func (d *doc) header() {
	p := d.pdf
	p.SetTextColor(60, 60, 60)
	d.font(sans, "", 8)
	period := "Period " + dayOrNone(d.r.Period.From) + " – " + dayOrNone(d.r.Period.To)
	pw := p.GetStringWidth(period) + 2
	p.SetXY(margin, 9)
	p.CellFormat(contentW-pw, 4, fitText(p, clean("Welfare records audit · "+orNone(d.r.Facility)), contentW-pw-2), "", 0, "L", false, 0, "")
	p.CellFormat(pw, 4, period, "", 0, "R", false, 0, "")
	p.SetDrawColor(150, 150, 150)
	p.SetLineWidth(0.2)
	p.Line(margin, 14, pageW-margin, 14)
	p.SetTextColor(0, 0, 0)
	p.SetDrawColor(0, 0, 0)
	p.SetXY(margin, topMargin)
}

func (d *doc) footer() {
	p := d.pdf
	p.SetTextColor(60, 60, 60)
	p.SetDrawColor(150, 150, 150)
	p.SetLineWidth(0.2)
	p.Line(margin, pageH-14, pageW-margin, pageH-14)
	d.font(sans, "", 8)
	p.SetXY(margin, pageH-13)
	left := "Fingerprint " + shortPrint(d.r.Fingerprint) + " · records check, not a veterinary judgement"
	p.CellFormat(contentW-40, 4, left, "", 0, "L", false, 0, "")
	// Written literally (not via "{nb}") so the last page's number - the
	// total - puts every digit the alias needs into the font subset.
	p.CellFormat(40, 4, fmt.Sprintf("page %d of {nb}", p.PageNo()), "", 0, "R", false, 0, "")
	p.SetTextColor(0, 0, 0)
	p.SetDrawColor(0, 0, 0)
}

// fitText shortens s with "…" until it fits w millimetres in the current
// font; for one-line slots (the running header) where wrapping would
// collide with the rule below.
func fitText(p *gofpdf.Fpdf, s string, w float64) string {
	if p.GetStringWidth(s) <= w {
		return s
	}
	r := []rune(s)
	for len(r) > 1 {
		r = r[:len(r)-1]
		if p.GetStringWidth(string(r)+"…") <= w {
			break
		}
	}
	return string(r) + "…"
}

// heading starts a section on a new page, with a bookmark for the outline.
func (d *doc) heading(title string) {
	d.pdf.AddPage()
	d.pdf.Bookmark(title, 0, -1)
	d.font(sans, "B", 16)
	d.pdf.CellFormat(contentW, 9, title, "", 1, "L", false, 0, "")
	d.pdf.Ln(2)
}

// subheading keeps itself with the next keep millimetres of content.
func (d *doc) subheading(title string, keep float64) {
	d.ensure(8 + keep)
	d.pdf.Ln(2)
	d.font(sans, "B", 11.5)
	d.pdf.MultiCell(contentW, lineHeight(11.5), clean(title), "", "L", false)
	d.pdf.Ln(1)
}

func (d *doc) para(text string, style string, size float64) {
	d.font(sans, style, size)
	d.pdf.MultiCell(contentW, lineHeight(size), clean(text), "", "L", false)
}

// keyValue prints a label and a wrapped value; the pair never splits.
func (d *doc) keyValue(label, value string, valueFamily string, size float64) {
	p := d.pdf
	const lw = 42.0
	d.font(valueFamily, "", size)
	lines := wrap(p, clean(value), contentW-lw)
	h := float64(len(lines)) * lineHeight(size)
	d.ensure(h)
	y := p.GetY()
	d.font(sans, "B", 10.5)
	p.SetXY(margin, y)
	p.CellFormat(lw, lineHeight(size), label, "", 0, "L", false, 0, "")
	d.font(valueFamily, "", size)
	for i, l := range lines {
		p.SetXY(margin+lw, y+float64(i)*lineHeight(size))
		p.CellFormat(contentW-lw, lineHeight(size), l, "", 0, "L", false, 0, "")
	}
	p.SetXY(margin, y+h+0.8)
}

// wrap splits text into lines no wider than w millimetres in the current
// font, honouring explicit line breaks and breaking words too long for a
// line, so nothing is ever clipped at a cell edge.
func wrap(p *gofpdf.Fpdf, text string, w float64) []string {
	var out []string
	for _, para := range strings.Split(text, "\n") {
		if para == "" {
			out = append(out, "")
			continue
		}
		out = append(out, p.SplitText(para, w)...)
	}
	if len(out) == 0 {
		out = []string{""}
	}
	return out
}
