package reports

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/jung-kurt/gofpdf"

	"welfare/checker"
	"welfare/checker/cold"
	"welfare/records"
)

// Greyscale fills that survive a black-and-white office printer, each with
// its own texture so the severities stay apart even on a faint copy.
type pattern struct {
	grey   int     // fill level, 0 black … 255 white
	hatch  float64 // spacing of diagonal lines in mm, 0 for none
	cross  bool    // hatch both ways
	dotted bool
}

var severityPattern = map[checker.Severity]pattern{
	checker.Significant: {grey: 45},
	checker.Minor:       {grey: 190, hatch: 1.3},
	checker.Note:        {grey: 255, dotted: true},
}

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

// barChart draws findings per domain as horizontal bars stacked by severity.
func (d *doc) barChart() {
	p, t := d.pdf, d.tall
	const labelW, barH, gap = 28.0, 5.0, 2.0
	plotW := contentW - labelW - 16
	n := len(t.domains)
	h := float64(n)*(barH+gap) + 22
	d.ensure(h)
	x0, y0 := margin+labelW, p.GetY()+2

	maxTotal := 0
	for _, dom := range t.domains {
		maxTotal = max(maxTotal, t.domainTotal(dom))
	}
	step := niceStep(float64(max(maxTotal, 1)), 5)
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
	for i, dom := range t.domains {
		y := y0 + float64(i)*(barH+gap) + gap/2
		d.font(sans, "", 8.5)
		p.SetXY(margin, y)
		p.CellFormat(labelW-2, barH, dom, "", 0, "R", false, 0, "")
		x := x0
		for _, s := range severities {
			c := t.get(dom, s)
			if c == 0 {
				continue
			}
			w := float64(c) / top * plotW
			d.fillPattern(x, y, w, barH, severityPattern[s], true)
			x += w
		}
		if tot := t.domainTotal(dom); tot > 0 {
			d.font(sans, "", 7.5)
			p.SetXY(x+1, y)
			p.CellFormat(14, barH, itoa(tot), "", 0, "L", false, 0, "")
		}
	}
	p.SetLineWidth(0.3)
	p.Line(x0, y0, x0, y0+plotH)

	// Legend.
	ly := y0 + plotH + 6
	x := x0
	d.font(sans, "", 8)
	for _, s := range severities {
		d.fillPattern(x, ly, 6, 3.5, severityPattern[s], true)
		p.SetXY(x+7, ly)
		label := string(s)
		p.CellFormat(p.GetStringWidth(label)+2, 3.5, label, "", 0, "L", false, 0, "")
		x += 7 + p.GetStringWidth(label) + 8
	}
	p.SetXY(margin, ly+7)
}

// hazardBand is one Environment and Climate Change Canada wind chill band
// as the chart draws it: its edges in °C and its greyscale pattern.
type hazardBand struct {
	hi, lo float64 // °C, hi warmer
	label  string
	pat    pattern
}

// bandPatterns shade the bands from the mildest to the most severe, readable
// in greyscale print; our own choice, not the published colours.
var bandPatterns = []pattern{
	{grey: 255}, {grey: 244}, {grey: 226}, {grey: 214, hatch: 2.2}, {grey: 200, hatch: 1.2}, {grey: 186, hatch: 1.4, cross: true},
}

// hazardBands are the published bands of checker/cold (the one place they
// are written down), with the whole-degree edges the chart draws them at;
// the coldest band is open-ended and drawn to the bottom of the chart.
var hazardBands = func() []hazardBand {
	var out []hazardBand
	for _, b := range cold.Bands() {
		if b.Level == 0 {
			continue // above 0: no band to shade
		}
		lo := math.Inf(-1)
		if b.ColdestC != math.MinInt {
			lo = float64(b.ColdestC - 1)
		}
		label := strings.ReplaceAll(b.Range(), "-", "−") + ": " + b.Wording
		out = append(out, hazardBand{hi: float64(b.WarmestC), lo: lo, label: label, pat: bandPatterns[b.Level-1]})
	}
	return out
}()

