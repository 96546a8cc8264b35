package pdf

import (
	"fmt"
	"math"

	"github.com/jung-kurt/gofpdf"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
)

// Greyscale fills that survive a black-and-white office printer, each with
// its own texture so the severities stay apart even on a faint copy.
type pattern struct {
	grey   int     // fill level, 0 black … 255 white
	hatch  float64 // spacing of diagonal lines in mm, 0 for none
	cross  bool    // hatch both ways
	dotted bool
}

var severityPattern = map[string]pattern{
	string(checker.Significant): {grey: 45},
	string(checker.Minor):       {grey: 190, hatch: 1.3},
	string(checker.Note):        {grey: 255, dotted: true},
}

// legendSeverities are the bar chart's legend, most severe first.
var legendSeverities = []checker.Severity{checker.Significant, checker.Minor, checker.Note}

// bandPatterns shade the hazard bands from the mildest (level 1) to the
// most severe, readable in greyscale print; our own choice, not the
// published colours.
var bandPatterns = []pattern{
	{grey: 255}, {grey: 244}, {grey: 226}, {grey: 214, hatch: 2.2}, {grey: 200, hatch: 1.2}, {grey: 186, hatch: 1.4, cross: true},
}

func bandPattern(level int) pattern {
	if level < 1 || level > len(bandPatterns) {
		return pattern{grey: 255}
	}
	return bandPatterns[level-1]
}

// lineDashes are the reference lines' dash patterns, by RefLine.Style.
var lineDashes = [][]float64{{2, 1}, {0.6, 0.8}, {3, 1, 0.6, 1}}

// fillPattern fills the rectangle with p and outlines it.
func (d *doc) fillPattern(x, y, w, h float64, p pattern, outline bool) {
	if w <= 0 || h <= 0 {
		return
	}
	f := d.pdf
	f.SetFillColor(p.grey, p.grey, p.grey)
	f.Rect(x, y, w, h, "F")
	if p.hatch > 0 || p.dotted {
		f.ClipRect(x, y, w, h, false)
		f.SetLineWidth(0.15)
		f.SetDrawColor(60, 60, 60)
		if p.hatch > 0 {
			for o := -h; o < w; o += p.hatch {
				f.Line(x+o, y+h, x+o+h, y)
				if p.cross {
					f.Line(x+o, y, x+o+h, y+h)
				}
			}
		}
		if p.dotted {
			f.SetFillColor(90, 90, 90)
			for yy := y + 0.8; yy < y+h; yy += 1.4 {
				for xx := x + 0.8; xx < x+w; xx += 1.4 {
					f.Circle(xx, yy, 0.18, "F")
				}
			}
		}
		f.ClipEnd()
	}
	if outline {
		f.SetDrawColor(0, 0, 0)
		f.SetLineWidth(0.2)
		f.Rect(x, y, w, h, "D")
	}
	f.SetDrawColor(0, 0, 0)
}

// niceStep picks a tick step of 1, 2 or 5 × 10ⁿ giving about n ticks.
func niceStep(span float64, n int) float64 {
	if span <= 0 {
		return 1
	}
	raw := span / float64(n)
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*mag >= raw {
			return m * mag
		}
	}
	return 10 * mag
}

// keyPatterns fill the segments of a bar chart with named keys (causes of
// death), in the order of the keys; distinct in greyscale print.
var keyPatterns = []pattern{
	{grey: 45}, {grey: 190, hatch: 1.3}, {grey: 255, dotted: true}, {grey: 120},
	{grey: 220, hatch: 1.6, cross: true}, {grey: 160, hatch: 0.9}, {grey: 235}, {grey: 90, dotted: true},
}

// segmentPattern is a segment's fill: by its key's place among keys, or by
// its severity when the chart has no keys.
func segmentPattern(s reports.Segment, keys []string) pattern {
	if len(keys) == 0 {
		return severityPattern[s.Severity]
	}
	for i, k := range keys {
		if k == s.Key {
			return keyPatterns[i%len(keyPatterns)]
		}
	}
	return pattern{grey: 255}
}

