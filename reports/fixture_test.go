package reports_test

import (
	"fmt"
	"math"
	"sort"
	"time"

	"welfare/checker"
	"welfare/records"
)

// checkSpec is one catalogue check used by the invented scenario; ids,
// titles and default severities follow the check catalogue.
type checkSpec struct {
	id, title, source string
	sev               checker.Severity
	subject           func(i int) string
	run               bool
	msg               func(i int) string
	weight            int
}

var (
	enclosure = func(i int) string { return fmt.Sprintf("N-%02d", 1+i%24) }
	animal    = func(i int) string { return fmt.Sprintf("VV-%04d", 101+i%60) }
	staff     = func(i int) string { return []string{"S-AIN", "S-ELO", "S-TUO", "S-MAR"}[i%4] }
)

// scenarioChecks is the Birchfall Fur Research Station scenario (invented);
// the weights make care and cold the busiest domains, as in a cold January.
var scenarioChecks = []checkSpec{
	{"records.row.rejected", "Row rejected", "common practice", checker.Minor,
		func(i int) string { return fmt.Sprintf("care_rounds.csv:%d", 40+i*17) }, false,
		func(i int) string { return `water_state: "froze" is not one of empty, ok, frozen, not_checked` }, 6},
	{"care.observation.missed", "Animals not observed", "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112", checker.Minor,
		enclosure, true, func(i int) string { return "occupied and no round recorded the animals as observed" }, 80},
	{"care.water.unavailable", "Water unavailable", "OLAW: inoperative watering is a significant deficiency", checker.Significant,
		enclosure, false, func(i int) string {
			return fmt.Sprintf("water found frozen at %02d:15 and not restored; air −%d °C", 6+i%4, 22+i%9)
		}, 40},
	{"care.health.unattended", "Health concern not followed up", "common practice", checker.Significant,
		animal, false, func(i int) string { return "health concern recorded by Élodie Marchetti; no examination within 24 h" }, 6},
	{"enclosure.space.insufficient", "Floor area below the requirement", "Council of Europe fur-animal recommendation (1999)", checker.Significant,
		enclosure, true, func(i int) string { return "floor area 1.10 m² < required 1.20 m² for two weaned juveniles" }, 8},
	{"handling.glove.inadequate", "Gloves not bite-resistant", "common practice", checker.Significant,
		animal, false, func(i int) string { return "conscious weighing with glove \"nitrile\", 0.1 mm (≥ 2 mm required)" }, 12},
	{"handling.bite.not_reported", "Bite not reported in time", "common practice", checker.Significant,
		animal, false, func(i int) string {
			return "bite to Aino Lindqvist-Ødegård's left hand; exposure reported 31 h after handling"
		}, 3},
	{"staff.rabies.followup_overdue", "Rabies titer overdue", "ACIP 2022 (MMWR 71(18))", checker.Minor,
		staff, false, func(i int) string {
			return "primary series 2021-03-02; no titer ≥ 0.5 IU/mL taken between year 1 and year 3"
		}, 5},
	{"ppe.inspection.overdue", "Glove not inspected", "facility choice", checker.Minor,
		func(i int) string { return fmt.Sprintf("GL-%02d", 1+i%9) }, false,
		func(i int) string { return "used in handling with no check in the 7 days up to the day of use" }, 10},
	{"protocol.expiring", "Protocol expiring", "common practice", checker.Note,
		func(int) string { return "P-2025-03" }, false, func(int) string { return "expires 2026-02-20, within 30 days after the period" }, 1},
	{"cull.death.unconfirmed", "Death not confirmed", "AVMA Guidelines for the Euthanasia of Animals (2020)", checker.Significant,
		animal, false, func(int) string { return "death_confirmed not recorded; confirmation lists 1 sign" }, 2},
	{"cold.water.checks_insufficient", "Too few water checks in frost", "common practice", checker.Minor,
		enclosure, false, func(i int) string { return fmt.Sprintf("minimum air −%d °C and 1 water check recorded", 8+i%20) }, 50},
	{"cold.bedding.stale", "Bedding not refreshed in severe cold", "facility choice", checker.Minor,
		enclosure, true, func(int) string { return "wind chill ≤ −20 and no bedding added on the 7 days up to this day" }, 20},
	{"cold.work.over_limit", "Outdoor stint over the work/warm-up limit", "ACGIH TLV cold stress, work/warm-up schedule", checker.Significant,
		staff, false, func(i int) string { return "stint of 70 min at −35 °C, 8 km/h; schedule maximum 40 min" }, 7},
	{"cold.frostbite.risk", "Frostbite risk", "Environment and Climate Change Canada wind chill hazard bands", checker.Note,
		func(int) string { return "north-yard" }, true, func(i int) string { return "minimum wind chill −41" }, 3},
}

var period = checker.Period{From: records.MakeDay(2026, 1, 1), To: records.MakeDay(2026, 1, 31)}

