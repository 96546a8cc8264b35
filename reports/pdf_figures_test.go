package reports_test

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
)

// figuresResult is the sample result with the health and warm-season
// figures of an invented summer: 14 foxes losing weight (more than the PDF
// charts), two deaths in shed S1, a hot week at the mast, an indoor dog
// room and a cleaning gap with its finding, and a reportable finding.
func figuresResult() *checker.Result {
	r := sampleResult(40)
	day := func(d int) records.Day { return records.MakeDay(2026, 1, d) }
	r.Findings = append(r.Findings,
		checker.Finding{Check: "protocol.species.unapproved", Domain: "protocol", Subject: "P-2025-03", On: day(9),
			Severity: checker.Significant, Message: "vulpes_lagopus used; the protocol approves vulpes_vulpes only",
			Title: "Species not approved", Source: "PHS Policy IV.C.1", Reportable: true},
		checker.Finding{Check: "care.cleaning.overdue", Domain: "care", Subject: "N-03", On: day(16),
			Severity: checker.Minor, Message: "not cleaned for 15 days", Title: "Cleaning overdue", Source: "facility choice"},
		checker.Finding{Check: "heat.danger", Domain: "heat", Subject: "north-yard", On: day(20), Until: day(21),
			Severity: checker.Note, Message: "heat index 41 °C", Title: "Dangerous heat", Source: "NWS"},
	)
	checker.SortFindings(r.Findings)
	h := &checker.Health{
		Files: []string{"deaths.csv", "observations.csv", "treatments.csv", "litters.csv"},
		Deaths: []checker.DeathLine{
			{Animal: "VV-0101", Species: "vulpes_vulpes", Building: "S1", On: day(6), Cause: "cold", Ref: "deaths.csv:2"},
			{Animal: "VV-0102", Species: "vulpes_vulpes", Building: "S1", On: day(13), Cause: "unknown", Ref: "deaths.csv:3"},
		},
		// Worked by hand: 62 animal-days in a 31-day month is a mean daily
		// population of 2; 2 deaths of 2 is 100.0 %.
		Mortality:      []checker.MortalityMonth{{Building: "S1", Month: day(1), Deaths: 2, AnimalDays: 62, DaysInMonth: 31, High: true}},
		MortalityLimit: checker.MortalityLimit{MinDeaths: 2, MonthlyPct: 2},
		OpenCases:      []checker.OpenCase{{Case: "C-1", Animal: "VV-0103", Diagnosis: "lameness left hind", Opened: day(6), Ref: "treatments.csv:2"}},
		WeightLossPct:  10, WeightLossDays: 30,
		EarlyWeaning: []checker.WeanedLitter{{Litter: "L1", Dam: "VV-0104", Species: "vulpes_vulpes",
			Whelped: records.MakeDay(2025, 11, 20), WeanedOn: day(10), AgeDays: 51, MinDays: 56, Born: 5}},
	}
	for i := 0; i < 14; i++ {
		h.WeightLoss = append(h.WeightLoss, checker.AnimalWeights{Animal: fmt.Sprintf("VV-%04d", 120+i), Species: "vulpes_vulpes",
			Weighings: []checker.Weighing{{Day: day(1) - 12, Kg: 7.0}, {Day: day(5), Kg: 6.6}, {Day: day(19), Kg: 6.2 - float64(i)/20}},
			Findings:  []records.Day{day(19)}})
	}
	r.Health = h
	w := &checker.Warm{HotDayC: 25, EnvironmentRecorded: true, CleaningRecorded: true, CleanEveryDays: 14,
		Sites: []checker.SiteHeat{{Site: "north-yard"}},
		Buildings: []checker.BuildingClimate{{Building: "KB", Exposure: "indoor",
			Ranges: []checker.SpeciesRange{{Species: "canis_familiaris", MinC: 7.2, MaxC: 29.5}}}},
		Cleaning: []checker.CleaningGap{{Enclosure: "N-03", From: day(1), Until: day(20), Days: 19, Overdue: true},
			{Enclosure: "N-04", From: day(2), Until: day(8), Days: 6}}}
	for d := day(1); d <= day(31); d++ {
		hot := 0.0
		if d >= day(18) && d <= day(22) {
			hot = 12
		}
		w.Sites[0].Days = append(w.Sites[0].Days, checker.DayHeat{Day: d, MaxAirC: 20 + hot, MaxHeatIndexC: 20 + hot*1.4, Readings: 8})
		w.Buildings[0].Days = append(w.Buildings[0].Days, checker.DayRange{Day: d, MinC: 19, MaxC: 22 + hot*0.8, Readings: 24})
	}
	r.Warm = w
	return r
}

