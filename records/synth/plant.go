package synth

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

// A plant places problems of one check kind. To plant a new kind, add one
// entry here: reserve fresh subjects (g.animal, g.freshStaff, …), change
// their rows, and record each finding the change must cause with g.plant.
// Keep the baseline clean: the change must cause exactly the findings
// recorded and nothing else.
type plantFunc struct {
	check string
	plant func(g *gen)
}

// perKind is how many problems of each kind are planted: one per 2,500
// animals, at least one.
func (g *gen) perKind() int { return max(1, g.opt.Animals/2500) }

// each runs f perKind times.
func each(f func(g *gen)) func(g *gen) {
	return func(g *gen) {
		for range g.perKind() {
			f(g)
		}
	}
}

var plants = []plantFunc{
	// records
	{"records.row.rejected", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		p := g.plant("records.row.rejected", "", i, -1) // subject: the row's FILE:LINE, set when written
		g.mod(a.cage, i).rejected = p
	})},
	{"records.event.after_departure", each(func(g *gen) {
		a, i := g.animal(fox), g.dayIn(warm, 0, g.opt.Days-4)
		a.leftOn, a.leftReason, a.noHandlingFrom = i+1, "transferred", i
		g.handle(a, i+3, "11:00", g.keeperOf(a.cage), nil)
		g.plant("records.event.after_departure", a.id, i+3, -1)
	})},
	{"records.value.missing", each(func(g *gen) {
		// A stint at 14:00 on a warm day without its 12:00 reading: the
		// latest, at 09:00, is 5 h before the start, more than
		// cold.reading_within_hours (3), so the work/warm-up schedule
		// cannot judge it. The missing reading is neither the day's
		// lowest nor its highest, and the baseline 09:00 stint has its own.
		p, i := g.freshStaff(), g.someDay(warm)
		g.noNoon[i] = true
		g.stint(p.id, i, "14:00", "14:30")
		g.plant("records.value.missing", p.id, i, -1)
	})},
	{"records.cull.mismatch", each(func(g *gen) {
		a, i := g.animal(fox), g.dayIn(warm, 0, g.opt.Days-2)
		g.cull(a, i, "V01", "barbiturate_overdose", nil)
		a.leftOn = i + 2 // the cull's day + 1
		g.plant("records.cull.mismatch", a.id, i, -1)
	})},

	// care
	{"care.observation.missed", each(func(g *gen) {
		a, i := g.animal(anySpecies), g.someDay(warm)
		g.mod(a.cage, i).noObserve = true
		g.plant("care.observation.missed", g.cages[a.cage].id, i, -1)
	})},
	{"care.feeding.missed", each(func(g *gen) {
		a, i := g.animal(anySpecies), g.someDay(warm)
		g.mod(a.cage, i).noFeed = true
		g.plant("care.feeding.missed", g.cages[a.cage].id, i, -1)
	})},
	{"care.water.unavailable", each(func(g *gen) {
		a, i := g.animal(anySpecies), g.someDay(warm)
		g.mod(a.cage, i).waterEmpty = true
		g.plant("care.water.unavailable", g.cages[a.cage].id, i, -1)
	})},
	{"care.health.unattended", each(func(g *gen) {
		a, i := g.animal(anySpecies), g.someDay(warm)
		g.mod(a.cage, i).concern = a.id
		g.plant("care.health.unattended", g.cages[a.cage].id, i, -1)
	})},

	// enclosures: whole-period runs of the occupant's stay
	{"enclosure.space.insufficient", each(func(g *gen) {
		a := g.animal(fox)
		g.cages[a.cage].lengthCm, g.cages[a.cage].widthCm = 80, 80 // 0.64 m² < 0.8 m²
		g.plant("enclosure.space.insufficient", g.cages[a.cage].id, 0, g.opt.Days-1)
	})},
	{"enclosure.height.insufficient", each(func(g *gen) {
		a := g.animal(fox)
		g.cages[a.cage].heightCm = 60 // < 70 cm
		g.plant("enclosure.height.insufficient", g.cages[a.cage].id, 0, g.opt.Days-1)
	})},
	{"enclosure.capacity.exceeded", each(func(g *gen) {
		a, b := g.animal(fox), g.animal(fox)
		c := &g.cages[a.cage]
		c.lengthCm, c.widthCm = 200, 100 // 2 m²: room for two by area, but max_occupants 1
		b.cage = a.cage
		g.plant("enclosure.capacity.exceeded", c.id, 0, g.opt.Days-1)
	})},
	{"enclosure.nest_box.missing", each(func(g *gen) {
		a := g.animal(fox)
		g.cages[a.cage].nestBox = "no"
		g.plant("enclosure.nest_box.missing", g.cages[a.cage].id, 0, g.opt.Days-1)
		// The same cage lacks shelter on every hard-cold day.
		g.runs("cold.shelter.missing", g.cages[a.cage].id, func(i int) bool { return g.kinds[i] == hard })
	})},
	{"enclosure.platform.missing", each(func(g *gen) {
		a := g.animal(fox)
		g.cages[a.cage].platform = "no"
		g.plant("enclosure.platform.missing", g.cages[a.cage].id, 0, g.opt.Days-1)
	})},

	// handling of one animal, by a trained and vaccinated keeper
	{"handling.glove.inadequate", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[6] = "leather" })
		g.plant("handling.glove.inadequate", a.id, i, -1)
	})},
	{"handling.ppe.missing", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[8] = "" })
		g.plant("handling.ppe.missing", a.id, i, -1)
	})},
	{"handling.duration.exceeded", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[5] = "9" }) // weighing: 5 min at most
		g.plant("handling.duration.exceeded", a.id, i, -1)
	})},
	{"handling.bite.not_washed", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) {
			r[9], r[11], r[12] = "yes", "no", stamp(i, "15:00")
		})
		g.plant("handling.bite.not_washed", a.id, i, -1)
	})},
	{"handling.bite.not_reported", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[10], r[11] = "yes", "yes" })
		g.plant("handling.bite.not_reported", a.id, i, -1)
	})},

	// staff: a person of their own, handling one fox
	{"staff.handling.untrained", each(func(g *gen) {
		p, a, i := g.freshStaff(), g.animal(fox), g.someDay(warm)
		p.handling = ""
		g.handle(a, i, "14:00", p.id, nil)
		g.plant("staff.handling.untrained", p.id, i, -1)
	})},
	{"staff.euthanasia.untrained", each(func(g *gen) {
		p, a, i := g.freshStaff(), g.animal(fox), g.someDay(warm)
		g.cull(a, i, p.id, "barbiturate_overdose", nil)
		g.plant("staff.euthanasia.untrained", p.id, i, -1)
	})},
	{"staff.rabies.unprotected", each(func(g *gen) {
		p, a, i := g.freshStaff(), g.animal(fox), g.someDay(warm)
		p.primary = ""
		g.handle(a, i, "14:00", p.id, nil)
		g.plant("staff.rabies.unprotected", p.id, i, -1)
	})},
	{"staff.rabies.followup_overdue", each(func(g *gen) {
		p, a, i := g.freshStaff(), g.animal(fox), g.someDay(warm)
		p.primary = dayOf(Start.AddDate(-4, 0, 0)) // more than 3 years, no titer (ACIP 2022, category 3)
		g.handle(a, i, "14:00", p.id, nil)
		g.plant("staff.rabies.followup_overdue", p.id, i, -1)
	})},
	{"staff.respirator.fit_overdue", each(func(g *gen) {
		p, a, i := g.freshStaff(), g.animal(fox), g.someDay(warm)
		g.handle(a, i, "14:00", p.id, func(r []string) { r[8] = "coverall;respirator" })
		g.plant("staff.respirator.fit_overdue", p.id, i, -1)
	})},
	{"staff.inactive", each(func(g *gen) {
		p, a, i := g.freshStaff(), g.animal(fox), g.dayIn(warm, 1, g.opt.Days)
		p.activeTo = day(i - 1)
		g.handle(a, i, "14:00", p.id, nil)
		g.plant("staff.inactive", p.id, i, -1)
	})},

	// protective equipment: one glove each
	{"ppe.inspection.overdue", each(func(g *gen) {
		a, i := g.animal(fox), g.dayIn(warm, 10, g.opt.Days)
		item := g.item()
		g.ppe = append(g.ppe, event{day: i - 10, row: []string{day(i - 10), item, "glove", "", "good", "kept"}})
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[7] = item })
		g.plant("ppe.inspection.overdue", item, i, -1)
	})},
	{"ppe.damaged.used", each(func(g *gen) {
		a, i := g.animal(fox), g.dayIn(warm, 2, g.opt.Days)
		item := g.item()
		g.ppe = append(g.ppe, event{day: i - 2, row: []string{day(i - 2), item, "glove", "", "damaged", "kept"}})
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[7] = item })
		g.plant("ppe.damaged.used", item, i, -1)
	})},

	// protocols: one of their own each
	{"protocol.inactive", each(func(g *gen) {
		a, i := g.animal(fox), g.dayIn(warm, 1, g.opt.Days)
		p := g.freshProtocol()
		p.expires = day(i - 1)
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[13] = p.id })
		g.plant("protocol.inactive", p.id, i, -1)
	})},
	{"protocol.procedure.unapproved", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		p := g.freshProtocol()
		p.procedures = "weighing"
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[3], r[13] = "health_check", p.id })
		g.plant("protocol.procedure.unapproved", p.id, i, -1)
	})},
	{"protocol.method.unapproved", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		p := g.freshProtocol()
		g.cull(a, i, "V01", "gunshot", func(r []string) { r[8] = p.id }) // conditional for foxes, not in the protocol
		g.plant("protocol.method.unapproved", p.id, i, -1)
	})},
	{"protocol.animals.exceeded", each(func(g *gen) {
		a, b, i := g.animal(fox), g.animal(fox), g.dayIn(warm, 1, g.opt.Days)
		p := g.freshProtocol()
		p.approved, p.maxAnimals = day(i), "1" // both animals held under it from its approval
		for _, x := range []*animal{a, b} {
			x.protocol, x.noHandlingFrom = p.id, 0 // no weighings before the approval
		}
		g.plant("protocol.animals.exceeded", p.id, i, -1)
	})},
	{"protocol.expiring", each(func(g *gen) {
		p := g.freshProtocol()
		p.expires = day(g.opt.Days - 1 + 10) // within the 30-day warning
		g.plant("protocol.expiring", p.id, g.opt.Days-1+10, -1)
	})},

	// culls, by the trained veterinarian
	{"cull.method.unacceptable", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.cull(a, i, "V01", "cervical_dislocation", nil)
		g.plant("cull.method.unacceptable", a.id, i, -1)
	})},
	{"cull.method.conditions_unmet", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.cull(a, i, "V01", "potassium_chloride", nil) // not sedated
		g.plant("cull.method.conditions_unmet", a.id, i, -1)
	})},
	{"cull.death.unconfirmed", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		g.cull(a, i, "V01", "barbiturate_overdose", func(r []string) { r[6], r[7] = "no", "" })
		g.plant("cull.death.unconfirmed", a.id, i, -1)
	})},

	// cold
	{"cold.water.checks_insufficient", each(func(g *gen) {
		a, i := g.animal(outdoor), g.someDay(freeze)
		g.mod(a.cage, i).skipPM = true
		g.plant("cold.water.checks_insufficient", g.cages[a.cage].id, i, -1)
	})},
	{"cold.bedding.stale", each(func(g *gen) {
		// No bedding for eight days a..a+7: the hard days a+6 and a+7 are
		// 7 and 8 days after the last bedding (bedding every 7 days at −20).
		a := g.animal(outdoor)
		s, ok := g.hardWindow(8)
		if !ok {
			return
		}
		for i := s; i < s+8; i++ {
			g.mod(a.cage, i).noBedding = true
		}
		g.plant("cold.bedding.stale", g.cages[a.cage].id, s+6, s+7)
	})},
	{"cold.frostbite.risk", each(func(g *gen) { g.snap(-25) })}, // wind chill about −37
	{"cold.work.over_limit", each(func(g *gen) {
		i, ok := g.snap(-30) // a row with a work limit of 40–55 min at 20 km/h
		if !ok {
			return
		}
		p := g.freshStaff()
		g.stint(p.id, i, "06:00", "07:30")
		g.plant("cold.work.over_limit", p.id, i, -1)
	})},
	{"cold.work.should_cease", each(func(g *gen) {
		i, ok := g.snap(-40) // non-emergency work should cease at 20 km/h
		if !ok {
			return
		}
		p := g.freshStaff()
		g.stint(p.id, i, "06:00", "06:20")
		g.plant("cold.work.should_cease", p.id, i, -1)
	})},
	// the frostbite runs of all snaps, once every snap is placed
	{"cold.frostbite.risk", func(g *gen) {
		g.runs("cold.frostbite.risk", site, func(i int) bool { _, ok := g.snapAir[i]; return ok })
	}},

	// heat: the hot stretch reaches 28 °C (heat index about 28 °C)
	{"heat.water.checks_insufficient", each(func(g *gen) {
		a, i := g.animal(outdoor), g.someDay(hot)
		g.mod(a.cage, i).skipPM = true
		g.plant("heat.water.checks_insufficient", g.cages[a.cage].id, i, -1)
	})},
	{"heat.shade.missing", each(func(g *gen) {
		a := g.animal(outdoor)
		g.cages[a.cage].shade = "no"
		g.runs("heat.shade.missing", g.cages[a.cage].id, func(i int) bool { return g.kinds[i] == hot })
	})},
	{"heat.danger", each(func(g *gen) {
		i, ok := g.peakDay()
		if !ok {
			return
		}
		g.heatPeak[i] = true // 35 °C at 50 %: heat index about 41 °C
		g.plant("heat.danger", site, i, -1)
	})},

	// cleaning: no cleaning for the 15 days after a weekly one
	{"care.cleaning.overdue", each(func(g *gen) {
		a := g.animal(anySpecies)
		var last []int
		for l := 0; l+15 < g.opt.Days; l++ {
			if cleanDay(a.cage, l) {
				last = append(last, l)
			}
		}
		l := last[g.rng.IntN(len(last))]
		for i := l + 1; i <= l+15; i++ {
			g.mod(a.cage, i).noClean = true
		}
		g.plant("care.cleaning.overdue", g.cages[a.cage].id, l+15, -1) // the first day more than 14 after l
	})},

	// the kennel's air (environment.csv)
	{"environment.temperature.out_of_range", each(func(g *gen) {
		i, ok := g.envDay()
		if !ok {
			return
		}
		g.envHot[i] = true // 31 °C for 6 h, above the dogs' 29.5 °C
		g.plant("environment.temperature.out_of_range", kennel, i, -1)
	})},
	{"environment.humidity.out_of_range", each(func(g *gen) {
		i, ok := g.envDay()
		if !ok {
			return
		}
		g.envHumid[i] = true // one reading at 78 %
		g.plant("environment.humidity.out_of_range", kennel, i, -1)
	})},
	{"environment.ammonia.high", each(func(g *gen) {
		i, ok := g.envDay()
		if !ok {
			return
		}
		g.envNH3[i] = true // one reading at 32 ppm
		g.plant("environment.ammonia.high", kennel, i, -1)
	})},

	// deaths: one per building and month, except the planted high mortality
	{"health.death.vet_not_notified", each(func(g *gen) {
		as, ds, _, _ := g.deathPlace(1)
		g.die(as[0], ds[0], func(r []string) { r[4] = stamp(ds[0]+1, "13:00") }) // 30 h after 07:00
		g.plant("health.death.vet_not_notified", as[0].id, ds[0], -1)
	})},
	{"health.death.unexplained", each(func(g *gen) {
		as, ds, _, _ := g.deathPlace(1)
		g.die(as[0], ds[0], func(r []string) { r[3], r[5], r[6] = "unknown", "no", "" })
		g.plant("health.death.unexplained", as[0].id, ds[0], -1)
	})},
	{"health.mortality.high", each(func(g *gen) {
		as, ds, building, month := g.deathPlace(2) // 2 of about 50: 4 %, above 2 %
		for k, a := range as {
			g.die(a, ds[k], nil)
		}
		g.plant("health.mortality.high", building, month, -1)
	})},
	{"records.death.mismatch", each(func(g *gen) {
		as, ds, _, _ := g.deathPlace(1)
		g.die(as[0], ds[0], nil)
		as[0].leftOn = ds[0] + 2 // left_on the day after the death
		g.plant("records.death.mismatch", as[0].id, ds[0], -1)
	})},

	// observations
	{"health.weight.loss", each(func(g *gen) {
		a := g.animal(anySpecies)
		first := a.idx % 30 // its first baseline weighing
		j := first + 1 + g.rng.IntN(g.opt.Days-first-1)
		m, _ := strconv.ParseFloat(a.mass, 64)
		g.observe(a, j, "14:00", func(r []string) { r[3] = strconv.FormatFloat(m*0.85, 'f', 2, 64) }) // 15 % below
		g.plant("health.weight.loss", a.id, j, -1)
	})},
	{"health.condition.poor", each(func(g *gen) {
		a, j := g.animal(anySpecies), g.rng.IntN(g.opt.Days)
		g.observe(a, j, "14:00", func(r []string) { r[4] = "2" })
		g.plant("health.condition.poor", a.id, j, -1)
	})},
	{"health.signs.unattended", each(func(g *gen) {
		a, j := g.animal(anySpecies), g.rng.IntN(g.opt.Days)
		g.observe(a, j, "14:00", func(r []string) { r[5] = "lameness" })
		g.plant("health.signs.unattended", a.id, j, -1)
	})},
	{"health.behaviour.abnormal", each(func(g *gen) {
		a, j := g.animal(anySpecies), g.rng.IntN(g.opt.Days-12)
		for _, k := range []int{j, j + 6, j + 12} {
			g.observe(a, k, "14:00", func(r []string) { r[5] = "stereotypy" })
		}
		g.plant("health.behaviour.abnormal", a.id, j+12, -1) // the third within 30 days
	})},
	{"health.case.unreviewed", each(func(g *gen) {
		a, o := g.animal(anySpecies), g.rng.IntN(g.opt.Days-8)
		id := g.treat(a, o, "", "", "")
		g.plant("health.case.unreviewed", id, o+8, -1) // the first day more than 7 after its opening
	})},

	// litters: whelped and weaned in the period
	{"litter.weaning.early", each(func(g *gen) {
		a, w := g.animalWhere(dam), g.rng.IntN(g.opt.Days-42)
		id := g.litter(a, w, 5, 5, w+42, 5) // 42 days, under the 56
		g.plant("litter.weaning.early", id, w+42, -1)
	})},
	{"litter.losses.high", each(func(g *gen) {
		a, w := g.animalWhere(dam), g.rng.IntN(g.opt.Days-56)
		id := g.litter(a, w, 6, 5, w+56, 3) // 3 of 6 lost: 50 %
		g.plant("litter.losses.high", id, w+56, -1)
	})},

	// protocols: second set
	{"protocol.species.unapproved", each(func(g *gen) {
		a, i := g.animal(func(sp string) bool { return sp == arcticFox }), g.someDay(warm)
		p := g.freshProtocol()
		p.species = redFox
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[13] = p.id })
		g.plant("protocol.species.unapproved", p.id, i, -1)
	})},
	{"protocol.personnel.unlisted", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		p := g.freshProtocol()
		p.personnel = "V01"
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[13] = p.id })
		g.plant("protocol.personnel.unlisted", p.id, i, -1)
	})},
	{"protocol.review.overdue", each(func(g *gen) {
		a, i := g.animal(fox), g.someDay(warm)
		p := g.freshProtocol()
		p.approved = dayOf(Start.AddDate(0, 0, i).AddDate(-3, 0, -10)) // no review since: 36 months ended 10 days before
		g.handle(a, i, "14:00", g.keeperOf(a.cage), func(r []string) { r[13] = p.id })
		g.plant("protocol.review.overdue", p.id, i, -1)
	})},

	// correction: the committee's plans (corrective_actions.csv), each for a
	// problem of its own. Water found empty and not restored is significant
	// (shared/checks.md).
	{"correction.overdue", each(func(g *gen) {
		// Open at the period's end, due before its last day: answers a
		// significant finding, so the overdue plan is significant too.
		a, i := g.animal(anySpecies), g.dayIn(warm, 0, g.opt.Days-15)
		g.mod(a.cage, i).waterEmpty = true
		w := g.plant("care.water.unavailable", g.cages[a.cage].id, i, -1)
		due := i + 14 // at most the period's last day but one
		g.act(w.Check, w.Subject, w.On, "Fit a heated drinker and check it at every round", g.keeperOf(a.cage), due, -1, "")
		g.plant("correction.overdue", problemOf(w), due, -1)
	})},
	{"correction.recurred", each(func(g *gen) {
		// Closed two days after the finding, before its due date, and the
		// water found empty again on a warm day after that.
		a, i := g.animal(anySpecies), g.dayIn(warm, 0, g.opt.Days/2)
		j := g.dayIn(warm, i+4, g.opt.Days)
		g.mod(a.cage, i).waterEmpty = true
		g.mod(a.cage, j).waterEmpty = true
		w := g.plant("care.water.unavailable", g.cages[a.cage].id, i, -1)
		g.plant("care.water.unavailable", g.cages[a.cage].id, j, -1)
		g.act(w.Check, w.Subject, w.On, "Replace the drinker valve", g.keeperOf(a.cage), i+7, i+2, "")
		g.plant("correction.recurred", problemOf(w), j, -1)
	})},
	{"correction.plan.missing", each(func(g *gen) {
		// A significant finding of the previous review that no row of
		// corrective_actions.csv answers. Last of the plants: its cage is
		// one no planted water finding names.
		if g.opt.Review == nil {
			return
		}
		c, on := g.freeCage("care.water.unavailable", outdoor), g.reviewDay(0)
		g.reviewed(ReviewFinding{Check: "care.water.unavailable", Subject: c, On: day(on), Severity: "significant",
			Message: "water found frozen at the 07:30 round and not restored"})
		g.plant("correction.plan.missing", "care.water.unavailable "+c, on, -1).Needs = NeedsPrevious
	})},
}

