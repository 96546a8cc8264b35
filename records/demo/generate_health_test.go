package demo

// The demo's health records: deaths, weighings and body-condition scores,
// clinical observations, veterinary cases and last spring's litters, with
// one planted instance of every health check. Everything is invented.

import (
	"bytes"
	"fmt"
	"strings"
	"time"

	"welfare/rules"
)

func init() {
	catalogue = append(catalogue,
		"records.death.mismatch",
		"health.death.vet_not_notified", "health.death.unexplained", "health.mortality.high",
		"health.weight.loss", "health.condition.poor", "health.signs.unattended",
		"health.behaviour.abnormal", "health.case.unreviewed",
		"litter.weaning.early", "litter.losses.high")
	unplanted["litter.weaning.early"] = true
	unplanted["litter.losses.high"] = true
	requiredColumns["deaths.csv"] = []string{"animal_id", "found_dead_at", "found_by"}
	requiredColumns["observations.csv"] = []string{"observed_at", "animal_id", "staff_id"}
	requiredColumns["treatments.csv"] = []string{"case_id", "animal_id", "opened_on", "diagnosis", "prescribed_by"}
	requiredColumns["litters.csv"] = []string{"litter_id", "dam_id", "whelped_on", "born"}
}

// unplanted are the catalogue checks with no instance in the January demo;
// PLANTED.md says why.
var unplanted = map[string]bool{}

type deathRow struct {
	at                    time.Time
	animal, by, cause     string
	notified              time.Time // zero: not recorded
	necropsy, necropsyRef string
	disposal              string
}

type obsRow struct {
	at                time.Time
	animal, staff     string
	massKg            float64 // 0: not weighed
	condition         int     // 0: not scored
	signs, vet, notes string
}

type vetCase struct {
	id, animal, opened, diagnosis, by, reviewed, closed, outcome string
}

type litterRow struct {
	id, dam, whelped string
	born, alive      int
	weanedOn         string
	weaned           int
}

type healthRecords struct {
	deaths  []deathRow
	obs     []obsRow
	cases   []vetCase
	litters []litterRow
}

// dec is a December 2025 day, before the period (weighings the January
// weighings are compared with).
func decAt(d, h, m int) time.Time { return time.Date(2025, 12, d, h, m, 0, 0, time.UTC) }

// buildHealth records the January deaths on the animals (their left_on is
// their last day, so the rounds and evaluators see the cage empty after it)
// and returns the health records.
func (s *scenario) buildHealth() *healthRecords {
	h := &healthRecords{}
	// Deaths. Two red foxes in shed S4 (one of cold in the hard spell, one
	// unexplained) and a mink whose death the veterinarian heard of late.
	h.deaths = []deathRow{
		{at: at(7, 7, 45), animal: "RF-414", by: "ST-04", cause: "cold", notified: at(7, 9, 15), necropsy: "no", disposal: "rendering"},
		{at: at(18, 7, 35), animal: "RF-419", by: "ST-05", cause: "", notified: at(18, 8, 30), necropsy: "no", disposal: "rendering"},
		{at: at(24, 7, 20), animal: "NV-03", by: "ST-07", cause: "disease", notified: at(25, 15, 0), necropsy: "yes", necropsyRef: "NX-26-004", disposal: "incineration"},
	}
	for _, d := range h.deaths {
		a := s.animalByID(d.animal)
		a.leftDay, a.leftReason = d.at.Day(), "died"
	}

	// Shed S4 is weighed and condition-scored on Dec 29 and Jan 26.
	for c := 1; c <= 24; c++ {
		a := s.animalByID(fmt.Sprintf("RF-4%02d", c))
		h.obs = append(h.obs, obsRow{at: decAt(29, 10, c*3), animal: a.id, staff: "ST-04", massKg: a.mass, condition: 3})
		if s.enclosureOn(a, 26) == "" {
			continue
		}
		kg, bcs, notes := a.mass+0.1*float64(c%3)-0.1, 3, ""
		if a.id == "RF-416" {
			kg, bcs, notes = 6.5, 2, "thin over the hips"
		}
		h.obs = append(h.obs, obsRow{at: at(26, 10, c*3), animal: a.id, staff: "ST-04", massKg: kg, condition: bcs, notes: notes})
	}

	// Clinical signs.
	h.obs = append(h.obs,
		obsRow{at: at(5, 16, 0), animal: "RF-405", staff: "ST-04", signs: "wound", vet: "yes", notes: "bite wound right ear after a fence fight"},
		obsRow{at: at(10, 8, 40), animal: "RF-422", staff: "ST-05", signs: "lameness", vet: "no", notes: "holding up left hind"},
		obsRow{at: at(19, 8, 15), animal: "RF-317", staff: "ST-04", signs: "lameness", vet: "yes", notes: "limping, left fore"},
	)
	// NV-07 chews its tail fur: seen four times in January.
	for _, d := range []int{2, 14, 24, 30} {
		h.obs = append(h.obs, obsRow{at: at(d, 14, 30), animal: "NV-07", staff: "ST-07", signs: "fur_chewing", notes: "tail tip chewed"})
	}

	h.cases = []vetCase{
		{"C-26-01", "RF-405", janDate(6), "bite wound, right ear", "ST-02", janDate(12), janDate(19), "recovered"},
		{"C-26-02", "NV-07", janDate(3), "fur chewing, tail", "ST-02", "", "", ""},
	}

	// Last spring's litters: weaned in early summer, outside the January period.
	h.litters = []litterRow{
		{"L-25-01", "RF-101", "2025-04-28", 6, 6, "2025-06-30", 5},
		{"L-25-02", "RF-103", "2025-05-02", 5, 5, "2025-07-01", 5},
		{"L-25-03", "RF-205", "2025-05-06", 7, 6, "2025-07-03", 6},
	}
	return h
}

