package checker

import (
	"time"

	"welfare/checker/heat"
	"welfare/records"
)

// Warm-season facts. Subjects get a "heat" section:
//
//   - site: every day of the period with readings, with its maximum heat
//     index (the NWS index of each reading, the day's maximum over readings,
//     in °C unrounded and as the NWS band), the maximum air temperature and
//     whether the reading that gave the maximum had a humidity (without one
//     the air temperature stands for the heat index);
//   - enclosure (outdoor or sheltered buildings only): its shade and the
//     occupied days whose maximum air temperature or maximum heat index
//     reaches hot_day_c, each with the rounds that recorded a water state.
//
// As for the cold facts, Go selects the enclosure days with the limit in
// force (a year of 10,000 enclosures must not reach the rules day by day)
// and each day carries its figures, so the rules compare them against
// data.limits.heat again.

// heatDay is one weather site's warm-season figures for one day.
type heatDay struct {
	readings int
	maxAirC  float64
	airRef   records.Ref
	airAt    time.Time
	// The heat index maximum and the reading that gave it.
	maxHIC  float64
	peak    *records.Weather
	noHumid int // readings without humidity (their heat index is the air temperature)
}

// readingHeatIndexC is the NWS heat index of a reading in °C; a reading
// without humidity has no heat index, and its air temperature stands.
func readingHeatIndexC(w *records.Weather) float64 {
	if w.HumidityPct == nil {
		return w.AirTempC
	}
	return heat.IndexC(w.AirTempC, *w.HumidityPct)
}

// heatDays computes, per site, the figures of each day of the period.
func (f *facts) heatDays() map[string][]heatDay {
	n := int(f.period.To-f.period.From) + 1
	out := map[string][]heatDay{}
	for i := range f.set.Weather {
		w := &f.set.Weather[i]
		d := records.DayOf(w.At)
		if !f.inPeriod(d) {
			continue
		}
		days := out[w.SiteID]
		if days == nil {
			days = make([]heatDay, n)
			out[w.SiteID] = days
		}
		hd := &days[d-f.period.From]
		hi := readingHeatIndexC(w)
		// Ties keep the earlier reading, so the evidence is stable.
		if hd.readings == 0 || w.AirTempC > hd.maxAirC || (w.AirTempC == hd.maxAirC && w.At.Before(hd.airAt)) {
			hd.maxAirC, hd.airRef, hd.airAt = w.AirTempC, w.Ref, w.At
		}
		if hd.readings == 0 || hi > hd.maxHIC || (hi == hd.maxHIC && w.At.Before(hd.peak.At)) {
			hd.maxHIC, hd.peak = hi, w
		}
		if w.HumidityPct == nil {
			hd.noHumid++
		}
		hd.readings++
	}
	return out
}

func (f *facts) heatFacts() {
	byDay := f.heatDays()
	f.siteHeatFacts(byDay)
	f.enclosureHeatFacts(byDay)
}

// heatDayDoc is the document of one site-day.
func heatDayDoc(d records.Day, hd heatDay) map[string]any {
	b := heat.BandC(hd.maxHIC)
	m := map[string]any{
		"on":                d.String(),
		"readings":          hd.readings,
		"max_air_c":         hd.maxAirC,
		"max_heat_index_c":  hd.maxHIC,
		"max_heat_index_f":  heat.CToF(hd.maxHIC),
		"band":              b.Label,
		"band_wording":      b.Wording,
		"peak_at":           hd.peak.At.Format("2006-01-02 15:04"),
		"peak_air_c":        hd.peak.AirTempC,
		"peak_humidity_pct": num(hd.peak.HumidityPct),
		// humidity_recorded: the reading that gave the day's maximum had a
		// humidity; when false the air temperature stands for the heat index.
		"humidity_recorded":         hd.peak.HumidityPct != nil,
		"readings_without_humidity": hd.noHumid,
		"evidence":                  refs(hd.peak.Ref),
	}
	return m
}