// ---- helpers for plants

func anySpecies(string) bool { return true }

func fox(species string) bool { return species == redFox || species == arcticFox }

// outdoor species: all but the kennel's dogs.
func outdoor(species string) bool { return species != dog }

// dam: a female of the outdoor species.
func dam(a *animal) bool { return a.sex == "f" && a.species != dog }

// plant records a finding from day index on to until (-1: a single day).
func (g *gen) plant(check, subject string, on, until int) *Planted {
	p := &Planted{Check: check, Subject: subject, On: day(on)}
	if until >= 0 && until != on {
		p.Until = day(until)
	}
	g.planted = append(g.planted, p)
	return p
}

// runs plants one finding per run of consecutive days on which bad holds.
func (g *gen) runs(check, subject string, bad func(int) bool) {
	for i := 0; i < g.opt.Days; i++ {
		if !bad(i) {
			continue
		}
		e := i
		for e+1 < g.opt.Days && bad(e+1) {
			e++
		}
		g.plant(check, subject, i, e)
		i = e
	}
}

// animal reserves a fresh animal of a species that ok accepts, in a cage no
// other plant uses, and stops its baseline weighings on planted days only.
func (g *gen) animal(ok func(string) bool) *animal {
	return g.animalWhere(func(a *animal) bool { return ok(a.species) })
}

