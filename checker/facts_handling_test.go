package checker

import (
	"context"
	"sort"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// peopleSet is an invented Birchfall January: keeper Ilse Varga (S1,
// trained, vaccinated, fit-tested), technician Oskar Lind (S2, untrained,
// unvaccinated, left on 5 January), veterinarian Runa Holm (S3, trained for
// barbiturate overdose only); three red foxes and a mink under two
// protocols. Each comment names the finding a row plants.
func peopleSet(t testing.TB) *records.Set {
	d := func(s string) records.Day { return pday(t, s) }
	n := func(v float64) *float64 { return &v }
	i := func(v int) *int { return &v }
	return &records.Set{
		Facility: records.Facility{Name: "Birchfall Fur Research Station", TimeZone: "UTC",
			Buildings: []records.Building{{ID: "B1", Exposure: "outdoor"}}},
		Enclosures: []records.Enclosure{{Ref: "enclosures.csv:2", ID: "E1", BuildingID: "B1", Kind: "pen", FloorAreaM2: n(10), HeightCm: 200, NestBox: records.Yes, Platform: records.Yes}},
		Animals: []records.Animal{
			{Ref: "animals.csv:2", ID: "F1", Species: "vulpes_vulpes", ArrivedOn: d("2025-06-01"), EnclosureID: "E1", ProtocolID: "P1"},
			{Ref: "animals.csv:3", ID: "F2", Species: "vulpes_vulpes", ArrivedOn: d("2025-06-01"), LeftOn: d("2026-01-20"), LeftReason: "culled", EnclosureID: "E1", ProtocolID: "P1"},
			// The third animal under P1, which approves 2: protocol.animals.exceeded on 2026-01-05.
			{Ref: "animals.csv:4", ID: "F3", Species: "vulpes_vulpes", ArrivedOn: d("2026-01-05"), LeftOn: d("2026-01-21"), LeftReason: "culled", EnclosureID: "E1", ProtocolID: "P1"},
			{Ref: "animals.csv:5", ID: "M1", Species: "neogale_vison", ArrivedOn: d("2025-06-01"), EnclosureID: "E1", ProtocolID: "P2"},
		},
		Staff: []records.Staff{
			{Ref: "staff.csv:2", ID: "S1", Name: "Ilse Varga", Role: "keeper", ActiveFrom: d("2024-01-01"), HandlingTrainedOn: d("2025-01-15"),
				RabiesPrimaryOn: d("2024-01-10"), RespiratorFitOn: d("2025-01-10")},
			{Ref: "staff.csv:3", ID: "S2", Name: "Oskar Lind", Role: "technician", ActiveFrom: d("2025-01-01"), ActiveTo: d("2026-01-05")},
			{Ref: "staff.csv:4", ID: "S3", Name: "Runa Holm", Role: "veterinarian", HandlingTrainedOn: d("2025-09-01"),
				EuthanasiaTrainedOn: d("2025-06-01"), EuthanasiaMethods: []string{"barbiturate_overdose"}, RabiesPrimaryOn: d("2020-03-01"),
				RabiesTiterOn: d("2022-03-01"), RabiesTiterIUmL: n(1.1)},
		},
		Protocols: []records.Protocol{
			// Expires 15 days after the period: protocol.expiring on 2026-02-15.
			{Ref: "protocols.csv:2", ID: "P1", Title: "Winter coat growth", ApprovedOn: d("2025-01-01"), ExpiresOn: d("2026-02-15"), MaxAnimals: i(2),
				Procedures: []string{"weighing", "health_check"}, EuthanasiaMethods: []string{"barbiturate_overdose"}},
			{Ref: "protocols.csv:3", ID: "P2", Title: "Mink nest use", ApprovedOn: d("2024-01-01"), ExpiresOn: d("2025-12-31")},
		},
		Care: []records.CareRound{
			// S2 named after leaving: staff.inactive on 2026-01-06.
			{Ref: "daily_care.csv:2", At: ptime(t, "2026-01-06 08:00"), Day: d("2026-01-06"), EnclosureID: "E1", StaffID: "S2", Observed: records.Yes, Fed: records.Yes},
			{Ref: "daily_care.csv:3", At: ptime(t, "2026-01-07 08:00"), Day: d("2026-01-07"), EnclosureID: "E1", StaffID: "S1", Observed: records.Yes, Fed: records.Yes},
		},
		Handling: []records.Handling{
			// Fit test on 2025-01-10 still covers 2026-01-10 (OSHA annual).
			{Ref: "handling.csv:2", At: ptime(t, "2026-01-10 09:00"), AnimalID: "F1", StaffID: "S1", Purpose: "weighing", Restraint: "gloved_hand",
				Glove: "bite_resistant", GloveID: "G1", GloveThicknessMm: n(3), PPE: []string{"coverall", "respirator"}, DurationMin: n(4)},
			// ... but not 2026-01-11: staff.respirator.fit_overdue.
			{Ref: "handling.csv:3", At: ptime(t, "2026-01-11 09:00"), AnimalID: "F1", StaffID: "S1", Purpose: "weighing", Restraint: "gloved_hand",
				Glove: "bite_resistant", GloveID: "G1", PPE: []string{"coverall", "respirator"}, DurationMin: n(4)},
			// Everything wrong: leather glove, no coverall, unwashed bite reported after 24 h 1 min,
			// untrained and unvaccinated technician after his last day, sampling not approved by P1,
			// glove G1 last inspected 7 days before.
			{Ref: "handling.csv:4", At: ptime(t, "2026-01-12 10:00"), AnimalID: "F1", StaffID: "S2", Purpose: "sampling", Restraint: "gloved_hand",
				Glove: "leather", GloveID: "G1", Bite: records.Yes, WoundWashed: records.No, ExposureReportedAt: ptime(t, "2026-01-13 10:01")},
			// A scratch washed and reported at exactly 24 h: in time. Glove G2 found damaged the day before: ppe.damaged.used.
			{Ref: "handling.csv:5", At: ptime(t, "2026-01-14 09:00"), AnimalID: "F1", StaffID: "S1", Purpose: "health_check", Restraint: "gloved_hand",
				Glove: "gauntlet", GloveID: "G2", PPE: []string{"coverall"}, Scratch: records.Yes, WoundWashed: records.Yes, ExposureReportedAt: ptime(t, "2026-01-15 09:00")},
			// Mink under the expired P2: protocol.inactive; 6 min weighing: handling.duration.exceeded.
			// 2026-01-15 is the last day of S1's training (trained 2025-01-15): still covered.
			{Ref: "handling.csv:6", At: ptime(t, "2026-01-15 09:00"), AnimalID: "M1", StaffID: "S1", Purpose: "weighing", Restraint: "gloved_hand",
				Glove: "bite_resistant", PPE: []string{"coverall"}, DurationMin: n(6)},
			// The day after: staff.handling.untrained; P2 still expired.
			{Ref: "handling.csv:7", At: ptime(t, "2026-01-16 09:00"), AnimalID: "M1", StaffID: "S1", Purpose: "weighing", Restraint: "gloved_hand",
				Glove: "bite_resistant", PPE: []string{"coverall"}, DurationMin: n(3)},
		},
		PPEChecks: []records.PPECheck{
			{Ref: "ppe_checks.csv:2", CheckedOn: d("2026-01-05"), ItemID: "G1", Item: "glove", Condition: "good", Action: "kept"},
			{Ref: "ppe_checks.csv:3", CheckedOn: d("2026-01-13"), ItemID: "G2", Item: "gauntlet", Condition: "damaged"},
		},
		Culls: []records.Cull{
			{Ref: "culls.csv:2", At: ptime(t, "2026-01-20 11:00"), AnimalID: "F2", StaffID: "S3", Reason: "end_of_study", Method: "barbiturate_overdose",
				Sedated: records.Yes, DeathConfirmed: records.Yes, Confirmation: []string{"no_heartbeat", "no_corneal_reflex"}},
			// Captive bolt with no secondary method and one sign, by a vet not trained for it, under
			// P1 which approves only barbiturate overdose.
			{Ref: "culls.csv:3", At: ptime(t, "2026-01-21 11:00"), AnimalID: "F3", StaffID: "S3", Reason: "end_of_study", Method: "penetrating_captive_bolt",
				DeathConfirmed: records.Yes, Confirmation: []string{"no_heartbeat"}},
		},
		Present: map[string]bool{"animals.csv": true, "enclosures.csv": true, "staff.csv": true, "protocols.csv": true, "daily_care.csv": true,
			"handling.csv": true, "ppe_checks.csv": true, "culls.csv": true},
	}
}

var peoplePeriod = func() Period {
	from, _ := records.ParseDay("2026-01-01")
	to, _ := records.ParseDay("2026-01-31")
	return Period{From: from, To: to}
}()

// peopleDomains are the domains these facts serve.
var peopleDomains = []string{"handling", "staff", "ppe", "protocol", "cull"}

func peopleCheck(t testing.TB, set *records.Set, lim *rules.Limits) []string {
	t.Helper()
	got := []string{}
	for _, f := range peopleFindings(t, set, lim, peoplePeriod) {
		got = append(got, f.Check+" "+f.Subject+" "+f.On.String()+" "+string(f.Severity))
	}
	sort.Strings(got)
	return got
}

// peopleFindings runs the shipped rules of these domains over set.
func peopleFindings(t testing.TB, set *records.Set, lim *rules.Limits, p Period) []Finding {
	t.Helper()
	ctx := context.Background()
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	eng, err := NewEngine(ctx, []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	res, err := Check(ctx, Config{Records: set, Limits: lim, Engine: eng, Period: p, Only: peopleDomains})
	if err != nil {
		t.Fatal(err)
	}
	// Rejected rows are listed whatever Only says; these tests are about
	// the people domains.
	var out []Finding
	for _, f := range res.Findings {
		if f.Check != RejectedCheck {
			out = append(out, f)
		}
	}
	return out
}

func TestPeopleChecksEndToEnd(t *testing.T) {
	lim := peopleLimits(t)
	clean := func(t testing.TB) *records.Set {
		s := peopleSet(t)
		// Keep the first, flawless handling and cull and a protocol far from expiry.
		s.Handling = s.Handling[:1]
		s.Culls = s.Culls[:1]
		s.Care = s.Care[1:]
		s.Animals = s.Animals[:2]
		s.Protocols[0].ExpiresOn = pday(t, "2026-12-31")
		return s
	}
	tests := []struct {
		name string
		set  func(testing.TB) *records.Set
		want []string
	}{
		{"planted", peopleSet, []string{
			"cull.death.unconfirmed F3 2026-01-21 significant",
			"cull.method.conditions_unmet F3 2026-01-21 significant",
			"handling.bite.not_reported F1 2026-01-12 significant",
			"handling.bite.not_washed F1 2026-01-12 significant",
			"handling.duration.exceeded M1 2026-01-15 minor",
			"handling.glove.inadequate F1 2026-01-12 significant",
			"handling.ppe.missing F1 2026-01-12 minor",
			"ppe.damaged.used G2 2026-01-14 significant",
			"ppe.inspection.overdue G1 2026-01-12 minor",
			"protocol.animals.exceeded P1 2026-01-05 significant",
			"protocol.expiring P1 2026-02-15 note",
			"protocol.inactive P2 2026-01-15 significant",
			"protocol.inactive P2 2026-01-16 significant",
			"protocol.method.unapproved P1 2026-01-21 significant",
			"protocol.procedure.unapproved P1 2026-01-12 significant",
			"staff.euthanasia.untrained S3 2026-01-21 significant",
			"staff.handling.untrained S1 2026-01-16 significant",
			"staff.handling.untrained S2 2026-01-12 significant",
			"staff.inactive S2 2026-01-06 minor",
			"staff.inactive S2 2026-01-12 minor",
			// The care round of E1 (foxes) on 01-06 is rabies-risk work too (checks.md
			// "Corrections to the first set"; ACIP 2022: people who work with reservoir species).
			"staff.rabies.unprotected S2 2026-01-06 significant",
			"staff.rabies.unprotected S2 2026-01-12 significant",
			"staff.respirator.fit_overdue S1 2026-01-11 minor",
		}},
		{"clean", clean, []string{}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := peopleCheck(t, tt.set(t), lim)
			if diff := cmp.Diff(tt.want, got); diff != "" {
				t.Errorf("findings (-want +got):\n%s", diff)
			}
		})
	}
}

func TestHandlingFacts(t *testing.T) {
	set := peopleSet(t)
	f := newFacts(set, peopleLimits(t), peoplePeriod)
	f.handlingFacts()
	got := section(f.docs["animal"]["F1"], "handling").([]any)
	if len(got) != 4 {
		t.Fatalf("F1 has %d handling entries, want 4", len(got))
	}
	want := map[string]any{
		"on": "2026-01-12", "at": "2026-01-12 10:00", "ref": "handling.csv:4", "staff": "S2", "purpose": "sampling",
		"restraint": "gloved_hand", "glove": "leather", "glove_thickness_mm": nil, "ppe": []any{}, "duration_min": nil,
		"bite": true, "scratch": false, "wound_washed": false,
		// 10:00 to 10:01 the next day.
		"reported_after_hours": 24 + 1.0/60,
	}
	if diff := cmp.Diff(want, got[2]); diff != "" {
		t.Errorf("handling entry (-want +got):\n%s", diff)
	}
	if h := got[3].(map[string]any)["reported_after_hours"]; h != 24.0 {
		t.Errorf("report at exactly 24 h: reported_after_hours = %v, want 24", h)
	}
}

// BenchmarkPeopleFacts10kAnimals computes the handling, staff, PPE,
// protocol and cull facts for a year of 10,000 invented foxes each handled
// weekly (520,000 handling rows) by 50 keepers with 200 gloves inspected
// weekly, under 10 protocols, with 1,000 culls.
func BenchmarkPeopleFacts10kAnimals(b *testing.B) {
	lim := peopleLimits(b)
	set, period := peopleYear(b)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		f := newFacts(set, lim, period)
		f.handlingFacts()
		f.staffFacts()
		f.ppeFacts()
		f.protocolFacts()
		f.cullFacts()
	}
}

