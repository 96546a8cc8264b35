package demo

// The generator of the demo scenario. Everything is invented: the station,
// the people and the animals. The weather is shaped like a hard prairie
// January but is not any real station's record.
//
// The generator writes the records folder and the answer key
// (testdata/demo/PLANTED.md). Most planted problems are placed by hand below;
// the ones that depend on the weather or on many rows (cold.*, the care runs)
// are computed from the generated rows by small evaluators in this file, so
// the answer key lists every run of days exactly.

import (
	"bytes"
	"encoding/csv"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"welfare/checker/cold"
	"welfare/rules"
)

var update = flag.Bool("update", false, "rewrite the demo records and testdata/demo/PLANTED.md")

const (
	recordsDir  = "birchfall"
	testdataDir = "../../testdata/demo"
	nDays       = 31 // January 2026
	site        = "MAST"
)

// ---- time helpers: every time is a local wall-clock time at the station,
// held in UTC so no time-zone database is needed to generate it.

func jan(d int) time.Time { return time.Date(2026, 1, d, 0, 0, 0, 0, time.UTC) }

func at(d, h, m int) time.Time { return time.Date(2026, 1, d, h, m, 0, 0, time.UTC) }

func date(y int, m time.Month, d int) string {
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC).Format("2006-01-02")
}

func janDate(d int) string { return jan(d).Format("2006-01-02") }

func stamp(t time.Time) string { return t.Format("2006-01-02T15:04") }

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

func num(x float64, prec int) string { return strconv.FormatFloat(x, 'f', prec, 64) }

// ---- CSV tables that remember line numbers (header = line 1).

type table struct {
	name   string
	header []string
	rows   [][]string
}

func (t *table) add(cells ...string) int {
	if len(cells) != len(t.header) {
		panic(fmt.Sprintf("%s: row has %d cells, header %d", t.name, len(cells), len(t.header)))
	}
	t.rows = append(t.rows, cells)
	return len(t.rows) + 1
}

func (t *table) ref(line int) string { return fmt.Sprintf("%s:%d", t.name, line) }

func (t *table) bytes() []byte {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	_ = w.Write(t.header)
	_ = w.WriteAll(t.rows) // WriteAll flushes; bytes.Buffer does not fail
	return b.Bytes()
}

// ---- findings of the answer key

type finding struct {
	check, subject string
	on, until      string // until empty for a single day
}

// runs collapses a per-day condition into runs of consecutive days, as the
// checker reports run checks.
func runs(check, subject string, bad func(d int) bool) []finding {
	var out []finding
	for d := 1; d <= nDays; d++ {
		if !bad(d) {
			continue
		}
		e := d
		for e+1 <= nDays && bad(e+1) {
			e++
		}
		f := finding{check: check, subject: subject, on: janDate(d)}
		if e > d {
			f.until = janDate(e)
		}
		out = append(out, f)
		d = e
	}
	return out
}

// perDay gives one finding per day on which bad holds.
func perDay(check, subject string, bad func(d int) bool) []finding {
	var out []finding
	for d := 1; d <= nDays; d++ {
		if bad(d) {
			out = append(out, finding{check: check, subject: subject, on: janDate(d)})
		}
	}
	return out
}

// ---- weather

type reading struct {
	at   time.Time
	air  float64 // rounded to 0.1 as written
	wind float64 // whole km/h as written
	// windless: written without wind_kmh (generate_missing_test.go)
	windless bool
}

// dayShape is one day's planned weather: minimum and maximum air
// temperature and a typical wind. The month: a mild start, an arctic outbreak
// down to −40 °C (Jan 6–12), a windy spell, a mild middle, a second cold and
// windy spell (Jan 20–24), a thaw on Jan 29 that stays above freezing, and a
// cold last day.
var january = [nDays]struct{ min, max, wind float64 }{
	{-9, -3, 8}, {-12, -5, 10}, {-17, -9, 14}, {-22, -14, 18}, {-27, -18, 15},
	{-31, -22, 12}, {-36, -26, 8}, {-39, -29, 10}, {-40, -30, 6}, {-37, -27, 20},
	{-33, -24, 28}, {-28, -20, 22}, {-24, -15, 15}, {-21, -12, 18}, {-19, -11, 25},
	{-12, -4, 14}, {-8, -2, 10}, {-6, -1, 12}, {-10, -3, 16}, {-18, -9, 30},
	{-26, -16, 32}, {-32, -22, 20}, {-34, -24, 10}, {-29, -20, 14}, {-22, -13, 12},
	{-16, -8, 10}, {-13, -6, 8}, {-7, -1, 16}, {0.8, 3.5, 20}, {-11, -2, 18},
	{-21, -12, 12},
}

// Readings every three hours from midnight; the coldest at 06:00, the
// warmest at 15:00; wind strongest around midday.
var (
	readingHours = [8]int{0, 3, 6, 9, 12, 15, 18, 21}
	tempShape    = [8]float64{0.25, 0.08, 0, 0.35, 0.85, 1.0, 0.6, 0.4}
	windShape    = [8]float64{0.8, 0.55, 0.9, 1.1, 1.3, 1.2, 1.0, 0.9}
)

// ---- the work/warm-up schedule

// schedule is the shipped ACGIH work/warm-up schedule: the demo places its
// cold-work problems against the same table (and the same lookup) the
// checker uses, so the two cannot drift apart.
var schedule = func() *cold.Schedule {
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		panic(err) // the shipped limits are tested in package rules
	}
	s, err := cold.NewSchedule(lim.Cold.WorkWarmup)
	if err != nil {
		panic(err)
	}
	return s
}()

// workLimit returns the maximum work period in minutes (0 = no limit) and
// whether non-emergency work should cease.
func workLimit(air, wind float64, light bool) (limit int, cease bool) {
	activity := "moderate"
	if light {
		activity = "light"
	}
	switch st := schedule.Lookup(air, wind, activity); st.Kind {
	case cold.Limit:
		return st.MaxWorkMin, false
	case cold.Cease:
		return 0, true
	}
	return 0, false
}

// ---- the station

type building struct {
	id, exposure, site string
}

type enclosure struct {
	id, building, kind string
	lengthCm, widthCm  float64
	areaM2             float64 // when set, written as floor_area_m2 instead of length × width
	heightCm           float64
	maxOcc             int
	nestBox, platform  string
}

type animal struct {
	id, species, sex, born, arrived string
	leftDay                         int // January day of left_on; 0 = still here
	leftReason, encl, protocol      string
	mass, length                    float64
	stage                           string
	badSpecies                      string // when set, the planted typo written instead of species
}

type move struct {
	animal, to string
	day        int
}

type person struct {
	id, name, role, from, to         string
	handling, euthanasia, methods    string
	primary, titerOn, titer, booster string
	respirator                       string
	riskCategory                     string // rabies_risk_category; empty: the limits' category
	activeTo                         int    // January day of active_to; 0 = open
}

type round struct {
	at                                  time.Time
	encl, bldg, staff                   string
	observed, fed, feedG, water         string
	restored, bedding, cleaned, concern string
	concernAnimal, notes                string
	rejectWater                         string // planted typo written in the water cell
}

type stint struct {
	staff          string
	start          time.Time
	minutes        int
	activity       string
	emergency      bool
	endBeforeStart bool // planted: ended_at typed earlier than started_at
}

type scenario struct {
	buildings  []building
	enclosures []enclosure
	animals    []animal
	moves      []move
	staff      []person
	readings   []reading
	minAir     [nDays + 1]float64
	minWC      [nDays + 1]float64
	rounds     []round
	stints     []stint
	planted    []finding
	handling   []handlingRow
	computed   []finding           // from the evaluators
	how        map[string][]string // check id -> prose lines
	tables     []*table
}

func (s *scenario) plant(check, subject, on, until, how string) {
	s.planted = append(s.planted, finding{check, subject, on, until})
	if how != "" {
		s.how[check] = append(s.how[check], how)
	}
}

func (s *scenario) explain(check, how string) { s.how[check] = append(s.how[check], how) }

func (s *scenario) encl(id string) *enclosure {
	for i := range s.enclosures {
		if s.enclosures[i].id == id {
			return &s.enclosures[i]
		}
	}
	panic("no enclosure " + id)
}