// animalWhere reserves a fresh animal that ok accepts.
func (g *gen) animalWhere(ok func(*animal) bool) *animal {
	for {
		a := &g.animals[g.rng.IntN(len(g.animals))]
		if a.reserved || g.cages[a.cage].reserved || !ok(a) {
			continue
		}
		a.reserved, g.cages[a.cage].reserved = true, true
		return a
	}
}

func (g *gen) someDay(k dayKind) int { return g.dayIn(k, 0, g.opt.Days) }

// dayIn picks a day index in [lo, hi) of kind k.
func (g *gen) dayIn(k dayKind, lo, hi int) int {
	var ds []int
	for i := lo; i < hi; i++ {
		if g.kinds[i] == k {
			ds = append(ds, i)
		}
	}
	return ds[g.rng.IntN(len(ds))]
}

// hardWindow picks a start s with days s+n-2 and s+n-1 hard. s is at least
// 1: the baseline bedding of day s-1 must be in the records, since no
// record before the period counts as no bedding.
func (g *gen) hardWindow(n int) (int, bool) {
	var ss []int
	for s := 1; s+n <= g.opt.Days; s++ {
		if g.kinds[s+n-2] == hard && g.kinds[s+n-1] == hard {
			ss = append(ss, s)
		}
	}
	if len(ss) == 0 {
		return 0, false
	}
	return ss[g.rng.IntN(len(ss))], true
}

