package demo

// The summer scenario: the same invented station in July 2026, a second
// records folder with its own answer key, so the January demo and its key
// stay as they are. It plants the warm-season and inside-building checks: a
// heat wave, an outdoor shed without shade, a hot day with one water check,
// a kennel room whose ventilation fails one afternoon, a humid night, an
// ammonia peak in the mink barn and an overdue cleaning. The weather is
// shaped like a prairie July but is not any real station's record.

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"welfare/checker/heat"
	"welfare/records"
	"welfare/rules"
)

const (
	summerRecordsDir  = "birchfall-summer"
	summerTestdataDir = "../../testdata/demo-summer"
	julyDays          = 31
)

// summerCatalogue are the checks the summer scenario plants, in report order.
var summerCatalogue = []string{
	"care.cleaning.overdue",
	"environment.temperature.out_of_range",
	"environment.humidity.out_of_range",
	"environment.ammonia.high",
	"heat.water.checks_insufficient",
	"heat.shade.missing",
	"heat.danger",
}

func july(d, h, m int) time.Time { return time.Date(2026, 7, d, h, m, 0, 0, time.UTC) }
func julyDate(d int) string      { return july(d, 0, 0).Format("2006-01-02") }

// julyMax is each day's maximum air temperature at MAST (°C), and julyRH the
// relative humidity at the hottest hour (%). July 14–18 is the heat wave.
var (
	julyMax = [julyDays]float64{
		22, 23, 24, 23, 22, 26.5, 27, 28, 27.5, 24, 23, 24, 26, // 1–13
		33, 34.5, 35, 34, 32.5, // 14–18: heat wave
		24, 23, 22, 23.5, 26.5, 27.5, 24, 23, 22.5, 23, 24, 22, 23, // 19–31
	}
	julyRH = [julyDays]float64{
		40, 40, 40, 40, 40, 45, 45, 45, 45, 40, 40, 40, 45,
		50, 50, 50, 50, 50,
		40, 40, 40, 40, 45, 45, 40, 40, 40, 40, 40, 40, 40,
	}
)

// The weather site reads every three hours; shape is the share of the day's
// range above its minimum (11 °C below the maximum) at each hour.
var (
	summerHours = []int{3, 6, 9, 12, 15, 18, 21}
	summerShape = []float64{0.1, 0, 0.4, 0.85, 1, 0.75, 0.35}
)

// humiditySensorOut is the day the site's humidity sensor failed: no
// humidity on any reading, so the air temperature stands for the heat index.
const humiditySensorOut = 16

type summerReading struct {
	at        time.Time
	air, wind float64
	rh        *float64
}

type summerScenario struct {
	tables   []*table
	readings []summerReading
	maxHI    [julyDays + 1]float64 // by day of July: the day's maximum heat index, °C
	maxAir   [julyDays + 1]float64
	planted  []finding
	how      map[string][]string
}

func (s *summerScenario) plant(check, subject, on, until, how string) {
	s.planted = append(s.planted, finding{check: check, subject: subject, on: on, until: until})
	s.how[check] = append(s.how[check], how)
}

