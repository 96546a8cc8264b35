package checker

import (
	"encoding/json"
	"fmt"
	"sort"
	"strconv"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"
	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/checker/cold"
	"welfare/records"
)

// The cold-season scenario (invented): Birchfall's north fox shed SHED-N is
// outdoor and read by the YARD weather site; N-01 has a nest box and two
// water checks a day, N-02 has no nest box and one water check a day (its
// second round writes not_checked). The shed's only bedding before the
// period is a building round on 2026-01-04; N-01 gets bedding on 01-11.
// The barn is indoor and is not judged. The readings are cells of
// published tables so the day minima can be checked against them:
//
//	01-10 mild:  0 °C/10 km/h, 5 °C/5 km/h
//	01-11 cold: −15 °C/30 km/h, −10 °C/20 km/h
//	01-12 cold: −25 °C/20 km/h, −20 °C/50 km/h
//	01-13 hard: −35 °C/8 km/h (06:00), −30 °C/40 km/h (09:00), −40 °C/10 km/h (12:00)
//	01-14 no readings
var coldZone = time.FixedZone("Birchfall", 2*3600)

func coldAt(day string, hhmm string) time.Time {
	t, err := time.ParseInLocation("2006-01-02 15:04", day+" "+hhmm, coldZone)
	if err != nil {
		panic(err) // test data only
	}
	return t
}

func coldDay(s string) records.Day {
	d, err := records.ParseDay(s)
	if err != nil {
		panic(err) // test data only
	}
	return d
}

func fp(x float64) *float64 { return &x }

type coldReading struct {
	day, hhmm string
	air       float64
	wind      *float64
}

var coldReadings = []coldReading{
	{"2026-01-10", "06:00", 0, fp(10)},   // weather.csv:2
	{"2026-01-10", "14:00", 5, fp(5)},    // weather.csv:3
	{"2026-01-11", "06:00", -15, fp(30)}, // weather.csv:4
	{"2026-01-11", "12:00", -10, fp(20)}, // weather.csv:5
	{"2026-01-12", "06:00", -25, fp(20)}, // weather.csv:6
	{"2026-01-12", "12:00", -20, fp(50)}, // weather.csv:7
	{"2026-01-13", "06:00", -35, fp(8)},  // weather.csv:8
	{"2026-01-13", "09:00", -30, fp(40)}, // weather.csv:9
	{"2026-01-13", "12:00", -40, fp(10)}, // weather.csv:10
}

type coldStint struct {
	staff, day, from, to, activity string
	emergency                      records.Bool
}

var coldStints = []coldStint{
	{"K-ORVO", "2026-01-13", "06:10", "06:51", "", records.No},          // outdoor_work.csv:2, 41 min at −35/8
	{"K-LISA", "2026-01-13", "06:10", "06:50", "moderate", records.No},  // outdoor_work.csv:3, 40 min at −35/8
	{"K-LISA", "2026-01-13", "12:20", "12:35", "heavy", records.No},     // outdoor_work.csv:4, at −40/10
	{"K-ORVO", "2026-01-13", "12:20", "13:30", "moderate", records.Yes}, // outdoor_work.csv:5, emergency
}