// snap makes the 06:00 reading of a hard day (not yet a snap) air °C with
// 20 km/h wind, and returns the day; false when every hard day is taken.
func (g *gen) snap(air float64) (int, bool) {
	var free []int
	for i, k := range g.kinds {
		if _, taken := g.snapAir[i]; k == hard && !taken {
			free = append(free, i)
		}
	}
	if len(free) == 0 {
		return 0, false
	}
	i := free[g.rng.IntN(len(free))]
	g.snapAir[i] = air
	return i, true
}

func (g *gen) mod(c, i int) *careMod {
	k := [2]int{c, i}
	m := g.care[k]
	if m == nil {
		m = &careMod{}
		g.care[k] = m
	}
	return m
}

// freshStaff adds a keeper of their own, trained and vaccinated, whom a
// plant then changes.
func (g *gen) freshStaff() *person {
	n := len(g.staff) + 1
	g.staff = append(g.staff, person{id: fmt.Sprintf("P%03d", n), name: "Relief Keeper " + strconv.Itoa(n), role: "keeper",
		handling: day(0), primary: dayOf(Start.AddDate(-1, 0, 0))})
	return &g.staff[len(g.staff)-1]
}

func (g *gen) freshProtocol() *protocol {
	n := len(g.protocols) + 1
	g.protocols = append(g.protocols, protocol{id: fmt.Sprintf("HM-%02d", n), title: "Sub-study " + strconv.Itoa(n),
		approved: dayOf(Start.AddDate(-1, 0, 0)), expires: dayOf(Start.AddDate(3, 0, 0)),
		species: "vulpes_vulpes;vulpes_lagopus", procedures: "weighing;health_check", methods: "barbiturate_overdose"})
	return &g.protocols[len(g.protocols)-1]
}

