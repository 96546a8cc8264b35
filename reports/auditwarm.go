package reports

import (
	"fmt"
	"math"
	"strings"

	"welfare/checker"
	"welfare/checker/heat"
	"welfare/records"
)

// heatBands are the NWS heat index bands of checker/heat (the one place
// they are written down), shaded from the caution band up; the hottest is
// open-ended. Level picks the shading, one step darker than the cold
// chart's mildest band so the caution band shows.
func heatBands() []Band {
	bs := heat.Bands()
	var out []Band
	for i, b := range bs {
		if b.Level == 0 {
			continue
		}
		band := Band{Lo: b.FromC, Level: b.Level + 1}
		if i+1 < len(bs) {
			band.Hi = bs[i+1].FromC
			band.Label = fmt.Sprintf("%g–%g °C (%g–%g °F): %s", b.FromC, bs[i+1].FromC, b.FromF, bs[i+1].FromF, b.Wording)
		} else {
			band.OpenAbove = true
			band.Label = fmt.Sprintf("%g °C (%g °F) and above: %s", b.FromC, b.FromF, b.Wording)
		}
		out = append(out, band)
	}
	return out
}

// warmSeason is the section on heat, the air inside buildings and
// cleaning; each part says why it is empty rather than drawing an empty
// chart.
func (b *auditBuilder) warmSeason() AuditSection {
	w := b.r.Warm
	title := "Inside buildings and cleaning"
	if len(w.Sites) > 0 {
		title = "Warm season, inside buildings and cleaning"
	}
	if len(w.Sites) > 0 {
		b.add(para(fmt.Sprintf("Daily maximum air temperature and maximum heat index per weather site (°C), against the heat index "+
			"bands of the US National Weather Service. The dashed line is hot_day_c (%s °C) from the limits in force: from it a day "+
			"needs more water checks and shade for outdoor enclosures. Triangles under a chart mark days with heat-domain findings "+
			"for that site and its enclosures, with their number.", minus(w.HotDayC)), "", 9))
		for _, s := range w.Sites {
			b.add(Block{Kind: KindDayChart, Chart: b.heatChart(s)})
		}
	} else {
		b.add(para(fmt.Sprintf("No weather site had a day in the period reaching hot_day_c (%s °C): no warm-season chart.", minus(w.HotDayC)), "italic", 9))
	}

	// Kept with the text and the first chart when charts follow.
	keep := 14.0
	if w.EnvironmentRecorded && len(w.Buildings) > 0 {
		keep = 100
	}
	b.add(subheading("Air temperature inside buildings", keep))
	switch {
	case !w.EnvironmentRecorded:
		b.add(para("No environment.csv in the records folder: the air inside buildings is not charted, and its checks are not evaluated.", "italic", 9))
	case len(w.Buildings) == 0:
		b.add(para("environment.csv has no readings in the period from an indoor or sheltered building while it housed animals.", "italic", 9))
	default:
		b.add(para("Lowest and highest reading of each day per indoor or sheltered building (°C), against the indoor_temp_c range "+
			"of each species it housed (the limits in force). Triangles mark days with environment.temperature.out_of_range findings.", "", 9))
		for _, bc := range w.Buildings {
			b.add(Block{Kind: KindDayChart, Chart: b.indoorChart(bc)})
		}
	}

	b.add(subheading("Cleaning", 20))
	if !w.CleaningRecorded {
		b.add(para("No daily_care.csv in the records folder: cleaning is not counted.", "italic", 9))
		return b.section(title, true, title)
	}
	if len(w.Cleaning) == 0 {
		b.add(para("No gap between cleanings of an occupied enclosure in the period.", "", 9))
		return b.section(title, true, title)
	}
	b.add(para(fmt.Sprintf("The longest gaps between cleanings of occupied enclosures (up to %d), and every gap with a "+
		"care.cleaning.overdue finding; clean_every_days is %d in the limits in force. A gap counts the days from a cleaning "+
		"(or the stretch's first round) to the day before the next.", checker.MaxCleaningGaps, w.CleanEveryDays), "", 9), space(1))
	tb := &Table{Size: 8.5, Caption: "Gaps between cleanings", Columns: []Column{
		{Head: "Enclosure", Width: 36, Align: "L", Mono: true},
		{Head: "From", Width: 28, Align: "L"},
		{Head: "Until", Width: 28, Align: "L"},
		{Head: "Days", Width: 18, Align: "R"},
		{Head: "Finding", Width: 70, Align: "L"},
	}}
	for _, g := range w.Cleaning {
		note := ""
		if g.Overdue {
			note = "care.cleaning.overdue"
		}
		tb.Rows = append(tb.Rows, Row{Bold: g.Overdue, Cells: []string{g.Enclosure, g.From.String(), g.Until.String(), itoa(g.Days), note}})
	}
	b.add(b.listing(tb, "gaps; every overdue one is a care.cleaning.overdue finding in the attached findings.csv and findings.json")...)
	return b.section(title, true, title)
}

// dayTicks are the y range and ticks of a chart holding lo..hi, in steps
// of 5 (10 over a wide range).
func dayTicks(lo, hi float64) (yMin, yMax float64, ticks []Tick) {
	yMin = math.Floor((lo-1)/5) * 5
	yMax = math.Ceil((hi+1)/5) * 5
	step := 5.0
	if yMax-yMin > 50 {
		step = 10
	}
	ticks = []Tick{}
	for v := yMin; v <= yMax+0.01; v += step {
		ticks = append(ticks, Tick{Value: v, Label: signed(int(v))})
	}
	return yMin, yMax, ticks
}

