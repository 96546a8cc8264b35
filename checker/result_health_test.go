package checker

import (
	"context"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// The health figures on the Result are the facts the rules read, with a
// figure marked only where a finding says so. The folder is the invented
// four-fox shed of healthFolder, with one litter weaned at 51 days.
func TestHealthFigures(t *testing.T) {
	lim := defaultLimits(t)
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	engine, err := NewEngine(ctx, []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	set := loadHealth(t, lim, map[string]string{
		"litters.csv": "litter_id,dam_id,whelped_on,born,born_alive,weaned_on,weaned\nL1,A1,2025-11-20,5,5,2026-01-10,4\n",
	})
	res, err := Check(ctx, Config{Records: set, Limits: lim, Engine: engine, Period: healthJanuary})
	if err != nil {
		t.Fatal(err)
	}
	day := func(m, d int) records.Day {
		if m == 12 {
			return records.MakeDay(2025, 12, d)
		}
		return records.MakeDay(2026, 1, d)
	}
	four := 4
	want := &Health{
		Files: []string{"deaths.csv", "observations.csv", "treatments.csv", "litters.csv"},
		Deaths: []DeathLine{
			{Animal: "A2", Species: "vulpes_vulpes", Building: "S1", On: day(1, 6), Cause: "cold", Ref: "deaths.csv:2"},
			{Animal: "A3", Species: "vulpes_vulpes", Building: "S1", On: day(1, 13), Cause: "unknown", Ref: "deaths.csv:3"},
		},
		// Worked by hand: A1 31 days, A2 1–6 January 6, A3 1–13 January 13,
		// A4 20–31 January 12: 62 animal-days, a mean daily population of
		// 62 / 31 = 2, and 2 deaths = 100 %, over 2 deaths and 2 % (the
		// limits file's health.mortality, facility choice).
		Mortality:      []MortalityMonth{{Building: "S1", Month: day(1, 1), Deaths: 2, AnimalDays: 62, DaysInMonth: 31, High: true}},
		MortalityLimit: MortalityLimit{MinDeaths: 2, MonthlyPct: 2},
		OpenCases: []OpenCase{{Case: "C-1", Animal: "A1", Diagnosis: "lameness left hind", Opened: day(1, 6), Reviewed: day(1, 20),
			Ref: "treatments.csv:2"}},
		// 6.2 kg on 19 January is 11.4 % below the 7.0 kg of 20 December,
		// 30 days before: at least weight_loss_pct 10 (common practice).
		WeightLoss: []AnimalWeights{{Animal: "A1", Species: "vulpes_vulpes", Weighings: []Weighing{
			{Day: day(12, 20), Kg: 7.0}, {Day: day(1, 5), Kg: 6.5}, {Day: day(1, 19), Kg: 6.2}}, Findings: []records.Day{day(1, 19)}}},
		WeightLossPct: 10, WeightLossDays: 30,
		// 51 days from whelping to weaning, under the Council of Europe's
		// 8 weeks (56 days) [M].
		EarlyWeaning: []WeanedLitter{{Litter: "L1", Dam: "A1", Species: "vulpes_vulpes", Whelped: records.MakeDay(2025, 11, 20),
			WeanedOn: day(1, 10), AgeDays: 51, MinDays: 56, Born: 5, Weaned: &four}},
	}
	if diff := cmp.Diff(want, res.Health); diff != "" {
		t.Errorf("health figures (-want +got):\n%s", diff)
	}
}

// The warm-season figures: a site is charted only when a day reaches
// hot_day_c, and the heat index is the NWS one.
func TestWarmFigures(t *testing.T) {
	lim := defaultLimits(t)
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	engine, err := NewEngine(ctx, []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name    string
		weather string
		want    []SiteHeat
	}{
		{"winter: no warm-season site", "observed_at,site_id,air_temp_c,wind_kmh,humidity_pct\n2026-01-10T12:00,MAST,-12,10,80\n", []SiteHeat{}},
		// NWS heat index chart (shared/references.md): 90 °F at 50 % → 95 °F
		// (35.0 °C), within the chart's 1 °F (0.56 °C); 90 °F is 32.2 °C.
		{"a hot day", "observed_at,site_id,air_temp_f,wind_mph,humidity_pct\n2026-01-10T12:00,MAST,90,5,50\n",
			[]SiteHeat{{Site: "MAST", Days: []DayHeat{{Day: records.MakeDay(2026, 1, 10), MaxAirC: 32.2, MaxHeatIndexC: 35.0, Readings: 1}}}}},
	}
	round := cmp.Comparer(func(a, b float64) bool { return a-b < 0.56 && b-a < 0.56 })
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			set := loadHealth(t, lim, map[string]string{"weather.csv": tt.weather})
			res, err := Check(ctx, Config{Records: set, Limits: lim, Engine: engine, Period: healthJanuary})
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(tt.want, res.Warm.Sites, round); diff != "" {
				t.Errorf("sites (-want +got):\n%s", diff)
			}
			if res.Warm.EnvironmentRecorded || len(res.Warm.Buildings) != 0 {
				t.Errorf("no environment.csv, yet recorded %v with %d buildings", res.Warm.EnvironmentRecorded, len(res.Warm.Buildings))
			}
			if res.Warm.HotDayC != lim.Heat.HotDayC {
				t.Errorf("hot_day_c %v, want the limit in force %v", res.Warm.HotDayC, lim.Heat.HotDayC)
			}
		})
	}
}

// A run limited to other domains (--only cold) carries no health or
// warm-season figures: they are marked by findings it did not keep.
func TestFiguresFollowOnly(t *testing.T) {
	lim := defaultLimits(t)
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	engine, err := NewEngine(ctx, []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		only             []string
		health, warmSeen bool
	}{
		{nil, true, true},
		{[]string{"cold"}, false, false},
		{[]string{"health"}, true, false},
		{[]string{"care"}, false, true},
	}
	for _, tt := range tests {
		res, err := Check(ctx, Config{Records: loadHealth(t, lim, nil), Limits: lim, Engine: engine, Period: healthJanuary, Only: tt.only})
		if err != nil {
			t.Fatal(err)
		}
		if got := res.Health != nil; got != tt.health {
			t.Errorf("only %v: health figures %v, want %v", tt.only, got, tt.health)
		}
		if got := res.Warm != nil; got != tt.warmSeen {
			t.Errorf("only %v: warm figures %v, want %v", tt.only, got, tt.warmSeen)
		}
	}
}
