package checker

import (
	"fmt"
	"math"
	"slices"
	"sort"

	"welfare/records"
)

// Inside-building facts. Every indoor or sheltered building gets a
// "building" subject with an "environment" section:
//
//   - temperature: for each species housed in the building during the period
//     whose profile has an indoor_temp_c range, the spells of consecutive
//     readings outside that range while the building housed the species. A
//     spell runs from the first reading outside to the first reading back
//     inside, or to the last reading outside when none follows (or when the
//     species is no longer housed there); its length in hours is measured
//     here, and the rule compares it with hours_outside.
//   - days: every day the building housed animals and had readings, with the
//     day's humidity readings (indoor buildings) and its ammonia peak.

// buildingSpecies lists, per day of the period, the species housed in any
// enclosure of the building.
func (f *facts) buildingSpecies(buildingID string) []map[string]bool {
	n := int(f.period.To-f.period.From) + 1
	out := make([]map[string]bool, n)
	for _, encID := range f.byBuilding[buildingID] {
		for _, seg := range f.segments[encID] {
			for d := seg.From; d <= seg.To; d++ {
				i := int(d - f.period.From)
				for _, o := range seg.Occupants {
					if out[i] == nil {
						out[i] = map[string]bool{}
					}
					out[i][o.Animal.Species] = true
				}
			}
		}
	}
	return out
}

func (f *facts) environmentFacts() {
	byBuilding := map[string][]*records.EnvironmentReading{}
	for i := range f.set.Environment {
		r := &f.set.Environment[i]
		byBuilding[r.BuildingID] = append(byBuilding[r.BuildingID], r)
	}
	for _, b := range f.set.Facility.Buildings {
		if b.Exposure != "indoor" && b.Exposure != "sheltered" {
			continue
		}
		rs := byBuilding[b.ID]
		sort.SliceStable(rs, func(i, j int) bool { return rs[i].At.Before(rs[j].At) })
		housed := f.buildingSpecies(b.ID)
		speciesOn := func(r *records.EnvironmentReading, sp string) bool {
			d := records.DayOf(r.At)
			return f.inPeriod(d) && housed[d-f.period.From][sp]
		}
		var species []string
		for _, day := range housed {
			for sp := range day {
				if !slices.Contains(species, sp) {
					species = append(species, sp)
				}
			}
		}
		sort.Strings(species)
		spells := []any{}
		for _, sp := range species {
			rng := f.lim.Species[sp].IndoorTempC
			if rng == nil {
				continue
			}
			for _, s := range outsideSpells(rs, rng.Min, rng.Max, func(r *records.EnvironmentReading) bool { return speciesOn(r, sp) }) {
				s["species"] = sp
				spells = append(spells, s)
			}
		}
		days := []any{}
		var cur map[string]any
		var curDay records.Day
		for _, r := range rs {
			d := records.DayOf(r.At)
			if !f.inPeriod(d) || len(housed[d-f.period.From]) == 0 {
				continue
			}
			if cur == nil || d != curDay {
				cur, curDay = map[string]any{
					"on": f.dayValue(d), "readings": 0, "humidity_pct": []any{}, "humidity_refs": []any{},
					"min_humidity_pct": nil, "max_humidity_pct": nil, "max_ammonia_ppm": nil, "ammonia_ref": nil,
				}, d
				days = append(days, cur)
			}
			cur["readings"] = cur["readings"].(int) + 1
			if r.HumidityPct != nil && b.Exposure == "indoor" {
				cur["humidity_pct"] = append(cur["humidity_pct"].([]any), *r.HumidityPct)
				cur["humidity_refs"] = append(cur["humidity_refs"].([]any), string(r.Ref))
				if lo, ok := cur["min_humidity_pct"].(float64); !ok || *r.HumidityPct < lo {
					cur["min_humidity_pct"] = *r.HumidityPct
				}
				if hi, ok := cur["max_humidity_pct"].(float64); !ok || *r.HumidityPct > hi {
					cur["max_humidity_pct"] = *r.HumidityPct
				}
			}
			if r.AmmoniaPpm != nil {
				if m, ok := cur["max_ammonia_ppm"].(float64); !ok || *r.AmmoniaPpm > m {
					cur["max_ammonia_ppm"], cur["ammonia_ref"] = *r.AmmoniaPpm, string(r.Ref)
				}
			}
		}
		d := f.doc("building", b.ID)
		if d["ref"] == nil && b.Line > 0 {
			d["ref"] = fmt.Sprintf("facility.yaml:%d", b.Line)
		}
		d["exposure"] = b.Exposure
		d["environment"] = map[string]any{
			"readings_recorded": f.set.Present["environment.csv"],
			"temperature":       spells,
			"days":              days,
		}
	}
}

// outsideSpells finds the spells of consecutive readings outside [lo, hi]
// among those that count. A spell runs from its first reading outside to
// the first counted reading back inside; when none follows (the records
// end, or the next reading does not count), to its last reading outside.
func outsideSpells(rs []*records.EnvironmentReading, lo, hi float64, counts func(*records.EnvironmentReading) bool) []map[string]any {
	var out []map[string]any
	var start, last, peak *records.EnvironmentReading
	above, below := false, false
	distance := func(r *records.EnvironmentReading) float64 {
		return math.Max(lo-r.AirTempC, r.AirTempC-hi)
	}
	emit := func(end *records.EnvironmentReading) {
		dir := "above"
		switch {
		case above && below:
			dir = "above and below"
		case below:
			dir = "below"
		}
		out = append(out, map[string]any{
			"from":          records.DayOf(start.At).String(),
			"until":         records.DayOf(end.At).String(),
			"started_at":    start.At.Format("2006-01-02 15:04"),
			"ended_at":      end.At.Format("2006-01-02 15:04"),
			"back_in_range": end != last,
			"hours":         end.At.Sub(start.At).Hours(),
			"min_c":         lo, "max_c": hi,
			"direction": dir,
			"peak_c":    peak.AirTempC,
			"evidence":  refs(uniqueRefs(start.Ref, peak.Ref, end.Ref)...),
		})
		start, last, peak, above, below = nil, nil, nil, false, false
	}
	for _, r := range rs {
		c := counts(r)
		outside := c && (r.AirTempC < lo || r.AirTempC > hi)
		if start != nil && !outside {
			if c {
				emit(r)
			} else {
				emit(last)
			}
		}
		if outside {
			if start == nil {
				start = r
			}
			last = r
			if peak == nil || distance(r) > distance(peak) {
				peak = r
			}
			above = above || r.AirTempC > hi
			below = below || r.AirTempC < lo
		}
	}
	if start != nil {
		emit(last)
	}
	return out
}

// uniqueRefs drops repeated refs, keeping the first of each.
func uniqueRefs(rs ...records.Ref) []records.Ref {
	var out []records.Ref
	for _, r := range rs {
		if !slices.Contains(out, r) {
			out = append(out, r)
		}
	}
	return out
}