func TestWritePDFHealthWarmReportable(t *testing.T) {
	tests := []struct {
		name    string
		r       *checker.Result
		want    []string
		wantNot []string
	}{
		{"summer", figuresResult(), []string{
			// Cover and findings: the reportable mark (PHS Policy IV.F.3).
			"Reportable 1 finding to report to the institutional official (PHS Policy IV.F.3)",
			"» Report to the institutional official (PHS Policy IV.F.3).",
			"1 finding to report to the institutional official (PHS Policy IV.F.3): marked » in the findings.",
			// Health and mortality.
			"Health and mortality", "Deaths by month and cause", "unknown", "cold",
			"S1 2026-01 2 62 2.0 100.0 % health.mortality.high",
			"C-1 VV-0103 lameness left hind 2026-01-06",
			"Animal VV-0120", "Animal VV-0131", "2 more animals with weight-loss findings",
			"L1 VV-0104 vulpes_vulpes 2025-11-20 2026-01-10 51 56 5 / not recorded",
			// Warm season: NWS bands from checker/heat, hot_day_c.
			"Warm season, inside buildings and cleaning", "Weather site north-yard", "25: hot day",
			"27–32 °C (80–90 °F): caution", "52 °C (125 °F) and above: extreme danger",
			"Building KB", "29.5: canis_familiaris max", "7.2: canis_familiaris min",
			"N-03 2026-01-01 2026-01-20 19 care.cleaning.overdue",
			// The staff heat caution quotes the same bands.
			"Heat illness for staff", "caution from 27 °C (80 °F)", "extreme danger from 52 °C (125 °F)",
		}, []string{"Animal VV-0132", "Animal VV-0133"}},
		{"winter folder", func() *checker.Result {
			r := sampleResult(40)
			r.Warm = &checker.Warm{HotDayC: 25, CleaningRecorded: true, CleanEveryDays: 14}
			return r
		}(), []string{
			"Inside buildings and cleaning", "no warm-season chart", "No environment.csv in the records folder",
			"No gap between cleanings", "Reportable none",
		}, []string{"Health and mortality", "Warm season", "25: hot day"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			file := filepath.Join(t.TempDir(), "audit.pdf")
			if err := os.WriteFile(file, writePDF(t, tt.r, sampleOptions()), 0o644); err != nil {
				t.Fatal(err)
			}
			flat := strings.Join(strings.Fields(run(t, "pdftotext", "-raw", file, "-")), " ")
			for _, w := range tt.want {
				if !strings.Contains(flat, w) {
					t.Errorf("PDF text lacks %q", w)
				}
			}
			for _, w := range tt.wantNot {
				if strings.Contains(flat, w) {
					t.Errorf("PDF text has %q", w)
				}
			}
		})
	}
}

// The mortality figures in findings.json, worked by hand: 62 animal-days
// over 31 days is a mean population of 2; 2 deaths is 100 %.
func TestJSONHealth(t *testing.T) {
	doc := reports.NewJSONReport(figuresResult())
	if doc.Health == nil {
		t.Fatal("no health object")
	}
	m := doc.Health.Mortality[0]
	if m.MeanPopulation != 2 || m.MortalityPct != 100 || !m.High || m.Month != "2026-01" {
		t.Errorf("mortality = %+v, want mean 2, 100 %%, high, 2026-01", m)
	}
	if got := len(doc.Health.WeightLoss); got != 14 {
		t.Errorf("weight_loss lists %d animals, want all 14 (the PDF caps its charts, the JSON does not)", got)
	}
	if reports.NewJSONReport(sampleResult(3)).Health != nil {
		t.Errorf("a result without health figures has a health object")
	}
}