func coldSet() *records.Set {
	set := &records.Set{
		Facility: records.Facility{
			Name: "Birchfall Fur Research Station", TimeZone: "Europe/Helsinki",
			Buildings: []records.Building{
				{ID: "SHED-N", Exposure: "outdoor", WeatherSite: "YARD"},
				{ID: "BARN", Exposure: "indoor", WeatherSite: "YARD"},
			},
			WeatherSites: []string{"YARD"},
		},
		Location: coldZone,
		Present: map[string]bool{"animals.csv": true, "enclosures.csv": true, "daily_care.csv": true,
			"weather.csv": true, "outdoor_work.csv": true, "staff.csv": true},
	}
	for i, e := range []struct {
		id, building string
		nest         records.Bool
	}{{"N-01", "SHED-N", records.Yes}, {"N-02", "SHED-N", records.No}, {"B-01", "BARN", records.No}} {
		set.Enclosures = append(set.Enclosures, records.Enclosure{
			Ref: records.Ref(fmt.Sprintf("enclosures.csv:%d", i+2)), ID: e.id, BuildingID: e.building,
			Kind: "cage", FloorAreaM2: fp(1.2), HeightCm: 90, NestBox: e.nest, Platform: records.Yes,
		})
		set.Animals = append(set.Animals, records.Animal{
			Ref: records.Ref(fmt.Sprintf("animals.csv:%d", i+2)), ID: fmt.Sprintf("VX-10%d", i+1),
			Species: "vulpes_vulpes", Sex: "f", ArrivedOn: coldDay("2025-11-01"), EnclosureID: e.id, LifeStage: "adult",
		})
	}
	for i, id := range []string{"K-ORVO", "K-LISA"} {
		// Rabies pre-exposure series done: the keepers' care rounds of fox
		// cages are rabies-risk work (checks.md "Corrections to the first set").
		set.Staff = append(set.Staff, records.Staff{Ref: records.Ref(fmt.Sprintf("staff.csv:%d", i+2)), ID: id, Name: id, Role: "keeper",
			RabiesPrimaryOn: coldDay("2025-10-01")})
	}
	line := 2
	round := func(day, hhmm, enc, building, water string, bedding records.Bool) {
		set.Care = append(set.Care, records.CareRound{
			Ref: records.Ref(fmt.Sprintf("daily_care.csv:%d", line)), At: coldAt(day, hhmm), Day: coldDay(day),
			EnclosureID: enc, BuildingID: building, StaffID: "K-ORVO", Observed: records.Yes, Fed: records.Yes,
			Water: water, BeddingAdded: bedding,
		})
		line++
	}
	for d := coldDay("2026-01-04"); d <= coldDay("2026-01-14"); d++ {
		day := d.String()
		bedShed, bedN01 := records.No, records.No
		if day == "2026-01-04" {
			bedShed = records.Yes
		}
		if day == "2026-01-11" {
			bedN01 = records.Yes
		}
		round(day, "08:00", "", "SHED-N", "ok", bedShed)
		round(day, "08:10", "", "BARN", "ok", records.Yes)
		round(day, "16:00", "N-01", "", "frozen", bedN01)
		round(day, "16:05", "N-02", "", "not_checked", records.No)
	}
	for i, r := range coldReadings {
		set.Weather = append(set.Weather, records.Weather{
			Ref: records.Ref(fmt.Sprintf("weather.csv:%d", i+2)), At: coldAt(r.day, r.hhmm), SiteID: "YARD",
			AirTempC: r.air, WindKmh: r.wind,
		})
	}
	for i, s := range coldStints {
		set.Work = append(set.Work, records.OutdoorWork{
			Ref: records.Ref(fmt.Sprintf("outdoor_work.csv:%d", i+2)), StaffID: s.staff,
			StartedAt: coldAt(s.day, s.from), EndedAt: coldAt(s.day, s.to), SiteID: "YARD",
			Activity: s.activity, Emergency: s.emergency,
		})
	}
	return set
}

var coldPeriod = Period{From: coldDay("2026-01-10"), To: coldDay("2026-01-14")}

func coldFactsOf(t testing.TB, set *records.Set, p Period) *facts {
	t.Helper()
	f := newFacts(set, defaultLimits(t), p)
	f.coldFacts()
	return f
}

func TestColdSiteDays(t *testing.T) {
	f := coldFactsOf(t, coldSet(), coldPeriod)
	wc := cold.WindChillC
	want := []SiteDays{{Site: "YARD", Days: []DayCold{
		{Day: coldDay("2026-01-10"), MinAirC: 0, MinWindChillC: wc(0, 10), Readings: 2, WindReadings: 2},
		{Day: coldDay("2026-01-11"), MinAirC: -15, MinWindChillC: wc(-15, 30), Readings: 2, WindReadings: 2},
		{Day: coldDay("2026-01-12"), MinAirC: -25, MinWindChillC: wc(-25, 20), Readings: 2, WindReadings: 2},
		{Day: coldDay("2026-01-13"), MinAirC: -40, MinWindChillC: wc(-40, 10), Readings: 3, WindReadings: 3},
		{Day: coldDay("2026-01-14"), Readings: 0},
	}}}
	if diff := cmp.Diff(want, f.weather); diff != "" {
		t.Errorf("weather (-want +got):\n%s", diff)
	}
	// The day minima against the published Environment Canada wind chill
	// table: (0,10)→−3, (−15,30)→−26, (−25,20)→−37 (its worked example;
	// lower than (−20,50)→−35 the same day), (−40,10)→−51.
	wantShown := []int{-3, -26, -37, -51}
	var gotShown []int
	for _, d := range f.weather[0].Days[:4] {
		gotShown = append(gotShown, cold.Display(d.MinWindChillC))
	}
	if diff := cmp.Diff(wantShown, gotShown); diff != "" {
		t.Errorf("displayed day minima (-want +got):\n%s", diff)
	}
}

