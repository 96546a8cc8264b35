package checker

import (
	"fmt"
	"strings"
)

// Partial is a check that was evaluated only in part: of Total items (the
// Unit says what they are) NotJudged could not be judged because a value
// the check needs was not recorded (each also a records.value.missing
// finding); Why counts them by reason.
type Partial struct {
	Check     string   `json:"check"`
	NotJudged int      `json:"not_judged"`
	Total     int      `json:"total"`
	Unit      string   `json:"unit"`
	Why       []Reason `json:"why"`
}

// Reason is one reason items were not judged, and how many.
type Reason struct {
	Reason string `json:"reason"`
	Count  int    `json:"count"`
}

// String is the line the reports print:
// "cold.work.over_limit: 3 of 128 stints not judged (no reading within 3 h)".
func (p Partial) String() string {
	why := make([]string, len(p.Why))
	for i, r := range p.Why {
		why[i] = r.Reason
		if len(p.Why) > 1 {
			why[i] = fmt.Sprintf("%d with %s", r.Count, r.Reason)
		}
	}
	return fmt.Sprintf("%s: %d of %d %s not judged (%s)", p.Check, p.NotJudged, p.Total, p.Unit, strings.Join(why, "; "))
}

// tally counts items and the ones not judged by reason, in the order the
// reasons first appear.
type tally struct {
	total int
	order []string
	by    map[string]int
}

func (t *tally) add(judged bool, why string) {
	t.total++
	if judged {
		return
	}
	if t.by == nil {
		t.by = map[string]int{}
	}
	if _, seen := t.by[why]; !seen {
		t.order = append(t.order, why)
	}
	t.by[why]++
}

func (t *tally) partial(check, unit string) (Partial, bool) {
	p := Partial{Check: check, Total: t.total, Unit: unit}
	for _, why := range t.order {
		p.NotJudged += t.by[why]
		p.Why = append(p.Why, Reason{Reason: why, Count: t.by[why]})
	}
	return p, p.NotJudged > 0
}

// partials counts, from the facts, the items of each check that could not
// be judged for a missing value (checks.md "Never pass what was not
// judged"): a report lists them beside the checks not evaluated. It counts
// what the facts hold, with the limits in force (reading_within_hours), as
// the records.value.missing rule does; inForce says which checks count.
func (f *facts) partials(inForce func(check string) bool) []Partial {
	var out []Partial
	add := func(check, unit string, t *tally) {
		if !inForce(check) {
			return
		}
		if p, ok := t.partial(check, unit); ok {
			out = append(out, p)
		}
	}

	// Floor space: occupied enclosure-days whose occupants' area is unknown.
	var space tally
	for _, d := range f.inputs("enclosure") {
		occ, _ := section(d, "occupancy").([]any)
		for _, o := range occ {
			s := o.(map[string]any)
			judged, what := true, ""
			for _, p := range s["occupants"].([]any) {
				if m, _ := p.(map[string]any)["missing_value"].(string); m != "" {
					judged, what = false, "no "+m+" for an occupant of a formula species"
				}
			}
			for range s["days"].(int) {
				space.add(judged, what)
			}
		}
	}
	add("enclosure.space.insufficient", "occupied enclosure-days", &space)

	// The enclosures of outdoor and sheltered buildings: their weather.
	siteDays := map[string][]DayCold{}
	for _, s := range f.weather {
		siteDays[s.Site] = s.Days
	}
	var air, wind tally
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		b := f.buildings[e.BuildingID]
		if !exposed(b) {
			continue
		}
		days := siteDays[b.WeatherSite]
		for _, seg := range f.segments[e.ID] {
			for d := seg.From; d <= seg.To; d++ {
				switch {
				case b.WeatherSite == "":
					air.add(false, "no weather_site for the building")
					wind.add(false, "no weather_site for the building")
				case days == nil || days[d-f.period.From].Readings == 0:
					air.add(false, "no reading at the site")
					wind.add(false, "no reading at the site")
				case days[d-f.period.From].WindReadings == 0:
					air.add(true, "")
					wind.add(false, "no reading with wind at the site")
				default:
					air.add(true, "")
					wind.add(true, "")
				}
			}
		}
	}
	const encDays = "occupied enclosure-days in outdoor or sheltered buildings"
	add("cold.water.checks_insufficient", encDays, &air)
	add("cold.bedding.stale", encDays, &wind)
	add("cold.shelter.missing", encDays, &wind)
	add("heat.water.checks_insufficient", encDays, &air)
	add("heat.shade.missing", encDays, &air)

	// Weather sites: site-days.
	var siteAir, siteWind tally
	for _, s := range f.weather {
		for _, d := range s.Days {
			siteAir.add(d.Readings > 0, "no reading")
			switch {
			case d.Readings == 0:
				siteWind.add(false, "no reading")
			default:
				siteWind.add(d.WindReadings > 0, "readings without wind only")
			}
		}
	}
	add("cold.frostbite.risk", "site-days", &siteWind)
	add("heat.danger", "site-days", &siteAir)

	// Outdoor stints (non-emergency) and the reading in force at their start.
	var stints tally
	within := f.lim.Cold.ReadingWithinHours
	for _, d := range f.inputs("staff") {
		c, _ := section(d, "cold").(map[string]any)
		if c == nil {
			continue
		}
		for _, st := range c["stints"].([]any) {
			s := st.(map[string]any)
			if s["emergency"].(bool) {
				continue
			}
			r, _ := s["reading"].(map[string]any)
			switch {
			case r == nil || r["hours_before_start"].(float64) > within:
				stints.add(false, fmt.Sprintf("no reading within %v h", within))
			case r["wind_kmh"] == nil:
				stints.add(false, "a reading without wind")
			default:
				stints.add(true, "")
			}
		}
	}
	add("cold.work.over_limit", "stints", &stints)
	add("cold.work.should_cease", "stints", &stints)
	return out
}

// off reports whether the limits switch a check off (severity: off): it
// judges nothing, so it is not counted as evaluated in part.
func (e *engine) off(check string) bool { return e.override[check] == "off" }