func (g *gen) item() string { return fmt.Sprintf("GL-%03d", len(g.ppe)+1) }

// handle adds a clean weighing of a at day i, changed by edit.
func (g *gen) handle(a *animal, i int, hhmm, staff string, edit func([]string)) {
	r := []string{stamp(i, hhmm), a.id, staff, "weighing", "gloved_hand", "2", "bite_resistant", "", "coverall", "no", "no", "", "", ""}
	if edit != nil {
		edit(r)
	}
	g.handling = append(g.handling, event{day: i, at: hhmm, row: r})
}

// cull adds a clean cull of a at day i (the animal leaves that day), changed by edit.
func (g *gen) cull(a *animal, i int, staff, method string, edit func([]string)) {
	r := []string{stamp(i, "11:00"), a.id, staff, "end_of_study", method, "no", "yes", "no_heartbeat;no_corneal_reflex", "", "incineration", "no"}
	if edit != nil {
		edit(r)
	}
	a.leftOn, a.leftReason, a.noHandlingFrom = i+1, "culled", i
	g.culls = append(g.culls, event{day: i, at: "11:00", row: r})
}

func (g *gen) stint(staff string, i int, from, to string) {
	g.stints = append(g.stints, event{day: i, at: from, row: []string{staff, stamp(i, from), stamp(i, to), site, "moderate"}})
}