func with(m map[string]any, kv ...any) map[string]any {
	out := map[string]any{}
	for k, v := range m {
		out[k] = v
	}
	for i := 0; i+1 < len(kv); i += 2 {
		out[kv[i].(string)] = kv[i+1]
	}
	return out
}

// yardDay is one cold day at the YARD site as the rules see it: its coldest
// reading against the Environment Canada wind chill table — (−15, 30 km/h)
// → −26, (−25, 20) → −37 (its worked example), (−40, 10) → −51 — and the
// ECCC hazard band of that value.
func yardDay(on string, kv ...any) map[string]any {
	days := map[string]map[string]any{
		"2026-01-11": {"air_c": -15.0, "wind_kmh": 30.0, "min_wind_chill_c": cold.WindChillC(-15, 30), "wind_chill_display": -26,
			"band": "low (risk of hypothermia with long exposure)", "ref": "weather.csv:4"},
		"2026-01-12": {"air_c": -25.0, "wind_kmh": 20.0, "min_wind_chill_c": cold.WindChillC(-25, 20), "wind_chill_display": -37,
			"band": "exposed skin can freeze in 10–30 min", "ref": "weather.csv:6"},
		"2026-01-13": {"air_c": -40.0, "wind_kmh": 10.0, "min_wind_chill_c": cold.WindChillC(-40, 10), "wind_chill_display": -51,
			"band": "exposed skin can freeze in 2–5 min", "ref": "weather.csv:10"},
	}
	return with(with(days[on], "on", on), kv...)
}

func TestColdSiteAndEnclosureFacts(t *testing.T) {
	f := coldFactsOf(t, coldSet(), coldPeriod)
	noWeather := []any{map[string]any{"from": "2026-01-14", "until": "2026-01-14", "days": 1}}
	// The four freezing days of an enclosure, all with the same number of
	// water checks: one group.
	water := func(checks int) []any {
		return []any{map[string]any{"checks": checks,
			"on":        []string{"2026-01-10", "2026-01-11", "2026-01-12", "2026-01-13"},
			"min_air_c": []any{0.0, -15.0, -25.0, -40.0},
			"air_refs":  []string{"weather.csv:2", "weather.csv:4", "weather.csv:6", "weather.csv:10"},
		}}
	}
	// The days that could be findings, selected with the limits inclusively
	// (two checks against a minimum of two is listed), with their figures:
	// the rules decide (rules/cold_test.rego).
	bedding := func(enc, on, last string, since int) any {
		// No occupant has an outdoor bedding limit (dogs, 9 CFR §3.4(b)(4)): null.
		return yardDay(on, "last_bedding", last, "days_since_bedding", since, "evidence", []any{enc, yardDay(on)["ref"]},
			"min_air_c", yardDay(on)["air_c"], "bedding_below_c", nil, "more_bedding_at_or_below_c", nil)
	}
	shelter := func(enc, on string) any {
		return yardDay(on, "needs_nest_box", true, "needs_shelter", false, "evidence", []any{enc, yardDay(on)["ref"]})
	}
	tests := []struct {
		kind, id string
		want     any
	}{
		{"site", "YARD", map[string]any{
			"readings_recorded": true,
			// −37 on 01-12 and −51 on 01-13 are at or below −28; −26 on
			// 01-11 is not (ECCC table and bands).
			"days_at_or_below_frostbite_limit": []any{yardDay("2026-01-12"), yardDay("2026-01-13")},
			"days_without_readings":            noWeather,
			// 01-14 has no reading, so none with wind either.
			"days_without_wind_readings": []any{with(noWeather[0].(map[string]any),
				"days_with_readings_without_wind", 0, "evidence", []any{})},
		}},
		{"enclosure", "N-01", map[string]any{
			// Two water checks a day (the building round and its own
			// round; "frozen" is a recorded state), fresh bedding on 01-11
			// and a nest box.
			"exposure": "outdoor", "weather_site": "YARD", "nest_box": true, "sheltered": true,
			"days_at_or_below_water_limits_by_checks": water(2),
			// Bedding 0–2 days old and a nest box: not selected.
			"days_at_or_past_bedding_limits":                  []any{},
			"days_at_or_below_shelter_limit_without_nest_box": []any{},
			"days_without_weather":                            noWeather,
		}},
		{"enclosure", "N-02", map[string]any{
			"exposure": "outdoor", "weather_site": "YARD", "nest_box": false, "sheltered": false,
			// At or below 0 °C from 01-10; not_checked does not count.
			"days_at_or_below_water_limits_by_checks": water(1),
			// Last bedding 01-04: 01-11 is 7 days on.
			"days_at_or_past_bedding_limits": []any{
				bedding("enclosures.csv:3", "2026-01-11", "2026-01-04", 7),
				bedding("enclosures.csv:3", "2026-01-12", "2026-01-04", 8),
				bedding("enclosures.csv:3", "2026-01-13", "2026-01-04", 9),
			},
			"days_at_or_below_shelter_limit_without_nest_box": []any{
				shelter("enclosures.csv:3", "2026-01-11"), shelter("enclosures.csv:3", "2026-01-12"), shelter("enclosures.csv:3", "2026-01-13"),
			},
			"days_without_weather": noWeather,
		}},
		{"enclosure", "B-01", nil}, // indoor: no cold section
	}
	for _, tc := range tests {
		t.Run(tc.kind+"/"+tc.id, func(t *testing.T) {
			got := section(f.docs[tc.kind][tc.id], "cold")
			if diff := cmp.Diff(tc.want, got); diff != "" {
				t.Errorf("cold section (-want +got):\n%s", diff)
			}
		})
	}
}

