package checker

import (
	"context"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// healthFolder is an invented four-fox shed for January 2026.
func healthFolder(over map[string]string) fstest.MapFS {
	files := map[string]string{
		"facility.yaml": "name: Birchfall Fur Research Station\ntime_zone: America/Winnipeg\nbuildings:\n  - id: S1\n    exposure: outdoor\n    weather_site: MAST\nweather_sites: [MAST]\n",
		"enclosures.csv": "enclosure_id,building_id,kind,length_cm,width_cm,height_cm,nest_box,platform\n" +
			"E1,S1,cage,120,85,78,yes,yes\nE2,S1,cage,120,85,78,yes,yes\nE3,S1,cage,120,85,78,yes,yes\nE4,S1,cage,120,85,78,yes,yes\n",
		"animals.csv": "animal_id,species,sex,arrived_on,left_on,left_reason,enclosure_id\n" +
			"A1,vulpes_vulpes,f,2025-05-01,,,E1\n" +
			"A2,vulpes_vulpes,m,2025-05-01,2026-01-06,died,E2\n" +
			"A3,vulpes_vulpes,f,2025-05-01,,,E3\n" + // died Jan 13, animals.csv not updated
			"A4,vulpes_vulpes,m,2026-01-20,,,E4\n",
		"staff.csv": "staff_id,name,role\nK1,Ilse Marrow,keeper\nV1,Tomas Fell,veterinarian\n",
		"deaths.csv": "animal_id,found_dead_at,found_by,suspected_cause,vet_notified_at,necropsy\n" +
			"A2,2026-01-06T07:30,K1,cold,2026-01-06T09:00,no\n" +
			"A3,2026-01-13T07:30,K1,,,no\n",
		"observations.csv": "observed_at,animal_id,staff_id,mass_kg,body_condition,signs\n" +
			"2025-12-20T09:00,A1,K1,7.0,3,\n" +
			"2026-01-05T09:00,A1,K1,6.5,,lameness\n" +
			"2026-01-19T09:00,A1,K1,6.2,2,\n",
		"handling.csv": "handled_at,animal_id,staff_id,purpose\n" +
			"2026-01-05T08:00,A1,V1,vet_exam\n" +
			"2026-01-06T10:30,A1,K1,weighing\n" +
			"2026-01-08T09:00,A1,V1,vet_exam\n" +
			"2026-01-09T09:00,A1,V1,vet_exam\n",
		"treatments.csv": "case_id,animal_id,opened_on,diagnosis,prescribed_by,reviewed_on,closed_on,outcome\n" +
			"C-1,A1,2026-01-06,lameness left hind,V1,2026-01-20,,\n",
	}
	fsys := fstest.MapFS{}
	for k, v := range files {
		fsys[k] = &fstest.MapFile{Data: []byte(v)}
	}
	for k, v := range over {
		fsys[k] = &fstest.MapFile{Data: []byte(v)}
	}
	return fsys
}

func loadHealth(t *testing.T, lim *rules.Limits, over map[string]string) *records.Set {
	t.Helper()
	set, err := records.Load(healthFolder(over), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	if len(set.Problems) > 0 {
		t.Fatalf("problems: %v", set.Problems)
	}
	return set
}

var healthJanuary = Period{From: records.MakeDay(2026, 1, 1), To: records.MakeDay(2026, 1, 31)}

func TestHealthFacts(t *testing.T) {
	lim := defaultLimits(t)
	f := newFacts(loadHealth(t, lim, nil), lim, healthJanuary)
	f.healthFacts()

	// Mortality, worked by hand: S1 in January (31 days). A1 all month = 31 animal-days;
	// A2 died Jan 6 = 6 (the leaving day counts); A3 died Jan 13 = 13 (its death ends its
	// stay though animals.csv has no left_on); A4 arrived Jan 20 = 12 (20…31).
	// 31 + 6 + 13 + 12 = 62 animal-days, a mean daily population of 62 / 31 = 2.
	want := []any{map[string]any{
		"building": "S1", "month": "2026-01", "on": "2026-01-01", "deaths": 2,
		"death_list": []any{
			map[string]any{"animal": "A2", "on": "2026-01-06", "ref": "deaths.csv:2"},
			map[string]any{"animal": "A3", "on": "2026-01-13", "ref": "deaths.csv:3"},
		},
		"animal_days": 62, "days_in_month": 31,
	}}
	if diff := cmp.Diff(want, f.docs["facility"]["Birchfall Fur Research Station"]["mortality"]); diff != "" {
		t.Errorf("mortality (-want +got):\n%s", diff)
	}

	a1 := f.docs["animal"]["A1"]
	// The December weighing is kept as the series' start, outside the period.
	wantWeights := []any{
		map[string]any{"n": 0, "on": "2025-12-20", "day": int(records.MakeDay(2025, 12, 20)), "at": "2025-12-20 09:00", "kg": 7.0, "ref": "observations.csv:2", "in_period": false},
		map[string]any{"n": 1, "on": "2026-01-05", "day": int(records.MakeDay(2026, 1, 5)), "at": "2026-01-05 09:00", "kg": 6.5, "ref": "observations.csv:3", "in_period": true},
		map[string]any{"n": 2, "on": "2026-01-19", "day": int(records.MakeDay(2026, 1, 19)), "at": "2026-01-19 09:00", "kg": 6.2, "ref": "observations.csv:4", "in_period": true},
	}
	if diff := cmp.Diff(wantWeights, section(a1, "weights")); diff != "" {
		t.Errorf("weights (-want +got):\n%s", diff)
	}
	// The lameness at 09:00 Jan 5: the vet_exam at 08:00 came before it and does not
	// count; the first weighing after is 25.5 h, the first vet_exam 72 h later.
	wantSigns := []any{map[string]any{
		"on": "2026-01-05", "day": int(records.MakeDay(2026, 1, 5)), "at": "2026-01-05 09:00", "ref": "observations.csv:3", "in_period": true,
		"signs": []any{"lameness"}, "vet_informed": false,
		"answers": []any{
			map[string]any{"purpose": "weighing", "hours": 25.5, "ref": "handling.csv:3"},
			map[string]any{"purpose": "vet_exam", "hours": 72.0, "ref": "handling.csv:4"},
		},
		"case": map[string]any{"id": "C-1", "days": 1, "ref": "treatments.csv:2"},
	}}
	if diff := cmp.Diff(wantSigns, a1["signs"]); diff != "" {
		t.Errorf("signs (-want +got):\n%s", diff)
	}
	// Case C-1: opened Jan 6, vet exams Jan 8 and 9, reviewed_on Jan 20, open at the
	// period's end (Feb 1 closes the last interval).
	day := func(d int) int { return int(records.MakeDay(2026, 1, d)) }
	iv := func(from int, by, ref string, next int, nextBy string) any {
		return map[string]any{"from": records.MakeDay(2026, 1, from).String(), "from_day": day(from), "by": by, "ref": ref, "next_day": day(next), "next": nextBy}
	}
	wantIntervals := []any{
		iv(6, "opened", "treatments.csv:2", 8, "vet_exam"),
		iv(8, "vet_exam", "handling.csv:4", 9, "vet_exam"),
		iv(9, "vet_exam", "handling.csv:5", 20, "reviewed_on"),
		iv(20, "reviewed_on", "treatments.csv:2", 32, "period end"),
	}
	cases, _ := a1["cases"].([]any)
	if len(cases) != 1 {
		t.Fatalf("cases = %v", a1["cases"])
	}
	if diff := cmp.Diff(wantIntervals, cases[0].(map[string]any)["intervals"]); diff != "" {
		t.Errorf("case intervals (-want +got):\n%s", diff)
	}

	// A death is the animal's last day: A3's stay ends on Jan 13 though
	// animals.csv was not updated, so no care finding follows it.
	if ss := f.stays["E3"]; len(ss) != 1 || ss[0].To != records.MakeDay(2026, 1, 13) {
		t.Errorf("E3 stays = %+v, want one ending 2026-01-13", ss)
	}
	if ss := f.stays["E2"]; len(ss) != 1 || ss[0].To != records.MakeDay(2026, 1, 6) {
		t.Errorf("E2 stays = %+v, want one ending 2026-01-06", ss)
	}
}

// checkHealthWith runs the shipped rules over the folder with the limits read
// from a limits file, as `welfare check --limits FILE` does.
func checkHealthWith(t *testing.T, limitsText string, over map[string]string, only ...string) []Finding {
	t.Helper()
	path := filepath.Join(t.TempDir(), "limits.yaml")
	if err := os.WriteFile(path, []byte(limitsText), 0o644); err != nil {
		t.Fatal(err)
	}
	fh, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	lim, err := rules.LoadLimits(fh, path)
	if err != nil {
		t.Fatal(err)
	}
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	engine, err := NewEngine(ctx, []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	res, err := Check(ctx, Config{Records: loadHealth(t, lim, over), Limits: lim, Engine: engine, Period: healthJanuary, Only: only})
	if err != nil {
		t.Fatal(err)
	}
	return res.Findings
}

type healthShort struct{ Check, Subject, On string }

func shortHealth(fs []Finding, prefix string) []healthShort {
	out := []healthShort{}
	for _, f := range fs {
		if strings.HasPrefix(f.Check, prefix) {
			out = append(out, healthShort{f.Check, f.Subject, f.On.String()})
		}
	}
	return out
}

// The committee's weight-loss check is retuned in the limits file alone: A1
// lost 7.0 → 6.2 kg = 11.4 % within 30 days (Dec 20 → Jan 19).
func TestWeightLossLimitFromFile(t *testing.T) {
	shipped := string(rules.DefaultLimits())
	if !strings.Contains(shipped, "weight_loss_pct: 10 ") {
		t.Fatal("shipped limits.yaml no longer has weight_loss_pct: 10")
	}
	tests := []struct {
		name, pct string
		want      []healthShort
	}{
		{"shipped 10 %", "10", []healthShort{{"health.weight.loss", "A1", "2026-01-19"}}},
		{"exactly the loss, 11.4 %", "11.4", []healthShort{{"health.weight.loss", "A1", "2026-01-19"}}},
		{"raised to 12 %", "12", []healthShort{}},
		{"lowered to 5 %: Jan 5 is 7.1 % below Dec 20 too", "5", []healthShort{{"health.weight.loss", "A1", "2026-01-05"}, {"health.weight.loss", "A1", "2026-01-19"}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			text := strings.Replace(shipped, "weight_loss_pct: 10 ", "weight_loss_pct: "+tt.pct+" ", 1)
			got := shortHealth(checkHealthWith(t, text, nil, "health"), "health.weight.")
			if diff := cmp.Diff(tt.want, got); diff != "" {
				t.Errorf("findings (-want +got):\n%s", diff)
			}
		})
	}
}

// Every health finding of the small shed, end to end through the rules.
func TestHealthFindings(t *testing.T) {
	got := shortHealth(checkHealthWith(t, string(rules.DefaultLimits()), nil), "")
	want := []healthShort{
		// C-1: vet exam Jan 9, next review Jan 20: Jan 17 is the first day more than 7 days after;
		// reviewed_on Jan 20 and none after: Jan 28.
		{"health.case.unreviewed", "C-1", "2026-01-17"},
		{"health.case.unreviewed", "C-1", "2026-01-28"},
		// Body condition 2 of 5 on Jan 19.
		{"health.condition.poor", "A1", "2026-01-19"},
		// A3: no cause, no necropsy, the veterinarian never told.
		{"health.death.unexplained", "A3", "2026-01-13"},
		{"health.death.vet_not_notified", "A3", "2026-01-13"},
		// 2 deaths, mean daily population 2: 100 %.
		{"health.mortality.high", "S1", "2026-01-01"},
		// The lameness of Jan 5 is answered by case C-1 opened the next day: no signs finding.
		// 7.0 -> 6.2 kg = 11.4 %.
		{"health.weight.loss", "A1", "2026-01-19"},
		// A2's death matches animals.csv; A3 died with no left_on in animals.csv.
		{"records.death.mismatch", "A3", "2026-01-13"},
	}
	var kept []healthShort
	for _, s := range got {
		if strings.HasPrefix(s.Check, "health.") || strings.HasPrefix(s.Check, "records.death") {
			kept = append(kept, s)
		}
	}
	sort.Slice(kept, func(i, j int) bool {
		if kept[i].Check != kept[j].Check {
			return kept[i].Check < kept[j].Check
		}
		return kept[i].On < kept[j].On
	})
	if diff := cmp.Diff(want, kept); diff != "" {
		t.Errorf("findings (-want +got):\n%s", diff)
	}
}

// An observation after the animal's death is a record-keeping finding like
// any other event after departure.
func TestObservationAfterDeath(t *testing.T) {
	obs := "observed_at,animal_id,staff_id,mass_kg\n2026-01-07T09:00,A2,K1,6.1\n2026-01-06T06:00,A2,K1,6.0\n"
	got := shortHealth(checkHealthWith(t, string(rules.DefaultLimits()), map[string]string{"observations.csv": obs}, "records"), "records.event.")
	want := []healthShort{{"records.event.after_departure", "A2", "2026-01-07"}}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("findings (-want +got):\n%s", diff)
	}
}
