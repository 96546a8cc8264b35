package reports

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"welfare/checker"
	"welfare/checker/cold"
	"welfare/records"
)

// MorningCaution ends every morning view: the figures describe exposed skin
// and records, not the animals themselves.
const MorningCaution = "Caution: cold injury: keep outdoor work to the work/warm-up schedule. " +
	"This is a records check, not a veterinary judgement: defer to the attending veterinarian, " +
	"the animal-care committee and local law."

// WriteMorning writes the one-screen answer for one morning: the day's
// lowest air temperature and wind chill at each weather site with its
// hazard band, the findings that touch the day (most severe first) under
// "Fix now:", or an all-clear when there are none, and a closing caution.
// It shows whatever domains r holds; the caller chooses them (--only).
func WriteMorning(w io.Writer, r *checker.Result, day records.Day) error {
	b := bufio.NewWriter(w)
	p := func(format string, a ...any) { fmt.Fprintf(b, format, a...) }
	date := day.String()

	facility := r.Facility
	if facility == "" {
		facility = "(facility not named)"
	}
	p("%s: morning check for %s\n\n", facility, date)

	p("Weather (lowest of the day's readings):\n")
	if len(r.Weather) == 0 {
		p("  no weather sites in the records\n")
	}
	unread := 0 // sites without a reading that day: their checks were not judged
	for _, s := range r.Weather {
		dc, ok := morningDay(s, day)
		if !ok {
			p("  %s: no readings on %s; checks that need the weather were not judged for that day\n", s.Site, date)
			unread++
			continue
		}
		band := cold.Band(dc.MinWindChillC)
		p("  %s: air %s °C, wind chill %d (%s; %d reading(s))\n",
			s.Site, morningNum(dc.MinAirC), cold.Display(dc.MinWindChillC), band.Wording, dc.Readings)
	}
	p("\n")

	var today []checker.Finding
	for _, f := range r.Findings {
		last := f.Until
		if last < f.On {
			last = f.On
		}
		if f.On <= day && day <= last {
			today = append(today, f)
		}
	}
	checker.SortFindings(today)

	if len(today) > 0 {
		p("Fix now (%d):\n", len(today))
		for _, f := range today {
			title := f.Title
			if title == "" {
				title = f.Check
			}
			since := ""
			if f.On < day {
				since = " (since " + f.On.String() + ")"
			}
			p("  %-11s %s: %s%s: %s\n", strings.ToUpper(string(f.Severity)), f.Subject, title, since, morningLine(f.Message))
		}
		p("\n")
	}
	if len(r.NotEvaluated) > 0 {
		p("Not checked (records missing):\n")
		for _, s := range r.NotEvaluated {
			p("  %s: %s\n", s.Check, s.Reason)
		}
		p("\n")
	}
	switch {
	case len(today) == 0 && unread > 0:
		p("No problems found for %s, but %d weather site(s) had no reading that day: this is not an all-clear. Record this morning's readings and check again.\n\n", date, unread)
	case len(today) == 0 && len(r.NotEvaluated) > 0:
		// An all-clear over checks that could not run would be false comfort.
		p("No problems found by the checks that ran for %s, but %d check(s) could not run: this is not an all-clear.\n\n", date, len(r.NotEvaluated))
	case len(today) == 0:
		p("All clear: no problems recorded for %s.\n\n", date)
	}
	p("%s\n", MorningCaution)
	return b.Flush()
}

// morningDay finds a site's figures for day; ok is false when the day had
// no readings or lies outside the site's days.
func morningDay(s checker.SiteDays, day records.Day) (checker.DayCold, bool) {
	for _, dc := range s.Days {
		if dc.Day == day {
			return dc, dc.Readings > 0
		}
	}
	return checker.DayCold{}, false
}

// morningNum writes a temperature to a tenth of a degree (−12.5, −40),
// without the float noise of a converted °F reading.
func morningNum(x float64) string {
	return strconv.FormatFloat(math.Round(x*10)/10, 'f', -1, 64)
}

// morningLine keeps a message on one line of the screen.
func morningLine(s string) string {
	return strings.Join(strings.Fields(s), " ")
}