func TestColdStintFacts(t *testing.T) {
	f := coldFactsOf(t, coldSet(), coldPeriod)
	// ACGIH TLV work/warm-up schedule (Saskatchewan table): −35 °C with an
	// 8 km/h wind, moderate work → 40 min, 4 breaks (a table cell; the
	// schedule's published example is the light-work one, references.md).
	limit := map[string]any{
		"kind": "limit", "text": "max 40 min work, 4 warm-up breaks (row -35 °C, 8 km/h column)", "cell": "40/4",
		"max_work_min": 40, "breaks": 4, "row_warmest_c": -35.0, "column_kmh": 8.0, "air_row_c": -35.0, "light_shift": false,
	}
	// ACGIH TLV table: −40 to −42 °C row, 16 km/h column (10 km/h wind) is C.
	cease := map[string]any{
		"kind": "cease", "text": "non-emergency work should cease (row -40 °C, 16 km/h column)", "cell": "C",
		"max_work_min": nil, "breaks": nil, "row_warmest_c": -40.0, "column_kmh": 16.0, "air_row_c": -40.0, "light_shift": false,
	}
	at0600 := map[string]any{"ref": "weather.csv:8", "at": "2026-01-13 06:00", "air_c": -35.0, "wind_kmh": 8.0,
		"wind_chill_c": cold.WindChillC(-35, 8), "wind_chill_display": -44, "hours_before_start": (10 * time.Minute).Hours()}
	at1200 := map[string]any{"ref": "weather.csv:10", "at": "2026-01-13 12:00", "air_c": -40.0, "wind_kmh": 10.0,
		"wind_chill_c": cold.WindChillC(-40, 10), "wind_chill_display": -51, "hours_before_start": (20 * time.Minute).Hours()}
	stint := func(ref, from, to string, minutes float64, activity string, emergency bool, reading, step map[string]any) any {
		return map[string]any{
			"on": "2026-01-13", "ref": ref, "site": "YARD",
			"started_at": "2026-01-13 " + from, "ended_at": "2026-01-13 " + to,
			"minutes": minutes, "activity": activity, "emergency": emergency, "reading": reading, "step": step,
		}
	}
	tests := []struct {
		staff string
		want  any
	}{
		{"K-ORVO", map[string]any{"readings_recorded": true, "stints": []any{
			stint("outdoor_work.csv:2", "06:10", "06:51", 41, "moderate", false, at0600, limit),
			stint("outdoor_work.csv:5", "12:20", "13:30", 70, "moderate", true, at1200, cease),
		}}},
		{"K-LISA", map[string]any{"readings_recorded": true, "stints": []any{
			stint("outdoor_work.csv:3", "06:10", "06:50", 40, "moderate", false, at0600, limit),
			stint("outdoor_work.csv:4", "12:20", "12:35", 15, "heavy", false, at1200, cease),
		}}},
	}
	for _, tc := range tests {
		t.Run(tc.staff, func(t *testing.T) {
			if diff := cmp.Diff(tc.want, f.docs["staff"][tc.staff]["cold"]); diff != "" {
				t.Errorf("stints (-want +got):\n%s", diff)
			}
		})
	}
}

