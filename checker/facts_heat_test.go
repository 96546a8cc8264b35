package checker

import (
	"context"
	"fmt"
	"math"
	"sort"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker/heat"
	"welfare/records"
)

// The summer scenario (invented): Birchfall's outdoor fox shed SHED-S is
// read by the YARD weather site; S-01 has shade and two water checks a day,
// S-02 has no shade and one water check a day. The indoor kennel room KB
// holds the dog DG-01 in K-01, with environment.csv readings. Weather:
//
//	07-13  24 °C, 40 %               (heat index below 25 °C: not a hot day)
//	07-14  86 °F, 60 %               (NWS chart [M]: heat index 91 °F = 32.8 °C)
//	07-15  90 °F, no humidity        (the air temperature stands: 32.2 °C)
//	07-16  no readings
var summerPeriod = Period{From: coldDay("2026-07-13"), To: coldDay("2026-07-16")}

type envReading struct {
	day, hhmm string
	air       float64
	hum, nh3  *float64
}

// The kennel room: 9 CFR §3.3(a) range for dogs 7.2–29.5 °C, more than 4 h.
var summerEnv = []envReading{
	{"2026-07-14", "10:00", 28, fp(55), nil},      // environment.csv:2
	{"2026-07-14", "11:00", 30, fp(60), nil},      // :3 first reading above 29.5
	{"2026-07-14", "13:00", 31.4, fp(75), nil},    // :4 peak; humidity above 70 %
	{"2026-07-14", "15:00", 30, fp(65), nil},      // :5
	{"2026-07-14", "17:00", 29, fp(60), fp(12)},   // :6 back in range after 6 h
	{"2026-07-15", "12:00", 30, fp(50), nil},      // :7 above again
	{"2026-07-15", "16:00", 29.5, fp(50), fp(30)}, // :8 back in range (29.5 is in) after exactly 4 h; ammonia 30 ppm
}