func (b *auditBuilder) heatChart(s checker.SiteHeat) *DayChart {
	r, w := b.r, b.r.Warm
	from, to := r.Period.From, r.Period.To
	air := Series{Name: "air temperature, daily maximum", Points: []Point{}}
	hi := Series{Name: "heat index, daily maximum", Points: []Point{}}
	lo, top := w.HotDayC-5, 35.0
	var hottest *checker.DayHeat
	hot := 0
	for i := range s.Days {
		x := &s.Days[i]
		air.Points = append(air.Points, Point{Day: x.Day, Value: x.MaxAirC})
		hi.Points = append(hi.Points, Point{Day: x.Day, Value: x.MaxHeatIndexC})
		lo, top = min(lo, x.MaxAirC, x.MaxHeatIndexC), max(top, x.MaxAirC, x.MaxHeatIndexC)
		if hottest == nil || x.MaxHeatIndexC > hottest.MaxHeatIndexC {
			hottest = x
		}
		if x.MaxAirC >= w.HotDayC || x.MaxHeatIndexC >= w.HotDayC {
			hot++
		}
	}
	yMin, yMax, ticks := dayTicks(lo, top)
	summary := fmt.Sprintf("Days at or above hot_day_c (%s °C): %d. Days without readings: %d.", minus(w.HotDayC), hot, int(to-from)+1-len(s.Days))
	if hottest != nil {
		summary = fmt.Sprintf("Highest heat index %s on %s (air %s, %s). ", celsius(hottest.MaxHeatIndexC), hottest.Day,
			celsius(hottest.MaxAirC), heat.BandC(hottest.MaxHeatIndexC).Wording) + summary
	}
	return &DayChart{
		Title: "Weather site " + s.Site, Summary: summary, From: from, To: to, Unit: "°C",
		YMin: yMin, YMax: yMax, YTicks: ticks,
		Series:     []Series{air, hi},
		Lines:      []RefLine{{Value: w.HotDayC, Label: minus(w.HotDayC) + ": hot day", Style: 0}},
		Marks:      b.siteMarks("heat", s.Site, from, to),
		MarksLabel: []string{"▲ days with heat", "findings (count)"},
		Bands:      heatBands(),
	}
}

func (b *auditBuilder) indoorChart(bc checker.BuildingClimate) *DayChart {
	r := b.r
	from, to := r.Period.From, r.Period.To
	hiS := Series{Name: "highest reading of the day", Points: []Point{}}
	loS := Series{Name: "lowest reading of the day", Points: []Point{}}
	lo, top := math.Inf(1), math.Inf(-1)
	var warmest *checker.DayRange
	for i := range bc.Days {
		x := &bc.Days[i]
		hiS.Points = append(hiS.Points, Point{Day: x.Day, Value: x.MaxC})
		loS.Points = append(loS.Points, Point{Day: x.Day, Value: x.MinC})
		lo, top = min(lo, x.MinC), max(top, x.MaxC)
		if warmest == nil || x.MaxC > warmest.MaxC {
			warmest = x
		}
	}
	// The species' range edges as lines; species sharing an edge share a line.
	type edge struct {
		v    float64
		what []string
	}
	var edges []edge
	add := func(v float64, what string) {
		for i := range edges {
			if edges[i].v == v {
				edges[i].what = append(edges[i].what, what)
				return
			}
		}
		edges = append(edges, edge{v, []string{what}})
	}
	var ranges []string
	for _, rg := range bc.Ranges {
		add(rg.MaxC, rg.Species+" max")
		add(rg.MinC, rg.Species+" min")
		lo, top = min(lo, rg.MinC), max(top, rg.MaxC)
		ranges = append(ranges, fmt.Sprintf("%s %s to %s °C", rg.Species, minus(rg.MinC), minus(rg.MaxC)))
	}
	yMin, yMax, ticks := dayTicks(lo, top)
	lines := []RefLine{}
	for i, e := range edges {
		lines = append(lines, RefLine{Value: e.v, Label: minus(e.v) + ": " + strings.Join(e.what, ", "), Style: i % 3})
	}
	summary := "No species it housed has an indoor_temp_c range in the limits in force."
	if len(ranges) > 0 {
		summary = "Ranges (indoor_temp_c): " + strings.Join(ranges, "; ") + "."
	}
	if warmest != nil {
		summary = fmt.Sprintf("%s building. Warmest reading %s on %s. ", capitalise(bc.Exposure), celsius(warmest.MaxC), warmest.Day) + summary
	}
	marks := map[records.Day]int{}
	for i := range r.Findings {
		f := &r.Findings[i]
		if f.Check == "environment.temperature.out_of_range" && f.Subject == bc.Building {
			countDays(marks, f, from, to)
		}
	}
	return &DayChart{
		Title: "Building " + bc.Building, Summary: summary, From: from, To: to, Unit: "°C",
		YMin: yMin, YMax: yMax, YTicks: ticks, Height: 48,
		Series:     []Series{hiS, loS},
		Lines:      lines,
		Marks:      marksOf(marks, from, to),
		MarksLabel: []string{"▲ days with temperature", "findings (count)"},
		Bands:      []Band{},
	}
}