func (s *scenario) animalByID(id string) *animal {
	for i := range s.animals {
		if s.animals[i].id == id {
			return &s.animals[i]
		}
	}
	panic("no animal " + id)
}

func (s *scenario) buildingOf(enclID string) building {
	e := s.encl(enclID)
	for _, b := range s.buildings {
		if b.id == e.building {
			return b
		}
	}
	panic("no building " + e.building)
}

// enclosureOn is the animal's enclosure on January day d ("" when absent):
// housing moves count in the new enclosure on the day of the move, and an
// animal is present from arrival to its last day (left_on) inclusive.
func (s *scenario) enclosureOn(a *animal, d int) string {
	if a.badSpecies != "" || a.arrived > janDate(d) || (a.leftDay != 0 && d > a.leftDay) {
		return ""
	}
	where := a.encl
	for _, m := range s.moves {
		if m.animal == a.id && d >= m.day {
			where = m.to
		}
	}
	return where
}

func (s *scenario) occupants(enclID string, d int) []*animal {
	var out []*animal
	for i := range s.animals {
		if s.enclosureOn(&s.animals[i], d) == enclID {
			out = append(out, &s.animals[i])
		}
	}
	return out
}

func generate() (*scenario, error) {
	s := &scenario{how: map[string][]string{}}
	rng := rand.New(rand.NewPCG(20260101, 42)) // fixed seed: the demo must be reproducible
	s.buildStation()
	h := s.buildHealth()
	s.vetStation()
	s.missingStation()
	s.buildWeather(rng)
	s.missingWeather()
	s.buildStaff()
	s.vetStaff()
	s.buildRounds()
	s.vetRounds()
	s.buildStints()
	if err := s.writeTables(); err != nil {
		return nil, err
	}
	if err := s.writeHealthTables(h); err != nil {
		return nil, err
	}
	s.correctionTables()
	s.evaluate()
	s.evaluateMissing()
	return s, nil
}

func (s *scenario) buildStation() {
	for i := 1; i <= 4; i++ {
		s.buildings = append(s.buildings, building{fmt.Sprintf("S%d", i), "outdoor", site})
	}
	s.buildings = append(s.buildings,
		building{"AB", "sheltered", site}, // arctic fox house: roofed, open-sided
		building{"MB", "sheltered", site}, // mink barn
		building{"KB", "indoor", ""},      // heated kennel room
	)
	// Red-fox sheds: single cages of about 1 m², nest box and platform (common practice).
	for shed := 1; shed <= 4; shed++ {
		l, w, h := 120.0, 85.0, 78.0
		if shed >= 3 {
			l, w, h = 105, 95, 75
		}
		n := 24
		if shed == 2 {
			n = 25 // S2-25: spare cage used when S2-07 is repaired
		}
		for c := 1; c <= n; c++ {
			e := enclosure{id: fmt.Sprintf("S%d-%02d", shed, c), building: fmt.Sprintf("S%d", shed), kind: "cage",
				lengthCm: l, widthCm: w, heightCm: h, maxOcc: 1, nestBox: "yes", platform: "yes"}
			s.enclosures = append(s.enclosures, e)
			if c == 25 {
				continue
			}
			id := fmt.Sprintf("RF-%d%02d", shed, c)
			sex, born := "f", date(2024, time.May, 2+c%9)
			if c%2 == 0 {
				sex = "m"
			}
			if c > 16 { // this year's kept young stock: adults by age in January
				born = date(2025, time.May, 1+c%12)
			}
			s.animals = append(s.animals, animal{id: id, species: "vulpes_vulpes", sex: sex, born: born, arrived: born,
				encl: e.id, protocol: "BFR-RF-01", mass: 6.2 + float64((c*7)%25)/10, length: 64 + float64((c*3)%10)})
		}
	}
	s.encl("S2-05").platform = "no"
	s.encl("S3-12").nestBox = "no"
	s.moves = append(s.moves, move{"RF-207", "S2-25", 19})

	// Arctic foxes in the sheltered house, held under the arctic-fox protocol.
	for c := 1; c <= 8; c++ {
		e := enclosure{id: fmt.Sprintf("AB-%02d", c), building: "AB", kind: "cage", areaM2: 0.96, heightCm: 80,
			maxOcc: 1, nestBox: "yes", platform: "yes"}
		if c == 5 {
			e.heightCm = 65 // planted: an older cage, lower than 70 cm
		}
		s.enclosures = append(s.enclosures, e)
		if c > 7 {
			continue
		}
		a := animal{id: fmt.Sprintf("AF-%02d", c), species: "vulpes_lagopus", sex: map[bool]string{true: "f", false: "m"}[c%2 == 1],
			born: date(2025, time.May, 20+c), arrived: "2025-10-20", encl: e.id, protocol: "BFR-AF-02",
			mass: 3.6 + float64(c)/10, length: 58 + float64(c)}
		if c == 7 {
			a.born, a.arrived = "2025-06-01", janDate(14)
		}
		s.animals = append(s.animals, a)
	}

	// Mink: single cages, 90 × 30 cm, 45 cm high, nest box (common practice).
	for c := 1; c <= 8; c++ {
		e := enclosure{id: fmt.Sprintf("MB-%02d", c), building: "MB", kind: "cage", lengthCm: 90, widthCm: 30, heightCm: 45,
			maxOcc: 1, nestBox: "yes", platform: "no"}
		if c == 7 {
			e.widthCm = 60 // a double cage, room for two, but the station set its capacity to one
		}
		s.enclosures = append(s.enclosures, e)
		s.animals = append(s.animals, animal{id: fmt.Sprintf("NV-%02d", c), species: "neogale_vison", sex: map[bool]string{true: "f", false: "m"}[c%2 == 1],
			born: date(2025, time.May, 3+c), arrived: date(2025, time.May, 3+c), encl: e.id, mass: 1.1 + float64(c%4)/10})
	}
	s.moves = append(s.moves, move{"NV-08", "MB-07", 10})

	// The station's dog in the heated kennel room; its run is checked with the
	// 9 CFR §3.6(c)(1) formula, which needs length_cm.
	s.enclosures = append(s.enclosures, enclosure{id: "K-01", building: "KB", kind: "run", lengthCm: 110, widthCm: 95,
		heightCm: 180, maxOcc: 1, nestBox: "no", platform: "no"})
	s.animals = append(s.animals, animal{id: "DG-01", species: "canis_familiaris", sex: "f", born: "2021-03-15",
		arrived: "2022-06-01", encl: "K-01", mass: 31, length: 90})

	// Planted record-keeping typo: an unknown species code.
	s.animals = append(s.animals, animal{id: "RF-499", species: "vulpes_vulpes", badSpecies: "vulpes_vulpse", sex: "m",
		born: "2025-05-02", arrived: janDate(5), mass: 7.0, length: 68})

	// Departures in January (culls; RF-111's death is written as "died").
	for _, c := range []struct {
		id     string
		day    int
		reason string
	}{
		{"RF-121", 9, "culled"}, {"RF-215", 11, "culled"}, {"RF-309", 16, "culled"}, {"AF-06", 20, "culled"},
		{"NV-01", 24, "culled"}, {"NV-04", 26, "culled"}, {"RF-404", 27, "culled"}, {"RF-111", 28, "died"},
	} {
		a := s.animalByID(c.id)
		a.leftDay, a.leftReason = c.day, c.reason
	}
}

func (s *scenario) buildWeather(rng *rand.Rand) {
	for d := 1; d <= nDays; d++ {
		p := january[d-1]
		s.minAir[d], s.minWC[d] = math.Inf(1), math.Inf(1)
		for i, h := range readingHours {
			air := math.Round((p.min+(p.max-p.min)*tempShape[i])*10) / 10
			wind := math.Max(0, math.Round(p.wind*windShape[i])+float64(rng.IntN(5)-2))
			s.readings = append(s.readings, reading{at: at(d, h, 0), air: air, wind: wind})
			s.minAir[d] = math.Min(s.minAir[d], air)
			s.minWC[d] = math.Min(s.minWC[d], cold.WindChillC(air, wind))
		}
	}
}

// readingFor is the latest reading at or before t within 3 hours.
func (s *scenario) readingFor(t time.Time) reading {
	var best reading
	for _, r := range s.readings {
		if !r.at.After(t) && t.Sub(r.at) <= 3*time.Hour {
			best = r
		}
	}
	return best
}