func summerSet(withCleanedColumn bool) *records.Set {
	set := &records.Set{
		Facility: records.Facility{
			Name: "Birchfall Fur Research Station", TimeZone: "Europe/Helsinki",
			Buildings: []records.Building{
				{ID: "SHED-S", Exposure: "outdoor", WeatherSite: "YARD"},
				{ID: "KB", Exposure: "indoor", Line: 9},
			},
			WeatherSites: []string{"YARD"},
		},
		Location: coldZone,
		Present: map[string]bool{"animals.csv": true, "enclosures.csv": true, "daily_care.csv": true,
			"weather.csv": true, "environment.csv": true, "staff.csv": true, "handling.csv": true},
		Columns: map[string][]string{"daily_care.csv": {"checked_at", "enclosure_id", "building_id", "staff_id", "observed", "fed", "water"}},
	}
	if withCleanedColumn {
		set.Columns["daily_care.csv"] = append(set.Columns["daily_care.csv"], "cleaned")
	}
	for i, e := range []struct {
		id, building, species string
		shade                 records.Bool
	}{{"S-01", "SHED-S", "vulpes_vulpes", records.Yes}, {"S-02", "SHED-S", "vulpes_vulpes", records.No}, {"K-01", "KB", "canis_familiaris", records.NotRecorded}} {
		set.Enclosures = append(set.Enclosures, records.Enclosure{
			Ref: records.Ref(fmt.Sprintf("enclosures.csv:%d", i+2)), ID: e.id, BuildingID: e.building,
			Kind: "cage", FloorAreaM2: fp(10), HeightCm: 180, NestBox: records.Yes, Platform: records.Yes, Shade: e.shade,
		})
		set.Animals = append(set.Animals, records.Animal{
			Ref: records.Ref(fmt.Sprintf("animals.csv:%d", i+2)), ID: fmt.Sprintf("A-%d", i+1),
			Species: e.species, Sex: "f", ArrivedOn: coldDay("2026-05-01"), EnclosureID: e.id, LifeStage: "adult", LengthCm: fp(60),
		})
	}
	set.Staff = append(set.Staff, records.Staff{Ref: "staff.csv:2", ID: "K-ORVO", Name: "K-ORVO", Role: "keeper",
		RabiesPrimaryOn: coldDay("2025-01-10"), HandlingTrainedOn: coldDay("2026-01-10")})
	line := 2
	round := func(day, hhmm, enc, building, water string, cleaned records.Bool) {
		set.Care = append(set.Care, records.CareRound{
			Ref: records.Ref(fmt.Sprintf("daily_care.csv:%d", line)), At: coldAt(day, hhmm), Day: coldDay(day),
			EnclosureID: enc, BuildingID: building, StaffID: "K-ORVO", Observed: records.Yes, Fed: records.Yes,
			Water: water, Cleaned: cleaned,
		})
		line++
	}
	// Rounds from 07-01: the shed cleaned weekly (07-01, 07-08, 07-15), the
	// kennel only on 07-01, so its gap passes 14 days on 07-16.
	for d := coldDay("2026-07-01"); d <= coldDay("2026-07-16"); d++ {
		day := d.String()
		shedClean, kennelClean := records.No, records.No
		if (d-coldDay("2026-07-01"))%7 == 0 {
			shedClean = records.Yes
		}
		if day == "2026-07-01" {
			kennelClean = records.Yes
		}
		round(day, "08:00", "", "SHED-S", "ok", shedClean)
		round(day, "08:30", "K-01", "", "ok", kennelClean)
		round(day, "16:00", "S-01", "", "ok", records.No)
		round(day, "16:05", "S-02", "", "not_checked", records.No)
		round(day, "16:30", "K-01", "", "ok", records.No)
	}
	for i, w := range []struct {
		day, hhmm string
		air       float64
		hum       *float64
	}{
		{"2026-07-13", "14:00", 24, fp(40)},            // weather.csv:2
		{"2026-07-13", "06:00", 15, fp(80)},            // weather.csv:3
		{"2026-07-14", "15:00", heat.FToC(86), fp(60)}, // weather.csv:4
		{"2026-07-14", "06:00", 18, fp(90)},            // weather.csv:5
		{"2026-07-15", "15:00", heat.FToC(90), nil},    // weather.csv:6
	} {
		set.Weather = append(set.Weather, records.Weather{
			Ref: records.Ref(fmt.Sprintf("weather.csv:%d", i+2)), At: coldAt(w.day, w.hhmm), SiteID: "YARD",
			AirTempC: w.air, WindKmh: fp(5), HumidityPct: w.hum,
		})
	}
	for i, r := range summerEnv {
		set.Environment = append(set.Environment, records.EnvironmentReading{
			Ref: records.Ref(fmt.Sprintf("environment.csv:%d", i+2)), At: coldAt(r.day, r.hhmm), BuildingID: "KB",
			AirTempC: r.air, HumidityPct: r.hum, AmmoniaPpm: r.nh3,
		})
	}
	return set
}

func TestHeatSiteDays(t *testing.T) {
	f := newFacts(summerSet(true), defaultLimits(t), summerPeriod)
	f.heatFacts()
	days := section(f.docs["site"]["YARD"], "heat").(map[string]any)["days"].([]any)
	type row struct {
		On       string
		MaxAirC  float64
		HIF      float64
		Band     string
		Humidity bool
		Evidence []any
	}
	var got []row
	for _, d := range days {
		m := d.(map[string]any)
		got = append(got, row{m["on"].(string), math.Round(m["max_air_c"].(float64)*10) / 10, math.Round(m["max_heat_index_f"].(float64)),
			m["band"].(string), m["humidity_recorded"].(bool), m["evidence"].([]any)})
	}
	want := []row{
		// 24 °C (75.2 °F), 40 %: Steadman's simple form 0.5·(75.2 + 61 + 8.64 + 3.76) = 74.3 °F
		// (NWS WPC, The Heat Index Equation), below 80 °F so it stands.
		{"2026-07-13", 24, 74, "none", true, []any{"weather.csv:2"}},
		// 86 °F, 60 %: NWS heat index chart [M] → 91 °F, extreme caution (90–103 °F).
		{"2026-07-14", 30, 91, "extreme_caution", true, []any{"weather.csv:4"}},
		// 90 °F without humidity: the air temperature stands, 90 °F = 32.2 °C.
		{"2026-07-15", 32.2, 90, "extreme_caution", false, []any{"weather.csv:6"}},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("site days (-want +got):\n%s", diff)
	}
}

