package reports

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"welfare/checker"
	"welfare/records"
)

// MaxWeightCharts caps the per-animal weight charts in the PDF; the rest
// are counted ("N more") and every one is in findings.json.
const MaxWeightCharts = 12

// deathCauses is the order of suspected causes in the chart's key: the
// values deaths.csv allows, unknown first.
var deathCauses = []string{"unknown", "injury", "disease", "cold", "heat", "whelping", "fight", "other"}

// healthSection is deaths, mortality, open cases, weight loss and early
// weaning: the figures the health and litter checks read, beside their
// findings.
func (b *auditBuilder) healthSection() AuditSection {
	h := b.r.Health
	b.add(para("The figures the health and litter checks read: "+strings.Join(h.Files, ", ")+
		". The findings are listed under their domains; the care of a sick or dead animal is the attending veterinarian's to decide.", "", 9))

	b.add(subheading("Deaths by month and cause", 24))
	switch {
	case !slices.Contains(h.Files, "deaths.csv"):
		b.add(para("No deaths.csv in the records folder: deaths and mortality are not charted, and their checks are not evaluated.", "italic", 9))
	case len(h.Deaths) == 0:
		b.add(para("No death recorded in the period.", "", 9.5))
	default:
		b.add(b.deathChart(h.Deaths))
		tb := &Table{Size: 8.5, Caption: "Deaths in the period", Columns: []Column{
			{Head: "Found dead", Width: 22, Align: "L"},
			{Head: "Animal", Width: 22, Align: "L", Mono: true},
			{Head: "Species", Width: 30, Align: "L"},
			{Head: "Building", Width: 22, Align: "L", Mono: true},
			{Head: "Suspected cause", Width: 28, Align: "L"},
			{Head: "Necropsy", Width: 16, Align: "L"},
			{Head: "Evidence", Width: 40, Align: "L", Mono: true},
		}}
		for _, d := range h.Deaths {
			tb.Rows = append(tb.Rows, Row{Cells: []string{d.On.String(), d.Animal, d.Species, orDash(d.Building), d.Cause, yesNo(d.Necropsy), string(d.Ref)}})
		}
		b.add(b.listing(tb, "deaths in the attached findings.json (health.deaths)")...)

		b.add(subheading("Mortality per building and month", 20),
			para(fmt.Sprintf("Deaths (deaths.csv, not culls) against the building's mean daily population (animal-days ÷ days in the month). "+
				"The limit in force: at least %d deaths and above %s %% (health.mortality); a month over it has a health.mortality.high finding. "+
				"Only months with a death are listed.", h.MortalityLimit.MinDeaths, minus(h.MortalityLimit.MonthlyPct)), "", 9), space(1))
		mt := &Table{Size: 8.5, Caption: "Mortality per building and month", Columns: []Column{
			{Head: "Building", Width: 30, Align: "L", Mono: true},
			{Head: "Month", Width: 20, Align: "L"},
			{Head: "Deaths", Width: 18, Align: "R"},
			{Head: "Animal-days", Width: 24, Align: "R"},
			{Head: "Mean population", Width: 28, Align: "R"},
			{Head: "Mortality", Width: 22, Align: "R"},
			{Head: "Finding", Width: 38, Align: "L"},
		}}
		for _, m := range h.Mortality {
			mean, rate := "—", "—"
			if m.DaysInMonth > 0 && m.AnimalDays > 0 {
				pop := float64(m.AnimalDays) / float64(m.DaysInMonth)
				mean = fmt.Sprintf("%.1f", pop)
				rate = fmt.Sprintf("%.1f %%", float64(m.Deaths)*100/pop)
			}
			note := ""
			if m.High {
				note = "health.mortality.high"
			}
			mt.Rows = append(mt.Rows, Row{Bold: m.High, Cells: []string{m.Building, m.Month.String()[:7], itoa(m.Deaths), itoa(m.AnimalDays), mean, rate, note}})
		}
		b.add(b.listing(mt, "building-months in the attached findings.json (health.mortality), those over the limit also as health.mortality.high findings")...)
	}

	b.add(subheading("Veterinary cases open at the end of the period", 12))
	switch {
	case !slices.Contains(h.Files, "treatments.csv"):
		b.add(para("No treatments.csv in the records folder: veterinary cases are not listed.", "italic", 9))
	case len(h.OpenCases) == 0:
		b.add(para("No case was open at the end of the period.", "", 9.5))
	default:
		ct := &Table{Size: 8.5, Caption: "Open veterinary cases", Columns: []Column{
			{Head: "Case", Width: 22, Align: "L", Mono: true},
			{Head: "Animal", Width: 24, Align: "L", Mono: true},
			{Head: "Diagnosis", Width: 44, Align: "L"},
			{Head: "Opened", Width: 22, Align: "L"},
			{Head: "Last review", Width: 22, Align: "L"},
			{Head: "Days open", Width: 16, Align: "R"},
			{Head: "Finding", Width: 30, Align: "L"},
		}}
		for _, c := range h.OpenCases {
			note := ""
			if c.Unreviewed {
				note = "health.case.unreviewed"
			}
			ct.Rows = append(ct.Rows, Row{Bold: c.Unreviewed, Cells: []string{c.Case, c.Animal, c.Diagnosis, c.Opened.String(),
				dayOrDash(c.Reviewed), itoa(int(b.r.Period.To-c.Opened) + 1), note}})
		}
		b.add(b.listing(ct, "open cases in the attached findings.json (health.open_cases), those unreviewed also as health.case.unreviewed findings")...)
	}

	keep := 12.0
	if len(h.WeightLoss) > 0 {
		keep = 75 // the text and the first chart
	}
	b.add(subheading("Animals with weight loss", keep))
	switch {
	case !slices.Contains(h.Files, "observations.csv"):
		b.add(para("No observations.csv in the records folder: weights are not charted.", "italic", 9))
	case len(h.WeightLoss) == 0:
		b.add(para("No animal has a weight-loss finding in the period.", "", 9.5))
	default:
		b.add(para(fmt.Sprintf("Each animal with a health.weight.loss finding (a mass at least %s %% below the highest of the preceding %d days), "+
			"with its weighings from %d days before the period; triangles mark the findings' days.",
			minus(h.WeightLossPct), h.WeightLossDays, h.WeightLossDays), "", 9))
		for i, aw := range h.WeightLoss {
			if i == MaxWeightCharts {
				b.add(para(fmt.Sprintf("%d more animals with weight-loss findings in the attached findings.json (health.weight_loss) and findings.csv.",
					len(h.WeightLoss)-MaxWeightCharts), "italic", 9))
				break
			}
			b.add(Block{Kind: KindDayChart, Chart: b.weightChart(aw)})
		}
	}

	b.add(subheading("Litters weaned early", 12))
	switch {
	case !slices.Contains(h.Files, "litters.csv"):
		b.add(para("No litters.csv in the records folder: weaning is not listed.", "italic", 9))
	case len(h.EarlyWeaning) == 0:
		b.add(para("No litter weaned in the period has an early-weaning finding.", "", 9.5))
	default:
		lt := &Table{Size: 8.5, Caption: "Litters weaned early", Columns: []Column{
			{Head: "Litter", Width: 24, Align: "L", Mono: true},
			{Head: "Dam", Width: 24, Align: "L", Mono: true},
			{Head: "Species", Width: 30, Align: "L"},
			{Head: "Whelped", Width: 22, Align: "L"},
			{Head: "Weaned on", Width: 22, Align: "L"},
			{Head: "Age (days)", Width: 16, Align: "R"},
			{Head: "Minimum", Width: 16, Align: "R"},
			{Head: "Born / weaned", Width: 26, Align: "L"},
		}}
		for _, l := range h.EarlyWeaning {
			minDays, weaned := "not set", "not recorded"
			if l.MinDays > 0 {
				minDays = itoa(l.MinDays)
			}
			if l.Weaned != nil {
				weaned = itoa(*l.Weaned)
			}
			lt.Rows = append(lt.Rows, Row{Cells: []string{l.Litter, l.Dam, l.Species, l.Whelped.String(), l.WeanedOn.String(),
				itoa(l.AgeDays), minDays, itoa(l.Born) + " / " + weaned}})
		}
		b.add(b.listing(lt, "litters in the attached findings.json (health.early_weaning) and as litter.weaning.early findings")...)
	}
	return b.section("Health and mortality", true, "Health and mortality")
}