func generateSummer() *summerScenario {
	s := &summerScenario{how: map[string][]string{}}
	newTable := func(name string, cols string) *table {
		return &table{name: name, header: strings.Split(cols, ",")}
	}

	an := newTable("animals.csv", "animal_id,species,sex,born_on,arrived_on,enclosure_id,mass_kg,length_cm")
	en := newTable("enclosures.csv", "enclosure_id,building_id,kind,length_cm,width_cm,floor_area_m2,height_cm,max_occupants,nest_box,platform,shade")
	type encl struct{ id, building, shade string }
	var encls []encl
	for i := 1; i <= 4; i++ {
		e := encl{fmt.Sprintf("S1-%02d", i), "S1", "yes"}
		encls = append(encls, e)
		en.add(e.id, "S1", "cage", "120", "80", "", "80", "1", "yes", "yes", "yes")
		an.add(fmt.Sprintf("RF-6%02d", i), "vulpes_vulpes", []string{"f", "m"}[i%2], "2024-04-2"+fmt.Sprint(i), "2024-09-01", e.id, "6.4", "68")
	}
	for i := 1; i <= 2; i++ {
		e := encl{fmt.Sprintf("S4-%02d", i), "S4", "no"}
		encls = append(encls, e)
		en.add(e.id, "S4", "cage", "120", "80", "", "80", "1", "yes", "yes", "no")
		an.add(fmt.Sprintf("RF-61%d", i), "vulpes_vulpes", []string{"f", "m"}[i%2], "2024-05-0"+fmt.Sprint(i), "2024-09-01", e.id, "6.1", "66")
	}
	for i := 1; i <= 2; i++ {
		e := encl{fmt.Sprintf("MB-%02d", i), "MB", ""}
		encls = append(encls, e)
		en.add(e.id, "MB", "cage", "90", "30", "", "45", "1", "yes", "no", "")
		an.add(fmt.Sprintf("NV-62%d", i), "neogale_vison", []string{"f", "m"}[i%2], "2024-05-1"+fmt.Sprint(i), "2024-09-01", e.id, "1.2", "40")
	}
	encls = append(encls, encl{"K-01", "KB", ""})
	// The station's dog: 150 × 120 cm is 1.8 m², above the 9 CFR §3.6(c)(1)
	// figure for a 90 cm dog ((35.4 in + 6)² / 144 = 11.9 ft² = 1.11 m²).
	en.add("K-01", "KB", "run", "150", "120", "", "180", "1", "no", "no", "")
	an.add("DG-01", "canis_familiaris", "f", "2021-03-15", "2022-06-01", "K-01", "31", "90")

	st := newTable("staff.csv", "staff_id,name,role,handling_trained_on,rabies_primary_on")
	st.add("ST-21", "Odile Parrack", "keeper", "2026-03-02", "2025-03-03")
	st.add("ST-22", "Hennig Vale", "keeper", "2026-03-02", "2025-03-03")

	// Care: every enclosure has its own rounds at 07:30 and 15:30, both
	// recording a water state; cages are cleaned on the morning round every
	// Wednesday (July 1, 8, 15, 22, 29).
	dc := newTable("daily_care.csv", "checked_at,enclosure_id,staff_id,observed,fed,water,cleaned")
	for d := 1; d <= julyDays; d++ {
		for _, e := range encls {
			cleaned := (d-1)%7 == 0
			if e.id == "MB-02" && d > 1 {
				// Planted: MB-02 is skipped on July 8 and 15 and cleaned again on the 20th.
				cleaned = d == 20 || d == 22 || d == 29
			}
			dc.add(stamp(july(d, 7, 30)), e.id, "ST-21", "yes", "yes", "ok", yesNo(cleaned))
			water := "ok"
			if e.id == "S1-03" && d == 15 {
				water = "not_checked" // planted: one water state on a hot day
			}
			dc.add(stamp(july(d, 15, 30)), e.id, "ST-22", "yes", "no", water, "no")
		}
	}

	// Weather at MAST.
	wx := newTable("weather.csv", "observed_at,site_id,air_temp_c,wind_kmh,humidity_pct")
	for d := 1; d <= julyDays; d++ {
		s.maxHI[d], s.maxAir[d] = math.Inf(-1), math.Inf(-1)
		for i, h := range summerHours {
			air := math.Round((julyMax[d-1]-11+11*summerShape[i])*10) / 10
			rh := math.Round(julyRH[d-1] + (85-julyRH[d-1])*(1-summerShape[i]))
			wind := float64(6 + (d+i)%5)
			r := summerReading{at: july(d, h, 0), air: air, wind: wind}
			hi, rhCell := air, ""
			if d != humiditySensorOut {
				r.rh = &rh
				hi = heat.IndexC(air, rh)
				rhCell = num(rh, 0)
			}
			s.readings = append(s.readings, r)
			s.maxHI[d] = math.Max(s.maxHI[d], hi)
			s.maxAir[d] = math.Max(s.maxAir[d], air)
			wx.add(stamp(r.at), site, num(air, 1), num(wind, 0), rhCell)
		}
	}

	// Inside buildings: the kennel room hourly, the mink barn every three hours.
	env := newTable("environment.csv", "observed_at,building_id,air_temp_c,humidity_pct,ammonia_ppm")
	kennelHot := map[int]float64{12: 30.2, 13: 31.0, 14: 31.5, 15: 31.2, 16: 30.6, 17: 29.9, 18: 28.4}
	kennelWarm := map[int]float64{13: 29.8, 14: 30.1, 15: 29.7, 16: 29.0}
	for d := 1; d <= julyDays; d++ {
		for h := 0; h < 24; h++ {
			air := 21 + 2*math.Sin(math.Pi*float64(h)/24)
			rh := 48 + float64((d+h)%7)
			if t, ok := kennelHot[h]; ok && d == 16 {
				air = t // planted: the ventilation fails on the heat wave's hottest afternoon
			}
			if t, ok := kennelWarm[h]; ok && d == 9 {
				air = t // a 3-hour spell above 29.5 °C: not more than 4 h, no finding
			}
			if d == 22 && h >= 3 && h <= 7 {
				rh = float64(74 + h - 3) // planted: a humid night, 74–78 %
			}
			env.add(stamp(july(d, h, 0)), "KB", num(air, 1), num(rh, 0), num(float64(2+(d+h)%4), 0))
		}
		for _, h := range []int{0, 3, 6, 9, 12, 15, 18, 21} {
			nh3 := float64(4 + (d+h)%7)
			if d == 27 && h == 6 {
				nh3 = 31 // planted: ammonia peak in the mink barn
			}
			env.add(stamp(july(d, h, 0)), "MB", num(julyMax[d-1]-8+6*math.Sin(math.Pi*float64(h)/24), 1), num(70+float64(h%5), 0), num(nh3, 0))
		}
	}
	s.tables = []*table{an, en, st, dc, wx, env}

	// The answer key. Weather-driven checks are computed from the readings.
	s.plant("care.cleaning.overdue", "MB-02", julyDate(16), "",
		"MB-02: cleaned on July 1, then not until July 20 (the rounds of July 8 and 15 skip it); July 16 is the first day more than 14 days after July 1. Every other cage is cleaned every Wednesday.")
	s.plant("environment.temperature.out_of_range", "KB", julyDate(16), "",
		"KB (indoor kennel room, the dog DG-01): on July 16 the readings are above 29.5 °C (9 CFR §3.3(a)) from 12:00 to 17:00 and back in range at 18:00, 6 h. On July 9 a spell above 29.5 °C lasts 3 h (13:00 to 16:00): not more than 4 h, no finding.")
	s.plant("environment.humidity.out_of_range", "KB", julyDate(22), "",
		"KB: on July 22 from 03:00 to 07:00 the humidity reads 74–78 %, above 30–70 %. Other hours and days read 48–54 %. The mink barn MB is sheltered, so its humidity is not judged.")
	s.plant("environment.ammonia.high", "MB", julyDate(27), "",
		"MB: the 06:00 reading of July 27 finds 31 ppm ammonia, above 25 ppm; every other reading is 2–10 ppm.")
	s.plant("heat.water.checks_insufficient", "S1-03", julyDate(15), "",
		"S1-03: on July 15 (maximum 34.5 °C) the afternoon round records water not_checked, so one water state that day. Every other enclosure has two rounds with a water state every day.")
	hot := func(d int) bool { return s.maxHI[d] >= 25 }
	for _, e := range []string{"S4-01", "S4-02"} {
		for _, f := range julyRuns("heat.shade.missing", e, hot) {
			s.plant(f.check, f.subject, f.on, f.until, "")
		}
	}
	s.how["heat.shade.missing"] = []string{"S4-01 and S4-02 (outdoor shed S4) are recorded without shade; every day whose maximum heat index at MAST reaches 25 °C is a finding, in runs. The S1 cages have shade; the mink barn is sheltered."}
	for _, f := range julyRuns("heat.danger", site, func(d int) bool { return s.maxHI[d] >= 32 }) {
		s.plant(f.check, f.subject, f.on, f.until, "")
	}
	s.how["heat.danger"] = []string{fmt.Sprintf("MAST: the heat wave of July 14–18 has maximum heat indexes of 32 °C and more (NWS extreme caution and danger bands). On July %d the humidity sensor is out: the air temperature stands for the heat index and the finding says so.", humiditySensorOut)}
	return s
}

