package checker

import (
	"time"

	"github.com/open-policy-agent/opa/v1/ast"

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
	docs := f.heatDayDocs(byDay)
	f.siteHeatFacts(byDay, docs)
	f.enclosureHeatFacts(byDay, docs)
}

// heatDayDoc is the figures of one site-day, as the site's days and the
// enclosures' hot days both give them (each adds its own evidence, and
// its run).
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
	}
	return m
}

// heatDayDocs builds the figures of every site-day with readings once
// (heatDayDoc), by site and day of the period; the site's document and
// those of the enclosures the site reads for copy them.
func (f *facts) heatDayDocs(byDay map[string][]heatDay) map[string][]map[string]any {
	out := map[string][]map[string]any{}
	for id, days := range byDay {
		docs := make([]map[string]any, len(days))
		for i, hd := range days {
			if hd.readings > 0 {
				docs[i] = heatDayDoc(f.period.From+records.Day(i), hd)
			}
		}
		out[id] = docs
	}
	return out
}

// withFields is a copy of the site-day figures base with the fields a
// subject adds (shallow: the values are shared, documents are not changed
// once built).
func withFields(base map[string]any, extra int) map[string]any {
	m := make(map[string]any, len(base)+extra)
	for k, v := range base {
		m[k] = v
	}
	return m
}

// siteHeatFacts adds every site's days with readings.
func (f *facts) siteHeatFacts(byDay map[string][]heatDay, docs map[string][]map[string]any) {
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
		var on []records.Day
		for i, hd := range byDay[id] {
			if hd.readings > 0 {
				m := withFields(docs[id][i], 2)
				m["evidence"] = refs(hd.peak.Ref)
				m["run"] = nil
				days = append(days, m)
				on = append(on, f.period.From+records.Day(i))
			}
		}
		for _, r := range heatRuns(days, on, f.lim.Heat.DangerHeatIndexC) {
			setRun(days, r, heatRunDoc(days[r.first:r.last+1]))
		}
		f.doc("site", id)["heat"] = map[string]any{
			"readings_recorded": f.set.Present["weather.csv"],
			"days":              days,
		}
	}
}

// enclosureHeatFacts adds the heat section of every enclosure in an outdoor
// or sheltered building. An enclosure's hot days copy its site's figures
// (heatDayDocs); a run of hot days the enclosure was occupied for from
// start to end is the site's run, one document shared by every enclosure
// of the site.
//
// The section is lazy (lazy.go): a year has about 50 hot days per
// enclosure, each a map of 16 values, so the facts keep only each hot
// day's index and water checks (encHeat) and the site's figures, shared,
// and the section is made when the enclosure is evaluated.
func (f *facts) enclosureHeatFacts(byDay map[string][]heatDay, docs map[string][]map[string]any) {
	c := f.careIndex()
	hot := f.lim.Heat.HotDayC
	sites := map[string]*siteHeat{}
	// Each enclosure's hot days go to a buffer reused from one enclosure to
	// the next and are copied out at their exact size.
	var days []hotDayOf
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		b := f.buildings[e.BuildingID]
		if !exposed(b) {
			continue
		}
		site := byDay[b.WeatherSite]
		care := c.of(e.ID, e.BuildingID)
		days = days[:0]
		eh := &encHeat{
			exposure: b.Exposure, site: nilIfEmpty(b.WeatherSite), ref: e.Ref,
			shade: e.Shade.IsYes(), shadeRecorded: e.Shade != records.NotRecorded,
		}
		for _, seg := range f.segments[e.ID] {
			for d := seg.From; d <= seg.To; d++ {
				if site == nil {
					break
				}
				k := d - f.period.From
				if !hotDay(site[k], hot) {
					continue
				}
				days = append(days, hotDayOf{day: int32(k), water: uint16(care.on(d).waterChecks)})
			}
		}
		eh.days = exactCopy(days)
		if len(eh.days) > 0 {
			sh := sites[b.WeatherSite]
			if sh == nil {
				sh = f.siteHeatOf(site, docs[b.WeatherSite], hot)
				sites[b.WeatherSite] = sh
			}
			eh.on = sh
		}
		f.doc("enclosure", e.ID)["heat"] = &lazy{make: eh.section, term: eh.sectionTerm}
	}
}

