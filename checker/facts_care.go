package checker

import (
	"slices"
	"sort"

	"welfare/records"
)

// dayCare is what the care rounds of one day recorded for one enclosure (or,
// for building rounds, for every enclosure of a building).
type dayCare struct {
	observed    bool
	fed         bool
	bedding     bool
	waterChecks uint8 // rounds that recorded a water state (not_checked and empty do not count)
}

func (a dayCare) or(b dayCare) dayCare {
	w := min(uint(a.waterChecks)+uint(b.waterChecks), 255)
	return dayCare{a.observed || b.observed, a.fed || b.fed, a.bedding || b.bedding, uint8(w)}
}

// careDays indexes the care rounds by enclosure (and building) and day of
// the period: a flat slice per enclosure keeps millions of rounds cheap.
type careDays struct {
	from records.Day
	n    int
	enc  map[string][]dayCare
	bld  map[string][]dayCare
}

func (f *facts) careIndex() *careDays {
	if f.care == nil {
		// Filled by the one pass over the rounds (facts_rounds.go).
		f.rix = nil
		f.roundIndex()
	}
	return f.care
}

// enclosureCare is one enclosure's days of care and its building's, looked
// up once for a loop over its days.
type enclosureCare struct {
	from     records.Day
	n        int
	enc, bld []dayCare
}

func (c *careDays) of(encID, buildingID string) enclosureCare {
	return enclosureCare{from: c.from, n: c.n, enc: c.enc[encID], bld: c.bld[buildingID]}
}

// on is what the rounds of day d recorded for the enclosure, counting its
// building's rounds.
// The days of each are nil or n long, so one unsigned test per slice
// keeps d within the period (and the method small enough to inline: the
// cold and care builders call it for every occupied day of every
// enclosure).
func (ec enclosureCare) on(d records.Day) dayCare {
	i := uint(d - ec.from)
	var out dayCare
	if i < uint(len(ec.enc)) {
		out = ec.enc[i]
	}
	if i < uint(len(ec.bld)) {
		out = out.or(ec.bld[i])
	}
	return out
}

// careFacts adds each enclosure's "care" section: runs of occupied days
// without an observation or a feeding, rounds that left water unavailable,
// and health concerns with the time to the first check that answered them.
func (f *facts) careFacts() {
	c := f.careIndex()
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		unobserved, unfed := []any{}, []any{}
		var obsRun, fedRun dayRun
		fedEvery := 0 // the smallest "fed every N days" over the current unfed run
		care := c.of(e.ID, e.BuildingID)
		for _, s := range f.segments[e.ID] {
			every := 0
			for _, o := range s.Occupants {
				if n := f.lim.Species[o.Animal.Species].FeedEveryDays; n > 0 && (every == 0 || n < every) {
					every = n
				}
			}
			for d := s.From; d <= s.To; d++ {
				dc := care.on(d)
				f.coverage.OccupiedDays++
				if dc.observed && dc.fed {
					f.coverage.CompleteDays++
				}
				if from, to, done := obsRun.step(d, !dc.observed); done {
					unobserved = append(unobserved, spanRun(from, to))
				}
				if from, to, done := fedRun.step(d, !dc.fed); done {
					unfed = append(unfed, unfedRun(from, to, fedEvery))
					fedEvery = 0
				}
				if !dc.fed && every > 0 && (fedEvery == 0 || every < fedEvery) {
					fedEvery = every
				}
			}
		}
		if from, to, done := obsRun.flush(); done {
			unobserved = append(unobserved, spanRun(from, to))
		}
		if from, to, done := fedRun.flush(); done {
			unfed = append(unfed, unfedRun(from, to, fedEvery))
		}
		d := f.doc("enclosure", e.ID)
		d["care"] = map[string]any{
			"rounds_recorded":   f.set.Present["daily_care.csv"],
			"unobserved":        unobserved,
			"unfed":             unfed,
			"water_unavailable": []any{},
			"concerns":          []any{},
		}
	}
	f.roundEvents()
}

