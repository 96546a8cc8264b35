package checker

import (
	"sort"

	"github.com/open-policy-agent/opa/v1/ast"

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

// beddingIndex gives, per enclosure and per building, the days a round
// added bedding, from every round up to the period's end: the look-back
// before the period start uses the rounds themselves, so the first days of
// a period are judged on the week before it. The period's days are the care
// index's (a round of the period that added bedding marks its day there);
// the days before the period are listed, sorted.
type beddingIndex struct {
	care     *careDays
	enc, bld map[string][]records.Day // days before the period
}

func (f *facts) beddingDays() beddingIndex {
	ix := beddingIndex{care: f.careIndex(), enc: map[string][]records.Day{}, bld: map[string][]records.Day{}}
	// From the one pass over the rounds (facts_rounds.go).
	rix := f.roundIndex()
	for i := range rix.places {
		if p := &rix.places[i]; p.bedding != nil {
			if p.building {
				ix.bld[p.id] = p.bedding
			} else {
				ix.enc[p.id] = p.bedding
			}
		}
	}
	return ix
}

// enclosureBedding is one enclosure's bedding days and its building's,
// looked up once for a loop over its days. A loop asking for later and
// later days (last) scans the period's days once.
type enclosureBedding struct {
	care   enclosureCare
	before [2][]records.Day // the enclosure's and the building's days before the period
	// next is the first day of the period not yet scanned (0: none is);
	// lastIn the last day before it with bedding added (0: none).
	next, lastIn records.Day
}

func (ix beddingIndex) of(encID, buildingID string) *enclosureBedding {
	return &enclosureBedding{care: ix.care.of(encID, buildingID), before: [2][]records.Day{ix.enc[encID], ix.bld[buildingID]}}
}

// last is the last day up to d (d included) a round added bedding, 0 when
// none did.
func (eb *enclosureBedding) last(d records.Day) records.Day {
	var best records.Day
	for _, ds := range eb.before {
		if len(ds) == 0 {
			continue
		}
		i := sort.Search(len(ds), func(i int) bool { return ds[i] > d })
		if i > 0 && ds[i-1] > best {
			best = ds[i-1]
		}
	}
	from, end := eb.care.from, eb.care.from+records.Day(eb.care.n)
	if d < from {
		return best
	}
	if eb.next == 0 || d < eb.next-1 {
		// The first call, or a day before those scanned: scan from the start.
		eb.next, eb.lastIn = from, 0
	}
	for ; eb.next <= d && eb.next < end; eb.next++ {
		if eb.care.on(eb.next).bedding {
			eb.lastIn = eb.next
		}
	}
	return max(best, eb.lastIn)
}

// exposed reports whether a building's animals live in the outside air.
func exposed(b records.Building) bool {
	return b.Exposure == "outdoor" || b.Exposure == "sheltered"
}

// enclosureColdFacts adds the cold section of every enclosure in an outdoor
// or sheltered building.
//
// The section is lazy (lazy.go): in a cold year nearly every occupied day
// of an enclosure is listed, so the facts keep each listed day as its
// index in the period with the enclosure's own figures (encCold), and the
// site's figures of each day once for every enclosure of the site
// (siteCold); the days' maps are made when the enclosure is evaluated. The
// water checks and bedding days come from the care rounds, read here: the
// section does not read them again.
func (f *facts) enclosureColdFacts(sites map[string]*siteWeather) {
	c := f.careIndex()
	bed := f.beddingDays()
	lc := f.lim.Cold
	pd := newPeriodDays(f.period)
	colds := map[*siteWeather]*siteCold{}
	// Each enclosure's listed days go to buffers reused from one enclosure
	// to the next and are copied out at their exact size.
	var water []waterDay
	var bedding []beddingDay
	var shelter []shelterDay
	var unknown [][2]records.Day
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		b := f.buildings[e.BuildingID]
		if !exposed(b) {
			continue
		}
		s := sites[b.WeatherSite]
		care, bedded := c.of(e.ID, e.BuildingID), bed.of(e.ID, e.BuildingID)
		var unknownRun dayRun
		// 9 CFR §3.4: in an outdoor building a species with an outdoor
		// shelter requirement (dogs) is sheltered by a nest box; a sheltered
		// building is itself the shelter.
		sheltered := e.NestBox.IsYes() || b.Exposure == "sheltered"
		ec := &encCold{
			exposure: b.Exposure, site: nilIfEmpty(b.WeatherSite), ref: e.Ref,
			nestBox: e.NestBox.IsYes(), sheltered: sheltered, days: pd,
		}
		if s != nil {
			sc := colds[s]
			if sc == nil {
				sc = f.siteColdOf(s, pd)
				colds[s] = sc
			}
			ec.sc = sc
		}
		water, bedding, shelter, unknown = water[:0], bedding[:0], shelter[:0], unknown[:0]
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
				// The site's figures of the day, read in place (s.day).
				var dc *DayCold
				if s != nil && f.inPeriod(d) {
					dc = &s.days[d-f.period.From]
				}
				ok := dc != nil && dc.Readings > 0
				if from, to, done := unknownRun.step(d, !ok); done {
					unknown = append(unknown, [2]records.Day{from, to})
				}
				if !ok {
					continue
				}
				k := int32(d - f.period.From)
				// The wind-chill checks judge only days with a reading with
				// wind (s.windDay); the water check needs the air
				// temperature alone.
				windOK := dc.WindReadings > 0
				if dc.MinAirC <= lc.WaterCheckBelowC {
					if checks := int(care.on(d).waterChecks); checks <= lc.WaterChecksMin {
						water = append(water, waterDay{day: k, checks: uint16(checks)})
					}
				}
				// The last bedding is looked up on the days it can decide.
				cold := dc.MinWindChillC <= lc.BeddingWindChill || (bedBelow != nil && dc.MinAirC <= *bedBelow)
				if windOK && cold {
					if last := bedded.last(d); last == 0 || int(d-last) >= lc.BeddingDays {
						bedding = append(bedding, beddingDay{day: k, last: last, below: bedBelow, more: moreBelow})
					}
				}
				if windOK && dc.MinWindChillC <= lc.ShelterWindChill && !e.NestBox.IsYes() {
					shelter = append(shelter, shelterDay{day: k, needsNest: needsNest, needsShelter: needsShelter})
				}
			}
		}
		if from, to, done := unknownRun.flush(); done {
			unknown = append(unknown, [2]records.Day{from, to})
		}
		ec.water, ec.bedding, ec.shelter, ec.unknown = exactCopy(water), exactCopy(bedding), exactCopy(shelter), exactCopy(unknown)
		f.doc("enclosure", e.ID)["cold"] = &lazy{make: ec.section, term: ec.sectionTerm}
	}
}