func TestOutsideSpells(t *testing.T) {
	r := func(hhmm string, air float64) *records.EnvironmentReading {
		return &records.EnvironmentReading{Ref: records.Ref("environment.csv:" + hhmm), At: coldAt("2026-07-14", hhmm), AirTempC: air}
	}
	all := func(*records.EnvironmentReading) bool { return true }
	type spell struct {
		Started, Ended string
		Hours          float64
		Back           bool
		Direction      string
		Peak           float64
	}
	tests := []struct {
		name   string
		rs     []*records.EnvironmentReading
		counts func(*records.EnvironmentReading) bool
		want   []spell
	}{
		{"in range", []*records.EnvironmentReading{r("10:00", 7.2), r("11:00", 29.5)}, all, nil},
		{"to the first reading back inside", []*records.EnvironmentReading{r("10:00", 28), r("11:00", 30), r("13:00", 31), r("16:00", 29)}, all,
			[]spell{{"2026-07-14 11:00", "2026-07-14 16:00", 5, true, "above", 31}}},
		{"to the last reading outside when none follows", []*records.EnvironmentReading{r("11:00", 30), r("13:00", 31), r("16:30", 30.5)}, all,
			[]spell{{"2026-07-14 11:00", "2026-07-14 16:30", 5.5, false, "above", 31}}},
		{"below, then above: one spell", []*records.EnvironmentReading{r("01:00", 5), r("03:00", 31), r("04:00", 20)}, all,
			[]spell{{"2026-07-14 01:00", "2026-07-14 04:00", 3, true, "above and below", 5}}},
		{"a reading that does not count ends the spell at the last reading outside",
			[]*records.EnvironmentReading{r("10:00", 30), r("12:00", 31), r("18:00", 33)},
			func(x *records.EnvironmentReading) bool { return x.At.Hour() < 15 },
			[]spell{{"2026-07-14 10:00", "2026-07-14 12:00", 2, false, "above", 31}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var got []spell
			for _, s := range outsideSpells(tc.rs, 7.2, 29.5, tc.counts) {
				got = append(got, spell{s["started_at"].(string), s["ended_at"].(string), s["hours"].(float64),
					s["back_in_range"].(bool), s["direction"].(string), s["peak_c"].(float64)})
			}
			if diff := cmp.Diff(tc.want, got); diff != "" {
				t.Errorf("spells (-want +got):\n%s", diff)
			}
		})
	}
}

func TestSummerCheckEndToEnd(t *testing.T) {
	lim := defaultLimits(t)
	eng := shippedEngine(t, lim)
	type row struct{ Check, Subject, On, Until string }
	res, err := Check(context.Background(), Config{Records: summerSet(true), Limits: lim, Engine: eng, Period: summerPeriod,
		Only: []string{"heat", "environment", "care"}})
	if err != nil {
		t.Fatalf("Check: %v", err)
	}
	got := []row{}
	for _, f := range res.Findings {
		got = append(got, row{f.Check, f.Subject, f.On.String(), f.Until.String()})
	}
	sort.Slice(got, func(i, j int) bool {
		a, b := got[i], got[j]
		if a.Check != b.Check {
			return a.Check < b.Check
		}
		return a.On < b.On
	})
	want := []row{
		// 9 CFR §3.11(b)(2): every 2 weeks; last cleaned 07-01, so 07-16 is the 15th day.
		{"care.cleaning.overdue", "K-01", "2026-07-16", ""},
		// 30 ppm on 07-15, above 25 ppm (common practice).
		{"environment.ammonia.high", "KB", "2026-07-15", ""},
		// Guide Table 3.1: 30–70 %; 75 % on 07-14.
		{"environment.humidity.out_of_range", "KB", "2026-07-14", ""},
		// 9 CFR §3.3(a): above 29.5 °C from 11:00 to 17:00 (6 h > 4 h); 07-15's exactly 4 h is not more.
		{"environment.temperature.out_of_range", "KB", "2026-07-14", ""},
		// NWS bands: 32.8 and 32.2 °C are in extreme caution (from 32 °C).
		{"heat.danger", "YARD", "2026-07-14", "2026-07-15"},
		{"heat.shade.missing", "S-02", "2026-07-14", "2026-07-15"},
		{"heat.water.checks_insufficient", "S-02", "2026-07-14", ""},
		{"heat.water.checks_insufficient", "S-02", "2026-07-15", ""},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("findings (-want +got):\n%s", diff)
	}
	for _, f := range res.Findings {
		if f.Check == "heat.danger" && !strings.Contains(f.Message, "extreme caution") {
			t.Errorf("heat.danger message does not name the band: %q", f.Message)
		}
		if f.Check == "heat.shade.missing" && f.On.String() == "2026-07-15" && !strings.Contains(f.Message, "air temperature stands") {
			t.Errorf("shade finding on the day without humidity does not say so: %q", f.Message)
		}
	}
	if len(res.NotEvaluated) > 0 {
		t.Errorf("not evaluated: %v", res.NotEvaluated)
	}
}