// barChart draws horizontal stacked bars: findings per domain by severity,
// or, with keys, the named parts of each bar (deaths per month by cause).
func (d *doc) barChart(bars []reports.Bar, keys []string) {
	p := d.pdf
	const labelW, barH, gap = 28.0, 5.0, 2.0
	plotW := contentW - labelW - 16
	n := len(bars)
	h := float64(n)*(barH+gap) + 22
	d.ensure(h)
	x0, y0 := margin+labelW, p.GetY()+2

	maxTotal := 0
	for _, b := range bars {
		maxTotal = max(maxTotal, b.Total)
	}
	step := max(niceStep(float64(max(maxTotal, 1)), 5), 1) // counts: whole steps
	top := math.Ceil(float64(max(maxTotal, 1))/step) * step
	xOf := func(v float64) float64 { return x0 + v/top*plotW }

	// Grid and scale.
	plotH := float64(n) * (barH + gap)
	d.font(sans, "", 7)
	p.SetLineWidth(0.1)
	for v := 0.0; v <= top+step/2; v += step {
		x := xOf(v)
		p.SetDrawColor(190, 190, 190)
		p.Line(x, y0, x, y0+plotH)
		p.SetXY(x-8, y0+plotH+0.5)
		p.CellFormat(16, 3.5, fmt.Sprintf("%g", v), "", 0, "C", false, 0, "")
	}
	p.SetDrawColor(0, 0, 0)
	for i, b := range bars {
		y := y0 + float64(i)*(barH+gap) + gap/2
		d.font(sans, "", 8.5)
		p.SetXY(margin, y)
		p.CellFormat(labelW-2, barH, clean(b.Label), "", 0, "R", false, 0, "")
		x := x0
		for _, s := range b.Segments {
			if s.Count == 0 {
				continue
			}
			w := float64(s.Count) / top * plotW
			d.fillPattern(x, y, w, barH, segmentPattern(s, keys), true)
			x += w
		}
		if b.Total > 0 {
			d.font(sans, "", 7.5)
			p.SetXY(x+1, y)
			p.CellFormat(14, barH, fmt.Sprint(b.Total), "", 0, "L", false, 0, "")
		}
	}
	p.SetLineWidth(0.3)
	p.Line(x0, y0, x0, y0+plotH)

	// Legend.
	ly := y0 + plotH + 6
	x := x0
	d.font(sans, "", 8)
	legend := keys
	if len(keys) == 0 {
		for _, s := range legendSeverities {
			legend = append(legend, string(s))
		}
	}
	for _, label := range legend {
		w := 7 + p.GetStringWidth(clean(label)) + 8
		if x+w > margin+contentW {
			x, ly = x0, ly+5
		}
		d.fillPattern(x, ly, 6, 3.5, segmentPattern(reports.Segment{Severity: label, Key: label}, keys), true)
		p.SetXY(x+7, ly)
		p.CellFormat(p.GetStringWidth(clean(label))+2, 3.5, clean(label), "", 0, "L", false, 0, "")
		x += w
	}
	p.SetXY(margin, ly+7)
}

// careBar draws the care coverage as a bar, complete days dark.
func (d *doc) careBar(c *reports.CareBar) {
	if c == nil || c.Occupied == 0 {
		return
	}
	p := d.pdf
	d.ensure(10)
	y := p.GetY() + 2
	const w, h = 120.0, 5.0
	p.SetLineWidth(0.2)
	p.SetFillColor(255, 255, 255)
	p.Rect(margin, y, w, h, "D")
	frac := float64(c.Complete) / float64(c.Occupied)
	frac = min(max(frac, 0), 1)
	p.SetFillColor(70, 70, 70)
	if frac > 0 {
		p.Rect(margin, y, w*frac, h, "F")
	}
	d.font(sans, "", 8.5)
	p.SetXY(margin+w+3, y)
	p.CellFormat(50, h, clean(c.Caption), "", 0, "L", false, 0, "")
	p.SetXY(margin, y+h+3)
}