// deathChart is the deaths per calendar month, stacked by suspected cause.
func (b *auditBuilder) deathChart(deaths []checker.DeathLine) Block {
	var months []string
	counts := map[string]map[string]int{}
	seen := map[string]bool{}
	for _, d := range deaths {
		m := d.On.String()[:7]
		if counts[m] == nil {
			counts[m] = map[string]int{}
			months = append(months, m)
		}
		counts[m][d.Cause]++
		seen[d.Cause] = true
	}
	slices.Sort(months)
	var keys []string
	for _, c := range deathCauses {
		if seen[c] {
			keys = append(keys, c)
		}
	}
	for _, d := range deaths { // a cause outside the contract's list, last
		if !slices.Contains(keys, d.Cause) {
			keys = append(keys, d.Cause)
		}
	}
	bars := make([]Bar, 0, len(months))
	for _, m := range months {
		bar := Bar{Label: m, Segments: []Segment{}}
		for _, k := range keys {
			if c := counts[m][k]; c > 0 {
				bar.Segments = append(bar.Segments, Segment{Key: k, Count: c})
				bar.Total += c
			}
		}
		bars = append(bars, bar)
	}
	return Block{Kind: KindBarChart, Bars: bars, Keys: keys}
}

// weightChart is one animal's weighings, joined, with its findings' days.
func (b *auditBuilder) weightChart(aw checker.AnimalWeights) *DayChart {
	r := b.r
	from, to := r.Period.From-records.Day(r.Health.WeightLossDays), r.Period.To
	s := Series{Name: "mass (kg), each weighing", Points: []Point{}, Joined: true}
	lo, hi := math.Inf(1), math.Inf(-1)
	var peak, last *checker.Weighing
	for i := range aw.Weighings {
		w := &aw.Weighings[i]
		from = min(from, w.Day)
		s.Points = append(s.Points, Point{Day: w.Day, Value: w.Kg})
		lo, hi = min(lo, w.Kg), max(hi, w.Kg)
		if peak == nil || w.Kg > peak.Kg {
			peak = w
		}
		last = w
	}
	if peak == nil {
		lo, hi = 0, 1
	}
	// Ticks in steps of 0.5 kg or 1 kg, with room around the values.
	step := 0.5
	if hi-lo > 3 {
		step = 1
	}
	yMin := math.Floor((lo-step/2)/step) * step
	yMax := math.Ceil((hi+step/2)/step) * step
	ticks := []Tick{}
	for v := yMin; v <= yMax+step/100; v += step {
		ticks = append(ticks, Tick{Value: v, Label: fmt.Sprintf("%g", v)})
	}
	summary := "No weighing in the window."
	if peak != nil {
		summary = fmt.Sprintf("%s; mass (kg) at each weighing. Highest %s kg on %s, last %s kg on %s (%.1f %% below the highest).", aw.Species,
			trimKg(peak.Kg), peak.Day, trimKg(last.Kg), last.Day, (peak.Kg-last.Kg)*100/peak.Kg)
	}
	marks := map[records.Day]int{}
	for _, d := range aw.Findings {
		marks[d]++
	}
	return &DayChart{
		Title: "Animal " + aw.Animal, Summary: summary, From: from, To: to, Unit: "kg",
		YMin: yMin, YMax: yMax, YTicks: ticks, Height: 24,
		Series:     []Series{s},
		Lines:      []RefLine{},
		Marks:      marksOf(marks, from, to),
		MarksLabel: []string{"▲ weight-loss finding"},
		Bands:      []Band{},
	}
}

func trimKg(v float64) string { return fmt.Sprintf("%g", math.Round(v*100)/100) }

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

func dayOrDash(d records.Day) string {
	if d.IsZero() {
		return "—"
	}
	return d.String()
}