func (s *scenario) buildStaff() {
	s.staff = []person{
		{id: "ST-01", name: "Hanna Kowalczyk", role: "supervisor", from: "2016-04-01", handling: "2025-06-10",
			euthanasia: "2025-06-12", methods: "barbiturate_overdose;electrocution_oral_rectal;gunshot",
			primary: "2020-03-02", titerOn: "2022-04-11", titer: "2.1", respirator: "2025-09-01"},
		{id: "ST-02", name: "Zoë Lefèvre-Amundsen", role: "veterinarian", from: "2018-08-20", handling: "2025-05-20",
			euthanasia: "2025-05-20", methods: "barbiturate_overdose;potassium_chloride;penetrating_captive_bolt;carbon_monoxide;carbon_dioxide",
			primary: "2018-09-10", booster: "2020-10-05", respirator: "2024-08-14"},
		{id: "ST-03", name: "Łucja Wiśniewska", role: "technician", from: "2023-01-09", handling: "2025-09-03",
			euthanasia: "2025-09-03", methods: "barbiturate_overdose;carbon_monoxide;carbon_dioxide;cervical_dislocation",
			primary: "2024-02-12", respirator: "2025-10-01"},
		{id: "ST-04", name: "Tomas Brandvold", role: "keeper", from: "2019-05-13", handling: "2025-04-22",
			euthanasia: "2024-10-15", methods: "electrocution_oral_rectal", primary: "2023-11-06"},
		{id: "ST-05", name: "Aino Halvorsen", role: "keeper", from: "2024-03-04", handling: "2025-02-14", primary: "2025-03-03"},
		{id: "ST-06", name: "Dale Oyelaran", role: "keeper", from: "2022-10-03", handling: "2024-12-02", primary: "2024-06-01"},
		{id: "ST-07", name: "Priya Castellanos", role: "technician", from: "2021-04-19", handling: "2025-08-18", primary: "2021-05-10"},
		{id: "ST-08", name: "Ruben Falk", role: "keeper", from: "2025-09-29", handling: "2025-10-06"},
		{id: "ST-09", name: "Ines Marchetti", role: "keeper", from: "2022-07-11", to: "2026-01-15", activeTo: 15,
			handling: "2025-03-30", primary: "2022-08-15", titerOn: "2024-02-20", titer: "0.9"},
	}
}

func (s *scenario) active(staffID string, d int) bool {
	for _, p := range s.staff {
		if p.id == staffID {
			return p.activeTo == 0 || d <= p.activeTo
		}
	}
	return false
}

// keepersOn are the keepers on the fox sheds on day d: two of the rota.
func (s *scenario) keepersOn(d int) (string, string) {
	rota := []string{"ST-04", "ST-05", "ST-06", "ST-08"}
	if s.active("ST-09", d) {
		rota = append(rota, "ST-09")
	}
	return rota[d%len(rota)], rota[(d+1)%len(rota)]
}

var beddingDays = []int{1, 4, 8, 11, 15, 18, 22, 25, 29}

func (s *scenario) buildRounds() {
	feed := map[string]string{"S": "480", "AB": "420", "MB": "210", "KB": "650"}
	for d := 1; d <= nDays; d++ {
		k1, k2 := s.keepersOn(d)
		bedding := slices.Contains(beddingDays, d)
		for _, b := range s.buildings {
			staff := map[string]string{"S1": k1, "S2": k1, "S3": k2, "S4": k2, "AB": "ST-03", "MB": "ST-07", "KB": "ST-05"}[b.id]
			kind := b.id
			if strings.HasPrefix(kind, "S") {
				kind = "S"
			}
			for slot, t := range []time.Time{at(d, 7, 30), at(d, 15, 30)} {
				r := round{at: t, bldg: b.id, staff: staff, observed: "yes", water: "ok"}
				if slot == 0 {
					r.fed, r.feedG = "yes", feed[kind]
					if b.exposure != "indoor" && s.minAir[d] < -15 {
						r.water, r.restored = "frozen", "yes" // drinkers freeze overnight; keepers bring warm water
					}
					if b.exposure != "indoor" && bedding {
						r.bedding = "yes"
					}
					if d%7 == 3 {
						r.cleaned = "yes"
					}
				} else if s.minAir[d] < -25 && b.exposure != "indoor" {
					r.water = "low"
				}
				if b.id == "S1" && d == 16 && slot == 0 {
					r.staff = "ST-09" // planted staff.inactive: Ines left on Jan 15
					s.plant("staff.inactive", "ST-09", janDate(d), "",
						"Ines (ST-09, active_to 2026-01-15) is named on the S1 morning round of Jan 16; no other row names her after Jan 15.")
				}
				s.addRounds(b, d, slot, r)
			}
			// Extra single-enclosure rounds.
			switch {
			case b.id == "S1" && d == 7:
				s.rounds = append(s.rounds, round{at: at(d, 10, 5), encl: "S1-04", staff: k1, observed: "yes", water: "frozen",
					restored: "yes", rejectWater: "frozn", notes: "drinker re-filled"})
			case b.id == "S2" && d == 8:
				s.rounds = append(s.rounds, round{at: at(d, 11, 0), encl: "S2-11", staff: k1, observed: "yes", water: "frozen",
					restored: "no", notes: "drinker frozen solid; heater fault reported"})
			case b.id == "S3" && d == 19:
				s.rounds = append(s.rounds, round{at: at(d, 8, 10), encl: "S3-17", staff: k2, observed: "yes",
					concern: "yes", concernAnimal: "RF-317", notes: "limping, left fore"})
			case b.id == "AB" && d == 25:
				s.rounds = append(s.rounds, round{at: at(d, 8, 20), encl: "AB-04", staff: "ST-03", observed: "yes",
					concern: "yes", concernAnimal: "AF-04", notes: "off feed, dull coat"})
			}
		}
	}
}

// mbOverride applies the planted mink-barn differences for one cage and
// round; it reports whether anything differs from the building round.
func mbOverride(e string, d, slot int, r *round) bool {
	switch {
	case e == "MB-03" && (d == 17 || d == 18):
		r.observed, r.notes = "no", "fed through the hatch; animal not seen"
		return true
	case e == "MB-05" && d == 22 && slot == 0:
		r.fed, r.feedG, r.notes = "no", "", "feed cart empty at this end"
		return true
	case e == "MB-02" && d == 27 && slot == 1:
		r.water = "not_checked"
		return true
	case e == "MB-06" && slot == 0 && r.bedding == "yes" && d >= 11 && d <= 18:
		r.bedding, r.notes = "no", "bedding bale wet, not used"
		return true
	}
	return false
}

// addRounds writes the building round, or one round per cage when a planted
// problem makes one cage differ that day.
func (s *scenario) addRounds(b building, d, slot int, r round) {
	if b.id == "MB" {
		var per []round
		differs := false
		for _, e := range s.enclosures {
			if e.building != "MB" {
				continue
			}
			c := r
			c.bldg, c.encl = "", e.id
			if mbOverride(e.id, d, slot, &c) {
				differs = true
			}
			per = append(per, c)
		}
		if differs {
			s.rounds = append(s.rounds, per...)
			return
		}
	}
	s.rounds = append(s.rounds, r)
}

