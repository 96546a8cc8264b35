// Package pdf draws the PDF audit report that reports.BuildAudit lays out.
// It is the only package that imports gofpdf: everything about fonts,
// millimetres, page breaks and drawing lives here, and nothing about what
// the report says.
package pdf

import (
	"bytes"
	"fmt"
	"io"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/jung-kurt/gofpdf"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goitalic"
	"golang.org/x/image/font/gofont/gomono"
	"golang.org/x/image/font/gofont/goregular"

	"welfare/checker"
	"welfare/reports"
)

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

// Write lays out the audit report of r (reports.BuildAudit) and draws it to
// w. The same r and opt give the same bytes.
func Write(w io.Writer, r *checker.Result, opt reports.PDFOptions) error {
	a, err := reports.BuildAudit(r, opt)
	if err != nil {
		return err
	}
	return Render(w, a)
}

// doc is one PDF being written.
type doc struct {
	pdf *gofpdf.Fpdf
	a   *reports.Audit
}

// Render draws a to w as a PDF. The same Audit gives the same bytes.
func Render(w io.Writer, a *reports.Audit) error {
	pdf := gofpdf.New("P", "mm", "A4", "")
	// Determinism: fixed dates, producer and catalogue order, so no clock
	// or map iteration order reaches the bytes.
	pdf.SetCatalogSort(true)
	pdf.SetCreationDate(a.GeneratedAt)
	pdf.SetModificationDate(a.GeneratedAt)
	pdf.SetProducer(producer, false)
	pdf.SetCreator(producer, false)
	pdf.SetTitle(clean(a.Title), true)
	pdf.SetSubject(clean(a.Subject), true)
	if a.Author != "" {
		pdf.SetAuthor(clean(a.Author), true)
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
		return fmt.Errorf("reports/pdf: loading the embedded fonts: %w", err)
	}

	d := &doc{pdf: pdf, a: a}
	pdf.SetHeaderFunc(d.header)
	pdf.SetFooterFunc(d.footer)
	for i := range a.Sections {
		d.section(&a.Sections[i])
	}
	var atts []gofpdf.Attachment
	for _, at := range a.Attachments {
		atts = append(atts, gofpdf.Attachment{Content: at.Content, Filename: at.Name, Description: at.Description})
	}
	pdf.SetAttachments(atts)
	if err := pdf.Output(w); err != nil {
		return fmt.Errorf("reports/pdf: writing the PDF: %w", err)
	}
	return nil
}

func (d *doc) section(s *reports.AuditSection) {
	if s.NewPage {
		d.pdf.AddPage()
		d.pdf.Bookmark(clean(s.Title), 0, -1)
		if s.Heading != "" {
			d.font(sans, "B", 16)
			d.pdf.CellFormat(contentW, 9, clean(s.Heading), "", 1, "L", false, 0, "")
			d.pdf.Ln(2)
		}
	}
	for i := range s.Blocks {
		d.block(&s.Blocks[i])
	}
}

func (d *doc) block(b *reports.Block) {
	p := d.pdf
	switch b.Kind {
	case reports.KindTitle:
		p.SetY(32)
		d.font(sans, "B", 24)
		p.CellFormat(contentW, 11, clean(b.Text), "", 1, "L", false, 0, "")
		d.font(sans, "", 15)
		p.MultiCell(contentW, 7.5, clean(b.Subtitle), "", "L", false)
		p.Ln(6)
	case reports.KindKeyValue:
		family := sans
		if b.Mono {
			family = mono
		}
		d.keyValue(b.Label, b.Text, family, b.Size)
	case reports.KindSubheading:
		d.subheading(b.Text, b.Keep)
	case reports.KindParagraph:
		if b.Indent > 0 {
			d.font(sans, style(b.Style), b.Size)
			p.SetX(margin + b.Indent)
			p.MultiCell(contentW-b.Indent, lineHeight(b.Size), clean(b.Text), "", "L", false)
			return
		}
		d.para(b.Text, style(b.Style), b.Size)
	case reports.KindBullet:
		d.bullet(b.Text)
	case reports.KindNotice:
		d.notice(b.Text)
	case reports.KindSpace:
		p.Ln(b.Size)
	case reports.KindTable:
		d.table(b.Table)
	case reports.KindDomainHeading:
		d.ensure(50)
		d.font(sans, "B", 13)
		p.Bookmark(clean(b.Bookmark), 1, -1)
		p.CellFormat(contentW, 7, clean(b.Text), "B", 1, "L", false, 0, "")
		p.Ln(1)
	case reports.KindCheckFindings:
		d.checkFindings(b)
	case reports.KindBarChart:
		d.barChart(b.Bars, b.Keys)
	case reports.KindCareBar:
		d.careBar(b.Care)
	case reports.KindDayChart:
		if b.Chart != nil {
			d.dayChart(b.Chart)
		}
	case reports.KindSignOff:
		d.signOff(b)
	default:
		// A kind this renderer does not know: say so on the page rather
		// than drop content silently.
		d.para(fmt.Sprintf("[%s: not drawn by this version]", b.Kind), "I", 9)
	}
}

