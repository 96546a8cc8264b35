package demo

// records.value.missing (checks.md "Never pass what was not judged"): one
// instance of each of its four subjects, hooked into generate, the weather
// writer and the evaluators. Everything is invented.
//
//   - enclosure: DG-02, the yard dog in run K-02, was never measured, so the
//     9 CFR §3.6(c)(1) formula has no length to work from;
//   - building: the S1 red-fox shed was never given a weather_site;
//   - site: on Jan 18 MAST's anemometer was iced up, so every reading of the
//     day has air temperature but no wind;
//   - staff: the two keepers' routine stints of Jan 18 therefore have a
//     reading without wind in force at their start.

import (
	"fmt"
	"math"
	"slices"
)

const (
	windlessDay   = 18 // MAST's readings without wind
	unmeasuredDog = "DG-02"
	siteless      = "S1" // an outdoor shed without weather_site
)

func init() {
	// checks.md order: records.value.missing precedes records.death.mismatch.
	i := slices.Index(catalogue, "records.death.mismatch")
	if i < 0 {
		i = len(catalogue)
	}
	catalogue = slices.Insert(catalogue, i, "records.value.missing")
}

// missingStation drops DG-02's length and S1's weather site.
func (s *scenario) missingStation() {
	s.animalByID(unmeasuredDog).length = 0
	for i := range s.buildings {
		if s.buildings[i].id == siteless {
			s.buildings[i].site = ""
		}
	}
}

// missingWeather takes the wind out of every reading of the windless day;
// that day's minimum wind chill is unknown, so no wind-chill check judges it.
func (s *scenario) missingWeather() {
	for i := range s.readings {
		if s.readings[i].at.Day() == windlessDay {
			s.readings[i].windless = true
		}
	}
	s.minWC[windlessDay] = math.Inf(1)
}

// windCell is the wind_kmh cell of a reading: empty when not recorded.
func windCell(r reading) string {
	if r.windless {
		return ""
	}
	return num(r.wind, 0)
}

// evaluateMissing adds the records.value.missing findings, worked out from
// the scenario: the occupied days of K-02 and of S1's enclosures, the
// windless day, and the non-emergency stints whose reading has no wind.
func (s *scenario) evaluateMissing() {
	const check = "records.value.missing"
	for _, e := range s.enclosures {
		for _, f := range runs(check, e.id, func(d int) bool {
			return slices.ContainsFunc(s.occupants(e.id, d), func(a *animal) bool {
				return a.species == "canis_familiaris" && a.length == 0
			})
		}) {
			s.plant(f.check, f.subject, f.on, f.until, "")
		}
	}
	for _, b := range s.buildings {
		if b.exposure == "indoor" || b.site != "" {
			continue
		}
		for _, f := range runs(check, b.id, func(d int) bool {
			for _, e := range s.enclosures {
				if e.building == b.id && len(s.occupants(e.id, d)) > 0 {
					return true
				}
			}
			return false
		}) {
			s.plant(f.check, f.subject, f.on, f.until, "")
		}
	}
	for _, f := range runs(check, site, func(d int) bool { return d == windlessDay }) {
		s.plant(f.check, f.subject, f.on, f.until, "")
	}
	seen := map[string]bool{}
	var keepers []string
	for _, w := range s.stints {
		if w.emergency || w.endBeforeStart || !s.readingFor(w.start).windless {
			continue
		}
		key := w.staff + " " + w.start.Format("2006-01-02")
		if !seen[key] {
			seen[key] = true
			keepers = append(keepers, w.staff)
			s.plant(check, w.staff, w.start.Format("2006-01-02"), "", "")
		}
	}
	s.explain(check, fmt.Sprintf("K-02: %s, the yard dog, has no length_cm in animals.csv, so the floor space of its run cannot be worked out with the 9 CFR §3.6(c)(1) formula; every day it lives there (Jan 1–31) is one run.", unmeasuredDog))
	s.explain(check, fmt.Sprintf("%s: the red-fox shed has no weather_site in facility.yaml, so the cold (and heat) checks of its cages cannot be judged on any day it houses animals (Jan 1–31). Its cages would have given no cold finding.", siteless))
	s.explain(check, fmt.Sprintf("%s: on Jan %d the anemometer was iced up; all eight readings have air_temp_c but no wind_kmh, so the day's minimum wind chill is unknown and the bedding, shelter and frostbite checks cannot judge it (a mild day, −6 °C at its coldest; its air temperature still counts for the water checks).", site, windlessDay))
	s.explain(check, fmt.Sprintf("%s: the keepers' routine stints of Jan %d start on a reading without wind, so the work/warm-up schedule cannot be read for them (a reading without wind is not calm).", joinAnd(keepers), windlessDay))
}

func joinAnd(xs []string) string {
	switch len(xs) {
	case 0:
		return ""
	case 1:
		return xs[0]
	}
	out := xs[0]
	for _, x := range xs[1 : len(xs)-1] {
		out += ", " + x
	}
	return out + " and " + xs[len(xs)-1]
}