// periodDays is the period's days as text and as OPA values, made once for
// every enclosure.
type periodDays struct {
	from  records.Day
	text  []string
	terms []*ast.Term
}

func newPeriodDays(p Period) *periodDays {
	n := max(int(p.To-p.From)+1, 0)
	pd := &periodDays{from: p.From, text: make([]string, n), terms: make([]*ast.Term, n)}
	for i := range pd.text {
		pd.text[i] = (p.From + records.Day(i)).String()
		pd.terms[i] = ast.StringTerm(pd.text[i])
	}
	return pd
}

// siteCold is what the cold sections of the enclosures of one weather site
// share, by day of the period: the day's figures, the lowest air
// temperature (a document value) and the reading that gave it, the
// wind-chill figures of a day with wind (coldDayDoc, nil on other days),
// and the same as OPA values, converted once.
type siteCold struct {
	days    []DayCold
	minAir  []any
	airRefs []string
	docs    []map[string]any

	minAirTerms []*ast.Term
	airRefTerms []*ast.Term
	refTerms    []*ast.Term // the ref of each day's wind-chill reading
	pairs       [][][2]*ast.Term
	// err is a day's figures that could not be made OPA values; an
	// enclosure's section gives it when converted.
	err error
}

func (f *facts) siteColdOf(s *siteWeather, pd *periodDays) *siteCold {
	n := len(s.days)
	sc := &siteCold{days: s.days, minAir: s.minAir, airRefs: make([]string, n), docs: make([]map[string]any, n),
		minAirTerms: make([]*ast.Term, n), airRefTerms: make([]*ast.Term, n), refTerms: make([]*ast.Term, n),
		pairs: make([][][2]*ast.Term, n)}
	c := newConverter()
	for i := range s.days {
		if s.days[i].Readings == 0 {
			continue
		}
		sc.airRefs[i] = string(s.coldestAir[i].Ref)
		sc.airRefTerms[i] = ast.StringTerm(sc.airRefs[i])
		sc.minAirTerms[i] = c.num(s.days[i].MinAirC)
		doc, _, ok := f.coldDayDoc(s, pd.from+records.Day(i))
		if !ok {
			continue
		}
		sc.docs[i] = doc
		if r := doc["ref"].(string); r != "" {
			sc.refTerms[i] = ast.StringTerm(r)
		}
		pairs, err := objectPairs(c, doc, 0)
		if err != nil && sc.err == nil {
			sc.err = err
		}
		sc.pairs[i] = pairs
	}
	return sc
}

