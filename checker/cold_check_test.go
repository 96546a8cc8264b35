package checker

import (
	"context"
	"fmt"
	"io/fs"
	"os"
	"sort"
	"strings"
	"testing"
	"testing/fstest"
	"time"
	"welfare/checker/cold"
	"welfare/records"
	"welfare/rules"

	"github.com/google/go-cmp/cmp"
)

// shippedEngine compiles the shipped rules with lim; the cold tests keep the cold domain
// with Config.Only, as `--only cold` does.
func shippedEngine(t testing.TB, lim *rules.Limits) *Engine {
	t.Helper()
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	e, err := NewEngine(context.Background(), []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatalf("NewEngine(shipped rules): %v", err)
	}
	return e
}

func TestColdCheckEndToEnd(t *testing.T) {
	lim := defaultLimits(t)
	eng := shippedEngine(t, lim)
	type row struct{ Check, Subject, On, Until string }
	tests := []struct {
		name   string
		period Period
		want   []row
	}{
		{"the cold week", coldPeriod, []row{
			{"cold.bedding.stale", "N-02", "2026-01-11", "2026-01-13"},
			{"cold.frostbite.risk", "YARD", "2026-01-12", "2026-01-13"},
			{"cold.shelter.missing", "N-02", "2026-01-11", "2026-01-13"},
			{"cold.water.checks_insufficient", "N-02", "2026-01-11", ""},
			{"cold.water.checks_insufficient", "N-02", "2026-01-12", ""},
			{"cold.water.checks_insufficient", "N-02", "2026-01-13", ""},
			{"cold.work.over_limit", "K-ORVO", "2026-01-13", ""},
			{"cold.work.should_cease", "K-LISA", "2026-01-13", ""},
		}},
		{"a clean mild day", Period{From: coldDay("2026-01-10"), To: coldDay("2026-01-10")}, []row{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Check(context.Background(), Config{Records: coldSet(), Limits: lim, Engine: eng, Period: tc.period, Only: []string{"cold"}})
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
			if diff := cmp.Diff(tc.want, got); diff != "" {
				t.Errorf("findings (-want +got):\n%s", diff)
			}
			if len(res.NotEvaluated) > 0 {
				t.Errorf("not evaluated: %v", res.NotEvaluated)
			}
		})
	}
}

// coldBenchSet: 10,000 occupied outdoor enclosures in 100 sheds at one
// site, two rounds a day each (one without a water state, so every freezing
// day is selected), bedding every fifth day, four readings a day between
// −30 and −12 °C, a month of days.
func coldBenchSet() (*records.Set, Period) {
	set := &records.Set{
		Facility: records.Facility{Name: "bench", WeatherSites: []string{"YARD"}},
		Location: coldZone,
		Present:  map[string]bool{"daily_care.csv": true, "weather.csv": true, "animals.csv": true, "enclosures.csv": true},
	}
	from := coldDay("2026-01-01")
	p := Period{From: from, To: from + 30}
	for s := 0; s < 100; s++ {
		set.Facility.Buildings = append(set.Facility.Buildings, records.Building{ID: fmt.Sprintf("S%03d", s), Exposure: "outdoor", WeatherSite: "YARD"})
	}
	for i := 0; i < 10000; i++ {
		id := fmt.Sprintf("E%05d", i)
		set.Enclosures = append(set.Enclosures, records.Enclosure{Ref: records.Ref(fmt.Sprintf("enclosures.csv:%d", i+2)), ID: id, BuildingID: fmt.Sprintf("S%03d", i%100), Kind: "cage", HeightCm: 90, NestBox: records.Bool(1 + i%2)})
		set.Animals = append(set.Animals, records.Animal{Ref: records.Ref(fmt.Sprintf("animals.csv:%d", i+2)), ID: "A" + id, Species: "vulpes_vulpes", ArrivedOn: from - 60, EnclosureID: id, LifeStage: "adult"})
	}
	for d := p.From - 7; d <= p.To; d++ {
		for i := range set.Enclosures {
			e := &set.Enclosures[i]
			for k, hh := range []int{8, 16} {
				set.Care = append(set.Care, records.CareRound{
					Ref: records.Ref(fmt.Sprintf("daily_care.csv:%d", len(set.Care)+2)), At: d.In(coldZone).Add(time.Duration(hh) * time.Hour), Day: d, EnclosureID: e.ID, StaffID: "K",
					Observed: records.Yes, Fed: records.Yes, Water: []string{"ok", "not_checked"}[k], BeddingAdded: records.Bool(1 + int(d)%5/4),
				})
			}
		}
		for hh := 0; hh < 24; hh += 6 {
			set.Weather = append(set.Weather, records.Weather{Ref: records.Ref(fmt.Sprintf("weather.csv:%d", len(set.Weather)+2)), At: d.In(coldZone).Add(time.Duration(hh) * time.Hour), SiteID: "YARD", AirTempC: -30 + float64(int(d)%7*3), WindKmh: fp(float64(hh))})
		}
	}
	return set, p
}