// siteHeat is what the enclosures of one weather site share: the figures
// of each day of the period (nil without readings), the evidence of each
// day (the readings with the maximum air temperature and heat index) and
// the site's runs of hot days.
//
// For the rules' values (encHeat.sectionTerm) it keeps the same as OPA
// values, converted once: each day's figures as key-value pairs, its
// evidence refs, and each site run.
type siteHeat struct {
	from     records.Day
	docs     []map[string]any
	evidence [][2]records.Ref
	runs     map[records.Day]siteRun
	hot      float64
	hic      []float64 // each day's maximum heat index (its figures' max_heat_index_c)

	pairs    [][][2]*ast.Term
	evTerms  [][2]*ast.Term
	runTerms map[records.Day]*ast.Term
	// err is a site-day or run that could not be made OPA values; an
	// enclosure's section gives it when converted.
	err error
}

func (f *facts) siteHeatOf(site []heatDay, docs []map[string]any, hot float64) *siteHeat {
	sh := &siteHeat{from: f.period.From, docs: docs, evidence: make([][2]records.Ref, len(site)), hot: hot,
		hic: make([]float64, len(site))}
	for i, hd := range site {
		sh.hic[i] = hd.maxHIC
		if hd.readings > 0 {
			sh.evidence[i] = [2]records.Ref{hd.airRef, hd.peak.Ref}
		}
	}
	sh.runs = f.siteHotRuns(site, docs, hot)
	c := newConverter()
	sh.pairs = make([][][2]*ast.Term, len(site))
	sh.evTerms = make([][2]*ast.Term, len(site))
	for i, d := range docs {
		if d == nil || !hotDay(site[i], hot) {
			continue
		}
		pairs, err := objectPairs(c, d, 3)
		if err != nil && sh.err == nil {
			sh.err = err
		}
		sh.pairs[i] = pairs
		for k, r := range sh.evidence[i] {
			if r != "" {
				sh.evTerms[i][k] = ast.StringTerm(string(r))
			}
		}
	}
	sh.runTerms = make(map[records.Day]*ast.Term, len(sh.runs))
	for d, r := range sh.runs {
		t, err := c.term(r.doc)
		if err != nil && sh.err == nil {
			sh.err = err
		}
		sh.runTerms[d] = t
	}
	return sh
}

// encHeat is an enclosure's heat section as the facts keep it.
type encHeat struct {
	exposure      string
	site          any
	ref           records.Ref
	shade         bool
	shadeRecorded bool
	days          []hotDayOf
	on            *siteHeat // nil when the enclosure has no hot day
}

// hotDayOf is one of an enclosure's hot days: its index in the period and
// the rounds that recorded a water state that day.
type hotDayOf struct {
	day   int32
	water uint16
}

// Keys of the hot days' fields an enclosure adds to its site's figures.
var (
	waterChecksKey = ast.InternedTerm("water_checks")
	evidenceKey    = ast.InternedTerm("evidence")
	heatRunKey     = ast.InternedTerm("run")
)

// hotDayPairs is room for a hot day's key-value pairs: the site-day's 13
// figures and the enclosure's 3 fields, and some to spare.
const hotDayPairs = 20