func (s *scenario) buildStints() {
	for d := 1; d <= nDays; d++ {
		k1, k2 := s.keepersOn(d)
		for _, k := range []string{k1, k2} {
			for _, start := range []time.Time{at(d, 7, 15), at(d, 15, 10)} {
				planned, activity := 50, "moderate"
				if k == "ST-08" {
					activity = "light" // new keeper: light tasks
				}
				rd := s.readingFor(start)
				if activity == "light" && math.Floor(rd.air) >= -25 {
					// Whether light work at −25 °C or warmer reads the −26 row is
					// not settled; 35 min is under every limit of that row.
					planned = 35
				}
				st := stint{staff: k, start: start, minutes: planned, activity: activity}
				limit, cease := workLimit(rd.air, rd.wind, activity == "light")
				switch {
				case cease:
					// The station treats feeding and watering in cease-work
					// weather as a welfare emergency: short and recorded so.
					st.minutes, st.emergency = 20, true
				case limit > 0:
					st.minutes = min(planned, limit-5)
				}
				s.stints = append(s.stints, st)
			}
		}
	}
	// Planted stints: one over the schedule's maximum, one in cease-work
	// weather without an emergency. Found from the weather, first match.
	for d := 1; d <= nDays; d++ {
		rd := s.readingFor(at(d, 9, 20))
		if limit, _ := workLimit(rd.air, rd.wind, false); limit > 0 {
			s.stints = append(s.stints, stint{staff: "ST-01", start: at(d, 9, 20), minutes: limit + 20, activity: "heavy"})
			s.plant("cold.work.over_limit", "ST-01", janDate(d), "", fmt.Sprintf(
				"Hanna (ST-01) recorded a heavy stint of %d min from %s; the 09:00 reading (%.1f °C, %.0f km/h) allows %d min.",
				limit+20, stamp(at(d, 9, 20)), rd.air, rd.wind, limit))
			break
		}
	}
ceaseSearch:
	for d := 1; d <= nDays; d++ {
		for _, h := range []int{12, 9, 6} {
			start := at(d, h, 20)
			rd := s.readingFor(start)
			if _, cease := workLimit(rd.air, rd.wind, false); cease {
				s.stints = append(s.stints, stint{staff: "ST-06", start: start, minutes: 25, activity: "moderate"})
				s.plant("cold.work.should_cease", "ST-06", janDate(d), "", fmt.Sprintf(
					"Dale (ST-06) recorded a 25-min moderate stint, not marked emergency, from %s; the %02d:00 reading (%.1f °C, %.0f km/h) is a cease-work cell.",
					stamp(start), h, rd.air, rd.wind))
				break ceaseSearch
			}
		}
	}
	// An emergency stint in the coldest weather is exempt; one stint typed
	// with its end before its start is a rejected row.
	s.stints = append(s.stints,
		stint{staff: "ST-01", start: at(9, 5, 40), minutes: 35, activity: "heavy", emergency: true},
		stint{staff: "ST-04", start: at(12, 11, 40), minutes: 36, activity: "moderate", endBeforeStart: true})
}

// ---- writing the tables, with the hand-placed plants

type handlingRow struct {
	at                                time.Time
	badStamp                          string // planted unreadable date-time
	animal, staff, purpose, restraint string
	minutes                           float64
	glove, gloveID                    string
	thickness                         float64
	ppe                               string
	bite, scratch, washed             string
	reported                          time.Time
	protocol                          string
}

var gloveOf = map[string]string{
	"ST-01": "GL-01", "ST-02": "GL-02", "ST-03": "GL-03", "ST-04": "GL-04", "ST-05": "GL-05",
	"ST-06": "GL-06", "ST-07": "GL-07", "ST-08": "GL-08", "ST-09": "GL-09",
}

// fox is a conscious fox handled with the handler's own bite-resistant glove
// and a coverall: the station's normal way.
func fox(t time.Time, animal, staff, purpose string, minutes float64) handlingRow {
	return handlingRow{at: t, animal: animal, staff: staff, purpose: purpose, restraint: "gloved_hand", minutes: minutes,
		glove: "bite_resistant", gloveID: gloveOf[staff], thickness: 3.0, ppe: "coverall;eye_protection"}
}

func (s *scenario) handlingRows() []handlingRow {
	special := map[string]bool{}
	for _, id := range strings.Fields("RF-108 RF-111 RF-118 RF-120 RF-121 RF-207 RF-210 RF-215 RF-223 RF-305 RF-309 RF-312 RF-317 RF-402 RF-404 RF-406 RF-407 RF-409 RF-412") {
		special[id] = true
	}
	var pool []string
	for shed := 1; shed <= 4; shed++ {
		for c := 1; c <= 24; c++ {
			if id := fmt.Sprintf("RF-%d%02d", shed, c); !special[id] {
				pool = append(pool, id)
			}
		}
	}
	var hs []handlingRow
	// Temperament tests of the red foxes, weekdays from Jan 12 (the fox
	// protocol was approved on Jan 8).
	next := 0
	for _, d := range []int{12, 13, 14, 15, 16, 19, 20, 21, 22, 23} {
		handlers := []string{"ST-03", "ST-05", "ST-09"}
		if d >= 15 {
			handlers = []string{"ST-03", "ST-05", "ST-04"}
		}
		for i := range 4 {
			hs = append(hs, fox(at(d, 9, 10+15*i), pool[next], handlers[i%3], "temperament_test", float64(2+i%3)))
			next++
		}
	}
	// Arctic foxes weighed in a restraint box with the shared gauntlet.
	for _, d := range []int{9, 23} {
		for c := 1; c <= 7; c++ {
			a := s.animalByID(fmt.Sprintf("AF-%02d", c))
			if s.enclosureOn(a, d) == "" {
				continue
			}
			h := handlingRow{at: at(d, 13, 5*c), animal: a.id, staff: "ST-03", purpose: "weighing", restraint: "restraint_box",
				minutes: 4, glove: "gauntlet", gloveID: "GT-01", thickness: 4.5, ppe: "coverall"}
			if a.id == "AF-03" && d == 23 { // planted: scratch reported two days later
				h.scratch, h.washed, h.reported = "yes", "yes", at(25, 14, 0)
			}
			hs = append(hs, h)
		}
	}
	// Mink health checks by the barn technician.
	for c := 1; c <= 8; c++ {
		hs = append(hs, handlingRow{at: at(13, 14, 4*c), animal: fmt.Sprintf("NV-%02d", c), staff: "ST-07", purpose: "health_check",
			restraint: "gloved_hand", minutes: 2, glove: "bite_resistant", gloveID: "GL-07", thickness: 3.0, ppe: "coverall"})
	}
	// The dog's yearly exam (not a bite-risk species at this station).
	hs = append(hs, handlingRow{at: at(14, 10, 30), animal: "DG-01", staff: "ST-02", purpose: "vet_exam", restraint: "none",
		minutes: 20, glove: "nitrile", ppe: "coverall"})
	// A vet exam under sedation before a humane endpoint; an answered concern;
	// a respirator used by a fit-tested technician; a bite handled correctly.
	hs = append(hs,
		handlingRow{at: at(9, 9, 30), animal: "RF-121", staff: "ST-02", purpose: "vet_exam", restraint: "sedation", minutes: 25,
			glove: "nitrile", ppe: "coverall;eye_protection"},
		fox(at(19, 11, 0), "RF-317", "ST-02", "health_check", 8),
		handlingRow{at: at(27, 10, 0), animal: "NV-05", staff: "ST-03", purpose: "sampling", restraint: "anaesthesia", minutes: 12,
			glove: "nitrile", ppe: "coverall;respirator"},
	)
	clean := fox(at(20, 9, 50), "RF-402", "ST-05", "temperament_test", 3)
	clean.bite, clean.washed, clean.reported = "yes", "yes", at(20, 10, 20)
	hs = append(hs, clean)

	// Planted handling rows.
	p := func(h handlingRow, check, subject, how string) {
		hs = append(hs, h)
		s.plant(check, subject, h.at.Format("2006-01-02"), "", how)
	}
	p(fox(at(6, 10, 0), "RF-108", "ST-01", "weighing", 3), "protocol.inactive", "BFR-RF-01",
		"RF-108 was weighed on Jan 6 under BFR-RF-01, whose renewal was approved only on Jan 8 (approved_on 2026-01-08).")
	p(fox(at(13, 9, 5), "RF-215", "ST-05", "weighing", 3), "records.event.after_departure", "RF-215",
		"RF-215 was culled on Jan 11 (left_on 2026-01-11) but a weighing of it is recorded on Jan 13.")
	h := fox(at(15, 10, 30), "RF-305", "ST-05", "temperament_test", 4)
	h.glove, h.gloveID, h.thickness = "leather", "", 0
	p(h, "handling.glove.inadequate", "RF-305", "RF-305 was temperament-tested with an ordinary leather glove.")
	h = fox(at(19, 14, 0), "RF-118", "ST-01", "weighing", 3)
	h.thickness = 1.5
	p(h, "handling.glove.inadequate", "RF-118", "RF-118 was weighed with a bite-resistant glove recorded as 1.5 mm thick (minimum 2 mm).")
	h = fox(at(22, 11, 0), "RF-210", "ST-03", "health_check", 6)
	h.ppe = "eye_protection"
	p(h, "handling.ppe.missing", "RF-210", "RF-210's health check lists eye protection but no coverall.")
	p(fox(at(21, 10, 45), "RF-412", "ST-05", "temperament_test", 9), "handling.duration.exceeded", "RF-412",
		"RF-412's temperament test took 9 min (limit 5).")
	h = fox(at(16, 9, 55), "RF-223", "ST-04", "temperament_test", 3)
	h.bite, h.washed, h.reported = "yes", "no", at(16, 11, 0)
	p(h, "handling.bite.not_washed", "RF-223", "Tomas was bitten by RF-223; wound_washed is no (the bite was reported within the hour).")
	s.plant("handling.bite.not_reported", "AF-03", janDate(23), "",
		"Łucja was scratched weighing AF-03 on Jan 23 at 13:15; washed, but reported only on Jan 25 at 14:00 (49 h).")
	p(fox(at(14, 13, 30), "RF-120", "ST-06", "weighing", 3), "staff.handling.untrained", "ST-06",
		"Dale (ST-06) weighed RF-120; his handling training (2024-12-02) is more than 12 months old.")
	p(fox(at(16, 10, 20), "RF-406", "ST-10", "temperament_test", 3), "staff.rabies.unprotected", "ST-10",
		"Mira (ST-10) has no rabies pre-exposure series recorded and temperament-tested RF-406.")
	hs = append(hs, s.vetHandling()...)
	p(fox(at(13, 15, 0), "RF-407", "ST-07", "temperament_test", 3), "staff.rabies.followup_overdue", "ST-07",
		"Priya (ST-07) completed her primary series on 2021-05-10 (over 3 years ago) with no titer or booster since, and handled RF-407.")
	p(handlingRow{at: at(21, 13, 0), animal: "AF-01", staff: "ST-02", purpose: "sampling", restraint: "sedation", minutes: 15,
		glove: "nitrile", ppe: "coverall;respirator"}, "staff.respirator.fit_overdue", "ST-02",
		"Zoë (ST-02) wore a respirator sampling AF-01; her last fit test was 2024-08-14.")
	h = handlingRow{at: at(20, 14, 10), animal: "NV-02", staff: "ST-07", purpose: "weighing", restraint: "gloved_hand", minutes: 2,
		glove: "bite_resistant", gloveID: "GL-07", thickness: 3.0, ppe: "coverall"}
	p(h, "ppe.inspection.overdue", "GL-07", "Glove GL-07 missed its Jan 15 inspection (checked Jan 8 and Jan 22) and was used on Jan 20.")
	p(fox(at(12, 9, 55), "RF-409", "ST-04", "temperament_test", 3), "ppe.damaged.used", "GL-04",
		"Glove GL-04 was found damaged and kept on Jan 8 (replaced only on Jan 13) and was used on Jan 12.")
	h = handlingRow{at: at(15, 13, 40), animal: "AF-02", staff: "ST-03", purpose: "temperament_test", restraint: "gloved_hand",
		minutes: 3, glove: "gauntlet", gloveID: "GT-01", thickness: 4.5, ppe: "coverall"}
	p(h, "protocol.procedure.unapproved", "BFR-AF-02", "AF-02 was temperament-tested; the arctic-fox protocol does not list temperament_test.")

	sort.SliceStable(hs, func(i, j int) bool { return hs[i].at.Before(hs[j].at) })
	return hs
}