// BenchmarkColdFacts10kEnclosures31Days times the cold facts alone.
func BenchmarkColdFacts10kEnclosures31Days(b *testing.B) {
	set, p := coldBenchSet()
	f := newFacts(set, defaultLimits(b), p)
	f.careIndex()
	b.ResetTimer()
	for b.Loop() {
		f.docs = map[string]map[string]map[string]any{}
		f.coldFacts()
	}
}

// BenchmarkColdCheck10kEnclosures31Days times a whole `--only cold` check:
// every domain's facts and the rules, with about 320,000 findings.
func BenchmarkColdCheck10kEnclosures31Days(b *testing.B) {
	set, p := coldBenchSet()
	lim := defaultLimits(b)
	eng := shippedEngine(b, lim)
	b.ResetTimer()
	for b.Loop() {
		res, err := Check(context.Background(), Config{Records: set, Limits: lim, Engine: eng, Period: p, Only: []string{"cold"}})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(len(res.Findings)), "findings")
	}
}

// The demo's answer key lists every planted finding; the cold checks must
// find exactly its cold rows over the demo period with the shipped limits.
func TestColdDemoMatchesAnswerKey(t *testing.T) {
	key, err := os.ReadFile("../testdata/demo/PLANTED.md")
	if err != nil {
		t.Fatalf("reading the demo answer key: %v", err)
	}
	type row struct{ Check, Subject, On, Until string }
	want := []row{}
	for _, line := range strings.Split(string(key), "\n") {
		cells := strings.Split(line, "|")
		if len(cells) != 6 || !strings.HasPrefix(strings.TrimSpace(cells[1]), "cold.") {
			continue
		}
		want = append(want, row{strings.TrimSpace(cells[1]), strings.TrimSpace(cells[2]), strings.TrimSpace(cells[3]), strings.TrimSpace(cells[4])})
	}
	if len(want) == 0 {
		t.Fatal("the answer key lists no cold findings")
	}
	lim := defaultLimits(t)
	var species []string
	for code := range lim.Species {
		species = append(species, code)
	}
	set, err := records.Load(os.DirFS("../testdata/demo/records"), records.Options{Species: species})
	if err != nil {
		t.Fatalf("loading the demo: %v", err)
	}
	period := Period{From: coldDay("2026-01-01"), To: coldDay("2026-01-31")}
	res, err := Check(context.Background(), Config{Records: set, Limits: lim, Engine: shippedEngine(t, lim), Period: period, Only: []string{"cold"}})
	if err != nil {
		t.Fatalf("Check: %v", err)
	}
	got := []row{}
	for _, f := range res.Findings {
		if f.Check == RejectedCheck {
			continue // listed whatever Only says; not a cold finding
		}
		got = append(got, row{f.Check, f.Subject, f.On.String(), f.Until.String()})
	}
	less := func(rs []row) func(i, j int) bool {
		return func(i, j int) bool {
			a, b := rs[i], rs[j]
			if a.Check != b.Check {
				return a.Check < b.Check
			}
			if a.Subject != b.Subject {
				return a.Subject < b.Subject
			}
			return a.On < b.On
		}
	}
	sort.Slice(want, less(want))
	sort.Slice(got, less(got))
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("cold findings on the demo (-answer key +got):\n%s", diff)
	}
}

