package synth

import "strconv"

// The failing farm (Options.Failing): the worst case for the reports. The
// same farm, weather, staff and weighing days as the baseline, but every
// enclosure fails every care, space and season check it can, every day it
// can, and every weighing fails every handling check it can:
//
//   - one care round a day, at 07:30: not observed, not fed, water frozen
//     (on a day whose minimum air is below 0 °C) or empty and not restored,
//     no bedding added, a health concern about its animal that no
//     veterinary handling follows, not cleaned;
//   - every cage and pen too small, every outdoor cage too low, and none
//     with a nest box, a resting platform or shade;
//   - the kennel's air at 31 °C, 80 % humidity and 32 ppm ammonia at every
//     reading;
//   - every weighing (each animal every 30 days) done in leather gloves,
//     without a coverall, for too long, with a bite not washed or reported.
//
// What cannot fail with one animal to a cage is left passing and said so:
// enclosure.capacity.exceeded (max_occupants is at least 1). Deaths,
// cases, litters, culls, PPE checks, protocols and the staff's training
// pass, and so do the weather sites: the failing farm stresses the
// enclosures' checks, which scale with the farm's size and its days.
//
// The findings, one a day for the day checks (care.water.unavailable,
// care.health.unattended, cold and heat water checks) and one a run for the
// run checks, are listed in PLANTED.json by construction, as for the
// baseline. Per outdoor cage and day they come to two, three on a day
// below freezing or a hot day, plus the runs and the weighings: about 31
// per animal over a week, so --animals 10000 --days 7 gives 309,066
// findings and --animals 1000 --days 7 30,816 (FailingFindings counts a
// size before writing it).

// MinFailingDays is the shortest failing period: a week still has hard-cold
// and hot days at the generator's season.
const MinFailingDays = 7

// Dimensions of the failing farm's enclosures, each below its occupant's
// minimum (shared/checks.md space defaults): fox cages 0.36 m² (< 0.8 m²)
// and 50 cm high (< 70 cm), mink cages 0.16 m² (< 0.255 m²) and 30 cm high
// (< 45 cm), dog pens 0.36 m² (< 0.91 m², 9 CFR §3.6(c)(1) for an 80 cm dog).
const (
	failFoxCm, failFoxHeightCm   = 60, 50
	failMinkCm, failMinkHeightCm = 40, 30
	failPenCm                    = 60
)

// failAll makes every enclosure and weighing fail and plants the findings
// that must follow; the care and environment rows are written failing by
// writeCare and writeEnvironment.
func (g *gen) failAll() {
	for ci := range g.cages {
		c := &g.cages[ci]
		switch {
		case c.indoor:
			c.lengthCm, c.widthCm = failPenCm, failPenCm
		case c.species == mink:
			c.lengthCm, c.widthCm, c.heightCm = failMinkCm, failMinkCm, failMinkHeightCm
		default:
			c.lengthCm, c.widthCm, c.heightCm = failFoxCm, failFoxCm, failFoxHeightCm
		}
		if !c.indoor {
			c.nestBox, c.platform, c.shade = "no", "no", "no"
		}
	}
	last := g.opt.Days - 1
	for ci := range g.cages {
		c := &g.cages[ci]
		whole := func(check string) { g.plant(check, c.id, 0, last) }
		whole("care.observation.missed")
		whole("care.feeding.missed")
		whole("enclosure.space.insufficient")
		for i := range g.opt.Days {
			g.plant("care.water.unavailable", c.id, i, -1)
			g.plant("care.health.unattended", c.id, i, -1)
		}
		// Days 0 … 14 without a cleaning are 15 days, more than 14: the
		// gap exceeds on day index 15 (rule care.cleaning.overdue).
		if g.opt.Days > cleanEveryDays+1 {
			g.plant("care.cleaning.overdue", c.id, cleanEveryDays+1, -1)
		}
		if c.indoor {
			continue
		}
		whole("enclosure.height.insufficient")
		whole("enclosure.nest_box.missing")
		if c.species != mink { // mink need no platform
			whole("enclosure.platform.missing")
		}
		for i := range g.opt.Days {
			if g.kinds[i] == hard || g.kinds[i] == freeze {
				g.plant("cold.water.checks_insufficient", c.id, i, -1)
			}
			if g.kinds[i] == hot {
				g.plant("heat.water.checks_insufficient", c.id, i, -1)
			}
		}
		g.runs("cold.bedding.stale", c.id, g.isKind(hard))
		g.runs("cold.shelter.missing", c.id, g.isKind(hard))
		g.runs("heat.shade.missing", c.id, g.isKind(hot))
	}
	for _, check := range []string{"environment.temperature.out_of_range", "environment.humidity.out_of_range", "environment.ammonia.high"} {
		g.plant(check, kennel, 0, last)
	}
	for i := range g.opt.Days {
		for ai := i % 30; ai < len(g.animals); ai += 30 {
			a := &g.animals[ai]
			if a.species != dog { // dogs are not a bite-risk species by default
				g.plant("handling.glove.inadequate", a.id, i, -1)
			}
			for _, check := range []string{"handling.ppe.missing", "handling.duration.exceeded", "handling.bite.not_washed", "handling.bite.not_reported"} {
				g.plant(check, a.id, i, -1)
			}
		}
	}
}

// cleanEveryDays is the default clean_every_days (rules/limits.yaml): a
// cage never cleaned has its care.cleaning.overdue finding on the day the
// gap from its first round exceeds it.
const cleanEveryDays = 14

func (g *gen) isKind(k dayKind) func(int) bool {
	return func(i int) bool { return g.kinds[i] == k }
}

// failingCare writes the failing farm's care rounds: one a day per
// enclosure, failing every check of the round.
func (g *gen) failingCare(c *csvFile) {
	for i := range g.opt.Days {
		am := stamp(i, "07:30")
		water := "empty"
		if g.kinds[i] == hard || g.kinds[i] == freeze {
			water = "frozen"
		}
		for ci := range g.cages {
			e := &g.cages[ci]
			c.row(am, e.id, g.keeperOf(ci), "no", "no", water, "no", "no", "yes", g.animals[e.animals[0]].id, "no")
		}
	}
}

// failingWeighing is a weighing row failing every handling check it can:
// leather gloves, no coverall, minutes over the 5 the limits allow (set
// by the seed), a bite neither washed nor reported.
func (g *gen) failingWeighing(i int, a *animal) []string {
	minutes := strconv.Itoa(6 + g.rng.IntN(25))
	return []string{stamp(i, "10:00"), a.id, g.keeperOf(a.cage), "weighing", "gloved_hand", minutes, "leather", "", "", "yes", "no", "no", "", ""}
}

// FailingFindings is the number of findings the failing farm of n animals
// over d days plants, without writing it: to choose a size.
func FailingFindings(n, d int) int {
	g := newGen(Options{Animals: n, Days: d, Failing: true})
	g.failAll()
	return len(g.planted)
}