// deathPlace picks a building and calendar month with no death yet and n
// fresh animals of that building, reserves them, and picks a day of that
// month in the period for each; it returns the building and the index of
// the month's first day. One death in a building of about fifty is below
// the mortality line (two deaths at least); n = 2 is above it.
func (g *gen) deathPlace(n int) (as []*animal, ds []int, building string, month int) {
	type slot struct {
		building string
		first    int   // day index of the month's first day
		days     []int // the month's days in the period
	}
	free := map[string]int{}
	var buildings []string
	for i := range g.animals {
		a := &g.animals[i]
		b := g.cages[a.cage].shed
		if _, ok := free[b]; !ok {
			buildings = append(buildings, b)
			free[b] = 0
		}
		if !a.reserved && !g.cages[a.cage].reserved {
			free[b]++
		}
	}
	var slots []slot
	for _, b := range buildings {
		if free[b] < n {
			continue
		}
		for _, m := range g.months() {
			if !g.deathSlots[b+"|"+m.key] {
				slots = append(slots, slot{building: b, first: m.first, days: m.days})
			}
		}
	}
	s := slots[g.rng.IntN(len(slots))]
	g.deathSlots[s.building+"|"+day(s.first)[:7]] = true
	for range n {
		as = append(as, g.animalWhere(func(a *animal) bool { return g.cages[a.cage].shed == s.building }))
		ds = append(ds, s.days[g.rng.IntN(len(s.days))])
	}
	return as, ds, s.building, s.first
}