// writeHealthTables writes the health files and plants their findings.
func (s *scenario) writeHealthTables(h *healthRecords) error {
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		return err
	}
	newTable := func(name, cols string) *table {
		t := &table{name: name, header: strings.Split(cols, ",")}
		s.tables = append(s.tables, t)
		return t
	}
	optStamp := func(t time.Time) string {
		if t.IsZero() {
			return ""
		}
		return stamp(t)
	}

	de := newTable("deaths.csv", "animal_id,found_dead_at,found_by,suspected_cause,vet_notified_at,necropsy,necropsy_ref,disposal")
	for _, d := range h.deaths {
		line := de.add(d.animal, stamp(d.at), d.by, d.cause, optStamp(d.notified), d.necropsy, d.necropsyRef, d.disposal)
		on := d.at.Format("2006-01-02")
		if hours := d.notified.Sub(d.at).Hours(); d.notified.IsZero() || hours > lim.Health.NotifyVetWithinHours {
			s.plant("health.death.vet_not_notified", d.animal, on, "", fmt.Sprintf(
				"%s (%s): found dead %s, the veterinarian told %s, %.1f h later (limit %g h).", d.animal, de.ref(line), stamp(d.at), stamp(d.notified), hours, lim.Health.NotifyVetWithinHours))
		}
		if d.cause == "" && d.necropsy != "yes" {
			s.plant("health.death.unexplained", d.animal, on, "", fmt.Sprintf(
				"%s (%s): found dead %s with no suspected cause and no necropsy.", d.animal, de.ref(line), stamp(d.at)))
		}
	}
	s.plant("records.death.mismatch", "RF-111", janDate(28), "",
		"RF-111 is recorded in animals.csv as died on Jan 28, but deaths.csv has no row for it (it has a cull row instead, the same muddle as records.cull.mismatch).")
	s.plantMortality(h, lim)

	ob := newTable("observations.csv", "observed_at,animal_id,staff_id,mass_kg,body_condition,signs,vet_informed,notes")
	for _, o := range h.obs {
		mass, bcs := "", ""
		if o.massKg > 0 {
			mass = num(o.massKg, 1)
		}
		if o.condition > 0 {
			bcs = fmt.Sprint(o.condition)
		}
		ob.add(stamp(o.at), o.animal, o.staff, mass, bcs, o.signs, o.vet, o.notes)
	}
	s.plant("health.weight.loss", "RF-416", janDate(26), "",
		"RF-416 weighed 7.4 kg on Dec 29 and 6.5 kg on Jan 26: 12.2 % below the highest mass of the preceding 30 days (limit 10 %; significant from 20 %). Every other fox of shed S4 is within 0.1 kg of its December mass.")
	s.plant("health.condition.poor", "RF-416", janDate(26), "",
		"RF-416 was scored body condition 2 of 5 (\"thin over the hips\") on Jan 26; every other score is 3.")
	s.plant("health.signs.unattended", "RF-422", janDate(10), "",
		"RF-422 was seen lame on Jan 10 at 08:40 (vet_informed no); no vet exam, treatment or health check of it follows, and no case is opened. RF-405's wound (Jan 5) is answered by case C-26-01 opened the next day, and RF-317's lameness (Jan 19, 08:15) by the health check at 11:00.")
	s.plant("health.behaviour.abnormal", "NV-07", janDate(24), "",
		"NV-07 was seen chewing its tail fur on Jan 2, 14 and 24: the third within 30 days falls on Jan 24. The fourth sighting on Jan 30 is within 30 days of that finding and gives none.")

	tr := newTable("treatments.csv", "case_id,animal_id,opened_on,diagnosis,prescribed_by,reviewed_on,closed_on,outcome")
	for _, c := range h.cases {
		tr.add(c.id, c.animal, c.opened, c.diagnosis, c.by, c.reviewed, c.closed, c.outcome)
	}
	s.plant("health.case.unreviewed", "C-26-02", janDate(3+lim.Health.CaseReviewDays+1), "",
		fmt.Sprintf("Case C-26-02 (NV-07, fur chewing) was opened on Jan 3 and never reviewed (no reviewed_on, no vet_exam of NV-07; its Jan 13 handling is a health check): Jan %d is the first day more than %d days after the opening. C-26-01 was reviewed on Jan 12 and closed on Jan 19, never more than 7 days without a review.",
			3+lim.Health.CaseReviewDays+1, lim.Health.CaseReviewDays))

	li := newTable("litters.csv", "litter_id,dam_id,whelped_on,born,born_alive,weaned_on,weaned")
	for _, l := range h.litters {
		li.add(l.id, l.dam, l.whelped, fmt.Sprint(l.born), fmt.Sprint(l.alive), l.weanedOn, fmt.Sprint(l.weaned))
	}
	why := "Not planted: the litter checks judge the weaning day, and foxes whelp in April–May and are weaned in June–July, so no weaning falls in a January period. litters.csv carries last spring's three litters (weaned at 58–63 days, losses 0–17 %), which a January check loads but does not judge. The check is exercised in rules/litter_test.rego (55 and 56 days; CoE 8 weeks) and a summer demo period would show it."
	s.explain("litter.weaning.early", why)
	s.explain("litter.losses.high", "Not planted, for the same reason: the losses are judged on the weaning day (rules/litter_test.rego: exactly 25 % does not fire, 37.5 % does).")
	return nil
}

