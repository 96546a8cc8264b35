package reports

import (
	"strings"

	"github.com/jung-kurt/gofpdf"
)

// column is one column of a PDF table.
type column struct {
	head  string
	w     float64 // millimetres
	align string  // "L", "R" or "C"
	mono  bool    // refs and ids read better in a fixed-width face
}

// table draws rows that never split across pages: each row is measured
// first, and a row that does not fit starts a new page, where the header row
// (and the caption, when set) is drawn again.
type table struct {
	cols    []column
	size    float64 // font size, points
	caption string  // printed above the repeated header on a continuation page
	minRowH float64 // e.g. room to write a plan by hand
}

// maxCellLines bounds one cell so that a row always fits on a page; the
// full text is in the attached files.
const maxCellLines = 40

const cellPadY = 1.0

type rowStyle struct {
	bold bool
	fill bool
}

func (d *doc) layoutRow(t *table, cells []string, st rowStyle) ([][]string, float64) {
	lh := lineHeight(t.size)
	lines := make([][]string, len(t.cols))
	n := 1
	for i, c := range t.cols {
		d.cellFont(t, c, st)
		text := ""
		if i < len(cells) {
			text = clean(cells[i])
		}
		var ls []string
		if c.mono {
			ls = wrapIDs(d.pdf, text, c.w)
		} else {
			ls = wrap(d.pdf, text, c.w)
		}
		if len(ls) > maxCellLines {
			ls = append(ls[:maxCellLines-1], "… (full text in the attached files)")
		}
		lines[i] = ls
		n = max(n, len(ls))
	}
	h := float64(n)*lh + 2*cellPadY
	return lines, max(h, t.minRowH)
}

func (d *doc) cellFont(t *table, c column, st rowStyle) {
	switch {
	case st.bold:
		d.font(sans, "B", t.size)
	case c.mono:
		d.font(mono, "", t.size-1)
	default:
		d.font(sans, "", t.size)
	}
}

// start draws the header row, first making sure the header and the first
// row fit together (a header alone at the foot of a page helps nobody).
func (d *doc) start(t *table, first []string) {
	h := d.headerHeight(t)
	if first != nil {
		_, rh := d.layoutRow(t, first, rowStyle{})
		h += rh
	}
	d.ensure(h)
	d.drawHeader(t)
}

func (d *doc) headerHeight(t *table) float64 {
	_, h := d.layoutRow(t, heads(t), rowStyle{bold: true})
	return h
}

func heads(t *table) []string {
	hs := make([]string, len(t.cols))
	for i, c := range t.cols {
		hs[i] = c.head
	}
	return hs
}

func (d *doc) drawHeader(t *table) {
	min := t.minRowH
	t.minRowH = 0
	d.drawCells(t, heads(t), rowStyle{bold: true, fill: true})
	t.minRowH = min
}

// row draws one row, starting a new page (with the header again) when it
// does not fit.
func (d *doc) row(t *table, cells []string, st rowStyle) {
	_, h := d.layoutRow(t, cells, st)
	if d.pdf.GetY()+h > d.bottom() {
		d.pdf.AddPage()
		if t.caption != "" {
			d.font(sans, "I", t.size)
			d.pdf.CellFormat(contentW, lineHeight(t.size)+1, clean(t.caption+" (continued)"), "", 1, "L", false, 0, "")
		}
		d.drawHeader(t)
	}
	d.drawCells(t, cells, st)
}

func (d *doc) drawCells(t *table, cells []string, st rowStyle) {
	p := d.pdf
	lines, h := d.layoutRow(t, cells, st)
	lh := lineHeight(t.size)
	x, y := margin, p.GetY()
	p.SetLineWidth(0.15)
	p.SetDrawColor(110, 110, 110)
	p.SetFillColor(226, 226, 226)
	for i, c := range t.cols {
		style := "D"
		if st.fill {
			style = "FD"
		}
		p.Rect(x, y, c.w, h, style)
		d.cellFont(t, c, st)
		for j, l := range lines[i] {
			p.SetXY(x, y+cellPadY+float64(j)*lh)
			p.CellFormat(c.w, lh, l, "", 0, c.align, false, 0, "")
		}
		x += c.w
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