// The reading a stint is judged on is the latest at or before its start,
// whatever its age (the rule compares the age with
// cold.reading_within_hours); a reading after the start, or the nearest
// one either side, never stands in (checks.md "Never pass what was not
// judged": no reading within 3 h is records.value.missing).
func TestLatestReading(t *testing.T) {
	rs := []*records.Weather{
		{Ref: "weather.csv:2", At: coldAt("2026-01-13", "06:00")},
		{Ref: "weather.csv:3", At: coldAt("2026-01-13", "10:00")},
		{Ref: "weather.csv:4", At: coldAt("2026-01-13", "20:00")},
	}
	tests := []struct {
		name, at string
		want     records.Ref // empty: none
	}{
		{"at the reading", "06:00", "weather.csv:2"},
		{"2 h after, the next as near", "08:00", "weather.csv:2"},
		{"exactly 3 h after", "09:00", "weather.csv:2"},
		{"3 h 1 min after: still the latest before, the next nearer is not used", "09:01", "weather.csv:2"},
		{"6 h after, the next 4 h away", "16:00", "weather.csv:3"},
		{"before the first reading: none, the next is not used", "05:00", ""},
		{"after the last reading", "23:59", "weather.csv:4"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var got records.Ref
			if w, ok := latestReading(rs, coldAt("2026-01-13", tc.at)); ok {
				got = w.Ref
			}
			if diff := cmp.Diff(tc.want, got); diff != "" {
				t.Errorf("reading (-want +got):\n%s", diff)
			}
		})
	}
	if _, ok := latestReading(nil, coldAt("2026-01-13", "08:00")); ok {
		t.Error("latestReading(no readings) found one")
	}
}

// Bedding looks back before the period start: a period starting on a cold
// 01-11 judges that day on the rounds of 01-05…01-11 (D−6…D).
func TestColdBeddingLooksBeforePeriod(t *testing.T) {
	tests := []struct {
		name      string
		beddingOn string
		wantSince []any // days_since_bedding of the days selected (7 or more, or never)
	}{
		{"bedding on D-6 keeps D fresh", "2026-01-05", []any{}},
		{"bedding on D-7 is listed", "2026-01-04", []any{7}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			set := coldSet()
			for i := range set.Care {
				r := &set.Care[i]
				if r.BuildingID == "SHED-N" {
					r.BeddingAdded = records.No
					if r.Day == coldDay(tc.beddingOn) {
						r.BeddingAdded = records.Yes
					}
				}
			}
			f := coldFactsOf(t, set, Period{From: coldDay("2026-01-11"), To: coldDay("2026-01-11")})
			got := []any{}
			for _, d := range section(f.docs["enclosure"]["N-02"], "cold").(map[string]any)["days_at_or_past_bedding_limits"].([]any) {
				got = append(got, d.(map[string]any)["days_since_bedding"])
			}
			if diff := cmp.Diff(tc.wantSince, got); diff != "" {
				t.Errorf("days since bedding of the days listed (-want +got):\n%s", diff)
			}
		})
	}
}

