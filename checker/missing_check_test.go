package checker

import (
	"cmp"
	"context"
	"slices"
	"testing"

	gocmp "github.com/google/go-cmp/cmp"

	"welfare/records"
)

// records.value.missing through the facts and the shipped rules: each case
// is one of issue-free-looking records that the checker used to pass or
// judge on a made-up value (checks.md "Never pass what was not judged").
func TestValueMissingEndToEnd(t *testing.T) {
	lim := defaultLimits(t)
	eng := shippedEngine(t, lim)
	type row struct{ Check, Subject, On, Until string }
	keep := map[string]bool{"records.value.missing": true, "cold.work.over_limit": true, "cold.work.should_cease": true,
		"cold.bedding.stale": true, "enclosure.space.insufficient": true}
	// The YARD site has no reading on 01-14 in every case.
	yard14 := row{"records.value.missing", "YARD", "2026-01-14", ""}
	tests := []struct {
		name   string
		change func(*records.Set)
		want   []row
		// The checks evaluated only in part, as the reports print them.
		partial []string
	}{
		{"the cold week as recorded", func(*records.Set) {}, []row{
			{"cold.bedding.stale", "N-02", "2026-01-11", "2026-01-13"},
			{"cold.work.over_limit", "K-ORVO", "2026-01-13", ""},
			{"cold.work.should_cease", "K-LISA", "2026-01-13", ""},
			yard14,
		}, []string{
			"cold.water.checks_insufficient: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.bedding.stale: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.shelter.missing: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.frostbite.risk: 1 of 5 site-days not judged (no reading)",
		}},
		// 9 CFR §3.6(c)(1): a dam's area needs her length; a 31 kg dam with
		// litter in a 30 × 30 cm run used to need 0 m² and pass.
		{"a dog without length in a tiny run", func(set *records.Set) {
			set.Enclosures = append(set.Enclosures, records.Enclosure{Ref: "enclosures.csv:5", ID: "B-02", BuildingID: "BARN",
				Kind: "run", LengthCm: fp(30), WidthCm: fp(30), HeightCm: 90, NestBox: records.Yes, Platform: records.Yes})
			set.Animals = append(set.Animals, records.Animal{Ref: "animals.csv:5", ID: "DG-09", Species: "canis_familiaris",
				Sex: "f", ArrivedOn: coldDay("2025-11-01"), EnclosureID: "B-02", LifeStage: "dam_with_litter", MassKg: fp(31)})
		}, []row{
			{"cold.bedding.stale", "N-02", "2026-01-11", "2026-01-13"},
			{"cold.work.over_limit", "K-ORVO", "2026-01-13", ""},
			{"cold.work.should_cease", "K-LISA", "2026-01-13", ""},
			{"records.value.missing", "B-02", "2026-01-10", "2026-01-14"},
			yard14,
		}, []string{
			"enclosure.space.insufficient: 5 of 20 occupied enclosure-days not judged (no length_cm for an occupant of a formula species)",
			"cold.water.checks_insufficient: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.bedding.stale: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.shelter.missing: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.frostbite.risk: 1 of 5 site-days not judged (no reading)",
		}},
		// A stint's reading days old is not in force; it used to be judged
		// on the nearest reading (here: 20 h before, at −40 °C: "cease").
		{"a stint with no reading within 3 h", func(set *records.Set) {
			set.Work = append(set.Work, records.OutdoorWork{Ref: "outdoor_work.csv:6", StaffID: "K-LISA",
				StartedAt: coldAt("2026-01-14", "08:00"), EndedAt: coldAt("2026-01-14", "09:30"), SiteID: "YARD",
				Activity: "moderate", Emergency: records.No})
		}, []row{
			{"cold.bedding.stale", "N-02", "2026-01-11", "2026-01-13"},
			{"cold.work.over_limit", "K-ORVO", "2026-01-13", ""},
			{"cold.work.should_cease", "K-LISA", "2026-01-13", ""},
			{"records.value.missing", "K-LISA", "2026-01-14", ""},
			yard14,
		}, []string{
			"cold.water.checks_insufficient: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.bedding.stale: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.shelter.missing: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.frostbite.risk: 1 of 5 site-days not judged (no reading)",
			"cold.work.over_limit: 1 of 4 stints not judged (no reading within 3 h)",
			"cold.work.should_cease: 1 of 4 stints not judged (no reading within 3 h)",
		}},
		// A reading without wind is not calm: K-LISA's 12:20 stint at
		// −40 °C is not judged on the calm column, and 01-12 (both
		// readings windless) is not a bedding day, which splits the run.
		{"readings without wind", func(set *records.Set) {
			for i := range set.Weather {
				if d := records.DayOf(set.Weather[i].At).String(); d == "2026-01-12" || set.Weather[i].Ref == "weather.csv:10" {
					set.Weather[i].WindKmh = nil
				}
			}
		}, []row{
			{"cold.bedding.stale", "N-02", "2026-01-11", ""},
			{"cold.bedding.stale", "N-02", "2026-01-13", ""},
			{"cold.work.over_limit", "K-ORVO", "2026-01-13", ""},
			{"records.value.missing", "K-LISA", "2026-01-13", ""},
			{"records.value.missing", "YARD", "2026-01-12", ""},
			yard14,
		}, []string{
			"cold.water.checks_insufficient: 2 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no reading at the site)",
			"cold.bedding.stale: 4 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (2 with no reading with wind at the site; 2 with no reading at the site)",
			"cold.shelter.missing: 4 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (2 with no reading with wind at the site; 2 with no reading at the site)",
			"cold.frostbite.risk: 2 of 5 site-days not judged (1 with readings without wind only; 1 with no reading)",
			"cold.work.over_limit: 1 of 3 stints not judged (a reading without wind)",
			"cold.work.should_cease: 1 of 3 stints not judged (a reading without wind)",
		}},
		// An outdoor building without weather_site: its cold checks used
		// to be off without a word.
		{"an outdoor building without weather_site", func(set *records.Set) {
			set.Facility.Buildings[0].WeatherSite = ""
		}, []row{
			{"cold.work.over_limit", "K-ORVO", "2026-01-13", ""},
			{"cold.work.should_cease", "K-LISA", "2026-01-13", ""},
			{"records.value.missing", "SHED-N", "2026-01-10", "2026-01-14"},
			yard14,
		}, []string{
			"cold.water.checks_insufficient: 10 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no weather_site for the building)",
			"cold.bedding.stale: 10 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no weather_site for the building)",
			"cold.shelter.missing: 10 of 10 occupied enclosure-days in outdoor or sheltered buildings not judged (no weather_site for the building)",
			"cold.frostbite.risk: 1 of 5 site-days not judged (no reading)",
		}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			set := coldSet()
			tc.change(set)
			res, err := Check(context.Background(), Config{Records: set, Limits: lim, Engine: eng, Period: coldPeriod,
				Only: []string{"records", "cold", "enclosure"}})
			if err != nil {
				t.Fatalf("Check: %v", err)
			}
			got := []row{}
			for _, f := range res.Findings {
				if !keep[f.Check] {
					continue
				}
				r := row{f.Check, f.Subject, f.On.String(), ""}
				if f.Until != 0 {
					r.Until = f.Until.String()
				}
				got = append(got, r)
			}
			less := func(a, b row) int { return cmp.Compare(a.Check+" "+a.Subject+" "+a.On, b.Check+" "+b.Subject+" "+b.On) }
			slices.SortFunc(got, less)
			slices.SortFunc(tc.want, less)
			if diff := gocmp.Diff(tc.want, got); diff != "" {
				t.Errorf("findings (-want +got):\n%s", diff)
			}
			partial := []string{}
			for _, p := range res.Partial {
				partial = append(partial, p.String())
			}
			if diff := gocmp.Diff(tc.partial, partial); diff != "" {
				t.Errorf("evaluated in part (-want +got):\n%s", diff)
			}
		})
	}
}