// julyRuns collapses a per-day condition of July into runs.
func julyRuns(check, subject string, bad func(d int) bool) []finding {
	var out []finding
	for d := 1; d <= julyDays; d++ {
		if !bad(d) {
			continue
		}
		e := d
		for e+1 <= julyDays && bad(e+1) {
			e++
		}
		f := finding{check: check, subject: subject, on: julyDate(d)}
		if e > d {
			f.until = julyDate(e)
		}
		out = append(out, f)
		d = e
	}
	return out
}

func (s *summerScenario) files() map[string][]byte {
	out := map[string][]byte{"facility.yaml": []byte(`# Demo records: an invented station, invented people and animals (July 2026).
# Generated by records/demo/generate_summer_test.go; edit the generator, then run
#   go test ./records/demo -update
name: Birchfall Fur Research Station
time_zone: America/Winnipeg
buildings:
  - id: S1
    exposure: outdoor
    weather_site: MAST
  - id: S4
    exposure: outdoor
    weather_site: MAST
  - id: MB
    exposure: sheltered
    weather_site: MAST
  - id: KB
    exposure: indoor
weather_sites: [MAST]
`)}
	for _, t := range s.tables {
		out[t.name] = t.bytes()
	}
	return out
}

func (s *summerScenario) plantedMD() []byte {
	rank := map[string]int{}
	for i, c := range summerCatalogue {
		rank[c] = i
	}
	fs := append([]finding(nil), s.planted...)
	sortByRank(fs, rank)
	var b strings.Builder
	b.WriteString(`# Planted problems in the summer demo records (answer key)

The summer demo records (records/demo/birchfall-summer, copied in testdata/demo-summer/records)
describe the invented station for the period 2026-07-01 … 2026-07-31. Checked with the default
limits (rules/limits.yaml) over that period, the checker must produce exactly the findings below:
no more, no fewer. ` + "`on`" + ` is the finding's first day and ` + "`until`" + ` the last day of a run (empty for a
single day). This file is generated with the records by ` + "`go test ./records/demo -update`" + `;
do not edit it by hand.

`)
	b.WriteString("| check | subject | on | until |\n|---|---|---|---|\n")
	for _, f := range fs {
		fmt.Fprintf(&b, "| %s | %s | %s | %s |\n", f.check, f.subject, f.on, f.until)
	}
	fmt.Fprintf(&b, "\n%d findings.\n\n## How each was planted\n", len(fs))
	for _, c := range summerCatalogue {
		fmt.Fprintf(&b, "\n### %s\n", c)
		for _, h := range s.how[c] {
			if h != "" {
				fmt.Fprintf(&b, "- %s\n", h)
			}
		}
	}
	b.WriteString(`
## What keeps everything else clean
- Every enclosure has two rounds a day, both observing the animals and recording a water state; the
  morning round feeds.
- Daily maximum air temperatures and heat indexes at MAST stay at least 0.5 °C away from 25 and
  32 °C, so rounding cannot move a day across a threshold.
- Cages meet their species' space, height, nest-box and platform limits; the keepers' handling
  training and rabies series are current. There are no handling, cull, PPE or protocol records:
  those checks are not evaluated.
`)
	return []byte(b.String())
}