// A reading without wind is not calm (checks.md, second-set clarifications):
// the day's minimum wind chill is taken over the readings with wind, a day
// whose readings all lack wind is listed for records.value.missing and is
// not selected for the wind-chill checks, while its air temperature still
// counts for the water check. Before, such a reading counted as calm (wind
// chill = air temperature) and a −38 °C windless day selected a frostbite
// and bedding day on a made-up value.
func TestColdWindlessReadings(t *testing.T) {
	set := coldSet()
	for i := range set.Weather {
		w := &set.Weather[i]
		switch records.DayOf(w.At).String() {
		case "2026-01-12":
			w.WindKmh = nil // both readings of 01-12 without wind
		case "2026-01-13":
			if w.Ref == "weather.csv:10" {
				w.WindKmh = nil // the coldest air of 01-13 without wind
			}
		}
	}
	f := coldFactsOf(t, set, coldPeriod)
	days := f.weather[0].Days
	// (−35, 8) → −44 and (−30, 40) → −48 (Environment Canada wind chill
	// table): −48 is the lowest of the readings with wind.
	gotDays := []any{days[2].WindReadings, days[2].MinAirC, days[3].WindReadings, cold.Display(days[3].MinWindChillC), days[3].MinAirC}
	if diff := cmp.Diff([]any{0, -25.0, 2, -48, -40.0}, gotDays); diff != "" {
		t.Errorf("01-12 and 01-13 (-want +got):\n%s", diff)
	}
	site := f.docs["site"]["YARD"]["cold"].(map[string]any)
	wantWindless := []any{
		map[string]any{"from": "2026-01-12", "until": "2026-01-12", "days": 1, "days_with_readings_without_wind": 1,
			"evidence": []any{"weather.csv:6", "weather.csv:7"}},
		map[string]any{"from": "2026-01-14", "until": "2026-01-14", "days": 1, "days_with_readings_without_wind": 0, "evidence": []any{}},
	}
	if diff := cmp.Diff(wantWindless, site["days_without_wind_readings"]); diff != "" {
		t.Errorf("days without wind readings (-want +got):\n%s", diff)
	}
	var frost []any
	for _, d := range site["days_at_or_below_frostbite_limit"].([]any) {
		frost = append(frost, d.(map[string]any)["on"])
	}
	if diff := cmp.Diff([]any{"2026-01-13"}, frost); diff != "" {
		t.Errorf("frostbite days (-want +got):\n%s", diff)
	}
	enc := section(f.docs["enclosure"]["N-02"], "cold").(map[string]any)
	var water, bedding []any
	for _, g := range enc["days_at_or_below_water_limits_by_checks"].([]any) {
		for _, on := range g.(map[string]any)["on"].([]string) {
			water = append(water, on)
		}
	}
	sort.Slice(water, func(i, j int) bool { return water[i].(string) < water[j].(string) })
	for _, d := range enc["days_at_or_past_bedding_limits"].([]any) {
		bedding = append(bedding, d.(map[string]any)["on"])
	}
	if diff := cmp.Diff([]any{"2026-01-10", "2026-01-11", "2026-01-12", "2026-01-13"}, water); diff != "" {
		t.Errorf("water days (air still counts) (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff([]any{"2026-01-11", "2026-01-13"}, bedding); diff != "" {
		t.Errorf("bedding days (the windless day is not judged) (-want +got):\n%s", diff)
	}
}

// A stint is given the latest reading at or before its start with its age
// and, without wind, no schedule step: before, a windless reading was read
// in the schedule's calm column and a stint with no reading for days was
// judged on the nearest one, even one after it started.
func TestColdStintReadingGaps(t *testing.T) {
	set := coldSet()
	set.Weather[8].WindKmh = nil // 01-13 12:00, K-LISA's 12:20 stint
	set.Work = append(set.Work, records.OutdoorWork{
		// Before the first reading of the period (01-10 06:00): none.
		Ref: "outdoor_work.csv:6", StaffID: "K-ORVO", StartedAt: coldAt("2026-01-10", "05:00"),
		EndedAt: coldAt("2026-01-10", "06:30"), SiteID: "YARD", Activity: "moderate", Emergency: records.No,
	}, records.OutdoorWork{
		// 01-14 08:00: the latest reading is 01-13 12:00 (without wind), 20 h before.
		Ref: "outdoor_work.csv:7", StaffID: "K-ORVO", StartedAt: coldAt("2026-01-14", "08:00"),
		EndedAt: coldAt("2026-01-14", "09:30"), SiteID: "YARD", Activity: "moderate", Emergency: records.No,
	})
	f := coldFactsOf(t, set, coldPeriod)
	type got struct {
		Ref, Reading, Step string
		Hours              any
	}
	var gots []got
	for _, id := range []string{"K-LISA", "K-ORVO"} {
		for _, st := range f.docs["staff"][id]["cold"].(map[string]any)["stints"].([]any) {
			s := st.(map[string]any)
			g := got{Ref: s["ref"].(string), Step: s["step"].(map[string]any)["kind"].(string)}
			if r, ok := s["reading"].(map[string]any); ok {
				g.Reading, g.Hours = r["ref"].(string), r["hours_before_start"]
			}
			gots = append(gots, g)
		}
	}
	want := []got{
		{"outdoor_work.csv:3", "weather.csv:8", "limit", (10 * time.Minute).Hours()},
		{"outdoor_work.csv:4", "weather.csv:10", "unknown", (20 * time.Minute).Hours()},
		{"outdoor_work.csv:2", "weather.csv:8", "limit", (10 * time.Minute).Hours()},
		{"outdoor_work.csv:5", "weather.csv:10", "unknown", (20 * time.Minute).Hours()},
		{"outdoor_work.csv:6", "", "unknown", nil},
		{"outdoor_work.csv:7", "weather.csv:10", "unknown", 20.0},
	}
	if diff := cmp.Diff(want, gots); diff != "" {
		t.Errorf("stints (-want +got):\n%s", diff)
	}
}

// An outdoor building without weather_site: its occupied days are listed
// for records.value.missing (before, its enclosures' cold checks were off
// without a word).
func TestBuildingWithoutWeatherSite(t *testing.T) {
	set := coldSet()
	set.Facility.Buildings[0].WeatherSite = ""
	set.Facility.Buildings[0].Line = 4
	f := coldFactsOf(t, set, coldPeriod)
	want := map[string]any{
		"weather_site":  nil,
		"occupied_days": []any{map[string]any{"from": "2026-01-10", "until": "2026-01-14", "days": 5}},
	}
	if diff := cmp.Diff(want, f.docs["building"]["SHED-N"]["weather"]); diff != "" {
		t.Errorf("SHED-N weather (-want +got):\n%s", diff)
	}
	if got := f.docs["building"]["SHED-N"]["ref"]; got != "facility.yaml:4" {
		t.Errorf("SHED-N ref = %v, want facility.yaml:4", got)
	}
	if _, has := f.docs["building"]["BARN"]; has {
		t.Error("the indoor BARN got a weather section")
	}
}

// TestColdWaterGroupsShared: enclosures of one site with the same water
// days by checks get the same group objects from one converter, and an
// enclosure whose days differ (same count, same checks) gets its own; each
// section converts as OPA converts its made section.
func TestColdWaterGroupsShared(t *testing.T) {
	p := Period{From: records.DayOf(coldAt("2026-01-10", "00:00")), To: records.DayOf(coldAt("2026-01-19", "00:00"))}
	pd := newPeriodDays(p)
	n := len(pd.text)
	sc := &siteCold{minAir: make([]any, n), airRefs: make([]string, n),
		minAirTerms: make([]*ast.Term, n), airRefTerms: make([]*ast.Term, n)}
	for i := range n {
		sc.minAir[i] = -10.5 - float64(i)
		sc.airRefs[i] = fmt.Sprintf("weather.csv:%d", 4+8*i)
		sc.minAirTerms[i] = ast.NumberTerm(json.Number(strconv.FormatFloat(sc.minAir[i].(float64), 'g', -1, 64)))
		sc.airRefTerms[i] = ast.StringTerm(sc.airRefs[i])
	}
	enc := func(ref string, water ...waterDay) *encCold {
		return &encCold{exposure: "outdoor", site: "YARD", ref: records.Ref(ref), days: pd, sc: sc, water: water}
	}
	a := enc("enclosures.csv:2", waterDay{1, 2}, waterDay{2, 1}, waterDay{3, 2}, waterDay{5, 2})
	b := enc("enclosures.csv:3", waterDay{1, 2}, waterDay{2, 1}, waterDay{3, 2}, waterDay{5, 2})
	other := enc("enclosures.csv:4", waterDay{1, 2}, waterDay{2, 1}, waterDay{4, 2}, waterDay{5, 2})
	c := newConverter()
	var groups [][]*ast.Term
	for _, ec := range []*encCold{a, b, other} {
		sameAsOPA(t, c, map[string]any{"id": string(ec.ref), "cold": &lazy{make: ec.section, term: ec.sectionTerm}})
		groups = append(groups, ec.waterTerms(c))
	}
	if len(groups[0]) != 2 || groups[0][0] != groups[1][0] || groups[0][1] != groups[1][1] {
		t.Errorf("the same groups were not shared: %v, %v", groups[0], groups[1])
	}
	if groups[2][0] != groups[0][0] {
		t.Errorf("the same 1-check group was not shared")
	}
	if groups[2][1] == groups[0][1] || groups[2][1].Equal(groups[0][1]) {
		t.Errorf("other days' 2-check group %v is enclosure a's %v", groups[2][1], groups[0][1])
	}
}