func (s *scenario) writeTables() error {
	var files []*table
	newTable := func(name string, cols string) *table {
		t := &table{name: name, header: strings.Split(cols, ",")}
		files = append(files, t)
		return t
	}

	// animals.csv
	an := newTable("animals.csv", "animal_id,species,sex,born_on,arrived_on,left_on,left_reason,enclosure_id,protocol_id,mass_kg,length_cm,life_stage")
	for _, a := range s.animals {
		sp, left, home := a.species, "", a.encl
		if a.badSpecies != "" {
			sp = a.badSpecies
		}
		if a.leftDay != 0 {
			left = janDate(a.leftDay)
		}
		for _, m := range s.moves {
			if m.animal == a.id {
				home = m.to // the home enclosure now; housing.csv has the history
			}
		}
		length := ""
		if a.length > 0 {
			length = num(a.length, 0)
		}
		line := an.add(a.id, sp, a.sex, a.born, a.arrived, left, a.leftReason, home, a.protocol, num(a.mass, 1), length, a.stage)
		if a.badSpecies != "" {
			s.plant("records.row.rejected", an.ref(line), a.arrived, "", fmt.Sprintf(
				"%s: animal RF-499, bought in on Jan 5, has species %q, a typo for vulpes_vulpes (no such species profile). The row's date is its arrived_on. It has no housing row, so nothing else refers to it.",
				an.ref(line), a.badSpecies))
		}
	}

	// enclosures.csv
	en := newTable("enclosures.csv", "enclosure_id,building_id,kind,length_cm,width_cm,floor_area_m2,height_cm,max_occupants,nest_box,platform")
	for _, e := range s.enclosures {
		l, w, area := num(e.lengthCm, 0), num(e.widthCm, 0), ""
		if e.areaM2 > 0 {
			l, w, area = "", "", num(e.areaM2, 2)
		}
		en.add(e.id, e.building, e.kind, l, w, area, num(e.heightCm, 0), strconv.Itoa(e.maxOcc), e.nestBox, e.platform)
	}

	// housing.csv: every animal's stays; a move closes the old stay on the
	// day of the move (the animal counts in its new enclosure that day).
	ho := newTable("housing.csv", "animal_id,enclosure_id,moved_in_on,moved_out_on")
	for _, a := range s.animals {
		if a.badSpecies != "" {
			continue
		}
		from, where := a.arrived, a.encl
		for _, m := range s.moves {
			if m.animal == a.id {
				ho.add(a.id, where, from, janDate(m.day))
				from, where = janDate(m.day), m.to
			}
		}
		ho.add(a.id, where, from, "")
	}

	// staff.csv
	st := newTable("staff.csv", "staff_id,name,role,active_from,active_to,handling_trained_on,euthanasia_trained_on,euthanasia_methods,rabies_primary_on,rabies_titer_on,rabies_titer_iu_ml,rabies_booster_on,respirator_fit_on,rabies_risk_category")
	for _, p := range s.staff {
		st.add(p.id, p.name, p.role, p.from, p.to, p.handling, p.euthanasia, p.methods, p.primary, p.titerOn, p.titer, p.booster, p.respirator, p.riskCategory)
	}

	// protocols.csv
	pr := newTable("protocols.csv", "protocol_id,title,approved_on,expires_on,species,max_animals,procedures,euthanasia_methods,personnel,last_reviewed_on,pain_category")
	pr.add(append([]string{"BFR-RF-01", "Temperament selection and winter welfare of farmed red foxes", "2026-01-08", "2029-01-07", "vulpes_vulpes", "120",
		"temperament_test;health_check;vet_exam;treatment;weighing;transfer", "barbiturate_overdose;electrocution_oral_rectal;gunshot"}, s.vetProtocolColumns("BFR-RF-01")...)...)
	pr.add(append([]string{"BFR-AF-02", "Winter coat and thermoregulation in arctic foxes", "2023-02-21", "2026-02-20", "vulpes_lagopus", "6",
		"health_check;vet_exam;treatment;weighing;sampling", "barbiturate_overdose;potassium_chloride"}, s.vetProtocolColumns("BFR-AF-02")...)...)
	pr.add(append([]string{"BFR-NV-03", "Nest use of farmed mink in winter", "2021-11-15", "2026-11-14", "neogale_vison", "",
		"health_check;weighing", ""}, s.vetProtocolColumns("BFR-NV-03")...)...)
	s.plant("protocol.expiring", "BFR-AF-02", "2026-02-20", "", "BFR-AF-02 expires on 2026-02-20, within 30 days after the period ends.")
	s.plant("protocol.animals.exceeded", "BFR-AF-02", janDate(14), "",
		"BFR-AF-02 allows 6 animals; AF-01…AF-06 arrived in October and AF-07 arrived on Jan 14, the seventh.")

	// daily_care.csv
	dc := newTable("daily_care.csv", "checked_at,enclosure_id,building_id,staff_id,observed,fed,feed_g,water,water_restored,bedding_added,cleaned,health_concern,concern_animal_id,notes")
	for _, r := range s.rounds {
		water := r.water
		if r.rejectWater != "" {
			water = r.rejectWater
		}
		line := dc.add(stamp(r.at), r.encl, r.bldg, r.staff, r.observed, r.fed, r.feedG, water, r.restored, r.bedding, r.cleaned,
			r.concern, r.concernAnimal, r.notes)
		if r.rejectWater != "" {
			s.plant("records.row.rejected", dc.ref(line), r.at.Format("2006-01-02"), "", fmt.Sprintf(
				"%s: water %q is a typo for frozen (not one of the allowed states).", dc.ref(line), r.rejectWater))
		}
	}

	// handling.csv
	hd := newTable("handling.csv", "handled_at,animal_id,staff_id,purpose,restraint,duration_min,glove,glove_id,glove_thickness_mm,ppe,bite,scratch,wound_washed,exposure_reported_at,protocol_id")
	hs := s.handlingRows()
	bad := handlingRow{at: at(23, 10, 15), badStamp: "2026-01-32T10:15", animal: "RF-301", staff: "ST-03", purpose: "weighing",
		restraint: "gloved_hand", minutes: 3, glove: "bite_resistant", gloveID: "GL-03", thickness: 3.0, ppe: "coverall"}
	i := sort.Search(len(hs), func(i int) bool { return !hs[i].at.Before(bad.at) })
	hs = slices.Insert(hs, i, bad)
	for _, h := range hs {
		when := stamp(h.at)
		if h.badStamp != "" {
			when = h.badStamp
		}
		th, rep, mins := "", "", num(h.minutes, 0)
		if h.thickness > 0 {
			th = num(h.thickness, 1)
		}
		if !h.reported.IsZero() {
			rep = stamp(h.reported)
		}
		line := hd.add(when, h.animal, h.staff, h.purpose, h.restraint, mins, h.glove, h.gloveID, th, h.ppe, h.bite, h.scratch, h.washed, rep, h.protocol)
		if h.badStamp != "" {
			s.plant("records.row.rejected", hd.ref(line), janDate(1), "", fmt.Sprintf(
				"%s: handled_at %q is not a date (digits swapped for Jan 23). The row has no readable date, so the finding is placed on the first day of the checked period, 2026-01-01 (checks.md leaves this open; the shipped rule does so).", hd.ref(line), h.badStamp))
		}
	}
	s.handling = hs

	// ppe_checks.csv: every bite glove and the gauntlet on Thursdays.
	pc := newTable("ppe_checks.csv", "checked_on,item_id,item,assigned_to,condition,action")
	for _, d := range []int{1, 8, 13, 15, 22, 29} {
		for _, p := range s.staff {
			id := gloveOf[p.id]
			cond, action := "good", "kept"
			switch {
			case d == 13 && id != "GL-04":
				continue
			case id == "GL-07" && d == 15:
				continue // planted: inspection skipped
			case id == "GL-04" && d == 8:
				cond, action = "damaged", "kept" // planted: torn cuff, kept in use
			case id == "GL-04" && d == 13:
				cond, action = "damaged", "replaced"
			case id == "GL-09" && d > 15:
				continue // withdrawn when Ines left
			case id == "GL-09" && d == 15:
				action = "withdrawn"
			case (d+len(p.id)+int(p.id[4]))%5 == 0:
				cond = "worn"
			}
			pc.add(janDate(d), id, "glove", p.id, cond, action)
		}
		if d != 13 {
			pc.add(janDate(d), "GT-01", "gauntlet", "", "good", "kept")
		}
	}

	// weather.csv, with one planted impossible reading.
	we := newTable("weather.csv", "observed_at,site_id,air_temp_c,wind_kmh")
	for _, r := range s.readings {
		we.add(stamp(r.at), site, num(r.air, 1), windCell(r))
		if r.at.Equal(at(17, 12, 0)) {
			line := we.add(stamp(at(17, 13, 30)), site, "-90.0", "12")
			s.plant("records.row.rejected", we.ref(line), janDate(17), "", fmt.Sprintf(
				"%s: an extra hand reading of −90.0 °C on a mild day (−9.0 was meant); outside −80…+60 °C.", we.ref(line)))
		}
	}

	// outdoor_work.csv
	ow := newTable("outdoor_work.csv", "staff_id,started_at,ended_at,site_id,activity,emergency")
	sort.SliceStable(s.stints, func(i, j int) bool { return s.stints[i].start.Before(s.stints[j].start) })
	for _, w := range s.stints {
		end := w.start.Add(time.Duration(w.minutes) * time.Minute)
		if w.endBeforeStart {
			end = at(12, 11, 4)
		}
		line := ow.add(w.staff, stamp(w.start), stamp(end), site, w.activity, yesNo(w.emergency))
		if w.endBeforeStart {
			s.plant("records.row.rejected", ow.ref(line), janDate(12), "", fmt.Sprintf(
				"%s: ended_at 11:04 is before started_at 11:40 (typed for 12:16).", ow.ref(line)))
		}
	}

	// culls.csv
	cu := newTable("culls.csv", "culled_at,animal_id,staff_id,reason,method,sedated,anaesthetised,death_confirmed,confirmation,protocol_id,disposal")
	type cull struct {
		at                                     time.Time
		animal, staff, reason, method, sedated string
		confirmed, confirmation, disposal      string
		check, how                             string
	}
	three := "no_heartbeat;no_breathing;no_corneal_reflex"
	for _, c := range []cull{
		{at(9, 14, 0), "RF-121", "ST-02", "humane_endpoint", "barbiturate_overdose", "yes", "yes", three, "necropsy", "", ""},
		{at(11, 10, 0), "RF-215", "ST-01", "breeding_selection", "electrocution_oral_rectal", "no", "yes", three, "rendering", "", ""},
		{at(16, 13, 0), "RF-309", "ST-02", "breeding_selection", "penetrating_captive_bolt", "no", "yes", "secondary_method;no_heartbeat", "rendering",
			"protocol.method.unapproved", "RF-309 was killed with a penetrating captive bolt (with a secondary method); BFR-RF-01 allows only barbiturate overdose, electrocution and gunshot."},
		{at(20, 15, 0), "AF-06", "ST-02", "humane_endpoint", "potassium_chloride", "yes", "yes", three, "necropsy",
			"cull.method.conditions_unmet", vetCullHow},
		{at(24, 11, 0), "NV-01", "ST-03", "health", "cervical_dislocation", "no", "yes", three, "incineration",
			"cull.method.unacceptable", "NV-01 (mink) was killed by cervical dislocation, which the limits do not list for mink."},
		{at(26, 11, 30), "NV-04", "ST-03", "end_of_study", "carbon_monoxide", "no", "yes", "no_breathing", "incineration",
			"cull.death.unconfirmed", "NV-04's death was confirmed by one sign only (no breathing)."},
		{at(27, 9, 0), "RF-404", "ST-04", "humane_endpoint", "electrocution_oral_rectal", "no", "yes", three, "rendering",
			"staff.euthanasia.untrained", "Tomas (ST-04) performed an electrocution; his euthanasia training (2024-10-15) is more than 12 months old."},
		{at(28, 10, 0), "RF-111", "ST-01", "breeding_selection", "electrocution_oral_rectal", "no", "yes", three, "rendering",
			"records.cull.mismatch", "RF-111 has a cull row on Jan 28 but animals.csv says left_reason died."},
	} {
		cu.add(stamp(c.at), c.animal, c.staff, c.reason, c.method, c.sedated, "", c.confirmed, c.confirmation, "", c.disposal)
		if c.check == "" {
			continue
		}
		subject := c.animal
		if c.check == "protocol.method.unapproved" {
			subject = "BFR-RF-01"
		} else if strings.HasPrefix(c.check, "staff.") {
			subject = c.staff
		}
		s.plant(c.check, subject, c.at.Format("2006-01-02"), "", c.how)
	}
	s.tables = files
	return nil
}