// siteHeatFacts adds every site's days with readings.
func (f *facts) siteHeatFacts(byDay map[string][]heatDay) {
	ids := map[string]bool{}
	for _, id := range f.set.Facility.WeatherSites {
		ids[id] = true
	}
	for _, b := range f.set.Facility.Buildings {
		if b.WeatherSite != "" {
			ids[b.WeatherSite] = true
		}
	}
	for id := range byDay {
		ids[id] = true
	}
	for id := range ids {
		days := []any{}
		for i, hd := range byDay[id] {
			if hd.readings > 0 {
				days = append(days, heatDayDoc(f.period.From+records.Day(i), hd))
			}
		}
		annotateHeatRuns(days, f.lim.Heat.DangerHeatIndexC)
		f.doc("site", id)["heat"] = map[string]any{
			"readings_recorded": f.set.Present["weather.csv"],
			"days":              days,
		}
	}
}

// enclosureHeatFacts adds the heat section of every enclosure in an outdoor
// or sheltered building.
func (f *facts) enclosureHeatFacts(byDay map[string][]heatDay) {
	c := f.careIndex()
	hot := f.lim.Heat.HotDayC
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		b := f.buildings[e.BuildingID]
		if !exposed(b) {
			continue
		}
		site := byDay[b.WeatherSite]
		days := []any{}
		for _, seg := range f.segments[e.ID] {
			for d := seg.From; d <= seg.To; d++ {
				if site == nil {
					break
				}
				hd := site[d-f.period.From]
				if hd.readings == 0 || (hd.maxAirC < hot && hd.maxHIC < hot) {
					continue
				}
				m := heatDayDoc(d, hd)
				m["water_checks"] = int(c.on(e.ID, e.BuildingID, d).waterChecks)
				m["evidence"] = refs(e.Ref, hd.airRef, hd.peak.Ref)
				days = append(days, m)
			}
		}
		annotateHeatRuns(days, hot)
		f.doc("enclosure", e.ID)["heat"] = map[string]any{
			"exposure":       b.Exposure,
			"weather_site":   nilIfEmpty(b.WeatherSite),
			"shade":          e.Shade.IsYes(),
			"shade_recorded": e.Shade != records.NotRecorded,
			"hot_days":       days,
		}
	}
}

// annotateHeatRuns gives every day whose maximum heat index reaches limit
// the figures of its run of consecutive such days ("run"; null on other
// days): the run's hottest day and the days in it without humidity. A run
// finding keeps its first day's message, so the message must speak for the
// whole run.
func annotateHeatRuns(days []any, limit float64) {
	in := func(i int) bool { return days[i].(map[string]any)["max_heat_index_c"].(float64) >= limit }
	day := func(i int) records.Day {
		d, _ := records.ParseDay(days[i].(map[string]any)["on"].(string))
		return d
	}
	for i := 0; i < len(days); i++ {
		if !in(i) {
			days[i].(map[string]any)["run"] = nil
			continue
		}
		j := i
		for j+1 < len(days) && in(j+1) && day(j+1) == day(j)+1 {
			j++
		}
		hottest := days[i].(map[string]any)
		noHumidity := []any{}
		for k := i; k <= j; k++ {
			m := days[k].(map[string]any)
			if m["max_heat_index_c"].(float64) > hottest["max_heat_index_c"].(float64) {
				hottest = m
			}
			if !m["humidity_recorded"].(bool) {
				noHumidity = append(noHumidity, m["on"])
			}
		}
		run := map[string]any{
			"from": days[i].(map[string]any)["on"], "until": days[j].(map[string]any)["on"], "days": j - i + 1,
			"hottest_on": hottest["on"], "max_heat_index_c": hottest["max_heat_index_c"],
			"max_heat_index_f": hottest["max_heat_index_f"], "band_wording": hottest["band_wording"],
			"peak_at": hottest["peak_at"], "peak_air_c": hottest["peak_air_c"],
			"peak_humidity_pct": hottest["peak_humidity_pct"], "humidity_recorded": hottest["humidity_recorded"],
			"days_without_humidity": noHumidity,
		}
		for k := i; k <= j; k++ {
			days[k].(map[string]any)["run"] = run
		}
		i = j
	}
}