func sortByRank(fs []finding, rank map[string]int) {
	for i := 1; i < len(fs); i++ {
		for j := i; j > 0 && lessFinding(fs[j], fs[j-1], rank); j-- {
			fs[j], fs[j-1] = fs[j-1], fs[j]
		}
	}
}

func lessFinding(a, b finding, rank map[string]int) bool {
	if a.check != b.check {
		return rank[a.check] < rank[b.check]
	}
	if a.subject != b.subject {
		return a.subject < b.subject
	}
	return a.on < b.on
}

// TestSummerDemoFilesUpToDate regenerates the summer scenario and compares
// it byte for byte with both stored copies and its answer key.
func TestSummerDemoFilesUpToDate(t *testing.T) {
	s := generateSummer()
	files := s.files()
	planted := s.plantedMD()
	if *update {
		writeDir(t, summerRecordsDir, files)
		writeDir(t, filepath.Join(summerTestdataDir, "records"), files)
		writeDir(t, summerTestdataDir, map[string][]byte{"PLANTED.md": planted})
	}
	for _, dir := range []string{summerRecordsDir, filepath.Join(summerTestdataDir, "records")} {
		got := readDir(t, dir)
		for name := range got {
			if _, ok := files[name]; !ok {
				t.Errorf("%s/%s is not generated any more; delete it", dir, name)
			}
		}
		for name, want := range files {
			if string(got[name]) != string(want) {
				t.Errorf("%s/%s differs from the generator's output; run: go test ./records/demo -update", dir, name)
			}
		}
	}
	if got, err := os.ReadFile(filepath.Join(summerTestdataDir, "PLANTED.md")); err != nil || string(got) != string(planted) {
		t.Errorf("%s/PLANTED.md differs from the generator's output (%v); run: go test ./records/demo -update", summerTestdataDir, err)
	}
}

