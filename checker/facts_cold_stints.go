package checker

import (
	"fmt"
	"sort"
	"time"
	"welfare/checker/cold"
	"welfare/records"
)

// The cold facts of people and buildings: each outdoor stint with the
// reading in force at its start (facts_cold.go has the sites' days and the
// enclosures), and where each outdoor or sheltered building's weather comes
// from.

// latestReading is the latest reading at or before t, whatever its age
// (the rules compare its age with cold.reading_within_hours: a reading
// exactly that many hours before still describes the stint). ok is false
// when the site has no reading at or before t; a reading after the start
// never stands in for one.
func latestReading(rs []*records.Weather, t time.Time) (w *records.Weather, ok bool) {
	i := sort.Search(len(rs), func(i int) bool { return rs[i].At.After(t) })
	if i == 0 {
		return nil, false
	}
	return rs[i-1], true
}

// stintColdFacts adds each staff member's outdoor stints in the period with
// the latest reading at or before the start, its age, and the work/warm-up
// step it gives (unknown when the reading has no wind: a reading without
// wind is not calm).
func (f *facts) stintColdFacts(sites map[string]*siteWeather) {
	sched, schedErr := cold.NewSchedule(f.lim.Cold.WorkWarmup)
	for i := range f.set.Work {
		w := &f.set.Work[i]
		day := records.DayOf(w.StartedAt)
		if !f.inPeriod(day) {
			continue
		}
		activity := w.Activity
		if activity == "" {
			activity = "moderate"
		}
		st := map[string]any{
			"on": f.dayValue(day), "ref": string(w.Ref), "site": w.SiteID,
			"started_at": w.StartedAt.Format("2006-01-02 15:04"),
			"ended_at":   w.EndedAt.Format("2006-01-02 15:04"),
			"minutes":    w.EndedAt.Sub(w.StartedAt).Minutes(),
			"activity":   activity, "emergency": w.Emergency.IsYes(),
			"reading": nil,
			"step":    map[string]any{"kind": "unknown", "text": "no reading at the site at or before the start: not judged"},
		}
		var rs []*records.Weather
		if s := sites[w.SiteID]; s != nil {
			rs = s.readings
		}
		if r, ok := latestReading(rs, w.StartedAt); ok {
			var wc, display any
			if r.WindKmh != nil {
				c := cold.WindChillC(r.AirTempC, *r.WindKmh)
				wc, display = c, cold.Display(c)
			}
			st["reading"] = map[string]any{
				"ref": string(r.Ref), "at": r.At.Format("2006-01-02 15:04"),
				"air_c": r.AirTempC, "wind_kmh": num(r.WindKmh),
				"wind_chill_c": wc, "wind_chill_display": display,
				"hours_before_start": w.StartedAt.Sub(r.At).Hours(),
			}
			switch {
			case r.WindKmh == nil:
				st["step"] = map[string]any{"kind": "unknown", "text": "the reading has no wind: not judged"}
			case schedErr != nil:
				st["step"] = map[string]any{"kind": "unknown", "text": "the work/warm-up schedule in the limits is unusable: " + schedErr.Error()}
			default:
				st["step"] = stepDoc(sched.Lookup(r.AirTempC, *r.WindKmh, activity))
			}
		}
		d := f.doc("staff", w.StaffID)
		sec, _ := d["cold"].(map[string]any)
		if sec == nil {
			sec = map[string]any{"stints": []any{}, "readings_recorded": f.set.Present["weather.csv"]}
			d["cold"] = sec
		}
		sec["stints"] = append(sec["stints"].([]any), st)
	}
}

// stepDoc is a schedule step as a document value; kind is no_limit, limit,
// cease or unknown.
func stepDoc(s cold.Step) map[string]any {
	kind := "unknown"
	switch s.Kind {
	case cold.NoLimit:
		kind = "no_limit"
	case cold.Limit:
		kind = "limit"
	case cold.Cease:
		kind = "cease"
	}
	m := map[string]any{
		"kind": kind, "text": s.String(), "cell": nilIfEmpty(s.Cell),
		"max_work_min": nil, "breaks": nil, "row_warmest_c": nil,
		"column_kmh": s.ColumnKmh, "air_row_c": s.AirRowC, "light_shift": s.Shifted,
	}
	if s.Kind == cold.Limit {
		m["max_work_min"], m["breaks"] = s.MaxWorkMin, s.Breaks
	}
	if s.Row >= 0 {
		m["row_warmest_c"] = s.RowWarmestC
	}
	return m
}

// buildingWeatherFacts gives every outdoor or sheltered building a
// "weather" section: its exposure, its weather site (null when
// facility.yaml names none, and the cold and heat checks of its enclosures
// cannot be judged) and the runs of days on which one of its enclosures was
// occupied.
func (f *facts) buildingWeatherFacts() {
	n := int(f.period.To-f.period.From) + 1
	for _, b := range f.set.Facility.Buildings {
		if !exposed(b) {
			continue
		}
		occupied := make([]bool, n)
		for _, encID := range f.byBuilding[b.ID] {
			for _, seg := range f.segments[encID] {
				if len(seg.Occupants) == 0 {
					continue
				}
				for d := max(seg.From, f.period.From); d <= min(seg.To, f.period.To); d++ {
					occupied[d-f.period.From] = true
				}
			}
		}
		runs := []any{}
		var run dayRun
		for i, occ := range occupied {
			if from, to, done := run.step(f.period.From+records.Day(i), occ); done {
				runs = append(runs, spanRun(from, to))
			}
		}
		if from, to, done := run.flush(); done {
			runs = append(runs, spanRun(from, to))
		}
		d := f.doc("building", b.ID)
		if d["ref"] == nil && b.Line > 0 {
			d["ref"] = fmt.Sprintf("facility.yaml:%d", b.Line)
		}
		d["exposure"] = b.Exposure
		d["weather"] = map[string]any{
			"weather_site":  nilIfEmpty(b.WeatherSite),
			"occupied_days": runs,
		}
	}
}
