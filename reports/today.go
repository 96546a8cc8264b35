package reports

import (
	"fmt"
	"io"
	"math"
	"regexp"
	"sort"
	"strings"
	"time"
	"unicode/utf8"

	"welfare/checker"
	"welfare/checker/cold"
	"welfare/checker/heat"
	"welfare/records"
)

// HeatCaution ends the view on a warm day, as MorningCaution on a cold one.
const HeatCaution = "Caution: heat illness: water, shade and rest for people and animals. " +
	"This is a records check, not a veterinary judgement: defer to the attending veterinarian, " +
	"the animal-care committee and local law."

// The today view fits one terminal screen, whatever the day holds.
const (
	TodayMaxLines = 24
	TodayMaxCols  = 80
)

// TodayOptions say which moment the view describes and how to print it.
type TodayOptions struct {
	// Day is the facility's local day; At the time of day in minutes after
	// midnight up to which the records were read. EndOfDay means the whole
	// day is over (At is then 24:00).
	Day      records.Day
	At       int
	EndOfDay bool
	// Records are the records as checked (already cut at At): the view
	// measures the day's weather and water checks from them.
	Records *records.Set
	// Schedule is the work/warm-up schedule in force (nil: none).
	Schedule *cold.Schedule
	// AllCommand is the command line that shows every finding of the day,
	// printed when the screen cannot hold them all. It must run as printed.
	AllCommand string
	// Plain leaves out box drawing, for a shared screen or a message.
	Plain bool
	// Only names the domains asked for (--only), so an all-clear says it
	// covers those alone.
	Only []string
}

// TodayVerdict is the view's answer, for the exit code: AllClear only when
// no problem is due now and nothing that an all-clear needs is missing.
type TodayVerdict struct {
	Problems int      // findings due now (not "due later today")
	Missing  []string // why an all-clear cannot be given
}

// AllClear is a real all-clear: no problem and nothing missing.
func (v TodayVerdict) AllClear() bool { return v.Problems == 0 && len(v.Missing) == 0 }

// roundDue says by which round a check's daily requirement is due: a
// finding of these checks on the view's day is "due later today" until
// that round's time has passed. Other checks are problems at once.
//
//	observation, feeding: the first round
//	water checks: the first round for the first check, the second for the rest
var roundDue = map[string]int{
	"care.observation.missed":        1,
	"care.feeding.missed":            1,
	"cold.water.checks_insufficient": 2,
	"heat.water.checks_insufficient": 2,
}

// roundWork says what a due-later round check asks the keeper to do.
var roundWork = map[string]string{
	"care.observation.missed":        "observe the animals",
	"care.feeding.missed":            "feed",
	"cold.water.checks_insufficient": "check water (freezing day)",
	"heat.water.checks_insufficient": "check water (hot day)",
}

var csvName = regexp.MustCompile(`[a-z_]+\.csv`)

// fixNow are the checks a keeper fixes with their hands this morning:
// shelter, nest boxes, bedding, shade, water found empty or frozen.
var fixNow = map[string]bool{
	"cold.shelter.missing":       true,
	"cold.bedding.stale":         true,
	"enclosure.nest_box.missing": true,
	"heat.shade.missing":         true,
	"care.water.unavailable":     true,
}

// todayItem is one check's findings on the day, grouped: one screen line
// names the check and its subjects.
type todayItem struct {
	check, title string
	severity     checker.Severity
	subjects     []string
	since        records.Day // earliest start of a run reaching the day
	message      string      // the message when there is one subject
	dueBy        int         // for "due later": the round time, minutes
}

