package records

import (
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestEnvironmentFile(t *testing.T) {
	const head = "observed_at,building_id,air_temp_f,humidity_pct,ammonia_ppm\n"
	s := mustLoad(t, folder(map[string]string{
		environmentFile: head +
			"2026-07-14T13:00,B2,86,55,12\n" + // line 2: accepted, 86 °F = 30 °C
			"2026-07-14T14:00,B2,,55,12\n" + // line 3: air temperature required
			"2026-07-14T15:00,B2,85,101,12\n" + // line 4: humidity above 100
			"2026-07-14T16:00,B2,85,60,-1\n" + // line 5: ammonia below 0
			"2026-07-14T17:00,B9,85,60,3\n" + // line 6: unknown building
			"2026-07-14T18:00,S1,80.6,,\n", // line 7: accepted, humidity and ammonia not recorded
	}))
	want := []string{
		`environment.csv:3: air_temp_f: is required but empty`,
		`environment.csv:4: humidity_pct: 101 is outside the plausible range 0 … 100`,
		`environment.csv:5: ammonia_ppm: -1 must be at least 0`,
		`environment.csv:6: building_id: "B9" is not a building: add it under buildings in facility.yaml`,
	}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	if len(s.Environment) != 2 {
		t.Fatalf("accepted %d readings, want 2: %+v", len(s.Environment), s.Environment)
	}
	r := s.Environment[0]
	// 86 °F = (86 − 32)/1.8 = 30 °C (NIST SP 811).
	if r.Ref != "environment.csv:2" || r.BuildingID != "B2" || r.AirTempC != 30 || *r.HumidityPct != 55 || *r.AmmoniaPpm != 12 ||
		r.At.Hour() != 13 || r.At.Location().String() != "America/Winnipeg" {
		t.Errorf("reading = %+v", r)
	}
	if r := s.Environment[1]; r.HumidityPct != nil || r.AmmoniaPpm != nil {
		t.Errorf("empty cells must stay not recorded: %+v", r)
	}
	var acc FileCount
	for _, c := range s.Accounting {
		if c.File == environmentFile {
			acc = c
		}
	}
	if d := cmp.Diff(FileCount{File: environmentFile, Read: 6, Accepted: 2, Rejected: 4}, acc); d != "" {
		t.Errorf("accounting (-want +got):\n%s", d)
	}
	if p := s.Problems[0]; p.Day != MakeDay(2026, 7, 14) {
		t.Errorf("rejected row day = %v, want 2026-07-14", p.Day)
	}
}

func TestHumidityAndShadeColumns(t *testing.T) {
	s := mustLoad(t, folder(map[string]string{
		"weather.csv": "observed_at,site_id,air_temp_c,wind_kmh,humidity_pct\n" +
			"2026-07-14T15:00,MAST,31,5,48\n" +
			"2026-07-14T16:00,MAST,30,,\n" +
			"2026-07-14T17:00,MAST,29,4,-3\n",
		enclosuresFile: "enclosure_id,building_id,kind,floor_area_m2,height_cm,shade\nE1,S1,cage,1.2,80,no\nE2,B2,pen,4.5,100,\n",
	}))
	if d := cmp.Diff([]string{`weather.csv:4: humidity_pct: -3 is outside the plausible range 0 … 100`}, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	if len(s.Weather) != 2 || s.Weather[0].HumidityPct == nil || *s.Weather[0].HumidityPct != 48 || s.Weather[1].HumidityPct != nil {
		t.Errorf("weather = %+v", s.Weather)
	}
	if s.Enclosures[0].Shade != No || s.Enclosures[1].Shade != NotRecorded {
		t.Errorf("shade = %v, %v; want no, not recorded", s.Enclosures[0].Shade, s.Enclosures[1].Shade)
	}
}

func TestHasColumn(t *testing.T) {
	withCleaned := mustLoad(t, folder(map[string]string{
		careFile: "checked_at,enclosure_id,staff_id,observed,cleaned\n2026-07-14T08:00,E1,K1,yes,\n",
	}))
	without := mustLoad(t, folder(map[string]string{
		careFile:      "checked_at,enclosure_id,staff_id,observed\n2026-07-14T08:00,E1,K1,yes\n",
		"weather.csv": "observed_at,site_id,air_temp_f\n2026-07-14T08:00,MAST,80\n",
	}))
	tests := []struct {
		name         string
		s            *Set
		file, column string
		want         bool
	}{
		{"cleaned column, empty cell", withCleaned, careFile, "cleaned", true},
		{"no cleaned column", without, careFile, "cleaned", false},
		{"a unit column by its SI name", without, "weather.csv", "air_temp_c", true},
		{"a file not in the folder", withCleaned, environmentFile, "air_temp_c", false},
	}
	for _, tc := range tests {
		if got := tc.s.HasColumn(tc.file, tc.column); got != tc.want {
			t.Errorf("%s: HasColumn(%s, %s) = %v, want %v", tc.name, tc.file, tc.column, got, tc.want)
		}
	}
}