// sectionTerm makes the enclosure's heat section as the OPA value
// converting section's gives: each hot day an object of its site-day's
// converted figures and the enclosure's three fields, a site run's
// converted once for every enclosure of the site.
func (eh *encHeat) sectionTerm(c *converter) (*ast.Term, error) {
	days := emptyArray
	if len(eh.days) > 0 {
		sh := eh.on
		if sh.err != nil {
			return nil, sh.err
		}
		encRef := ast.StringTerm(string(eh.ref))
		on := make([]records.Day, len(eh.days))
		for k, hd := range eh.days {
			on[k] = sh.from + records.Day(hd.day)
		}
		hic := func(k int) float64 { return sh.hic[eh.days[k].day] }
		runs := make([]*ast.Term, len(eh.days))
		for _, r := range heatRunsBy(len(on), hic, on, sh.hot) {
			t, ok := sh.runTerms[on[r.first]]
			if !ok || sh.runs[on[r.first]].until != on[r.last] {
				days := make([]any, 0, r.last-r.first+1)
				for _, hd := range eh.days[r.first : r.last+1] {
					days = append(days, sh.docs[hd.day])
				}
				var err error
				if t, err = c.term(heatRunDoc(days)); err != nil {
					return nil, err
				}
			}
			for k := r.first; k <= r.last; k++ {
				runs[k] = t
			}
		}
		// The days' terms and evidence lists in one block each; the
		// key-value pairs of each day in an array on the stack (NewObject
		// copies them out, and writing them there costs no write barrier
		// while the collector runs), or on the converter's stack when a
		// site-day has more figures than it holds.
		elems := make([]*ast.Term, len(eh.days))
		terms := make([]ast.Term, 2*len(eh.days))
		evs := make([]*ast.Term, 0, 3*len(eh.days))
		var buf [hotDayPairs][2]*ast.Term
		start := len(c.pairs)
		defer func() { c.pairs = c.pairs[:start] }()
		for k, hd := range eh.days {
			at := len(evs)
			if eh.ref != "" {
				evs = append(evs, encRef)
			}
			for _, t := range sh.evTerms[hd.day] {
				if t != nil {
					evs = append(evs, t)
				}
			}
			ev := &terms[2*k]
			ev.Value = ast.NewArray(evs[at:len(evs):len(evs)]...)
			run := runs[k]
			if run == nil {
				run = ast.InternedNullTerm
			}
			site := sh.pairs[hd.day]
			var pairs [][2]*ast.Term
			if len(site)+3 <= len(buf) {
				pairs = buf[:len(site)+3]
			} else {
				c.pairs = append(c.pairs[:start], make([][2]*ast.Term, len(site)+3)...)
				pairs = c.pairs[start:]
			}
			n := copy(pairs, site)
			pairs[n] = [2]*ast.Term{waterChecksKey, ast.InternedTerm(int(hd.water))}
			pairs[n+1] = [2]*ast.Term{evidenceKey, ev}
			pairs[n+2] = [2]*ast.Term{heatRunKey, run}
			day := &terms[2*k+1]
			day.Value = ast.NewObject(pairs...)
			elems[k] = day
		}
		days = ast.NewTerm(ast.NewArray(elems...))
	}
	var site *ast.Term = ast.InternedNullTerm
	if s, ok := eh.site.(string); ok {
		site = c.str(s)
	}
	fewest := ast.InternedNullTerm
	if n, ok := eh.fewestWaterChecks(); ok {
		fewest = ast.InternedTerm(n)
	}
	return ast.NewTerm(ast.NewObject(
		[2]*ast.Term{c.key("exposure"), c.str(eh.exposure)},
		[2]*ast.Term{c.key("weather_site"), site},
		[2]*ast.Term{c.key("shade"), ast.InternedTerm(eh.shade)},
		[2]*ast.Term{c.key("shade_recorded"), ast.InternedTerm(eh.shadeRecorded)},
		[2]*ast.Term{c.key("hot_days"), days},
		[2]*ast.Term{c.key("fewest_water_checks"), fewest},
	)), nil
}

// section makes the enclosure's heat section.
func (eh *encHeat) section() any {
	days := make([]any, 0, len(eh.days))
	on := make([]records.Day, 0, len(eh.days))
	sh := eh.on
	for _, hd := range eh.days {
		m := withFields(sh.docs[hd.day], 3)
		m["water_checks"] = int(hd.water)
		ev := sh.evidence[hd.day]
		m["evidence"] = refs(eh.ref, ev[0], ev[1])
		m["run"] = nil
		days = append(days, m)
		on = append(on, sh.from+records.Day(hd.day))
	}
	if len(days) > 0 {
		for _, r := range heatRuns(days, on, sh.hot) {
			if sr, ok := sh.runs[on[r.first]]; ok && sr.until == on[r.last] {
				setRun(days, r, sr.doc)
			} else {
				setRun(days, r, heatRunDoc(days[r.first:r.last+1]))
			}
		}
	}
	var fewest any
	if n, ok := eh.fewestWaterChecks(); ok {
		fewest = n
	}
	return map[string]any{
		"exposure":            eh.exposure,
		"weather_site":        eh.site,
		"shade":               eh.shade,
		"shade_recorded":      eh.shadeRecorded,
		"hot_days":            days,
		"fewest_water_checks": fewest,
	}
}