// encCold is an enclosure's cold section as the facts keep it: its own
// fields, and its listed days as indexes into the period.
type encCold struct {
	exposure  string
	site      any // the weather site's id, or nil
	ref       records.Ref
	nestBox   bool
	sheltered bool
	days      *periodDays
	sc        *siteCold // nil without a weather site
	water     []waterDay
	bedding   []beddingDay
	shelter   []shelterDay
	unknown   [][2]records.Day
}

// waterDay is a day at or below the water limits and its water checks.
type waterDay struct {
	day    int32
	checks uint16
}

// beddingDay is a day at or past the bedding limits: the last day bedding
// was added (0: never) and the occupants' bedding thresholds.
type beddingDay struct {
	day         int32
	last        records.Day
	below, more *float64
}

// shelterDay is a day at or below the shelter limit without a nest box.
type shelterDay struct {
	day                     int32
	needsNest, needsShelter bool
}

// waterGroups gives the water days' groups by checks, fewest first, each
// its days in day order (as parallel arrays in the section).
func (ec *encCold) waterGroups() [][]int32 {
	var groups [][]int32
	for _, w := range ec.water {
		for int(w.checks) >= len(groups) {
			groups = append(groups, nil)
		}
		groups[w.checks] = append(groups[w.checks], w.day)
	}
	return groups
}

// section makes the enclosure's cold section.
func (ec *encCold) section() any {
	sc := ec.sc
	water := []any{}
	for checks, g := range ec.waterGroups() {
		if len(g) == 0 {
			continue
		}
		on, minAir, airRefs := make([]string, len(g)), make([]any, len(g)), make([]string, len(g))
		for k, i := range g {
			on[k], minAir[k], airRefs[k] = ec.days.text[i], sc.minAir[i], sc.airRefs[i]
		}
		water = append(water, map[string]any{"checks": checks, "on": on, "min_air_c": minAir, "air_refs": airRefs})
	}
	bedding := make([]any, len(ec.bedding))
	for k, bd := range ec.bedding {
		base := sc.docs[bd.day]
		day := withFields(base, 6)
		day["min_air_c"] = sc.days[bd.day].MinAirC
		day["bedding_below_c"], day["more_bedding_at_or_below_c"] = num(bd.below), num(bd.more)
		day["last_bedding"], day["days_since_bedding"] = nil, nil
		if bd.last != 0 {
			d := ec.days.from + records.Day(bd.day)
			day["last_bedding"], day["days_since_bedding"] = bd.last.String(), int(d-bd.last)
		}
		day["evidence"] = refs(ec.ref, records.Ref(base["ref"].(string)))
		bedding[k] = day
	}
	shelter := make([]any, len(ec.shelter))
	for k, sd := range ec.shelter {
		base := sc.docs[sd.day]
		day := withFields(base, 3)
		day["needs_nest_box"] = sd.needsNest
		day["needs_shelter"] = sd.needsShelter
		day["evidence"] = refs(ec.ref, records.Ref(base["ref"].(string)))
		shelter[k] = day
	}
	unknown := make([]any, len(ec.unknown))
	for k, r := range ec.unknown {
		unknown[k] = spanRun(r[0], r[1])
	}
	return map[string]any{
		"exposure":     ec.exposure,
		"weather_site": ec.site,
		"nest_box":     ec.nestBox,
		"sheltered":    ec.sheltered,
		"days_at_or_below_water_limits_by_checks":         water,
		"days_at_or_past_bedding_limits":                  bedding,
		"days_at_or_below_shelter_limit_without_nest_box": shelter,
		"days_without_weather":                            unknown,
	}
}