func TestCleaningNotEvaluatedWithoutColumn(t *testing.T) {
	lim := defaultLimits(t)
	res, err := Check(context.Background(), Config{Records: summerSet(false), Limits: lim, Engine: shippedEngine(t, lim), Period: summerPeriod,
		Only: []string{"care"}})
	if err != nil {
		t.Fatalf("Check: %v", err)
	}
	for _, f := range res.Findings {
		if f.Check == "care.cleaning.overdue" {
			t.Errorf("cleaning judged without a cleaned column: %+v", f)
		}
	}
	want := []Skipped{{Check: "care.cleaning.overdue", Reason: "no daily_care.csv column cleaned in the records folder"}}
	if diff := cmp.Diff(want, res.NotEvaluated); diff != "" {
		t.Errorf("not evaluated (-want +got):\n%s", diff)
	}
}

func TestEnvironmentDays(t *testing.T) {
	f := newFacts(summerSet(true), defaultLimits(t), summerPeriod)
	f.environmentFacts()
	env := f.docs["building"]["KB"]["environment"].(map[string]any)
	type row struct {
		On       string
		Readings int
		MinRH    any
		MaxRH    any
		NH3      any
		NH3Ref   any
	}
	var got []row
	for _, d := range env["days"].([]any) {
		m := d.(map[string]any)
		got = append(got, row{m["on"].(string), m["readings"].(int), m["min_humidity_pct"], m["max_humidity_pct"], m["max_ammonia_ppm"], m["ammonia_ref"]})
	}
	want := []row{
		{"2026-07-14", 5, 55.0, 75.0, 12.0, "environment.csv:6"},
		{"2026-07-15", 2, 50.0, 50.0, 30.0, "environment.csv:8"},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("KB days (-want +got):\n%s", diff)
	}
	if d := f.docs["building"]["KB"]; d["ref"] != "facility.yaml:9" || d["exposure"] != "indoor" {
		t.Errorf("KB document = %v", d)
	}
	if _, ok := f.docs["building"]["SHED-S"]; ok {
		t.Error("an outdoor building has inside-building facts")
	}
}

func TestEnclosureHotDays(t *testing.T) {
	f := newFacts(summerSet(true), defaultLimits(t), summerPeriod)
	f.heatFacts()
	type row struct {
		On     string
		Checks int
		RunOf  int
	}
	got := map[string][]row{}
	for _, id := range []string{"S-01", "S-02"} {
		sec := section(f.docs["enclosure"][id], "heat").(map[string]any)
		for _, d := range sec["hot_days"].([]any) {
			m := d.(map[string]any)
			got[id] = append(got[id], row{m["on"].(string), m["water_checks"].(int), m["run"].(map[string]any)["days"].(int)})
		}
	}
	// hot_day_c 25 (common practice): 07-14 and 07-15 are hot, 07-13 (24 °C,
	// heat index 23.5 °C) is not. S-01: a building round and its own round
	// record water; S-02's own round writes not_checked.
	want := map[string][]row{
		"S-01": {{"2026-07-14", 2, 2}, {"2026-07-15", 2, 2}},
		"S-02": {{"2026-07-14", 1, 2}, {"2026-07-15", 1, 2}},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("hot days (-want +got):\n%s", diff)
	}
	if _, ok := f.docs["enclosure"]["K-01"]["heat"]; ok {
		t.Error("an indoor enclosure has hot-day facts")
	}
}