// ---- evaluators for the checks that depend on the weather or on many rows.
// They follow /work/shared/checks.md and the default limits; their results go
// into the answer key, and the hand-placed plants of the same checks must agree.

func covers(r round, e enclosure) bool {
	return r.rejectWater == "" && (r.encl == e.id || (r.encl == "" && r.bldg == e.building))
}

func (s *scenario) evaluate() {
	var computed []finding
	add := func(fs ...finding) { computed = append(computed, fs...) }

	add(runs("cold.frostbite.risk", site, func(d int) bool { return s.minWC[d] <= -28 })...)

	for _, e := range s.enclosures {
		b := s.buildingOf(e.id)
		occupied := func(d int) bool { return len(s.occupants(e.id, d)) > 0 }
		roundsOn := func(d int) []round {
			var out []round
			for _, r := range s.rounds {
				if r.at.Day() == d && covers(r, e) {
					out = append(out, r)
				}
			}
			return out
		}
		add(runs("care.observation.missed", e.id, func(d int) bool {
			return occupied(d) && !slices.ContainsFunc(roundsOn(d), func(r round) bool { return r.observed == "yes" })
		})...)
		add(runs("care.feeding.missed", e.id, func(d int) bool {
			return occupied(d) && !slices.ContainsFunc(roundsOn(d), func(r round) bool { return r.fed == "yes" || (r.feedG != "" && r.feedG != "0") })
		})...)
		add(perDay("care.water.unavailable", e.id, func(d int) bool {
			return slices.ContainsFunc(roundsOn(d), func(r round) bool {
				return (r.water == "empty" || r.water == "frozen") && r.restored != "yes"
			})
		})...)
		add(perDay("care.health.unattended", e.id, func(d int) bool {
			for _, r := range roundsOn(d) {
				if r.concern != "yes" {
					continue
				}
				answered := slices.ContainsFunc(s.handling, func(h handlingRow) bool {
					return h.badStamp == "" && h.animal == r.concernAnimal && !h.at.Before(r.at) && h.at.Sub(r.at) <= 24*time.Hour &&
						(h.purpose == "vet_exam" || h.purpose == "treatment" || h.purpose == "health_check")
				})
				if !answered {
					return true
				}
			}
			return false
		})...)

		// Space and furnishing, with the default limits' figures.
		add(runs("enclosure.space.insufficient", e.id, func(d int) bool {
			need, cage := 0.0, 0.0
			for _, a := range s.occupants(e.id, d) {
				n, c := vetRequiredArea(a)
				need, cage = need+n, max(cage, c)
			}
			return occupied(d) && area(e) < max(need, cage)
		})...)
		add(runs("enclosure.height.insufficient", e.id, func(d int) bool {
			return slices.ContainsFunc(s.occupants(e.id, d), func(a *animal) bool { return e.heightCm < minHeight[a.species] })
		})...)
		add(runs("enclosure.capacity.exceeded", e.id, func(d int) bool { return len(s.occupants(e.id, d)) > e.maxOcc })...)
		needsNest := func(d int) bool {
			return slices.ContainsFunc(s.occupants(e.id, d), func(a *animal) bool { return a.species != "canis_familiaris" })
		}
		add(runs("enclosure.nest_box.missing", e.id, func(d int) bool { return needsNest(d) && e.nestBox != "yes" })...)
		add(runs("enclosure.platform.missing", e.id, func(d int) bool {
			return e.platform != "yes" && slices.ContainsFunc(s.occupants(e.id, d), func(a *animal) bool {
				return a.species == "vulpes_vulpes" || a.species == "vulpes_lagopus"
			})
		})...)

		if b.exposure == "indoor" || b.site == "" {
			continue // no weather: records.value.missing instead
		}
		add(perDay("cold.water.checks_insufficient", e.id, func(d int) bool {
			n := 0
			for _, r := range roundsOn(d) {
				if r.water != "" && r.water != "not_checked" {
					n++
				}
			}
			return occupied(d) && s.minAir[d] < 0 && n < 2
		})...)
		add(runs("cold.bedding.stale", e.id, func(d int) bool {
			if !occupied(d) || s.minWC[d] > -20 {
				return false
			}
			for dd := max(1, d-6); dd <= d; dd++ {
				if slices.ContainsFunc(roundsOn(dd), func(r round) bool { return r.bedding == "yes" }) {
					return false
				}
			}
			return true
		})...)
		add(runs("cold.shelter.missing", e.id, func(d int) bool {
			// 9 CFR §3.4(b): dogs in an outdoor building need a nest box too (a
			// sheltered building would be their shelter).
			dogOutside := b.exposure == "outdoor" && slices.ContainsFunc(s.occupants(e.id, d), func(a *animal) bool { return a.species == "canis_familiaris" })
			return (needsNest(d) || dogOutside) && e.nestBox != "yes" && s.minWC[d] <= -20
		})...)
	}

	for _, w := range s.stints {
		if w.emergency || w.endBeforeStart {
			continue
		}
		rd := s.readingFor(w.start)
		if rd.windless {
			continue // not judged: records.value.missing instead
		}
		limit, cease := workLimit(rd.air, rd.wind, w.activity == "light")
		if cease {
			add(finding{check: "cold.work.should_cease", subject: w.staff, on: w.start.Format("2006-01-02")})
		} else if limit > 0 && w.minutes > limit {
			add(finding{check: "cold.work.over_limit", subject: w.staff, on: w.start.Format("2006-01-02")})
		}
	}

	// Computed findings of checks that were also planted by hand replace the
	// hand entries only after a comparison (see TestPlantsAgree); the others
	// join the answer key here.
	s.computed = computed
	byHand := map[string]bool{}
	for _, p := range s.planted {
		byHand[p.check] = true
	}
	for _, f := range computed {
		if !byHand[f.check] {
			s.planted = append(s.planted, f)
		}
	}
	s.explainComputed()
}