// Keys of the cold section.
var (
	keyChecks          = ast.InternedTerm("checks")
	keyMinAirC         = ast.InternedTerm("min_air_c")
	keyAirRefs         = ast.InternedTerm("air_refs")
	keyBeddingBelow    = ast.InternedTerm("bedding_below_c")
	keyMoreBedding     = ast.InternedTerm("more_bedding_at_or_below_c")
	keyLastBedding     = ast.InternedTerm("last_bedding")
	keyDaysSince       = ast.InternedTerm("days_since_bedding")
	keyEvidence        = ast.InternedTerm("evidence")
	keyNeedsNestBox    = ast.InternedTerm("needs_nest_box")
	keyNeedsShelter    = ast.InternedTerm("needs_shelter")
	keyFrom            = ast.InternedTerm("from")
	keyUntil           = ast.InternedTerm("until")
	keyDays            = ast.InternedTerm("days")
	keyExposure        = ast.InternedTerm("exposure")
	keyWeatherSite     = ast.InternedTerm("weather_site")
	keyNestBox         = ast.InternedTerm("nest_box")
	keySheltered       = ast.InternedTerm("sheltered")
	keyWaterDays       = ast.InternedTerm("days_at_or_below_water_limits_by_checks")
	keyBeddingDays     = ast.InternedTerm("days_at_or_past_bedding_limits")
	keyShelterDays     = ast.InternedTerm("days_at_or_below_shelter_limit_without_nest_box")
	keyDaysWithoutWthr = ast.InternedTerm("days_without_weather")
)

// waterTerms gives the enclosure's water groups (waterGroups) as the
// section's objects. A group's object is made from its site's figures,
// the period's days and the group's days and checks only, and the
// enclosures of a site occupied alike have the same groups (at 1,000
// animals 984 of 990 groups, 156 k days, repeat one made before), so
// the converter keeps each group it made by what it was made from and
// gives it again: values are immutable and shared among documents.
func (ec *encCold) waterTerms(c *converter) []*ast.Term {
	if len(ec.water) == 0 {
		return nil
	}
	maxChecks := 0
	for _, w := range ec.water {
		maxChecks = max(maxChecks, int(w.checks))
	}
	// Each group's day count and a hash of its days (FNV-1a), in one pass.
	var small [8]coldWaterSum
	var sums []coldWaterSum
	if maxChecks < len(small) {
		sums = small[:maxChecks+1]
	} else {
		sums = make([]coldWaterSum, maxChecks+1)
	}
	for i := range sums {
		sums[i].hash = fnvOffset
	}
	for _, w := range ec.water {
		s := &sums[w.checks]
		s.n++
		s.hash = (s.hash ^ uint64(uint32(w.day))) * fnvPrime
	}
	if c.coldWater == nil || len(c.coldWater) > maxSharedGroups {
		c.coldWater = map[coldWaterKey]coldWaterGroup{}
	}
	sc := ec.sc
	var water []*ast.Term
	for checks, s := range sums {
		if s.n == 0 {
			continue
		}
		key := coldWaterKey{sc: sc, days: ec.days, checks: checks, n: s.n, hash: s.hash}
		if g, ok := c.coldWater[key]; ok && g.holds(ec.water, checks) {
			water = append(water, g.term)
			continue
		}
		g := make([]int32, 0, s.n)
		for _, w := range ec.water {
			if int(w.checks) == checks {
				g = append(g, w.day)
			}
		}
		// The three lists in one block.
		block := make([]*ast.Term, 3*len(g))
		on, minAir, airRefs := block[:len(g):len(g)], block[len(g):2*len(g):2*len(g)], block[2*len(g):]
		for k, i := range g {
			on[k], minAir[k], airRefs[k] = ec.days.terms[i], sc.minAirTerms[i], sc.airRefTerms[i]
		}
		t := ast.NewTerm(ast.NewObject(
			[2]*ast.Term{keyChecks, ast.InternedTerm(checks)},
			[2]*ast.Term{keyOn, ast.NewTerm(ast.NewArray(on...))},
			[2]*ast.Term{keyMinAirC, ast.NewTerm(ast.NewArray(minAir...))},
			[2]*ast.Term{keyAirRefs, ast.NewTerm(ast.NewArray(airRefs...))},
		))
		c.coldWater[key] = coldWaterGroup{days: g, term: t}
		water = append(water, t)
	}
	return water
}

// coldWaterKey is what a water group's object is made from: the site's
// figures, the period's days, the checks, and the group's days by their
// number and hash (coldWaterGroup.holds compares them).
type coldWaterKey struct {
	sc        *siteCold
	days      *periodDays
	checks, n int
	hash      uint64
}

type coldWaterGroup struct {
	days []int32
	term *ast.Term
}

type coldWaterSum struct {
	n    int
	hash uint64
}

const (
	fnvOffset uint64 = 14695981039346656037
	fnvPrime  uint64 = 1099511628211
	// Past this many groups a converter forgets them all (its memory stays
	// bounded; a site's enclosures are converted one after the other).
	maxSharedGroups = 1 << 10
)