type month struct {
	key   string // YYYY-MM
	first int    // day index of its first day
	days  []int  // its days in the period
}

// months are the calendar months of the period.
func (g *gen) months() []month {
	if g.monthList == nil {
		for i := range g.opt.Days {
			k := day(i)[:7]
			if n := len(g.monthList); n == 0 || g.monthList[n-1].key != k {
				g.monthList = append(g.monthList, month{key: k, first: i})
			}
			m := &g.monthList[len(g.monthList)-1]
			m.days = append(m.days, i)
		}
	}
	return g.monthList
}

// die records a found dead at 07:00 of day i with a known cause, the
// veterinarian told at 09:30 and a necropsy, changed by edit; the animal
// leaves that day.
func (g *gen) die(a *animal, i int, edit func([]string)) {
	r := []string{a.id, stamp(i, "07:00"), g.keeperOf(a.cage), "disease", stamp(i, "09:30"), "yes", "NX-" + a.id, "incineration"}
	if edit != nil {
		edit(r)
	}
	a.leftOn, a.leftReason, a.noHandlingFrom = i+1, "died", i
	g.deaths = append(g.deaths, event{day: i, at: "07:00", row: r})
}

// observe adds an observation of a at day i by its keeper (no mass, no
// score, no sign), changed by edit.
func (g *gen) observe(a *animal, i int, hhmm string, edit func([]string)) {
	r := []string{stamp(i, hhmm), a.id, g.keeperOf(a.cage), "", "", "", "", ""}
	if edit != nil {
		edit(r)
	}
	g.obs = append(g.obs, event{day: i, at: hhmm, row: r})
}

// treat opens a veterinary case of a on day index opened; reviewed and
// closed are day indexes or empty. It returns the case id.
func (g *gen) treat(a *animal, opened int, reviewed, closed, outcome string) string {
	id := fmt.Sprintf("C%04d", len(g.cases)+1)
	g.cases = append(g.cases, event{day: opened, row: []string{id, a.id, day(opened), "superficial skin wound", "V01", reviewed, closed, outcome}})
	return id
}

// litter records a litter of dam whelped on day w and weaned on day weanedOn.
func (g *gen) litter(dam *animal, w, born, alive, weanedOn, weaned int) string {
	id := fmt.Sprintf("L%04d", len(g.litters)+1)
	g.litters = append(g.litters, event{day: w, row: []string{id, dam.id, day(w), strconv.Itoa(born), strconv.Itoa(alive), day(weanedOn), strconv.Itoa(weaned)}})
	return id
}

// envDay picks a day for a planted kennel reading, not next to another, so
// that no two plants join into one run; false when none is left.
func (g *gen) envDay() (int, bool) {
	i, ok := g.apart(func(int) bool { return true }, g.envDays)
	if ok {
		g.envDays[i] = true
	}
	return i, ok
}

// peakDay picks a hot day for a heat peak, not next to another peak; false
// when none is left.
func (g *gen) peakDay() (int, bool) {
	return g.apart(func(i int) bool { return g.kinds[i] == hot }, g.heatPeak)
}

// apart picks a day that ok accepts with neither it nor a neighbour in taken.
func (g *gen) apart(ok func(int) bool, taken map[int]bool) (int, bool) {
	var ds []int
	for i := range g.opt.Days {
		if ok(i) && !taken[i-1] && !taken[i] && !taken[i+1] {
			ds = append(ds, i)
		}
	}
	if len(ds) == 0 {
		return 0, false
	}
	return ds[g.rng.IntN(len(ds))], true
}

// baseline adds the clean deaths, cases and litters: nothing here causes a
// finding.
func (g *gen) baseline() {
	for range max(1, g.opt.Animals/1000) {
		as, ds, _, _ := g.deathPlace(1)
		g.die(as[0], ds[0], nil)
	}
	for range max(1, g.opt.Animals/500) {
		a, o := g.animal(anySpecies), g.rng.IntN(g.opt.Days-8)
		g.treat(a, o, day(o+4), day(o+8), "recovered") // reviewed within a week, closed
	}
	for range max(1, g.opt.Animals/500) {
		a, w := g.animalWhere(dam), g.rng.IntN(g.opt.Days-56)
		age := 56 + g.rng.IntN(min(5, g.opt.Days-56-w)) // eight weeks or a few days more
		g.litter(a, w, 5, 5, w+age, 4)                  // 1 of 5 lost: 20 %
	}
}

