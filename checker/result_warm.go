package checker

import (
	"slices"
	"sort"

	"welfare/records"
)

// Warm is the warm-season and inside-building figures of the period, for
// the report's charts and tables (see result_health.go).
type Warm struct {
	// HotDayC is heat.hot_day_c in the limits in force.
	HotDayC float64 `json:"hot_day_c"`
	// Sites are the weather sites with at least one day in the period
	// whose maximum air temperature or heat index reached HotDayC; each
	// carries every day with readings. A cold period has none.
	Sites []SiteHeat `json:"sites"`
	// EnvironmentRecorded: environment.csv was in the records folder.
	EnvironmentRecorded bool `json:"environment_recorded"`
	// Buildings are the indoor and sheltered buildings with readings in
	// the period while they housed animals.
	Buildings []BuildingClimate `json:"buildings"`
	// CleaningRecorded: daily_care.csv was in the records folder.
	CleaningRecorded bool `json:"cleaning_recorded"`
	CleanEveryDays   int  `json:"clean_every_days"`
	// Cleaning are the longest gaps between cleanings (MaxCleaningGaps of
	// them, longest first) and every gap with a care.cleaning.overdue
	// finding (Overdue).
	Cleaning []CleaningGap `json:"cleaning"`
}

// MaxCleaningGaps is how many of the longest cleaning gaps the figures keep
// besides the overdue ones.
const MaxCleaningGaps = 6

// SiteHeat is one weather site's warm days.
type SiteHeat struct {
	Site string    `json:"site"`
	Days []DayHeat `json:"days"`
}

// DayHeat is one day at one site: the maximum air temperature and maximum
// NWS heat index of its readings (°C).
type DayHeat struct {
	Day           records.Day `json:"day"`
	MaxAirC       float64     `json:"max_air_c"`
	MaxHeatIndexC float64     `json:"max_heat_index_c"`
	Readings      int         `json:"readings"`
}

// BuildingClimate is one building's indoor air temperature per day against
// the indoor_temp_c range of each species it housed in the period.
type BuildingClimate struct {
	Building string         `json:"building"`
	Exposure string         `json:"exposure"`
	Ranges   []SpeciesRange `json:"ranges"`
	Days     []DayRange     `json:"days"`
}

// SpeciesRange is a species' indoor_temp_c range (°C).
type SpeciesRange struct {
	Species string  `json:"species"`
	MinC    float64 `json:"min_c"`
	MaxC    float64 `json:"max_c"`
}

// DayRange is the lowest and highest reading of one day (°C).
type DayRange struct {
	Day      records.Day `json:"day"`
	MinC     float64     `json:"min_c"`
	MaxC     float64     `json:"max_c"`
	Readings int         `json:"readings"`
}

// CleaningGap is one enclosure's days between cleanings (as the cleaning
// facts count them).
type CleaningGap struct {
	Enclosure string      `json:"enclosure"`
	From      records.Day `json:"from"`
	Until     records.Day `json:"until"`
	Days      int         `json:"days"`
	Overdue   bool        `json:"overdue"`
}

func (f *facts) warmFigures(fs []Finding, gaps []CleaningGap) *Warm {
	w := &Warm{HotDayC: f.lim.Heat.HotDayC, Sites: []SiteHeat{}, Buildings: []BuildingClimate{}, Cleaning: []CleaningGap{},
		EnvironmentRecorded: f.set.Present["environment.csv"], CleaningRecorded: f.set.Present["daily_care.csv"],
		CleanEveryDays: f.lim.Care.CleanEveryDays}

	for _, id := range sortedIDs(f.docs["site"]) {
		hs, _ := section(f.docs["site"][id], "heat").(map[string]any)
		days, _ := hs["days"].([]any)
		s := SiteHeat{Site: id, Days: []DayHeat{}}
		warm := false
		for _, x := range days {
			m := x.(map[string]any)
			d, _ := records.ParseDay(m["on"].(string))
			dh := DayHeat{Day: d, MaxAirC: m["max_air_c"].(float64), MaxHeatIndexC: m["max_heat_index_c"].(float64), Readings: m["readings"].(int)}
			warm = warm || dh.MaxAirC >= w.HotDayC || dh.MaxHeatIndexC >= w.HotDayC
			s.Days = append(s.Days, dh)
		}
		if warm {
			w.Sites = append(w.Sites, s)
		}
	}

	byBuilding := map[string][]*records.EnvironmentReading{}
	for i := range f.set.Environment {
		r := &f.set.Environment[i]
		byBuilding[r.BuildingID] = append(byBuilding[r.BuildingID], r)
	}
	for _, b := range f.set.Facility.Buildings {
		if (b.Exposure != "indoor" && b.Exposure != "sheltered") || len(byBuilding[b.ID]) == 0 {
			continue
		}
		housed := f.buildingSpecies(b.ID)
		bc := BuildingClimate{Building: b.ID, Exposure: b.Exposure, Ranges: []SpeciesRange{}, Days: []DayRange{}}
		var species []string
		for _, day := range housed {
			for sp := range day {
				if !slices.Contains(species, sp) {
					species = append(species, sp)
				}
			}
		}
		sort.Strings(species)
		for _, sp := range species {
			if rng := f.lim.Species[sp].IndoorTempC; rng != nil {
				bc.Ranges = append(bc.Ranges, SpeciesRange{Species: sp, MinC: rng.Min, MaxC: rng.Max})
			}
		}
		byDay := map[records.Day]*DayRange{}
		for _, r := range byBuilding[b.ID] {
			d := records.DayOf(r.At)
			if !f.inPeriod(d) || len(housed[d-f.period.From]) == 0 {
				continue
			}
			x := byDay[d]
			if x == nil {
				x = &DayRange{Day: d, MinC: r.AirTempC, MaxC: r.AirTempC}
				byDay[d] = x
			}
			x.MinC, x.MaxC = min(x.MinC, r.AirTempC), max(x.MaxC, r.AirTempC)
			x.Readings++
		}
		for d := f.period.From; d <= f.period.To; d++ {
			if x := byDay[d]; x != nil {
				bc.Days = append(bc.Days, *x)
			}
		}
		if len(bc.Days) > 0 {
			w.Buildings = append(w.Buildings, bc)
		}
	}

	overdue := findingDays(fs, "care.cleaning.overdue")
	w.Cleaning = longestGaps(gaps, func(g *CleaningGap) bool {
		for _, d := range overdue[g.Enclosure] {
			if d > g.From && d <= g.Until {
				return true
			}
		}
		return false
	}, MaxCleaningGaps)
	return w
}

