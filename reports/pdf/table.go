package pdf

import (
	"strings"

	"github.com/jung-kurt/gofpdf"

	"welfare/reports"
)

// maxCellLines bounds one cell so that a row always fits on a page; the
// full text is in the attached files.
const maxCellLines = 40

const cellPadY = 1.0

type rowStyle struct {
	bold bool
	fill bool
}

// table draws t's rows, which never split across pages: each row is
// measured first, and a row that does not fit starts a new page, where the
// header row (and the caption) is drawn again.
func (d *doc) table(t *reports.Table) {
	if len(t.Rows) == 0 {
		d.start(t, nil)
		return
	}
	d.start(t, t.Rows[0].Cells)
	for _, r := range t.Rows {
		d.row(t, r.Cells, rowStyle{bold: r.Bold})
	}
}

// checkFindings is one check's heading, counts and findings table; the
// heading keeps with the table's header and first row.
func (d *doc) checkFindings(b *reports.Block) {
	p, t := d.pdf, b.Table
	d.font(sans, "B", 10)
	hl := wrap(p, clean(b.Text), contentW)
	d.font(sans, "", 8.5)
	ml := wrap(p, clean(b.Subtitle), contentW)
	rh := 0.0
	if len(t.Rows) > 0 {
		_, rh = d.layoutRow(t, t.Rows[0].Cells, rowStyle{})
	}
	d.ensure(float64(len(hl))*lineHeight(10) + float64(len(ml))*lineHeight(8.5) + 3 + d.headerHeight(t) + rh)
	p.Ln(1.5)
	d.para(b.Text, "B", 10)
	d.para(b.Subtitle, "", 8.5)
	p.Ln(1)
	d.drawHeader(t)
	for _, r := range t.Rows {
		d.row(t, r.Cells, rowStyle{bold: r.Bold})
	}
	if b.More != "" {
		d.ensure(7)
		d.font(sans, "I", 8.5)
		p.Ln(1.5)
		p.MultiCell(contentW, lineHeight(8.5), clean(b.More), "", "L", false)
	}
}

func (d *doc) layoutRow(t *reports.Table, cells []string, st rowStyle) ([][]string, float64) {
	lh := lineHeight(t.Size)
	lines := make([][]string, len(t.Columns))
	n := 1
	for i, c := range t.Columns {
		d.cellFont(t, c, st)
		text := ""
		if i < len(cells) {
			text = clean(cells[i])
		}
		var ls []string
		if c.Mono {
			ls = wrapIDs(d.pdf, text, c.Width)
		} else {
			ls = wrap(d.pdf, text, c.Width)
		}
		if len(ls) > maxCellLines {
			ls = append(ls[:maxCellLines-1], "… (full text in the attached files)")
		}
		lines[i] = ls
		n = max(n, len(ls))
	}
	h := float64(n)*lh + 2*cellPadY
	if st.fill { // the header row is never stretched to the minimum
		return lines, h
	}
	return lines, max(h, t.MinRowH)
}

func (d *doc) cellFont(t *reports.Table, c reports.Column, st rowStyle) {
	switch {
	case st.bold:
		d.font(sans, "B", t.Size)
	case c.Mono:
		d.font(mono, "", t.Size-1)
	default:
		d.font(sans, "", t.Size)
	}
}

// start draws the header row, first making sure the header and the first
// row fit together (a header alone at the foot of a page helps nobody).
func (d *doc) start(t *reports.Table, first []string) {
	h := d.headerHeight(t)
	if first != nil {
		_, rh := d.layoutRow(t, first, rowStyle{})
		h += rh
	}
	d.ensure(h)
	d.drawHeader(t)
}

// headerStyle is the header row's: bold on a grey fill.
var headerStyle = rowStyle{bold: true, fill: true}

func (d *doc) headerHeight(t *reports.Table) float64 {
	_, h := d.layoutRow(t, heads(t), rowStyle{bold: true})
	return h
}

func heads(t *reports.Table) []string {
	hs := make([]string, len(t.Columns))
	for i, c := range t.Columns {
		hs[i] = c.Head
	}
	return hs
}

func (d *doc) drawHeader(t *reports.Table) {
	d.drawCells(t, heads(t), headerStyle)
}

// row draws one row, starting a new page (with the header again) when it
// does not fit.
func (d *doc) row(t *reports.Table, cells []string, st rowStyle) {
	_, h := d.layoutRow(t, cells, st)
	if d.pdf.GetY()+h > d.bottom() {
		d.pdf.AddPage()
		if t.Caption != "" {
			d.font(sans, "I", t.Size)
			d.pdf.CellFormat(contentW, lineHeight(t.Size)+1, clean(t.Caption+" (continued)"), "", 1, "L", false, 0, "")
		}
		d.drawHeader(t)
	}
	d.drawCells(t, cells, st)
}

func (d *doc) drawCells(t *reports.Table, cells []string, st rowStyle) {
	p := d.pdf
	lines, h := d.layoutRow(t, cells, st)
	lh := lineHeight(t.Size)
	x, y := margin, p.GetY()
	p.SetLineWidth(0.15)
	p.SetDrawColor(110, 110, 110)
	p.SetFillColor(226, 226, 226)
	for i, c := range t.Columns {
		style := "D"
		if st.fill {
			style = "FD"
		}
		p.Rect(x, y, c.Width, h, style)
		d.cellFont(t, c, st)
		for j, l := range lines[i] {
			p.SetXY(x, y+cellPadY+float64(j)*lh)
			p.CellFormat(c.Width, lh, l, "", 0, c.Align, false, 0, "")
		}
		x += c.Width
	}
	p.SetDrawColor(0, 0, 0)
	p.SetXY(margin, y+h)
}

// wrapIDs wraps ids and FILE:LINE refs, which have no spaces: a line too
// long for the cell breaks after the last ':', '/', '_', '.' or '-' that
// fits, so "care_rounds.csv:" and its line number stay readable.
func wrapIDs(p *gofpdf.Fpdf, text string, w float64) []string {
	avail := w - 2*p.GetCellMargin()
	var out []string
	for _, line := range strings.Split(text, "\n") {
		for p.GetStringWidth(line) > avail {
			r := []rune(line)
			fit := 1
			for fit < len(r) && p.GetStringWidth(string(r[:fit+1])) <= avail {
				fit++
			}
			cut := fit
			for i := fit - 1; i > 0; i-- {
				if strings.ContainsRune(":/_.-", r[i-1]) {
					cut = i
					break
				}
			}
			out = append(out, string(r[:cut]))
			line = string(r[cut:])
		}
		out = append(out, line)
	}
	return out
}