var minHeight = map[string]float64{"vulpes_vulpes": 70, "vulpes_lagopus": 70, "neogale_vison": 45, "canis_familiaris": 0}

func area(e enclosure) float64 {
	if e.areaM2 > 0 {
		return e.areaM2
	}
	return e.lengthCm * e.widthCm / 10000
}

// requiredArea for an adult (every demo animal is an adult by age).
func requiredArea(a *animal) float64 {
	switch a.species {
	case "vulpes_vulpes", "vulpes_lagopus":
		return 0.8
	case "neogale_vison":
		return 0.255
	}
	// 9 CFR §3.6(c)(1): ft² = (length in + 6)² / 144; 1 ft² = 0.09290304 m².
	in := a.length / 2.54
	return (in + 6) * (in + 6) / 144 * 0.09290304
}

func (s *scenario) explainComputed() {
	s.explain("care.observation.missed", "MB-03: on Jan 17 and 18 the mink barn rounds are written per cage; both rounds for MB-03 say observed no (\"fed through the hatch; animal not seen\"). A two-day run, so significant.")
	s.explain("care.feeding.missed", "MB-05: on Jan 22 the morning round for MB-05 says fed no with no feed_g (\"feed cart empty at this end\"); the afternoon round records no feeding either.")
	s.explain("care.water.unavailable", "S2-11: on Jan 8 an extra round at 11:00 found the drinker frozen and water_restored no. Every other frozen drinker in the records is restored.")
	s.explain("care.health.unattended", "AB-04: a round on Jan 25 at 08:20 raised a concern for AF-04 (off feed); no vet exam, treatment or health check of AF-04 follows. The concern for RF-317 on Jan 19 is answered by a health check at 11:00 and gives no finding.")
	s.explain("enclosure.space.insufficient", "K-01: the dog's run is 110 × 95 cm = 1.045 m²; DG-01 is 90 cm long, so 9 CFR §3.6(c)(1) asks (35.4 + 6)² / 144 = 11.92 ft² = 1.108 m².")
	s.explain("enclosure.height.insufficient", "AB-05: an older arctic-fox cage 65 cm high (70 cm required), occupied by AF-05 all month.")
	s.explain("enclosure.capacity.exceeded", "MB-07: a double mink cage (90 × 60 cm, room for two at 0.255 m² each) with max_occupants 1; NV-08 moved in with NV-07 on Jan 10 (housing.csv).")
	s.explain("enclosure.nest_box.missing", "S3-12: nest_box no, occupied by RF-312 all month.")
	s.explain("enclosure.platform.missing", "S2-05: platform no, occupied by RF-205 all month.")
	s.explain("cold.water.checks_insufficient", "MB-02: on Jan 27 (minimum below freezing) the afternoon round for MB-02 records water not_checked, so only one water state that day. Every other occupied outdoor or sheltered enclosure has a building or cage round with a water state at 07:30 and 15:30 every day.")
	s.explain("cold.bedding.stale", "MB-06: the mink barn's bedding rounds on Jan 11, 15 and 18 skipped MB-06 (\"bedding bale wet\"); its last bedding before that was Jan 8 and the next Jan 22. Every cold day (minimum wind chill ≤ −20) from Jan 15 to Jan 21 is stale; the runs follow the weather. All other enclosures get bedding on Jan 1, 4, 8, 11, 15, 18, 22, 25 and 29.")
	s.explain("cold.shelter.missing", "S3-12 has no nest box; every run of days with a minimum wind chill ≤ −20 at MAST is a finding.")
	s.explain("cold.frostbite.risk", "Every run of days whose minimum wind chill at MAST is −28 or colder, computed from the 3-hourly readings.")
}

