package checker

import (
	"slices"
	"sort"

	"welfare/checker/cold"
	"welfare/records"
)

// Cold-season facts. Every subject gets a "cold" section:
//
//   - site: the days at or below the frostbite wind chill, each with its
//     coldest reading, and the days of the period without a reading (checks
//     that need the weather are not judged on those days);
//   - enclosure (outdoor or sheltered buildings only): the occupied days at
//     or below the water, bedding and shelter limits, each with its figures
//     (water checks recorded; days since bedding was added; whether the
//     occupants need a nest box), and the occupied days whose weather is
//     unknown;
//   - staff: each outdoor stint with the reading in force at its start and
//     the work/warm-up schedule step for it.
//
// Go measures, Rego judges: a year of 10,000 enclosures must not reach the
// rules day by day, so Go pre-selects the days that could be findings,
// comparing with the limits inclusively, and the field's name says so:
//
//   - days_at_or_below_water_limits_by_checks: lowest air temperature at or
//     below cold.water_check_below_c and at most cold.water_checks_min water
//     checks, grouped by the number of checks (one group per count, its days
//     as parallel arrays), since in a cold year nearly every occupied day is
//     one of them: the rule compares a group's checks once and each of its
//     days' air temperature only when the checks fall short;
//   - days_at_or_past_bedding_limits: lowest wind chill at or below
//     cold.bedding_wind_chill and bedding added cold.bedding_days or more
//     days before (or never);
//   - days_at_or_below_shelter_limit_without_nest_box: lowest wind chill at
//     or below cold.shelter_wind_chill in an enclosure recorded without one;
//   - days_at_or_below_frostbite_limit (a site).
//
// The rules make the deciding comparisons on each day and group the days
// they judge into runs, so a committee that changes <= to < (or >= to >) in
// a rule sees the change.

// siteWeather is one weather site's readings and daily minima.
type siteWeather struct {
	id       string
	readings []*records.Weather // every reading of the site, in time order
	days     []DayCold          // one per day of the period
	// The reading that gave each day's minimum wind chill and minimum air
	// temperature, as evidence.
	coldestWC  []*records.Weather
	coldestAir []*records.Weather
	// minAir is each day's lowest air temperature as a document value,
	// made once and shared by the water days of every enclosure at the site.
	minAir []any
}

// day returns the site's figures for day d and whether it had readings
// (the air-temperature figures are known).
func (s *siteWeather) day(p Period, d records.Day) (DayCold, bool) {
	if s == nil || d < p.From || d > p.To {
		return DayCold{}, false
	}
	return s.days[int(d-p.From)], s.days[int(d-p.From)].Readings > 0
}

// windDay returns the site's figures for day d, the reading that gave its
// minimum wind chill, and whether a reading of the day had wind (the
// wind-chill figures are known). A reading without wind is not calm: it
// has no wind chill (checks.md, second-set clarifications).
func (s *siteWeather) windDay(p Period, d records.Day) (DayCold, *records.Weather, bool) {
	if s == nil || d < p.From || d > p.To {
		return DayCold{}, nil, false
	}
	i := int(d - p.From)
	return s.days[i], s.coldestWC[i], s.days[i].WindReadings > 0
}

func (f *facts) coldFacts() {
	sites := f.weatherSites()
	f.weather = make([]SiteDays, len(sites))
	byID := make(map[string]*siteWeather, len(sites))
	for i, s := range sites {
		f.weather[i] = SiteDays{Site: s.id, Days: s.days}
		byID[s.id] = s
		f.siteColdFacts(s)
	}
	f.enclosureColdFacts(byID)
	f.stintColdFacts(byID)
	f.buildingWeatherFacts()
}