// WriteToday writes the keepers' answer for one day at one time of day, on
// one screen (at most TodayMaxLines lines of TodayMaxCols columns): each
// weather site's coldest (or hottest) figure so far and its band with the
// work/warm-up limit at the latest reading; water checks; what to fix now
// (shelter, bedding, shade, rounds overdue); what is due later today; the
// day's other problems; the verdict; and the caution. What does not fit is
// counted, with the command that shows it all.
func WriteToday(w io.Writer, r *checker.Result, o TodayOptions) (TodayVerdict, error) {
	var v TodayVerdict
	set := o.Records
	first, second := set.Facility.RoundTimes.Due()
	at := o.At
	if o.EndOfDay {
		at = 24 * 60
	}
	dueTime := func(round int) int {
		if round == 1 {
			return first
		}
		return second
	}

	// The findings touching the day, sorted most severe first.
	var today []checker.Finding
	for _, f := range r.Findings {
		last := f.Until
		if last < f.On {
			last = f.On
		}
		if f.On <= o.Day && o.Day <= last {
			today = append(today, f)
		}
	}
	checker.SortFindings(today)

	water := waterCounts(set, o.Day)
	var fix, later, earlier []*todayItem
	group := func(list *[]*todayItem, f checker.Finding, dueBy int) {
		for _, it := range *list {
			if it.check == f.Check && it.dueBy == dueBy {
				it.subjects = append(it.subjects, f.Subject)
				if f.On < it.since {
					it.since = f.On
				}
				it.message = ""
				return
			}
		}
		title := f.Title
		if title == "" {
			title = f.Check
		}
		*list = append(*list, &todayItem{check: f.Check, title: title, severity: f.Severity,
			subjects: []string{f.Subject}, since: f.On, message: todayLine(f.Message), dueBy: dueBy})
	}
	for _, f := range today {
		if round, ok := roundDue[f.Check]; ok && f.On == o.Day {
			due := dueTime(round)
			if round == 2 && water[f.Subject] == 0 {
				due = first // not even the first round's check yet
			}
			if at < due {
				group(&later, f, due)
				continue
			}
			group(&fix, f, -1)
			v.Problems++
			continue
		}
		v.Problems++
		if fixNow[f.Check] {
			group(&fix, f, -1)
		} else {
			group(&earlier, f, -1)
		}
	}
	sort.SliceStable(later, func(i, j int) bool { return later[i].dueBy < later[j].dueBy })

	// Lines, section by section; the problems from earlier are cut to what
	// the screen holds.
	var head, tail []string
	where := "end of day"
	if !o.EndOfDay {
		where = "at " + clockText(at)
	}
	tz := set.Facility.TimeZone
	head = append(head, fmt.Sprintf("%s: %s %s, %s (%s)", nonEmpty(r.Facility, "(facility not named)"),
		o.Day.Time().Weekday().String()[:3], o.Day, where, tz))
	if note := nothingRecorded(set, o.Day); note != "" {
		v.Missing = append(v.Missing, note)
	}
	wl, hot, missing := weatherLines(set, o)
	v.Missing = append(v.Missing, missing...)
	if o.EndOfDay {
		head = append(head, o.rule("Weather"))
	} else {
		head = append(head, o.rule("Weather so far"))
	}
	head = append(head, wl...)

	var fixLines, laterLines, earlierLines []string
	for _, it := range fix {
		fixLines = append(fixLines, "  "+it.line(o.Day))
	}
	for _, it := range later {
		head := fmt.Sprintf("  by %s: %s (%d): ", clockText(it.dueBy), roundWork[it.check], len(it.subjects))
		laterLines = append(laterLines, head+subjectList(it.subjects, TodayMaxCols-6-utf8.RuneCountInString(head)))
	}
	for _, it := range earlier {
		earlierLines = append(earlierLines, "  "+it.line(o.Day))
	}
	// A check judged over a review period (custom.period: review, as the
	// follow-up of corrective plans), not a keeper's day, does not hold
	// back an all-clear.
	review := map[string]bool{}
	for _, c := range r.Checks {
		if c.ReviewPeriod() {
			review[c.ID] = true
		}
	}
	var notRunToday []checker.Skipped
	for _, sk := range r.NotEvaluated {
		if !review[sk.Check] {
			notRunToday = append(notRunToday, sk)
		}
	}
	if len(notRunToday) > 0 {
		v.Missing = append(v.Missing, notRun(notRunToday))
	}

	say := verdict(v, o.EndOfDay)
	if v.AllClear() && len(o.Only) > 0 {
		say = strings.Replace(say, "All clear", "All clear for the "+strings.Join(o.Only, ", ")+" checks alone", 1)
	}
	tail = append(tail, wrapText(say, TodayMaxCols)...)
	caution := MorningCaution
	if hot {
		caution = HeatCaution
	}
	tail = append(tail, wrapText(caution, TodayMaxCols)...)

	// The screen's room is shared out in the order a keeper acts: what to
	// fix now, what is due later, then the rest; a section that does not
	// fit is cut, and one line names the command that shows everything.
	cut := 0
	budget := TodayMaxLines - len(head) - len(tail)
	var body []string
	section := func(title string, lines []string, after int) {
		if len(lines) == 0 {
			return
		}
		room := budget - len(body) - 1 - after
		if cut == 0 {
			room-- // the command line, should this section be cut
		}
		room = max(room, 1)
		body = append(body, o.rule(fmt.Sprintf("%s (%d)", title, len(lines))))
		if len(lines) > room {
			n := len(lines) - room + 1
			cut += n
			lines = append(lines[:room-1:room-1], fmt.Sprintf("  … %s, all shown by:", plural(n, "more line")))
		}
		body = append(body, lines...)
	}
	reserve := func(ls ...[]string) int {
		n := 0
		for _, l := range ls {
			if len(l) > 0 {
				n += 2
			}
		}
		return n
	}
	section("Fix now", fixLines, reserve(laterLines, earlierLines))
	section("Due later today", laterLines, reserve(earlierLines))
	section("Other problems", earlierLines, 0)
	if cut > 0 {
		body = append(body, "  "+o.AllCommand)
	}

	var b strings.Builder
	for _, l := range append(append(head, body...), tail...) {
		if l != "  "+o.AllCommand {
			l = fitColumns(l, TodayMaxCols) // a command is printed whole, to run as printed
		}
		b.WriteString(l)
		b.WriteByte('\n')
	}
	_, err := io.WriteString(w, b.String())
	return v, err
}