// unfedRun is a run of unfed days with the day it became a finding: the
// day the run reached the species' "fed every N days".
func unfedRun(from, to records.Day, every int) map[string]any {
	m := spanRun(from, to)
	if every > 0 {
		m["every_days"] = every
		m["due_on"] = (from + records.Day(every) - 1).String()
	}
	return m
}

// roundEvents adds the per-round care events: water found empty or frozen
// and not restored, and health concerns.
func (f *facts) roundEvents() {
	byAnimal := f.handlingByAnimal()
	var targets []string // reused across rounds
	// Most rounds are neither: the pass over the rounds lists the others,
	// and only those are read in full.
	for _, i := range f.roundIndex().events {
		i := int(i)
		r := f.rounds.View(i)
		// A building round speaks for every enclosure of the building that
		// had animals that day; an enclosure round for its enclosure.
		targets = append(targets[:0], r.EnclosureID)
		if r.EnclosureID == "" {
			targets = targets[:0]
			for _, id := range f.byBuilding[r.BuildingID] {
				if f.occupied(id, r.Day) {
					targets = append(targets, id)
				}
			}
		}
		if r.Water == "empty" || r.Water == "frozen" {
			for _, id := range targets {
				appendTo(f.doc("enclosure", id)["care"], "water_unavailable", map[string]any{
					"on": r.Day.String(), "state": r.Water, "restored": r.WaterRestored.IsYes(), "ref": string(f.rounds.Ref(i)),
				})
			}
		}
		if !r.HealthConcern.IsYes() {
			continue
		}
		// The animals the concern is about: the named one, else every
		// occupant of the enclosures the round covered.
		var animals []string
		subject := r.EnclosureID
		if r.ConcernAnimalID != "" {
			animals = []string{r.ConcernAnimalID}
			if subject == "" {
				subject = f.enclosureOf(r.ConcernAnimalID, r.Day)
			}
		} else {
			for _, id := range targets {
				if s := f.segmentOn(id, r.Day); s != nil {
					for _, o := range s.Occupants {
						animals = append(animals, o.Animal.ID)
					}
				}
			}
		}
		if subject == "" {
			subject = r.BuildingID
		}
		var best *records.Handling
		for _, a := range animals {
			for _, h := range byAnimal[a] {
				if h.At.Before(r.At) || !slices.Contains(f.lim.Care.ConcernAnsweredBy, h.Purpose) {
					continue
				}
				if best == nil || h.At.Before(best.At) {
					best = h
				}
				break
			}
		}
		c := map[string]any{
			"on": r.Day.String(), "ref": string(f.rounds.Ref(i)), "animal": nilIfEmpty(r.ConcernAnimalID),
			"answered_ref": nil, "answered_after_hours": nil,
		}
		if best != nil {
			c["answered_ref"] = string(best.Ref)
			c["answered_after_hours"] = best.At.Sub(r.At).Hours()
		}
		if f.docs["enclosure"][subject] == nil && f.enclosures[subject] == nil {
			// A building-wide concern about no named animal: the building
			// stands as the subject.
			f.doc("enclosure", subject)["care"] = map[string]any{"unobserved": []any{}, "unfed": []any{}, "water_unavailable": []any{}, "concerns": []any{}}
		}
		appendTo(f.doc("enclosure", subject)["care"], "concerns", c)
	}
}

// handlingByAnimal indexes the handling events by animal, in time order.
func (f *facts) handlingByAnimal() map[string][]*records.Handling {
	if f.handling != nil {
		return f.handling
	}
	m := map[string][]*records.Handling{}
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		m[h.AnimalID] = append(m[h.AnimalID], h)
	}
	for _, hs := range m {
		sort.SliceStable(hs, func(i, j int) bool { return hs[i].At.Before(hs[j].At) })
	}
	f.handling = m
	return m
}

// enclosureOf is the enclosure an animal occupied on day d, or "".
func (f *facts) enclosureOf(animalID string, d records.Day) string {
	for _, s := range f.homes[animalID] {
		if s.From <= d && d <= s.To {
			return s.Enclosure
		}
	}
	return ""
}

func appendTo(section any, key string, v any) {
	m := section.(map[string]any)
	m[key] = append(m[key].([]any), v)
}

func nilIfEmpty(s string) any {
	if s == "" {
		return nil
	}
	return s
}