// weatherSites gathers the sites named by facility.yaml, its buildings and
// the readings, sorted by id, with their daily minima over the period.
func (f *facts) weatherSites() []*siteWeather {
	byID := map[string]*siteWeather{}
	add := func(id string) *siteWeather {
		if id == "" {
			return nil
		}
		s := byID[id]
		if s == nil {
			s = &siteWeather{id: id}
			byID[id] = s
		}
		return s
	}
	for _, id := range f.set.Facility.WeatherSites {
		add(id)
	}
	for _, b := range f.set.Facility.Buildings {
		add(b.WeatherSite)
	}
	for i := range f.set.Weather {
		w := &f.set.Weather[i]
		s := add(w.SiteID)
		s.readings = append(s.readings, w)
	}
	n := int(f.period.To-f.period.From) + 1
	out := make([]*siteWeather, 0, len(byID))
	for _, s := range byID {
		sort.SliceStable(s.readings, func(i, j int) bool { return s.readings[i].At.Before(s.readings[j].At) })
		s.days = make([]DayCold, n)
		s.coldestWC = make([]*records.Weather, n)
		s.coldestAir = make([]*records.Weather, n)
		s.minAir = make([]any, n)
		for i := range s.days {
			s.days[i].Day = f.period.From + records.Day(i)
		}
		for _, w := range s.readings {
			d := records.DayOf(w.At)
			if !f.inPeriod(d) {
				continue
			}
			i := int(d - f.period.From)
			dc := &s.days[i]
			if w.WindKmh != nil {
				wc := cold.WindChillC(w.AirTempC, *w.WindKmh)
				if dc.WindReadings == 0 || wc < dc.MinWindChillC {
					dc.MinWindChillC, s.coldestWC[i] = wc, w
				}
				dc.WindReadings++
			}
			if dc.Readings == 0 || w.AirTempC < dc.MinAirC {
				dc.MinAirC, s.coldestAir[i] = w.AirTempC, w
			}
			dc.Readings++
		}
		for i := range s.days {
			s.minAir[i] = s.days[i].MinAirC
		}
		out = append(out, s)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].id < out[j].id })
	return out
}

// coldDayDoc is one day at a site as the cold rules see it: its lowest
// wind chill (unrounded, and as charted), the reading that gave it, its air
// and wind, and the hazard band. ok is false on a day without a reading
// with wind.
func (f *facts) coldDayDoc(s *siteWeather, d records.Day) (map[string]any, *records.Weather, bool) {
	dc, w, ok := s.windDay(f.period, d)
	if !ok {
		return nil, nil, false
	}
	return map[string]any{
		"on":                 d.String(),
		"min_wind_chill_c":   dc.MinWindChillC,
		"wind_chill_display": cold.Display(dc.MinWindChillC),
		"air_c":              w.AirTempC,
		"wind_kmh":           num(w.WindKmh),
		"band":               cold.Band(dc.MinWindChillC).Wording,
		"ref":                string(w.Ref),
	}, w, true
}

// siteColdFacts adds a site's days at or below the frostbite limit, its
// days without readings, and its days without a reading with wind (the
// wind-chill checks cannot judge them), each run with how many of its days
// had readings, none of them with wind.
func (f *facts) siteColdFacts(s *siteWeather) {
	frost, missing, windless := []any{}, []any{}, []any{}
	var missRun, windRun dayRun
	limit := f.lim.Cold.FrostbiteWindChill
	windlessRun := func(from, to records.Day) map[string]any {
		m := spanRun(from, to)
		n, refs := 0, []any{}
		for d := from; d <= to; d++ {
			if dc, _ := s.day(f.period, d); dc.Readings > 0 {
				n++
			}
		}
		for _, w := range s.readings {
			if d := records.DayOf(w.At); d >= from && d <= to && len(refs) < 3 {
				refs = append(refs, string(w.Ref))
			}
		}
		m["days_with_readings_without_wind"] = n
		m["evidence"] = refs
		return m
	}
	for d := f.period.From; d <= f.period.To; d++ {
		_, hasAir := s.day(f.period, d)
		day, _, ok := f.coldDayDoc(s, d)
		if ok && day["min_wind_chill_c"].(float64) <= limit {
			frost = append(frost, day)
		}
		if from, to, done := missRun.step(d, !hasAir); done {
			missing = append(missing, spanRun(from, to))
		}
		if from, to, done := windRun.step(d, !ok); done {
			windless = append(windless, windlessRun(from, to))
		}
	}
	if from, to, done := missRun.flush(); done {
		missing = append(missing, spanRun(from, to))
	}
	if from, to, done := windRun.flush(); done {
		windless = append(windless, windlessRun(from, to))
	}
	f.doc("site", s.id)["cold"] = map[string]any{
		"readings_recorded":                f.set.Present["weather.csv"],
		"days_at_or_below_frostbite_limit": frost,
		"days_without_readings":            missing,
		"days_without_wind_readings":       windless,
	}
}

// beddingIndex lists, per enclosure and per building, the days a round
// added bedding, sorted, from every round up to the period's end: the
// look-back before the period start uses the rounds themselves, so the first
// days of a period are judged on the week before it.
type beddingIndex struct {
	enc, bld map[string][]records.Day
}