func (o TodayOptions) rule(title string) string {
	if o.Plain {
		return title + ":"
	}
	s := "── " + title + " "
	return s + strings.Repeat("─", max(3, 60-utf8.RuneCountInString(s)))
}

// line writes one grouped check: "No shelter in hard cold: K-02, S3-12",
// or with one subject its message when the screen has room for it.
func (it *todayItem) line(day records.Day) string {
	since := ""
	if it.since < day {
		since = " (since " + it.since.String() + ")"
	}
	if len(it.subjects) > 1 {
		head := fmt.Sprintf("%s%s (%d): ", it.title, since, len(it.subjects))
		return head + subjectList(it.subjects, TodayMaxCols-8-utf8.RuneCountInString(head))
	}
	s := it.subjects[0] + ": " + it.title + since
	if it.message != "" && utf8.RuneCountInString(s)+2+utf8.RuneCountInString(it.message) <= TodayMaxCols-2 {
		s += ": " + it.message
	}
	return s
}

// subjectList names subjects up to width columns, then counts the rest.
func subjectList(ids []string, width int) string {
	var b strings.Builder
	for i, id := range ids {
		if i > 0 && b.Len()+2+len(id) > width {
			fmt.Fprintf(&b, " +%d", len(ids)-i)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(id)
	}
	return b.String()
}

// notRun says which checks could not run, by the reasons given.
func notRun(sk []checker.Skipped) string {
	var reasons []string
	seen := map[string]bool{}
	for _, s := range sk {
		if !seen[s.Reason] {
			seen[s.Reason] = true
			reasons = append(reasons, s.Reason)
		}
	}
	// The reasons name the record files; a list of the files is shorter.
	var files []string
	for _, r := range reasons {
		for _, f := range csvName.FindAllString(r, -1) {
			if !seen[f] {
				seen[f] = true
				files = append(files, f)
			}
		}
	}
	if len(files) == 0 {
		return fmt.Sprintf("%s could not run: %s", plural(len(sk), "check"), strings.Join(reasons, "; "))
	}
	more := ""
	if len(files) > 3 {
		more = fmt.Sprintf(" and %d more", len(files)-3)
		files = files[:3]
	}
	return fmt.Sprintf("%s could not run without %s%s", plural(len(sk), "check"), strings.Join(files, ", "), more)
}

// verdict is the view's last word before the caution: an all-clear only
// when nothing is due and nothing is missing.
func verdict(v TodayVerdict, endOfDay bool) string {
	switch {
	case v.AllClear() && endOfDay:
		return "All clear: nothing due on the day is missing or wrong."
	case v.AllClear():
		return "All clear so far: nothing due now is missing or wrong."
	case v.Problems > 0 && len(v.Missing) > 0:
		return fmt.Sprintf("Not all clear: %s due now; and %s.", plural(v.Problems, "finding"), strings.Join(v.Missing, "; "))
	case v.Problems > 0:
		return fmt.Sprintf("Not all clear: %s due now.", plural(v.Problems, "finding"))
	}
	return "No all-clear can be given: " + strings.Join(v.Missing, "; ") + "."
}

// weatherLines gives each site's coldest (or, on a day without frost,
// hottest) figure so far and its band, and the work/warm-up limits at the
// latest reading. missing names the sites without a reading yet.
func weatherLines(set *records.Set, o TodayOptions) (lines []string, hot bool, missing []string) {
	loc := set.Location
	if loc == nil {
		loc = time.UTC
	}
	bySite := map[string][]records.Weather{}
	for _, wr := range set.Weather {
		if records.DayOf(wr.At.In(loc)) == o.Day {
			bySite[wr.SiteID] = append(bySite[wr.SiteID], wr)
		}
	}
	if len(set.Facility.WeatherSites) == 0 {
		return []string{"  no weather sites in facility.yaml"}, false, nil
	}
	for _, site := range set.Facility.WeatherSites {
		rows := bySite[site]
		if len(rows) == 0 {
			lines = append(lines, fmt.Sprintf("  %s: no reading yet today: record one; the cold and heat checks wait for it", site))
			missing = append(missing, "no weather reading today at "+site)
			continue
		}
		sort.SliceStable(rows, func(i, j int) bool { return rows[i].At.Before(rows[j].At) })
		coldest, hottest := rows[0], rows[0]
		minWC, maxHI, minAir := math.Inf(1), math.Inf(-1), math.Inf(1)
		for _, wr := range rows {
			minAir = min(minAir, wr.AirTempC)
			if wr.WindKmh == nil {
				continue // no wind: no wind chill (a reading without wind is not calm)
			}
			if wc := cold.WindChillC(wr.AirTempC, *wr.WindKmh); wc < minWC {
				minWC, coldest = wc, wr
			}
		}
		for _, wr := range rows {
			if hi := readingHeatIndex(wr); hi > maxHI {
				maxHI, hottest = hi, wr
			}
		}
		last := rows[len(rows)-1]
		if math.IsInf(minWC, 1) && minAir <= 0 {
			// Two lines: on one, the screen's width cut off what to do.
			lines = append(lines, fmt.Sprintf("  %s: no reading with wind yet today (air down to %s °C)", site, morningNum(minAir)),
				"    record the wind: the wind-chill checks wait for it")
			missing = append(missing, "no weather reading with wind today at "+site)
			continue
		}
		if minWC <= 0 {
			lines = append(lines,
				fmt.Sprintf("  %s: coldest wind chill %d °C at %s (air %s °C, %s)", site, cold.Display(minWC),
					coldest.At.In(loc).Format("15:04"), morningNum(coldest.AirTempC), windText(coldest.WindKmh)),
				"    wind chill band: "+cold.Band(minWC).Wording)
			if o.Schedule != nil {
				lines = append(lines,
					fmt.Sprintf("    latest %s: air %s °C, %s; work/warm-up schedule:", last.At.In(loc).Format("15:04"),
						morningNum(last.AirTempC), windText(last.WindKmh)))
				for _, l := range workLimits(o.Schedule, last) {
					lines = append(lines, "    "+l)
				}
			}
			continue
		}
		hot = true
		rh := "no humidity recorded"
		if hottest.HumidityPct != nil {
			rh = "humidity " + morningNum(*hottest.HumidityPct) + " %"
		}
		lines = append(lines,
			fmt.Sprintf("  %s: hottest heat index %d °C at %s (air %s °C, %s)", site, int(math.Round(maxHI)),
				hottest.At.In(loc).Format("15:04"), morningNum(hottest.AirTempC), rh),
			"    heat index band: "+heat.BandC(maxHI).Wording)
	}
	return lines, hot, missing
}

func readingHeatIndex(wr records.Weather) float64 {
	if wr.HumidityPct == nil {
		return wr.AirTempC // as the heat checks count a reading without humidity
	}
	return heat.IndexC(wr.AirTempC, *wr.HumidityPct)
}

func windText(kmh *float64) string {
	if kmh == nil {
		return "no wind recorded"
	}
	return "wind " + morningNum(*kmh) + " km/h"
}

// workLimits is the schedule's answer per activity at one reading:
// "moderate: 40-minute stints, 4 warm-up breaks; light: 30/5", on two
// lines when one cannot hold it.
func workLimits(s *cold.Schedule, wr records.Weather) []string {
	if wr.WindKmh == nil {
		return []string{"no wind recorded: the schedule cannot be read; record the wind"}
	}
	mod := s.Lookup(wr.AirTempC, *wr.WindKmh, "moderate")
	light := s.Lookup(wr.AirTempC, *wr.WindKmh, "light")
	long := func(st cold.Step) string {
		switch st.Kind {
		case cold.Limit:
			return fmt.Sprintf("%d-minute stints, %d warm-up breaks", st.MaxWorkMin, st.Breaks)
		case cold.Cease:
			return "non-emergency work should cease"
		case cold.NoLimit:
			return "normal breaks"
		}
		return "unknown"
	}
	if mod.Kind == light.Kind && mod.Kind != cold.Limit {
		return []string{"all work: " + long(mod)}
	}
	l := long(light)
	if mod.Kind == cold.Limit && light.Kind == cold.Limit {
		l = fmt.Sprintf("%d/%d", light.MaxWorkMin, light.Breaks)
	}
	one := "moderate: " + long(mod) + "; light: " + l
	if utf8.RuneCountInString(one) <= TodayMaxCols-4 {
		return []string{one}
	}
	return []string{"moderate work: " + long(mod), "light work: " + long(light)}
}

// nothingRecorded says so when the day has no care round and no weather
// reading, naming the latest day that has a round: a folder not yet kept
// up to date, or the wrong folder.
func nothingRecorded(set *records.Set, day records.Day) string {
	var latest records.Day
	rounds := set.CareRounds()
	for i := range rounds.Len() {
		d := rounds.Day(i)
		if d == day {
			return ""
		}
		latest = max(latest, d)
	}
	loc := set.Location
	if loc == nil {
		loc = time.UTC
	}
	for _, w := range set.Weather {
		if records.DayOf(w.At.In(loc)) == day {
			return ""
		}
	}
	if latest.IsZero() {
		return "nothing recorded for " + day.String() + " yet (no care rounds in the records)"
	}
	return "nothing recorded for " + day.String() + " yet (the latest round is on " + latest.String() + ")"
}

// waterCounts counts each enclosure's water checks recorded on day (a
// round of its building counts for it).
func waterCounts(set *records.Set, day records.Day) map[string]int {
	byBuilding := map[string]int{}
	out := map[string]int{}
	rounds := set.CareRounds()
	for i := range rounds.Len() {
		if rounds.Day(i) != day {
			continue
		}
		c := rounds.View(i)
		if c.Water == "" || c.Water == "not_checked" {
			continue
		}
		if c.EnclosureID != "" {
			out[c.EnclosureID]++
		} else {
			byBuilding[c.BuildingID]++
		}
	}
	for _, e := range set.Enclosures {
		out[e.ID] += byBuilding[e.BuildingID]
	}
	return out
}

func clockText(min int) string { return fmt.Sprintf("%02d:%02d", min/60, min%60) }

func nonEmpty(s, alt string) string {
	if s == "" {
		return alt
	}
	return s
}

// todayLine keeps a message on one line.
func todayLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// fitColumns cuts a line to width columns (runes), ending it with "…".
func fitColumns(s string, width int) string {
	if utf8.RuneCountInString(s) <= width {
		return s
	}
	r := []rune(s)
	return string(r[:width-1]) + "…"
}

// wrapText breaks text into lines of at most width columns at spaces.
func wrapText(s string, width int) []string {
	var lines []string
	var cur string
	for _, word := range strings.Fields(s) {
		if cur != "" && utf8.RuneCountInString(cur)+1+utf8.RuneCountInString(word) > width {
			lines = append(lines, cur)
			cur = ""
		}
		if cur != "" {
			cur += " "
		}
		cur += word
	}
	if cur != "" {
		lines = append(lines, cur)
	}
	return lines
}