func (d *doc) coldSeason() {
	r := d.r
	d.heading("Cold season")
	lines := coldLines(r.ColdLines)
	var marks []string
	for _, l := range lines {
		marks = append(marks, fmt.Sprintf("%s (%s)", minus(l.v), l.what))
	}
	d.para("Daily minimum air temperature and minimum wind chill per weather site (°C), against the wind chill hazard bands "+
		"of Environment and Climate Change Canada. The dashed lines mark the wind chills the cold checks used: "+
		strings.Join(marks, " and ")+". Triangles under a chart mark days with cold-domain findings "+
		"for that site, its enclosures and staff, with their number.", "", 9)
	for _, s := range r.Weather {
		if len(s.Days) == 0 {
			continue
		}
		d.coldChart(s)
	}
}

// coldMarks counts, per day of the chart, the cold findings of one site.
func (d *doc) coldMarks(site string, from, to records.Day) map[records.Day]int {
	single := 0
	for _, s := range d.r.Weather {
		if len(s.Days) > 0 {
			single++
		}
	}
	marks := map[records.Day]int{}
	for i := range d.r.Findings {
		f := &d.r.Findings[i]
		if domainOf(f) != "cold" {
			continue
		}
		mapped, ok := d.opt.SiteOf[f.Subject]
		mine := f.Subject == site || (ok && mapped == site) || (!ok && single == 1)
		if !mine || f.On.IsZero() {
			continue
		}
		last := f.Until
		if last < f.On {
			last = f.On
		}
		for day := max(f.On, from); day <= min(last, to); day++ {
			marks[day]++
		}
	}
	return marks
}