// TestColdRuleDecides: with the frostbite limit set exactly to 2026-01-12's
// lowest wind chill (−25 °C, 20 km/h; the Environment Canada worked example),
// the shipped rule (<=) reports 01-12…01-13, and the same rule edited to <
// reports 01-13 alone: the facts did not decide for the rule.
func TestColdRuleDecides(t *testing.T) {
	lim := defaultLimits(t)
	lim.Cold.FrostbiteWindChill = cold.WindChillC(-25, 20)
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	shipped, err := fs.ReadFile(rules.FS(), "cold.rego")
	if err != nil {
		t.Fatal(err)
	}
	const rule = "d.min_wind_chill_c <= lim.frostbite_wind_chill"
	if !strings.Contains(string(shipped), rule) {
		t.Fatalf("cold.rego no longer compares %q", rule)
	}
	edited := strings.Replace(string(shipped), rule, "d.min_wind_chill_c < lim.frostbite_wind_chill", 1)
	tests := []struct {
		name, src string
		want      [][2]string
	}{
		{"at or below", string(shipped), [][2]string{{"2026-01-12", "2026-01-13"}}},
		{"strictly below", edited, [][2]string{{"2026-01-13", ""}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			src := []Source{{Name: "committee", FS: fstest.MapFS{"cold.rego": {Data: []byte(tc.src)}}, Trusted: true}} // the shipped rule as edited in the project
			e, err := NewEngine(context.Background(), src, data, EngineOptions{})
			if err != nil {
				t.Fatal(err)
			}
			res, err := Check(context.Background(), Config{Records: coldSet(), Limits: lim, Engine: e, Period: coldPeriod, Only: []string{"cold"}})
			if err != nil {
				t.Fatal(err)
			}
			var got [][2]string
			for _, f := range res.Findings {
				if f.Check == "cold.frostbite.risk" {
					until := ""
					if f.Until != 0 {
						until = f.Until.String()
					}
					got = append(got, [2]string{f.On.String(), until})
				}
			}
			if diff := cmp.Diff(tc.want, got); diff != "" {
				t.Errorf("frostbite findings (-want +got):\n%s", diff)
			}
		})
	}
}

func TestDogOutdoorShelterAndBedding(t *testing.T) {
	// 9 CFR §3.4(b) (references.md "Dogs in the cold"): a dog in outdoor housing needs a
	// shelter — a nest box, or a sheltered building (checks.md "Corrections to the first
	// set"); §3.4(b)(4): bedding when the ambient temperature is below 50 °F (10 °C).
	// 2026-01-10 is 0 °C with wind chill −3 (Environment Canada table (0,10)→−3): too mild
	// for the foxes' wind-chill bedding limit, cold enough for the dog's 10 °C.
	dogSet := func(exposure string) *records.Set {
		set := coldSet()
		set.Facility.Buildings[0].Exposure = exposure
		set.Animals[1].Species = "canis_familiaris"
		set.Animals[1].LengthCm = fp(80)
		for i := range set.Care {
			set.Care[i].BeddingAdded = records.No
		}
		return set
	}
	lim := defaultLimits(t)
	eng := shippedEngine(t, lim)
	tests := []struct {
		exposure    string
		wantShelter []string // from..until of cold.shelter.missing for N-02
		wantBedding []string // from..until of cold.bedding.stale for N-02
	}{
		// Wind chill ≤ −20 (the cold limits' shelter_wind_chill) from 01-11: (−15,30)→−26.
		{"outdoor", []string{"2026-01-11..2026-01-13"}, []string{"2026-01-10..2026-01-13"}},
		// A sheltered building is the dog's shelter; §3.4 (outdoor housing) bedding does
		// not apply, so only the wind-chill bedding limit selects days.
		{"sheltered", nil, []string{"2026-01-11..2026-01-13"}},
	}
	for _, tt := range tests {
		t.Run(tt.exposure, func(t *testing.T) {
			res, err := Check(context.Background(), Config{Records: dogSet(tt.exposure), Limits: lim, Engine: eng, Period: coldPeriod, Only: []string{"cold"}})
			if err != nil {
				t.Fatalf("Check: %v", err)
			}
			var shelter, bedding []string
			for _, f := range res.Findings {
				if f.Subject != "N-02" {
					continue
				}
				span := f.On.String() + ".." + f.Until.String()
				switch f.Check {
				case "cold.shelter.missing":
					shelter = append(shelter, span)
				case "cold.bedding.stale":
					bedding = append(bedding, span)
					if f.On.String() == "2026-01-10" && !strings.Contains(f.Message, "9 CFR §3.4(b)(4)") {
						t.Errorf("dog bedding message does not cite 9 CFR §3.4(b)(4): %q", f.Message)
					}
				}
			}
			if diff := cmp.Diff(tt.wantShelter, shelter); diff != "" {
				t.Errorf("shelter (-want +got):\n%s", diff)
			}
			if diff := cmp.Diff(tt.wantBedding, bedding); diff != "" {
				t.Errorf("bedding (-want +got):\n%s", diff)
			}
		})
	}
}