func (f *facts) beddingDays() beddingIndex {
	ix := beddingIndex{enc: map[string][]records.Day{}, bld: map[string][]records.Day{}}
	// Gathered by the keys of the rounds' table, named once per key.
	strs := f.rounds.Strings()
	encDays := make([][]records.Day, len(strs))
	bldDays := make([][]records.Day, len(strs))
	for i := range f.rounds.Len() {
		d := f.rounds.Day(i)
		if d > f.period.To || !f.rounds.Answers(i).BeddingAdded.IsYes() {
			continue
		}
		if k := f.rounds.Keys(i); k.Enclosure != 0 {
			encDays[k.Enclosure] = append(encDays[k.Enclosure], d)
		} else {
			bldDays[k.Building] = append(bldDays[k.Building], d)
		}
	}
	for k, id := range strs {
		for _, m := range []struct {
			days [][]records.Day
			ix   map[string][]records.Day
		}{{encDays, ix.enc}, {bldDays, ix.bld}} {
			if ds := m.days[k]; ds != nil {
				if !slices.IsSorted(ds) {
					slices.Sort(ds)
				}
				m.ix[id] = ds
			}
		}
	}
	return ix
}

// last is the latest day on or before d bedding was added to the enclosure
// (by its own rounds or its building's), or 0.
func (ix beddingIndex) last(encID, buildingID string, d records.Day) records.Day {
	return ix.of(encID, buildingID).last(d)
}

// enclosureBedding is one enclosure's bedding days and its building's,
// looked up once for a loop over its days.
type enclosureBedding struct{ enc, bld []records.Day }

func (ix beddingIndex) of(encID, buildingID string) enclosureBedding {
	return enclosureBedding{ix.enc[encID], ix.bld[buildingID]}
}

func (eb enclosureBedding) last(d records.Day) records.Day {
	var best records.Day
	for _, ds := range [2][]records.Day{eb.enc, eb.bld} {
		i := sort.Search(len(ds), func(i int) bool { return ds[i] > d })
		if i > 0 && ds[i-1] > best {
			best = ds[i-1]
		}
	}
	return best
}

// exposed reports whether a building's animals live in the outside air.
func exposed(b records.Building) bool {
	return b.Exposure == "outdoor" || b.Exposure == "sheltered"
}

