// Package synth writes a deterministic synthetic records folder of any size
// in an invented scenario, with a small number of planted problems of every
// check kind and the list of what it planted (PLANTED.json).
//
// The scenario: the invented Birchfall Fur Research Station's scale-test
// farm, sheds of fifty single outdoor cages (red foxes, arctic foxes and
// mink) and an indoor kennel of ten dog pens, a few keepers, a veterinarian
// and protocols. The weather runs through a winter, a summer and back:
// hard-cold days at the start and end of the period (minimum wind chill
// about −24), freezing days around them, mild to warm days, and a hot
// stretch in the middle (maximum 28 °C, heat index about 28 °C). The clean
// baseline is chosen so that it produces no finding: every cage is observed
// and fed every day, checked twice on freezing and hot days, bedded daily,
// cleaned weekly and shaded; every animal is weighed (handling and
// observation) every 30 days at a steady mass and good condition; a few
// animals die, one at most per building and month, with a known cause and
// the veterinarian told; a few veterinary cases are reviewed and closed
// within a week; a few litters are weaned at eight weeks with small losses;
// the kennel's air stays in range; every keeper is trained and vaccinated;
// every cage is big enough; no reading reaches the frostbite or heat-danger
// line; the committee's corrective actions answering a few planted findings
// are closed before their due date or not yet due, and their problems do not
// come back. With Options.Review the folder also has an invented previous
// review (PreviousFile), of the Days days before the period, whose
// significant findings have plans closed in time or not yet due.
//
// Each planted problem is placed by construction by one plant function (see
// plants in plant.go): it changes a few rows of a subject no other plant
// touches and records the finding it must cause. The planted list is never
// computed by running the checker.
//
// With Options.Failing the folder is the failing farm instead (failing.go):
// every enclosure fails every check it can, every day, the worst case for
// the reports, with its findings listed by construction in PLANTED.json.
package synth

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"
)

// Options are the size and seed of a generated folder.
type Options struct {
	Animals int    // single cages, one animal each, in sheds of fifty
	Days    int    // length of the period, from Start
	Seed    uint64 // same seed, same bytes
	// Review writes the previous review (the period of Days days just
	// before Start) to PreviousFile as the findings file `welfare check
	// --json` writes; package synth/review has the writer. Nil: no previous
	// review is written and nothing that needs one is planted.
	Review func(w io.Writer, r Review) error
	// Failing writes the failing farm instead of the clean baseline with
	// its planted problems: every enclosure fails every check it can,
	// every day (see failAll), the worst case for the reports. Days may
	// then be as few as MinFailingDays.
	Failing bool
}

// Review is the invented previous review of the generated farm: its
// facility, period and findings, made by hand (not checked from records).
type Review struct {
	Facility string
	From, To string // YYYY-MM-DD, inclusive
	Findings []ReviewFinding
}

// ReviewFinding is one finding of the previous review. Its severity is the
// check's own (shared/checks.md), set by hand like the rest.
type ReviewFinding struct {
	Check, Subject, On, Until, Severity, Message string
}

// PreviousFile is the previous review's findings file in the generated
// folder (slash-separated), for `welfare check DIR --previous
// DIR/previous/findings.json`. The records loader does not read it.
const PreviousFile = "previous/findings.json"

// NeedsPrevious marks a planted finding that only a check given the
// previous review finds (Planted.Needs): a plain `welfare check DIR`
// reports the check as not evaluated instead.
const NeedsPrevious = "--previous"

// Limits of the generator's sizes: fewer animals or days leave no room for
// one planted problem of every kind on its own subject and in its season.
const (
	MinAnimals = 100
	MinDays    = 60
	MaxDays    = 366
)

// Start is the first day of every generated period (a winter day).
var Start = time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)

// Planted is one finding the checker must report on the folder.
type Planted struct {
	Check   string `json:"check"`
	Subject string `json:"subject"`
	On      string `json:"on"`
	Until   string `json:"until"` // last day of a run; empty for a single day
	// Needs is NeedsPrevious for a finding of a check that needs the
	// previous review (correction.plan.missing); empty otherwise.
	Needs string `json:"needs,omitempty"`
}

// PlantedFile is the answer key's file name in the generated folder.
const PlantedFile = "PLANTED.json"

const (
	cagesPerShed = 50
	site         = "YARD"
	timeZone     = "America/Winnipeg"
	facilityName = "Birchfall Fur Research Station, generated scale farm (invented)"
)