// longestGaps gives, longest first (gaps of one length in their order),
// every gap overdue says was overdue (marked Overdue) and the first n of
// the others' order too: what a stable sort of all the gaps by length,
// cut after n but for the overdue ones, gives. It places each gap by a
// count of the gaps of each length instead of sorting them (half a
// million at 10,000 enclosures, a tenth of a second of sorting), and
// sorts only what it keeps; gaps is not changed.
func longestGaps(gaps []CleaningGap, overdue func(*CleaningGap) bool, n int) []CleaningGap {
	if len(gaps) == 0 {
		return nil
	}
	lo, hi := gaps[0].Days, gaps[0].Days
	for i := range gaps {
		lo, hi = min(lo, gaps[i].Days), max(hi, gaps[i].Days)
	}
	// next[k]: the place in the sorted order of the next gap of length hi-k.
	next := make([]int, hi-lo+1)
	for i := range gaps {
		next[hi-gaps[i].Days]++
	}
	at := 0
	for k, c := range next {
		next[k] = at
		at += c
	}
	type placed struct {
		at  int
		gap CleaningGap
	}
	var keep []placed
	for i := range gaps {
		g := gaps[i]
		k := hi - g.Days
		pos := next[k]
		next[k]++
		g.Overdue = g.Overdue || overdue(&g)
		if g.Overdue || pos < n {
			keep = append(keep, placed{pos, g})
		}
	}
	if len(keep) == 0 {
		return nil
	}
	slices.SortFunc(keep, func(a, b placed) int { return a.at - b.at })
	out := make([]CleaningGap, len(keep))
	for i, p := range keep {
		out[i] = p.gap
	}
	return out
}

// cleaningGaps lists the gaps of the enclosures' cleaning sections, by
// enclosure id (Overdue is left for warmFigures): taken before the
// documents are evaluated and let go.
func cleaningGaps(enclosures map[string]map[string]any) []CleaningGap {
	// A cleaning builder's section gives its gaps without being made; a
	// year of them is counted first, so the list is made at its size.
	built := func(d map[string]any) *encCleaning {
		l, _ := d["cleaning"].(*lazy)
		if l == nil {
			return nil
		}
		ec, _ := l.data.(*encCleaning)
		return ec
	}
	n := 0
	for _, d := range enclosures {
		if ec := built(d); ec != nil {
			n += len(ec.gaps)
		}
	}
	gaps := make([]CleaningGap, 0, n)
	for _, id := range sortedIDs(enclosures) {
		if ec := built(enclosures[id]); ec != nil {
			gaps = ec.appendGaps(gaps, id)
			continue
		}
		cs, _ := section(enclosures[id], "cleaning").(map[string]any)
		list, _ := cs["gaps"].([]any)
		for _, x := range list {
			m := x.(map[string]any)
			from, _ := records.ParseDay(m["from"].(string))
			until, _ := records.ParseDay(m["until"].(string))
			gaps = append(gaps, CleaningGap{Enclosure: id, From: from, Until: until, Days: m["days"].(int)})
		}
	}
	return gaps
}

func sortedIDs(byID map[string]map[string]any) []string {
	ids := make([]string, 0, len(byID))
	for id := range byID {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	return ids
}
