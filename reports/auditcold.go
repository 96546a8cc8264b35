package reports

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"welfare/checker"
	"welfare/checker/cold"
	"welfare/records"
)

// hazardBands are the published bands of checker/cold (the one place they
// are written down), with the whole-degree edges the chart draws them at;
// the coldest band is open-ended and drawn to the bottom of the chart.
func hazardBands() []Band {
	var out []Band
	for _, b := range cold.Bands() {
		if b.Level == 0 {
			continue // above 0: no band to shade
		}
		band := Band{Hi: float64(b.WarmestC), Level: b.Level,
			Label: strings.ReplaceAll(b.Range(), "-", "−") + ": " + b.Wording}
		if b.ColdestC == math.MinInt {
			band.OpenBelow = true
		} else {
			band.Lo = float64(b.ColdestC - 1)
		}
		out = append(out, band)
	}
	return out
}

func (b *auditBuilder) coldSeason() AuditSection {
	r := b.r
	var marks []string
	for _, l := range coldLines(r.ColdLines) {
		marks = append(marks, fmt.Sprintf("%s (%s)", minus(l.v), l.what))
	}
	b.add(para("Daily minimum air temperature and minimum wind chill per weather site (°C), against the wind chill hazard bands "+
		"of Environment and Climate Change Canada. The dashed lines mark the wind chills the cold checks used: "+
		strings.Join(marks, " and ")+". Triangles under a chart mark days with cold-domain findings "+
		"for that site, its enclosures and staff, with their number.", "", 9))
	for _, s := range r.Weather {
		if len(s.Days) == 0 {
			continue
		}
		b.add(Block{Kind: KindDayChart, Chart: b.coldChart(s)})
	}
	return b.section("Cold season", true, "Cold season")
}

// siteMarks counts, per day of the chart, the findings of one domain at one
// weather site (the site itself, or a subject SiteOf maps to it; with a
// single weather site, every finding of the domain).
func (b *auditBuilder) siteMarks(domain, site string, from, to records.Day) []Mark {
	single := 0
	for _, s := range b.r.Weather {
		if len(s.Days) > 0 {
			single++
		}
	}
	marks := map[records.Day]int{}
	for i := range b.r.Findings {
		f := &b.r.Findings[i]
		if domainOf(f) != domain {
			continue
		}
		mapped, ok := b.opt.SiteOf[f.Subject]
		mine := f.Subject == site || (ok && mapped == site) || (!ok && single == 1)
		if mine {
			countDays(marks, f, from, to)
		}
	}
	return marksOf(marks, from, to)
}

// countDays adds each day of f (its run, when it has one) within from..to.
func countDays(marks map[records.Day]int, f *checker.Finding, from, to records.Day) {
	if f.On.IsZero() {
		return
	}
	last := max(f.Until, f.On)
	for day := max(f.On, from); day <= min(last, to); day++ {
		marks[day]++
	}
}

// marksOf lists the counted days in order.
func marksOf(marks map[records.Day]int, from, to records.Day) []Mark {
	out := []Mark{}
	for day := from; day <= to; day++ {
		if c := marks[day]; c > 0 {
			out = append(out, Mark{Day: day, Count: c})
		}
	}
	return out
}

func (b *auditBuilder) coldChart(s checker.SiteDays) *DayChart {
	r := b.r
	from, to := r.Period.From, r.Period.To
	if from.IsZero() || to < from {
		from, to = s.Days[0].Day, s.Days[0].Day
		for _, x := range s.Days {
			from, to = min(from, x.Day), max(to, x.Day)
		}
	}

	// Value range: always show −30 so both lines and the first freezing
	// band are on every chart, and 0 so the scale reads at a glance.
	lo, hi := -30.0, 0.0
	var coldest *checker.DayCold
	below, missing, windless := 0, 0, 0
	have := map[records.Day]bool{}
	air := Series{Name: "air temperature, daily minimum", Points: []Point{}}
	chill := Series{Name: "wind chill, daily minimum", Points: []Point{}}
	for i := range s.Days {
		x := &s.Days[i]
		if x.Readings == 0 {
			continue
		}
		have[x.Day] = true
		if x.Day < from || x.Day > to {
			continue
		}
		lo, hi = min(lo, x.MinAirC), max(hi, x.MinAirC)
		if x.WindReadings == 0 {
			windless++
			continue // no wind chill: a reading without wind is not calm
		}
		lo, hi = min(lo, x.MinWindChillC), max(hi, x.MinWindChillC)
		if coldest == nil || x.MinWindChillC < coldest.MinWindChillC {
			coldest = x
		}
		if x.MinWindChillC <= r.ColdLines.Frostbite {
			below++
		}
	}
	for day := from; day <= to; day++ {
		if !have[day] {
			missing++
		}
	}
	// One point per day with readings; a later row for the same day wins,
	// as the chart has always drawn it.
	byDay := map[records.Day]checker.DayCold{}
	for _, x := range s.Days {
		if x.Readings > 0 && x.Day >= from && x.Day <= to {
			byDay[x.Day] = x
		}
	}
	for day := from; day <= to; day++ {
		if x, ok := byDay[day]; ok {
			air.Points = append(air.Points, Point{Day: day, Value: x.MinAirC})
			if x.WindReadings > 0 {
				chill.Points = append(chill.Points, Point{Day: day, Value: x.MinWindChillC})
			}
		}
	}
	yMin := math.Floor((lo-2)/5) * 5
	yMax := math.Ceil((hi+1)/5) * 5
	step := 5.0
	if yMax-yMin > 50 {
		step = 10
	}
	ticks := []Tick{}
	for v := yMin; v <= yMax+0.01; v += step {
		ticks = append(ticks, Tick{Value: v, Label: signed(int(v))})
	}
	lines := []RefLine{}
	for i, l := range coldLines(r.ColdLines) {
		if l.v < yMin || l.v > yMax {
			continue
		}
		lines = append(lines, RefLine{Value: l.v, Label: minus(l.v) + ": " + l.what, Style: i})
	}

	summary := fmt.Sprintf("Days with wind chill ≤ %s: %d. Days without readings: %d.", minus(r.ColdLines.Frostbite), below, missing)
	if windless > 0 {
		summary += fmt.Sprintf(" Days with readings but none with wind (no wind chill): %d.", windless)
	}
	if coldest != nil {
		summary = fmt.Sprintf("Coldest wind chill %s on %s (air %s). ", celsius(coldest.MinWindChillC), coldest.Day, celsius(coldest.MinAirC)) + summary
	}
	return &DayChart{
		Title: "Weather site " + s.Site, Summary: summary, From: from, To: to, Unit: "°C",
		YMin: yMin, YMax: yMax, YTicks: ticks,
		Series:     []Series{air, chill},
		Lines:      lines,
		Marks:      b.siteMarks("cold", s.Site, from, to),
		MarksLabel: []string{"▲ days with cold", "findings (count)"},
		Bands:      hazardBands(),
	}
}

// coldLine is one reference line of the cold chart.
type coldLine struct {
	v    float64
	what string
}

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