// dayKind is the planned weather of a day.
type dayKind int8

const (
	warm   dayKind = iota // minimum air at or above 2 °C, maximum below 23 °C
	freeze                // minimum air −5 °C, wind chill about −9
	hard                  // minimum air −15 °C with 20 km/h wind: wind chill about −24
	hot                   // maximum air 28 °C at 45 % humidity: heat index about 28 °C
)

// Species of the generated farm.
const (
	redFox    = "vulpes_vulpes"
	arcticFox = "vulpes_lagopus"
	mink      = "neogale_vison"
	dog       = "canis_familiaris"
)

// The indoor kennel: the last dogs animals, one to a pen.
const (
	kennel = "R01"
	dogs   = 10
)

type cage struct {
	id, shed, species string // shed: the building
	kind              string
	indoor            bool
	lengthCm, widthCm int
	heightCm, maxOcc  int
	nestBox, platform string
	shade             string
	reserved          bool // taken by a plant
	animals           []int
}

type animal struct {
	idx              int
	id, species, sex string
	cage             int
	born, arrived    time.Time
	leftOn           int // day index + 1 of left_on; 0: still here
	leftReason       string
	protocol         string
	noHandlingFrom   int    // day index from which baseline weighings stop; -1: never stop
	mass             string // steady body mass, kg
	length           string // nose to tail base, cm (dogs: their space is a formula of it)
	reserved         bool
}

type person struct {
	id, name, role                   string
	activeTo                         string
	handling, euthanasia, methods    string
	primary, titerOn, titer, respFit string
	risk                             string // ACIP 2022 rabies risk category
}

type protocol struct {
	id, title, approved, expires string
	species, maxAnimals          string
	procedures, methods          string
	personnel, reviewed, pain    string
}

// careMod changes one cage's rounds on one day.
type careMod struct {
	noObserve, noFeed, waterEmpty, skipPM, noBedding, noClean bool
	concern                                                   string // animal id of a health concern
	rejected                                                  *Planted
}

type event struct {
	day int
	at  string // local time HH:MM, for ordering
	row []string
}

type gen struct {
	opt       Options
	rng       *rand.Rand
	kinds     []dayKind
	snapAir   map[int]float64 // day -> the 06:00 reading's air temperature on a planted cold snap
	cages     []cage
	animals   []animal
	staff     []person
	protocols []protocol
	care      map[[2]int]*careMod
	handling  []event
	culls     []event
	ppe       []event
	stints    []event
	deaths    []event
	obs       []event // observations beyond the baseline weighings
	cases     []event
	litters   []event
	actions   [][]string      // corrective_actions.csv rows
	review    []ReviewFinding // the previous review's findings
	planted   []*Planted
	keepers   []string

	deathSlots map[string]bool // building|month with a death
	monthList  []month
	envDays    map[int]bool // days of the kennel's planted readings
	envHot     map[int]bool // kennel days with a warm spell 12:00–18:00
	envHumid   map[int]bool // kennel days with a humid reading
	envNH3     map[int]bool // kennel days with an ammonia peak
	heatPeak   map[int]bool // hot days with a 15:00 reading in the NWS extreme caution band
	noNoon     map[int]bool // warm days without the 12:00 reading
}