// holds reports whether water's days with checks are the group's days.
func (g coldWaterGroup) holds(water []waterDay, checks int) bool {
	k := 0
	for _, w := range water {
		if int(w.checks) != checks {
			continue
		}
		if k >= len(g.days) || g.days[k] != w.day {
			return false
		}
		k++
	}
	return k == len(g.days)
}

// ptrTerm is num's value as an OPA value.
func ptrTerm(c *converter, p *float64) *ast.Term {
	if p == nil {
		return ast.InternedNullTerm
	}
	return c.num(*p)
}

// arrayOf is an array term of elems, the one empty array when there are none.
func arrayOf(elems []*ast.Term) *ast.Term {
	if len(elems) == 0 {
		return emptyArray
	}
	return ast.NewTerm(ast.NewArray(elems...))
}

// sectionTerm makes the enclosure's cold section as the OPA value
// converting section's gives: each listed day an object of its site-day's
// converted figures and the enclosure's fields.
func (ec *encCold) sectionTerm(c *converter) (*ast.Term, error) {
	sc := ec.sc
	if sc != nil && sc.err != nil {
		return nil, sc.err
	}
	var encRef *ast.Term
	if ec.ref != "" {
		encRef = c.str(string(ec.ref))
	}
	evidence := func(i int32) *ast.Term {
		ev := make([]*ast.Term, 0, 2)
		for _, t := range [2]*ast.Term{encRef, sc.refTerms[i]} {
			if t != nil {
				ev = append(ev, t)
			}
		}
		return ast.NewTerm(ast.NewArray(ev...))
	}
	water := ec.waterTerms(c)
	bedding := make([]*ast.Term, len(ec.bedding))
	for k, bd := range ec.bedding {
		base := sc.pairs[bd.day]
		last, since := ast.InternedNullTerm, ast.InternedNullTerm
		if bd.last != 0 {
			d := ec.days.from + records.Day(bd.day)
			last, since = c.str(bd.last.String()), ast.InternedTerm(int(d-bd.last))
		}
		pairs := append(base[:len(base):len(base)],
			[2]*ast.Term{keyMinAirC, sc.minAirTerms[bd.day]},
			[2]*ast.Term{keyBeddingBelow, ptrTerm(c, bd.below)},
			[2]*ast.Term{keyMoreBedding, ptrTerm(c, bd.more)},
			[2]*ast.Term{keyLastBedding, last},
			[2]*ast.Term{keyDaysSince, since},
			[2]*ast.Term{keyEvidence, evidence(bd.day)})
		bedding[k] = ast.NewTerm(ast.NewObject(pairs...))
	}
	shelter := make([]*ast.Term, len(ec.shelter))
	for k, sd := range ec.shelter {
		base := sc.pairs[sd.day]
		pairs := append(base[:len(base):len(base)],
			[2]*ast.Term{keyNeedsNestBox, ast.InternedTerm(sd.needsNest)},
			[2]*ast.Term{keyNeedsShelter, ast.InternedTerm(sd.needsShelter)},
			[2]*ast.Term{keyEvidence, evidence(sd.day)})
		shelter[k] = ast.NewTerm(ast.NewObject(pairs...))
	}
	unknown := make([]*ast.Term, len(ec.unknown))
	for k, r := range ec.unknown {
		unknown[k] = ast.NewTerm(ast.NewObject(
			[2]*ast.Term{keyFrom, c.str(r[0].String())},
			[2]*ast.Term{keyUntil, c.str(r[1].String())},
			[2]*ast.Term{keyDays, ast.InternedTerm(int(r[1]-r[0]) + 1)},
		))
	}
	site := ast.InternedNullTerm
	if s, ok := ec.site.(string); ok {
		site = c.str(s)
	}
	return ast.NewTerm(ast.NewObject(
		[2]*ast.Term{keyExposure, c.str(ec.exposure)},
		[2]*ast.Term{keyWeatherSite, site},
		[2]*ast.Term{keyNestBox, ast.InternedTerm(ec.nestBox)},
		[2]*ast.Term{keySheltered, ast.InternedTerm(ec.sheltered)},
		[2]*ast.Term{keyWaterDays, arrayOf(water)},
		[2]*ast.Term{keyBeddingDays, arrayOf(bedding)},
		[2]*ast.Term{keyShelterDays, arrayOf(shelter)},
		[2]*ast.Term{keyDaysWithoutWthr, arrayOf(unknown)},
	)), nil
}