// The warm-season figures the PDF draws are in findings.json too, day by
// day: the mast's hottest day, 2026-01-20, is 20 + 12 = 32 °C air and
// 20 + 12 × 1.4 = 36.8 °C heat index, and the dog room's range is
// 7.2–29.5 °C (the sample's own numbers, carried over unchanged).
func TestJSONWarm(t *testing.T) {
	b, err := json.Marshal(reports.NewJSONReport(figuresResult()))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Warm *struct {
			HotDayC float64 `json:"hot_day_c"`
			Sites   []struct {
				Site string
				Days []struct {
					On            string
					MaxAirC       float64 `json:"max_air_c"`
					MaxHeatIndexC float64 `json:"max_heat_index_c"`
					Readings      int
				}
			}
			EnvironmentRecorded bool `json:"environment_recorded"`
			Buildings           []struct {
				Building, Exposure string
				Ranges             []struct {
					Species string
					Min     float64 `json:"min_c"`
					Max     float64 `json:"max_c"`
				}
				Days []struct {
					On       string
					Max      float64 `json:"max_c"`
					Readings int
				}
			}
			CleaningRecorded bool `json:"cleaning_recorded"`
			CleanEveryDays   int  `json:"clean_every_days"`
			Cleaning         []struct {
				Enclosure, From, Until string
				Days                   int
				Overdue                bool
			}
		}
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	w := doc.Warm
	if w == nil {
		t.Fatalf("no warm object in %s", b)
	}
	if w.HotDayC != 25 || !w.EnvironmentRecorded || !w.CleaningRecorded || w.CleanEveryDays != 14 {
		t.Errorf("warm = hot_day_c %v, environment %v, cleaning %v every %d days", w.HotDayC, w.EnvironmentRecorded, w.CleaningRecorded, w.CleanEveryDays)
	}
	if len(w.Sites) != 1 || w.Sites[0].Site != "north-yard" || len(w.Sites[0].Days) != 31 {
		t.Fatalf("sites = %+v, want north-yard with 31 days", w.Sites)
	}
	if d := w.Sites[0].Days[19]; d.On != "2026-01-20" || d.MaxAirC != 32 || math.Abs(d.MaxHeatIndexC-36.8) > 1e-9 || d.Readings != 8 {
		t.Errorf("north-yard 2026-01-20 = %+v, want 32 °C air, 36.8 °C heat index, 8 readings", d)
	}
	if len(w.Buildings) != 1 || w.Buildings[0].Building != "KB" || w.Buildings[0].Exposure != "indoor" ||
		len(w.Buildings[0].Ranges) != 1 || w.Buildings[0].Ranges[0].Min != 7.2 || w.Buildings[0].Ranges[0].Max != 29.5 ||
		len(w.Buildings[0].Days) != 31 || w.Buildings[0].Days[0].On != "2026-01-01" || w.Buildings[0].Days[0].Readings != 24 {
		t.Errorf("buildings = %+v", w.Buildings)
	}
	if len(w.Cleaning) != 2 || w.Cleaning[0].Enclosure != "N-03" || w.Cleaning[0].From != "2026-01-01" ||
		w.Cleaning[0].Until != "2026-01-20" || w.Cleaning[0].Days != 19 || !w.Cleaning[0].Overdue || w.Cleaning[1].Overdue {
		t.Errorf("cleaning = %+v", w.Cleaning)
	}
	if reports.NewJSONReport(sampleResult(3)).Warm != nil {
		t.Errorf("a result without warm-season figures has a warm object")
	}
}

var keepFigures = flag.String("keep-figures", "", "also write the figures report's PDF to this file, to look at it")

func TestWritePDFFiguresDeterministic(t *testing.T) {
	r := figuresResult()
	first := writePDF(t, r, sampleOptions())
	if got := writePDF(t, r, sampleOptions()); string(got) != string(first) {
		t.Fatalf("second write differs (%d vs %d bytes)", len(got), len(first))
	}
	if *keepFigures != "" {
		if err := os.WriteFile(*keepFigures, first, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}