// TestSummerScenarioMargins: every planted check is in the key, and the
// weather keeps clear of the thresholds so rounding cannot decide a day.
func TestSummerScenarioMargins(t *testing.T) {
	s := generateSummer()
	seen := map[string]bool{}
	for _, f := range s.planted {
		seen[f.check] = true
	}
	for _, c := range summerCatalogue {
		if !seen[c] {
			t.Errorf("no planted %s", c)
		}
	}
	for d := 1; d <= julyDays; d++ {
		for _, x := range []struct {
			what      string
			v, thresh float64
		}{{"max heat index", s.maxHI[d], 25}, {"max heat index", s.maxHI[d], 32}, {"max air", s.maxAir[d], 25}} {
			if math.Abs(x.v-x.thresh) < 0.5 {
				t.Errorf("July %d: %s %.2f °C is within 0.5 of %g", d, x.what, x.v, x.thresh)
			}
		}
	}
	// The planted water check needs a hot day by air temperature (hot_day_c 25).
	if s.maxAir[15] < 25 {
		t.Errorf("July 15 maximum air %.1f °C is not a hot day", s.maxAir[15])
	}
}

// TestSummerDemoLoads: the embedded summer folder loads with the default
// limits' species, every row accepted, nothing left over as a warning, and
// the warm-season columns read.
func TestSummerDemoLoads(t *testing.T) {
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	set, err := records.Load(Seasons["summer"].FS(), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	if len(set.Problems) > 0 || len(set.Warnings) > 0 {
		t.Errorf("problems %v, warnings %v", set.Problems, set.Warnings)
	}
	for _, c := range set.Accounting {
		if c.Rejected != 0 || c.Read != c.Accepted {
			t.Errorf("%+v", c)
		}
	}
	if len(set.Environment) != julyDays*(24+8) || !set.HasColumn("daily_care.csv", "cleaned") || !set.HasColumn("weather.csv", "humidity_pct") {
		t.Errorf("environment readings %d, columns %v", len(set.Environment), set.Columns)
	}
	shade := map[string]records.Bool{}
	for _, e := range set.Enclosures {
		shade[e.ID] = e.Shade
	}
	if shade["S1-01"] != records.Yes || shade["S4-01"] != records.No || shade["MB-01"] != records.NotRecorded {
		t.Errorf("shade = %v", shade)
	}
}