// dayChart draws a daily series chart: its title and summary, a legend,
// the bands, the reference lines, the series, the marked days and the band
// key. The cold season, the warm season, the indoor climate and the
// weighings of an animal are all drawn here.
func (d *doc) dayChart(c *reports.DayChart) {
	p := d.pdf
	const (
		leftW  = 14.0
		rightW = 34.0
	)
	plotH := c.Height
	if plotH <= 0 {
		plotH = 72
	}
	plotW := contentW - leftW - rightW
	from, to := c.From, c.To
	if to < from {
		to = from
	}
	n := int(to-from) + 1
	yMin, yMax := c.YMin, c.YMax
	if yMax <= yMin {
		yMax = yMin + 1
	}
	keyRows := (len(c.Bands) + 1) / 2
	marksH := 0.0
	if len(c.Marks) > 0 || len(c.MarksLabel) > 0 {
		marksH = 8
	}

	// A small chart of one series (an animal's weighings) has no legend
	// row: its summary names the series.
	legend := len(c.Series) > 1 || c.Height == 0
	legendH := 7.0
	if !legend {
		legendH = 5
	}
	total := 9 + 8 + plotH + legendH + 7 + marksH + float64(keyRows)*5 + 6
	if keyRows == 0 {
		total = 9 + 8 + plotH + legendH + 6 + marksH
	}
	d.ensure(total)
	d.subheading(c.Title, total-10)
	if c.Summary != "" {
		d.para(c.Summary, "", 8.5)
	}

	// Legend above the plot: one entry per series, drawn in its style.
	ly := p.GetY() + 2
	x0 := margin + leftW
	d.font(sans, "", 8)
	if legend && len(c.Series) > 0 {
		p.SetLineWidth(0.35)
		p.Line(x0, ly+1.8, x0+8, ly+1.8)
		p.Circle(x0+4, ly+1.8, 0.6, "F")
		p.SetXY(x0+9, ly)
		p.CellFormat(52, 3.6, clean(c.Series[0].Name), "", 0, "L", false, 0, "")
	}
	if len(c.Series) > 1 {
		p.SetDrawColor(70, 70, 70)
		p.SetLineWidth(0.6)
		p.SetDashPattern([]float64{1.4, 0.9}, 0)
		p.Line(x0+62, ly+1.8, x0+70, ly+1.8)
		p.SetDashPattern([]float64{}, 0)
		p.SetFillColor(70, 70, 70)
		p.Rect(x0+65.3, ly+1.1, 1.4, 1.4, "F")
		p.SetXY(x0+71, ly)
		p.CellFormat(60, 3.6, clean(c.Series[1].Name), "", 0, "L", false, 0, "")
		p.SetDrawColor(0, 0, 0)
	}

	y0 := ly + legendH
	yOf := func(v float64) float64 { return y0 + (yMax-v)/(yMax-yMin)*plotH }
	xOf := func(day records.Day) float64 { return x0 + (float64(day-from)+0.5)*plotW/float64(n) }

	// Bands, clipped to the plot.
	for _, b := range c.Bands {
		lo, hi := b.Lo, b.Hi
		if b.OpenBelow {
			lo = math.Inf(-1)
		}
		if b.OpenAbove {
			hi = math.Inf(1)
		}
		top, bot := math.Min(hi, yMax), math.Max(lo, yMin)
		if top <= bot {
			continue
		}
		d.fillPattern(x0, yOf(top), plotW, yOf(bot)-yOf(top), bandPattern(b.Level), false)
	}
	// Grid and y scale.
	d.font(sans, "", 7)
	p.SetLineWidth(0.1)
	for _, t := range c.YTicks {
		y := yOf(t.Value)
		p.SetDrawColor(170, 170, 170)
		p.Line(x0, y, x0+plotW, y)
		p.SetXY(margin, y-1.7)
		p.CellFormat(leftW-1.5, 3.4, clean(t.Label), "", 0, "R", false, 0, "")
	}
	p.SetDrawColor(0, 0, 0)
	p.SetLineWidth(0.3)
	p.Rect(x0, y0, plotW, plotH, "D")
	d.font(sans, "", 6.5)
	p.SetXY(margin, y0-4.5)
	p.CellFormat(leftW, 3, clean(c.Unit), "", 0, "R", false, 0, "")

	// Thresholds, labelled in the right margin.
	for _, l := range c.Lines {
		p.SetLineWidth(0.4)
		p.SetDashPattern(lineDashes[l.Style%len(lineDashes)], 0)
		p.Line(x0, yOf(l.Value), x0+plotW, yOf(l.Value))
		p.SetDashPattern([]float64{}, 0)
		d.font(sans, "B", 7)
		p.SetXY(x0+plotW+1, yOf(l.Value)-1.7)
		p.CellFormat(rightW-1, 3.4, clean(l.Label), "", 0, "L", false, 0, "")
	}

	// X ticks; labels far enough apart to stay legible.
	labelEvery := int(math.Ceil(12 / (plotW / float64(n))))
	d.font(sans, "", 6.5)
	p.SetLineWidth(0.2)
	for day := from; day <= to; day++ {
		x := xOf(day)
		if n <= 120 || int(day-from)%labelEvery == 0 {
			p.Line(x, y0+plotH, x, y0+plotH+1)
		}
		if int(day-from)%labelEvery == 0 {
			p.SetXY(x-7, y0+plotH+1.2)
			p.CellFormat(14, 3, day.Time().Format("01-02"), "", 0, "C", false, 0, "")
		}
	}

	// Series: a gap where a day had no readings, never a line across it,
	// unless the series joins its points.
	series := func(s reports.Series, dash []float64, grey int, width float64, marker func(x, y float64)) {
		p.SetDrawColor(grey, grey, grey)
		p.SetFillColor(grey, grey, grey)
		p.SetLineWidth(width)
		p.SetDashPattern(dash, 0)
		for i := 0; i+1 < len(s.Points); i++ {
			a, b := s.Points[i], s.Points[i+1]
			if b.Day == a.Day+1 || (s.Joined && b.Day > a.Day) {
				p.Line(xOf(a.Day), yOf(a.Value), xOf(b.Day), yOf(b.Value))
			}
		}
		p.SetDashPattern([]float64{}, 0)
		for _, a := range s.Points {
			marker(xOf(a.Day), yOf(a.Value))
		}
		p.SetDrawColor(0, 0, 0)
	}
	if len(c.Series) > 0 {
		series(c.Series[0], []float64{}, 0, 0.35, func(x, y float64) { p.Circle(x, y, 0.6, "F") })
	}
	if len(c.Series) > 1 {
		series(c.Series[1], []float64{1.4, 0.9}, 70, 0.6, func(x, y float64) { p.Rect(x-0.7, y-0.7, 1.4, 1.4, "F") })
	}

	// Days with findings.
	my := y0 + plotH + 6.5
	p.SetFillColor(0, 0, 0)
	d.font(sans, "", 5.5)
	for _, m := range c.Marks {
		if m.Count == 0 || m.Day < from || m.Day > to {
			continue
		}
		x := xOf(m.Day)
		p.Polygon([]gofpdf.PointType{{X: x, Y: my}, {X: x - 1.2, Y: my + 2.1}, {X: x + 1.2, Y: my + 2.1}}, "F")
		p.SetXY(x-3, my+2.3)
		p.CellFormat(6, 2.6, fmt.Sprint(m.Count), "", 0, "C", false, 0, "")
	}
	d.font(sans, "", 7)
	for i, l := range c.MarksLabel {
		if i == 0 {
			p.SetXY(x0+plotW+1, my)
		} else {
			p.SetX(x0 + plotW + 1)
		}
		ln := 2
		if i == len(c.MarksLabel)-1 {
			ln = 0
		}
		p.CellFormat(rightW-1, 3, clean(l), "", ln, "L", false, 0, "")
	}

	// Band key, two columns.
	ky := y0 + plotH + 7
	if marksH > 0 {
		ky = my + 8
	}
	d.font(sans, "", 7.5)
	for i, b := range c.Bands {
		col, rowN := i%2, i/2
		x := margin + float64(col)*contentW/2
		y := ky + float64(rowN)*5
		d.fillPattern(x, y, 7, 3.5, bandPattern(b.Level), true)
		p.SetXY(x+8, y)
		p.CellFormat(contentW/2-9, 3.5, clean(b.Label), "", 0, "L", false, 0, "")
	}
	end := ky + float64(keyRows)*5 + 4
	if keyRows == 0 {
		end = y0 + plotH + 6 + marksH
	}
	p.SetXY(margin, end)
}