// catalogue is every check id of /work/shared/checks.md, in its order.
var catalogue = []string{
	"records.row.rejected", "records.event.after_departure", "records.cull.mismatch",
	"care.observation.missed", "care.feeding.missed", "care.water.unavailable", "care.health.unattended",
	"enclosure.space.insufficient", "enclosure.height.insufficient", "enclosure.capacity.exceeded",
	"enclosure.nest_box.missing", "enclosure.platform.missing",
	"handling.glove.inadequate", "handling.ppe.missing", "handling.duration.exceeded",
	"handling.bite.not_washed", "handling.bite.not_reported",
	"staff.handling.untrained", "staff.euthanasia.untrained", "staff.rabies.unprotected",
	"staff.rabies.followup_overdue", "staff.respirator.fit_overdue", "staff.inactive",
	"ppe.inspection.overdue", "ppe.damaged.used",
	"protocol.inactive", "protocol.procedure.unapproved", "protocol.method.unapproved",
	"protocol.animals.exceeded", "protocol.expiring", vetCatalogue[0], vetCatalogue[1], vetCatalogue[2],
	"cull.method.unacceptable", "cull.method.conditions_unmet", "cull.death.unconfirmed",
	"cold.water.checks_insufficient", "cold.bedding.stale", "cold.shelter.missing",
	"cold.work.over_limit", "cold.work.should_cease", "cold.frostbite.risk",
}

func sortFindings(fs []finding) {
	rank := map[string]int{}
	for i, c := range catalogue {
		rank[c] = i
	}
	sort.SliceStable(fs, func(i, j int) bool {
		a, b := fs[i], fs[j]
		if a.check != b.check {
			return rank[a.check] < rank[b.check]
		}
		if a.subject != b.subject {
			return a.subject < b.subject
		}
		return a.on < b.on
	})
}

// files renders the records folder.
func (s *scenario) files() map[string][]byte {
	out := map[string][]byte{"facility.yaml": s.facilityYAML()}
	for _, t := range s.tables {
		out[t.name] = t.bytes()
	}
	return out
}

func (s *scenario) facilityYAML() []byte {
	var b strings.Builder
	b.WriteString("# Demo records: an invented station, invented people and animals (January 2026).\n")
	b.WriteString("# Generated by records/demo/generate_test.go; edit the generator, then run\n")
	b.WriteString("#   go test ./records/demo -update\n")
	b.WriteString("name: Birchfall Fur Research Station\n")
	b.WriteString("time_zone: America/Winnipeg\n")
	b.WriteString("buildings:\n")
	for _, bl := range s.buildings {
		fmt.Fprintf(&b, "  - id: %s\n    exposure: %s\n", bl.id, bl.exposure)
		if bl.site != "" {
			fmt.Fprintf(&b, "    weather_site: %s\n", bl.site)
		}
	}
	fmt.Fprintf(&b, "weather_sites: [%s]\n", site)
	return []byte(b.String())
}

// plantedMD renders the answer key.
func (s *scenario) plantedMD() []byte {
	fs := slices.Clone(s.planted)
	sortFindings(fs)
	var b strings.Builder
	b.WriteString(`# Planted problems in the demo records (answer key)

The demo records (records/demo/birchfall, copied in testdata/demo/records) describe an invented
station for the period 2026-01-01 … 2026-01-31. Checked with the default limits
(rules/limits.yaml) over that period, with the December review as ` + "`--previous`" + `
(testdata/demo/previous/findings-2025-12.json), the checker must produce exactly the findings below: no
more, no fewer. ` + "`on`" + ` is the finding's first day and ` + "`until`" + ` the last day of a run (empty for a
single day); a rejected row whose date cannot be read is placed on the period's first day. Subjects are exactly the
findings' subjects. This file is generated with the records by
` + "`go test ./records/demo -update`" + `; do not edit it by hand.

`)
	b.WriteString("| check | subject | on | until |\n|---|---|---|---|\n")
	for _, f := range fs {
		fmt.Fprintf(&b, "| %s | %s | %s | %s |\n", f.check, f.subject, f.on, f.until)
	}
	fmt.Fprintf(&b, "\n%d findings.\n\n## How each was planted\n", len(fs))
	for _, c := range catalogue {
		if len(s.how[c]) == 0 {
			continue
		}
		fmt.Fprintf(&b, "\n### %s\n", c)
		for _, h := range s.how[c] {
			fmt.Fprintf(&b, "- %s\n", h)
		}
	}
	b.WriteString("\n## Corrections to the first set\n")
	for _, n := range vetNotes {
		fmt.Fprintf(&b, "- %s\n", n)
	}
	b.WriteString(`
## What keeps everything else clean
- Every occupied outdoor or sheltered enclosure has two rounds a day recording a water state;
  frozen drinkers are recorded with water_restored yes (except S2-11 above).
- Bedding goes in on Jan 1, 4, 8, 11, 15, 18, 22, 25 and 29, so no gap reaches 7 days.
- Every handler's handling training is under 12 months old at each event (except ST-06), and every
  fox handler is rabies-protected under ACIP category 3 (except ST-07 and ST-10): primary series
  within 3 years, or a titer ≥ 0.5 IU/mL between year 1 and 3, or a booster between day 21 and
  year 3.
- Bite gloves are inspected every Thursday (Jan 1, 8, 15, 22, 29); every use falls within 7 days of
  an inspection (except GL-07 on Jan 20).
- Red foxes are handled only from Jan 8, when BFR-RF-01 was approved (except RF-108 on Jan 6).
- Keepers' routine stints are cut to 5 min under the schedule's maximum for the reading at or before
  their start; in cease-work weather they are 20-min emergency stints. Light stints at −25 °C or
  warmer are kept to 35 min, under every limit of the −26 °C row, because whether light work there
  reads that row is not settled.
- Daily minimum wind chills stay at least 0.5 °C away from −20 and −28, and daily minimum air
  temperatures away from 0 °C, so rounding cannot move a day across a threshold.
`)
	return []byte(b.String())
}

func readDir(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatalf("read %s: %v (run: go test ./records/demo -update)", dir, err)
	}
	for _, e := range entries {
		b, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		out[e.Name()] = b
	}
	return out
}

func writeDir(t *testing.T, dir string, files map[string][]byte) {
	t.Helper()
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	for name, b := range files {
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// TestDemoFilesUpToDate regenerates the scenario in memory and compares it
// byte for byte with both stored copies and the answer key.
func TestDemoFilesUpToDate(t *testing.T) {
	s, err := generate()
	if err != nil {
		t.Fatal(err)
	}
	files := s.files()
	planted := map[string][]byte{"PLANTED.md": s.plantedMD()}
	if *update {
		writeDir(t, recordsDir, files)
		writeDir(t, filepath.Join(testdataDir, "records"), files)
		writeDir(t, testdataDir, planted)
	}
	for _, dir := range []string{recordsDir, filepath.Join(testdataDir, "records")} {
		got := readDir(t, dir)
		for name := range got {
			if _, ok := files[name]; !ok {
				t.Errorf("%s/%s is not generated any more; delete it", dir, name)
			}
		}
		for name, want := range files {
			if !bytes.Equal(got[name], want) {
				t.Errorf("%s/%s differs from the generator's output; run: go test ./records/demo -update", dir, name)
			}
		}
	}
	if got, err := os.ReadFile(filepath.Join(testdataDir, "PLANTED.md")); err != nil || !bytes.Equal(got, planted["PLANTED.md"]) {
		t.Errorf("%s/PLANTED.md differs from the generator's output (%v); run: go test ./records/demo -update", testdataDir, err)
	}
}