func (d *doc) coldChart(s checker.SiteDays) {
	p := d.pdf
	const (
		leftW  = 14.0
		rightW = 34.0
		plotH  = 72.0
	)
	plotW := contentW - leftW - rightW
	from, to := d.r.Period.From, d.r.Period.To
	if from.IsZero() || to < from {
		from, to = s.Days[0].Day, s.Days[0].Day
		for _, x := range s.Days {
			from, to = min(from, x.Day), max(to, x.Day)
		}
	}
	n := int(to-from) + 1

	// Value range: always show −30 so both lines and the first freezing
	// band are on every chart, and 0 so the scale reads at a glance.
	lo, hi := -30.0, 0.0
	var coldest *checker.DayCold
	below28, missing := 0, 0
	for i := range s.Days {
		x := &s.Days[i]
		if x.Readings == 0 || x.Day < from || x.Day > to {
			continue
		}
		lo = min(lo, x.MinAirC, x.MinWindChillC)
		hi = max(hi, x.MinAirC, x.MinWindChillC)
		if coldest == nil || x.MinWindChillC < coldest.MinWindChillC {
			coldest = x
		}
		if x.MinWindChillC <= d.r.ColdLines.Frostbite {
			below28++
		}
	}
	have := map[records.Day]bool{}
	for _, x := range s.Days {
		if x.Readings > 0 {
			have[x.Day] = true
		}
	}
	for day := from; day <= to; day++ {
		if !have[day] {
			missing++
		}
	}
	yMin := math.Floor((lo-2)/5) * 5
	yMax := math.Ceil((hi+1)/5) * 5

	summary := fmt.Sprintf("Days with wind chill ≤ %s: %d. Days without readings: %d.", minus(d.r.ColdLines.Frostbite), below28, missing)
	if coldest != nil {
		summary = fmt.Sprintf("Coldest wind chill %s on %s (air %s). ", celsius(coldest.MinWindChillC), coldest.Day, celsius(coldest.MinAirC)) + summary
	}
	total := 9 + 8 + plotH + 22 + 3*5.0 + 6
	d.ensure(total)
	d.subheading("Weather site "+s.Site, total-10)
	d.para(summary, "", 8.5)

	// Legend above the plot.
	ly := p.GetY() + 2
	x0 := margin + leftW
	d.font(sans, "", 8)
	p.SetLineWidth(0.35)
	p.Line(x0, ly+1.8, x0+8, ly+1.8)
	p.Circle(x0+4, ly+1.8, 0.6, "F")
	p.SetXY(x0+9, ly)
	p.CellFormat(52, 3.6, "air temperature, daily minimum", "", 0, "L", false, 0, "")
	p.SetDrawColor(70, 70, 70)
	p.SetLineWidth(0.6)
	p.SetDashPattern([]float64{1.4, 0.9}, 0)
	p.Line(x0+62, ly+1.8, x0+70, ly+1.8)
	p.SetDashPattern([]float64{}, 0)
	p.SetFillColor(70, 70, 70)
	p.Rect(x0+65.3, ly+1.1, 1.4, 1.4, "F")
	p.SetXY(x0+71, ly)
	p.CellFormat(60, 3.6, "wind chill, daily minimum", "", 0, "L", false, 0, "")
	p.SetDrawColor(0, 0, 0)

	y0 := ly + 7
	yOf := func(v float64) float64 { return y0 + (yMax-v)/(yMax-yMin)*plotH }
	xOf := func(day records.Day) float64 { return x0 + (float64(day-from)+0.5)*plotW/float64(n) }

	// Hazard bands, clipped to the plot.
	for _, b := range hazardBands {
		top, bot := math.Min(b.hi, yMax), math.Max(b.lo, yMin)
		if top <= bot {
			continue
		}
		d.fillPattern(x0, yOf(top), plotW, yOf(bot)-yOf(top), b.pat, false)
	}
	// Grid and y scale.
	step := 5.0
	if yMax-yMin > 50 {
		step = 10
	}
	d.font(sans, "", 7)
	p.SetLineWidth(0.1)
	for v := yMin; v <= yMax+0.01; v += step {
		y := yOf(v)
		p.SetDrawColor(170, 170, 170)
		p.Line(x0, y, x0+plotW, y)
		p.SetXY(margin, y-1.7)
		p.CellFormat(leftW-1.5, 3.4, signed(int(v)), "", 0, "R", false, 0, "")
	}
	p.SetDrawColor(0, 0, 0)
	p.SetLineWidth(0.3)
	p.Rect(x0, y0, plotW, plotH, "D")
	d.font(sans, "", 6.5)
	p.SetXY(margin, y0-4.5)
	p.CellFormat(leftW, 3, "°C", "", 0, "R", false, 0, "")

	// The cold checks' thresholds, labelled in the right margin.
	for i, l := range coldLines(d.r.ColdLines) {
		if l.v < yMin || l.v > yMax {
			continue
		}
		p.SetLineWidth(0.4)
		p.SetDashPattern(lineDashes[i%len(lineDashes)], 0)
		p.Line(x0, yOf(l.v), x0+plotW, yOf(l.v))
		p.SetDashPattern([]float64{}, 0)
		d.font(sans, "B", 7)
		p.SetXY(x0+plotW+1, yOf(l.v)-1.7)
		p.CellFormat(rightW-1, 3.4, minus(l.v)+": "+l.what, "", 0, "L", false, 0, "")
	}

	// X ticks; labels far enough apart to stay legible.
	labelEvery := int(math.Ceil(12 / (plotW / float64(n))))
	d.font(sans, "", 6.5)
	p.SetLineWidth(0.2)
	for day := from; day <= to; day++ {
		x := xOf(day)
		p.Line(x, y0+plotH, x, y0+plotH+1)
		if int(day-from)%labelEvery == 0 {
			p.SetXY(x-7, y0+plotH+1.2)
			p.CellFormat(14, 3, day.Time().Format("01-02"), "", 0, "C", false, 0, "")
		}
	}

	// Series: a gap where a day had no readings, never a line across it.
	byDay := map[records.Day]checker.DayCold{}
	for _, x := range s.Days {
		if x.Readings > 0 && x.Day >= from && x.Day <= to {
			byDay[x.Day] = x
		}
	}
	series := func(val func(checker.DayCold) float64, dash []float64, grey int, width float64, marker func(x, y float64)) {
		p.SetDrawColor(grey, grey, grey)
		p.SetFillColor(grey, grey, grey)
		p.SetLineWidth(width)
		p.SetDashPattern(dash, 0)
		for day := from; day < to; day++ {
			a, okA := byDay[day]
			b, okB := byDay[day+1]
			if okA && okB {
				p.Line(xOf(day), yOf(val(a)), xOf(day+1), yOf(val(b)))
			}
		}
		p.SetDashPattern([]float64{}, 0)
		for day := from; day <= to; day++ {
			if a, ok := byDay[day]; ok {
				marker(xOf(day), yOf(val(a)))
			}
		}
		p.SetDrawColor(0, 0, 0)
	}
	series(func(x checker.DayCold) float64 { return x.MinAirC }, []float64{}, 0, 0.35,
		func(x, y float64) { p.Circle(x, y, 0.6, "F") })
	series(func(x checker.DayCold) float64 { return x.MinWindChillC }, []float64{1.4, 0.9}, 70, 0.6,
		func(x, y float64) { p.Rect(x-0.7, y-0.7, 1.4, 1.4, "F") })

	// Days with cold findings.
	my := y0 + plotH + 6.5
	marks := d.coldMarks(s.Site, from, to)
	p.SetFillColor(0, 0, 0)
	d.font(sans, "", 5.5)
	for day := from; day <= to; day++ {
		c := marks[day]
		if c == 0 {
			continue
		}
		x := xOf(day)
		p.Polygon([]gofpdf.PointType{{X: x, Y: my}, {X: x - 1.2, Y: my + 2.1}, {X: x + 1.2, Y: my + 2.1}}, "F")
		p.SetXY(x-3, my+2.3)
		p.CellFormat(6, 2.6, itoa(c), "", 0, "C", false, 0, "")
	}
	d.font(sans, "", 7)
	p.SetXY(x0+plotW+1, my)
	p.CellFormat(rightW-1, 3, "▲ days with cold", "", 2, "L", false, 0, "")
	p.SetX(x0 + plotW + 1)
	p.CellFormat(rightW-1, 3, "findings (count)", "", 0, "L", false, 0, "")

	// Band key, two columns.
	ky := my + 8
	d.font(sans, "", 7.5)
	for i, b := range hazardBands {
		col, rowN := i%2, i/2
		x := margin + float64(col)*contentW/2
		y := ky + float64(rowN)*5
		d.fillPattern(x, y, 7, 3.5, b.pat, true)
		p.SetXY(x+8, y)
		p.CellFormat(contentW/2-9, 3.5, b.label, "", 0, "L", false, 0, "")
	}
	p.SetXY(margin, ky+3*5+4)
}

// coldLine is one reference line of the cold chart.
type coldLine struct {
	v    float64
	what string
}

var lineDashes = [][]float64{{2, 1}, {0.6, 0.8}, {3, 1, 0.6, 1}}

// coldLines are the thresholds of the limits in force, warmest first, with
// checks that share a threshold on one line ("−20: bedding, shelter").
func coldLines(c checker.ColdLines) []coldLine {
	var out []coldLine
	add := func(v float64, what string) {
		for i := range out {
			if out[i].v == v {
				out[i].what += ", " + what
				return
			}
		}
		out = append(out, coldLine{v, what})
	}
	add(c.Bedding, "bedding")
	add(c.Shelter, "shelter")
	add(c.Frostbite, "frostbite risk")
	slices.SortStableFunc(out, func(a, b coldLine) int { return cmp.Compare(b.v, a.v) })
	return out
}

// minus writes a number with a true minus sign, as the report prints them.
func minus(v float64) string {
	return strings.ReplaceAll(strconv.FormatFloat(v, 'f', -1, 64), "-", "−")
}
