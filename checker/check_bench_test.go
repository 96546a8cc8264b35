package checker

import (
	"context"
	"fmt"
	"testing"
	"time"

	"welfare/records"
)

// yearOfCages builds, in memory, a facility of n single-fox outdoor cages
// with two care rounds per cage per day for a year, a weather reading every
// three hours, a handling event per animal per month and an outdoor stint
// per keeper per day: the shape of the stress case in DESIGN.md, scaled by n.
func yearOfCages(b *testing.B, n int) (*records.Set, Period, int) {
	b.Helper()
	loc, err := time.LoadLocation("America/Winnipeg")
	if err != nil {
		b.Fatal(err)
	}
	from := records.MakeDay(2025, time.July, 1)
	to := from + 364
	set := &records.Set{
		Facility: records.Facility{Name: "Bench station (invented)", TimeZone: "America/Winnipeg",
			Buildings:    []records.Building{{ID: "S", Exposure: "outdoor", WeatherSite: "MAST"}},
			WeatherSites: []string{"MAST"}},
		Location: loc,
		Present:  map[string]bool{},
	}
	for _, f := range []string{"facility.yaml", "animals.csv", "enclosures.csv", "staff.csv", "daily_care.csv", "handling.csv", "weather.csv", "outdoor_work.csv", "ppe_checks.csv"} {
		set.Present[f] = true
	}
	area, length := 100.0, 100.0
	for k := 0; k < 4; k++ {
		set.Staff = append(set.Staff, records.Staff{ID: fmt.Sprintf("K%d", k), Name: "Keeper", Role: "keeper",
			HandlingTrainedOn: from, RabiesPrimaryOn: from - 30, Ref: records.Ref(fmt.Sprintf("staff.csv:%d", k+2))})
	}
	for i := 0; i < n; i++ {
		id := fmt.Sprintf("C%05d", i)
		set.Enclosures = append(set.Enclosures, records.Enclosure{ID: id, BuildingID: "S", Kind: "cage",
			LengthCm: &length, WidthCm: &area, HeightCm: 75, MaxOccupants: 1, NestBox: records.Yes, Platform: records.Yes,
			Ref: records.Ref(fmt.Sprintf("enclosures.csv:%d", i+2))})
		set.Animals = append(set.Animals, records.Animal{ID: fmt.Sprintf("F%05d", i), Species: "vulpes_vulpes",
			ArrivedOn: from - 100, EnclosureID: id, Ref: records.Ref(fmt.Sprintf("animals.csv:%d", i+2))})
	}
	line := 2
	for d := from; d <= to; d++ {
		for i := 0; i < n; i++ {
			for _, hour := range []int{7, 16} {
				at := d.In(loc).Add(time.Duration(hour) * time.Hour)
				set.Care = append(set.Care, records.CareRound{Ref: records.Ref(fmt.Sprintf("daily_care.csv:%d", line)),
					At: at, Day: d, EnclosureID: set.Enclosures[i].ID, StaffID: "K1",
					Observed: records.Yes, Fed: records.Yes, Water: "ok", BeddingAdded: records.Yes})
				line++
			}
		}
		for h := 0; h < 24; h += 3 {
			wind := 10.0
			set.Weather = append(set.Weather, records.Weather{At: d.In(loc).Add(time.Duration(h) * time.Hour),
				SiteID: "MAST", AirTempC: -30 + float64(h), WindKmh: &wind, Ref: records.Ref(fmt.Sprintf("weather.csv:%d", len(set.Weather)+2))})
		}
		start := d.In(loc).Add(9 * time.Hour)
		set.Work = append(set.Work, records.OutdoorWork{StaffID: "K2", StartedAt: start, EndedAt: start.Add(30 * time.Minute),
			SiteID: "MAST", Ref: records.Ref(fmt.Sprintf("outdoor_work.csv:%d", len(set.Work)+2))})
	}
	for i := 0; i < n; i++ {
		for m := 0; m < 12; m++ {
			at := (from + records.Day(m*30+i%28)).In(loc).Add(10 * time.Hour)
			set.Handling = append(set.Handling, records.Handling{At: at, AnimalID: set.Animals[i].ID, StaffID: "K3",
				Purpose: "weighing", Glove: "bite_resistant", PPE: []string{"coverall"},
				Ref: records.Ref(fmt.Sprintf("handling.csv:%d", len(set.Handling)+2))})
		}
	}
	rows := len(set.Care) + len(set.Weather) + len(set.Work) + len(set.Handling) + len(set.Animals) + len(set.Enclosures)
	return set, Period{From: from, To: to}, rows
}

// BenchmarkCheckYear1000Cages is one year of 1,000 single-animal cages
// (730,000 care rounds): facts, every shipped rule, findings.
func BenchmarkCheckYear1000Cages(b *testing.B) { benchmarkCheckYear(b, 1000) }

// BenchmarkCheckYear10000Cages is the stress case of DESIGN.md: 10,000
// animals for 365 days (7.3 million care rounds at two rounds a day).
func BenchmarkCheckYear10000Cages(b *testing.B) { benchmarkCheckYear(b, 10000) }

func benchmarkCheckYear(b *testing.B, n int) {
	set, period, rows := yearOfCages(b, n)
	lim := defaultLimits(b)
	engine := shippedEngine(b, lim)
	ctx := context.Background()
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		res, err := Check(ctx, Config{Records: set, Limits: lim, Engine: engine, Period: period})
		if err != nil {
			b.Fatal(err)
		}
		if i == 0 {
			b.ReportMetric(float64(len(res.Findings)), "findings")
		}
	}
	b.ReportMetric(float64(rows)*float64(b.N)/b.Elapsed().Seconds(), "rows/s")
}