// TestEnclosureHotRunsShared: a run of hot days an enclosure was occupied
// for throughout is one document, shared by the enclosures of the site;
// an enclosure occupied for part of it gets a run of its own days.
func TestEnclosureHotRunsShared(t *testing.T) {
	set := summerSet(true)
	set.Animals[1].LeftOn = coldDay("2026-07-14") // S-02 is empty from 07-15
	f := newFacts(set, defaultLimits(t), summerPeriod)
	f.heatFacts()
	runs := func(id string) []map[string]any {
		var out []map[string]any
		for _, d := range section(f.docs["enclosure"][id], "heat").(map[string]any)["hot_days"].([]any) {
			out = append(out, d.(map[string]any)["run"].(map[string]any))
		}
		return out
	}
	s1, s2 := runs("S-01"), runs("S-02")
	if len(s1) != 2 || len(s2) != 1 {
		t.Fatalf("S-01 has %d hot days, S-02 %d; want 2 and 1", len(s1), len(s2))
	}
	same := func(a, b map[string]any) bool { return fmt.Sprintf("%p", a) == fmt.Sprintf("%p", b) }
	if !same(s1[0], s1[1]) {
		t.Error("S-01's two days of one run have two run documents")
	}
	// Another enclosure of the site occupied for the whole run shares it.
	set = summerSet(true)
	g := newFacts(set, defaultLimits(t), summerPeriod)
	g.heatFacts()
	a := section(g.docs["enclosure"]["S-01"], "heat").(map[string]any)["hot_days"].([]any)[0].(map[string]any)["run"].(map[string]any)
	b := section(g.docs["enclosure"]["S-02"], "heat").(map[string]any)["hot_days"].([]any)[1].(map[string]any)["run"].(map[string]any)
	if !same(a, b) {
		t.Error("S-01 and S-02, occupied for the whole run, have two run documents")
	}
	// S-02's run is its own one day, 07-14 (the site's goes on to 07-15).
	want := map[string]any{"from": "2026-07-14", "until": "2026-07-14", "days": 1, "hottest_on": "2026-07-14",
		"humidity_recorded": true, "days_without_humidity": []any{}}
	for k, v := range want {
		if diff := cmp.Diff(v, s2[0][k]); diff != "" {
			t.Errorf("S-02 run %s (-want +got):\n%s", k, diff)
		}
	}
	if s1[0]["from"] != "2026-07-14" || s1[0]["days"] != 2 {
		t.Errorf("S-01 run = %v", s1[0])
	}
}

// TestSectionFiguresMatchTheirLists: on a generated year, each enclosure's
// fewest_water_checks is the fewest water_checks of its hot days and its
// longest_gap_days the most days of its cleaning gaps (null when the list
// is empty): the heat and care rules walk the lists only when these say a
// day or a gap may fail, so a figure that disagreed would hide findings.
func TestSectionFiguresMatchTheirLists(t *testing.T) {
	lim := defaultLimits(t)
	set, _ := generatedSet(t, 150, lim)
	from, to := recordSpan(set)
	f := newFacts(set, lim, Period{From: from, To: to})
	buildFacts(f, nil)
	extreme := func(list []any, field string, better func(a, b int) bool) any {
		var out any
		for _, x := range list {
			n := x.(map[string]any)[field].(int)
			if out == nil || better(n, out.(int)) {
				out = n
			}
		}
		return out
	}
	var heatSeen, gapsSeen int
	for _, d := range f.inputs("enclosure") {
		if h, ok := section(d, "heat").(map[string]any); ok {
			days := h["hot_days"].([]any)
			heatSeen += len(days)
			want := extreme(days, "water_checks", func(a, b int) bool { return a < b })
			if h["fewest_water_checks"] != want {
				t.Errorf("%s: fewest_water_checks %v, the hot days' fewest %v", d["id"], h["fewest_water_checks"], want)
			}
		}
		if c, ok := section(d, "cleaning").(map[string]any); ok {
			gaps := c["gaps"].([]any)
			gapsSeen += len(gaps)
			want := extreme(gaps, "days", func(a, b int) bool { return a > b })
			if c["longest_gap_days"] != want {
				t.Errorf("%s: longest_gap_days %v, the gaps' longest %v", d["id"], c["longest_gap_days"], want)
			}
		}
	}
	if heatSeen == 0 || gapsSeen == 0 {
		t.Fatalf("the generated year gave %d hot days and %d gaps: nothing compared", heatSeen, gapsSeen)
	}
}