// plantMortality computes each building's January deaths and animal-days
// from the scenario (an animal counts on every day it is present, its last
// day included) and plants health.mortality.high where the default limits
// are crossed, with the arithmetic written out.
func (s *scenario) plantMortality(h *healthRecords, lim *rules.Limits) {
	deaths := map[string][]string{}
	for _, d := range h.deaths {
		b := s.buildingOf(s.enclosureOn(s.animalByID(d.animal), d.at.Day())).id
		deaths[b] = append(deaths[b], d.animal)
	}
	for _, b := range s.buildings {
		n := len(deaths[b.id])
		if n == 0 {
			continue
		}
		days := 0
		for i := range s.animals {
			for d := 1; d <= nDays; d++ {
				if e := s.enclosureOn(&s.animals[i], d); e != "" && s.buildingOf(e).id == b.id {
					days++
				}
			}
		}
		mean := float64(days) / nDays
		pct := float64(n) * 100 / mean
		if n < lim.Health.Mortality.MinDeaths || pct <= lim.Health.Mortality.MonthlyPct {
			continue
		}
		s.plant("health.mortality.high", b.id, janDate(1), "", fmt.Sprintf(
			"Shed %s: %d deaths (%s) in January against %d animal-days / 31 = a mean daily population of %.2f: %.1f %% (limit %g %%, at least %d deaths). The mink barn's single death is below the minimum of %d.",
			b.id, n, strings.Join(deaths[b.id], ", "), days, mean, pct, lim.Health.Mortality.MonthlyPct, lim.Health.Mortality.MinDeaths, lim.Health.Mortality.MinDeaths))
	}
}