// BenchmarkPeopleCheck10kAnimals is the same year through the whole check:
// facts and the handling, staff, PPE, protocol and cull rules.
func BenchmarkPeopleCheck10kAnimals(b *testing.B) {
	lim := peopleLimits(b)
	set, period := peopleYear(b)
	ctx := context.Background()
	data, err := lim.Data()
	if err != nil {
		b.Fatal(err)
	}
	eng, err := NewEngine(ctx, []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		res, err := Check(ctx, Config{Records: set, Limits: lim, Engine: eng, Period: period, Only: peopleDomains})
		if err != nil {
			b.Fatal(err)
		}
		if len(res.Findings) != 0 {
			b.Fatalf("%d findings on a clean year, first %+v", len(res.Findings), res.Findings[0])
		}
	}
}

// peopleYear is the benchmarks' invented year: clean records, so every
// finding would be a defect.
func peopleYear(b *testing.B) (*records.Set, Period) {
	start := pday(b, "2025-01-01")
	max := 1000
	set := &records.Set{Facility: records.Facility{Name: "Birchfall Fur Research Station", TimeZone: "UTC"}, Present: map[string]bool{
		"animals.csv": true, "staff.csv": true, "protocols.csv": true, "handling.csv": true, "ppe_checks.csv": true, "culls.csv": true}}
	for p := range 10 {
		set.Protocols = append(set.Protocols, records.Protocol{Ref: records.Ref("protocols.csv:" + itoa(p+2)), ID: "P" + itoa(p),
			Title: "t", ApprovedOn: start, ExpiresOn: start + 400, MaxAnimals: &max, Procedures: []string{"weighing", "health_check"},
			EuthanasiaMethods: []string{"barbiturate_overdose"}})
	}
	for s := range 50 {
		set.Staff = append(set.Staff, records.Staff{Ref: records.Ref("staff.csv:" + itoa(s+2)), ID: "S" + itoa(s), Name: "Keeper " + itoa(s),
			Role: "keeper", HandlingTrainedOn: start, RabiesPrimaryOn: start - 400, RespiratorFitOn: start - 10,
			EuthanasiaTrainedOn: start, EuthanasiaMethods: []string{"barbiturate_overdose"}})
	}
	for g := range 200 {
		for w := range 53 {
			set.PPEChecks = append(set.PPEChecks, records.PPECheck{Ref: records.Ref("ppe_checks.csv:" + itoa(len(set.PPEChecks)+2)),
				CheckedOn: start + records.Day(7*w), ItemID: "G" + itoa(g), Item: "glove", Condition: "good"})
		}
	}
	base := ptime(b, "2025-01-01 09:00")
	for a := range 10000 {
		id := "F" + itoa(a)
		set.Animals = append(set.Animals, records.Animal{Ref: records.Ref("animals.csv:" + itoa(a+2)), ID: id, Species: "vulpes_vulpes",
			ArrivedOn: start, ProtocolID: "P" + itoa(a%10)})
		for w := range 52 {
			set.Handling = append(set.Handling, records.Handling{Ref: records.Ref("handling.csv:" + itoa(len(set.Handling)+2)),
				At: base.AddDate(0, 0, 7*w+a%7), AnimalID: id, StaffID: "S" + itoa(a%50), Purpose: "weighing", Restraint: "gloved_hand",
				Glove: "bite_resistant", GloveID: "G" + itoa(a%200), PPE: []string{"coverall"}})
		}
		if a%10 == 0 {
			set.Culls = append(set.Culls, records.Cull{Ref: records.Ref("culls.csv:" + itoa(len(set.Culls)+2)), At: base.AddDate(0, 0, 300+a%60),
				AnimalID: id, StaffID: "S" + itoa(a%50), Method: "barbiturate_overdose", DeathConfirmed: records.Yes,
				Confirmation: []string{"no_heartbeat", "no_breathing"}})
		}
	}
	return set, Period{From: start, To: start + 364}
}