// style is gofpdf's font style for the model's.
func style(s string) string {
	switch s {
	case "bold":
		return "B"
	case "italic":
		return "I"
	}
	return ""
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
	period := clean(d.a.Header[1])
	pw := p.GetStringWidth(period) + 2
	p.SetXY(margin, 9)
	p.CellFormat(contentW-pw, 4, fitText(p, clean(d.a.Header[0]), contentW-pw-2), "", 0, "L", false, 0, "")
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
	p.CellFormat(contentW-40, 4, clean(d.a.Footer), "", 0, "L", false, 0, "")
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
	p.CellFormat(lw, lineHeight(size), clean(label), "", 0, "L", false, 0, "")
	d.font(valueFamily, "", size)
	for i, l := range lines {
		p.SetXY(margin+lw, y+float64(i)*lineHeight(size))
		p.CellFormat(contentW-lw, lineHeight(size), l, "", 0, "L", false, 0, "")
	}
	p.SetXY(margin, y+h+0.8)
}

// notice is a boxed paragraph that never splits across pages.
func (d *doc) notice(text string) {
	p := d.pdf
	const size = 10
	d.font(sans, "", size)
	lines := wrap(p, clean(text), contentW-8)
	h := float64(len(lines))*lineHeight(size) + 6
	d.ensure(h)
	y := p.GetY()
	p.SetLineWidth(0.5)
	p.SetFillColor(242, 242, 242)
	p.Rect(margin, y, contentW, h, "FD")
	p.SetLineWidth(0.2)
	for i, l := range lines {
		p.SetXY(margin+4, y+3+float64(i)*lineHeight(size))
		p.CellFormat(contentW-8, lineHeight(size), l, "", 0, "L", false, 0, "")
	}
	p.SetXY(margin, y+h+2)
}

// bullet is one item of a list; it never splits across pages.
func (d *doc) bullet(text string) {
	p := d.pdf
	d.font(sans, "", 10)
	lines := wrap(p, clean(text), contentW-6)
	d.ensure(float64(len(lines)) * lineHeight(10))
	y := p.GetY()
	p.SetXY(margin, y)
	p.CellFormat(6, lineHeight(10), "•", "", 0, "L", false, 0, "")
	for i, l := range lines {
		p.SetXY(margin+6, y+float64(i)*lineHeight(10))
		p.CellFormat(contentW-6, lineHeight(10), l, "", 0, "L", false, 0, "")
	}
	p.SetXY(margin, y+float64(len(lines))*lineHeight(10)+1.2)
}

// signOff is the heading, the statement and a box per role with a line per
// field, kept together on one page.
func (d *doc) signOff(b *reports.Block) {
	p := d.pdf
	const blockH = 52.0
	d.ensure(14 + float64(len(b.Roles))*blockH)
	if p.GetY() > topMargin+1 {
		p.Ln(4)
	}
	p.Bookmark(clean(b.Bookmark), 0, -1)
	d.font(sans, "B", 16)
	p.CellFormat(contentW, 9, clean(b.Text), "", 1, "L", false, 0, "")
	d.para(b.Subtitle, "", 9.5)
	p.Ln(2)
	for _, role := range b.Roles {
		y := p.GetY()
		p.SetLineWidth(0.3)
		p.Rect(margin, y, contentW, blockH-4, "D")
		d.font(sans, "B", 11)
		p.SetXY(margin+4, y+3)
		p.CellFormat(contentW-8, 6, clean(role), "", 0, "L", false, 0, "")
		d.font(sans, "", 9.5)
		for i, label := range b.Fields {
			ly := y + 18 + float64(i)*11
			p.SetXY(margin+4, ly-4.5)
			p.CellFormat(24, 5, clean(label), "", 0, "L", false, 0, "")
			p.SetLineWidth(0.2)
			p.Line(margin+30, ly, margin+contentW-6, ly)
		}
		p.SetXY(margin, y+blockH)
	}
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