// sampleResult builds an invented but realistic result with n findings
// spread over the scenario's checks by weight. It is deterministic.
func sampleResult(n int) *checker.Result {
	r := &checker.Result{
		Facility:    "Birchfall Fur Research Station",
		Period:      period,
		Fingerprint: "3f9a1c07be52d4e8a6103f7c2b9e5d4a8c1f06e7d2b3a9c5e8f1d0a7b6c4e2f9",
		Accounting: []records.FileCount{
			{File: "animals.csv", Read: 184, Accepted: 184},
			{File: "enclosures.csv", Read: 24, Accepted: 24},
			{File: "care_rounds.csv", Read: 1540, Accepted: 1534, Rejected: 6},
			{File: "handling.csv", Read: 212, Accepted: 211, Rejected: 1},
			{File: "weather.csv", Read: 744, Accepted: 744},
			{File: "cold_work.csv", Read: 96, Accepted: 96},
			{File: "culls.csv", Read: 0, Accepted: 0, Rejected: 0, Failed: "missing required column \"method\""},
		},
		Warnings: []records.Warning{
			{File: "care_rounds.csv", Column: "keeper_mood", Message: "unknown column; its values were not read"},
			{File: "handling.csv", Column: "sedative_dose_µg_kg", Message: "unknown column; its values were not read"},
		},
		NotEvaluated: []checker.Skipped{
			{Check: "ppe.damaged.used", Reason: "ppe_checks.csv is absent"},
			{Check: "staff.respirator.fit_overdue", Reason: "no handling row lists a respirator and staff.yaml has no respirator_fit_on dates"},
		},
		Care: checker.CareCoverage{OccupiedDays: 744, CompleteDays: 689},
		// The shipped defaults (limits.yaml): bedding and shelter at -20, frostbite at -28 (ECCC).
		ColdLines: checker.ColdLines{Bedding: -20, Shelter: -20, Frostbite: -28},
		Limits: []checker.LimitLine{
			{Key: "species.vulpes_vulpes.space.adult_m2", Value: "0.8", Source: "[P] Council of Europe fur-animal recommendation (1999)"},
			{Key: "species.vulpes_vulpes.space.min_height_cm", Value: "70", Source: "[P] same"},
			{Key: "species.vulpes_vulpes.feed_every_days", Value: "1", Source: "[C] common practice"},
			{Key: "handling.glove.accepted", Value: "bite_resistant, gauntlet", Source: "[C] common practice"},
			{Key: "handling.glove.min_thickness_mm", Value: "2", Source: "[F] facility choice — set your own"},
			{Key: "cold.bedding_days", Value: "7", Source: "[F] facility choice — set your own"},
			{Key: "cold.bedding_wind_chill_c", Value: "−20", Source: "[F] facility choice — set your own"},
			{Key: "cold.frostbite_wind_chill_c", Value: "−28", Source: "[P] Environment and Climate Change Canada"},
			{Key: "staff.rabies.titer_min_iu_ml", Value: "0.5", Source: "[P] ACIP 2022"},
		},
	}
	for _, c := range scenarioChecks {
		dom := c.id[:indexDot(c.id)]
		r.Checks = append(r.Checks, checker.CheckInfo{ID: c.id, Domain: dom, Title: c.title, Severity: c.sev, Source: c.source,
			Package: "welfare." + dom, File: "rules/" + dom + ".rego"})
	}
	for _, s := range r.NotEvaluated {
		dom := s.Check[:indexDot(s.Check)]
		r.Checks = append(r.Checks, checker.CheckInfo{ID: s.Check, Domain: dom, Title: "(not evaluated)", Severity: checker.Minor, Source: "facility choice"})
	}
	sort.Slice(r.Checks, func(i, j int) bool { return r.Checks[i].ID < r.Checks[j].ID })

	total := 0
	for _, c := range scenarioChecks {
		total += c.weight
	}
	for i := 0; i < n; i++ {
		// Deal findings to checks in proportion to weight, deterministically.
		k, acc := 0, i%total
		for acc >= scenarioChecks[k].weight {
			acc -= scenarioChecks[k].weight
			k++
		}
		c := scenarioChecks[k]
		j := i
		on := period.From + records.Day(j%31)
		f := checker.Finding{
			Check: c.id, Domain: c.id[:indexDot(c.id)], Subject: c.subject(j), On: on, Severity: c.sev,
			Message: c.msg(j), Title: c.title, Source: c.source,
			Evidence: []records.Ref{records.Ref(fmt.Sprintf("care_rounds.csv:%d", 2+j*3))},
		}
		if c.run && j%3 == 0 && on+2 <= period.To {
			f.Until = on + 2
			f.Evidence = append(f.Evidence, records.Ref(fmt.Sprintf("care_rounds.csv:%d", 3+j*3)), records.Ref(fmt.Sprintf("care_rounds.csv:%d", 4+j*3)))
			if c.id == "care.observation.missed" {
				f.Severity = checker.Significant // a run of 2 days or more is significant (check catalogue)
			}
		}
		if c.id == "records.row.rejected" {
			f.Evidence = []records.Ref{records.Ref(f.Subject)}
		}
		r.Findings = append(r.Findings, f)
	}
	sort.SliceStable(r.Findings, func(i, j int) bool { return r.Findings[i].Key() < r.Findings[j].Key() })

	// 31 days at one site: a mild start, a cold snap mid-month, and one
	// day (the 20th) on which the station logged no readings.
	site := checker.SiteDays{Site: "north-yard"}
	for d := 0; d < 31; d++ {
		air := -12 - 22*math.Exp(-math.Pow(float64(d-14)/5, 2)) + 3*math.Sin(float64(d))
		wc := air - 6 - 4*math.Abs(math.Cos(float64(d)*0.7))
		readings := 24
		if d == 19 {
			air, wc, readings = 0, 0, 0
		}
		site.Days = append(site.Days, checker.DayCold{Day: period.From + records.Day(d), MinAirC: air, MinWindChillC: wc, Readings: readings, WindReadings: readings})
	}
	r.Weather = []checker.SiteDays{site}
	return r
}

func indexDot(s string) int {
	for i := range s {
		if s[i] == '.' {
			return i
		}
	}
	return len(s)
}

// generatedAt is a fixed generation time, so PDFs compare byte for byte.
var generatedAt = time.Date(2026, 2, 3, 9, 30, 0, 0, time.FixedZone("CST", -6*3600))