// fewestWaterChecks is the fewest water checks of any of the enclosure's
// hot days; false when it has none.
func (eh *encHeat) fewestWaterChecks() (int, bool) {
	if len(eh.days) == 0 {
		return 0, false
	}
	n := int(eh.days[0].water)
	for _, hd := range eh.days[1:] {
		n = min(n, int(hd.water))
	}
	return n, true
}

// hotDay reports whether a site-day is a hot day for the enclosures it
// reads for: its maximum air temperature or heat index reaches limit.
func hotDay(hd heatDay, limit float64) bool {
	return hd.readings > 0 && (hd.maxAirC >= limit || hd.maxHIC >= limit)
}

// siteRun is a run of a site's hot days as an enclosure occupied for all
// of it has it: its last day and its document.
type siteRun struct {
	until records.Day
	doc   map[string]any
}

// siteHotRuns gives, by first day, the runs of a site's hot days (the days
// an enclosure occupied for the whole period would list).
func (f *facts) siteHotRuns(site []heatDay, docs []map[string]any, hot float64) map[records.Day]siteRun {
	var days []any
	var on []records.Day
	for i, hd := range site {
		if hotDay(hd, hot) {
			days = append(days, docs[i])
			on = append(on, f.period.From+records.Day(i))
		}
	}
	out := map[records.Day]siteRun{}
	for _, r := range heatRuns(days, on, hot) {
		out[on[r.first]] = siteRun{until: on[r.last], doc: heatRunDoc(days[r.first : r.last+1])}
	}
	return out
}

// dayRange is a run of days as indexes into a list of days, inclusive.
type dayRange struct{ first, last int }

// heatRuns finds, in days (site-day documents of the days on, in order),
// the runs of consecutive days whose maximum heat index reaches limit. A
// run finding keeps its first day's message, so the message must speak
// for the whole run: each day of a run gets the run's document (setRun).
func heatRuns(days []any, on []records.Day, limit float64) []dayRange {
	hic := func(i int) float64 { return days[i].(map[string]any)["max_heat_index_c"].(float64) }
	return heatRunsBy(len(days), hic, on, limit)
}

// heatRunsBy is heatRuns of n days given by their maximum heat index.
func heatRunsBy(n int, hic func(i int) float64, on []records.Day, limit float64) []dayRange {
	in := func(i int) bool { return hic(i) >= limit }
	var out []dayRange
	for i := 0; i < n; i++ {
		if !in(i) {
			continue
		}
		j := i
		for j+1 < n && in(j+1) && on[j+1] == on[j]+1 {
			j++
		}
		out = append(out, dayRange{i, j})
		i = j
	}
	return out
}

// setRun gives the days of r the run document run (the other days have a
// null run).
func setRun(days []any, r dayRange, run map[string]any) {
	for k := r.first; k <= r.last; k++ {
		days[k].(map[string]any)["run"] = run
	}
}

// heatRunDoc is the document of a run of days: its hottest day and the
// days in it without humidity.
func heatRunDoc(days []any) map[string]any {
	first, last := days[0].(map[string]any), days[len(days)-1].(map[string]any)
	hottest := first
	noHumidity := []any{}
	for _, d := range days {
		m := d.(map[string]any)
		if m["max_heat_index_c"].(float64) > hottest["max_heat_index_c"].(float64) {
			hottest = m
		}
		if !m["humidity_recorded"].(bool) {
			noHumidity = append(noHumidity, m["on"])
		}
	}
	return map[string]any{
		"from": first["on"], "until": last["on"], "days": len(days),
		"hottest_on": hottest["on"], "max_heat_index_c": hottest["max_heat_index_c"],
		"max_heat_index_f": hottest["max_heat_index_f"], "band_wording": hottest["band_wording"],
		"peak_at": hottest["peak_at"], "peak_air_c": hottest["peak_air_c"],
		"peak_humidity_pct": hottest["peak_humidity_pct"], "humidity_recorded": hottest["humidity_recorded"],
		"days_without_humidity": noHumidity,
	}
}