// enclosureColdFacts adds the cold section of every enclosure in an outdoor
// or sheltered building.
func (f *facts) enclosureColdFacts(sites map[string]*siteWeather) {
	c := f.careIndex()
	bed := f.beddingDays()
	lc := f.lim.Cold
	// The period's days as text, made once: the water groups of every
	// enclosure share them.
	days := make([]string, max(int(f.period.To-f.period.From)+1, 0))
	for i := range days {
		days[i] = (f.period.From + records.Day(i)).String()
	}
	water := newWaterGroups(lc.WaterChecksMin, days)
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		b := f.buildings[e.BuildingID]
		if !exposed(b) {
			continue
		}
		s := sites[b.WeatherSite]
		bedding, shelter, unknown := []any{}, []any{}, []any{}
		water.reset()
		care, bedded := c.of(e.ID, e.BuildingID), bed.of(e.ID, e.BuildingID)
		var unknownRun dayRun
		// 9 CFR §3.4: in an outdoor building a species with an outdoor
		// shelter requirement (dogs) is sheltered by a nest box; a sheltered
		// building is itself the shelter.
		sheltered := e.NestBox.IsYes() || b.Exposure == "sheltered"
		for _, seg := range f.segments[e.ID] {
			needsNest, needsShelter := false, false
			// The occupants' outdoor bedding limits (dogs, 9 CFR §3.4(b)(4)):
			// the warmest threshold among them, nil when none applies.
			var bedBelow, moreBelow *float64
			for _, o := range seg.Occupants {
				sp := f.lim.Species[o.Animal.Species]
				needsNest = needsNest || sp.NestBox
				if out := sp.Outdoor; out != nil && b.Exposure == "outdoor" {
					needsShelter = needsShelter || out.Shelter
					if out.BeddingBelowC != nil && (bedBelow == nil || *out.BeddingBelowC > *bedBelow) {
						bedBelow, moreBelow = out.BeddingBelowC, out.MoreBeddingAtOrBelowC
					}
				}
			}
			for d := seg.From; d <= seg.To; d++ {
				dc, ok := s.day(f.period, d)
				if from, to, done := unknownRun.step(d, !ok); done {
					unknown = append(unknown, spanRun(from, to))
				}
				if !ok {
					continue
				}
				// The wind-chill checks judge only days with a reading with
				// wind; the water check needs the air temperature alone.
				_, _, windOK := s.windDay(f.period, d)
				if checks := int(care.on(d).waterChecks); dc.MinAirC <= lc.WaterCheckBelowC && checks <= lc.WaterChecksMin {
					water.add(checks, int(d-f.period.From), s.minAir[d-f.period.From], s.coldestAir[d-f.period.From].Ref)
				}
				last := bedded.last(d)
				cold := dc.MinWindChillC <= lc.BeddingWindChill || (bedBelow != nil && dc.MinAirC <= *bedBelow)
				if windOK && cold && (last == 0 || int(d-last) >= lc.BeddingDays) {
					day, w, _ := f.coldDayDoc(s, d)
					day["min_air_c"] = dc.MinAirC
					day["bedding_below_c"], day["more_bedding_at_or_below_c"] = num(bedBelow), num(moreBelow)
					day["last_bedding"], day["days_since_bedding"] = nil, nil
					if last != 0 {
						day["last_bedding"], day["days_since_bedding"] = last.String(), int(d-last)
					}
					day["evidence"] = refs(e.Ref, w.Ref)
					bedding = append(bedding, day)
				}
				if windOK && dc.MinWindChillC <= lc.ShelterWindChill && !e.NestBox.IsYes() {
					day, w, _ := f.coldDayDoc(s, d)
					day["needs_nest_box"] = needsNest
					day["needs_shelter"] = needsShelter
					day["evidence"] = refs(e.Ref, w.Ref)
					shelter = append(shelter, day)
				}
			}
		}
		if from, to, done := unknownRun.flush(); done {
			unknown = append(unknown, spanRun(from, to))
		}
		f.doc("enclosure", e.ID)["cold"] = map[string]any{
			"exposure":     b.Exposure,
			"weather_site": nilIfEmpty(b.WeatherSite),
			"nest_box":     e.NestBox.IsYes(),
			"sheltered":    sheltered,
			"days_at_or_below_water_limits_by_checks":         water.doc(),
			"days_at_or_past_bedding_limits":                  bedding,
			"days_at_or_below_shelter_limit_without_nest_box": shelter,
			"days_without_weather":                            unknown,
		}
	}
}

// waterGroups gathers an enclosure's days at or below the water limits by
// the number of water checks recorded (0 to cold.water_checks_min): one
// group per count, its days in day order as parallel arrays (the day, its
// lowest air temperature and the reading that gave it). The texts are
// []string, which OPA takes without boxing each one. The days are listed
// first and each group's arrays made at their size when the enclosure is
// done; one waterGroups serves every enclosure in turn (reset).
type waterGroups struct {
	days    []string // the period's days as text, by day of the period
	groups  int
	entries []waterDay
	counts  []int
}

type waterDay struct {
	checks, i int
	minAirC   any
	air       records.Ref
}

func newWaterGroups(maxChecks int, days []string) *waterGroups {
	n := max(maxChecks+1, 0)
	return &waterGroups{days: days, groups: n, counts: make([]int, n)}
}

// reset empties the groups for the next enclosure.
func (w *waterGroups) reset() {
	w.entries = w.entries[:0]
	clear(w.counts)
}

// add lists day i of the period, with checks water checks (minAirC: the
// day's lowest air temperature, a float64).
func (w *waterGroups) add(checks, i int, minAirC any, air records.Ref) {
	w.counts[checks]++
	w.entries = append(w.entries, waterDay{checks, i, minAirC, air})
}

// doc gives the groups that have days, fewest checks first.
func (w *waterGroups) doc() []any {
	out := []any{}
	type group struct {
		on, airRefs []string
		minAirC     []any
	}
	groups := make([]group, w.groups)
	for checks, n := range w.counts {
		if n > 0 {
			groups[checks] = group{make([]string, 0, n), make([]string, 0, n), make([]any, 0, n)}
		}
	}
	for _, e := range w.entries {
		g := &groups[e.checks]
		g.on = append(g.on, w.days[e.i])
		g.minAirC = append(g.minAirC, e.minAirC)
		g.airRefs = append(g.airRefs, string(e.air))
	}
	for checks, g := range groups {
		if len(g.on) > 0 {
			out = append(out, map[string]any{"checks": checks, "on": g.on, "min_air_c": g.minAirC, "air_refs": g.airRefs})
		}
	}
	return out
}