// Generate writes the records folder and PLANTED.json into dir (created if
// needed), and the previous review when opt.Review is set, and returns the
// planted findings.
func Generate(dir string, opt Options) ([]Planted, error) {
	if opt.Animals < MinAnimals {
		return nil, fmt.Errorf("--animals %d: at least %d, so every planted problem has its own animal", opt.Animals, MinAnimals)
	}
	minDays := MinDays
	if opt.Failing {
		minDays = MinFailingDays
	}
	if opt.Days < minDays || opt.Days > MaxDays {
		return nil, fmt.Errorf("--days %d: between %d and %d (a cold and a warm stretch, within one year of training records)", opt.Days, minDays, MaxDays)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	g := newGen(opt)
	if opt.Failing {
		g.failAll()
	} else {
		g.baseline()
		for _, p := range plants {
			p.plant(g)
		}
		g.plans()
	}
	if err := g.write(dir); err != nil {
		return nil, err
	}
	out := make([]Planted, len(g.planted))
	for i, p := range g.planted {
		out[i] = *p
	}
	SortPlanted(out)
	b, err := json.MarshalIndent(out, "", "  ")
	if err != nil {
		return nil, err
	}
	if err := os.WriteFile(filepath.Join(dir, PlantedFile), append(b, '\n'), 0o644); err != nil {
		return nil, err
	}
	return out, nil
}

// SortPlanted orders findings by check, subject, on and until.
func SortPlanted(ps []Planted) {
	sort.Slice(ps, func(i, j int) bool {
		a, b := ps[i], ps[j]
		if a.Check != b.Check {
			return a.Check < b.Check
		}
		if a.Subject != b.Subject {
			return a.Subject < b.Subject
		}
		if a.On != b.On {
			return a.On < b.On
		}
		return a.Until < b.Until
	})
}

func newGen(opt Options) *gen {
	g := &gen{opt: opt, rng: rand.New(rand.NewPCG(opt.Seed, 0x5eed)), snapAir: map[int]float64{}, care: map[[2]int]*careMod{},
		deathSlots: map[string]bool{}, envDays: map[int]bool{}, envHot: map[int]bool{}, envHumid: map[int]bool{},
		envNH3: map[int]bool{}, heatPeak: map[int]bool{}, noNoon: map[int]bool{}}
	// Season: cos over the period, 1 (winter) at both ends, −1 (summer) in the middle.
	for i := range opt.Days {
		s := math.Cos(2 * math.Pi * float64(i) / float64(opt.Days))
		k := warm
		switch {
		case s > 0.6:
			k = hard
		case s > 0.2:
			k = freeze
		case s < -0.9:
			k = hot
		}
		g.kinds = append(g.kinds, k)
	}
	species := []string{redFox, arcticFox, redFox, mink}
	baseMass := map[string]float64{redFox: 6.5, arcticFox: 4.5, mink: 1.4, dog: 22}
	outdoor := opt.Animals - dogs
	for i := range opt.Animals {
		shed := i / cagesPerShed
		sp := species[shed%len(species)]
		c := cage{id: fmt.Sprintf("S%03d-%02d", shed+1, i%cagesPerShed+1), shed: fmt.Sprintf("S%03d", shed+1), species: sp, kind: "cage",
			lengthCm: 120, widthCm: 85, heightCm: 78, maxOcc: 1, nestBox: "yes", platform: "yes", shade: "yes"}
		if sp == mink {
			c.lengthCm, c.widthCm, c.heightCm, c.platform = 70, 40, 46, "no"
		}
		length := ""
		if i >= outdoor { // the kennel: indoor pens, no nest box or platform asked of dogs
			sp, length = dog, "80" // 9 CFR §3.6(c)(1): (31.5 in + 6)² / 144 = 9.8 ft², 0.91 m²
			c = cage{id: fmt.Sprintf("%s-%02d", kennel, i-outdoor+1), shed: kennel, species: sp, kind: "pen", indoor: true,
				lengthCm: 180, widthCm: 120, heightCm: 180, maxOcc: 1, nestBox: "no", platform: "no"}
		}
		sex := "f"
		if i%2 == 1 {
			sex = "m"
		}
		mass := baseMass[sp] * (0.9 + 0.2*float64(i*37%100)/100)
		g.animals = append(g.animals, animal{idx: i, id: fmt.Sprintf("A%05d", i+1), species: sp, sex: sex, cage: i,
			born: Start.AddDate(-2, 0, -(i % 90)), arrived: Start.AddDate(-1, -6, -(i % 60)), noHandlingFrom: -1,
			mass: strconv.FormatFloat(mass, 'f', 2, 64), length: length})
		c.animals = []int{i}
		g.cages = append(g.cages, c)
	}
	names := []string{"Wren Halloway", "Ives Marchetti", "Oona Brackley", "Tobin Ashgrove", "Sela Varnholt",
		"Piet Okonedo", "Maren Coldwell", "Jory Teasdale", "Linnea Forsk", "Cato Rimmel"}
	sheds := (opt.Animals + cagesPerShed - 1) / cagesPerShed
	var team []string
	for k := range max(1, (sheds+9)/10) {
		id := fmt.Sprintf("K%02d", k+1)
		g.keepers = append(g.keepers, id)
		team = append(team, id)
		g.staff = append(g.staff, person{id: id, name: names[k%len(names)] + suffix(k/len(names)), role: "keeper",
			handling: day(0), primary: dayOf(Start.AddDate(-1, 0, 0)), risk: "3"})
	}
	g.staff = append(g.staff, person{id: "V01", name: "Dr Halvard Enqvist", role: "veterinarian", handling: day(0),
		euthanasia: day(0), methods: "barbiturate_overdose;gunshot;cervical_dislocation;potassium_chloride",
		primary: dayOf(Start.AddDate(-1, 0, 0)), risk: "3"})
	g.protocols = append(g.protocols, protocol{id: "HM-01", title: "Winter coat and husbandry study",
		approved: dayOf(Start.AddDate(-1, 0, 0)), expires: dayOf(Start.AddDate(3, 0, 0)),
		species: "vulpes_vulpes;vulpes_lagopus;neogale_vison", procedures: "weighing;health_check;vet_exam",
		methods: "barbiturate_overdose", personnel: strings.Join(append(team, "V01"), ";"),
		reviewed: dayOf(Start.AddDate(0, -2, 0)), pain: "C"})
	return g
}

func suffix(n int) string {
	if n == 0 {
		return ""
	}
	return " " + strconv.Itoa(n+1)
}

// day is the date of day index i of the period.
func day(i int) string { return dayOf(Start.AddDate(0, 0, i)) }

func dayOf(t time.Time) string { return t.Format("2006-01-02") }

func stamp(i int, hhmm string) string { return day(i) + "T" + hhmm }

// ---- writing

type csvFile struct {
	f    *os.File
	w    *bufio.Writer
	line int
	name string
}

func create(dir, name string, header ...string) (*csvFile, error) {
	f, err := os.Create(filepath.Join(dir, name))
	if err != nil {
		return nil, err
	}
	c := &csvFile{f: f, w: bufio.NewWriterSize(f, 1<<16), name: name}
	c.row(header...)
	return c, nil
}

// row writes one record; the generator's cells never need quoting.
func (c *csvFile) row(cells ...string) int {
	for i, s := range cells {
		if i > 0 {
			c.w.WriteByte(',')
		}
		c.w.WriteString(s)
	}
	c.w.WriteByte('\n')
	c.line++
	return c.line
}

func (c *csvFile) close() error {
	if err := c.w.Flush(); err != nil {
		c.f.Close()
		return err
	}
	return c.f.Close()
}

func yes(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

func (g *gen) write(dir string) error {
	var sb strings.Builder
	sb.WriteString("name: " + facilityName + "\ntime_zone: " + timeZone + "\nbuildings:\n")
	for s := 0; s*cagesPerShed < len(g.cages)-dogs; s++ {
		fmt.Fprintf(&sb, "  - {id: S%03d, exposure: outdoor, weather_site: %s}\n", s+1, site)
	}
	sb.WriteString("  - {id: " + kennel + ", exposure: indoor}\n")
	sb.WriteString("weather_sites: [" + site + "]\n")
	if err := os.WriteFile(filepath.Join(dir, "facility.yaml"), []byte(sb.String()), 0o644); err != nil {
		return err
	}
	steps := []func(string) error{g.writeEnclosures, g.writeAnimals, g.writeStaff, g.writeProtocols,
		g.writeCare, g.writeHandling, g.writeEvents("culls.csv", g.culls,
			"culled_at", "animal_id", "staff_id", "reason", "method", "sedated", "death_confirmed", "confirmation", "protocol_id", "disposal", "anaesthetised"),
		g.writeEvents("ppe_checks.csv", g.ppe, "checked_on", "item_id", "item", "assigned_to", "condition", "action"),
		g.writeWeather, g.writeStints, g.writeObservations,
		g.writeEvents("deaths.csv", g.deaths, "animal_id", "found_dead_at", "found_by", "suspected_cause", "vet_notified_at", "necropsy", "necropsy_ref", "disposal"),
		g.writeEvents("treatments.csv", g.cases, "case_id", "animal_id", "opened_on", "diagnosis", "prescribed_by", "reviewed_on", "closed_on", "outcome"),
		g.writeEvents("litters.csv", g.litters, "litter_id", "dam_id", "whelped_on", "born", "born_alive", "weaned_on", "weaned"),
		g.writeEnvironment, g.writeActions, g.writeReview}
	for _, step := range steps {
		if err := step(dir); err != nil {
			return err
		}
	}
	return nil
}

func (g *gen) writeEnclosures(dir string) error {
	c, err := create(dir, "enclosures.csv", "enclosure_id", "building_id", "kind", "length_cm", "width_cm", "height_cm", "max_occupants", "nest_box", "platform", "shade")
	if err != nil {
		return err
	}
	for _, e := range g.cages {
		c.row(e.id, e.shed, e.kind, strconv.Itoa(e.lengthCm), strconv.Itoa(e.widthCm), strconv.Itoa(e.heightCm), strconv.Itoa(e.maxOcc), e.nestBox, e.platform, e.shade)
	}
	return c.close()
}

func (g *gen) writeAnimals(dir string) error {
	c, err := create(dir, "animals.csv", "animal_id", "species", "sex", "born_on", "arrived_on", "left_on", "left_reason", "enclosure_id", "protocol_id", "length_cm")
	if err != nil {
		return err
	}
	for _, a := range g.animals {
		left := ""
		if a.leftOn > 0 {
			left = day(a.leftOn - 1)
		}
		c.row(a.id, a.species, a.sex, dayOf(a.born), dayOf(a.arrived), left, a.leftReason, g.cages[a.cage].id, a.protocol, a.length)
	}
	return c.close()
}

func (g *gen) writeStaff(dir string) error {
	c, err := create(dir, "staff.csv", "staff_id", "name", "role", "active_to", "handling_trained_on", "euthanasia_trained_on",
		"euthanasia_methods", "rabies_primary_on", "rabies_titer_on", "rabies_titer_iu_ml", "respirator_fit_on", "rabies_risk_category")
	if err != nil {
		return err
	}
	for _, p := range g.staff {
		c.row(p.id, p.name, p.role, p.activeTo, p.handling, p.euthanasia, p.methods, p.primary, p.titerOn, p.titer, p.respFit, p.risk)
	}
	return c.close()
}

func (g *gen) writeProtocols(dir string) error {
	c, err := create(dir, "protocols.csv", "protocol_id", "title", "approved_on", "expires_on", "species", "max_animals", "procedures", "euthanasia_methods",
		"personnel", "last_reviewed_on", "pain_category")
	if err != nil {
		return err
	}
	for _, p := range g.protocols {
		c.row(p.id, p.title, p.approved, p.expires, p.species, p.maxAnimals, p.procedures, p.methods, p.personnel, p.reviewed, p.pain)
	}
	return c.close()
}

// twoChecks reports whether day i needs two water checks: minimum air below
// 0 °C, or maximum air at or above 25 °C.
func (g *gen) twoChecks(i int) bool { return g.kinds[i] != warm }

// cleanDay reports whether cage ci is cleaned on day i in the baseline: weekly.
func cleanDay(ci, i int) bool { return (ci+i)%7 == 0 }

func (g *gen) keeperOf(c int) string { return g.keepers[c/cagesPerShed/10] }

func (g *gen) writeCare(dir string) error {
	c, err := create(dir, "daily_care.csv", "checked_at", "enclosure_id", "staff_id", "observed", "fed", "water", "water_restored", "bedding_added", "health_concern", "concern_animal_id", "cleaned")
	if err != nil {
		return err
	}
	if g.opt.Failing {
		g.failingCare(c)
		return c.close()
	}
	// The baseline rows of a cage, written whole: the round's time, then
	// these cells (the morning's ends with its cleaned cell).
	amCells, pmCells := make([]string, len(g.cages)), make([]string, len(g.cages))
	for ci := range g.cages {
		amCells[ci] = "," + g.cages[ci].id + "," + g.keeperOf(ci) + ",yes,yes,ok,,yes,no,,"
		pmCells[ci] = "," + g.cages[ci].id + "," + g.keeperOf(ci) + ",yes,no,ok,,no,no,,no\n"
	}
	// The changed rounds by day, so the baseline needs no look-up.
	mods := make([]map[int]*careMod, g.opt.Days)
	for k, m := range g.care {
		if mods[k[1]] == nil {
			mods[k[1]] = map[int]*careMod{}
		}
		mods[k[1]][k[0]] = m
	}
	for i := range g.opt.Days {
		am, pm := stamp(i, "07:30"), stamp(i, "15:30")
		two := g.twoChecks(i)
		for ci := range g.cages {
			e := &g.cages[ci]
			k := g.keeperOf(ci)
			m := mods[i][ci]
			if m == nil {
				c.w.WriteString(am)
				c.w.WriteString(amCells[ci])
				if cleanDay(ci, i) {
					c.w.WriteString("yes\n")
				} else {
					c.w.WriteString("no\n")
				}
				c.line++
				if two {
					c.w.WriteString(pm)
					c.w.WriteString(pmCells[ci])
					c.line++
				}
				continue
			}
			water, restored := "ok", ""
			if m.waterEmpty {
				water, restored = "empty", "no"
			}
			concern := m.concern != ""
			c.row(am, e.id, k, yes(!m.noObserve), yes(!m.noFeed), water, restored, yes(!m.noBedding), yes(concern), m.concern, yes(cleanDay(ci, i) && !m.noClean))
			if g.twoChecks(i) && !m.skipPM {
				c.row(pm, e.id, k, yes(!m.noObserve), "no", "ok", "", "no", "no", "", "no")
			}
			if m.rejected != nil {
				line := c.row(stamp(i, "19:00"), e.id, k, "yes", "no", "frozn", "", "no", "no", "", "no")
				m.rejected.Subject = fmt.Sprintf("daily_care.csv:%d", line)
			}
		}
	}
	return c.close()
}

func (g *gen) writeHandling(dir string) error {
	c, err := create(dir, "handling.csv", "handled_at", "animal_id", "staff_id", "purpose", "restraint", "duration_min",
		"glove", "glove_id", "ppe", "bite", "scratch", "wound_washed", "exposure_reported_at", "protocol_id")
	if err != nil {
		return err
	}
	extra := byDay(g.handling)
	for i := range g.opt.Days {
		// Each animal is weighed once every 30 days, on a day set by its number.
		for ai := i % 30; ai < len(g.animals); ai += 30 {
			a := &g.animals[ai]
			if a.noHandlingFrom >= 0 && i >= a.noHandlingFrom {
				continue
			}
			if g.opt.Failing {
				c.row(g.failingWeighing(i, a)...)
				continue
			}
			c.row(stamp(i, "10:00"), a.id, g.keeperOf(a.cage), "weighing", "gloved_hand", "2", "bite_resistant", "", "coverall", "no", "no", "", "", "")
		}
		for _, e := range extra[i] {
			c.row(e.row...)
		}
	}
	return c.close()
}

func byDay(evs []event) map[int][]event {
	m := map[int][]event{}
	for _, e := range evs {
		m[e.day] = append(m[e.day], e)
	}
	for _, l := range m {
		sort.SliceStable(l, func(i, j int) bool { return l[i].at < l[j].at })
	}
	return m
}

func (g *gen) writeEvents(name string, evs []event, header ...string) func(string) error {
	return func(dir string) error {
		c, err := create(dir, name, header...)
		if err != nil {
			return err
		}
		sorted := append([]event(nil), evs...)
		sort.SliceStable(sorted, func(i, j int) bool {
			if sorted[i].day != sorted[j].day {
				return sorted[i].day < sorted[j].day
			}
			return sorted[i].at < sorted[j].at
		})
		for _, e := range sorted {
			c.row(e.row...)
		}
		return c.close()
	}
}

// Reading hours and the shape of the day: coldest at 06:00, warmest and
// driest at 15:00.
var (
	readingHours  = [8]int{0, 3, 6, 9, 12, 15, 18, 21}
	warmthShape   = [8]float64{3, 1, 0, 2, 6, 8, 5, 4}         // °C above the day's minimum
	humidityShape = [8]float64{70, 75, 78, 65, 50, 45, 55, 65} // relative humidity, %
)

// reading is the air, wind and humidity of day i at reading h (0..7). The
// warmest reading of a warm day is below 23 °C, so its heat index stays
// below 25 °C; the warmest of a hot day is 28 °C at 45 % (heat index about
// 28 °C, below the 32 °C extreme caution line); a planted heat peak is 35 °C
// at 50 % (heat index about 41 °C).
func (g *gen) reading(i, h int) (air, wind, humidity float64) {
	wind, humidity = 10, humidityShape[h]
	var low float64
	switch g.kinds[i] {
	case hard:
		low = -15
		if h == 2 {
			wind = 20
			if a, ok := g.snapAir[i]; ok {
				return a, wind, humidity
			}
		}
	case freeze:
		low = -5
	case hot:
		low = 20
		if h == 5 && g.heatPeak[i] {
			return 35, wind, 50
		}
	default:
		s := math.Cos(2 * math.Pi * float64(i) / float64(g.opt.Days))
		low = 2 + 14*math.Min(1, (0.2-s)/1.2)
	}
	return math.Round((low+warmthShape[h])*10) / 10, wind, humidity
}

func (g *gen) writeWeather(dir string) error {
	c, err := create(dir, "weather.csv", "observed_at", "site_id", "air_temp_c", "wind_kmh", "humidity_pct")
	if err != nil {
		return err
	}
	for i := range g.opt.Days {
		for h, hour := range readingHours {
			if h == 4 && g.noNoon[i] {
				continue
			}
			air, wind, humidity := g.reading(i, h)
			c.row(stamp(i, fmt.Sprintf("%02d:00", hour)), site, strconv.FormatFloat(air, 'f', 1, 64), strconv.Itoa(int(wind)), strconv.Itoa(int(humidity)))
		}
	}
	return c.close()
}

// writeEnvironment writes the kennel's readings every three hours: 17.5 to
// 19.5 °C, 50 % humidity, 6 ppm ammonia, with the planted spells and peaks.
func (g *gen) writeEnvironment(dir string) error {
	c, err := create(dir, "environment.csv", "observed_at", "building_id", "air_temp_c", "humidity_pct", "ammonia_ppm")
	if err != nil {
		return err
	}
	shape := [8]string{"18.0", "17.5", "17.5", "18.0", "19.0", "19.5", "19.0", "18.5"}
	for i := range g.opt.Days {
		for h, hour := range readingHours {
			air, humidity, nh3 := shape[h], "50", "6"
			if g.envHot[i] && (h == 4 || h == 5) {
				air = "31.0" // above 29.5 °C from 12:00 to the 18:00 reading back in range: 6 h
			}
			if g.envHumid[i] && h == 4 {
				humidity = "78"
			}
			if g.envNH3[i] && h == 4 {
				nh3 = "32"
			}
			if g.opt.Failing {
				air, humidity, nh3 = "31.0", "80", "32"
			}
			c.row(stamp(i, fmt.Sprintf("%02d:00", hour)), kennel, air, humidity, nh3)
		}
	}
	return c.close()
}

// writeObservations writes every animal's weighing (mass and body
// condition 3 of 5) on the day of its baseline handling weighing, and the
// planted observations.
func (g *gen) writeObservations(dir string) error {
	c, err := create(dir, "observations.csv", "observed_at", "animal_id", "staff_id", "mass_kg", "body_condition", "signs", "vet_informed", "notes")
	if err != nil {
		return err
	}
	extra := byDay(g.obs)
	for i := range g.opt.Days {
		at := stamp(i, "10:00")
		for ai := i % 30; ai < len(g.animals); ai += 30 {
			a := &g.animals[ai]
			if a.noHandlingFrom >= 0 && i >= a.noHandlingFrom {
				continue
			}
			c.row(at, a.id, g.keeperOf(a.cage), a.mass, "3", "", "", "")
		}
		for _, e := range extra[i] {
			c.row(e.row...)
		}
	}
	return c.close()
}

func (g *gen) writeStints(dir string) error {
	c, err := create(dir, "outdoor_work.csv", "staff_id", "started_at", "ended_at", "site_id", "activity")
	if err != nil {
		return err
	}
	extra := byDay(g.stints)
	for i := range g.opt.Days {
		for _, e := range extra[i] {
			c.row(e.row...)
		}
		c.row(g.keepers[0], stamp(i, "09:00"), stamp(i, "09:30"), site, "moderate")
	}
	return c.close()
}

// writeActions writes the committee's corrective actions.
func (g *gen) writeActions(dir string) error {
	c, err := create(dir, "corrective_actions.csv", "check", "subject", "found_on", "plan", "owner", "due_on", "closed_on", "verified_by")
	if err != nil {
		return err
	}
	for _, r := range g.actions {
		c.row(r...)
	}
	return c.close()
}

// reviewPeriod is the previous review's period: the Days days before Start.
func (g *gen) reviewPeriod() (from, to time.Time) {
	return Start.AddDate(0, 0, -g.opt.Days), Start.AddDate(0, 0, -1)
}

// writeReview writes the previous review with Options.Review, if any.
func (g *gen) writeReview(dir string) error {
	if g.opt.Review == nil {
		return nil
	}
	from, to := g.reviewPeriod()
	r := Review{Facility: facilityName, From: dayOf(from), To: dayOf(to), Findings: g.review}
	path := filepath.Join(dir, filepath.FromSlash(PreviousFile))
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	if err := g.opt.Review(w, r); err != nil {
		f.Close()
		return fmt.Errorf("%s: %w", PreviousFile, err)
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