// ---- corrective actions and the previous review

// problemOf is the problem a finding belongs to: its check and subject
// (the subject of the correction checks' findings).
func problemOf(p *Planted) string { return p.Check + " " + p.Subject }

// act adds a row of corrective_actions.csv answering the finding of check
// and subject found on foundOn (empty: every finding of that check and
// subject), due on day index due; closed is -1 while the action is open.
func (g *gen) act(check, subject, foundOn, plan, owner string, due, closed int, verifiedBy string) {
	closedOn := ""
	if closed != -1 {
		closedOn = day(closed)
	}
	g.actions = append(g.actions, []string{check, subject, foundOn, plan, owner, day(due), closedOn, verifiedBy})
}

// dayIndex is the day index of a YYYY-MM-DD date.
func dayIndex(s string) int {
	t, err := time.Parse("2006-01-02", s)
	if err != nil {
		return -1 << 30 // never a planted day: the generator writes every date
	}
	return int(t.Sub(Start).Hours() / 24)
}

// reviewDay picks a day of the previous review (a negative day index) with
// room for n more days after it inside that review.
func (g *gen) reviewDay(n int) int {
	return -g.opt.Days + g.rng.IntN(g.opt.Days-n)
}

// reviewed adds a finding to the previous review.
func (g *gen) reviewed(f ReviewFinding) { g.review = append(g.review, f) }

// freeCage picks a cage of a species that ok accepts that is neither the
// subject of a planted finding of check nor of a previous review's finding,
// so its problem is its own.
func (g *gen) freeCage(check string, ok func(string) bool) string {
	taken := map[string]bool{}
	for _, p := range g.planted {
		if p.Check == check {
			taken[p.Subject] = true
		}
	}
	for _, f := range g.review {
		taken[f.Subject] = true
	}
	for {
		c := &g.cages[g.rng.IntN(len(g.cages))]
		if !taken[c.id] && ok(c.species) {
			return c.id
		}
	}
}

// plans adds the clean corrective actions, which cause no finding: plans
// answering a few planted single-day findings of this period whose problem
// has no other finding (closed in time and verified, or open and not yet
// due), and, with a previous review, its clean findings: a significant one
// whose plan was closed in time, a significant run whose plan is open and
// due after this period, and a minor one, which needs no plan.
func (g *gen) plans() {
	count, answered := map[string]int{}, map[string]bool{}
	for _, p := range g.planted {
		count[problemOf(p)]++
	}
	for _, r := range g.actions {
		answered[r[0]+" "+r[1]] = true
	}
	var cands []*Planted
	for _, p := range g.planted {
		k := problemOf(p)
		if p.Until != "" || p.Needs != "" || count[k] != 1 || answered[k] || p.Check == "records.row.rejected" ||
			strings.HasPrefix(p.Check, "correction.") || dayIndex(p.On) < 0 || dayIndex(p.On) > g.opt.Days-5 {
			continue
		}
		cands = append(cands, p)
	}
	for k := range min(2*g.perKind(), len(cands)) {
		n := k + g.rng.IntN(len(cands)-k)
		cands[k], cands[n] = cands[n], cands[k]
		p, on := cands[k], dayIndex(cands[k].On)
		plan := "Find the cause with the keepers and correct it"
		if k%2 == 0 {
			g.act(p.Check, p.Subject, p.On, plan, "V01", on+7, on+3, "V01") // closed before its due date, verified
		} else {
			g.act(p.Check, p.Subject, p.On, plan, "V01", g.opt.Days-1+30, -1, "") // due after the period
		}
	}
	if g.opt.Review == nil {
		return
	}
	c, on := g.freeCage("care.water.unavailable", outdoor), g.reviewDay(10)
	g.reviewed(ReviewFinding{Check: "care.water.unavailable", Subject: c, On: day(on), Severity: "significant",
		Message: "water found empty at the 07:30 round and not restored"})
	g.act("care.water.unavailable", c, day(on), "Fit a heated drinker", "K01", on+7, on+3, "V01")

	c, on = g.freeCage("care.observation.missed", anySpecies), g.reviewDay(1)
	g.reviewed(ReviewFinding{Check: "care.observation.missed", Subject: c, On: day(on), Until: day(on + 1), Severity: "significant",
		Message: "not observed for 2 days in a row"}) // significant: a run of 2 days
	g.act("care.observation.missed", c, "", "A second keeper covers the weekend rounds", "K01", g.opt.Days-1+30, -1, "") // due after the period

	c = g.freeCage("enclosure.platform.missing", fox)
	from, to := g.reviewPeriod()
	g.reviewed(ReviewFinding{Check: "enclosure.platform.missing", Subject: c, On: dayOf(from), Until: dayOf(to), Severity: "minor",
		Message: "no resting platform for foxes"})
}
